"""Representations of Cl(3,0) against outside references.

References: sympy.physics.matrices.msigma (Pauli matrices), numpy matrix algebra,
sympy.algebras.Quaternion (Hamilton quaternions), scipy.spatial.transform.Rotation.
"""

from fractions import Fraction

import numpy as np
import pytest
import sympy as sp
from hypothesis import given, settings, strategies as st
from scipy.spatial.transform import Rotation
from sympy.algebras import Quaternion
from sympy.physics.matrices import msigma

import gacalc.simplify  # noqa: F401  (installs the simplifier the algebra compares with)
from gacalc.algebra import AlgebraError, I, Multivector, e1, e2, e3, e12, e23, e31, symbolic, vector
from gacalc.algebra.basis import BASIS_INDICES
from gacalc.algebra.representations import (
    coefficient_column, from_coefficient_column, from_pauli, from_quaternion, from_rotation_matrix,
    left_matrix, pauli, quaternion, right_matrix, rotation_matrix,
)

from conftest import stereographic_unit

SETTINGS = settings(max_examples=25, deadline=None, derandomize=True)
theta = sp.Symbol("theta", real=True)

# ---------------------------------------------------------------------------
# helpers

small_q = st.fractions(min_value=-4, max_value=4, max_denominator=5)


@st.composite
def rational_mv(draw, indices=range(8)):
    return Multivector({k: draw(small_q) for k in indices})


def rational_even():
    return rational_mv((0, 4, 5, 6))


def unit_vector_from(u, v):
    """A rational unit vector (conftest.stereographic_unit; common practice)."""
    return stereographic_unit(u, v)


def make_rotor(n, angle):
    """rotor(n, angle) = cos(a/2) - sin(a/2) n I (DESIGN.md) about the vector n."""
    from gacalc.algebra.rotors import rotor

    return rotor(vector(*n), angle)


def expanded_zero(matrix):
    return all(sp.expand(x) == 0 for x in matrix)


def to_numpy(matrix, dtype=complex):
    return np.array(sp.N(matrix, 17).tolist(), dtype=dtype)


# ---------------------------------------------------------------------------
# Pauli matrices

# The matrix of each basis blade as the product of its vectors' Pauli matrices
# (sympy.physics.matrices.msigma), and I = e1 e2 e3 -> sigma_x sigma_y sigma_z = i 1.
BLADE_MATRICES = []
for _ix in BASIS_INDICES:
    _m = sp.eye(2)
    for _i in _ix:
        _m = _m * msigma(_i)
    BLADE_MATRICES.append(_m)

# The Pauli matrices written out (the standard textbook form, common practice), for numpy.
NP_SIGMA = [np.eye(2, dtype=complex), np.array([[0, 1], [1, 0]], dtype=complex),
            np.array([[0, -1j], [1j, 0]]), np.array([[1, 0], [0, -1]], dtype=complex)]


def reference_pauli(a):
    return sum((a[k] * BLADE_MATRICES[k] for k in range(8)), sp.zeros(2))


def numpy_pauli(a):
    """The numpy image of a rational multivector, built from the textbook Pauli matrices."""
    out = np.zeros((2, 2), dtype=complex)
    for k, ix in enumerate(BASIS_INDICES):
        m = NP_SIGMA[0]
        for i in ix:
            m = m @ NP_SIGMA[i]
        out = out + float(a[k]) * m
    return out


def test_pauli_of_the_basis_vectors_is_msigma():
    # sympy.physics.matrices.msigma; e123 -> i 1 by the convention in DESIGN.md
    assert pauli(e1) == msigma(1)
    assert pauli(e2) == msigma(2)
    assert pauli(e3) == msigma(3)
    assert pauli(I) == sp.I * sp.eye(2)
    assert BLADE_MATRICES[7] == sp.I * sp.eye(2)  # sigma_x sigma_y sigma_z = i 1 (msigma)


def test_pauli_of_a_symbolic_multivector_matches_msigma_products():
    m, _ = symbolic("multivector", "M")
    assert expanded_zero(pauli(m) - reference_pauli(m))  # sympy msigma products


def test_geometric_product_is_matrix_product_symbolically():
    a, _ = symbolic("multivector", "A")
    b, _ = symbolic("multivector", "B")
    assert expanded_zero(pauli(a * b) - pauli(a) * pauli(b))  # sympy Matrix product


@SETTINGS
@given(rational_mv(), rational_mv())
def test_geometric_product_is_matrix_product_with_numpy(a, b):
    # numpy matrix product of the textbook Pauli matrices
    assert np.allclose(numpy_pauli(a * b), numpy_pauli(a) @ numpy_pauli(b), atol=1e-12)
    assert expanded_zero(pauli(a * b) - pauli(a) * pauli(b))  # exact, sympy Matrix product


def test_reverse_is_conjugate_transpose():
    m, _ = symbolic("multivector", "M")
    assert expanded_zero(pauli(m.rev()) - pauli(m).H)  # sympy Matrix.H


def test_clifford_conjugate_is_adjugate():
    m, _ = symbolic("multivector", "M")
    assert expanded_zero(pauli(m.conjugate()) - pauli(m).adjugate())  # sympy Matrix.adjugate


def test_grade_involution_is_adjugate_of_conjugate_transpose():
    # grade involution = reverse composed with Clifford conjugate (common practice)
    m, _ = symbolic("multivector", "M")
    assert expanded_zero(pauli(m.involute()) - pauli(m).adjugate().H)


def test_central_norm_is_determinant():
    # A Ā = a + b I and pauli(A) adj(pauli(A)) = det 1, so det = a + i b (common practice)
    m, _ = symbolic("multivector", "M")
    p = m * m.conjugate()
    assert sp.expand(pauli(m).det() - (p[0] + sp.I * p[7])) == 0


@SETTINGS
@given(rational_mv())
def test_inverse_is_matrix_inverse(a):
    det = pauli(a).det()
    if det == 0:
        return
    assert expanded_zero(pauli(a.inverse()) - pauli(a).inv())  # sympy Matrix.inv
    assert np.allclose(numpy_pauli(a.inverse()), np.linalg.inv(numpy_pauli(a)), atol=1e-10)  # numpy.linalg.inv


def test_inverse_is_matrix_inverse_symbolically():
    v, _ = symbolic("vector", "v")
    b, _ = symbolic("bivector", "B")
    a = v + b + 2
    inverse, condition = a.inverse_with_condition()
    assert condition is not None
    assert all(sp.cancel(x) == 0 for x in pauli(inverse) - pauli(a).inv())  # sympy Matrix.inv


def test_from_pauli_inverts_pauli():
    m, _ = symbolic("multivector", "M")
    assert from_pauli(pauli(m)) == m
    assert from_pauli(msigma(2)) == e2  # sympy msigma
    assert from_pauli(msigma(1) * msigma(2)) == e12
    assert from_pauli(sp.I * sp.eye(2)) == I


@SETTINGS
@given(rational_mv())
def test_from_pauli_of_a_numpy_matrix(a):
    back = from_pauli(numpy_pauli(a))
    for k in range(8):
        assert abs(float(back[k]) - float(a[k])) < 1e-12


def test_from_pauli_refuses_other_shapes_and_text():
    with pytest.raises(AlgebraError, match="2x2"):
        from_pauli(sp.eye(3))
    with pytest.raises(AlgebraError):
        from_pauli([["1", "0"], ["0", "1"]])
    with pytest.raises(AlgebraError):
        from_pauli(42)


# ---------------------------------------------------------------------------
# quaternions


QI = from_quaternion((0, 1, 0, 0))
QJ = from_quaternion((0, 0, 1, 0))
QK = from_quaternion((0, 0, 0, 1))


def test_hamilton_rules():
    # Hamilton's rules: i^2 = j^2 = k^2 = ijk = -1 (W. R. Hamilton, 1843)
    for q in (QI, QJ, QK):
        assert q * q == -1
    assert QI * QJ * QK == -1
    # and their consequences ij = k, jk = i, ki = j, ji = -k
    assert QI * QJ == QK and QJ * QK == QI and QK * QI == QJ and QJ * QI == -QK
    # the correspondence of DESIGN.md
    assert QI == -e23 and QJ == -e31 and QK == -e12


def test_even_product_is_sympy_quaternion_product():
    a, _ = symbolic("rotor", "A")
    b, _ = symbolic("rotor", "B")
    got = quaternion(a * b)
    want = quaternion(a) * quaternion(b)  # sympy.algebras.Quaternion multiplication
    for x, y in zip((got.a, got.b, got.c, got.d), (want.a, want.b, want.c, want.d)):
        assert sp.expand(x - y) == 0


@SETTINGS
@given(rational_even(), rational_even())
def test_even_product_is_quaternion_product_rational(a, b):
    assert quaternion(a * b) == quaternion(a) * quaternion(b)  # sympy Quaternion
    assert from_quaternion(quaternion(a) * quaternion(b)) == a * b


def test_quaternion_round_trip_and_inputs():
    r, _ = symbolic("rotor", "R")
    assert from_quaternion(quaternion(r)) == r
    q = Quaternion(1, 2, 3, 4)
    assert quaternion(from_quaternion(q)) == q
    assert from_quaternion((Fraction(1, 2), 0, 0, 1)) == Multivector({0: Fraction(1, 2), 6: -1})
    with pytest.raises(AlgebraError, match="even"):
        quaternion(e1 + 1)
    with pytest.raises(AlgebraError):
        from_quaternion((1, 2, 3))
    with pytest.raises(AlgebraError):
        from_quaternion(("1", 0, 0, 0))


def test_same_rotation_as_sympy_quaternion():
    n = unit_vector_from(Fraction(1, 3), Fraction(-2, 5))
    r = make_rotor(n, theta)
    q = quaternion(r)
    want = q.to_rotation_matrix()  # sympy Quaternion.to_rotation_matrix
    got = rotation_matrix(r)
    assert all(sp.simplify(x) == 0 for x in got - want)
    point = (1, 2, 3)
    image = r * vector(*point) * r.rev()
    want_point = Quaternion.rotate_point(point, q)  # sympy Quaternion.rotate_point
    assert all(sp.simplify(image[k + 1] - want_point[k]) == 0 for k in range(3))


# ---------------------------------------------------------------------------
# rotation matrices against scipy


def scipy_quaternion_wxyz(rotation):
    """scipy is scalar-last by default; ask for scalar-first where the option exists."""
    try:
        return np.array(rotation.as_quat(scalar_first=True))
    except TypeError:  # scipy < 1.14
        x, y, z, w = rotation.as_quat()
        return np.array([w, x, y, z])


def rotor_wxyz(r):
    q = quaternion(r)
    return np.array([float(sp.N(c, 17)) for c in (q.a, q.b, q.c, q.d)])


def same_up_to_sign(p, q, tol):
    return min(np.max(np.abs(p - q)), np.max(np.abs(p + q))) < tol


AXES = [(0, 0), (Fraction(1, 2), Fraction(1, 3)), (-2, Fraction(3, 7)), (5, -1), (Fraction(-1, 9), 4)]
ANGLES = [sp.Rational(1, 3), sp.Rational(-7, 4), sp.Rational(5, 2), sp.Rational(3, 1)]


@pytest.mark.parametrize("uv", AXES)
def test_rotation_matrix_matches_scipy_rotvec(uv):
    n = unit_vector_from(*uv)
    r = make_rotor(n, theta)
    m = rotation_matrix(r)
    for angle in ANGLES:
        want = Rotation.from_rotvec(float(angle) * np.array(n, dtype=float))  # scipy
        got = to_numpy(m.subs(theta, angle), float)
        assert np.allclose(got, want.as_matrix(), atol=1e-12)
        # quaternion order: (w, x, y, z) against scipy's scalar-first quaternion
        assert same_up_to_sign(rotor_wxyz(r.subs({theta: angle})), scipy_quaternion_wxyz(want), 1e-12)


def test_scipy_quaternion_is_scalar_last_by_default():
    n = np.array([0.0, 0.0, 1.0])
    rot = Rotation.from_rotvec(0.5 * n)  # scipy: as_quat() is (x, y, z, w)
    r = make_rotor((0, 0, 1), sp.Rational(1, 2))
    w, x, y, z = rotor_wxyz(r)
    assert np.allclose(rot.as_quat(), [x, y, z, w], atol=1e-14)


def test_rotation_about_e3_follows_the_convention():
    # DESIGN.md: rotor(e12, t) turns e1 toward e2; the matrix of a turn about z (common practice)
    r = Multivector.scalar(sp.cos(theta / 2)) - e12.scale(sp.sin(theta / 2))
    c, s = sp.cos(theta), sp.sin(theta)
    assert rotation_matrix(r) == sp.Matrix([[c, -s, 0], [s, c, 0], [0, 0, 1]])


def test_random_rotations_round_trip():
    mats = Rotation.random(30, random_state=20240501).as_matrix()  # scipy
    for mat in mats:
        r = from_rotation_matrix(mat)
        back = to_numpy(rotation_matrix(r), float)
        assert np.allclose(back, mat, atol=1e-12)
        want = scipy_quaternion_wxyz(Rotation.from_matrix(mat))
        assert same_up_to_sign(rotor_wxyz(r), want, 1e-12)
        assert rotor_wxyz(r)[0] >= 0


@pytest.mark.parametrize("eps", [1e-2, 1e-5, 1e-8, 1e-11, 0.0])
def test_rotations_near_and_at_a_half_turn(eps):
    rng = np.random.default_rng(7)
    for _ in range(6):
        n = rng.normal(size=3)
        n /= np.linalg.norm(n)
        angle = np.pi - eps
        mat = Rotation.from_rotvec(angle * n).as_matrix()  # scipy
        r = from_rotation_matrix(mat)
        assert np.allclose(to_numpy(rotation_matrix(r), float), mat, atol=1e-12)
        # the rotor is (cos(a/2), sin(a/2) n) up to sign, to full precision even here
        exact = np.concatenate([[np.cos(angle / 2)], np.sin(angle / 2) * n])
        assert same_up_to_sign(rotor_wxyz(r), exact, 1e-12)


def half_turn(n):
    """The half-turn about unit n: 2 n n^T - 1 (Rodrigues at angle pi, common practice)."""
    nn = sp.Matrix(n)
    return 2 * nn * nn.T - sp.eye(3)


@pytest.mark.parametrize("mat", [sp.diag(1, -1, -1), sp.diag(-1, 1, -1), sp.diag(-1, -1, 1),
                                 half_turn(unit_vector_from(Fraction(1, 2), 3)),
                                 half_turn((sp.sqrt(2) / 2, sp.sqrt(2) / 2, 0))])
def test_exact_half_turns(mat):
    r = from_rotation_matrix(mat)
    assert rotation_matrix(r) == mat
    assert r.scalar_part() == 0
    want = scipy_quaternion_wxyz(Rotation.from_matrix(to_numpy(mat, float)))  # scipy
    assert same_up_to_sign(rotor_wxyz(r), want, 1e-12)


@pytest.mark.parametrize("q", [(1, 2, 3, 4), (5, -1, 0, 2), (0, 1, 1, 0), (1, 0, 0, 0), (-3, 2, 2, 1)])
def test_exact_rational_rotation_matrices(q):
    mat = Quaternion(*q).to_rotation_matrix()  # sympy: rational matrix of a rational quaternion
    r = from_rotation_matrix(mat)
    assert rotation_matrix(r) == mat
    norm = sp.sqrt(sum(sp.Integer(c) ** 2 for c in q))
    unit = from_quaternion([sp.Integer(c) / norm for c in q])
    assert r == unit or r == -unit
    assert all(not x.has(sp.Float) for _, x in r.items())  # exact in, exact out


def test_symbolic_rotation_matrices():
    c, s = sp.cos(theta), sp.sin(theta)
    about_z = sp.Matrix([[c, -s, 0], [s, c, 0], [0, 0, 1]])  # common practice
    assert from_rotation_matrix(about_z) == Multivector.scalar(sp.cos(theta / 2)) - e12.scale(sp.sin(theta / 2))
    n = unit_vector_from(Fraction(2, 3), -1)
    r = make_rotor(n, theta)
    back = from_rotation_matrix(rotation_matrix(r))
    assert back == r or back == -r


@pytest.mark.parametrize("angle", [sp.Rational(1, 3), sp.Integer(3), sp.Rational(-3), sp.pi / 6])
@pytest.mark.parametrize("axis", [0, 2])
def test_exact_trigonometric_rotation_matrices(angle, axis):
    # the matrix of a turn about a coordinate axis (common practice); near a half turn
    # (angle 3) the pivot is not the scalar part, and the halves still come out exactly
    c, s = sp.cos(angle), sp.sin(angle)
    mat = sp.eye(3)
    i, j = [k for k in range(3) if k != axis]
    mat[i, i], mat[i, j], mat[j, i], mat[j, j] = c, -s, s, c
    r = from_rotation_matrix(mat)
    plane = [e23, e31, e12][axis]
    assert r == Multivector.scalar(sp.cos(angle / 2)) - plane.scale(sp.sin(angle / 2))
    assert rotation_matrix(r) == mat
    rot = Rotation.from_matrix(to_numpy(mat, float))  # scipy
    assert same_up_to_sign(rotor_wxyz(r), scipy_quaternion_wxyz(rot), 1e-12)


def test_symbolic_rotor_matrix_is_sympy_quaternion_matrix():
    # sympy's Quaternion.to_rotation_matrix divides by the squared norm; R x R~ does not
    r, cond = symbolic("rotor", "R")
    q = quaternion(r)
    norm2 = q.a**2 + q.b**2 + q.c**2 + q.d**2
    want = q.to_rotation_matrix() * norm2
    assert all(sp.cancel(x) == 0 for x in rotation_matrix(r) - want)


def test_symbolic_round_trips_under_unit_conditions():
    r, cond = symbolic("rotor", "R")
    assert from_rotation_matrix(rotation_matrix(r, cond), cond) == r  # valid where R0 != 0
    n, ncond = symbolic("vector", "n", unit=True)
    rn = Multivector.scalar(sp.cos(theta / 2)) - (n * I).scale(sp.sin(theta / 2))  # rotor(n, theta)
    back = from_rotation_matrix(rotation_matrix(rn, ncond), ncond)
    assert back.equals(rn, ncond)
    assert not any(isinstance(x, sp.Pow) and x.exp == sp.Rational(1, 2)
                   for _, c in back.items() for x in sp.preorder_traversal(c))  # no radical


def test_refuses_what_is_not_a_rotation():
    with pytest.raises(AlgebraError, match="reflection"):
        from_rotation_matrix(sp.diag(1, 1, -1))
    with pytest.raises(AlgebraError):
        from_rotation_matrix(sp.Matrix([[1, 1, 0], [0, 1, 0], [0, 0, 1]]))
    with pytest.raises(AlgebraError, match="3x3"):
        from_rotation_matrix(sp.eye(2))
    with pytest.raises(AlgebraError, match="odd"):
        rotation_matrix(e1)
    with pytest.raises(AlgebraError, match="unit"):
        rotation_matrix(1 + e12)


def test_minus_rotor_gives_the_same_matrix():
    # R and -R give the same rotation (common practice)
    r = make_rotor(unit_vector_from(3, Fraction(1, 4)), theta)
    assert rotation_matrix(-r) == rotation_matrix(r)


# ---------------------------------------------------------------------------
# the 8x8 matrices of multiplication


def test_left_matrix_acts_on_coefficients():
    a, _ = symbolic("multivector", "A")
    x, _ = symbolic("multivector", "X")
    assert from_coefficient_column(left_matrix(a) * coefficient_column(x)) == a * x
    assert from_coefficient_column(right_matrix(a) * coefficient_column(x)) == x * a


@SETTINGS
@given(rational_mv(), rational_mv())
def test_left_and_right_regular_representations(a, b):
    # the left regular representation is a homomorphism, the right one an anti-homomorphism
    # (sympy Matrix product); the two commute (associativity)
    assert left_matrix(a * b) == left_matrix(a) * left_matrix(b)
    assert right_matrix(a * b) == right_matrix(b) * right_matrix(a)
    assert left_matrix(a) * right_matrix(b) == right_matrix(b) * left_matrix(a)


@SETTINGS
@given(rational_mv())
def test_determinant_of_left_multiplication(a):
    # Cl(3,0) = M2(C): left multiplication by M on C^(2x2) has real determinant |det M|^4
    # = (a^2 + b^2)^2 with A Ā = a + b I (linear algebra over C viewed over R; from memory)
    p = a * a.conjugate()
    assert left_matrix(a).det() == (p[0] ** 2 + p[7] ** 2) ** 2


@SETTINGS
@given(rational_mv(), rational_mv())
def test_solving_a_x_equals_b(a, b):
    # sympy's LU solve of the 8x8 system agrees with X = A^-1 B
    if pauli(a).det() == 0:
        return
    x = from_coefficient_column(left_matrix(a).LUsolve(coefficient_column(b)))
    assert x == a.inverse() * b
    assert a * x == b

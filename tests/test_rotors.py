"""Rotors, exp and log of Cl(3,0), checked against outside references."""

import random

import numpy as np
import pytest
import scipy.linalg
import sympy
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.spatial.transform import Rotation, Slerp
from sympy.physics.matrices import msigma

from gacalc.algebra import I, ONE, AlgebraError, Multivector, e1, e2, e3, e12, e23, e31, symbolic, vector
from gacalc.algebra.rotors import (
    exp, log, power, rotate, rotor, rotor_angle, rotor_axis, rotor_between, rotor_plane, slerp, sqrt,
)
from gacalc.simplify import is_zero, simplify

from conftest import same

RNG = random.Random(1958)
theta = sympy.Symbol("theta", real=True)


# -- helpers ------------------------------------------------------------------------------------


def num(m: Multivector) -> np.ndarray:
    return np.array([complex(sympy.N(m[k], 20)) for k in range(8)])


def vec(m: Multivector) -> np.ndarray:
    return num(m)[[1, 2, 3]].real


def close(a: Multivector, b: Multivector, tol=1e-10) -> bool:
    return np.allclose(num(a), num(b), atol=tol)


def random_vector() -> Multivector:
    while True:
        comps = [sympy.Rational(RNG.randint(-9, 9), RNG.randint(1, 4)) for _ in range(3)]
        if any(comps):
            return vector(*comps)


def unit(v: Multivector) -> Multivector:
    """v / |v| with exact radicals."""
    return v.scale(1 / sympy.sqrt(v.norm2()))


def random_unit_vector() -> Multivector:
    return unit(random_vector())


def random_angle():
    return sympy.Rational(RNG.randint(-40, 40), 7)


def random_rotor() -> Multivector:
    return rotor(random_unit_vector(), random_angle())


def rotation_of(R: Multivector) -> Rotation:
    """The scipy Rotation whose matrix has columns rotate(R, e_k)."""
    cols = [vec(rotate(R, e)) for e in (e1, e2, e3)]
    return Rotation.from_matrix(np.column_stack(cols))


SIGMA = [np.array(msigma(k).evalf(), dtype=complex) for k in (1, 2, 3)]
PAULI_BASIS = [
    np.eye(2, dtype=complex), SIGMA[0], SIGMA[1], SIGMA[2],
    SIGMA[1] @ SIGMA[2], SIGMA[2] @ SIGMA[0], SIGMA[0] @ SIGMA[1], SIGMA[0] @ SIGMA[1] @ SIGMA[2],
]


def pauli_numeric(m: Multivector) -> np.ndarray:
    """DESIGN.md: e1, e2, e3 -> sigma_x, sigma_y, sigma_z (sympy msigma); e123 -> i 1."""
    c = num(m)
    return sum(c[k] * PAULI_BASIS[k] for k in range(8))


# -- construction and the conventions of DESIGN.md ------------------------------------------------


def test_rotor_closed_form_and_direction():
    # DESIGN.md: rotor(B, theta) = exp(-B theta/2); x -> R x R~ turns e1 toward e2 for B = e12
    R = rotor(e12, theta)
    assert R[0] == sympy.cos(theta / 2) and R[6] == -sympy.sin(theta / 2)
    assert R.grades() == {0, 2}
    turned = simplify(rotate(R, e1)).value
    assert same(turned, Multivector({1: sympy.cos(theta), 2: sympy.sin(theta)}))
    assert same(rotor(e3, theta), R)  # right-hand rule about e3 (B = e3 I = e12)


def test_rotor_about_axis_matches_scipy_rotvec():
    # scipy.spatial.transform.Rotation.from_rotvec(theta n).apply(x)
    for _ in range(6):
        n, th, x = random_unit_vector(), random_angle(), random_vector()
        ref = Rotation.from_rotvec(float(th) * vec(n))
        assert np.allclose(vec(rotate(rotor(n, th), x)), ref.apply(vec(x)))


def test_rotor_matches_rodrigues_formula():
    # Rodrigues' rotation formula: x cos t + (n x x) sin t + n (n.x)(1 - cos t), via numpy
    for _ in range(6):
        n, th, x = random_unit_vector(), random_angle(), random_vector()
        nn, xx, t = vec(n), vec(x), float(th)
        expected = xx * np.cos(t) + np.cross(nn, xx) * np.sin(t) + nn * nn.dot(xx) * (1 - np.cos(t))
        assert np.allclose(vec(rotate(rotor(n, th), x)), expected)


def test_rodrigues_symbolically_about_a_parametrised_axis():
    # Rodrigues' formula, symbolically, for the unit axis n = (cos p sin q, sin p sin q, cos q)
    # (a unit vector by cos^2 + sin^2 = 1, so no side condition is needed); x is symbolic
    p, q = sympy.symbols("p q", real=True)
    n = vector(sympy.cos(p) * sympy.sin(q), sympy.sin(p) * sympy.sin(q), sympy.cos(q))
    x, _ = symbolic("vector", "x")
    c, s = sympy.cos(theta), sympy.sin(theta)
    n_cross_x = n.outer(x).dual()  # Gibbs cross product a x b = dual(a ^ b) (DESIGN.md)
    expected = x.scale(c) + n_cross_x.scale(s) + n.scale(n.scalar_product(x)[0] * (1 - c))
    assert same(rotate(rotor(n, theta), x), expected)


def test_rotor_of_bivector_equals_exp():
    # DESIGN.md: rotor(B, theta) = exp(-B theta / 2)
    for _ in range(3):
        B = random_unit_vector() * I
        th = random_angle()
        assert close(rotor(B, th), exp(B.scale(-th / 2)))
    assert same(rotor(e31, theta), exp(e31.scale(-theta / 2)))


def test_minus_rotor_rotates_the_same():
    # common practice: R and -R give the same rotation
    for _ in range(3):
        R, x = random_rotor(), random_vector()
        assert close(rotate(R, x), rotate(-R, x))


def test_composition_applies_right_factor_first():
    # common practice (matrix order): R2 R1 applies R1 first; scipy: (r2 * r1).apply = r2(r1(x))
    R1, R2, x = random_rotor(), random_rotor(), random_vector()
    ref = rotation_of(R2) * rotation_of(R1)
    assert np.allclose(vec(rotate(R2 * R1, x)), ref.apply(vec(x)))
    assert close(rotate(R2 * R1, x), rotate(R2, rotate(R1, x)))


def test_camera_gimbal_yaw_then_pitch():
    # our scenario: a camera gimbal yaws 90 degrees about e3, then pitches 90 degrees about
    # its (turned) e2 axis; scipy's extrinsic composition gives the reference
    yaw = rotor(e3, sympy.pi / 2)
    pitch_axis = rotate(yaw, e2)  # e2 after the yaw
    pitch = rotor(pitch_axis, sympy.pi / 2)
    R = pitch * yaw
    ref = Rotation.from_rotvec(np.pi / 2 * vec(pitch_axis)) * Rotation.from_rotvec([0, 0, np.pi / 2])
    assert np.allclose(vec(rotate(R, e1)), ref.apply([1, 0, 0]))
    assert same(rotate(R, e1), -e3)  # the lens axis e1 ends up pointing down (scipy agrees above)


def test_rotor_rejects_bad_input():
    with pytest.raises(AlgebraError, match="got grade 3"):
        rotor(I, theta)
    with pytest.raises(AlgebraError, match="got a multivector of grades 0 and 2"):
        rotor(1 + e12, theta)
    with pytest.raises(AlgebraError, match="norm 2"):
        rotor(2 * e12, theta)
    n, cond = symbolic("vector", "n")
    with pytest.raises(AlgebraError, match="cannot tell"):
        rotor(n, theta)
    n, cond = symbolic("vector", "n", unit=True)
    R = rotor(n, theta, conditions=cond)
    assert R[0] == sympy.cos(theta / 2)
    with pytest.raises(AlgebraError, match="angle"):
        rotor(e12, e1)


def test_declared_unit_conditions_are_accepted():
    # a unit axis declared symbolically: rotate agrees with scipy's from_rotvec at a unit point
    n, cond = symbolic("vector", "n", unit=True)
    x, _ = symbolic("vector", "x")
    turned = rotate(rotor(n, theta, conditions=cond), x, conditions=cond)
    n1, n2, n3 = (sympy.Symbol(f"n{k}", real=True) for k in (1, 2, 3))
    x1, x2, x3 = (sympy.Symbol(f"x{k}", real=True) for k in (1, 2, 3))
    point = {n1: sympy.Rational(2, 7), n2: sympy.Rational(-3, 7), n3: sympy.Rational(6, 7),
             x1: 1, x2: sympy.Rational(1, 2), x3: -2, theta: sympy.Rational(5, 4)}
    ref = Rotation.from_rotvec(1.25 * np.array([2, -3, 6]) / 7).apply([1, 0.5, -2])
    assert np.allclose(vec(turned.subs(point)), ref)
    # two declared rotors: their product is a rotor given both conditions, not given one
    R, c1 = symbolic("rotor", "R")
    Q, c2 = symbolic("rotor", "Q")
    assert rotate(Q * R, x, conditions=c1 + c2).grades() <= {1}
    with pytest.raises(AlgebraError, match="cannot tell"):
        rotate(Q * R, x, conditions=c1)


def test_floating_point_rotors():
    # floats only on request: an evaluated rotor still works, within a tolerance;
    # reference scipy from_rotvec
    n, th, x = random_unit_vector(), random_angle(), random_vector()
    R = rotor(n, th).evalf()
    ref = Rotation.from_rotvec(float(th) * vec(n)).apply(vec(x))
    assert np.allclose(vec(rotate(R, x)), ref)
    assert np.allclose(num(exp(log(R))), num(R))
    A = random_multivector().evalf()
    assert np.allclose(pauli_numeric(exp(A)), scipy.linalg.expm(pauli_numeric(A)), atol=1e-9)


# -- rotor between two vectors ------------------------------------------------------------------------


def test_rotor_between_maps_a_to_b():
    # common practice: R a R~ = b; scipy's align_vectors gives the same shortest rotation
    for _ in range(5):
        a, b = random_unit_vector(), random_unit_vector()
        R, arbitrary = rotor_between(a, b)
        assert not arbitrary
        assert same(rotate(R, a), b)
        ref, _ = Rotation.align_vectors([vec(b)], [vec(a)])
        assert np.allclose(rotation_of(R).as_matrix(), ref.as_matrix())


def test_rotor_between_directions_of_non_unit_vectors():
    # common practice: only directions matter; e1 -> e2 is the quarter turn rotor(e12, pi/2)
    R, arbitrary = rotor_between(e1, 3 * e2)
    assert not arbitrary
    assert same(rotate(R, e1), e2)
    assert same(R, rotor(e12, sympy.pi / 2))


def test_rotor_between_symbolic():
    # common practice: the rotor from e1 to (cos p, sin p, 0) turns by p in the e12 plane
    p = sympy.Symbol("p", real=True)
    b = vector(sympy.cos(p), sympy.sin(p), 0)
    R, arbitrary = rotor_between(e1, b)
    assert not arbitrary
    assert same(rotate(R, e1), b)
    assert is_zero(Multivector({0: R.norm2() - 1})) is True


def test_rotor_between_opposite_vectors_is_flagged():
    for a in (e1, vector(1, 2, -2), random_unit_vector()):
        a = unit(a)
        R, arbitrary = rotor_between(a, -a)
        assert arbitrary
        assert same(rotate(R, a), -a)
        assert same(R * R.rev(), ONE)
        assert is_zero(Multivector({0: R[0]})) is True  # a half turn


def test_rotor_between_rejects_zero():
    # a zero vector has no direction
    with pytest.raises(AlgebraError, match="nonzero vectors"):
        rotor_between(e1, Multivector())
    with pytest.raises(AlgebraError, match="nonzero vectors"):
        rotor_between(e1, e12)


# -- angle, plane, axis -------------------------------------------------------------------------


def test_angle_plane_axis_rebuild_the_rotor():
    # the documented branch: R = rotor(plane, angle) = rotor(axis, angle), angle in [0, 2 pi]
    for _ in range(5):
        R = random_rotor()
        ang, B, n = rotor_angle(R), rotor_plane(R), rotor_axis(R)
        assert 0 <= float(ang) <= 2 * np.pi
        assert close(rotor(B, ang), R)
        assert close(rotor(n, ang), R)


def test_axis_angle_matches_scipy_rotvec():
    # scipy as_rotvec has |rotvec| in [0, pi]: rotation by a > pi about n is 2 pi - a about -n
    for _ in range(5):
        R = random_rotor()
        ang, n = float(rotor_angle(R)), vec(rotor_axis(R))
        expected = rotation_of(R).as_rotvec()
        got = ang * n if ang <= np.pi else (ang - 2 * np.pi) * n
        assert np.allclose(got, expected)


def test_angle_of_known_rotors():
    # DESIGN.md convention: rotor(e12, t) has angle t for t in [0, 2 pi]
    for t in (sympy.pi / 3, sympy.pi, 3 * sympy.pi / 2):
        R = rotor(e12, t)
        assert sympy.simplify(rotor_angle(R) - t) == 0
        assert same(rotor_plane(R), e12)
        assert same(rotor_axis(R), e3)
    # -rotor(B, t) = rotor(-B, 2 pi - t)
    R = -rotor(e12, sympy.pi / 3)
    assert sympy.simplify(rotor_angle(R) - 5 * sympy.pi / 3) == 0
    assert same(rotor_plane(R), -e12)


def test_plane_of_identity_is_an_error():
    # common practice: +-1 rotates nothing, so no plane or axis is defined
    with pytest.raises(AlgebraError, match="no plane"):
        rotor_plane(ONE)
    with pytest.raises(AlgebraError, match="no plane"):
        rotor_axis(-ONE)


# -- log, exp, sqrt, power ------------------------------------------------------------------------


def test_log_exp_round_trip():
    # common practice: exp(log R) = R on the principal branch
    for _ in range(5):
        R = random_rotor()
        L = log(R)
        assert L.grades() <= {2}
        assert float(sympy.N(sympy.sqrt(L.norm2()))) <= np.pi + 1e-12
        assert close(exp(L), R)


def test_log_of_rotor_is_minus_half_angle_bivector():
    # DESIGN.md: rotor(B, t) = exp(-B t/2); the principal branch returns -B t/2 for t in [0, 2 pi]
    for t in (sympy.Rational(1, 3), sympy.Integer(2), sympy.Rational(6, 1)):
        B = unit(random_vector()) * I
        assert close(log(rotor(B, t)), B.scale(-t / 2))


def test_log_special_cases():
    # common practice: exp(pi B) = cos(pi) + B sin(pi) = -1 for every unit bivector B, so
    # log(-1) needs a choice (ours: e12); exp(pi/2 B) = B gives the half-turn rotor B
    assert log(ONE).is_zero()
    assert same(log(-ONE), e12.scale(sympy.pi))  # documented choice
    assert same(exp(log(-ONE)), -ONE)
    # the half-turn R = e12 = rotor(-e12, pi): log is (pi/2) e12
    assert same(log(e12), e12.scale(sympy.pi / 2))
    assert same(exp(log(e12)), e12)


def test_log_rejects_non_rotors():
    with pytest.raises(AlgebraError, match="rotor"):
        log(e1)
    with pytest.raises(AlgebraError, match="norm"):
        log(2 + e12)
    R, cond = symbolic("rotor", "R")
    with pytest.raises(AlgebraError, match="cannot tell"):
        log(R)
    L = log(R, conditions=cond)  # with the declared unit condition it is a rotor
    assert L.grades() <= {2}


def test_sqrt_squares_back():
    # common practice: sqrt(R)^2 = R; the principal root is the half-angle rotor
    for _ in range(5):
        R = random_rotor()
        S = sqrt(R)
        assert close(S * S, R)
        assert num(S)[0].real >= -1e-12  # principal: angle of S in [0, pi]
        assert close(S, power(R, sympy.Rational(1, 2)))
    assert same(sqrt(rotor(e12, sympy.pi / 3)), rotor(e12, sympy.pi / 6))
    assert same(sqrt(-ONE), e12)  # documented choice, matches log(-1) = pi e12
    assert same(sqrt(-ONE) * sqrt(-ONE), -ONE)


def test_sqrt_symbolic_squares_back():
    # common practice: sqrt(R)^2 = R, here exactly for a symbolic angle
    R = rotor(e23, theta)
    S = sqrt(R)
    assert same(S * S, R)


def test_rational_powers():
    # common practice: (R^(1/3))^3 = R, R^-1 = R~, R^(p/q) = rotor(B, p t / q) on the branch
    for _ in range(4):
        R = random_rotor()
        assert close(power(R, sympy.Rational(1, 3)) ** 3, R)
        assert same(power(R, -1), R.rev())
        assert same(power(R, 2), R * R)
    B = unit(vector(1, -2, 2)) * I
    R = rotor(B, sympy.Rational(9, 5))
    assert close(power(R, sympy.Rational(2, 3)), rotor(B, sympy.Rational(6, 5)))
    assert same(power(-ONE, sympy.Rational(1, 2)), e12)
    s = sympy.Symbol("s", real=True)
    assert same(power(rotor(e12, sympy.pi / 2), s), rotor(e12, s * sympy.pi / 2))


# -- slerp -------------------------------------------------------------------------------------


NICE_ROTORS = [
    rotor(e12, sympy.pi / 3),
    rotor(vector(sympy.Rational(1, 3), sympy.Rational(2, 3), sympy.Rational(2, 3)), sympy.pi / 2),
    rotor(vector(sympy.Rational(2, 3), sympy.Rational(-1, 3), sympy.Rational(2, 3)), 3 * sympy.pi / 2),
    rotor(e1, 5 * sympy.pi / 3),
]


@pytest.mark.parametrize("i, j", [(0, 1), (1, 2), (2, 3), (3, 0), (0, 2)])
def test_slerp_endpoints_and_midpoint(i, j):
    # common practice: slerp(R1, R2, 0) = R1, slerp(.., 1) = +-R2, midpoint = R1 sqrt(R1~ R2)
    # (R2 flipped to -R2 when <R1~ R2>_0 < 0)
    R1, R2 = NICE_ROTORS[i], NICE_ROTORS[j]
    assert same(slerp(R1, R2, 0), R1)
    D = R1.rev() * R2
    flip = float(sympy.N(D[0])) < 0
    assert same(slerp(R1, R2, 1), -R2 if flip else R2)
    if flip:
        D = -D
    assert close(slerp(R1, R2, sympy.Rational(1, 2)), R1 * sqrt(D))


def test_slerp_matches_scipy():
    # scipy.spatial.transform.Slerp interpolates along the shorter arc, like ours; the
    # rotors are evaluated to floating point first (exact forms of two generic rotors'
    # slerp are large; the float path is what a numeric user gets)
    for _ in range(5):
        R1, R2 = random_rotor().evalf(), random_rotor().evalf()
        ref = Slerp([0, 1], Rotation.concatenate([rotation_of(R1), rotation_of(R2)]))
        for t in (sympy.Rational(1, 4), sympy.Rational(2, 3)):
            ours = rotation_of(slerp(R1, R2, t))
            assert np.allclose(ours.as_matrix(), ref([float(t)]).as_matrix()[0])


def test_slerp_takes_the_shorter_arc():
    # rotor(e12, 3 pi/2) rotates like a -90 degree turn: the midpoint is a -45 degree turn
    R2 = rotor(e12, 3 * sympy.pi / 2)
    mid = slerp(ONE, R2, sympy.Rational(1, 2))
    assert same(rotate(mid, e1), rotate(rotor(e12, -sympy.pi / 4), e1))


# -- exp of general multivectors ------------------------------------------------------------------


def random_multivector(grades=range(4)):
    from gacalc.algebra import BASIS_GRADES

    return Multivector({
        k: sympy.Rational(RNG.randint(-6, 6), RNG.randint(1, 4))
        for k in range(8) if BASIS_GRADES[k] in grades
    })


def test_exp_matches_pauli_matrix_exponential():
    # scipy.linalg.expm of the Pauli representation (sympy.physics.matrices.msigma, DESIGN.md)
    for grades in ([0, 1, 2, 3], [1, 2], [1], [2], [0, 3], [1, 3]):
        for _ in range(3):
            A = random_multivector(grades)
            assert np.allclose(pauli_numeric(exp(A)), scipy.linalg.expm(pauli_numeric(A)), atol=1e-9)


def test_exp_nilpotent_and_special_cases():
    F = e1 + e12  # F^2 = 0
    assert (F * F).is_zero()
    assert same(exp(F), ONE + F)
    assert np.allclose(pauli_numeric(exp(F)), scipy.linalg.expm(pauli_numeric(F)))
    assert same(exp(Multivector()), ONE)
    # common practice: exp(theta e12) = cos theta + e12 sin theta, exp(t e1) = cosh t + e1 sinh t
    assert same(exp(e12.scale(theta)), Multivector({0: sympy.cos(theta), 6: sympy.sin(theta)}))
    t = sympy.Symbol("t", real=True)
    assert same(exp(e1.scale(t)), Multivector({0: sympy.cosh(t), 1: sympy.sinh(t)}))
    # the centre acts like the complex numbers: exp(pi/2 I) = I
    assert same(exp(I.scale(sympy.pi / 2)), I)


def test_exp_symbolic_bivector_and_mixed():
    # exp of a general symbolic bivector: cos|B| + B sin|B|/|B|, checked numerically at a point
    B, _ = symbolic("bivector", "B")
    E = exp(B)
    point = {sympy.Symbol(n, real=True): v for n, v in (("B23", 1), ("B31", -2), ("B12", sympy.Rational(1, 2)))}
    Bp = B.subs(point)
    assert np.allclose(pauli_numeric(E.subs(point)), scipy.linalg.expm(pauli_numeric(Bp)))
    # vector + bivector with symbolic coefficients, compared at a point with a . b != 0
    x, y = sympy.symbols("x y", real=True)
    A = e1.scale(x) + e23.scale(y) + e12.scale(2)
    E = exp(A)
    for vals in ({x: 1, y: 2}, {x: -3, y: sympy.Rational(1, 2)}):
        assert np.allclose(pauli_numeric(E.subs(vals)), scipy.linalg.expm(pauli_numeric(A.subs(vals))))


def test_spin_precession_in_magnetic_field():
    # our scenario: a spin-1/2 in a magnetic field along n precesses with U = exp(-i w t n.sigma/2);
    # in Cl(3,0), i n.sigma is the bivector I n, so U = exp(-I n w t/2) = rotor(n, w t).
    # Reference: scipy.linalg.expm of the 2x2 matrix built from msigma.
    n = unit(vector(2, -1, 2))
    wt = sympy.Rational(7, 5)
    U = exp((I * n).scale(-wt / 2))
    nsig = sum(c * s for c, s in zip(vec(n), SIGMA))
    assert np.allclose(pauli_numeric(U), scipy.linalg.expm(-1j * float(wt) / 2 * nsig))
    assert close(U, rotor(n, wt))


@settings(max_examples=12, deadline=None)
@given(st.lists(st.integers(-4, 4), min_size=8, max_size=8))
def test_exp_inverse_property(coeffs):
    # common practice: exp(A) exp(-A) = 1 (the product taken in the Pauli representation)
    A = Multivector(dict(enumerate(coeffs)))
    assert np.allclose(pauli_numeric(exp(A)) @ pauli_numeric(exp(-A)), np.eye(2), atol=1e-8)


# -- properties of rotors ----------------------------------------------------------------------------

small = st.fractions(min_value=-6, max_value=6, max_denominator=5)
directions = st.tuples(small, small, small).filter(any).map(lambda c: vector(*c))


@settings(max_examples=10, deadline=None)
@given(directions, directions, directions)
def test_rotor_between_properties(a, b, x):
    # common practice: the result is a unit rotor turning the direction of a into that of b,
    # and rotations keep lengths
    R, _ = rotor_between(a, b)
    assert same(R * R.rev(), ONE)
    assert close(rotate(R, unit(a)), unit(b))
    assert same(Multivector({0: rotate(R, x).norm2() - x.norm2()}), Multivector())


@settings(max_examples=15, deadline=None)
@given(directions)
def test_rotor_angles_add_in_one_plane(n):
    # common practice: rotors in the same plane compose by adding angles
    n = unit(n)
    s, t = sympy.symbols("s t", real=True)
    assert same(rotor(n, t) * rotor(n, s), rotor(n, s + t))

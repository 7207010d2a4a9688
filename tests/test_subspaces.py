"""Subspaces, frames and linear maps (gacalc.algebra.subspaces, gacalc.algebra.outermorphism)
checked against numpy/scipy/sympy and published identities; each source is named beside
its check.  Inputs are random small integers (exact in gacalc), compared in floating point
with the reference libraries."""

from __future__ import annotations


import numpy as np
import pytest
import scipy.linalg
import sympy

import gacalc.simplify  # noqa: F401  (installs the simplifier the algebra asks)
from gacalc.algebra import AlgebraError, Multivector, NotInvertibleError, blade, symbolic
from gacalc.algebra import subspaces as S
from gacalc.algebra.outermorphism import LinearMap

CASES = 40
I = blade("123")


def _vec(v) -> Multivector:
    return Multivector({1: int(v[0]), 2: int(v[1]), 3: int(v[2])})


def _np(x: Multivector) -> np.ndarray:
    return np.array([float(x[k]) for k in (1, 2, 3)])


def _bivector_normal(b: Multivector) -> np.ndarray:
    # the normal of the plane b = B23 e23 + B31 e31 + B12 e12 is (B23, B31, B12): the
    # components of dual(b) up to sign (DESIGN.md: e1 x e2 = dual(e1 ^ e2) = e3)
    return np.array([float(b[k]) for k in (4, 5, 6)])


def _random_vectors(rng, count):
    """Integer vectors in general position (checked with numpy's rank)."""
    while True:
        vs = [rng.integers(-4, 5, size=3) for _ in range(count)]
        if np.linalg.matrix_rank(np.array(vs, dtype=float)) == min(count, 3):
            return vs


@pytest.fixture
def rng():
    return np.random.default_rng(18)


# meet and join -------------------------------------------------------------------------
def test_meet_of_two_planes_is_their_common_line_like_scipy_null_space(rng):
    for _ in range(CASES):
        a, b, c, d = _random_vectors(rng, 2) + _random_vectors(rng, 2)
        p, q = _vec(a).outer(_vec(b)), _vec(c).outer(_vec(d))
        if np.allclose(np.cross(np.cross(a, b), np.cross(c, d)), 0):
            continue                                   # the same plane twice
        m, conditions = S.meet(p, q)
        assert m.grades() == {1} and not conditions
        # scipy.linalg.null_space of the two normals: the direction both planes contain
        line = scipy.linalg.null_space(np.array([np.cross(a, b), np.cross(c, d)], float))
        assert line.shape[1] == 1
        assert np.allclose(np.cross(_np(m), line[:, 0]), 0, atol=1e-9)
        assert np.linalg.norm(_np(m)) > 1e-9
        assert S.join(p, q)[0] == I                    # two planes span all of space


def test_join_spans_the_same_space_as_scipy_orth(rng):
    for _ in range(CASES):
        u, v = _random_vectors(rng, 2)
        j, _ = S.join(_vec(u), _vec(v))
        # scipy.linalg.orth gives an orthonormal basis of span{u, v}; the join is a plane
        # whose normal is orthogonal to both basis vectors
        basis = scipy.linalg.orth(np.array([u, v], float).T)
        assert basis.shape[1] == 2 and j.grades() == {2}
        assert np.allclose(_bivector_normal(j) @ basis, 0, atol=1e-9)
        w = _random_vectors(rng, 3)[0]
        plane = _vec(u).outer(_vec(v))
        if abs(np.dot(w, np.cross(u, v))) > 0:
            # a line off a plane: the join is the trivector u ^ v ^ w, scipy.linalg.orth
            # of the three vectors has rank 3, and they meet only at the origin (a scalar)
            assert scipy.linalg.orth(np.array([u, v, w], float).T).shape[1] == 3
            assert S.join(_vec(w), plane)[0] == _vec(w).outer(plane)
            assert S.meet(_vec(w), plane)[0].grades() == {0}


def test_contained_blades_meet_in_the_smaller_and_join_in_the_larger(rng):
    for _ in range(CASES // 4):
        u, v = _random_vectors(rng, 2)
        plane = _vec(u).outer(_vec(v))
        inside = _vec(2 * u - 3 * v)
        assert S.join(inside, plane)[0] == plane and S.join(plane, inside)[0] == plane
        assert S.meet(inside, plane)[0] == inside and S.meet(plane, inside)[0] == inside


def test_meet_and_join_of_the_coordinate_planes():
    e12, e23 = blade("12"), blade("23")
    m, _ = S.meet(e12, e23)
    assert m == blade("2")                         # computed by hand from the formula
    assert m.outer(blade("2")).is_zero() and not m.is_zero()


def test_meet_rejects_zero_and_mixed_grades():
    with pytest.raises(AlgebraError, match="nonzero blade"):
        S.meet(blade("1").outer(blade("1")), blade("12"))
    with pytest.raises(AlgebraError, match="single grade"):
        S.meet(blade("1") + blade("12"), blade("1"))


def test_symbolic_join_states_its_condition():
    a, _ = symbolic("vector", "a")
    b, _ = symbolic("vector", "b")
    j, conditions = S.join(a, b)
    assert j == a.outer(b) and len(conditions) == 1
    # the condition vanishes exactly when a ^ b does: at b = 2 a it is zero
    at = {sympy.Symbol(f"b{k}", real=True): 2 * sympy.Symbol(f"a{k}", real=True)
          for k in (1, 2, 3)}
    assert sympy.expand(conditions[0].subs(at)) == 0


# factor, is_blade ----------------------------------------------------------------------
def test_factor_gives_orthogonal_vectors_spanning_the_blade(rng):
    for _ in range(CASES):
        u, v = _random_vectors(rng, 2)
        plane = _vec(u).outer(_vec(v))
        vectors, _ = S.factor(plane)
        assert len(vectors) == 2
        assert vectors[0].outer(vectors[1]) == plane           # exactly
        assert vectors[0].inner(vectors[1]).is_zero()           # orthogonal
        # scipy.linalg.subspace_angles: the factors span the same plane as u, v
        factors = np.array([_np(x) for x in vectors]).T
        assert np.allclose(scipy.linalg.subspace_angles(factors, np.array([u, v], float).T),
                           0, atol=1e-7)
    w = _random_vectors(rng, 3)
    volume = _vec(w[0]).outer(_vec(w[1])).outer(_vec(w[2]))
    three, _ = S.factor(volume)
    assert three[0].outer(three[1]).outer(three[2]) == volume
    assert S.factor(blade("1") * 5)[0] == [blade("1") * 5]


def test_factor_of_parallel_vectors_is_a_clear_error():
    with pytest.raises(AlgebraError, match="parallel"):
        S.factor(blade("1").outer(blade("1") * 3))


def test_symbolic_factor_holds_under_its_condition():
    B, _ = symbolic("bivector", "B")
    (x, y), conditions = S.factor(B)
    assert x.outer(y) == B and x.inner(y).is_zero()
    assert conditions and not conditions[0].is_number


def test_is_blade():
    e1, e2, e3 = (blade(k) for k in "123")
    # common practice: in 3-D every homogeneous multivector is a blade
    assert S.is_blade(e1.outer(e2 + e3))[0] is True
    assert S.is_blade(Multivector())[0] is True
    assert S.is_blade(e1 + e1.outer(e2))[0] is False
    assert S.is_blade(1 + e1 * e2)[0] is False


# angles ---------------------------------------------------------------------------------
def test_angles_agree_with_scipy_subspace_angles(rng):
    for _ in range(CASES):
        a, b, c, d = _random_vectors(rng, 2) + _random_vectors(rng, 2)
        A = np.array([a], float).T
        P, Q = np.array([a, b], float).T, np.array([c, d], float).T
        plane1, plane2 = _vec(a).outer(_vec(b)), _vec(c).outer(_vec(d))
        # line and line: [0, pi]; scipy reports the unoriented angle min(t, pi - t)
        t = float(S.angle(_vec(a), _vec(c)))
        assert np.isclose(min(t, np.pi - t), scipy.linalg.subspace_angles(A, np.array([c], float).T)[0])
        # line and plane: [-pi/2, pi/2], its size the scipy angle, its sign that of the
        # component along the plane's normal c x d (= dual(c ^ d), DESIGN.md)
        s = float(S.angle(_vec(a), plane2))
        assert np.isclose(abs(s), scipy.linalg.subspace_angles(A, Q)[0])
        assert np.sign(s) == np.sign(np.dot(a, np.cross(c, d))) or np.isclose(s, 0)
        assert np.isclose(float(S.angle(plane2, _vec(a))), s)
        # two planes: [0, pi] between normals; scipy's largest principal angle is min(t, pi - t)
        t = float(S.angle(plane1, plane2))
        assert np.isclose(min(t, np.pi - t), max(scipy.linalg.subspace_angles(P, Q)))


def test_angle_exact_values():
    e1, e3, e12, e23 = blade("1"), blade("3"), blade("12"), blade("23")
    assert S.angle(e1 + e3, e12) == sympy.pi / 4
    assert S.angle(e1 - e3, e12) == -sympy.pi / 4
    assert S.angle(e12, e23) == sympy.pi / 2
    with pytest.raises(AlgebraError, match="lines"):
        S.angle(I, e1)


# frames -------------------------------------------------------------------------------
def test_reciprocal_frame_is_the_reciprocal_lattice_of_numpy_inv(rng):
    for _ in range(CASES):
        a, b, c = _random_vectors(rng, 3)
        frame, _ = S.reciprocal(_vec(a), _vec(b), _vec(c))
        A = np.array([a, b, c], float).T                      # columns a, b, c
        # crystallography's reciprocal lattice (without the 2 pi): the columns of inv(A).T
        # (Kittel, "Introduction to Solid State Physics", ch. 2, from memory; numpy.linalg.inv)
        expected = np.linalg.inv(A).T
        got = np.array([_np(x) for x in frame]).T
        assert np.allclose(got, expected)
        # frame_matrix has the vectors as columns; its numpy.linalg.det is the volume
        F = S.frame_matrix(_vec(a), _vec(b), _vec(c))
        assert np.allclose(np.array(F, float), A)
        assert np.isclose(float(S.frame_volume(_vec(a), _vec(b), _vec(c))), np.linalg.det(A))


def test_reciprocal_frame_formula_symbolically():
    # a^i . a_j = delta^i_j for a^1 = (b ^ c) I^-1 / ((a ^ b ^ c) I^-1) and cyclically
    # (Hestenes and Sobczyk, "Clifford Algebra to Geometric Calculus", sec. 1.3)
    a, _ = symbolic("vector", "a")
    b, _ = symbolic("vector", "b")
    c, _ = symbolic("vector", "c")
    frame, conditions = S.reciprocal(a, b, c)
    for i, upper in enumerate(frame):
        for j, lower in enumerate((a, b, c)):
            assert upper.inner(lower) == (1 if i == j else 0)
    assert len(conditions) == 1
    assert sympy.expand(conditions[0] - sympy.Matrix(S.frame_matrix(a, b, c)).det()) == 0 \
        or sympy.expand(conditions[0] + sympy.Matrix(S.frame_matrix(a, b, c)).det()) == 0


def test_flat_frame_is_an_error_with_its_condition():
    e1, e2 = blade("1"), blade("2")
    with pytest.raises(AlgebraError, match="one plane"):
        S.reciprocal(e1, e2, e1 + e2)


# linear maps ---------------------------------------------------------------------------
def _random_matrix(rng):
    return rng.integers(-3, 4, size=(3, 3))


def _map(m) -> LinearMap:
    return LinearMap(sympy.Matrix(m.tolist()))


def test_determinant_and_inverse_agree_with_numpy(rng):
    for _ in range(CASES):
        m = _random_matrix(rng)
        f = _map(m)
        assert np.isclose(float(f.det()), np.linalg.det(m))          # numpy.linalg.det
        if round(np.linalg.det(m)) == 0:
            with pytest.raises(NotInvertibleError, match="det"):
                f.inverse_with_condition()
            continue
        inverse, condition = f.inverse_with_condition()
        assert condition is None
        assert np.allclose(np.array(inverse.matrix, float), np.linalg.inv(m))  # numpy.linalg.inv


def test_outermorphism_laws(rng):
    for _ in range(CASES):
        f = _map(_random_matrix(rng))
        a, b, c = (_vec(v) for v in rng.integers(-4, 5, size=(3, 3)))
        assert f(Multivector.scalar(1)) == 1
        assert f(a.outer(b)) == f(a).outer(f(b))
        # f(a ^ b ^ c) = det(f) a ^ b ^ c (the determinant as the volume factor)
        assert f(a.outer(b).outer(c)) == a.outer(b).outer(c) * f.det()
        x = 3 + a + 2 * a.outer(b) + I
        assert f(x) == 3 + f(a) + 2 * f(a.outer(b)) + f(I)     # linear, grade by grade


def test_cauchy_binet_for_compositions(rng):
    for _ in range(CASES):
        m, n = _random_matrix(rng), _random_matrix(rng)
        f, g = _map(m), _map(n)
        fg = f.compose(g)
        assert np.allclose(np.array(fg.matrix, float), m @ n)
        # Cauchy-Binet: det(f g) = det f det g, and on bivectors the 2x2 minors of the
        # product are sums of products of minors: (f g)(e_k ^ e_l) = f(g(e_k ^ e_l))
        assert fg.det() == f.det() * g.det()
        for k, l in ((2, 3), (3, 1), (1, 2)):
            plane = blade(f"{k}{l}")
            assert fg(plane) == f(g(plane))
            image = f(plane)
            for i, j, index in ((2, 3, 4), (3, 1, 5), (1, 2, 6)):
                minor = m[np.ix_([i - 1, j - 1], [k - 1, l - 1])]
                assert np.isclose(float(image[index]), np.linalg.det(minor))


def test_symbolic_map_against_sympy_det_and_adjugate():
    M = sympy.Matrix(3, 3, sympy.symbols("M11 M12 M13 M21 M22 M23 M31 M32 M33", real=True))
    f = LinearMap(M)
    assert sympy.expand(f.det() - M.det()) == 0                       # sympy Matrix.det
    inverse, condition = f.inverse_with_condition()
    assert sympy.expand(condition - M.det()) == 0 or sympy.expand(condition + M.det()) == 0
    adjugate = (inverse.matrix * f.det()).applyfunc(sympy.cancel)
    assert (adjugate - M.adjugate()).applyfunc(sympy.expand) == sympy.zeros(3, 3)  # adjugate
    assert f.adjoint().matrix == M.T


def test_adjoint_satisfies_its_definition(rng):
    for _ in range(CASES // 4):
        f = _map(_random_matrix(rng))
        a, b = (_vec(v) for v in rng.integers(-4, 5, size=(2, 3)))
        # common practice: adjoint(f)(a) . b = a . f(b)
        assert f.adjoint()(a).inner(b) == a.inner(f(b))

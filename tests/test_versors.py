"""Projections, reflections and versor application, checked against outside references."""

import random
from fractions import Fraction

import numpy as np
import pytest
import sympy
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.spatial.transform import Rotation

from gacalc.algebra import I, ONE, AlgebraError, Multivector, e1, e2, e3, e12, e23, e31, symbolic, vector
from gacalc.algebra.versors import (
    apply_versor, classify_versor, is_versor, project, reflect, reject, versor_parity,
)

from conftest import same

RNG = random.Random(20240611)


def as_array(v: Multivector) -> np.ndarray:
    return np.array([float(sympy.N(v[k])) for k in (1, 2, 3)])


def all_components(m: Multivector) -> np.ndarray:
    return np.array([float(sympy.N(m[k])) for k in range(8)])


def random_rational_vector(lo=-9, hi=9) -> Multivector:
    while True:
        comps = [sympy.Rational(RNG.randint(lo, hi), RNG.randint(1, 5)) for _ in range(3)]
        if any(comps):
            return vector(*comps)


# -- reflect -----------------------------------------------------------------------------


def test_reflect_matches_householder_matrix():
    # Householder, "Unitary triangularization of a nonsymmetric matrix", J. ACM 5 (1958):
    # H = 1 - 2 n n^T / (n^T n) reflects in the plane with normal n.
    for _ in range(8):
        n, x = random_rational_vector(), random_rational_vector()
        nn = as_array(n)
        H = np.eye(3) - 2 * np.outer(nn, nn) / nn.dot(nn)
        assert np.allclose(as_array(reflect(x, n)), H @ as_array(x))


def test_reflect_symbolic_matches_householder_formula():
    # Householder (1958) in vector form: x - 2 (x.n) n / (n.n), for symbolic x and n
    x, _ = symbolic("vector", "x")
    n, _ = symbolic("vector", "n")
    nn = n.scalar_product(n)[0]
    expected = x - n.scale(2 * x.scalar_product(n)[0] / nn)
    assert same(reflect(x, n), expected)


def test_reflect_signs_for_every_grade():
    # common practice: the reflection in the plane with normal e3 keeps e1, e2, flips e3;
    # bivectors and the trivector transform as the outermorphism (det H = -1 -> I -> -I).
    assert same(reflect(e1, e3), e1)
    assert same(reflect(e3, e3), -e3)
    assert same(reflect(e12, e3), e12)  # e1 ^ e2 -> e1 ^ e2
    assert same(reflect(e31, e3), -e31)  # (-e3) ^ e1
    assert same(reflect(e23, e3), -e23)
    assert same(reflect(I, e3), -I)
    assert same(reflect(ONE * 7, e3), ONE * 7)


def test_reflect_of_trivector_follows_determinant():
    # numpy.linalg.det: a reflection has determinant -1, so a ^ b ^ c -> det(H) a ^ b ^ c
    for _ in range(3):
        n = random_rational_vector()
        nn = as_array(n)
        H = np.eye(3) - 2 * np.outer(nn, nn) / nn.dot(nn)
        a, b, c = (random_rational_vector() for _ in range(3))
        T = a.outer(b).outer(c)
        assert np.allclose(all_components(reflect(T, n)), np.linalg.det(H) * all_components(T))


def test_reflect_is_outermorphism_on_bivectors():
    # common practice: an orthogonal map acts on a ^ b as f(a) ^ f(b); numpy Householder matrix
    for _ in range(4):
        n, a, b = (random_rational_vector() for _ in range(3))
        nn = as_array(n)
        H = np.eye(3) - 2 * np.outer(nn, nn) / nn.dot(nn)
        fa, fb = H @ as_array(a), H @ as_array(b)
        # a ^ b in the basis e23, e31, e12 has the components of the cross product a x b
        expected = np.cross(fa, fb)
        got = all_components(reflect(a.outer(b), n))[[4, 5, 6]]
        assert np.allclose(got, expected)


def test_two_reflections_rotate_by_twice_the_angle():
    # common practice: mirrors with normals meeting at angle alpha compose to a rotation by
    # 2 alpha about n1 x n2; reference rotation from scipy.spatial.transform.Rotation
    for _ in range(5):
        n1, n2, x = random_rational_vector(), random_rational_vector(), random_rational_vector()
        a1, a2 = as_array(n1), as_array(n2)
        axis = np.cross(a1, a2)
        if np.linalg.norm(axis) < 1e-6:
            continue
        alpha = np.arccos(a1.dot(a2) / np.linalg.norm(a1) / np.linalg.norm(a2))
        ref = Rotation.from_rotvec(2 * alpha * axis / np.linalg.norm(axis))
        got = reflect(reflect(x, n1), n2)
        assert np.allclose(as_array(got), ref.apply(as_array(x)))


def test_periscope_mirror_pair_is_a_translation_of_direction():
    # our scenario: a periscope's two parallel 45-degree mirrors; a ray going down -e3 hits
    # the top mirror, travels along e1, and the bottom mirror sends it down again
    # (common practice: two reflections in parallel planes give the identity on directions)
    mirror = e1 + e3  # normal of both mirrors (unnormalised on purpose)
    ray = -e3
    after_top = reflect(ray, mirror)
    assert same(after_top, e1)
    assert same(reflect(after_top, mirror), -e3)


def test_corner_cube_reverses_every_direction():
    # our scenario: a corner-cube retroreflector; three mutually perpendicular mirrors map
    # any direction d to -d (common practice: the product of the three reflections is -1)
    for _ in range(3):
        d = random_rational_vector()
        out = reflect(reflect(reflect(d, e1), e2), e3)
        assert same(out, -d)


def test_reflect_rejects_non_vectors():
    # the mirror is given by its normal vector (DESIGN.md); anything else is refused plainly
    with pytest.raises(AlgebraError, match="normal vector"):
        reflect(e1, e12)
    with pytest.raises(AlgebraError, match="normal vector"):
        reflect(e1, Multivector())
    with pytest.raises(AlgebraError):
        reflect(e1, e1 + e12)


# -- versor application ------------------------------------------------------------------------


def test_single_vector_versor_is_the_reflection():
    # DESIGN.md "Versor application": an odd versor uses the grade involution
    for _ in range(3):
        n = random_rational_vector()
        X = Multivector({k: RNG.randint(-4, 4) for k in range(8)})
        assert same(apply_versor(n, X), reflect(X, n))


def test_odd_versor_applies_reflections_right_to_left():
    # common practice: the versor n3 n2 n1 acts as the reflection in n1, then n2, then n3;
    # each reflection compared with the Householder matrix (Householder 1958)
    n1, n2, n3 = (random_rational_vector() for _ in range(3))
    x = random_rational_vector()
    v = as_array(x)
    for n in (n1, n2, n3):
        nn = as_array(n)
        v = (np.eye(3) - 2 * np.outer(nn, nn) / nn.dot(nn)) @ v
    assert np.allclose(as_array(apply_versor(n3 * n2 * n1, x)), v)


def test_scaled_versor_acts_like_unit_one():
    # common practice: V and s V (s != 0) give the same action, V^-1 = V~ / |V|^2
    V = (e1 + 2 * e2) * (e3 - e1)
    X = Multivector({k: k + 1 for k in range(8)})
    assert same(apply_versor(3 * V, X), apply_versor(V, X))
    assert same(apply_versor(V, ONE), ONE)


def test_versor_action_is_an_algebra_automorphism():
    # common practice: X -> V X^ V^-1 respects the geometric product for any versor V
    V = (e1 + e3) * (e2 - 2 * e3) * (e1 + e2 + e3)
    A = Multivector({k: RNG.randint(-3, 3) for k in range(8)})
    B = Multivector({k: RNG.randint(-3, 3) for k in range(8)})
    assert same(apply_versor(V, A * B), apply_versor(V, A) * apply_versor(V, B))


def test_classify_versor():
    # common practice: in Cl(3,0) the nonzero even and odd elements are the versors
    assert classify_versor(1 + e12) == "even"
    assert classify_versor(e1 * e2 * e3) == "odd"
    assert classify_versor(e1 + I) == "odd"
    assert classify_versor(1 + e1) is None
    assert classify_versor(Multivector()) is None
    t = sympy.Symbol("t", real=True)
    hidden_zero = sympy.sin(t) ** 2 + sympy.cos(t) ** 2 - 1
    V = e1 + Multivector({0: hidden_zero})  # the scalar part is zero once simplified
    assert classify_versor(V) == "odd"
    assert versor_parity(V) == "odd"
    assert same(apply_versor(V, e1), -e1)
    assert is_versor(1 + e1) is False
    assert is_versor(e12) is True


def test_apply_versor_rejects_mixed_parity():
    # common practice: versors are purely even or purely odd
    with pytest.raises(AlgebraError, match="purely even or purely odd"):
        apply_versor(1 + e1, e2)
    with pytest.raises(AlgebraError, match="nonzero"):
        apply_versor(Multivector(), e2)


# -- project and reject ------------------------------------------------------------------------


def test_project_onto_vector_matches_textbook_formula():
    # vector projection (x.n) n / (n.n), computed with numpy.dot
    for _ in range(5):
        x, n = random_rational_vector(), random_rational_vector()
        xx, nn = as_array(x), as_array(n)
        assert np.allclose(as_array(project(x, n)), xx.dot(nn) / nn.dot(nn) * nn)
        assert np.allclose(as_array(reject(x, n)), xx - xx.dot(nn) / nn.dot(nn) * nn)


def test_project_onto_plane_matches_least_squares_projector():
    # the orthogonal projector A (A^T A)^-1 A^T onto the column space of A (least squares,
    # e.g. Strang, Introduction to Linear Algebra); numpy.linalg.pinv gives A^+ = (A^T A)^-1 A^T
    for _ in range(5):
        u, v, x = random_rational_vector(), random_rational_vector(), random_rational_vector()
        A = np.column_stack([as_array(u), as_array(v)])
        if np.linalg.matrix_rank(A) < 2:
            continue
        P = A @ np.linalg.pinv(A)
        B = u.outer(v)
        assert np.allclose(as_array(project(x, B)), P @ as_array(x))
        assert np.allclose(as_array(reject(x, B)), as_array(x) - P @ as_array(x))


def test_project_bivector_onto_plane_is_outermorphism():
    # common practice: projecting a blade projects each factor: P(a ^ b) = P a ^ P b;
    # P from numpy as above, a ^ b components from numpy.cross
    u, v = e1 + 2 * e2, e3 - e2
    A = np.column_stack([as_array(u), as_array(v)])
    P = A @ np.linalg.pinv(A)
    for _ in range(3):
        a, b = random_rational_vector(), random_rational_vector()
        expected = np.cross(P @ as_array(a), P @ as_array(b))
        got = all_components(project(a.outer(b), u.outer(v)))
        assert np.allclose(got[[4, 5, 6]], expected)
        assert np.allclose(np.delete(got, [4, 5, 6]), 0)


def test_project_trivial_cases():
    # common practice: projection onto the whole space (I) is the identity; a vector or
    # plane has no part in a lower-dimensional blade of higher grade than itself
    x = vector(1, 2, 3)
    assert same(project(x, I), x)
    assert same(project(e12, e1), Multivector())
    assert same(project(e12, 2 * e12), e12)
    assert same(project(ONE * 5, e3), ONE * 5)


def test_project_symbolic_onto_plane():
    # common practice: onto the plane e12 a vector loses exactly its e3 component
    x, _ = symbolic("vector", "x")
    assert same(project(x, e12), vector(x[1], x[2], 0))
    assert same(reject(x, e12), vector(0, 0, x[3]))


def test_project_rejects_non_blades():
    # (x _| B) B^-1 projects onto a subspace only when B is a blade
    with pytest.raises(AlgebraError, match="blade"):
        project(e1, 1 + e12)
    with pytest.raises(AlgebraError, match="blade"):
        project(e1, Multivector())


# -- properties ---------------------------------------------------------------------------------

rationals = st.fractions(min_value=-5, max_value=5, max_denominator=7)
vectors = st.tuples(rationals, rationals, rationals).filter(any).map(lambda c: vector(*c))
multivectors = st.lists(rationals, min_size=8, max_size=8).map(lambda cs: Multivector(dict(enumerate(cs))))


@settings(max_examples=25, deadline=None)
@given(vectors, multivectors)
def test_reflect_twice_is_identity(n, X):
    # common practice: a reflection is an involution
    assert same(reflect(reflect(X, n), n), X)


@settings(max_examples=25, deadline=None)
@given(vectors, vectors)
def test_reflect_preserves_length(n, x):
    # common practice: reflections are orthogonal maps
    assert reflect(x, n).norm2() == x.norm2()


@settings(max_examples=25, deadline=None)
@given(vectors, vectors)
def test_projection_plus_rejection_and_orthogonality(x, n):
    # common practice: x = P x + R x with P x parallel and R x perpendicular to n
    p, r = project(x, n), reject(x, n)
    assert same(p + r, x)
    assert p.outer(n).is_zero()
    assert r.scalar_product(n).is_zero()
    assert same(project(p, n), p)  # idempotent


@settings(max_examples=20, deadline=None)
@given(vectors, vectors, vectors)
def test_rejection_from_plane_is_wedge_formula(x, u, v):
    # for a vector x and blade B, x - (x _| B) B^-1 = (x ^ B) B^-1 (common practice)
    B = u.outer(v)
    if B.is_zero():
        return
    assert same(reject(x, B), x.outer(B) * B.inverse())


def test_fraction_inputs_work():
    # Householder (1958): the mirror with normal e1 flips the e1 component; Fraction input
    assert same(reflect(vector(Fraction(1, 2), 0, 0), e1), vector(Fraction(-1, 2), 0, 0))

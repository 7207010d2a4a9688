"""Vector-algebra identities and rotation formulas, checked with the Cl(3,0) core.

Sources: numpy.cross and numpy.linalg.det; sympy's Matrix.det; the vector identities of
the NRL Plasma Formulary ("Vector identities", items quoted from memory); Rodrigues'
rotation formula; the Householder reflection matrix; facts of the trade marked
common practice.
"""

from fractions import Fraction

import numpy as np
import pytest
import sympy as sp
from hypothesis import given, settings, strategies as st

import gacalc.simplify  # noqa: F401  (installs the simplifier the algebra compares with)
from gacalc.algebra import I, Multivector, cross, e1, e2, e12, symbolic, vector

from conftest import stereographic_unit

SETTINGS = settings(max_examples=30, deadline=None, derandomize=True)
theta = sp.Symbol("theta", real=True)
alpha = sp.Symbol("alpha", real=True)

ints = st.integers(-9, 9)
int_triples = st.tuples(ints, ints, ints)


def dot(a, b):
    """a . b of two vectors as a scalar multivector (Hestenes inner product)."""
    return a.inner(b)


def unit_vector_from(u, v):
    """A rational unit vector (conftest.stereographic_unit; common practice)."""
    return vector(*stereographic_unit(u, v))


def make_rotor(n, angle):
    """rotor(n, angle) = cos(a/2) - sin(a/2) n I (DESIGN.md)."""
    from gacalc.algebra.rotors import rotor

    return rotor(n, angle)


# ---------------------------------------------------------------------------
# numpy references


@SETTINGS
@given(int_triples, int_triples)
def test_cross_product_matches_numpy(a, b):
    want = np.cross(np.array(a), np.array(b))  # numpy.cross
    got = cross(vector(*a), vector(*b))
    assert got == vector(*(int(x) for x in want))


@SETTINGS
@given(int_triples, int_triples, int_triples)
def test_trivector_is_determinant_times_pseudoscalar(a, b, c):
    # a ^ b ^ c = det[a b c] I
    got = vector(*a).outer(vector(*b)).outer(vector(*c))
    exact = sp.Matrix([a, b, c]).T.det()  # sympy Matrix.det
    assert got == exact * I
    assert abs(float(got[7]) - np.linalg.det(np.array([a, b, c], dtype=float).T)) < 1e-9  # numpy.linalg.det


def test_trivector_is_determinant_symbolically():
    a, _ = symbolic("vector", "a")
    b, _ = symbolic("vector", "b")
    c, _ = symbolic("vector", "c")
    m = sp.Matrix([[v[k] for k in (1, 2, 3)] for v in (a, b, c)]).T
    assert a.outer(b).outer(c) == m.det() * I  # sympy Matrix.det


# ---------------------------------------------------------------------------
# NRL Plasma Formulary, vector identities (symbolic vectors)


@pytest.fixture(scope="module")
def abcd():
    return [symbolic("vector", name)[0] for name in "abcd"]


def test_triple_product(abcd):
    # NRL: A . (B x C) = B . (C x A) = C . (A x B) = (A x B) . C
    a, b, c, _ = abcd
    t = dot(a, cross(b, c))
    assert t == dot(b, cross(c, a)) == dot(c, cross(a, b)) == dot(cross(a, b), c)
    assert t == -dot(a, cross(c, b))
    # and in Cl(3,0): a . (b x c) I = a ^ b ^ c (common practice)
    assert t * I == a.outer(b).outer(c)


def test_vector_triple_product(abcd):
    # NRL: A x (B x C) = (C x B) x A = B (A . C) - C (A . B)
    a, b, c, _ = abcd
    lhs = cross(a, cross(b, c))
    assert lhs == b * dot(a, c) - c * dot(a, b)
    assert lhs == cross(cross(c, b), a)


def test_lagrange_identity(abcd):
    # NRL: (A x B) . (C x D) = (A . C)(B . D) - (A . D)(B . C)
    a, b, c, d = abcd
    assert dot(cross(a, b), cross(c, d)) == dot(a, c) * dot(b, d) - dot(a, d) * dot(b, c)


def test_cross_of_crosses(abcd):
    # NRL: (A x B) x (C x D) = (A x B . D) C - (A x B . C) D
    a, b, c, d = abcd
    ab = cross(a, b)
    assert cross(ab, cross(c, d)) == dot(ab, d) * c - dot(ab, c) * d


def test_jacobi_identity(abcd):
    # A x (B x C) + B x (C x A) + C x (A x B) = 0 (common practice)
    a, b, c, _ = abcd
    assert (cross(a, cross(b, c)) + cross(b, cross(c, a)) + cross(c, cross(a, b))).is_zero()


def test_cross_is_dual_of_wedge_and_bivector_identity(abcd):
    # DESIGN.md a x b = dual(a ^ b); and a ^ b = I (a x b) (common practice)
    a, b, _, _ = abcd
    assert cross(a, b) == a.outer(b).dual()
    assert a.outer(b) == I * cross(a, b)
    assert a * b == dot(a, b) + I * cross(a, b)


# ---------------------------------------------------------------------------
# rotations and reflections


@pytest.mark.parametrize("uv", [(0, 0), (Fraction(1, 2), Fraction(1, 3)), (-2, Fraction(3, 7))])
def test_rodrigues_formula_symbolically(uv):
    # Rodrigues: R x R~ = x cos t + (n x x) sin t + n (n . x)(1 - cos t) for unit n
    n = unit_vector_from(*uv)
    x, _ = symbolic("vector", "x")
    r = make_rotor(n, theta)
    want = x * sp.cos(theta) + cross(n, x) * sp.sin(theta) + n * dot(n, x) * (1 - sp.cos(theta))
    assert r * x * r.rev() == want


def test_rodrigues_formula_at_random_points():
    # the same formula evaluated with numpy at random axes, angles and points
    rng = np.random.default_rng(11)
    for _ in range(10):
        n = rng.normal(size=3)
        n /= np.linalg.norm(n)
        x = rng.normal(size=3)
        t = float(rng.uniform(-np.pi, np.pi))
        want = x * np.cos(t) + np.cross(n, x) * np.sin(t) + n * np.dot(n, x) * (1 - np.cos(t))
        r = make_rotor(vector(*map(sp.Float, n)), sp.Float(t))
        got = r * vector(*map(sp.Float, x)) * r.rev()
        assert np.allclose([float(got[k]) for k in (1, 2, 3)], want, atol=1e-12)


@SETTINGS
@given(int_triples, int_triples)
def test_reflection_sandwich_is_householder(n, x):
    # Householder: H = 1 - 2 n n^T / (n^T n); in Cl(3,0) x -> -n x n^-1 (common practice)
    if not any(n):
        return
    nv, xv = vector(*n), vector(*x)
    nn = sp.Matrix(n)
    h = sp.eye(3) - 2 * nn * nn.T / (nn.T * nn)[0]
    want = h * sp.Matrix(x)
    assert -(nv * xv * nv.inverse()) == vector(*want)


def test_two_reflections_make_a_rotation_by_twice_the_angle():
    # common practice: reflecting in the plane normal to n, then in the plane normal to m,
    # with the normals at angle alpha, rotates by 2 alpha in the plane n ^ m
    n = e1
    m = sp.cos(alpha) * e1 + sp.sin(alpha) * e2
    x, _ = symbolic("vector", "x")
    twice = m * (n * x * n) * m  # -m (-n x n) m
    r = m * n
    assert r == Multivector.scalar(sp.cos(alpha)) - e12.scale(sp.sin(alpha))  # = rotor(e12, 2 alpha)
    assert twice == r * x * r.rev()
    rot = make_rotor(vector(0, 0, 1), 2 * alpha)
    assert twice == rot * x * rot.rev()


def test_minus_rotor_is_the_same_rotation():
    # common practice: R and -R give the same rotation
    r, _ = symbolic("rotor", "R")
    x, _ = symbolic("vector", "x")
    assert (-r) * x * (-r).rev() == r * x * r.rev()

"""Algebra laws and definitions of the Cl(3,0) core, checked on basis blades, random
rational multivectors (hypothesis) and symbolic multivectors.

Sources: the product definitions are those of DESIGN.md ("Conventions"), checked against
grade projections of the geometric product; permutation signs against
sympy.combinatorics.Permutation; the rest are facts of the trade, marked common practice.
"""

from itertools import permutations, product

import pytest
import sympy as sp
from hypothesis import assume, given, settings, strategies as st
from sympy.combinatorics import Permutation

import gacalc.simplify  # noqa: F401  (installs the simplifier the algebra compares with)
from gacalc.algebra import (
    BASIS_GRADES, ONE, AlgebraError, I, Multivector, NotInvertibleError, blade, cross,
    e1, e2, e3, e12, e23, e31, symbolic, vector,
)

SETTINGS = settings(max_examples=40, deadline=None, derandomize=True)
FEW = settings(max_examples=15, deadline=None, derandomize=True)
t = sp.Symbol("theta", real=True)

small_q = st.fractions(min_value=-4, max_value=4, max_denominator=5)


@st.composite
def rational_mv(draw, indices=tuple(range(8))):
    """A rational multivector; each component is present with probability about 2/3."""
    comps = {}
    for k in indices:
        if draw(st.integers(0, 2)):
            comps[k] = draw(small_q)
    return Multivector(comps)


vectors = rational_mv((1, 2, 3))
BASIS = [Multivector({k: 1}) for k in range(8)]


def grade_part_sum(a, b, rule):
    """sum over grade parts A_r, B_s of <A_r B_s>_g for the grade g = rule(r, s) (or none)."""
    total = Multivector()
    for r in a.grades():
        for s in b.grades():
            g = rule(r, s)
            if g is not None:
                total = total + (a.grade(r) * b.grade(s)).grade(g)
    return total


# The products as grade selections of the geometric product (DESIGN.md, "Conventions";
# the usual definitions, e.g. Dorst, Fontijne & Mann, Geometric Algebra for Computer
# Science, ch. 3 and 6 - quoted from memory).
DEFINITIONS = {
    "outer": lambda r, s: r + s,
    "lc": lambda r, s: s - r if s >= r else None,
    "rc": lambda r, s: r - s if r >= s else None,
    "inner": lambda r, s: abs(r - s) if r > 0 and s > 0 else None,
    "scalar_product": lambda r, s: 0,
}


# ---------------------------------------------------------------------------
# blades from index strings


@pytest.mark.parametrize(
    "word, want",
    [("", ONE), ("1", e1), ("2", e2), ("3", e3), ("23", e23), ("31", e31), ("12", e12),
     ("123", I), ("21", -e12), ("32", -e23), ("13", -e31), ("11", ONE), ("312", I), ("231", I),
     ("321", -I), ("1221", ONE), ("2112", ONE), ("121", -e2), ("3131", -ONE)],
)
def test_blades_from_index_strings(word, want):
    # DESIGN.md: e21 = -e12, e312 = e123, e11 = 1 (e_i e_i = +1 in Cl(3,0), common practice)
    assert blade(word) == want


def test_blade_signs_are_permutation_parities():
    # sympy.combinatorics.Permutation.signature of the reordering
    for n in (2, 3):
        for word in permutations([1, 2, 3], n):
            sorted_word = sorted(word)
            perm = Permutation([sorted_word.index(i) for i in word])
            want = blade("".join(map(str, sorted_word))) * perm.signature()
            assert blade("".join(map(str, word))) == want


def test_blade_is_the_product_of_its_vectors():
    for n in range(5):
        for word in product("123", repeat=n):
            want = ONE
            for ch in word:
                want = want * blade(ch)
            assert blade("".join(word)) == want


def test_bad_blade_indices():
    with pytest.raises(AlgebraError):
        blade("14")


# ---------------------------------------------------------------------------
# facts of the trade


def test_basis_squares():
    # common practice: e_i^2 = +1, basis bivectors square to -1, I^2 = -1
    for v in (e1, e2, e3):
        assert v * v == 1
    for b in (e23, e31, e12):
        assert b * b == -1
    assert I * I == -1
    assert e1 * e2 * e3 == I


def test_pseudoscalar_is_central():
    # common practice: I commutes with everything in Cl(3,0)
    m, _ = symbolic("multivector", "M")
    assert I * m == m * I
    for b in BASIS:
        assert I * b == b * I


def test_vectors_anticommute_and_bivectors_are_products():
    # common practice: e_i e_j = -e_j e_i for i != j; e23 = e2 e3 and so on
    assert e1 * e2 == -(e2 * e1) == e12
    assert e2 * e3 == e23 and e3 * e1 == e31


def test_basis_bivectors_multiply_like_negated_quaternion_units():
    # even subalgebra = quaternions (common practice): with i = -e23 ..., ij = k etc.
    i, j, k = -e23, -e31, -e12
    assert i * j == k and j * k == i and k * i == j
    assert i * i == j * j == k * k == i * j * k == -1


# ---------------------------------------------------------------------------
# products against their definitions


@pytest.mark.parametrize("name", sorted(DEFINITIONS))
def test_products_on_basis_blades(name):
    for a in BASIS:
        for b in BASIS:
            assert getattr(a, name)(b) == grade_part_sum(a, b, DEFINITIONS[name]), (name, a, b)


@FEW
@given(rational_mv(), rational_mv())
def test_products_on_random_multivectors(a, b):
    for name, rule in DEFINITIONS.items():
        assert getattr(a, name)(b) == grade_part_sum(a, b, rule), name
    assert a.comm(b) == (a * b - b * a) / 2  # commutator product, DESIGN.md
    assert a.anticomm(b) == (a * b + b * a) / 2
    assert a.comm(b) + a.anticomm(b) == a * b


def test_products_on_symbolic_multivectors():
    a, _ = symbolic("multivector", "A")
    b, _ = symbolic("multivector", "B")
    for name, rule in DEFINITIONS.items():
        assert getattr(a, name)(b) == grade_part_sum(a, b, rule), name


def test_hestenes_inner_is_zero_with_a_scalar():
    # DESIGN.md: zero when either factor is a scalar (unlike the contractions)
    assert (ONE * 3).inner(e1 + e12).is_zero()
    assert (e1 + e12).inner(ONE * 3).is_zero()
    assert (ONE * 3).lc(e1) == 3 * e1
    assert e1.rc(ONE * 3) == 3 * e1


def test_scalar_product_is_grade_zero():
    a, _ = symbolic("multivector", "A")
    b, _ = symbolic("multivector", "B")
    sp_ab = a.scalar_product(b)
    assert sp_ab.grades() <= {0}
    assert sp_ab == (a * b).grade(0)


def test_dual_and_cross():
    # DESIGN.md: dual(A) = A I^-1, undual(A) = A I, e1 x e2 = e3
    m, _ = symbolic("multivector", "M")
    assert m.dual() == m * I.inverse()
    assert m.dual().undual() == m
    assert cross(e1, e2) == e3 and cross(e2, e3) == e1 and cross(e3, e1) == e2
    assert e1.dual() == -e23  # e1 I^-1 = -e1 e123 = -e23
    with pytest.raises(AlgebraError):
        cross(e1, e12)


# ---------------------------------------------------------------------------
# algebra laws (hypothesis, random rational multivectors; common practice)


@SETTINGS
@given(rational_mv(), rational_mv(), rational_mv())
def test_geometric_product_associative_and_distributive(a, b, c):
    assert (a * b) * c == a * (b * c)
    assert a * (b + c) == a * b + a * c
    assert (a + b) * c == a * c + b * c


@SETTINGS
@given(rational_mv(), rational_mv(), rational_mv())
def test_outer_product_associative_and_distributive(a, b, c):
    assert a.outer(b).outer(c) == a.outer(b.outer(c))
    assert a.outer(b + c) == a.outer(b) + a.outer(c)


@SETTINGS
@given(vectors, vectors)
def test_outer_product_antisymmetric_on_vectors(a, b):
    assert a.outer(b) == -b.outer(a)
    assert a.outer(a).is_zero()


@SETTINGS
@given(vectors, vectors)
def test_vector_product_is_inner_plus_outer(a, b):
    # a b = a . b + a ^ b (common practice)
    assert a * b == a.inner(b) + a.outer(b)
    assert a.inner(b) == (a * b + b * a) / 2
    assert a.outer(b) == (a * b - b * a) / 2


@SETTINGS
@given(rational_mv(), rational_mv())
def test_involutions(a, b):
    # reverse and Clifford conjugate are anti-automorphisms, grade involution an automorphism
    assert (a * b).rev() == b.rev() * a.rev()
    assert (a * b).conjugate() == b.conjugate() * a.conjugate()
    assert (a * b).involute() == a.involute() * b.involute()
    assert a.rev().rev() == a and a.conjugate() == a.rev().involute()


@SETTINGS
@given(rational_mv())
def test_grade_parts(a):
    assert sum((a.grade(k) for k in range(4)), Multivector()) == a
    assert a.even() + a.odd() == a
    assert a.grades() == frozenset(BASIS_GRADES[k] for k, _ in a.items())
    assert a.is_homogeneous() == (len(a.grades()) <= 1)


@SETTINGS
@given(rational_mv())
def test_norm2_is_sum_of_squares(a):
    # in a Euclidean algebra <A A~>_0 is the sum of the squared coefficients (common practice)
    assert a.norm2() == sum((c**2 for _, c in a.items()), sp.Integer(0))


@SETTINGS
@given(rational_mv())
def test_inverse_where_invertible(a):
    p = a * a.conjugate()
    assume(p[0] ** 2 + p[7] ** 2 != 0)
    inv = a.inverse()
    assert a * inv == 1 and inv * a == 1
    assert a ** -2 == inv * inv
    assert a ** 3 == a * a * a and a ** 0 == 1


@SETTINGS
@given(rational_mv(), rational_mv())
def test_inverse_of_a_product_and_division(a, b):
    assume(not (a * b).is_zero())
    try:
        inv_a, inv_b = a.inverse(), b.inverse()
    except NotInvertibleError:
        assume(False)
    assert (a * b).inverse() == inv_b * inv_a
    assert a / b == a * inv_b


@SETTINGS
@given(st.fractions(-5, 5, max_denominator=6), st.fractions(-5, 5, max_denominator=6))
def test_one_plus_a_unit_vector_is_not_invertible(u, v):
    # (1 + n)(1 - n) = 1 - n^2 = 0 for a unit vector n: a zero divisor (common practice)
    d = u**2 + v**2 + 1
    n = vector(2 * u / d, 2 * v / d, (u**2 + v**2 - 1) / d)
    assert (1 + n) * (1 - n) == 0
    with pytest.raises(NotInvertibleError):
        (1 + n).inverse()


@pytest.mark.parametrize(
    "a",
    [1 + e1, (1 + e3) / 2, e23 + I, (1 + e1) * e2, 1 + sp.cos(t) * e1 + sp.sin(t) * e2],
    ids=["1+e1", "idempotent", "e23+I", "e2+e12", "trig-null"],
)
def test_null_elements_raise(a):
    # each has A Ā = a + b I with a = b = 0 (for the last one through cos^2 + sin^2 = 1)
    with pytest.raises(NotInvertibleError) as info:
        a.inverse()
    assert isinstance(info.value, AlgebraError)
    assert info.value.condition is not None
    with pytest.raises(NotInvertibleError):
        ONE / a
    with pytest.raises(NotInvertibleError):
        a ** -1


def test_inverse_with_condition_on_symbolic_multivectors():
    a, _ = symbolic("vector", "a")
    inv, cond = a.inverse_with_condition()
    a1, a2, a3 = sp.symbols("a1 a2 a3", real=True)
    assert sp.expand(cond - (a1**2 + a2**2 + a3**2)) == 0
    assert a * inv == 1

    m, _ = symbolic("multivector", "M")
    inv, cond = m.inverse_with_condition()
    assert cond is not None and cond.free_symbols
    assert m * inv == 1 and inv * m == 1

    # decided cases: a nonzero rational, and a rotor whose norm reduces to 1 (no condition)
    assert (ONE * 3).inverse_with_condition() == (ONE / 3, None)
    r = Multivector.scalar(sp.cos(t / 2)) - e12.scale(sp.sin(t / 2))
    inv, cond = r.inverse_with_condition()
    assert cond is None and inv == r.rev()


def test_inverse_condition_is_the_central_norm():
    # A Ā = a + b I; the condition is a^2 + b^2 (DESIGN.md), up to repeated factors
    x = sp.Symbol("x", real=True)
    a = x + e1
    inv, cond = a.inverse_with_condition()
    assert sp.expand(cond - (x**2 - 1) ** 2) == 0 or sp.expand(cond - (x**2 - 1)) == 0
    assert a * inv == 1

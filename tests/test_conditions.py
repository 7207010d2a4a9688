"""Side conditions: identities that hold only where the conditions do, proved by reduction
modulo a Gröbner basis (gacalc.simplify.conditions), and refused without the conditions.

Sources are named beside each check.  Reference libraries: scipy.spatial.transform.Rotation
and sympy.algebras.Quaternion.
"""

import random

import flint
import numpy as np
import pytest
import sympy as sp
from scipy.spatial.transform import Rotation
from sympy.polys.orderings import grevlex

from gacalc.algebra import AlgebraError, I, Multivector, cross, symbolic
from gacalc.algebra.coefficients import from_expr
from gacalc.simplify import Budget, BudgetExceeded, is_zero, reduce_coef, simplify, simplify_scalar
from gacalc.simplify.conditions import ConditionError, ConditionSet, InconsistentConditionsError

theta = sp.Symbol("theta", real=True)
t = sp.Symbol("t", real=True)

n, UNIT_N = symbolic("vector", "n", unit=True)
x, _ = symbolic("vector", "x")
a, _ = symbolic("vector", "a")
b, _ = symbolic("vector", "b")
R, UNIT_R = symbolic("rotor", "R")
n1, n2, n3 = (n[k] for k in (1, 2, 3))
A_DOT_B = [a.inner(b).scalar_part()]
E = [Multivector({k: 1}) for k in (1, 2, 3)]


def scalar(expr) -> Multivector:
    return Multivector({0: expr})


def holds(expr, conditions=()):
    return is_zero(scalar(expr), conditions)


def sandwich_rotor():
    """R = cos(θ/2) − sin(θ/2) n I: rotation by θ about n, right-hand rule (DESIGN.md)."""
    return scalar(sp.cos(theta / 2)) - (n * I).scale(sp.sin(theta / 2))


def rodrigues_rhs():
    # Rodrigues' rotation formula (O. Rodrigues, J. Math. Pures Appl. 5, 1840):
    # x cos θ + (n × x) sin θ + n (n·x)(1 − cos θ), for a unit axis n.
    n_dot_x = n.inner(x).scalar_part()
    return x.scale(sp.cos(theta)) + cross(n, x).scale(sp.sin(theta)) + n.scale(n_dot_x * (1 - sp.cos(theta)))


# ---------------------------------------------------------------------------
# Rodrigues' rotation formula


def test_rodrigues_formula_holds_given_the_unit_axis():
    R_ = sandwich_rotor()
    assert is_zero(R_ * x * R_.rev() - rodrigues_rhs(), UNIT_N) is True


def test_rodrigues_formula_fails_without_the_unit_condition():
    R_ = sandwich_rotor()
    assert is_zero(R_ * x * R_.rev() - rodrigues_rhs()) is False


def test_rotor_sandwich_with_symbolic_axis_displays_as_the_textbook_formula():
    # The shortest normal form modulo n·n = 1, half angles merged back into θ, is the
    # expanded Rodrigues formula itself, term for term (no n_k^2 traded for the others).
    R_ = sandwich_rotor()
    out = simplify(R_ * x * R_.rev(), UNIT_N).value
    assert "theta/2" not in str(out)
    assert out.identical(rodrigues_rhs())


def test_rodrigues_result_agrees_with_scipy_rotation():
    # Reference library: scipy's Rotation.from_rotvec(θ n) is the right-handed rotation by θ
    # about n.  Axis (2, 3, 6)/7 is unit (2^2 + 3^2 + 6^2 = 7^2, common practice).
    R_ = sandwich_rotor()
    out = simplify(R_ * x * R_.rev(), UNIT_N).value
    axis = np.array([2.0, 3.0, 6.0]) / 7.0
    angle, point = 0.7, np.array([1.0, -2.0, 0.5])
    values = {theta: angle, **{n[k]: axis[k - 1] for k in (1, 2, 3)}, **{x[k]: point[k - 1] for k in (1, 2, 3)}}
    ours = np.array([float(out[k].subs(values)) for k in (1, 2, 3)])
    reference = Rotation.from_rotvec(angle * axis).apply(point)
    assert np.allclose(ours, reference, atol=1e-12)


# ---------------------------------------------------------------------------
# Euler–Rodrigues parameters


def rotation_columns(rotor):
    return [rotor * e * rotor.rev() for e in E]


def euler_rodrigues(a_, b_, c_, d_):
    # The Euler–Rodrigues formula (Euler 1775; Rodrigues 1840), as published, rows i, columns j.
    return sp.Matrix(
        [
            [a_**2 + b_**2 - c_**2 - d_**2, 2 * (b_ * c_ - a_ * d_), 2 * (b_ * d_ + a_ * c_)],
            [2 * (b_ * c_ + a_ * d_), a_**2 + c_**2 - b_**2 - d_**2, 2 * (c_ * d_ - a_ * b_)],
            [2 * (b_ * d_ - a_ * c_), 2 * (c_ * d_ + a_ * b_), a_**2 + d_**2 - b_**2 - c_**2],
        ]
    )


def euler_rodrigues_unit_form(a_, b_, c_, d_):
    # The same matrix written for a² + b² + c² + d² = 1 (its usual unit-quaternion form).
    M = euler_rodrigues(a_, b_, c_, d_)
    M[0, 0] = 1 - 2 * (c_**2 + d_**2)
    M[1, 1] = 1 - 2 * (b_**2 + d_**2)
    M[2, 2] = 1 - 2 * (b_**2 + c_**2)
    return M


def rotor_parameters():
    # Quaternion correspondence of DESIGN.md: i = -e23, j = -e31, k = -e12.
    return R[0], -R["e23"], -R["e31"], -R["e12"]


def matrix_differences(columns, M):
    return [columns[j][i + 1] - M[i, j] for i in range(3) for j in range(3)]


def test_rotor_matrix_is_the_euler_rodrigues_matrix():
    # The quadratic form q v q* needs no condition: both sides scale with |R|^2.
    cols = rotation_columns(R)
    for diff in matrix_differences(cols, euler_rodrigues(*rotor_parameters())):
        assert holds(diff) is True


def test_unit_form_of_euler_rodrigues_holds_given_the_unit_rotor():
    cols = rotation_columns(R)
    diffs = matrix_differences(cols, euler_rodrigues_unit_form(*rotor_parameters()))
    assert all(holds(d, UNIT_R) is True for d in diffs)
    # without R0^2 + R23^2 + R31^2 + R12^2 = 1 the diagonal entries differ
    assert [holds(d) for d in diffs].count(False) == 3


def test_rotor_matrix_agrees_with_sympy_quaternion_given_the_unit_rotor():
    # Reference library: sympy.algebras.Quaternion.to_rotation_matrix (divides by the norm).
    M = sp.Quaternion(*rotor_parameters()).to_rotation_matrix()
    cols = rotation_columns(R)
    assert all(holds(d, UNIT_R) is True for d in matrix_differences(cols, M))


def test_rotor_matrix_diagonal_comes_out_short():
    # a² + b² − c² − d² → 1 − 2c² − 2d²: three terms, the unit form
    out = simplify(rotation_columns(R)[0], UNIT_R).value
    assert sp.expand(out[1] - (1 - 2 * R["e31"] ** 2 - 2 * R["e12"] ** 2)) == 0


# ---------------------------------------------------------------------------
# Householder reflections


def mirror(v):
    """−n v n: the reflection in the plane normal to n when n is unit."""
    return -(n * v * n)


def householder_columns():
    return [mirror(e) for e in E]


def test_householder_matrix_is_one_minus_two_n_n_transpose_given_unit_n():
    # Householder (J. ACM 5, 1958): H = 1 − 2 n nᵀ for a unit normal n.
    cols = householder_columns()
    nv = [n1, n2, n3]
    diffs = [cols[j][i + 1] - (sp.KroneckerDelta(i, j) - 2 * nv[i] * nv[j]) for i in range(3) for j in range(3)]
    assert all(holds(d, UNIT_N) is True for d in diffs)
    assert any(holds(d) is False for d in diffs)


def test_householder_matrix_is_symmetric_and_orthogonal_given_unit_n():
    cols = householder_columns()
    H = sp.Matrix([[cols[j][i + 1] for j in range(3)] for i in range(3)])
    for i in range(3):
        for j in range(3):
            assert holds(H[i, j] - H[j, i]) is True  # symmetric without any condition
    gram = H * H.T - sp.eye(3)
    assert all(holds(g, UNIT_N) is True for g in gram)
    assert any(holds(g) is False for g in gram)


def test_reflecting_twice_gives_back_the_vector_given_unit_n():
    assert is_zero(mirror(mirror(x)) - x, UNIT_N) is True
    assert is_zero(mirror(mirror(x)) - x) is False


def test_mirror_sandwich_agrees_with_the_core_reflection_given_unit_n():
    from gacalc.algebra.versors import reflect  # n x^ n^-1, for any nonzero n

    assert is_zero(mirror(x) - reflect(x, n), UNIT_N) is True
    assert is_zero(mirror(x) - reflect(x, n)) is False


# ---------------------------------------------------------------------------
# Orthogonality


def test_pythagoras_given_orthogonal_vectors():
    # (a + b)^2 = a^2 + b^2 when a · b = 0 (Pythagoras; common practice)
    lhs = (a + b) * (a + b)
    assert is_zero(lhs - a * a - b * b, A_DOT_B) is True
    assert is_zero(lhs - a * a - b * b) is False


def test_geometric_product_of_orthogonal_vectors_is_their_wedge():
    # a b = a · b + a ∧ b (common practice), so a b = a ∧ b when a · b = 0
    assert is_zero(a * b - a.outer(b), A_DOT_B) is True
    assert is_zero(a * b - a.outer(b)) is False


def test_orthonormal_pair_combines_conditions():
    # a, b unit and orthogonal: (a b)^2 = -1, a unit bivector (common practice)
    conds = symbolic("vector", "a", unit=True)[1] + symbolic("vector", "b", unit=True)[1] + A_DOT_B
    ab = a * b
    assert is_zero(ab * ab + 1, conds) is True
    assert is_zero(ab * ab + 1, A_DOT_B) is False


# ---------------------------------------------------------------------------
# Inconsistent condition sets


@pytest.mark.parametrize(
    "conditions",
    [
        [t - 1, t - 2],
        UNIT_N + [n1**2 + n2**2 + n3**2 - 2],
        [t**2 + 1],  # no real solution (a positive sum of squares)
        [sp.cos(theta) - 2],  # |cos| <= 1 through cos^2 + sin^2 = 1
    ],
)
def test_inconsistent_condition_sets_are_reported(conditions):
    with pytest.raises(InconsistentConditionsError) as info:
        ConditionSet.of(conditions)
    assert isinstance(info.value, AlgebraError)
    assert "inconsistent" in str(info.value)


def test_inconsistent_conditions_prove_nothing():
    with pytest.raises(InconsistentConditionsError, match=r"t - 1 = 0, t - 2 = 0"):
        is_zero(x, [t - 1, t - 2])


def test_unusable_conditions_are_refused():
    with pytest.raises(ConditionError):
        ConditionSet.of([sp.Float(0.5) * t - 1])


# ---------------------------------------------------------------------------
# Simplification under the unit condition


def test_unit_vector_dot_itself_is_one():
    out = simplify(n.inner(n), UNIT_N).value
    assert out.is_scalar() and out[0] == 1
    assert simplify_scalar(n.norm2(), UNIT_N) == 1
    assert simplify_scalar(n.norm(), UNIT_N) == 1  # sqrt(n1^2 + n2^2 + n3^2) has base 1


def test_without_the_condition_nothing_changes():
    assert simplify_scalar(n.norm2()) == n1**2 + n2**2 + n3**2


def test_reduction_is_canonical_and_correct_on_the_sphere():
    # Points on the unit sphere from the inverse stereographic projection (common practice):
    # n = (2s, 2u, 1 - s^2 - u^2) / (1 + s^2 + u^2) for rational s, u.
    rng = random.Random(7)
    f = n1**2 + n2**2 + n3**2 - 1
    monomials = [n1, n2, n3, n1 * n2, n3**2, n1**3, n2**2 * n3, x[1] * n1**2, theta * n2]
    for _ in range(6):
        p = sum(rng.randint(-3, 3) * m for m in rng.sample(monomials, 4))
        q = sum(rng.randint(-3, 3) * m for m in rng.sample(monomials, 3))
        reduced = reduce_coef(from_expr(p), UNIT_N)
        assert reduce_coef(from_expr(sp.expand(p + q * f)), UNIT_N).identical(reduced)
        s, u = sp.Rational(rng.randint(-5, 5), 7), sp.Rational(rng.randint(1, 5), 3)
        d = 1 + s**2 + u**2
        point = {n1: 2 * s / d, n2: 2 * u / d, n3: (1 - s**2 - u**2) / d, x[1]: 3, theta: 5}
        assert sp.simplify((reduced.to_expr() - p).subs(point)) == 0


# ---------------------------------------------------------------------------
# Trig conditions, angles and deciding nonzero remainders


def test_conditions_on_an_angle_reach_its_multiples_and_halves():
    # cos θ = 0: cos^2(θ/2) = (1 + cos θ)/2 = 1/2 (half-angle formula, A&S 4.3.20, from memory)
    assert simplify_scalar(sp.cos(theta / 2) ** 2, [sp.cos(theta)]) == sp.Rational(1, 2)
    # sin 2θ = 2 sin θ cos θ = 0 (A&S 4.3.24, from memory)
    assert holds(sp.sin(2 * theta), [sp.cos(theta)]) is True
    # cos θ/2 = 1/3: cos θ = 2 cos^2(θ/2) - 1 = -7/9
    assert simplify_scalar(sp.cos(theta), [sp.cos(theta / 2) - sp.Rational(1, 3)]) == sp.Rational(-7, 9)


def test_a_fixed_angle_is_substituted_into_trig():
    # cos(π/3) = 1/2, sin(π/3) = √3/2 (common practice)
    cond = [theta - sp.pi / 3]
    assert holds(sp.cos(theta) - sp.Rational(1, 2), cond) is True
    assert holds(sp.sin(theta) - sp.sqrt(3) / 2, cond) is True
    assert holds(sp.cos(theta) - sp.Rational(1, 2)) is False


def test_decide_needs_a_witness_to_say_false():
    cs = ConditionSet.of(UNIT_N)
    assert cs.decide(from_expr(n1 - sp.Rational(1, 2))) is False  # n = e2 is on the sphere
    assert cs.decide(from_expr(n1**2 + n2**2 + n3**2 - 1)) is True
    # cos^2 θ = 1/2 allows cos θ = -√2/2 (θ = 3π/4), so cos θ = √2/2 is not a consequence
    half = ConditionSet.of([sp.cos(theta) ** 2 - sp.Rational(1, 2)])
    assert half.decide(from_expr(sp.cos(theta) - sp.sqrt(2) / 2)) is False


def test_decide_proves_what_only_the_radical_contains():
    # cos θ = 1 forces sin θ = 0 (sin^2 θ = 1 - cos^2 θ = 0), though sin θ itself is no
    # multiple of the conditions: the remainder is nonzero, the Rabinowitsch test proves it.
    cs = ConditionSet.of([sp.cos(theta) - 1])
    assert not cs.reduce(from_expr(sp.sin(theta))).is_zero()
    assert cs.decide(from_expr(sp.sin(theta))) is True
    assert ConditionSet.of([t**2]).decide(from_expr(t)) is True


# ---------------------------------------------------------------------------
# Mechanics: the order, the cache, the budget


def test_flint_degrevlex_is_sympy_grevlex():
    # The reduction runs in flint; the basis comes from sympy: both must use one order.
    ctx = flint.fmpq_mpoly_ctx.get(("p", "q", "r"), "degrevlex")
    rng = random.Random(3)
    for _ in range(200):
        u = tuple(rng.randint(0, 3) for _ in range(3))
        v = tuple(rng.randint(0, 3) for _ in range(3))
        if u == v:
            continue
        leading = tuple(ctx.from_dict({u: 1, v: 1}).monoms()[0])
        assert leading == max(u, v, key=grevlex)


def test_unit_vector_basis_eliminates_n1_squared():
    cs = ConditionSet.of(UNIT_N)
    assert cs.basis_exprs() == [n1**2 + n2**2 + n3**2 - 1]
    assert ConditionSet.of(UNIT_N) is cs  # cached by the tuple of conditions


def test_budget_is_checked_while_building_a_basis():
    with pytest.raises(BudgetExceeded):
        ConditionSet([t**3 - t - 1, t * sp.Symbol("w", real=True) - 2], Budget(0.0))

"""Coefficient simplification: the one place where relations between generators apply.

Policy, cheapest first:
1. Exact arithmetic in the coefficient domain already expands and cancels (gcd) for free.
2. ``reduce_coef``: a canonical form modulo the relations of the generators —
   every trigonometric family cos(q u), sin(q u) is written over its base angle g u and
   sin^2 -> 1 - cos^2; a radical r = b^(1/n) has r^n -> b.  Zero in this form is zero.
3. Side conditions (unit vectors, `given` lists) reduce further modulo a Gröbner basis
   (gacalc.simplify.conditions).  Ranges among them (`t > 0`, `scalar a in (0, pi)`)
   rewrite abs, sign, atan2, acos, asin and log where a proved sign allows it
   (gacalc.simplify.ranges); the result is reduced again.
4. ``display_coef``: for printing, products of half angles are merged back into full
   angles (cos^2(t/2) - sin^2(t/2) -> cos t) whenever that is not longer.
Every call runs under a time budget; when it runs out the correct but unsimplified value
comes back marked ``complete=False``.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from gacalc.lazy import sympy

from gacalc.algebra.coefficients import Coef, from_expr
from gacalc.algebra.context import Simplifier, install_simplifier
from gacalc.algebra.multivector import Multivector

from .angles import ANGLE_SECONDS
from .budget import Budget, BudgetExceeded, time_limit
from .decision import (NONZERO, OUT_OF_TIME, ZERO, Decision, combine, nonzero_at,
                       opaque_reason, sample_points, undecided)
from .exact_values import _exact_atan2, _exact_square_root
from .ranges import ranges_of, split_conditions
from .relations import has_opaque_generators, reduce_poly_relations, shortest_display

DEFAULT_BUDGET = 10.0  # seconds per simplification call


@dataclass
class SimplifyResult:
    value: Multivector
    complete: bool = True
    used_conditions: tuple = field(default_factory=tuple)
    message: str = ""


def _conditions_reducer(conditions):
    if not conditions:
        return None
    from .conditions import ConditionSet

    return ConditionSet.of(conditions)


def reduce_coef(coef: Coef, conditions=None, budget: Budget | None = None) -> Coef:
    """Canonical form of a coefficient modulo the generator relations (and conditions)."""
    if coef is None or coef.expr is not None:
        return coef
    equations, _ = split_conditions(conditions)
    out = _reduce_equations(coef, equations, budget)
    ranges = ranges_of(conditions)
    if ranges:
        refined = ranges.refine_coef(out)
        if refined is not out:
            out = _reduce_equations(refined, equations, budget)
    return out


def _reduce_equations(coef: Coef, conditions, budget) -> Coef:
    if coef is None or coef.expr is not None:
        return coef
    num, den = coef.parts()
    reducer = _conditions_reducer(conditions)
    parts = []
    for p, other in ((num, den), (den, num)):
        if p is None:
            continue
        c = reduce_poly_relations(p, budget, companions=(other,) if other is not None else ())
        if reducer is not None:
            c = reducer.reduce(c, budget)
        parts.append(c)
    return parts[0] if len(parts) == 1 else parts[0] / parts[1]


def display_coef(coef: Coef, conditions=None, budget: Budget | None = None,
                 angle_budget: Budget | None = None) -> Coef:
    """The coefficient as it is printed; ``angle_budget`` is the share of the multiple-angle
    rewrite (one for all coefficients of a value; its own when None)."""
    c = reduce_coef(coef, conditions, budget)
    if c is None or c.expr is not None:
        return c
    num, den = c.parts()
    num = shortest_display(num, budget, angle_budget)
    if den is not None:
        return num / shortest_display(den, budget, angle_budget)
    return num


def decide_zero(coef: Coef, conditions=None, budget: Budget | None = None):
    """True if the coefficient is zero, False if it is not, None if that cannot be decided."""
    return decision_of_zero(coef, conditions, budget).verdict


def decision_of_zero(coef: Coef, conditions=None, budget: Budget | None = None) -> Decision:
    """The verdict of decide_zero with its grounds: a witness point for a False found
    numerically, the method's limit (or the budget) for an undecided one."""
    if coef is None:
        return ZERO
    equations, _ = split_conditions(conditions)
    ranges = ranges_of(conditions)
    if coef.expr is not None:
        value = sympy.simplify(coef.expr)
        if value == 0:
            return ZERO
        if value.is_number:
            return NONZERO
        return _decide_by_points(value, budget, ranges, equations)
    c = reduce_coef(coef, conditions, budget)
    if c.is_zero():
        return ZERO
    if equations:
        # a nonzero remainder only says "not in the ideal"; decide looks for a real witness
        verdict = _conditions_reducer(equations).decide(c, budget)
        if verdict is False and ranges and not _ranges_apart(c, equations, ranges):
            # the witness point may lie outside the ranges
            return undecided("a point where L - R is not zero satisfies the equations, "
                             "but it may lie outside the declared ranges")
        if verdict is None:
            return undecided("L - R does not reduce to zero modulo the side conditions, and "
                             "no real point on them was found where it is not zero")
        return Decision(verdict)
    if c.is_constant():
        return NONZERO
    if not has_opaque_generators(c):
        # symbols and trig families are algebraically independent once reduced (and a
        # nonzero analytic function does not vanish on a whole open range either)
        return NONZERO
    den = c.parts()[1]
    return _decide_by_points(Coef(c.num).to_expr(), budget, ranges,
                             denominator=None if den is None else Coef(den).to_expr())


def _ranges_apart(c: Coef, equations, ranges) -> bool:
    """Whether a real witness on the equations (some values of every symbol) carries
    over into the ranges: the ranged symbols appear in no equation, each range is an
    interval with an inside (and none relates several symbols), and c depends on them only
    through the symbols themselves and cos and sin of polynomials in them.  Then, with the
    other symbols held at the witness, c is a nonzero function of the ranged ones that is
    analytic everywhere, so it cannot vanish on the whole open box (identity theorem): it
    is nonzero at some point inside the ranges too.
    (n unit and t in (0, pi): cos(t/2) is not zero.)"""
    from gacalc.algebra.coefficients import generators_of

    if any(len(fact.free_symbols) > 1 for fact in ranges.facts):
        return False                      # a + b > 0: not a box
    ranged = set(ranges.box)
    for lo, hi, _, _ in ranges.box.values():
        if (hi - lo).is_positive is not True:
            return False
    if any(e.free_symbols & ranged for e in equations):
        return False
    if has_opaque_generators(c):
        return False                      # cos(t) beside cos(t/2): not independent
    for info in generators_of(c):
        if not info.expr.free_symbols & ranged:
            continue
        if info.kind == "symbol":
            continue
        if info.kind in ("cos", "sin") and info.trig[1].is_polynomial():
            continue              # cos(q u) with u a polynomial: analytic everywhere
        return False              # abs(t), sqrt(t), cos(atan2(...)): maybe not analytic
    return True


def _decide_by_points(expr, budget, ranges=None, equations=(), denominator=None):
    """Generators with hidden relations (abs, exp, nested roots): a numeric witness at
    exact rational points (inside the ranges, when there are any), then sympy."""
    if not equations:     # a point off the equations' set proves nothing
        free = sorted(expr.free_symbols, key=str)
        point = nonzero_at(expr, sample_points(free, ranges), budget, denominator)
        if point is not None:
            return Decision(False, witness=tuple((s, point[s]) for s in free))
    try:
        if budget is not None:
            budget.check()
        if sympy.simplify(expr) == 0:
            return ZERO
    except BudgetExceeded:
        return OUT_OF_TIME
    if equations:
        return undecided("L - R has coefficients sympy could not simplify to zero under "
                         "the side conditions")
    return undecided(opaque_reason(expr, ranges))


def is_zero(mv: Multivector, conditions=(), budget=None):
    """True / False / None (undecided) for 'this multivector vanishes'."""
    return decide(mv, conditions, budget).verdict


def decide(mv: Multivector, conditions=(), budget=None) -> Decision:
    """is_zero with its grounds (gacalc.simplify.decision.Decision)."""
    if mv.is_zero():
        return ZERO         # exactly zero (a check that holds): no alarm to arm
    budget = _as_budget(budget)
    try:
        with time_limit(budget):
            return combine(decision_of_zero(c, conditions, budget)
                           for c in mv.coefs() if c is not None)
    except BudgetExceeded:
        return OUT_OF_TIME


def simplify(mv: Multivector, conditions=(), budget=None) -> SimplifyResult:
    """The multivector with each coefficient in its display form."""
    budget = _as_budget(budget)
    try:
        with time_limit(budget):
            angle_budget = budget.within(ANGLE_SECONDS)   # shared by the components
            coefs = [display_coef(c, conditions, budget, angle_budget) for c in mv.coefs()]
    except BudgetExceeded:
        return SimplifyResult(mv, complete=False, message="simplification gave up within its time budget")
    return SimplifyResult(Multivector.from_coefs(coefs), True, tuple(conditions or ()))


def simplify_scalar(expr, conditions=(), budget=None):
    """A sympy scalar through the same policy; returns a sympy Expr."""
    result = simplify(Multivector({0: expr}), conditions, budget)
    return result.value[0]


def _as_budget(budget):
    if isinstance(budget, Budget):
        return budget
    return Budget(DEFAULT_BUDGET if budget is None else float(budget))


class StandardSimplifier(Simplifier):
    """This package's policy behind the hooks of gacalc.algebra.context."""

    def reduce(self, coef):
        return reduce_coef(coef)

    def decide_zero(self, coef):
        return decide_zero(coef)

    def is_zero(self, mv, conditions=()):
        return is_zero(mv, conditions)

    def simplify(self, mv, conditions=()):
        return simplify(mv, conditions).value

    def exact_square_root(self, base):
        return _exact_square_root(base)

    def exact_atan2(self, y, x):
        return _exact_atan2(y, x)


# Importing the simplifier installs it: every algebra context without hooks of its own uses it.
install_simplifier(StandardSimplifier())


__all__ = [
    "SimplifyResult", "simplify", "is_zero", "simplify_scalar", "reduce_coef", "display_coef",
    "decide_zero", "decide", "decision_of_zero", "Decision", "Budget", "BudgetExceeded", "DEFAULT_BUDGET", "StandardSimplifier", "from_expr",
]

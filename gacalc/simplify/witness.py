"""Real witness points on the set where side conditions hold.

A nonzero remainder modulo the conditions only says "not in the ideal".  A polynomial is
shown nonzero on the condition set by a point where every condition holds to 45 digits
(Newton's method with a damped minimum-norm step, in mpmath) and the polynomial clearly
does not vanish.
"""

from __future__ import annotations

import random

import mpmath
import sympy
from sympy.core.function import AppliedUndef

from gacalc.algebra.coefficients import Coef, from_expr, registry


class _OutsideDomain(Exception):
    """The point leaves the real domain (even root of a negative number, complex value)."""


class Witness:
    """Real points where the conditions hold (Newton with a damped minimum-norm step, mpmath)."""

    DIGITS = 60
    TOLERANCE = mpmath.mpf(10) ** -45
    ITERATIONS = 80
    STARTS = 8

    def __init__(self, conditions, budget):
        self.cs = conditions
        self.budget = budget

    def decide(self, p):
        """False when a witness shows p nonzero on the set; None otherwise."""
        eqs = [Coef(q) for q in self.cs.polys]
        target_coef = Coef(p)
        unknowns = sorted(set().union(*(_free_atoms(e.to_expr()) for e in eqs)), key=str)
        others = sorted(_free_atoms(target_coef.to_expr()) - set(unknowns), key=str)
        rng = random.Random(20240601)
        with mpmath.workdps(self.DIGITS):
            for attempt in range(self.STARTS):
                if self.budget is not None:
                    self.budget.check()
                spread = 0.8 + 0.6 * attempt  # ever wider starts reach the other trig branches
                start = {s: mpmath.mpf(rng.uniform(-spread, spread)) for s in unknowns}
                fixed = {s: mpmath.mpf(rng.uniform(-1.3, 1.3)) for s in others}
                point = self._solve(eqs, unknowns, start, fixed)
                if point is None:
                    continue
                try:
                    value, scale = _evaluate(target_coef, point)
                except _OutsideDomain:
                    continue
                if abs(value) > mpmath.mpf(10) ** -25 * (1 + scale):
                    return False
        return None

    def _solve(self, eqs, unknowns, start, fixed):
        x = [start[s] for s in unknowns]
        h = mpmath.mpf(10) ** -28
        lam = mpmath.mpf(10) ** -40

        def residual(xs):
            point = dict(fixed)
            point.update(zip(unknowns, xs))
            cache = {}
            return [_evaluate(e, point, cache)[0] for e in eqs], point

        try:
            for _ in range(self.ITERATIONS):
                if self.budget is not None:
                    self.budget.check()
                F, point = residual(x)
                if max(abs(v) for v in F) < self.TOLERANCE:
                    return point
                J = mpmath.matrix(len(eqs), len(x))
                for j in range(len(x)):
                    shifted = list(x)
                    shifted[j] += h
                    Fj, _ = residual(shifted)
                    for i in range(len(eqs)):
                        J[i, j] = (Fj[i] - F[i]) / h
                JJt = J * J.T
                for i in range(len(eqs)):
                    JJt[i, i] += lam
                y = mpmath.lu_solve(JJt, mpmath.matrix(F))
                step = J.T * y
                x = [xi - step[i] for i, xi in enumerate(x)]
        except (_OutsideDomain, ZeroDivisionError, ValueError):
            return None
        return None


def _free_atoms(expr) -> set:
    """What a point must fix: the free symbols, and the values of functions of a scalar
    and of their derivatives (r1(t), diff(r1(t), t)), which are independent unknowns."""
    return expr.free_symbols | expr.atoms(AppliedUndef, sympy.Derivative, sympy.Subs)


def _evaluate(c: Coef, point: dict, cache=None):
    """(value, sum of |term values|) of a Coef's numerator at a point {Symbol: mpf}."""
    cache = {} if cache is None else cache
    num = registry().lift(c.num)
    total = mpmath.mpf(0)
    scale = mpmath.mpf(0)
    for monom, coeff in zip(num.monoms(), num.coeffs()):
        t = mpmath.mpf(int(coeff.p)) / int(coeff.q)
        for pos, e in enumerate(monom):
            if e:
                t *= _generator_value(pos, point, cache) ** int(e)
        total += t
        scale += abs(t)
    if c.den is not None:
        d, _ = _evaluate(Coef(registry().lift(c.den)), point, cache)
        if d == 0:
            raise _OutsideDomain()
        total /= d
    return total, scale


def _generator_value(pos, point, cache):
    found = cache.get(pos)
    if found is not None:
        return found
    info = registry().info(pos)
    if info.kind == "symbol":
        value = point.get(info.expr)
        if value is None:
            raise _OutsideDomain()  # a symbol the point does not fix
    elif info.kind in ("cos", "sin"):
        q, u = info.trig
        arg, _ = _evaluate(from_expr(u), point, cache)
        arg *= mpmath.mpf(int(q.p)) / int(q.q)
        value = mpmath.cos(arg) if info.kind == "cos" else mpmath.sin(arg)
    elif info.kind == "root":
        base, n = info.root
        b, _ = _evaluate(base, point, cache)
        if b < 0 and n % 2 == 0:
            raise _OutsideDomain()
        value = mpmath.root(abs(b), n) * (1 if b >= 0 else -1)
    elif info.expr in point:              # r1(t), diff(r1(t), t): an unknown of its own
        value = point[info.expr]
    else:
        subs = {s: sympy.Float(v, Witness.DIGITS) for s, v in point.items() if info.expr.has(s)}
        v = sympy.N(info.expr.subs(subs), Witness.DIGITS)
        if not v.is_number or v.is_real is False:
            raise _OutsideDomain()
        value = mpmath.mpf(sympy.Float(v, Witness.DIGITS))
    if isinstance(value, mpmath.mpc):
        raise _OutsideDomain()
    cache[pos] = value
    return value


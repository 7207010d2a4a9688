"""Ranges of scalars (``scalar a in (0, pi)``, ``assume 0 < a < pi``, ``given t > 0``) used
by the simplifier.

A range condition is a sympy relational ``expr > 0`` or ``expr >= 0``; those linear in one
symbol make a box (gacalc.algebra.signs.box_of).  On that box the functions whose value
depends on a sign are rewritten, each only when the sign is proved (signs.sign_on):

- abs(x) -> x or -x, sign(x) -> 1 or -1 (so sqrt(x^2) = abs(x) -> x);
- atan2(r sin u, r cos u) -> u for r > 0 and u in (-pi, pi];  atan2(y, x) -> atan(y/x)
  for x > 0;
- acos(cos u) -> u for u in [0, pi], asin(sin u) -> u for u in [-pi/2, pi/2];
- log(exp u) -> u, log(x y) keeps its factors apart when both are positive.

Everything else is left alone: a rewrite that cannot be proved is never made.
"""

from __future__ import annotations

from gacalc.lazy import sympy

from gacalc.algebra.coefficients import Coef, from_expr, registry, trig
from gacalc.algebra.signs import box_of, is_range, linear_interval, sign_on, within


def split_conditions(conditions):
    """(equations, ranges) of a condition tuple: ranges are the relationals."""
    equations, ranges = [], []
    for c in conditions or ():
        (ranges if is_range(c) else equations).append(c)
    return tuple(equations), tuple(ranges)


class Ranges:
    """The box of a tuple of range conditions and the rewriting it licenses."""

    def __init__(self, conditions):
        self.conditions = tuple(conditions)
        self.box = box_of(self.conditions)
        # a range on an expression of several symbols (a + b > 0) is a known sign
        self.facts = {}
        for c in self.conditions:
            expr = sympy.expand(c.lhs - c.rhs)
            if isinstance(c, sympy.StrictGreaterThan):
                self.facts[expr] = 1
                self.facts[-expr] = -1
        self._memo = {}

    def __bool__(self):
        return bool(self.box or self.facts)

    def sign(self, expr):
        expr = sympy.expand(expr) if expr.free_symbols else expr
        found = self.facts.get(expr)
        if found is not None:
            return found
        return sign_on(expr, self.box)

    def interval(self, expr):
        return linear_interval(expr, self.box)

    def sample(self, symbol, index: int):
        """A rational point inside the symbol's range (for numeric witnesses)."""
        lo, hi, _, _ = self.box.get(symbol, (-sympy.oo, sympy.oo, True, True))
        weight = sympy.Rational(7 + 3 * index, 11 + 2 * index) % 1 or sympy.Rational(1, 3)
        if lo.is_finite and hi.is_finite:
            return sympy.nsimplify(sympy.N(lo + (hi - lo) * weight, 20), rational=True)
        if lo.is_finite:
            return sympy.nsimplify(sympy.N(lo + 1 + weight, 20), rational=True)
        if hi.is_finite:
            return sympy.nsimplify(sympy.N(hi - 1 - weight, 20), rational=True)
        return sympy.Rational(7 + 3 * index, 11 + 2 * index)

    # -- rewriting ---------------------------------------------------------------------
    def refine(self, expr):
        """The sympy expression with every provable range rule applied, bottom-up."""
        if expr.is_Atom or not expr.free_symbols:
            return expr
        found = self._memo.get(expr)
        if found is not None:
            return found
        args = [self.refine(a) for a in expr.args]
        e = expr.func(*args) if any(a is not b for a, b in zip(args, expr.args)) else expr
        out = self._rule(e)
        self._memo[expr] = out
        return out

    def _rule(self, e):
        if isinstance(e, sympy.Abs):
            s = self.sign(e.args[0])
            return e.args[0] * s if s is not None else e
        if isinstance(e, sympy.sign):
            s = self.sign(e.args[0])
            return sympy.Integer(s) if s is not None else e
        if isinstance(e, sympy.atan2):
            return self._atan2(*e.args) or e
        if isinstance(e, sympy.acos) and isinstance(e.args[0], sympy.cos):
            u = e.args[0].args[0]
            interval = self.interval(u)
            if interval is not None and within(interval, 0, sympy.pi):
                return u
        if isinstance(e, sympy.asin) and isinstance(e.args[0], sympy.sin):
            u = e.args[0].args[0]
            interval = self.interval(u)
            if interval is not None and within(interval, -sympy.pi / 2, sympy.pi / 2):
                return u
        if isinstance(e, sympy.log):
            x = e.args[0]
            if isinstance(x, sympy.exp):
                return x.args[0]
            if x.is_Mul and all(self.sign(f) == 1 for f in x.args if f.free_symbols):
                return sympy.Add(*[sympy.log(f) for f in x.args])
        return e

    def _atan2(self, y, x):
        """w in (-pi, pi] when (x, y) = r (cos w, sin w), r > 0, with w linear in the
        ranged symbols: y = r sin u, x = +-r cos u gives w = u, pi - u, -u or u + pi,
        shifted by a whole turn into (-pi, pi] when the range proves where it lies."""
        for s in sorted(y.atoms(sympy.sin), key=sympy.default_sort_key):
            u = s.args[0]
            ratio = sympy.cancel(y / s)
            if ratio.has(sympy.sin(u)):
                continue
            sy = self.sign(ratio)
            if sy is None:
                continue
            if _is_zero(x - ratio * sympy.cos(u)):
                cx = sy
            elif _is_zero(x + ratio * sympy.cos(u)):
                cx = -sy
            else:
                continue
            w = {(1, 1): u, (1, -1): sympy.pi - u, (-1, 1): -u, (-1, -1): u + sympy.pi}[(sy, cx)]
            for k in (0, -1, 1, -2, 2):
                shifted = w + 2 * k * sympy.pi
                interval = self.interval(shifted)
                if interval is not None and within(interval, -sympy.pi, sympy.pi,
                                                   low_closed=False):
                    return shifted
        if self.sign(x) == 1:
            return sympy.atan(y / x)
        return None

    def refine_coef(self, c: Coef) -> Coef:
        """The coefficient with its range-dependent generators rewritten (or c itself)."""
        if c is None or c.expr is not None:
            return c
        num, den = c.parts()
        images = {}
        for p in (num, den):
            if p is None:
                continue
            for pos, degree in enumerate(registry().lift(p).degrees()):
                if degree == 0 or pos in images:
                    continue
                info = registry().info(pos)
                if info.kind == "symbol" or not info.expr.free_symbols:
                    continue
                if not info.expr.free_symbols & (set(self.box) | _fact_symbols(self.facts)):
                    continue
                if info.kind in ("cos", "sin"):
                    q, u = info.trig     # cos(q u) with u = atan2(...): refine the angle
                    new_u = self.refine(u)
                    if new_u != u:
                        images[pos] = trig(info.kind, q * new_u)
                    continue
                new = self.refine(info.expr)
                if new != info.expr:
                    images[pos] = from_expr(new)
        if not images:
            return c
        from .relations import substitute

        out = substitute(num, images)
        if den is not None:
            out = out / substitute(den, images)
        return out


def _fact_symbols(facts) -> set:
    out = set()
    for expr in facts:
        out |= expr.free_symbols
    return out


def _is_zero(expr) -> bool:
    from . import reduce_coef

    try:
        return reduce_coef(from_expr(expr)).is_zero()
    except (ValueError, TypeError):
        return False


def ranges_of(conditions) -> Ranges | None:
    """The Ranges of the range conditions among ``conditions`` (None when there are none)."""
    _, ranges = split_conditions(conditions)
    if not ranges:
        return None
    from gacalc.algebra.context import current

    cache = current().store("gacalc.simplify ranges", dict)
    found = cache.get(ranges)
    if found is None:
        found = Ranges(ranges)
        if len(cache) > 64:
            cache.clear()
        cache[ranges] = found
    return found

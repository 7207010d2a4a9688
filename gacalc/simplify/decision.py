"""Deciding "is this zero?" honestly: the verdict, and when there is none, why.

A verdict is True (zero), False (not zero) or None (not decided).  An undecided answer
says whether the time budget ran out or which method reached its limit, so that a check
never blames the clock for what the rules cannot do.  A False found at a point carries
that point (exact rationals), so a failed check can show where the two sides differ.
"""

from __future__ import annotations

from dataclasses import dataclass

from gacalc.lazy import sympy

# Sample points for symbols without a range: exact rationals of both signs and several
# sizes (a periodic or sign-dependent function is caught on some of them).
_SAMPLE_RATIONALS = ((7, 11), (-1, 1), (2, 1), (-5, 3), (1, 3), (5, 1), (-7, 2), (3, 7),
                     (-2, 9), (11, 2))
SAMPLE_POINTS = 8
FOLLOW_UP_BITS = 320      # interval precision at the sample points after the first

# Functions whose value depends on the sign (or the branch) of their argument.
# (A function, not a table: importing this module must not load sympy.)
def _sign_dependent():
    return (sympy.Abs, sympy.sign, sympy.atan2, sympy.acos, sympy.asin, sympy.log, sympy.Pow)


@dataclass(frozen=True)
class Decision:
    verdict: bool | None
    out_of_time: bool = False      # undecided because the time budget ran out
    reason: str = ""               # undecided for another reason: the method's limit
    witness: tuple = ()            # ((symbol, value), ...) where a False was found

    @property
    def point(self) -> dict:
        return dict(self.witness)


ZERO = Decision(True)
NONZERO = Decision(False)
OUT_OF_TIME = Decision(None, out_of_time=True)


def undecided(reason: str) -> Decision:
    return Decision(None, reason=reason)


def combine(decisions) -> Decision:
    """The decision for several coefficients (or differences) that must all vanish."""
    decisions = list(decisions)
    if all(d.verdict is True for d in decisions):
        return ZERO
    falses = [d for d in decisions if d.verdict is False]
    if falses:
        with_point = [d for d in falses if d.witness]
        return with_point[0] if with_point else falses[0]
    if any(d.out_of_time for d in decisions):
        return OUT_OF_TIME
    reasons = list(dict.fromkeys(d.reason for d in decisions if d.reason))
    return undecided("; ".join(reasons))


def sample_points(symbols, ranges=None, count: int | None = None):
    """Exact rational points: each symbol inside its range when it has one, otherwise from
    the table of test values; the points satisfy every range condition."""
    points = []
    for k in range(SAMPLE_POINTS if count is None else count):
        point = {}
        for i, s in enumerate(symbols):
            if ranges is not None and s in ranges.box:
                point[s] = ranges.sample(s, k + i)
            else:
                point[s] = sympy.Rational(*_SAMPLE_RATIONALS[(k + 3 * i) % len(_SAMPLE_RATIONALS)])
        if ranges is None or all(c.subs(point) is sympy.true for c in ranges.conditions):
            points.append(point)
    return points


def nonzero_at(expr, points, budget=None, denominator=None):
    """The first point where expr provably does not vanish (certified interval sign of the
    exact value), or None.  Points where a part of expr leaves the real numbers (sqrt or
    log of a negative number) lie outside its domain and are skipped: scalars are real;
    so are the points where ``denominator`` is not provably nonzero (the value of the
    whole fraction is shown there)."""
    from gacalc.algebra.signs import MAX_BITS, certified_sign

    parts = [p for p in expr.atoms(sympy.Function, sympy.Pow) if p.free_symbols]
    for index, point in enumerate(points):
        if budget is not None:
            budget.check()
        try:
            if any(p.subs(point).is_real is not True for p in parts):
                continue
            if denominator is not None and \
                    certified_sign(denominator.subs(point), FOLLOW_UP_BITS) is None:
                continue
            # the first point to full precision; at the others a value that is not zero
            # shows its sign early, so an identity that holds costs little there
            bits = MAX_BITS if index == 0 else FOLLOW_UP_BITS
            if certified_sign(expr.subs(point), bits) is not None:
                return point
        except (TypeError, ValueError, ZeroDivisionError):
            continue
    return None


def opaque_reason(expr, ranges=None) -> str:
    """Why the opaque-generator method stopped: L - R vanished at every test point, sympy
    did not prove it zero; name what the rules do not model."""
    ranged = set(ranges.box) if ranges is not None else set()
    from gacalc.algebra.spelling import input_text

    unknown_sign = []
    for f in sorted(expr.atoms(*_sign_dependent()), key=sympy.default_sort_key):
        if isinstance(f, sympy.Pow) and (f.exp.is_Integer or not f.base.free_symbols):
            continue
        free = f.free_symbols - ranged
        if free:
            unknown_sign.append((f, sorted(free, key=str)))
    tail = "no sample point tried disproves it, and no rule proves it zero"
    if unknown_sign:
        f, free = unknown_sign[0]
        names = " and ".join(input_text(s) for s in free)
        has = "has" if len(free) == 1 else "have"
        return (f"L - R has {input_text(f)} and {names} {has} no declared range "
                f"(assume {input_text(free[0])} > 0, say); {tail}")
    if not expr.free_symbols:
        return "L - R is a number too close to zero to tell its sign, and no rule proves it zero"
    functions = sorted({type(f).__name__ for f in expr.atoms(sympy.Function)})
    if functions:
        return f"L - R has {', '.join(functions)}, whose relations the rules do not model; {tail}"
    return tail


def witness_text(decision: Decision) -> str:
    """'t = -1, a = 2': the point of a False decision as input text."""
    from gacalc.algebra.spelling import input_text

    return ", ".join(f"{input_text(s)} = {input_text(v)}" for s, v in decision.witness)


__all__ = ["Decision", "ZERO", "NONZERO", "OUT_OF_TIME", "undecided", "combine",
           "sample_points", "nonzero_at", "opaque_reason", "witness_text"]

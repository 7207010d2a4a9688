"""Multiple angles and sums of angles, for display.

A reduced coefficient is a polynomial in cos x_i, sin x_i over a few angles x_i (one per
trigonometric family).  Any such polynomial is a trigonometric polynomial: a sum of
cos(k . x) and sin(k . x) over integer vectors k (product to sum, the standard
identities cos A cos B = (cos(A - B) + cos(A + B))/2 and its siblings).  When that
form, over all the families or over some of them, has fewer terms (or as many and
shorter text), it is what we print: 4 cos(a/2)^3 - 3 cos(a/2) is cos(3 a/2),
cos(p/2) cos(t/2) - sin(p/2) sin(t/2) is cos(p/2 + t/2), 2 cos(d) sin(d) is sin(2 d).

A cosine or sine of a sum of several angles cannot be an ordinary generator (the domain
splits sums by the addition theorems, so that its relations stay those of single
angles).  It is registered as a generator of kind ``angle_sum``; the simplifier expands
it back (``expand_angle_sums``) before anything else, so canonical forms and zero tests
never see it, and text, LaTeX and code print it as the one cosine it is.
"""

from __future__ import annotations

from functools import lru_cache
from itertools import combinations

import flint
from gacalc.lazy import sympy

from gacalc.algebra.coefficients import Coef, generator, registry, trig

from .budget import Budget, BudgetExceeded

ANGLE_SUM = "angle_sum"       # the generator kind of cos/sin of a sum of angles
MAX_FAMILIES = 5              # subsets of at most this many angles are tried
MAX_SERIES_TERMS = 4000       # a product-to-sum expansion larger than this is not tried
ANGLE_SECONDS = 2.0           # the rewrite's share of one simplification's budget


# -- the relation: an angle sum is the product its addition theorem gives ------------------

def expand_angle_sums(p):
    """p (a polynomial) with every ``angle_sum`` generator expanded; a Coef, or None when
    p has none (the common case, decided from the degrees alone)."""
    p = registry().lift(p)
    images = {}
    for pos, degree in enumerate(p.degrees()):
        if degree and pos:
            info = registry().info(pos)
            if info.kind == ANGLE_SUM:
                images[pos] = trig(type(info.expr).__name__, info.expr.args[0])
    if not images:
        return None
    from .relations import substitute

    return substitute(p, images)


# -- product to sum -------------------------------------------------------------------------

def _normal(k, kind, value):
    """cos(-A) = cos A, sin(-A) = -sin A, sin 0 = 0: the key with its first nonzero entry
    positive, and the value with the sign that costs; None when the term vanishes."""
    first = next((x for x in k if x), 0)
    if first < 0:
        k = tuple(-x for x in k)
        if kind == "s":
            value = -value
    if first == 0 and kind == "s":
        return None
    return k, kind, value


def _times(series_a, series_b):
    """The product of two series {(k, kind): fmpq} (kind 'c' cos, 's' sin)."""
    out = {}

    def add(k, kind, value):
        normal = _normal(k, kind, value)
        if normal is None:
            return
        k, kind, value = normal
        total = out.get((k, kind), 0) + value
        if total:
            out[(k, kind)] = total
        else:
            out.pop((k, kind), None)

    for (ka, a), va in series_a.items():
        for (kb, b), vb in series_b.items():
            half = va * vb / 2
            plus = tuple(x + y for x, y in zip(ka, kb))
            minus = tuple(x - y for x, y in zip(ka, kb))
            if a == "c" and b == "c":      # cos A cos B
                add(minus, "c", half), add(plus, "c", half)
            elif a == "s" and b == "s":    # sin A sin B
                add(minus, "c", half), add(plus, "c", -half)
            elif a == "s":                 # sin A cos B
                add(plus, "s", half), add(minus, "s", half)
            else:                          # cos A sin B
                add(plus, "s", half), add(minus, "s", -half)
    return out


@lru_cache(maxsize=512)
def _monomial_series(n: int, slot: int, a: int, b: int):
    """cos(x)^a sin(x)^b for x the angle at ``slot`` of n, as a series."""
    unit = tuple(1 if i == slot else 0 for i in range(n))
    series = {(tuple([0] * n), "c"): flint.fmpq(1)}
    for kind, count in (("c", a), ("s", b)):
        for _ in range(count):
            series = _times(series, {(unit, kind): flint.fmpq(1)})
    return tuple(series.items())


def _series_of(exponents):
    """The product over the angles of cos^a sin^b, exponents [(a, b)] per angle."""
    n = len(exponents)
    series = {(tuple([0] * n), "c"): flint.fmpq(1)}
    for slot, (a, b) in enumerate(exponents):
        if a or b:
            series = _times(series, dict(_monomial_series(n, slot, a, b)))
            if len(series) > MAX_SERIES_TERMS:
                raise _TooLarge()
    return series


class _TooLarge(Exception):
    pass


def _trig_of(kind: str, k, angles) -> Coef:
    """cos(k . x) or sin(k . x): an ordinary generator for one angle, else an angle sum."""
    used = [(m, x) for m, x in zip(k, angles) if m]
    name = "cos" if kind == "c" else "sin"
    if len(used) == 1:
        m, x = used[0]
        return trig(name, m * x)
    angle = sympy.Add(*[m * x for m, x in used])
    sign = 1
    if angle.could_extract_minus_sign():
        angle = -angle
        sign = -1 if kind == "s" else 1
    fn = sympy.cos if kind == "c" else sympy.sin
    value = fn(angle)
    if not (isinstance(value, fn) and value.args[0].is_Add):
        return trig(name, sign * angle)  # sympy evaluated it (a shift by pi): let trig split it
    out = Coef(generator(value, ANGLE_SUM))
    return out if sign > 0 else -out


# -- the rewrite ------------------------------------------------------------------------------

def _angle_families(p):
    """[(angle x = q u, cos position, sin position)] of the symbolic families of p in reduced
    form (one angle each)."""
    from .relations import _families

    out = []
    for u, by_q in _families(p).items():
        if len(by_q) != 1 or not u.free_symbols:
            continue
        (q, kinds), = by_q.items()
        out.append((q * u, kinds.get("cos"), kinds.get("sin")))
    return out


def _worth_trying(p, families) -> bool:
    """Product to sum changes nothing when every term is at most linear in one angle."""
    positions = [[pos for pos in (c, s) if pos is not None] for _, c, s in families]
    for monom in p.monoms():
        touched = 0
        for group in positions:
            degree = sum(monom[pos] for pos in group)
            if degree > 1:
                return True
            touched += degree > 0
        if touched > 1:
            return True
    return False


def _linear_over(p, families, budget) -> dict:
    """p with the products of the chosen angles written as sums of cos(k . x), sin(k . x):
    {(k, kind): polynomial of the other factors}, zero entries dropped."""
    from .relations import _group_terms

    positions, slots = [], []
    for slot, (_, c, s) in enumerate(families):
        for pos, which in ((c, 0), (s, 1)):
            if pos is not None:
                positions.append(pos)
                slots.append((slot, which))
    collected = {}
    for key, rest in _group_terms(p, positions).items():
        budget.check()
        exponents = [[0, 0] for _ in families]
        for (slot, which), e in zip(slots, key):
            exponents[slot][which] = e
        for (k, kind), value in _series_of(exponents).items():
            term = rest * value if value != 1 else rest
            collected[(k, kind)] = collected[(k, kind)] + term if (k, kind) in collected else term
    return {key: rest for key, rest in collected.items() if not rest.is_zero()}


def _build(collected, families, budget) -> Coef:
    """The Coef of a product-to-sum form (registers the angle sums it uses)."""
    angles = [x for x, _, _ in families]
    total = Coef.constant(0)
    for (k, kind), rest in collected.items():
        budget.check()
        factor = Coef.constant(1) if not any(k) else _trig_of(kind, k, angles)
        total = total + Coef(rest) * factor
    return total


def _cost(c: Coef):
    return (len(registry().lift(c.num)), len(c.text()))


def collapse_angles(p, best: Coef, budget: Budget) -> Coef:
    """``best`` (the display form found so far for the reduced polynomial p), or p written
    over multiple angles and sums of angles when that is shorter.  Runs under ``budget``
    (the rewrite's own share); when that runs out ``best`` stands."""
    p = registry().lift(p)
    families = _angle_families(p)
    if not families or best.den is not None or not _worth_trying(p, families):
        return best
    shown = registry().lift(best.num)
    if not _worth_trying(shown, _angle_families(shown)):
        return best   # already a sum of single cosines and sines: the form this would find
    if len(families) > MAX_FAMILIES:
        families = families[:MAX_FAMILIES]
    chosen, cost = best, _cost(best)
    try:
        forms = []
        for size in range(len(families), 0, -1):
            for subset in combinations(families, size):
                budget.check()
                if not _worth_trying(p, subset):
                    continue          # product to sum would give p back
                collected = _linear_over(p, list(subset), budget)
                terms = sum(len(rest) for rest in collected.values())
                if terms <= cost[0]:      # counted before any new angle is registered
                    forms.append((terms, collected, list(subset)))
        for terms, collected, subset in sorted(forms, key=lambda f: f[0]):
            if terms > cost[0]:
                break
            candidate = _build(collected, subset, budget)
            if candidate.den is None and _cost(candidate) < cost:
                chosen, cost = candidate, _cost(candidate)
    except (_TooLarge, BudgetExceeded) as stop:
        if isinstance(stop, BudgetExceeded) and not budget.expired():
            raise  # an outer deadline, not this rewrite's own
        return best
    return chosen

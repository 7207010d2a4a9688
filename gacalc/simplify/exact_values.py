"""Exact values the coefficient domain asks for while it converts sympy input.

sqrt of a perfect square (also over half angles) and atan2 of a numeric point with a known
angle are simplification rules: they live here, and the standard simplifier
(gacalc.simplify.standard) offers them to gacalc.algebra.coefficients through its hooks.
"""

from __future__ import annotations

from flint.utils.flint_exceptions import DomainError as FlintDomainError
from gacalc.lazy import sympy

from gacalc.algebra.coefficients import Coef, from_expr, generator, generators_of, trig

from .relations import over_half_angles, sine_form
from gacalc.algebra.signs import certified_sign


def _exact_square_root(bc: Coef):
    """sqrt of a perfect square q^2 (also over half angles: 1/2 - cos(u)/2 = sin(u/2)^2):
    q itself when q is a number of known sign, else |q| (a radical of q^2).  None if
    the base is not a perfect square."""
    if bc.expr is not None:
        return None
    half = over_half_angles(bc)
    halves = [] if half is None else [half, sine_form(half.num) / (Coef(half.den) if half.den is not None else Coef.constant(1))]
    for cand in [bc, *halves]:
        if cand is None or cand.expr is not None:
            continue
        num, den = cand.parts()
        try:
            q = Coef(num.sqrt()) / (Coef(den.sqrt()) if den is not None else Coef.constant(1))
        except FlintDomainError:
            continue
        q_expr = q.to_expr()
        if not q_expr.free_symbols:
            # sqrt(q^2) = q needs q >= 0 proved: a certified sign, never a float guess
            sign = certified_sign(q_expr)
            if sign is not None:
                return q if sign > 0 else -q
            continue
        return Coef(generator(sympy.Abs(q_expr), "root", root=(bc, 2)))
    return None


def _exact_atan2(y, x):
    """atan2(k sin u, k cos u) = u for a number u in (-pi, pi) and a number k > 0, proved by
    exact arithmetic (y cos u - x sin u = 0) plus certified signs (algebra/signs.py)."""
    yc, xc = from_expr(y), from_expr(x)
    angles = {info.trig[0] * info.trig[1] for info in generators_of(yc) + generators_of(xc)
              if info.kind in ("cos", "sin")}
    shifted = {u + k * sympy.pi for u in angles for k in (-2, -1, 0, 1, 2)}
    for u in sorted(shifted, key=sympy.default_sort_key):
        # -pi < u < pi and k > 0 must be proved (certified signs), not read off floats
        if u.free_symbols or certified_sign(sympy.pi - sympy.Abs(u)) != 1:
            continue
        c, sn = trig("cos", u), trig("sin", u)
        if not _vanishes(yc * c - xc * sn):
            continue
        if certified_sign((xc * c + yc * sn).to_expr()) == 1:
            return from_expr(u)
    return None


def _vanishes(c: Coef) -> bool:
    from gacalc.simplify import decide_zero

    return decide_zero(c) is True


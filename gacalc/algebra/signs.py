"""Certified signs of real numeric expressions, by interval arithmetic (mpmath.iv).

A rule that needs a sign (sqrt(q^2) = q, atan2(k sin u, k cos u) = u, the shorter arc of
a slerp) may only use a sign that is proved.  A floating-point value is a guess: a sum
that cancels to 1e-40 looks like anything at 30 digits.  Here the expression is evaluated
as an interval that is guaranteed to contain the true value; only when the interval
lies wholly on one side of zero is the sign known.  Precision doubles up to a limit; a
number that still straddles zero (zero itself, or too close to tell) stays undecided.
"""

from __future__ import annotations

from gacalc.lazy import LazyModule, sympy

iv = LazyModule("mpmath", "iv")   # interval arithmetic, imported on first use

START_BITS = 80
MAX_BITS = 2560


class _Unsupported(Exception):
    """A part of the expression this evaluator does not handle (the sign stays unknown)."""


def certified_sign(expr, max_bits: int = MAX_BITS):
    """+1 or -1 when the sign of the real number ``expr`` is proved, else None.

    None also for zero, for symbols and for functions this module cannot enclose."""
    if isinstance(expr, int):
        expr = sympy.Integer(expr)
    if not isinstance(expr, sympy.Basic) or expr.free_symbols:
        return None
    if expr.is_Rational:
        return 1 if expr > 0 else (-1 if expr < 0 else None)
    bits = START_BITS
    while bits <= max_bits:
        try:
            box = _enclose_at(expr, bits)
        except (_Unsupported, ZeroDivisionError, ValueError, TypeError, OverflowError):
            return None
        sign = _enclosure_sign(box)
        if sign is not None:
            return sign
        bits *= 2
    return None


def _enclosure_sign(box):
    """+1 or -1 when the interval lies on one side of zero, else None."""
    if box is None:
        return None
    return 1 if box.a > 0 else -1 if box.b < 0 else None


def is_certified_positive(expr) -> bool:
    return certified_sign(expr) == 1


def is_certified_negative(expr) -> bool:
    return certified_sign(expr) == -1


def _enclose_at(expr, bits):
    old = iv.prec
    iv.prec = bits
    try:
        return _enclose(expr, {})
    finally:
        iv.prec = old


def _enclose(e, memo):
    got = memo.get(e)
    if got is not None:
        return got
    out = _enclose_new(e, memo)
    memo[e] = out
    return out


def _enclose_new(e, memo):
    if e.is_Integer:
        return iv.mpf(int(e))
    if e.is_Rational:
        return iv.mpf(int(e.p)) / iv.mpf(int(e.q))
    if e.is_Float:
        return iv.mpf(sympy.Rational(e).p) / iv.mpf(sympy.Rational(e).q)
    if e is sympy.pi:
        return iv.pi
    if e is sympy.E:
        return iv.e
    if e.is_Add:
        total = iv.mpf(0)
        for a in e.args:
            total = total + _enclose(a, memo)
        return total
    if e.is_Mul:
        total = iv.mpf(1)
        for a in e.args:
            total = total * _enclose(a, memo)
        return total
    if e.is_Pow:
        return _power(e, memo)
    if isinstance(e, sympy.cos):
        return iv.cos(_enclose(e.args[0], memo))
    if isinstance(e, sympy.sin):
        return iv.sin(_enclose(e.args[0], memo))
    if isinstance(e, sympy.tan):
        x = _enclose(e.args[0], memo)
        return iv.sin(x) / iv.cos(x)
    if isinstance(e, sympy.atan):
        return iv.atan2(_enclose(e.args[0], memo), iv.mpf(1))
    if isinstance(e, sympy.atan2):
        y, x = (_enclose(a, memo) for a in e.args)
        if x.a <= 0 and y.a <= 0 <= y.b:
            raise _Unsupported("atan2 across its branch cut")
        return iv.atan2(y, x)
    if isinstance(e, sympy.exp):
        return iv.exp(_enclose(e.args[0], memo))
    if isinstance(e, sympy.log):
        x = _enclose(e.args[0], memo)
        if x.a <= 0:
            raise _Unsupported("log of a value that may be <= 0")
        return iv.log(x)
    if isinstance(e, sympy.Abs):
        x = _enclose(e.args[0], memo)
        if x.a >= 0:
            return x
        if x.b <= 0:
            return -x
        return iv.mpf([0, max(-x.a, x.b)])
    if isinstance(e, (sympy.cosh, sympy.sinh)):
        x = _enclose(e.args[0], memo)
        p, m = iv.exp(x), iv.exp(-x)
        return (p + m) / 2 if isinstance(e, sympy.cosh) else (p - m) / 2
    raise _Unsupported(type(e).__name__)


def _power(e, memo):
    base, expo = e.args
    x = _enclose(base, memo)
    if expo.is_Integer:
        n = int(expo)
        if n < 0:
            x = 1 / x
            n = -n
        out = iv.mpf(1)
        square = x
        while n:  # repeated squaring; the even powers of an interval around 0 stay >= 0
            if n & 1:
                out = out * square
            n >>= 1
            if n:
                square = _square(square)
        return out
    if expo.is_Rational:
        if x.a <= 0:
            raise _Unsupported("a root of a value that may be <= 0")
        if expo == sympy.Rational(1, 2):
            return iv.sqrt(x)
        if expo == sympy.Rational(-1, 2):
            return 1 / iv.sqrt(x)
        return iv.exp(iv.log(x) * (iv.mpf(int(expo.p)) / iv.mpf(int(expo.q))))
    if x.a <= 0:
        raise _Unsupported("a real power of a value that may be <= 0")
    return iv.exp(iv.log(x) * _enclose(expo, memo))


def _square(x):
    if x.a >= 0 or x.b <= 0:
        return x * x
    top = max(-x.a, x.b)
    return iv.mpf([0, top * top])


# ---------------------------------------------------------------------------
# Signs on a box of ranges (scalar a in (0, pi), assume t > 0)
#
# A box maps each ranged symbol to (low, high, low_open, high_open); low and high are
# sympy numbers or -oo/oo.  ``sign_on`` proves a strict sign at every point of the box:
# by structure first (a symbol's own range, products, powers, sin and cos of an argument
# linear in the symbols, whose interval lies between two zeros), then by interval
# arithmetic on the closed box (a strict sign there holds on the open box as well).


def box_of(conditions) -> dict:
    """The box of the range conditions among ``conditions`` (sympy relationals
    ``expr > 0`` or ``expr >= 0`` with expr linear in one symbol); others are ignored."""
    box = {}
    for condition in conditions or ():
        bound = _bound_of(condition)
        if bound is None:
            continue
        symbol, low, high, low_open, high_open = bound
        old = box.get(symbol, (-sympy.oo, sympy.oo, True, True))
        lo, lo_open = _tighter(old[0], old[2], low, low_open, larger=True)
        hi, hi_open = _tighter(old[1], old[3], high, high_open, larger=False)
        box[symbol] = (lo, hi, lo_open, hi_open)
    return box


def is_range(condition) -> bool:
    return isinstance(condition, (sympy.StrictGreaterThan, sympy.GreaterThan))


def _bound_of(condition):
    if not is_range(condition):
        return None
    expr = condition.lhs - condition.rhs
    strict = isinstance(condition, sympy.StrictGreaterThan)
    symbols = expr.free_symbols
    if len(symbols) != 1:
        return None
    (x,) = symbols
    poly = sympy.Poly(expr, x) if expr.is_polynomial(x) else None
    if poly is None or poly.degree() != 1:
        return None
    c1, c0 = poly.all_coeffs()
    if c1.free_symbols or c0.free_symbols:
        return None
    edge = -c0 / c1
    s = certified_sign(c1)
    if s == 1:        # c1 x + c0 > 0: x > edge
        return x, edge, sympy.oo, strict, True
    if s == -1:       # x < edge
        return x, -sympy.oo, edge, True, strict
    return None


def _tighter(a, a_open, b, b_open, larger):
    """The tighter of two lower (larger=True) or upper bounds."""
    if a in (sympy.oo, -sympy.oo):
        return (b, b_open) if b not in (sympy.oo, -sympy.oo) else (a, a_open)
    if b in (sympy.oo, -sympy.oo):
        return a, a_open
    d = _difference_sign(b, a)
    if d == 0:
        return a, a_open or b_open
    if d is None:
        return a, a_open
    if (d > 0) == larger:
        return b, b_open
    return a, a_open


def _difference_sign(a, b):
    """0 when a = b exactly, +1 / -1 when a - b has that proved sign, else None."""
    d = sympy.simplify(a - b)
    if d == 0:
        return 0
    return certified_sign(d)


def _at_most(a, b, strict_ok: bool) -> bool:
    """a <= b proved (a = b allowed only when ``strict_ok``: an open end meets the edge)."""
    if a == -sympy.oo or b == sympy.oo:
        return True        # an infinite end is open: it stays inside an unbounded zone
    if a in (sympy.oo, -sympy.oo) or b in (sympy.oo, -sympy.oo):
        return False
    d = _difference_sign(b, a)
    return d == 1 or (d == 0 and strict_ok)


def linear_interval(expr, box):
    """(low, high, low_open, high_open) of an expression linear in boxed symbols with
    numeric coefficients, or None."""
    expr = sympy.expand(expr)
    low, high = sympy.Integer(0), sympy.Integer(0)
    low_open = high_open = False
    for term in sympy.Add.make_args(expr):
        coeff, rest = term.as_independent(*box.keys()) if box else (term, sympy.Integer(1))
        if rest == 1:
            if term.free_symbols:
                return None
            low, high = low + term, high + term
            continue
        if rest not in box or coeff.free_symbols:
            return None
        lo, hi, lo_open, hi_open = box[rest]
        s = certified_sign(coeff)
        if s is None:
            return None
        if s < 0:
            lo, hi, lo_open, hi_open = hi, lo, hi_open, lo_open
        low, high = low + coeff * lo, high + coeff * hi
        low_open, high_open = low_open or lo_open, high_open or hi_open
    return low, high, low_open, high_open


def within(interval, low, high, low_closed=True, high_closed=True) -> bool:
    """The interval lies in [low, high] (ends of that zone excluded when not closed)."""
    lo, hi, lo_open, hi_open = interval
    return _at_most(low, lo, low_closed or lo_open) and _at_most(hi, high, high_closed or hi_open)


def sign_on(expr, box) -> int | None:
    """+1 or -1 when ``expr`` has that strict sign everywhere on the box, else None."""
    if isinstance(expr, int):
        expr = sympy.Integer(expr)
    if not isinstance(expr, sympy.Basic):
        return None
    if not expr.free_symbols:
        return certified_sign(expr)
    if not box or not expr.free_symbols <= set(box):
        return None
    try:
        found = _structural_sign(expr, box)
        if found is None:
            found = _box_sign(expr, box)
    except (TypeError, ValueError, ZeroDivisionError, sympy.PolynomialError):
        return None
    return found


def _structural_sign(e, box):
    if not e.free_symbols:
        return certified_sign(e)
    if e.is_Symbol:
        interval = box[e]
        if within(interval, 0, sympy.oo, low_closed=False):
            return 1
        if within(interval, -sympy.oo, 0, high_closed=False):
            return -1
        return None
    if e.is_Mul:
        total = 1
        for a in e.args:
            s = _structural_sign(a, box)
            if s is None:
                return None
            total *= s
        return total
    if e.is_Pow:
        base, expo = e.args
        s = _structural_sign(base, box)
        if s is None or expo.free_symbols:
            return None
        if expo.is_Integer:
            return s ** (int(expo) % 2) if s < 0 else 1
        return 1 if s > 0 else None
    if isinstance(e, sympy.exp):
        return 1
    if isinstance(e, sympy.Abs):
        return 1 if _structural_sign(e.args[0], box) is not None else None
    if isinstance(e, (sympy.sin, sympy.cos)):
        interval = linear_interval(e.args[0], box)
        if interval is None:
            return None
        shift = 0 if isinstance(e, sympy.sin) else sympy.pi / 2   # cos x = sin(x + pi/2)
        lo, hi, lo_open, hi_open = interval
        lo, hi = lo + shift, hi + shift
        if lo in (sympy.oo, -sympy.oo) or hi in (sympy.oo, -sympy.oo):
            return None
        k = int(sympy.floor(sympy.N(lo / sympy.pi, 30)))
        for j in (k, k + 1, k - 1):     # the half-period between two zeros holding it
            if within((lo, hi, lo_open, hi_open), j * sympy.pi, (j + 1) * sympy.pi,
                      low_closed=False, high_closed=False):
                return 1 if j % 2 == 0 else -1
        return None
    if e.is_Add:
        signs = {_structural_sign(a, box) for a in e.args}
        if len(signs) == 1 and None not in signs:
            return signs.pop()
        return None
    return None


def _box_sign(expr, box):
    finite = all(lo not in (sympy.oo, -sympy.oo) and hi not in (sympy.oo, -sympy.oo)
                 for lo, hi, _, _ in (box[s] for s in expr.free_symbols))
    if not finite:
        return None
    bits = START_BITS
    while bits <= MAX_BITS // 4:
        old = iv.prec
        iv.prec = bits
        try:
            memo = {}
            for s in expr.free_symbols:
                lo, hi, _, _ = box[s]
                memo[s] = iv.mpf([_enclose(lo, {}).a, _enclose(hi, {}).b])
            enclosure = _enclose(expr, memo)
        except (_Unsupported, ZeroDivisionError, ValueError, TypeError, OverflowError):
            return None
        finally:
            iv.prec = old
        sign = _enclosure_sign(enclosure)
        if sign is not None:
            return sign
        bits *= 2
    return None

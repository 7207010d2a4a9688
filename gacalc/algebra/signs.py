"""Certified signs of real numeric expressions, by interval arithmetic (mpmath.iv).

A rule that needs a sign (sqrt(q^2) = q, atan2(k sin u, k cos u) = u, the shorter arc of
a slerp) may only use a sign that is proved.  A floating-point value is a guess: a sum
that cancels to 1e-40 looks like anything at 30 digits.  Here the expression is evaluated
as an interval that is guaranteed to contain the true value; only when the interval
lies wholly on one side of zero is the sign known.  Precision doubles up to a limit; a
number that still straddles zero (zero itself, or too close to tell) stays undecided.
"""

from __future__ import annotations

import sympy
from mpmath import iv

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
        if box is not None:
            if box.a > 0:
                return 1
            if box.b < 0:
                return -1
        bits *= 2
    return None


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

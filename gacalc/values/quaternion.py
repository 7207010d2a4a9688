"""Quaternions (from ``quaternion``): sympy quaternions, Hamilton's convention."""

from __future__ import annotations

from gacalc.lazy import loaded, sympy

from gacalc.language.errors import GacalcTypeError

from . import register
from .kind import ValueKind, require_number


class QuaternionKind(ValueKind):
    name = "quaternion"

    def matches(self, value) -> bool:
        return loaded("sympy") and isinstance(value, sympy.Quaternion)   # none before sympy

    def text(self, value, unicode=False, width=78, indent=0) -> str:
        from gacalc.printing.text import quaternion_input_text

        return quaternion_input_text(value, unicode)

    def scalars(self, value) -> list:
        return [value.a, value.b, value.c, value.d]

    def map_scalars(self, value, fn):
        return sympy.Quaternion(*(fn(part) for part in self.scalars(value)))

    def numeric(self, value, digits):
        from sympy import N

        return sympy.Quaternion(*(N(part, digits) for part in self.scalars(value)))

    def as_rotation(self, value):
        from gacalc.algebra.representations import from_quaternion

        return from_quaternion(value), True      # q and -q as R and -R

    def add(self, left, right, sign, span):
        return left + right if sign > 0 else left - right

    def multiply(self, left, right, span):
        return left * right

    def scale(self, value, factor):
        return sympy.Quaternion(value.a * factor, value.b * factor, value.c * factor,
                                value.d * factor)

    def power(self, evaluator, base, exponent, node):
        span = node.exponent.span
        require_number(exponent, span)
        if not exponent.is_Integer:
            raise GacalcTypeError("quaternions take integer powers", span)
        result = base ** abs(int(exponent))
        return result.inverse() if exponent < 0 else result

    def differences(self, left, right):
        from gacalc.algebra import Multivector

        if not self.matches(right):
            return None
        d = left - right
        return [Multivector.scalar(part) for part in (d.a, d.b, d.c, d.d)]

    def reassemble(self, like, differences):
        return sympy.Quaternion(*[d.scalar_part() for d in differences])

    def report(self, value, simplifier, against=None):
        from gacalc.forms.report import QUATERNION_NOTE, VALUE, Report, ReportItem

        q = tuple(simplifier.scalar(c) for c in (value.a, value.b, value.c, value.d))
        return Report("quaternion", "quaternion",
                      [ReportItem("(w, x, y, z)", q, QUATERNION_NOTE, VALUE)],
                      simplifier.complete)


QUATERNION = register(QuaternionKind())

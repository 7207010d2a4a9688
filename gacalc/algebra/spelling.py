"""The one spelling of sympy scalar expressions as gacalc input text.

Everything that writes a scalar as text goes through :class:`InputTextPrinter`: the names
of the coefficient domain's generators (which flint then prints inside polynomials), the
text of conditions, and the printing layer's scalar parts, matrix entries and notes.  It
lives in the core because generator names are made here; the printing layer adds layout
and the Unicode spelling on top and never a second set of rules.

Rules: ``^`` for powers (parenthesised unless the exponent is a plain integer or symbol),
``sqrt(x)`` for x^(1/2), ``1/x`` for negative exponents, ``abs``/``ln``/``exp(1)`` for
sympy's Abs/log/E, ``I`` for the imaginary unit (e123 in the Pauli picture), and floats in
positional notation with the digits their precision carries (the language has no exponent
syntax).  Only the term order differs between uses: generator names keep sympy's argument
order (``order="none"``, cheap and stable), displayed scalars use sympy's default order.

This module imports sympy: it is loaded when a sympy scalar is first printed.  Polynomial
text straight from flint (a rational multivector) needs only gacalc.algebra.rational_text.
"""

from __future__ import annotations

import mpmath
import sympy
from sympy.printing.str import StrPrinter


class InputTextPrinter(StrPrinter):
    """sympy's StrPrinter with gacalc's power operator, function names and numbers."""

    _renames = {"Abs": "abs", "log": "ln"}

    def _print_Pow(self, expr, rational=False):
        base, exponent = expr.args
        if exponent == sympy.Rational(1, 2):
            return f"sqrt({self._print(base)})"
        if exponent.is_Number and exponent.is_negative:
            positive = -exponent
            denominator = self._print(sympy.Pow(base, positive, evaluate=False)) \
                if positive != 1 else self.parenthesize(base, 60)
            if positive != 1 and not positive.is_Integer:
                denominator = f"({denominator})"
            return f"1/{denominator}"
        if exponent.is_Integer or (exponent.is_Atom and not exponent.is_Number):
            return f"{self.parenthesize(base, 60)}^{self._print(exponent)}"
        return f"{self.parenthesize(base, 60)}^({self._print(exponent)})"

    def _print_Function(self, expr):
        name = self._renames.get(expr.func.__name__, expr.func.__name__)
        return f"{name}({', '.join(self._print(arg) for arg in expr.args)})"

    def _print_Derivative(self, expr):
        # gacalc's own call: diff(r1(t), t), diff(r1(t), t, 2); mixed ones nest
        text = self._print(expr.expr)
        for variable, count in expr.variable_count:
            order = f", {count}" if count != 1 else ""
            text = f"diff({text}, {self._print(variable)}{order})"
        return text

    def _print_Subs(self, expr):
        # a derivative taken at a point: subs(diff(r1(t), t), t, 2*t)
        text, variables, points = expr.args
        for variable, point in zip(variables, points):
            text = f"subs({self._print(text) if not isinstance(text, str) else text}, " \
                   f"{self._print(variable)}, {self._print(point)})"
        return text

    def _print_Exp1(self, expr):
        return "exp(1)"

    def _print_ImaginaryUnit(self, expr):
        return "I"

    def _print_Float(self, expr):
        digits = max(1, int(expr._prec * 0.30103))
        return mpmath.nstr(expr._to_mpmath(expr._prec), digits, min_fixed=-30,
                           max_fixed=30, strip_zeros=True)


_PRINTERS = {order: InputTextPrinter({"order": order}) for order in ("none", None)}


def input_text(expr, order: str | None = None) -> str:
    """``expr`` as gacalc input text; ``order="none"`` keeps sympy's argument order."""
    return _PRINTERS[order].doprint(expr)

"""Multivectors of Cl(3,0), scalars included (grade-0 multivectors)."""

from __future__ import annotations

from gacalc.lazy import sympy

from gacalc.algebra import Multivector
from gacalc.language.errors import GacalcMathError, GacalcTypeError

from . import register
from .kind import ValueKind, require_number

_GRADE_NAMES = {0: "scalar", 1: "vector", 2: "bivector", 3: "trivector"}


class MultivectorKind(ValueKind):
    name = "multivector"
    block_text = False        # broken lines continue after "name = "

    def matches(self, value) -> bool:
        return isinstance(value, Multivector)

    def describe(self, value) -> str:
        grades = sorted(value.grades())
        if not grades:
            return "the zero multivector"
        if len(grades) == 1:
            return f"a {_GRADE_NAMES[grades[0]]}"
        return "a multivector of grades " + ", ".join(str(g) for g in grades)

    def text(self, value, unicode=False, width=78, indent=0) -> str:
        from gacalc.printing.text import multivector_text

        return multivector_text(value, unicode, width, indent)

    def scalars(self, value) -> list:
        return [e for _, e in value.items()]

    def map_scalars(self, value, fn):
        return value.map_coefficients(fn)

    def is_exact_constant(self, value) -> bool:
        # free_symbols reads the generators: no sympy conversion of long coefficients
        if value.free_symbols:
            return False
        return not any(c is not None and c.expr is not None and c.expr.has(sympy.Float)
                       for c in value.coefs())

    def numeric(self, value, digits):
        return value.evalf(digits)

    # Arithmetic ----------------------------------------------------------------------
    def add(self, left, right, sign, span):
        from gacalc.language import limits

        limits.check_sum(left, right, span)
        total = left + right if sign > 0 else left - right
        limits.check_terms(total, span, "this sum")
        return total

    def multiply(self, left, right, span):
        from gacalc.language import limits

        limits.check_product(left, right, span)
        return left * right

    def as_scalar(self, value):
        if value.is_scalar() or value.is_zero():
            return value.scalar_part()
        return None

    def scale(self, value, factor):
        return value * factor

    def negate(self, value):
        return -value

    def divide(self, evaluator, left, right, span):
        if right.is_zero():
            raise GacalcMathError("division by zero", span)
        if right.is_scalar():
            if self.matches(left):
                return left / right
            return evaluator.multiply(left, Multivector.scalar(1 / right.scalar_part()), span)
        if not self.matches(left):
            from . import describe

            raise GacalcTypeError(f"cannot divide {describe(left)} by a multivector", span)
        return evaluator.multiply(left, self.inverse(evaluator, right, span), span)

    def inverse(self, evaluator, value, span):
        """value^-1, noting the validity condition when it cannot be decided."""
        from gacalc.language import limits

        if value.is_zero():
            raise GacalcMathError("division by zero: 0 has no inverse", span)
        if not value.is_scalar():
            # A^-1 = conj(A) (a - b I) / (a^2 + b^2) with a + b I = A conj(A)
            limits.check_chain([value, value, value, value], span, "this inverse")
        from .kind import inverse_with_note

        return inverse_with_note(evaluator, value, span)

    def power(self, evaluator, base, exponent, node):
        import sympy

        from gacalc.language import limits
        from gacalc.language.evaluator import check_finite, check_result_digits

        span = node.exponent.span
        if base.is_scalar() or base.is_zero():
            if exponent.is_Integer and abs(exponent) >= 2:
                limits.check_power(base, abs(int(exponent)), node.span)
            scalar_base = base.scalar_part()
            check_result_digits(scalar_base, exponent, node.span)
            if scalar_base == 0 and exponent.is_negative:
                raise GacalcMathError("division by zero: 0 to a negative power", node.span)
            result = sympy.Pow(scalar_base, exponent)
            check_finite(result, node.span)
            return Multivector.scalar(result)
        require_number(exponent, span)
        if exponent.is_Integer:
            return super().power(evaluator, base, exponent, node)
        if base.grades() <= {0, 2}:
            from gacalc.algebra import rotors

            conditions = tuple(c.expr for c in evaluator.active_conditions([base]))
            return rotors.power(base, exponent, conditions)
        raise GacalcTypeError("a fractional power needs a rotor (an even multivector)",
                              node.base.span)

    # Conditions, comparison ------------------------------------------------------------
    def symbols(self, value) -> frozenset:
        return frozenset(value.free_symbols)

    def simplify(self, value, conditions, budget):
        from gacalc.simplify import simplify

        outcome = simplify(value, conditions, budget)
        return outcome.value, outcome.complete

    def as_rotation(self, value):
        return value, False

    def differences(self, left, right):
        if not self.matches(right):
            return None
        return [left - right]

    def reassemble(self, like, differences):
        return differences[0]

    # show, limits ----------------------------------------------------------------------
    def report(self, value, simplifier, against=None):
        from gacalc.forms.report import multivector_report

        return multivector_report(value, simplifier, against)

    def report_lines(self, value, unicode, width):
        return self.text(value, unicode, width - 2).split("\n")

    def latex(self, value):
        from gacalc.export import latex_of

        return latex_of(value, options={"aligned": False})

    def size(self, value):
        from gacalc.language.limits import size_of

        return size_of(value)


MULTIVECTOR = register(MultivectorKind())

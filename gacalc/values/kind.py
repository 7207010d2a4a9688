"""The value protocol: what a kind of value offers the language.

Binary operations are asked of the left operand's kind when both operands are of the
same kind; otherwise a scalar on either side scales the other value.  A method that
returns None means "not defined for these values": the evaluator then reports it in
words ("cannot add a 2x2 matrix to a vector").  Methods that need the evaluator (for
notes, the side conditions in force, or other operations) receive it.
"""

from __future__ import annotations

from gacalc.language.errors import GacalcTypeError


class ValueKind:
    name = "value"             # as in "a value"
    block_text = True          # an assignment puts multi-line text below "name ="

    # Identity and description ----------------------------------------------------------
    def matches(self, value) -> bool:
        raise NotImplementedError

    def describe(self, value) -> str:
        return f"a {self.name}"

    # Text --------------------------------------------------------------------------------
    def text(self, value, unicode: bool = False, width: int = 78, indent: int = 0) -> str:
        raise NotImplementedError

    # Arithmetic ----------------------------------------------------------------------------
    def add(self, left, right, sign: int, span):
        """left + right (sign 1) or left - right (sign -1), both of this kind."""
        return None

    def multiply(self, left, right, span):
        """left * right, both of this kind."""
        return None

    def act_on(self, evaluator, left, right, span):
        """left * right for a right operand of another kind, asked of the kind of left
        before any scaling (a linear map applied to a multivector); None: not defined."""
        return None

    def as_scalar(self, value):
        """The value as a sympy scalar when it is one (it then scales other kinds)."""
        return None

    def scale(self, value, factor):
        """value times a sympy scalar."""
        return None

    def negate(self, value):
        return self.scale(value, -1)

    def divide(self, evaluator, left, right, span):
        """left / right, asked of the kind of right."""
        raise GacalcTypeError(f"cannot divide by {self.describe(right)}", span)

    def inverse(self, evaluator, value, span):
        raise GacalcTypeError(f"cannot invert {self.describe(value)}", span)

    def power(self, evaluator, base, exponent, node):
        """base^exponent for a sympy exponent already checked against the size limits."""
        span = node.exponent.span
        require_number(exponent, span)
        if not exponent.is_Integer:
            raise GacalcTypeError(f"{self.describe(base)} takes integer powers only", span)
        n = int(exponent)
        if n < 0:
            base, n = evaluator.inverse(base, node.span), -n
        return evaluator.integer_power(base, n, node.span)

    # Indexing ------------------------------------------------------------------------------
    def index(self, evaluator, value, indices, spans):
        """value[indices...]: ``indices`` are evaluated values, ``spans`` the index texts'
        spans followed by the whole expression's."""
        raise GacalcTypeError(f"cannot index {self.describe(value)}: only lists (and "
                              "matrices) take X[k]", spans[-1])

    # Side conditions, simplification, comparison ------------------------------------------
    def symbols(self, value) -> frozenset:
        return frozenset()

    def simplify(self, value, conditions, budget):
        """(value, complete) under side conditions (sympy Exprs equal to zero)."""
        return value, True

    def as_rotation(self, value):
        """(the even multivector that turns vectors as the value does, whether the value
        is a quaternion) for ``check ... as rotation``; None: this kind is no rotation."""
        return None

    def differences(self, left, right):
        """left - right as a list of multivectors that are all zero when the two are
        equal; None when the values cannot be compared."""
        return None

    def reassemble(self, like, differences):
        """The differences back in the shape of ``like`` (to show a failed check)."""
        raise NotImplementedError

    # Numbers ------------------------------------------------------------------------------
    def scalars(self, value) -> list:
        """The sympy scalars the value is made of (components, entries)."""
        return []

    def is_exact_constant(self, value) -> bool:
        """True when the value is exact and free of symbols (it has a numeric value)."""
        import sympy

        return not any(e.free_symbols or e.has(sympy.Float) for e in self.scalars(value))

    def numeric(self, value, digits: int):
        """The floating-point approximation of the value to ``digits`` digits, or None."""
        return None

    def map_scalars(self, value, fn):
        """The value with ``fn`` applied to each sympy scalar it is made of (subs uses
        it), or None when the kind has no scalars to map."""
        return None

    # show, emit, limits -------------------------------------------------------------------
    def report(self, value, simplifier, against=None):
        """The derived-forms report (gacalc.forms.report.Report): by default the value."""
        from gacalc.forms.report import VALUE, Report, ReportItem

        return Report(self.name, self.name, [ReportItem("value", value, section=VALUE)],
                      simplifier.complete)

    def report_lines(self, value, unicode: bool, width: int) -> list:
        """The value as lines of a show report (``# `` starts a display line that is
        not input)."""
        return ["# " + line for line in self.text(value, unicode, width - 2).split("\n")]

    def latex(self, value) -> str:
        """The value in a LaTeX report."""
        from gacalc.export import latex_of

        return latex_of(self.export(value))

    def export(self, value):
        """What gacalc.export.emit receives for this value."""
        return value

    def size(self, value):
        """A gacalc.language.limits.Size, or None when the value is always small."""
        return None


def require_number(exponent, span):
    if not exponent.is_Rational:
        raise GacalcTypeError("a multivector can only be raised to a number; symbolic "
                              "exponents are for scalars", span)


def inverse_with_note(evaluator, value, span):
    """value.inverse_with_condition(), its condition said as a note (multivectors and
    linear maps invert this way)."""
    from gacalc.algebra import NotInvertibleError
    from gacalc.language.evaluator import math_error
    from gacalc.printing.text import scalar_text

    try:
        result, condition = value.inverse_with_condition()
    except NotInvertibleError as error:
        raise math_error(error, span) from None
    if condition is not None:
        evaluator.note(f"the inverse is valid where {scalar_text(condition)} != 0", span)
    return result

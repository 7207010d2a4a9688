"""Linear maps (from ``linmap``): gacalc.algebra.outermorphism.LinearMap.

The language reading (our own design, documented in README): a linear map times a value
is the map applied to it, so ``f(X)``, ``f X`` and ``f*X`` all mean the outermorphism
f(X); two maps multiply by composition, ``(f g)(X) = f(g(X))``; a scalar times a map
scales the map; maps add and subtract entry by entry; ``f^-1`` is the inverse map.
The text is the nine entries row by row, ``linmap(2, 1, 0, 0, 3, 1, 1, 0, 4)``, which
reads back as the same map.
"""

from __future__ import annotations

from gacalc.lazy import sympy

from gacalc.algebra import Multivector
from gacalc.algebra.outermorphism import LinearMap
from gacalc.language.errors import GacalcTypeError

from . import register
from .kind import ValueKind


class LinearMapKind(ValueKind):
    name = "linear map"
    block_text = True

    def matches(self, value) -> bool:
        return isinstance(value, LinearMap)

    def text(self, value, unicode=False, width=78, indent=0) -> str:
        from gacalc.printing.text import scalar_text

        rows = [", ".join(scalar_text(value.matrix[i, j], unicode) for j in range(3))
                for i in range(3)]
        one_line = f"linmap({', '.join(rows)})"
        if len(one_line) + indent <= width:
            return one_line
        # one row per line (or one entry per line when a row is still too wide): a line
        # ending in ',' continues, so this still reads back
        if max(len(row) for row in rows) + indent + 8 > width:
            rows = [scalar_text(e, unicode) for e in value.matrix]
        return "linmap(" + ",\n       ".join(rows) + ")"

    def scalars(self, value) -> list:
        return list(value.matrix)

    def map_scalars(self, value, fn):
        return value.map_entries(fn)

    def numeric(self, value, digits):
        return value.map_entries(lambda e: sympy.N(e, digits))

    # Arithmetic --------------------------------------------------------------------------
    def add(self, left, right, sign, span):
        return left.add(right, sign)

    def multiply(self, left, right, span):
        return left.compose(right)

    def act_on(self, evaluator, left, right, span):
        """A map times a multivector: the outermorphism applied to it."""
        if isinstance(right, Multivector):
            from gacalc.language import limits

            result = left(right)
            limits.check_value(result, span, "the image under this linear map")
            return result
        return None

    def scale(self, value, factor):
        return value.scale(factor)

    def negate(self, value):
        return value.scale(-1)

    def inverse(self, evaluator, value, span):
        from .kind import inverse_with_note

        return inverse_with_note(evaluator, value, span)

    def divide(self, evaluator, left, right, span):
        raise GacalcTypeError("cannot divide by a linear map: multiply by its inverse, "
                              "f^-1", span)

    # Conditions, comparison ---------------------------------------------------------------
    def symbols(self, value) -> frozenset:
        return frozenset(value.matrix.free_symbols)

    def simplify(self, value, conditions, budget):
        from gacalc.simplify import simplify

        complete, entries = True, []
        for entry in value.matrix:
            outcome = simplify(Multivector({0: entry}), conditions, budget)
            complete = complete and outcome.complete
            entries.append(outcome.value[0])
        return LinearMap(sympy.Matrix(3, 3, entries)), complete

    def differences(self, left, right):
        if not self.matches(right):
            return None
        return [Multivector.scalar(e) for e in left.differences(right)]

    def reassemble(self, like, differences):
        return LinearMap(sympy.Matrix(3, 3, [d.scalar_part() for d in differences]))

    # show, emit ---------------------------------------------------------------------------
    def report(self, value, simplifier, against=None):
        from gacalc.algebra.outermorphism import is_orthogonal
        from gacalc.forms.report import FORMS, KIND, MEASURES, VALUE, Report, ReportItem

        f = LinearMap(simplifier.matrix(value.matrix))
        det = simplifier.scalar(f.det())
        items = [ReportItem("value", f, "columns are f(e1), f(e2), f(e3)", VALUE),
                 ReportItem("determinant", det, "f(I) = det(f) I", MEASURES)]
        orthogonal = is_orthogonal(f, simplifier.conditions)
        verdict = {True: "yes", False: "no", None: "undecided"}[orthogonal]
        note = "f^T f = 1" if orthogonal is not False or not f.matrix.free_symbols \
            else "f^T f = 1 does not hold for all values of the symbols"
        items.append(ReportItem("orthogonal", verdict, note, KIND))
        special = None
        if orthogonal is True:
            special = simplifier.zero(det - 1)
            items.append(ReportItem("special orthogonal",
                                    {True: "yes", False: "no", None: "undecided"}[special],
                                    "a rotation: orthogonal with det(f) = 1", KIND))
        if special is True:
            from gacalc.algebra.representations import from_rotation_matrix

            rotor = simplifier.mv(from_rotation_matrix(f.matrix, simplifier.conditions))
            items.append(ReportItem("rotor", rotor, "f(x) = R x R~", FORMS))
        return Report("linear map", "linear map", items, simplifier.complete)

    def report_lines(self, value, unicode, width):
        return self.text(value, unicode, width - 2).split("\n")

    def export(self, value):
        return sympy.Matrix(value.matrix)


LINMAP = register(LinearMapKind())

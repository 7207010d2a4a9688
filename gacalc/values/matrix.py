"""Matrices (from ``matrix`` and ``pauli``): sympy matrices, complex entries allowed."""

from __future__ import annotations

from gacalc.lazy import loaded, sympy

from gacalc.language.errors import GacalcMathError, GacalcTypeError

from . import register
from .kind import ValueKind, require_number


class MatrixKind(ValueKind):
    name = "matrix"

    def matches(self, value) -> bool:
        return loaded("sympy") and isinstance(value, sympy.MatrixBase)   # none before sympy

    def describe(self, value) -> str:
        return f"a {value.rows}x{value.cols} matrix"

    def text(self, value, unicode=False, width=78, indent=0) -> str:
        from gacalc.printing.text import matrix_text

        return matrix_text(value, unicode)

    def scalars(self, value) -> list:
        return list(value)

    def map_scalars(self, value, fn):
        return value.applyfunc(fn)       # complex entries too

    def symbols(self, value) -> frozenset:
        return frozenset().union(*(e.free_symbols for e in value))

    def simplify(self, value, conditions, budget):
        """Each complex entry through gacalc.simplify, real and imaginary parts apart (the
        complex a + b i as the central a + b e123, Pauli picture)."""
        from gacalc.simplify import simplify

        entries, complete = [], True
        for x in value:
            if not x.has(sympy.I):     # real entries stay as computed (as before)
                entries.append(x)
                continue
            outcome = simplify(_complex_mv(x), conditions, budget)
            complete = complete and outcome.complete
            entries.append(outcome.value.scalar_part() + sympy.I * outcome.value["e123"])
        return sympy.ImmutableMatrix(value.rows, value.cols, entries), complete

    def coerce(self, value, like):
        """A multivector where a matrix ``like`` is expected, as the representation
        allows: any multivector next to a 2x2 matrix is its Pauli matrix; a real scalar
        next to a square matrix is that multiple of the identity."""
        from gacalc.algebra import Multivector

        if not isinstance(value, Multivector) or like.rows != like.cols:
            return None
        if like.shape == (2, 2):
            from gacalc.algebra.representations import pauli

            return sympy.ImmutableMatrix(pauli(value))
        if value.is_scalar() or value.is_zero():
            return value.scalar_part() * sympy.eye(like.rows)
        return None

    def numeric(self, value, digits):
        return value.applyfunc(lambda e: sympy.N(e, digits))  # complex entries too

    def add(self, left, right, sign, span):
        if left.shape != right.shape:
            return None
        return (left + right if sign > 0 else left - right).applyfunc(sympy.expand)

    def multiply(self, left, right, span):
        if left.cols != right.rows:
            return None
        return (left * right).applyfunc(sympy.expand)

    def scale(self, value, factor):
        return value * factor

    def negate(self, value):
        return -value

    def inverse(self, evaluator, value, span):
        if value.rows != value.cols:
            return super().inverse(evaluator, value, span)
        if value.det() == 0:
            raise GacalcMathError("this matrix is not invertible (determinant 0)", span)
        return value.inv()

    def power(self, evaluator, base, exponent, node):
        span = node.exponent.span
        require_number(exponent, span)
        if not exponent.is_Integer or base.rows != base.cols:
            raise GacalcTypeError("only square matrices, to integer powers", span)
        return evaluator.inverse(base, node.span) ** int(-exponent) if exponent < 0 \
            else base ** int(exponent)

    def index(self, evaluator, value, indices, spans):
        from gacalc.algebra import Multivector

        if len(indices) != 2:
            raise GacalcTypeError(f"a matrix entry takes two indices, row and column: "
                                  f"M[1, 2], not {len(indices)}", spans[-1])
        row = evaluator.index_number(indices[0], spans[0], value.rows, "rows")
        column = evaluator.index_number(indices[1], spans[1], value.cols, "columns")
        entry = value[row - 1, column - 1]
        return _complex_mv(entry) if entry.has(sympy.I) else Multivector.scalar(entry)

    def differences(self, left, right):
        from gacalc.algebra import Multivector

        if not self.matches(right) or left.shape != right.shape:
            return None
        return [Multivector.scalar(x) if not x.has(sympy.I) else _complex_mv(x)
                for x in (left - right)]

    def reassemble(self, like, differences):
        entries = [d.scalar_part() + sympy.I * d["e123"] for d in differences]
        return sympy.Matrix(like.rows, like.cols, entries)

    def report(self, value, simplifier, against=None):
        from gacalc.forms.report import VALUE, Report, ReportItem, numeric_items

        complex_entries = any(x.has(sympy.I) for x in value)
        m = simplifier.matrix(value, complex_entries)
        return Report(f"{m.shape[0]}x{m.shape[1]} matrix", "matrix",
                      [ReportItem("value", m, section=VALUE)] + numeric_items(m),
                      simplifier.complete)

    def report_lines(self, value, unicode, width):
        from gacalc.printing.text import scalar_text

        rows = ["# " + row for row in self.text(value, unicode).split("\n")]
        if max(len(row) for row in rows) <= width:
            return rows
        # too wide for the screen: one entry per line
        return [f"#   ({i + 1},{j + 1})  {scalar_text(value[i, j], unicode)}"
                for i in range(value.rows) for j in range(value.cols)]


def _complex_mv(x):
    """A complex scalar a + b i as the central multivector a + b I (Pauli picture)."""
    from gacalc.algebra import Multivector

    re, im = sympy.expand_complex(x).as_real_imag()
    return Multivector({0: re, 7: im})


MATRIX = register(MatrixKind())

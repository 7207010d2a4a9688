"""Formulas in the report of ``show``: a "formula" item for the value, and the derived
forms (norm2, norm, inverse, reverse, dual, ...) and their conditions written as
coordinate-free formulas when gacalc.formulas finds and proves one.

The report's values stay what they are (components, for programs that read a Report);
the formulas ride along in ``ReportItem.formula`` and the renderers print them instead.
"""

from __future__ import annotations

import dataclasses

from gacalc.lazy import sympy

from gacalc.algebra.multivector import Multivector

from .report import VALUE, Report, ReportItem

ITEM_SECONDS = 2.0     # one recognition (the search budget of gacalc.formulas)


def with_formulas(report: Report, variables, others=(), conditions=(), deadline=None) -> Report:
    """The report with formulas attached where they are found (nothing changes for a value
    without declared vectors)."""
    from gacalc.formulas import recognize
    from gacalc.formulas.terms import SquareRoot
    from gacalc.simplify.budget import Budget

    deadline = deadline if deadline is not None else Budget(None)
    if not variables or "value" not in report:
        return report

    def find(value):
        if isinstance(value, sympy.Pow) and value.exp == sympy.Rational(1, 2):
            radicand, message = find(value.base)     # a magnitude: sqrt of a formula
            return (SquareRoot(radicand) if radicand is not None else None), message
        mv = _as_multivector(value)
        if mv is None or deadline.expired():
            return None, ""
        outcome = recognize(mv, variables, conditions, deadline.within(ITEM_SECONDS), others)
        return outcome.formula, outcome.message

    items = []
    norm2_formula = None
    for item in report.items:
        formula = condition_formula = None
        if item.label == "norm" and norm2_formula is not None:
            formula = SquareRoot(norm2_formula)
        elif item.label != "value":
            formula, _ = find(item.value)
        if item.condition is not None:
            condition_formula, _ = find(item.condition)
        if item.label == "norm2":
            norm2_formula = formula
        if formula is not None or condition_formula is not None:
            item = dataclasses.replace(item, formula=formula, condition_formula=condition_formula)
        items.append(item)
        if item.label == "value":
            formula, message = find(item.value)
            if formula is not None:
                items.append(ReportItem("formula", item.value, "proved equal", VALUE,
                                        formula=formula))
            else:
                items.append(ReportItem("formula", "none", message.removeprefix("no formula: "),
                                        VALUE))
    return dataclasses.replace(report, items=items)


def _as_multivector(value):
    if isinstance(value, Multivector):
        return value
    if isinstance(value, sympy.Expr) and not isinstance(value, sympy.MatrixBase):
        if value.is_number or value.has(sympy.I):
            return None
        try:
            return Multivector({0: value})
        except (ArithmeticError, ValueError, TypeError):
            return None
    return None

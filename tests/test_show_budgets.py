"""show degrades honestly: each section under its own budget, long items named with the
statement that prints them, the inverse's condition by flint.  No timed assertions: the
budgets are set to zero (deterministic) or the outcome is checked, not the time."""

import time

import pytest
import sympy

from gacalc.algebra import blade
from gacalc.algebra.multivector import _condition_text_expr
from gacalc.algebra.symbolic import symbolic
from gacalc.forms import report as report_module
from gacalc.language import Session
from gacalc.language.results import ShowResult
from gacalc.simplify.budget import Budget, BudgetExceeded, time_limit


def _show(session, text):
    result = session.run(text)[-1]
    assert isinstance(result, ShowResult), result
    return result


def test_a_section_out_of_time_is_named_with_the_statements_for_it(monkeypatch):
    monkeypatch.setattr(report_module, "SECTION_SECONDS", 1e-9)
    monkeypatch.setattr(report_module, "INVERSE_SECONDS", 1e-9)
    s = Session()
    s.run("vector a, b")
    shown = _show(s, "show a /\\ b")
    text = shown.report_text
    for section, hint in [("involutions", "rev(a /\\ b)"), ("measures", "norm2(a /\\ b)")]:
        assert f"# {section}: omitted" in text
        assert hint in text
    assert not shown.report.complete


def test_library_reports_have_no_section_limit(monkeypatch):
    # build_report without section_seconds: the result does not depend on the machine
    monkeypatch.setattr(report_module, "SECTION_SECONDS", 1e-9)
    monkeypatch.setattr(report_module, "INVERSE_SECONDS", 1e-9)
    r, _ = symbolic("rotor", "R")
    report = report_module.build_report(r)
    assert not any(item.value == "omitted" for item in report.items)


def test_long_items_are_named_but_kept_in_the_report(monkeypatch):
    monkeypatch.setattr(report_module, "ITEM_TERMS", 3)
    s = Session()
    s.run("scalar x, y")
    shown = _show(s, "show (x + y)^3 e1")
    item = shown.report.item("reverse")
    assert item.omitted and "rev((x + y)^3 e1) prints it" in item.omitted
    assert "# reverse: omitted" in shown.report_text
    # the value itself is still there for programs
    assert item.value == s.run("rev((x + y)^3 e1)")[-1].value


def test_the_general_product_reports_every_section():
    s = Session()
    s.run("multivector A, B")
    text = _show(s, "show A B").report_text
    for heading in ("value", "involutions", "measures", "classification", "forms"):
        assert f"-- {heading} " in text


def test_condition_square_free_part_agrees_with_sympy():
    # reference: sympy's sqf_part on the same numerator (the route this replaced)
    m, _ = symbolic("multivector", "M")
    product = m * m.conjugate()
    a, b = product._c[0], product._c[7]
    d = a * a + b * b
    ours = _condition_text_expr(d)
    reference = sympy.sqf_part(sympy.numer(sympy.together(d.to_expr())))
    ratio = sympy.cancel(ours / reference)
    assert ratio.is_number and ratio != 0


def test_condition_of_a_square_is_taken_once():
    v, _ = symbolic("vector", "v")
    n2 = (v * v)._c[0]
    ours = _condition_text_expr(n2 * n2)
    assert sympy.expand(ours - n2.to_expr()) == 0


def test_the_alarm_repeats_when_its_first_interruption_is_swallowed():
    caught = 0
    with pytest.raises(BudgetExceeded):
        with time_limit(Budget(0.05), repeat=0.05):
            end = time.monotonic() + 5
            while time.monotonic() < end:
                try:
                    while time.monotonic() < end:
                        pass
                except BudgetExceeded:
                    caught += 1        # swallowed once, like a broad except in sympy
                    if caught > 1:
                        raise
    assert caught >= 1


def test_a_spent_budget_runs_out_even_under_an_outer_alarm():
    with time_limit(Budget(5.0)):
        with pytest.raises(BudgetExceeded):
            with time_limit(Budget(0.0)):
                pass


@pytest.mark.parametrize("out_of_time", [True, False])
def test_an_undecided_kind_says_when_the_budget_ran_out(monkeypatch, out_of_time):
    # the report's zero tests undecided: the kind line names the budget only when it ran out
    import gacalc.simplify as simplify_module
    from gacalc.simplify.decision import OUT_OF_TIME, undecided

    s = Session()
    s.run("scalar t\nvector n unit\nR = rotor(n, t)")
    monkeypatch.setattr(simplify_module, "decide", lambda *args, **kwargs: (
        OUT_OF_TIME if out_of_time else undecided("the method's limit")))
    item = _show(s, "show R").report.item("kind")
    assert item.value == "undecided"
    assert ("within the report's time budget" in item.note) == out_of_time

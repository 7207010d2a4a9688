"""One deadline type (gacalc.simplify.budget.Budget) passed down from the statement to
the report of show and each simplification in it.  No timed assertions: budgets of
zero seconds have run out before any work starts, so the outcome is deterministic."""

import math

from gacalc.algebra import blade
from gacalc.forms import build_report
from gacalc.language import Session
from gacalc.language.results import ShowResult
from gacalc.language.watchdog import StatementClock, StatementTimeout
from gacalc.simplify.budget import Budget, BudgetExceeded


def _show(session, text):
    result = session.run(text)[-1]
    assert isinstance(result, ShowResult), result
    return result.report


def test_show_keeps_to_the_sessions_simplification_budget():
    assert _show(Session(), "show e1 + e2").complete
    # --budget 0: every simplification of the report gives up, and the report says so
    report = _show(Session(budget=0), "show e1 + e2")
    assert not report.complete
    assert report["simplification"] == "incomplete"


def test_the_report_keeps_to_the_deadline_it_is_given():
    value = blade("1") + blade("12")
    assert build_report(value).complete
    assert not build_report(value, deadline=Budget(0.0)).complete


def test_an_inner_budget_never_outlives_the_outer_one():
    outer = Budget(0.0)
    assert outer.within(100.0).remaining() <= 0
    assert Budget(None).within(5.0).seconds == 5.0
    assert math.isinf(Budget(None).remaining())
    try:
        Budget(-1.0).check()
    except BudgetExceeded:
        pass
    else:
        raise AssertionError("an expired budget must raise BudgetExceeded")


def test_the_statement_clock_is_a_budget_that_abandons_the_statement():
    clock = StatementClock()
    assert isinstance(clock, Budget)
    clock.check()                       # no deadline: nothing happens
    clock.start(-1.0)
    assert clock.expired()
    try:
        clock.check()
    except StatementTimeout:
        pass
    else:
        raise AssertionError("an expired statement clock must raise StatementTimeout")

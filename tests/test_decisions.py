"""Honest check outcomes: FAILED with a witness point where the two sides differ,
"undecided within the time budget" only when the budget ran out, otherwise the limit of
the method named (gacalc.simplify.decision)."""

from __future__ import annotations

import math

import sympy

from conftest import ok
from gacalc.language import Session
from gacalc.runner import Tally


def _check(session, text):
    return ok(session, text)[-1]


def test_abs_of_a_plain_symbol_fails_with_a_witness():
    result = _check(Session(), "check abs(t) == t")
    assert result.outcome == "fails"
    point, value = result.witness
    # the witness is checked outside gacalc: sympy evaluates |t| - t at the point
    t = sympy.Symbol("t", real=True)
    name, _, number = point.partition(" = ")
    assert name == "t"
    expected = (sympy.Abs(t) - t).subs(t, sympy.Rational(number))
    assert expected != 0 and value == expected
    assert result.text.splitlines()[-1] == f"  L - R = {expected} at t = {number}"
    assert "time budget" not in result.text


def test_a_branch_cut_fails_at_a_point_outside_it():
    # atan2(sin t, cos t) = t only for t in (-pi, pi] (common practice)
    result = _check(Session(), "check atan2(sin(t), cos(t)) == t")
    assert result.outcome == "fails"
    point, value = result.witness
    t = float(sympy.Rational(point.partition(" = ")[2]))
    assert abs(t) > math.pi
    # reference: Python's math.atan2
    assert math.isclose(float(value.scalar_part()), math.atan2(math.sin(t), math.cos(t)) - t)


def test_a_multivector_difference_at_the_witness_point():
    result = _check(Session(), "vector a\ncheck abs(a1) e1 + e2 == a1 e1 + e2")
    point, value = result.witness
    a1 = sympy.Rational(point.partition(" = ")[2])
    assert a1 < 0 and value[1] == abs(a1) - a1 and value[2] == 0


def test_points_outside_the_real_domain_prove_nothing():
    # sqrt(t) sqrt(u) = sqrt(t u) holds wherever both roots are real (t, u >= 0), so a
    # negative sample point (where sympy's principal roots differ) must not fail it
    result = _check(Session(), "check sqrt(t) sqrt(u) == sqrt(t u)")
    assert result.outcome == "undecided" and not result.out_of_time
    assert "time budget" not in result.text
    assert "sqrt(t) and t has no declared range" in result.reason


def test_an_undecided_check_names_the_limit_and_the_range_decides_it():
    session = Session()
    result = _check(session, "check log(t u) == log(t) + log(u)")
    assert result.outcome == "undecided" and not result.out_of_time
    assert "not decided: L - R has ln(t) and t has no declared range" in result.text
    # the advice works: log(t u) = log t + log u for t, u > 0 (common practice)
    held = _check(session, "assume t > 0, u > 0\ncheck log(t u) == log(t) + log(u)")
    assert held.outcome == "holds"


def test_undecided_within_the_time_budget_only_when_it_ran_out():
    result = _check(Session(budget=0), "check cos(t)^2 + sin(t)^2 == 1")
    assert result.outcome == "undecided" and result.out_of_time
    assert "within the time budget" in result.text


def test_the_tally_line_tells_which_undecided_checks_ran_out_of_time():
    assert Tally(undecided=2, out_of_time=2).summary_lines()[0] == \
        "(2 undecided within the time budget, counted as failed)"
    assert Tally(undecided=1).summary_lines()[0] == "(1 undecided, counted as failed)"
    assert Tally(undecided=3, out_of_time=1).summary_lines()[0] == \
        "(3 undecided, 1 of them within the time budget, counted as failed)"


def test_the_runner_counts_a_method_limit_apart_from_the_budget(capsys):
    from gacalc.cli import main

    status = main(["-e", "check log(t u) == log(t) + log(u)"])
    out = capsys.readouterr().out
    assert status == 1
    assert "(1 undecided, counted as failed)" in out and "within the time budget" not in out


def test_the_notebook_shows_the_witness_and_the_reason():
    from gacalc.display import bundle

    session = Session()
    failed = bundle(_check(session, "check abs(t) == t"))["text/html"]
    assert "at <code>t = -1</code>" in failed
    undecided = bundle(_check(session, "check log(d^2) == 2 log(d)"))["text/html"]
    assert "no declared range" in undecided and "time budget" not in undecided


def test_the_witness_point_avoids_a_pole_of_l_minus_r():
    result = _check(Session(), "check (abs(t) - t)/(t + 1) e1 == 0")
    point, value = result.witness
    t = sympy.Rational(point.partition(" = ")[2])
    # checked outside gacalc: sympy evaluates the fraction at the point
    assert t != -1 and value[1] == (abs(t) - t) / (t + 1) != 0

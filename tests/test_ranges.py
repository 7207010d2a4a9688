"""Ranges of scalars: `scalar a in (0, pi)`, `assume 0 < a < pi`, `given t > 0`, and what
the simplifier proves with them (abs, sign, atan2, square roots of squares, acos/asin,
log, slerp's shorter arc)."""

from __future__ import annotations

import math

import numpy as np
import pytest
import sympy

from conftest import ok
from gacalc.language import GacalcError, Session
from gacalc.language.parser import parse


def _check(session, text):
    (result,) = [r for r in ok(session, text) if getattr(r, "kind", "") == "check"]
    return result.outcome


def _value(session, text):
    results = ok(session, text)
    return results[-1].value


# -- the language ------------------------------------------------------------------------

def test_range_statements_parse_and_grade_brackets_still_do():
    (assume,) = parse("assume 0 < a < pi")
    assert [c.relation for c in assume.conditions] == ["<", "<"]
    (check,) = parse("check abs(t) == t given t > 0, u >= 1")
    assert [c.relation for c in check.given] == [">", ">="]
    (declare,) = parse("scalar a in (0, pi)")
    assert declare.intervals["a"].low_open and declare.intervals["a"].high_open
    (declare,) = parse("scalar a, b in (0, 1), c in (1, 2)")
    assert set(declare.intervals) == {"a", "b", "c"}
    # inside a condition a grade bracket still opens where an operand starts
    (assume,) = parse("assume <e1 a> > 0")
    assert assume.conditions[0].relation == ">"
    # and outside conditions < > are the grade brackets as before
    session = Session()
    assert _value(session, "<2 + e1>")[0] == 2


def test_range_errors_are_one_line_with_a_position():
    session = Session()
    for text, words in [("scalar a in (1, 0)", "empty"),
                        ("vector v in (0, 1)", "belongs to scalars"),
                        ("assume a < b = c", "cannot be chained"),
                        ("assume 0 < a > 1", "one way"),
                        ("assume a >", "right-hand side"),
                        ("assume e1 > 0", "compares scalars"),
                        ("assume 1 > 2", "never hold")]:
        results = session.run(text)
        assert isinstance(results[-1], GacalcError), text
        assert words in results[-1].message, (text, results[-1].message)
        assert results[-1].line == 1
    # the session is as it was: no condition stayed behind
    assert session.conditions == []


def test_a_range_that_leaves_no_value_is_refused():
    session = Session()
    ok(session, "assume t > 1")
    results = session.run("assume t < 0")
    assert isinstance(results[-1], GacalcError) and "no value" in results[-1].message
    assert len(session.conditions) == 1


def test_a_line_break_after_a_range_ends_the_statement():
    session = Session()
    results = ok(session, "assume t > 0\nabs(t)")
    assert results[-1].value[0] == sympy.Symbol("t", real=True)


# -- what the simplifier proves ----------------------------------------------------------

def test_angle_of_a_rotor_is_its_parameter_on_the_stated_range():
    session = Session()
    ok(session, "scalar a in (0, pi)")
    assert str(_value(session, "angle(rotor(e12, a))")) == "a"
    assert _check(session, "check angle(rotor(e12, a)) == a") == "holds"
    # without a range the same check cannot be proved: the angle is in [0, 2 pi] only
    other = Session()
    assert _check(other, "check angle(rotor(e12, b)) == b") != "holds"


def test_abs_and_sqrt_of_squares_agree_with_sympy_assumptions():
    # reference: sympy's own assumptions-aware simplification (refine with Q.positive,
    # and sqrt(t^2) of a positive symbol)
    t = sympy.Symbol("t", real=True)
    assert sympy.refine(sympy.Abs(t), sympy.Q.positive(t)) == t
    assert sympy.refine(sympy.Abs(t), sympy.Q.negative(t)) == -t
    tp = sympy.Symbol("t", positive=True)
    assert sympy.sqrt(tp**2) == tp
    session = Session()
    assert _check(session, "check abs(t) == t given t > 0") == "holds"
    assert _check(session, "check abs(t) == -t given t < 0") == "holds"
    assert _check(session, "check sqrt(t^2) == t given t >= 1") == "holds"
    assert _check(session, "check abs(t - 3) == 3 - t given t < 3") == "holds"


def test_sign_atan2_acos_asin_log_on_ranges():
    session = Session()
    ok(session, "scalar a in (0, pi)")
    a = sympy.Symbol("a", real=True)
    assert _value(session, "abs(sin(a))")[0] == sympy.sin(a)
    assert _value(session, "acos(cos(a))")[0] == a
    assert _value(session, "asin(sin(a/2))")[0] == a / 2
    assert _value(session, "atan2(sin(a), cos(a))")[0] == a
    # (x, y) = (-cos a, sin a) lies at angle pi - a (common practice: the unit circle)
    assert _value(session, "atan2(sin(a), -cos(a))")[0] == sympy.pi - a
    ok(session, "scalar u in (0, 1), w in (0, 1)")
    # reference: sympy's expand_log splits log(u w) for positive u, w
    up, wp = sympy.symbols("u w", positive=True)
    assert sympy.expand_log(sympy.log(up * wp)) == sympy.log(up) + sympy.log(wp)
    assert _check(session, "check ln(u w) == ln(u) + ln(w)") == "holds"
    # abs(cos a) has no proved sign on (0, pi): it stays
    assert _value(session, "abs(cos(a))")[0] == sympy.Abs(sympy.cos(a))


def test_rewrites_agree_numerically_inside_the_range():
    """Each rewrite against math (the standard library) at points inside the range."""
    session = Session()
    ok(session, "scalar g in (pi, 2 pi)")
    a = sympy.Symbol("g", real=True)
    for text in ["atan2(sin(g), cos(g))", "atan2(-sin(g/2), cos(g/2))", "abs(sin(g))",
                 "angle(-rotor(e12, g))", "acos(cos(g - pi))"]:
        value = _value(session, text)[0]
        for x in (3.3, 4.0, 5.5, 6.2):
            want = {"atan2(sin(g), cos(g))": math.atan2(math.sin(x), math.cos(x)),
                    "atan2(-sin(g/2), cos(g/2))": math.atan2(-math.sin(x / 2), math.cos(x / 2)),
                    "abs(sin(g))": abs(math.sin(x)),
                    "angle(-rotor(e12, g))": 2 * math.pi - x,
                    "acos(cos(g - pi))": math.acos(math.cos(x - math.pi))}[text]
            assert float(value.subs(a, x)) == pytest.approx(want, abs=1e-12), text


def test_slerp_takes_the_shorter_arc_on_a_range():
    # reference: scipy's Slerp, which interpolates along the shorter arc (its relative
    # rotation is read as a rotation vector of angle at most pi)
    from scipy.spatial.transform import Rotation, Slerp

    session = Session()
    ok(session, "scalar g in (pi, 2 pi)")
    value = _value(session, "matrix(slerp(1, rotor(e12, g), 1/2))")
    g = sympy.Symbol("g", real=True)
    for x in (3.5, 5.0, 6.0):
        ends = Rotation.from_rotvec([[0, 0, 0], [0, 0, x]])
        want = Slerp([0, 1], ends)([0.5]).as_matrix()[0]
        got = np.array(value.subs(g, x).evalf(), dtype=float)
        assert np.allclose(got, want, atol=1e-12)


def test_show_says_when_the_plain_angle_is_proved():
    session = Session()
    ok(session, "scalar a in (0, pi)")
    report = ok(session, "show rotor(e12, a)")[-1].text
    assert "under the stated range" in report
    report = " ".join(ok(Session(), "show rotor(e12, b)")[-1].text.replace("#", " ").split())
    assert "assuming the range 0 <= b <= 2*pi" in report


def test_ranges_are_listed_saved_and_dropped(tmp_path):
    session = Session()
    ok(session, "scalar a in (0, pi)\nassume t > 0")
    listed = ok(session, "assume")[-1].message
    assert "a in (0, pi)" in listed and "t > 0" in listed
    path = tmp_path / "s.gac"
    ok(session, f'save "{path}"')
    again = Session()
    ok(again, f'use "{path}"')
    assert _check(again, "check abs(t) == t") == "holds"
    ok(session, "assume none")
    assert _check(session, "check abs(a) == a") == "holds"    # the declaration's range stays


def test_equations_and_ranges_on_separate_symbols_decide_a_nonzero():
    # n unit and t in (0, pi): cos(t/2) > 0 there and n1 = 1 at n = e1, so cos(t/2) n1 is
    # not zero (common practice); the witness on the sphere carries over into the range
    s = Session()
    ok(s, "scalar t in (0, pi)\nvector n unit")
    result = ok(s, "check cos(t/2) n1 == 0")[-1]
    assert result.outcome == "fails"
    # half-angle identities are still proved, and their near misses still fail
    # (cos t = 2 cos^2(t/2) - 1, common practice)
    assert ok(s, "check (cos(t) - 2 cos(t/2)^2 + 1) n1 == 0")[-1].outcome == "holds"
    assert ok(s, "check (cos(t) - 3 cos(t/2)^2 + 1) n1 == 0")[-1].outcome == "fails"
    # the rotor about n by t is classified, with its angle and axis read off
    report = ok(s, "show rotor(n, t)")[-1].report
    assert report.item("kind").value == "rotor"
    assert s.format(report.item("angle").value) == "t"


@pytest.mark.parametrize("setup, text", [
    # the ranged symbol is in the equation: t^2 = 1 with t in (0, pi) leaves t = 1 only,
    # where t - 1 vanishes; the witness t = -1 lies outside the range
    ("scalar t in (0, pi)", "check t - 1 == 0 given t^2 = 1"),
    # a range relating two symbols is not a box
    ("scalar a, b\nvector n unit\nassume a + b > 0", "check (a + b) n1 == 0"),
])
def test_a_witness_that_may_leave_the_ranges_stays_undecided(setup, text):
    s = Session()
    ok(s, setup)
    assert ok(s, text)[-1].outcome == "undecided"

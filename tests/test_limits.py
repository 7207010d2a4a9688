"""Bounded work: limits on input size, nesting, exponents, value size and time.

Every limit ends in a GacalcLimitError with a position, never a hang, a RecursionError
or a MemoryError; the session is unchanged afterwards.  The size estimates that refuse a
product before it runs are upper bounds, checked here against the sizes actually
computed (and against sympy's own expansion for the multinomial counts).
"""

from __future__ import annotations

import math
import signal
import threading

import pytest
import sympy
from hypothesis import given, settings
from hypothesis import strategies as st

from gacalc.algebra import Multivector
from gacalc.language import Session
from gacalc.language import limits
from gacalc.language.errors import GacalcError, GacalcLimitError
from gacalc.language.parser import MAX_DEPTH, MAX_NUMBER_DIGITS, MAX_STATEMENT_CHARS
from gacalc.language.session import DEFAULT_STATEMENT_BUDGET, MAX_INPUT_CHARS

from conftest import patch_builtin


def last(session, text):
    return session.run(text)[-1]


def limit_error(session, text) -> GacalcLimitError:
    result = last(session, text)
    assert isinstance(result, GacalcLimitError), (text, result)
    assert result.span is not None and "\n" in result.caret_text()
    return result


# Input size, nesting, numbers, exponents ------------------------------------------------
def test_input_and_statement_length():
    session = Session()
    error = limit_error(session, "x" + " + x" * (MAX_INPUT_CHARS // 4 + 1))
    assert "input too long" in error.message
    error = limit_error(session, "y = " + " + ".join(["e1"] * (MAX_STATEMENT_CHARS // 5 + 1)))
    assert "statement too long" in error.message
    assert session.get("y") is None


def test_number_length():
    session = Session()
    assert "number too long" in limit_error(session, "9" * (MAX_NUMBER_DIGITS + 1)).message
    value = last(session, "9" * MAX_NUMBER_DIGITS)
    assert value.value.scalar_part() == 10 ** MAX_NUMBER_DIGITS - 1


@pytest.mark.parametrize("text", [
    "(" * (MAX_DEPTH + 1) + "x" + ")" * (MAX_DEPTH + 1),
    "<" * 5000 + "x" + ">" * 5000,
    "-" * 5000 + "x",
    "rev(" * 3000 + "e1" + ")" * 3000,
    "x" + "^x" * 3000,
    "e1" + "~" * 5000,
    "(" * 100000,
])
def test_deep_nesting_is_a_limit_error(text):
    session = Session()
    error = limit_error(session, text)
    assert "nested too deeply" in error.message or "too many postfix" in error.message


def test_nesting_at_the_limit_still_works():
    depth = MAX_DEPTH - 1
    result = last(Session(), "(" * depth + "e1 + 1" + ")" * depth)
    assert result.kind == "value" and result.text == "1 + e1"


def test_deep_user_function_calls_are_limited():
    session = Session()
    session.run("f(x) = x + 1\n" + "\n".join(f"f{k}(x) = f{k - 1 if k > 1 else ''}(x)"
                                            for k in range(1, 60)))
    error = limit_error(session, "f59(1)")
    assert "nested more than" in error.message


def test_exponent_magnitude():
    session = Session()
    assert "exponent 1001 is too large" in limit_error(session, "x^1001").message
    assert "too large" in limit_error(session, "e1^(10^30)").message
    assert "too large" in limit_error(session, "x^(1/100000)").message
    # (x + 1)^1000 has 1001 terms: computed.  Coefficient of x^500 is C(1000, 500).
    value = last(session, "(x + 1)^1000").value
    x = sympy.Symbol("x", real=True)
    assert sympy.Poly(value.scalar_part(), x).coeff_monomial(x**500) == math.comb(1000, 500)


def test_huge_numbers_are_refused_before_they_are_built():
    session = Session()
    error = limit_error(session, "(2^1000)^1000")
    assert "digits" in error.message
    error = limit_error(session, "(x + 2^999)^1000")     # a polynomial's coefficients too
    assert "digits" in error.message


# Value size -------------------------------------------------------------------------
def test_a_huge_power_is_refused_quickly_and_explained():
    session = Session()
    session.run("y = 1")
    # (a + ... + h)^50 has C(57, 7) = 264,385,836 terms (multinomial count, common
    # practice); the product would run for hours in C and cannot be interrupted.
    error = limit_error(session, "y = (a + b + c + d + e + f + g + h)^50")
    assert "264 million terms" in error.message and f"{limits.MAX_TERMS:,}" in error.message
    assert session.get("y").scalar_part() == 1          # unchanged


@pytest.mark.parametrize("text", [
    "multivector M; M^1000",
    "multivector M; M^-50",
    "p = (x + y + z + w + 1)^20; p p",
    "p = (x + y + z + w + 1)^20; p /\\ p",
    "p = (x + y + z + w + 1)^20; p _| p e1",
    "multivector M; inverse(M^6)",
    "multivector M; apply(even(M)^6, M^6)",
    "p = (x + y + z + w + 1)^20; subs(p^2, x, y)",
    "q = 1/(x + 1)^30 + 1/(y + 2)^30; (q + 1/(z+1)^40)^30",
    "multivector M; show M^8",
])
def test_oversized_products_are_refused(text):
    session = Session()
    error = limit_error(session, text)
    assert "limit" in error.message


def test_sizes_under_the_limit_are_computed_exactly():
    session = Session()
    value = last(session, "(a + b + c)^10").value
    a, b, c = sympy.symbols("a b c", real=True)
    # number of monomials of (a + b + c)^10: C(12, 2) = 66, as sympy's expansion shows
    expected = len(sympy.Poly(sympy.expand((a + b + c) ** 10), a, b, c).terms())
    assert expected == math.comb(12, 2)
    assert limits.terms_of(value) == expected


def test_substitution_is_guarded_and_still_exact():
    session = Session()
    value = last(session, "subs((x + 1)^3 e1, x, y - 1)").value
    assert value.identical(last(session, "y^3 e1").value)
    error = limit_error(session, "subs(x^1000, x, a + b + c + d + e)")
    assert "substitution" in error.message


_COEFFICIENTS = st.sampled_from(["x", "y", "2", "x y", "x + 1", "x - y", "3 x^2", "1/2",
                                 "y^3 - x", "cos(t)", "sin(t) x"])
_BLADES = st.sampled_from(["", " e1", " e2", " e3", " e12", " e23", " e31", " e123"])


@st.composite
def small_multivectors(draw):
    terms = draw(st.lists(st.tuples(_COEFFICIENTS, _BLADES), min_size=1, max_size=5))
    return " + ".join(f"({c}){b}" for c, b in terms)


@settings(max_examples=150, derandomize=True, deadline=None, database=None)
@given(small_multivectors(), small_multivectors(), st.integers(min_value=2, max_value=6))
def test_size_estimates_are_upper_bounds(left, right, n):
    session = Session()
    a = last(session, left).value
    b = last(session, right).value
    # Products and sizes inside the session's own algebra context, as a statement computes
    # them: outside it the values are rewritten into the process-wide default registry,
    # whose generator positions depend on every test that ran before in the process.
    with session.algebra.active():
        for product in (a * b, a.outer(b), a.lc(b), a.inner(b)):
            bound, pairs = limits.product_size(limits.size_of(a), limits.size_of(b))
            actual = limits.size_of(product)
            assert actual.terms <= bound.terms and actual.terms <= pairs
            assert actual.bits <= bound.bits
        power = a ** n
        bound = limits.power_size(limits.size_of(a), n)
        assert limits.size_of(power).terms <= bound.terms
        assert limits.size_of(power).bits <= bound.bits


def test_the_size_of_a_value_counts_every_blade_and_denominator():
    value = Session().run("(x + 1) e1 + (y^2 - x) e12 + 1/(x + 2)")[-1].value
    size = limits.size_of(value)
    assert (size.terms, size.blades, size.degree) == (2 + 2 + 1 + 2, 3, 2)
    assert size.rational and len(size.generators) == 2


# Time budget ------------------------------------------------------------------------
def _spin(*args, **kwargs):
    """Pure-Python work that never ends by itself (stands in for a slow sympy call)."""
    n = 0
    while True:
        n += 1


def test_default_statement_budget():
    assert Session().statement_budget == DEFAULT_STATEMENT_BUDGET == 30.0


def test_a_statement_over_its_budget_is_abandoned(monkeypatch):
    patch_builtin(monkeypatch, "norm", _spin)
    session = Session(statement_budget=0.3)
    session.run("x = e1")
    error = limit_error(session, "x = norm(e1)")
    assert "time budget (0.3 s)" in error.message and "unchanged" in error.message
    assert session.get("x").identical(Multivector({1: 1}))
    # the session keeps working, and no alarm or handler is left behind
    assert last(session, "x e1").text == "1"
    assert signal.getitimer(signal.ITIMER_REAL)[0] == 0


def test_the_interrupt_repeats_when_one_is_swallowed(monkeypatch):
    # An exception raised inside a finalizer or a gc callback is "ignored" by Python; the
    # deadline's interrupt keeps coming until the statement ends.
    import time

    swallowed = []

    def swallowing_spin(ctx, *args):
        end = time.monotonic() + 30
        while time.monotonic() < end:
            try:
                while time.monotonic() < end:
                    pass
            except BaseException as error:      # noqa: BLE001 - what a finalizer does
                if swallowed:
                    raise
                swallowed.append(type(error).__name__)
        raise AssertionError("the statement budget never ended the statement")

    patch_builtin(monkeypatch, "norm", swallowing_spin)
    error = limit_error(Session(statement_budget=0.3), "norm(e1)")
    assert "time budget" in error.message and swallowed == ["StatementTimeout"]


def test_the_budget_is_also_checked_between_nodes_in_other_threads():
    # No signals outside the main thread: the evaluator checks the deadline at each node.
    session = Session(statement_budget=1e-6)
    outcome = []
    worker = threading.Thread(target=lambda: outcome.extend(
        session.run(" + ".join(["e1"] * 2000))))
    worker.start()
    worker.join()
    assert isinstance(outcome[-1], GacalcLimitError) and "time budget" in outcome[-1].message


def test_simplification_that_runs_out_gives_the_unsimplified_value():
    session = Session(budget=0)
    results = session.run("y = cos(t)^2 + sin(t)^2")
    note, value = results[-2], results[-1]
    assert note.kind == "note" and "not fully simplified" in note.message
    assert not value.complete
    # correct although not simplified: with a budget it simplifies to 1 (Pythagoras)
    assert Session().run("cos(t)^2 + sin(t)^2")[-1].text == "1"
    assert value.value.equals(Multivector.scalar(1))


def test_the_simplifier_gets_at_most_the_time_the_statement_has_left(monkeypatch):
    import gacalc.simplify as simplify_module

    seen = []
    original = simplify_module.simplify

    def recording(value, conditions=(), budget=None):
        seen.append(budget.seconds)
        return original(value, conditions, budget)

    monkeypatch.setattr(simplify_module, "simplify", recording)
    Session(budget=100, statement_budget=2).run("x + 1")
    assert seen and all(seconds <= 2 for seconds in seen)


def test_the_simplifier_keeps_its_own_alarm_under_a_statement_budget(monkeypatch):
    # The simplifier's SIGALRM budget still ends a slow simplification with the honest
    # unsimplified value while the statement's own deadline is armed.
    import gacalc.simplify as simplify_module

    monkeypatch.setattr(simplify_module, "display_coef", _spin)
    session = Session(budget=0.3, statement_budget=60)
    results = session.run("z = (x + 1)^2")
    assert results[-1].kind == "value" and not results[-1].complete
    assert "not fully simplified" in results[-2].message
    assert session.get("z") is not None
    assert signal.getitimer(signal.ITIMER_REAL)[0] == 0


def test_the_statement_deadline_ends_a_simplification_inside_the_core(monkeypatch):
    # norm() simplifies inside the core with the simplifier's default budget (10 s); the
    # statement's shorter deadline still ends it, and the simplifier's alarm is cleaned up.
    import gacalc.simplify as simplify_module

    previous_handler = signal.getsignal(signal.SIGALRM)
    monkeypatch.setattr(simplify_module, "display_coef", _spin)
    session = Session(statement_budget=0.3)
    error = limit_error(session, "vector a; norm(a)")
    assert "time budget" in error.message
    assert signal.getitimer(signal.ITIMER_REAL)[0] == 0
    assert signal.getsignal(signal.SIGALRM) == previous_handler


def test_each_statement_of_a_used_file_has_its_own_budget(tmp_path, monkeypatch):
    # Every statement of the file is slow but under the budget; the whole file is not.
    import time

    def slow_rev(ctx, a):
        end = time.monotonic() + 0.2
        while time.monotonic() < end:
            pass
        return ctx.multivector(0).rev()

    patch_builtin(monkeypatch, "rev", slow_rev)
    (tmp_path / "slow.gac").write_text("".join(f"x{k} = rev(e12)\n" for k in range(6)))
    session = Session(statement_budget=0.6, base_dir=str(tmp_path))
    result = last(session, 'use "slow.gac"')
    assert result.kind == "file" and result.count == 6


def test_budget_none_means_no_statement_deadline():
    session = Session(statement_budget=math.inf)
    assert session._seconds() is None
    assert last(session, "e1 e2").text == "e12"


def test_limit_errors_never_escape_as_python_errors():
    session = Session()
    for text in ["(a + b + c + d + e + f + g + h)^1000", "x^" + "9" * 2000, "e1^(2^1000)",
                 "numeric(e1, 100000)", "exp(10^1000)", "sin(2^1000^1000)"]:
        result = last(session, text)
        assert isinstance(result, GacalcError) or result.kind == "value", text


def test_one_watching_thread_serves_every_statement():
    session = Session(statement_budget=30)
    session.run("\n".join(f"x{k} = e1" for k in range(50)))
    watchers = [t for t in threading.enumerate() if t.name == "gacalc statement budget"]
    assert len(watchers) == 1 and watchers[0].daemon

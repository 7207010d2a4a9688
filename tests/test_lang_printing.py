"""Text printing: layout, and the round trip parse(print(v)) == v (hypothesis)."""

import pytest
import sympy
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from gacalc.algebra import Multivector, blade
from gacalc.language import GacalcError, Session
from gacalc.language.session import ValueResult
from gacalc.printing.text import (is_sum, multivector_text, scalar_text, split_sign,
                                  unicode_text, value_text)

SYMBOLS = [sympy.Symbol(name, real=True) for name in ("a", "b1", "theta", "phi", "x_2")]


def read_back(text):
    """The value of printed text in a fresh session."""
    results = Session().run(text)
    errors = [r for r in results if isinstance(r, GacalcError)]
    assert not errors, f"{text!r}: {errors[0].caret_text()}"
    values = [r for r in results if isinstance(r, ValueResult)]
    assert len(values) == 1, text
    return values[0].value


# Layout -----------------------------------------------------------------------------
def test_layout_grade_by_grade_in_basis_order():
    a, b = sympy.symbols("a b", real=True)
    value = Multivector({"e12": a - b, "e1": 2, 0: 3, "e123": -1, "e31": -a, "e3": 1})
    assert multivector_text(value) == "3 + 2*e1 + e3 - a*e31 + (a - b)*e12 - e123"


def test_negative_first_term_and_zero():
    assert multivector_text(-blade("1")) == "-e1"
    assert multivector_text(Multivector()) == "0"
    assert multivector_text(Multivector.scalar(sympy.Rational(-1, 2))) == "-1/2"


def test_scalar_sum_is_parenthesised_only_beside_other_terms():
    a, b = sympy.symbols("a b", real=True)
    assert multivector_text(Multivector.scalar(a + b)) == "a + b"
    assert multivector_text(Multivector({0: a + b, 1: 1})) == "(a + b) + e1"


def test_long_values_break_at_grade_boundaries_with_trailing_operators():
    session = Session(width=40)
    results = session.run("vector a, b\na b")
    text = results[-1].text
    lines = text.splitlines()
    assert len(lines) >= 2
    assert all(line.rstrip().endswith(("+", "-")) for line in lines[:-1])
    assert all(line.startswith("  ") for line in lines[1:])
    again = Session()
    again.run("vector a, b")
    back = [r for r in again.run(text) if isinstance(r, ValueResult)][0].value
    assert back == results[-1].value


def test_sum_detection_and_sign_split():
    assert is_sum("a1*b2 - a2*b1")
    assert is_sum("-a + b")
    assert not is_sum("-a*b")
    assert not is_sum("cos(a + b)")
    assert not is_sum("x^(-2)")
    assert not is_sum("(a + b)/(c - d)")
    assert split_sign("-a*b") == (-1, "a*b")
    assert split_sign("-a + b") == (1, "-a + b")


def test_unicode_text():
    assert unicode_text("theta^2*phi1 - 1/2*cos(theta)") == "θ² φ1 − 1/2 cos(θ)"
    assert unicode_text("a^(-3)") == "a⁻³"
    assert unicode_text("k*(a + b)") == "k*(a + b)"      # k (a + b) would read as a call
    assert unicode_text("2*(a + b)") == "2 (a + b)"
    assert unicode_text("pi*psi") == "π ψ"
    assert unicode_text("thetax") == "thetax"


def test_scalar_text():
    t = sympy.Symbol("t", real=True)
    assert scalar_text(t**2 / 2 + sympy.E) == "t^2/2 + exp(1)"
    assert read_back(scalar_text(t**2 / 2 + sympy.E)) == Multivector.scalar(t**2 / 2 + sympy.E)
    assert scalar_text(sympy.log(t)) == "ln(t)"
    assert scalar_text(sympy.Abs(t)) == "abs(t)"
    assert scalar_text(1 / t**2) == "1/t^2"
    assert scalar_text(sympy.Float("1e-7")) == "0.0000001"


def test_matrix_and_quaternion_text():
    from sympy.algebras.quaternion import Quaternion

    # matrices and quaternions print as input that reads back (issue 16)
    assert value_text(sympy.Matrix([[1, -2], [30, 4]])) == "[1, -2; 30, 4]"
    assert value_text(Quaternion(1, 0, -2, sympy.Symbol("t") + 1)) == "quaternion(1, 0, -2, t + 1)"


# Round trip -------------------------------------------------------------------------
def _atoms():
    return st.one_of(
        st.integers(-20, 20).map(sympy.Integer),
        st.fractions(min_value=-5, max_value=5, max_denominator=12).map(
            lambda f: sympy.Rational(f.numerator, f.denominator)),
        st.sampled_from(SYMBOLS),
        st.sampled_from(SYMBOLS).map(sympy.cos),
        st.sampled_from(SYMBOLS).map(sympy.sin),
        st.sampled_from(SYMBOLS).map(lambda s: sympy.cos(s / 2)),
    )


def _coefficients():
    return st.recursive(
        _atoms(),
        lambda inner: st.one_of(
            st.tuples(inner, inner).map(lambda p: p[0] + p[1]),
            st.tuples(inner, inner).map(lambda p: p[0] * p[1]),
            st.tuples(inner, inner).map(lambda p: p[0] - p[1]),
            st.tuples(inner, st.integers(2, 3)).map(lambda p: p[0] ** p[1]),
            inner.map(lambda c: c / (SYMBOLS[0] ** 2 + 1)),
        ),
        max_leaves=6,
    )


multivectors = st.dictionaries(st.integers(0, 7), _coefficients(), max_size=8).map(Multivector)
SETTINGS = settings(max_examples=60, deadline=None,
                    suppress_health_check=[HealthCheck.too_slow])


@SETTINGS
@given(multivectors)
def test_round_trip_ascii(value):
    text = multivector_text(value)
    assert read_back(text) == value


@SETTINGS
@given(multivectors)
def test_round_trip_unicode(value):
    text = multivector_text(value, unicode=True)
    assert read_back(text) == value


@SETTINGS
@given(multivectors)
def test_round_trip_of_broken_lines(value):
    text = multivector_text(value, width=24)
    assert read_back(text) == value


def test_round_trip_of_session_results():
    # printed results of real computations read back as the same values
    session = Session()
    session.run("vector a, b; scalar theta; rotor R")
    for expression in ("a b", "rotate(rotor(e12, theta), a)", "a^-1", "R a R~",
                       "exp(-e12 theta/2) + norm(a)", "cross(a, b) sqrt(2)/3",
                       # a shared denominator read outside the session's algebra context
                       "(e1 + e2)/sqrt(2)", "(a + b)/sqrt(a . a)", "(a + b)/(a . b)"):
        result = [r for r in session.run(expression) if isinstance(r, ValueResult)][-1]
        for unicode in (False, True):
            text = result.render(unicode)
            back = [r for r in session.run(text) if isinstance(r, ValueResult)][-1]
            assert back.value == result.value, text


def test_generator_names_and_scalar_text_share_one_spelling():
    # One printer: the coefficient domain's generator names and the printing layer's scalar
    # text follow the same rules (only the term order of sums may differ).  The expected
    # spellings are the language's own (DESIGN.md: ^ for powers, sqrt, ln, abs, exp(1)).
    import sympy

    from gacalc.algebra.coefficients import ascii_text
    from gacalc.printing.text import scalar_text

    x, t = sympy.symbols("x t", real=True)
    cases = {
        x ** sympy.Rational(-1, 2): "1/(sqrt(x))",
        2 ** t: "2^t",
        x ** sympy.Rational(2, 3): "x^(2/3)",
        sympy.log(x): "ln(x)",
        sympy.Abs(x): "abs(x)",
        sympy.E: "exp(1)",
        sympy.Float("0.5", 15): "0.5",
        sympy.cos(t / 2): "cos(t/2)",
    }
    for expr, text in cases.items():
        assert ascii_text(expr) == text
        assert scalar_text(expr) == text

"""Printed values are valid input: pasting a result back gives the same value, for every
value kind (multivectors, matrices with real and complex entries, quaternions, lists),
in ASCII and in Unicode mode.  Generated values (hypothesis) and the README's own cases."""

from __future__ import annotations

import sympy
from hypothesis import HealthCheck, given, settings, strategies as st

from conftest import ok
from gacalc.language import GacalcError, Session
from gacalc.values import kind_of

_SMALL = st.integers(-3, 3)
_ANGLES = st.sampled_from(["t", "pi/3", "2 t", "t/2", "pi/5", "a + t"])
_BLADES = ["", " e1", " e2", " e3", " e23", " e31", " e12", " I"]


@st.composite
def multivector_texts(draw):
    terms = []
    for blade in _BLADES:
        kind = draw(st.sampled_from(["zero", "int", "frac", "trig", "root", "symbol"]))
        if kind == "zero":
            continue
        coef = {"int": lambda: str(draw(_SMALL)),
                "frac": lambda: f"{draw(_SMALL)}/{draw(st.integers(1, 5))}",
                "trig": lambda: f"{draw(st.sampled_from(['cos', 'sin']))}({draw(_ANGLES)})",
                "root": lambda: f"sqrt({draw(st.integers(2, 7))})",
                "symbol": lambda: draw(st.sampled_from(["a", "b", "a b", "a^2/3"]))}[kind]()
        terms.append(f"({coef}){blade}")
    return " + ".join(terms) or "0"


@st.composite
def value_texts(draw):
    mv = draw(multivector_texts())
    shape = draw(st.sampled_from(["mv", "matrix", "pauli", "quaternion", "rotor", "list",
                                  "literal"]))
    if shape == "mv":
        return mv
    if shape == "matrix":
        return f"matrix(rotor(e12, {draw(_ANGLES)}) rotor(e23, {draw(_ANGLES)}))"
    if shape == "pauli":
        return f"pauli({mv})"
    if shape == "quaternion":
        return f"quaternion(even({mv}))"
    if shape == "rotor":
        return f"rotor(e31, {draw(_ANGLES)})"
    if shape == "list":
        return f"({mv}, pauli(e1), quaternion(1 + e12))"
    n = draw(st.integers(1, 3))
    entries = [[f"{draw(_SMALL)} + ({draw(_SMALL)})*i" for _ in range(n)] for _ in range(n)]
    return "[" + "; ".join(", ".join(row) for row in entries) + "]"


def _same_value(session, first_text, printed):
    """The printed text, read back in the same session, equals the value."""
    results = session.run(f"check {first_text} == {printed}")
    outcome = results[-1]
    assert not isinstance(outcome, GacalcError), (first_text, printed, outcome.caret_text())
    assert outcome.outcome == "holds", (first_text, printed)


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(value_texts(), st.booleans())
def test_printed_values_read_back_as_themselves(text, unicode):
    session = Session(unicode=unicode)
    ok(session, "scalar t, a, b")
    results = ok(session, f"x = {text}")
    printed = session.format(results[-1].value)
    _same_value(session, "x", printed)
    # and it reads back as a value of the same kind
    again = ok(session, f"y = {printed}")[-1].value
    assert kind_of(again) is kind_of(session.get("x"))


def test_complex_entries_with_negative_sums_read_back_in_unicode():
    # cos(pi/5) = (1 + sqrt(5))/4 (handbook value, golden ratio / 2): an imaginary part
    # that is a negative sum keeps its parentheses when the minus is the Unicode one
    for unicode in (False, True):
        session = Session(unicode=unicode)
        value = ok(session, "x = pauli(cos(pi/5) e12 - cos(pi/5) e1)")[-1].value
        printed = session.format(value)
        assert "(" + ("\u2212" if unicode else "-") + "sqrt(5)/4" in printed, printed
        _same_value(session, "x", printed)


def test_matrix_literals_print_as_they_are_written():
    session = Session()
    m = ok(session, "[0, -1, 0; 1, 0, 0; 0, 0, 1]")[-1]
    assert m.text == "[0, -1, 0; 1, 0, 0; 0, 0, 1]"
    assert m.value == sympy.Matrix([[0, -1, 0], [1, 0, 0], [0, 0, 1]])
    # a long matrix prints one row per line, and still reads back
    long = ok(session, "scalar theta\nmatrix(rotor(e23, theta) rotor(e12, theta))")[-1]
    assert long.text.count("\n") == 2
    _same_value(session, "matrix(rotor(e23, theta) rotor(e12, theta))", long.text)
    # statements after a multi-line matrix still run; ';' inside [ ] separates rows
    results = ok(session, "M = [1, 2;\n     3, 4]\nM[2, 1]")
    assert results[-1].value[0] == 3


def test_matrix_literal_errors():
    session = Session()
    for text, words in [("[1, 2; 3]", "equally long"), ("[]", "empty matrix"),
                        ("[e1, 0]", "a matrix entry is a scalar"), ("[I, 0]", "written i"),
                        ("[1, 2", "never closed"), ("[1,, 2]", "missing matrix entry")]:
        error = session.run(text)[-1]
        assert isinstance(error, GacalcError), text
        assert words in error.message, (text, error.message)


def test_quaternions_read_back_and_keep_hamilton_products():
    # reference: sympy's own Quaternion algebra (Hamilton's i j = k)
    from sympy.algebras.quaternion import Quaternion

    session = Session()
    q = ok(session, "quaternion(0, 1, 0, 0) quaternion(0, 0, 1, 0)")[-1]
    assert q.value == Quaternion(0, 1, 0, 0) * Quaternion(0, 0, 1, 0) == Quaternion(0, 0, 0, 1)
    assert q.text == "quaternion(0, 0, 0, 1)"

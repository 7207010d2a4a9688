"""Lists: (a, b, c) literals, 1-based indexing X[k], matrix entries M[i, j]."""

from __future__ import annotations

import pytest
import sympy

from conftest import ok
from gacalc.algebra import blade
from gacalc.language import GacalcError, Session
from gacalc.language.scanner import tokenize
from gacalc.values import kind_of
from gacalc.values.sequence import LIST, ValueList


def value(session, text):
    return ok(session, text)[-1].value


def error(session, text) -> GacalcError:
    results = session.run(text)
    assert isinstance(results[-1], GacalcError), results
    return results[-1]


def test_literal_makes_a_list_of_values():
    s = Session()
    got = value(s, "(e1, 2 e2 + e3, (1, e12))")
    assert kind_of(got) is LIST
    assert len(got) == 3 and got[0] == blade("1")
    assert kind_of(got[2]) is LIST


def test_indexing_is_one_based_and_nests():
    s = Session()
    ok(s, "L = (e1, 2 e2 + e3, (1, e12))")
    assert value(s, "L[1]") == blade("1")
    assert value(s, "L[3][2]") == blade("12")
    assert value(s, "L[1 + 1]") == 2 * blade("2") + blade("3")


@pytest.mark.parametrize("text, words, column", [
    ("L = (1, 2)\nL[0]", "index 0 is out of range: items are numbered 1 to 2", 3),
    ("L = (1, 2)\nL[3]", "index 3 is out of range", 3),
    ("L = (1, 2)\nL[1.5]", "whole number", 3),
    ("L = (1, 2)\nL[e1]", "must be a scalar", 3),
    ("L = (1, 2)\nL[1, 2]", "one index", 6),
    ("e1[1]", "cannot index a vector", 1),
    ("L = (1, 2)\nL[]", "empty index", 3),
    ("L = (1, 2)\nL[1", "never closed", 2),
    ("(1, , 2)", "missing item", 5),
])
def test_bad_indexing_is_one_line_with_position(text, words, column):
    s = Session()
    failure = error(s, text)
    assert words in failure.message
    assert "\n" not in failure.message
    assert failure.span.column == column


def test_index_only_written_against_its_operand():
    # "A [1]" is not an index: a bracket after a space starts an operand (common practice
    # of this language's juxtaposition product: spacing decides, as for calls)
    toks = [t.kind for t in tokenize("L[1]")]
    assert toks[:4] == ["NAME", "LBRACKET", "NUMBER", "RBRACKET"]
    s = Session()
    ok(s, "L = (e1, e2)")
    assert isinstance(s.run("L [1]")[-1], GacalcError)


def test_printed_list_reads_back_to_itself():
    s = Session()
    for text in ["(e1, 2*e2 + e3, (1, e12))", "(e1,)", "(1/2, cos(t)*e12)"]:
        ok(s, f"X = {text}")
        got = value(s, "X")
        again = value(s, kind_of(got).text(got))
        assert again == got
    # a single item keeps its comma: (e1) would be e1 itself
    assert kind_of(value(s, "(e1,)")).text(value(s, "(e1,)")) == "(e1,)"


def test_long_lists_break_one_item_per_line_and_still_parse():
    s = Session()
    ok(s, "vector a")
    got = value(s, "(a, a a a, a a a a a, e1)")
    text = kind_of(got).text(got, width=40)
    assert text.count("\n") >= 3
    assert value(s, text) == got


def test_check_compares_item_by_item():
    s = Session()
    results = ok(s, "vector a\ncheck (a, a a) == (a, a . a)\ncheck (a, e1) == (a, e2)")
    texts = [str(r) for r in results[-2:]]
    assert "held" in texts[0].lower() or "pass" in texts[0].lower()
    assert "e1 - e2" in texts[1]


def test_lists_do_not_add_or_scale():
    s = Session()
    ok(s, "L = (1, 2)")
    assert "cannot add" in error(s, "L + L").message
    assert "cannot multiply" in error(s, "2 L").message


def test_matrix_entries():
    s = Session()
    ok(s, "M = matrix(rotor(e12, pi/2))")
    # matrix(R) of a quarter turn about e3 sends e1 to e2: entry (2, 1) is 1 (common practice)
    assert value(s, "M[2, 1]") == blade("")
    assert value(s, "M[1, 2]") == -blade("")
    # the Pauli matrix of e2 is [[0, -i], [i, 0]]; i is the pseudoscalar I (common practice)
    ok(s, "P = pauli(e2)")
    assert value(s, "P[1, 2]") == -blade("123")
    assert "columns are numbered 1 to 2" in error(s, "P[1, 3]").message
    assert "two indices" in error(s, "P[1]").message


def test_numeric_and_show_of_a_list():
    s = Session()
    got = value(s, "numeric((1/3, e1/7))")
    assert kind_of(got) is LIST
    assert abs(float(got[0].scalar_part()) - 1 / 3) < 1e-12
    shown = "\n".join(str(r) for r in ok(s, "show (e1, rotor(e12, pi/3))"))
    assert "item 1" in shown and "item 2" in shown


def test_emit_of_a_list_says_what_to_do():
    s = Session()
    assert "emit its items" in error(s, "emit latex (e1, e2)").message
    assert "mathbf" in str(ok(s, "emit latex (e1, e2)[2]")[-1])


def test_list_is_an_immutable_tuple():
    items = ValueList([blade("1"), blade("2")])
    assert isinstance(items, tuple) and items[1] == blade("2")
    with pytest.raises(TypeError):
        items[0] = blade("3")

"""subs with several substitutions: pairs in a row or as (t, value) lists, applied
simultaneously (sympy's subs(..., simultaneous=True) is the reference)."""

from __future__ import annotations

import sympy

from conftest import ok
from gacalc.language import GacalcError, Session


def _value(session, text):
    return ok(session, text)[-1].value


def test_several_pairs_in_a_row_and_as_lists_agree():
    s = Session()
    ok(s, "vector a")
    flat = _value(s, "subs(a, a1, 2, a2, 3)")
    listed = _value(s, "subs(a, (a1, 2), (a2, 3))")
    assert flat.identical(listed)
    assert [flat[i] for i in (1, 2)] == [2, 3] and flat[3] == sympy.Symbol("a3", real=True)


def test_substitutions_are_simultaneous_not_sequential():
    s = Session()
    ok(s, "vector a")
    swapped = _value(s, "subs(a1 e1 + a2^2 e2, a1, a2, a2, a1 + 1)")
    # reference: sympy's own simultaneous substitution of the same components
    a1, a2 = sympy.symbols("a1 a2", real=True)
    mapping = {a1: a2, a2: a1 + 1}
    assert sympy.expand(swapped[1] - a1.subs(mapping, simultaneous=True)) == 0
    assert sympy.expand(swapped[2] - (a2 ** 2).subs(mapping, simultaneous=True)) == 0
    # in sequence the second replacement would have reached the first one's value
    assert sympy.expand(swapped[1] - a1.subs(a1, a2).subs(a2, a1 + 1)) != 0


def test_a_declared_function_among_the_pairs():
    s = Session()
    ok(s, "scalar u(t)")
    value = _value(s, "subs(diff(u, t) e1 + u e2 + c e3, u, sin(t), c, 2)")
    t = sympy.Symbol("t", real=True)
    # d/dt sin t = cos t (handbook derivative)
    assert value[1] == sympy.cos(t) and value[2] == sympy.sin(t) and value[3] == 2


def test_substitution_errors_say_what_is_wrong_and_where():
    s = Session()
    ok(s, "vector a")
    for text, words, column in [
            ("subs(a, a1, 2, a2)", "needs a value after it", 16),
            ("subs(a, a1, 2, a1, 3)", "a1 is substituted twice", 16),
            ("subs(a, (a1, 2, 3))", "a pair (t, value)", 9),
            ("subs(a, 2, 3)", "replaces a scalar symbol", 9)]:
        error = s.run(text)[-1]
        assert isinstance(error, GacalcError), text
        assert words in error.message and error.span.column == column, (text, error)
    # the session is as it was
    assert s.get("a").identical(_value(s, "a"))


def test_subs_reaches_every_kind_of_value():
    s = Session()
    ok(s, "scalar t")
    t = sympy.Symbol("t", real=True)
    matrix = _value(s, "subs(matrix(rotor(e12, t)), t, pi/2)")
    # reference: sympy's own Matrix.subs of the rotation matrix about z, [[c, -s], [s, c]]
    # (handbook form)
    expected = sympy.Matrix([[sympy.cos(t), -sympy.sin(t), 0],
                             [sympy.sin(t), sympy.cos(t), 0], [0, 0, 1]]).subs(t, sympy.pi / 2)
    assert matrix == expected
    items = _value(s, "subs((cos(t) e1, pauli(t e3), quaternion(t, 0, 0, 1), "
                      "linmap(t, 0, 0, 0, 1, 0, 0, 0, 1)), t, 2)")
    assert items[0][1] == sympy.cos(2)
    assert items[1] == sympy.Matrix([[2, 0], [0, -2]])
    assert items[2].a == 2 and items[3].matrix[0, 0] == 2

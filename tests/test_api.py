"""The public Python API: gacalc.Session, parse_value, session(), Multivector operators and
conversions.  Operator results are compared with the language's results for the same
expressions, and both with tests/ga_reference.py (an independent numpy Cl(3,0))."""

from __future__ import annotations

import subprocess
import sys
from fractions import Fraction

import numpy as np
import pytest
import sympy

import gacalc
from gacalc import GacalcError, Multivector, Session, e1, e2, e3, e12, parse_value
from ga_reference import gp as reference_product

TEXTS = {
    # python expression on a, b (vectors) and R (rotor) -> the same in the language
    "a * b": "a b",
    "a * b * ~R": "a b R~",
    "R * a * ~R": "R a R~",
    "a.outer(b)": "a /\\ b",
    "a.lc(a.outer(b))": "a _| (a /\\ b)",
    "a.outer(b).rc(b)": "(a /\\ b) |_ b",
    "a.inner(b)": "a . b",
    "a / b": "a / b",
    "b ** 3": "b^3",
    "(a + 2 * b) ** -1": "(a + 2 b)^-1",
    "-a + Fraction(1, 2) * b": "-a + 1/2 b",
}


@pytest.fixture
def symbolic():
    s = Session()
    s.evaluate("vector a, b\nR = rotor(e12, theta)")
    return s


@pytest.mark.parametrize("python", sorted(TEXTS))
def test_operators_equal_the_language(symbolic, python):
    names = {"a": symbolic["a"], "b": symbolic["b"], "R": symbolic["R"],
             "Fraction": Fraction}
    # the Python side is our own expression from the table above, not user text
    ours = _apply(python, names)
    theirs = symbolic.evaluate(TEXTS[python])
    assert ours == theirs
    assert ours.simplified().identical(theirs)


def _apply(python, names):
    # a tiny interpreter of the table's expressions: Python's own operators, no eval
    a, b, R = names["a"], names["b"], names["R"]
    table = {
        "a * b": lambda: a * b, "a * b * ~R": lambda: a * b * ~R,
        "R * a * ~R": lambda: R * a * ~R, "a.outer(b)": lambda: a.outer(b),
        "a.lc(a.outer(b))": lambda: a.lc(a.outer(b)), "a.outer(b).rc(b)": lambda: a.outer(b).rc(b),
        "a.inner(b)": lambda: a.inner(b), "a / b": lambda: a / b, "b ** 3": lambda: b ** 3,
        "(a + 2 * b) ** -1": lambda: (a + 2 * b) ** -1,
        "-a + Fraction(1, 2) * b": lambda: -a + Fraction(1, 2) * b,
    }
    return table[python]()


def test_numeric_products_match_the_numpy_reference():
    # tests/ga_reference.py: independent numpy Cl(3,0), same basis order
    x = parse_value("1 + 2 e1 - e23 + 3 e123")
    y = parse_value("-2 + e2 + 4 e31 + e12")
    expected = reference_product(x.to_numpy(), y.to_numpy())
    assert np.allclose((x * y).to_numpy(), expected)


def test_to_sympy_per_component_and_grade():
    s = Session()
    value = s.evaluate("scalar t\ncos(t) + sin(t) e12 + 2 e3")
    t = sympy.Symbol("t", real=True)
    assert value.to_sympy("e12") == sympy.sin(t)
    assert value.to_sympy(grade=1) == {"e1": 0, "e2": 0, "e3": 2}
    everything = value.to_sympy()
    assert list(everything) == ["1", "e1", "e2", "e3", "e23", "e31", "e12", "e123"]
    assert everything["1"] == sympy.cos(t)


def test_to_numpy_and_its_refusal_of_symbols():
    value = parse_value("rotor(e12, pi/2)")
    # cos(pi/4) - sin(pi/4) e12 (DESIGN.md rotor convention; exact values common practice)
    expected = np.array([np.sqrt(0.5), 0, 0, 0, 0, 0, -np.sqrt(0.5), 0])
    assert np.allclose(value.to_numpy(), expected)
    assert np.allclose(parse_value("3 e1 - e3").to_numpy(grade=1), [3, 0, -1])
    with pytest.raises(ValueError, match="a1, a2"):
        Session().evaluate("vector a\na").to_numpy()


def test_reverse_operator_and_rotation():
    # R e1 R~ for R = rotor(e12, pi/2) turns e1 into e2 (DESIGN.md)
    R = parse_value("rotor(e12, pi/2)")
    assert (R * e1 * ~R).simplified().identical(e2)
    assert ~e12 == -e12


def test_values_travel_between_python_and_a_session():
    s = Session()
    s["n"] = e1 + e3
    assert s.evaluate("n . e3") == 1
    s["k"] = 5
    assert s.evaluate("k^2") == 25
    s.evaluate("m = n /\\ e2")
    assert s["m"] == e12 - parse_value("e23")
    assert "m" in s and "nothing" not in s
    with pytest.raises(KeyError):
        s["nothing"]
    assert s._state.log[0] == "n = e1 + e3;"       # kept for save


@pytest.mark.parametrize("name", ["x y", "e1", "pi", "check", "1x", "x; use \"f\""])
def test_only_plain_names_can_be_set(name):
    with pytest.raises(GacalcError):
        Session()[name] = e1


def test_mistakes_raise_the_positioned_error():
    with pytest.raises(GacalcError) as caught:
        parse_value("e1 + ")
    assert caught.value.column == 5
    assert "^" in caught.value.caret_text()


def test_shared_session_is_one_object():
    assert gacalc.session() is gacalc.session()
    gacalc.session()["shared_x"] = e3
    assert gacalc.session().evaluate("shared_x") == e3


def test_multivector_kind_is_the_language_value():
    assert isinstance(parse_value("e1 + e23"), Multivector)
    assert parse_value("e1 + e23") == e1 + parse_value("e23")


def test_import_is_cheap_and_names_load_on_use():
    code = ("import sys, gacalc; assert 'sympy' not in sys.modules; "
            "assert 'IPython' not in sys.modules and 'matplotlib' not in sys.modules; "
            "import gacalc.language; assert 'sympy' not in sys.modules; "
            "from gacalc import Session; assert 'sympy' not in sys.modules; "
            "s = Session(); s.evaluate('e1 e2'); assert 'sympy' not in sys.modules; "
            "s.evaluate('sin(t) e1'); assert 'sympy' in sys.modules; "
            "assert 'matplotlib' not in sys.modules and 'IPython' not in sys.modules")
    subprocess.run([sys.executable, "-c", code], check=True)


def test_public_names():
    for name in ("Session", "Multivector", "parse_value", "session", "draw", "GacalcError",
                 "e1", "e2", "e3", "e23", "e31", "e12", "I", "ONE", "blade", "vector",
                 "bivector", "load_ipython_extension"):
        assert name in dir(gacalc) and getattr(gacalc, name) is not None
    with pytest.raises(AttributeError):
        gacalc.no_such_name

"""Scalars shown factored when shorter (flint), and names that stay valid input."""

import sympy

from gacalc.forms.naming import name_repeats
from gacalc.language import Session
from gacalc.simplify.factoring import factored

x, y = sympy.symbols("x y", real=True)


def test_factored_form_is_equal_and_shorter():
    expanded = sympy.expand((x + y) ** 4 * (x - 2 * y))
    shown = factored(expanded)
    # reference: sympy's own factor gives the same product (sympy.polys)
    assert sympy.expand(shown - expanded) == 0
    assert shown == sympy.factor(expanded)
    assert len(str(shown)) < len(str(expanded))


def test_irreducible_and_numeric_scalars_are_left_alone():
    assert factored(x**2 + y**2 + 1) == x**2 + y**2 + 1
    assert factored(sympy.Integer(12)) == 12


def test_factoring_goes_under_a_root():
    shown = factored(sympy.sqrt(sympy.expand((x + y) ** 4)))
    assert sympy.expand(shown**2 - (x + y) ** 4) == 0
    assert "x**2" not in str(shown)


def test_show_prints_the_factored_norm():
    s = Session()
    s.run("scalar x, y")
    text = s.run("show (x + y)^2 e12")[-1].report_text
    assert "(x + y)^4" in text and "(x + y)^2" in text


def test_arguments_of_a_call_are_never_named():
    texts = ["atan2(sqrt(a1^2 + a2^2 + a3^2 + b1), a1*b1 + a2*b2 + a3*b3)"] * 2
    for _, group in name_repeats(texts):
        assert "," not in group

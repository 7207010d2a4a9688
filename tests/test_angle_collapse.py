"""Same-plane rotor products and powers print over their angle (gacalc.simplify.angles).

Every collapsed value is checked three ways: numerically at random angles against
tests/ga_reference.py (an independent numpy Cl(3,0)), exactly by `check` against the
unsimplified product, and by reading its printed text back in a session.
"""

from __future__ import annotations

import numpy as np
import pytest
import sympy
from hypothesis import HealthCheck, given, settings, strategies as st

import ga_reference as ref
from conftest import ok
from gacalc.language import Session

RNG = np.random.default_rng(16)
BASIS = ["", "e1", "e2", "e3", "e23", "e31", "e12", "e123"]


def _value(session, text):
    return ok(session, text)[-1].value


def _printed(session, text):
    return session.format(_value(session, text))


def _numeric(value, point: dict) -> np.ndarray:
    """The eight components of a gacalc value at numeric symbol values (sympy lambdify)."""
    out = np.zeros(8)
    for index, expr in value.items():
        symbols = sorted(expr.free_symbols, key=str)
        f = sympy.lambdify(symbols, expr, "numpy")
        out[index] = f(*[point[str(s)] for s in symbols])
    return out


CASES = [
    # statement text, the text gacalc prints, the reference value from numpy
    ("power(rotor(e3, a), 3)", "cos(3*a/2) - sin(3*a/2)*e12",
     lambda v: ref.power(ref.rotor(ref.basis(3), v["a"]), 3)),
    ("rotor(e12, t)^5", "cos(5*t/2) - sin(5*t/2)*e12",
     lambda v: ref.power(ref.rotor(ref.basis(6), v["t"]), 5)),
    ("rotor(e12, t) rotor(e12, p)", "cos(p/2 + t/2) - sin(p/2 + t/2)*e12",
     lambda v: ref.gp(ref.rotor(ref.basis(6), v["t"]), ref.rotor(ref.basis(6), v["p"]))),
    ("rotor(e31, a) rotor(e31, b) rotor(e31, t)", "cos(a/2 + b/2 + t/2) - sin(a/2 + b/2 + t/2)*e31",
     lambda v: ref.gp(ref.gp(ref.rotor(ref.basis(5), v["a"]), ref.rotor(ref.basis(5), v["b"])),
                      ref.rotor(ref.basis(5), v["t"]))),
    # a rotor built by hand, squared
    ("(cos(t/2) - sin(t/2) e23)^2", "cos(t) - sin(t)*e23",
     lambda v: ref.power(ref.rotor(ref.basis(4), v["t"]), 2)),
    # a rotor that undoes part of another: angles subtract
    ("rotor(e12, t) rotor(e12, -p)", "cos(p/2 - t/2) + sin(p/2 - t/2)*e12",
     lambda v: ref.gp(ref.rotor(ref.basis(6), v["t"]), ref.rotor(ref.basis(6), -v["p"]))),
]


@pytest.mark.parametrize("text, printed, reference", CASES)
def test_same_plane_products_print_over_their_angle(text, printed, reference):
    session = Session()
    ok(session, "scalar a, b, p, t")
    assert _printed(session, f"x = {text}") == printed
    value = session.get("x")
    for _ in range(5):
        point = {name: RNG.uniform(-7, 7) for name in ("a", "b", "p", "t")}
        assert np.allclose(_numeric(value, point), reference(point), atol=1e-12)
    # exact: the printed text is the same value as the product written out
    assert ok(session, f"check {printed} == {text}")[-1].outcome == "holds"
    # and it reads back as itself
    assert _printed(session, printed) == printed


def test_shared_unit_axis_factors_out_per_component():
    session = Session()
    ok(session, "vector n unit\nscalar p, t")
    printed = _printed(session, "x = rotor(n, t) rotor(n, p)")
    assert printed == ("cos(p/2 + t/2) -\n  n1*sin(p/2 + t/2)*e23 - n2*sin(p/2 + t/2)*e31 - "
                       "n3*sin(p/2 + t/2)*e12")
    assert ok(session, "check x == rotor(n, p + t)")[-1].outcome == "holds"
    value = session.get("x")
    for _ in range(5):
        n = RNG.normal(size=3)
        n /= np.linalg.norm(n)
        point = {"n1": n[0], "n2": n[1], "n3": n[2], "p": RNG.uniform(-7, 7),
                 "t": RNG.uniform(-7, 7)}
        axis = ref.mv(e1=n[0], e2=n[1], e3=n[2])
        expected = ref.gp(ref.rotor(axis, point["t"]), ref.rotor(axis, point["p"]))
        assert np.allclose(_numeric(value, point), expected, atol=1e-12)


def test_periscope_line_of_sight_uses_one_form_of_its_angle():
    # the periscope demo's tilted bottom mirror: the line of sight turned by 2 delta
    session = Session()
    ok(session, "scalar delta\nn = (e1 - e2)/sqrt(2)\nhinged = rotate(rotor(e3, delta), n)")
    printed = _printed(session, "out = reflect(reflect(-e1, n), hinged)")
    assert printed == "-cos(2*delta)*e1 - sin(2*delta)*e2"
    value = session.get("out")
    for _ in range(5):
        d = RNG.uniform(-4, 4)
        expected = ref.rotate(ref.rotor(ref.basis(3), 2 * d), -ref.basis(1))
        assert np.allclose(_numeric(value, {"delta": d}), expected, atol=1e-12)


def test_products_in_different_planes_stay_as_they_are():
    # the product-to-sum form of cos(a/2) cos(b/2) has two terms: longer, not taken
    session = Session()
    ok(session, "scalar a, b")
    assert _printed(session, "rotor(e12, a) rotor(e23, b)") == (
        "cos(a/2)*cos(b/2) -\n  cos(a/2)*sin(b/2)*e23 - sin(a/2)*sin(b/2)*e31 - "
        "cos(b/2)*sin(a/2)*e12")


def test_some_angles_collapse_while_others_stay():
    session = Session()
    ok(session, "scalar a, b, c")
    printed = _printed(session, "x = rotor(e12, a) rotor(e12, b) rotor(e23, c)")
    assert "cos(a/2 + b/2)*cos(c/2)" in printed
    assert ok(session, "check x == rotor(e12, a + b) rotor(e23, c)")[-1].outcome == "holds"


def test_rotated_vector_by_two_same_plane_rotors():
    session = Session()
    ok(session, "scalar a, b")
    assert _printed(session, "rotate(rotor(e12, a) rotor(e12, b), e1)") == \
        "cos(a + b)*e1 + sin(a + b)*e2"


def test_a_scalar_product_of_sine_and_cosine_matches_sympy_trigsimp():
    # sympy's trigsimp is the reference: trigsimp(sin(a) cos(a)) = sin(2 a)/2
    a = sympy.Symbol("a")
    assert sympy.trigsimp(sympy.sin(a) * sympy.cos(a)) == sympy.sin(2 * a) / 2
    session = Session()
    ok(session, "scalar a")
    assert _printed(session, "cos(a) sin(a)") == "sin(2*a)/2"
    assert _printed(session, "cos(a)^2") == "cos(a)^2"      # 1/2 + cos(2 a)/2 is longer


def test_collapsed_values_compute_on_and_show_and_emit():
    session = Session()
    ok(session, "scalar p, t\nR = rotor(e12, t) rotor(e12, p)")
    assert _printed(session, "R R~") == "1"
    assert _printed(session, "R rotor(e12, -p)") == "cos(t/2) - sin(t/2)*e12"
    assert ok(session, "check R R~ == 1")[-1].outcome == "holds"
    code = ok(session, "emit python R")[-1]
    namespace: dict = {}
    exec(compile(code.text, "<emitted>", "exec"), namespace)   # generated code, not user text
    got = namespace["R"](0.3, 1.1)
    expected = ref.gp(ref.rotor(ref.basis(6), 1.1), ref.rotor(ref.basis(6), 0.3))
    assert np.allclose(got, [expected[0], expected[6]])
    report = ok(session, "show R")[-1].report_text
    assert "cos(p/2 + t/2) - sin(p/2 + t/2)*e12       # value" in report
    assert "\\cos{\\left(\\frac{p}{2} + \\frac{t}{2} \\right)}" in ok(session, "emit latex R")[-1].text


def test_an_exhausted_rewrite_budget_keeps_the_product_form():
    from gacalc.algebra.coefficients import from_expr
    from gacalc.simplify import Budget, display_coef

    t, p = sympy.symbols("t p", real=True)   # the symbols sessions use
    coef = from_expr(sympy.cos(t / 2) * sympy.cos(p / 2) - sympy.sin(t / 2) * sympy.sin(p / 2))
    spent = Budget(0.0)
    assert display_coef(coef, angle_budget=spent).text() == "cos(p/2)*cos(t/2) - sin(p/2)*sin(t/2)"
    assert display_coef(coef).text() == "cos(p/2 + t/2)"


def test_an_angle_sum_generator_expands_back_for_zero_tests():
    # the display form's cos(p/2 + t/2) is one value with the product it came from
    from gacalc.simplify import decide_zero, display_coef
    from gacalc.algebra.coefficients import from_expr

    t, p = sympy.symbols("t p", real=True)   # the symbols sessions use
    product = from_expr(sympy.cos(t / 2) * sympy.cos(p / 2) - sympy.sin(t / 2) * sympy.sin(p / 2))
    shown = display_coef(product)
    assert decide_zero(shown - product) is True
    assert decide_zero(shown - from_expr(sympy.cos(t / 2))) is False


_PLANES = {"e12": 6, "e23": 4, "e31": 5}


@st.composite
def rotor_chains(draw):
    """A product of 1-4 rotors in random planes, angles k*name/m, and an optional power."""
    factors = []
    for _ in range(draw(st.integers(1, 4))):
        plane = draw(st.sampled_from(sorted(_PLANES)))
        name = draw(st.sampled_from(["a", "b", "t"]))
        k = draw(st.sampled_from([1, 2, 3, -1]))
        factors.append((plane, name, k))
    power = draw(st.sampled_from([1, 1, 2, 3]))
    return factors, power


@settings(max_examples=12, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(rotor_chains())
def test_rotor_chains_stay_equal_after_the_rewrite(chain):
    factors, power = chain
    text = " ".join(f"rotor({plane}, {k}*{name})" for plane, name, k in factors)
    text = f"({text})^{power}"
    session = Session()
    ok(session, "scalar a, b, t")
    printed = _printed(session, f"x = {text}")
    value = session.get("x")
    for _ in range(3):
        point = {name: RNG.uniform(-7, 7) for name in ("a", "b", "t")}
        expected = ref.basis(0)
        for plane, name, k in factors:
            expected = ref.gp(expected, ref.rotor(ref.basis(_PLANES[plane]), k * point[name]))
        expected = ref.power(expected, power)
        assert np.allclose(_numeric(value, point), expected, atol=1e-10), (text, printed)
    # exactly equal to the product, and the printed text reads back as the same value
    # (its display may differ: read back, a family is written over its own base angle)
    assert ok(session, f"check {printed.replace(chr(10), ' ')} == {text}")[-1].outcome == "holds"

"""The simplifier: canonical zero tests and display forms of trigonometric coefficients.

Trigonometric identities are the addition and multiple-angle formulas of Abramowitz &
Stegun, Handbook of Mathematical Functions, section 4.3 (4.3.16, 4.3.17, 4.3.24, 4.3.25;
equation numbers quoted from memory).
"""

import sympy as sp
import pytest

from gacalc.algebra import Multivector, symbolic
from gacalc.simplify import is_zero, simplify, simplify_scalar

t = sp.Symbol("theta", real=True)
u = sp.Symbol("phi", real=True)


def zero(expr):
    return is_zero(Multivector({0: expr}))


@pytest.mark.parametrize(
    "lhs, rhs",
    [
        (sp.sin(t + u), sp.sin(t) * sp.cos(u) + sp.cos(t) * sp.sin(u)),  # A&S 4.3.16
        (sp.cos(t + u), sp.cos(t) * sp.cos(u) - sp.sin(t) * sp.sin(u)),  # A&S 4.3.17
        (sp.sin(2 * t), 2 * sp.sin(t) * sp.cos(t)),  # A&S 4.3.24
        (sp.cos(2 * t), 2 * sp.cos(t) ** 2 - 1),  # A&S 4.3.25
        (sp.cos(3 * t), 4 * sp.cos(t) ** 3 - 3 * sp.cos(t)),  # triple angle, common practice
        (sp.sin(t) ** 2 + sp.cos(t) ** 2, 1),  # Pythagorean identity, common practice
        (sp.cos(t / 2) ** 2, (1 + sp.cos(t)) / 2),  # half-angle, A&S 4.3.20 (from memory)
        (sp.tan(t) * sp.cos(t), sp.sin(t)),
    ],
)
def test_trig_identities_hold(lhs, rhs):
    assert zero(lhs - rhs) is True


@pytest.mark.parametrize(
    "expr",
    [sp.sin(t) - sp.cos(t), sp.cos(2 * t) - sp.cos(t) ** 2, sp.sin(t / 2) ** 2 - sp.sin(t) ** 2, t - 1],
)
def test_non_identities_are_refuted(expr):
    assert zero(expr) is False


def test_rotor_sandwich_comes_back_in_full_angles():
    # R = exp(-e12 θ/2) turns e1 toward e2 (DESIGN.md); R x R~ is the plane rotation by θ.
    R = Multivector({0: sp.cos(t / 2), 6: -sp.sin(t / 2)})
    x, _ = symbolic("vector", "x")
    out = simplify(R * x * R.rev()).value
    x1, x2, x3 = sp.symbols("x1 x2 x3", real=True)
    assert sp.expand(out[1] - (x1 * sp.cos(t) - x2 * sp.sin(t))) == 0
    assert sp.expand(out[2] - (x1 * sp.sin(t) + x2 * sp.cos(t))) == 0
    assert out[3] == x3
    assert "theta/2" not in str(out)


def test_display_prefers_the_shorter_form():
    assert simplify_scalar(sp.cos(2 * t) - sp.cos(t) ** 2) == -sp.sin(t) ** 2


def test_radicals_square_back():
    a1, a2 = sp.symbols("a1 a2", real=True)
    r = Multivector({0: sp.sqrt(a1**2 + a2**2)})
    assert simplify(r * r).value[0] == a1**2 + a2**2
    assert is_zero(r * r - (a1**2 + a2**2)) is True


def test_opaque_generators_use_a_numeric_witness():
    x = sp.Symbol("x", real=True)
    assert zero(sp.exp(x) - sp.exp(2 * x)) is False


def test_budget_gives_an_honest_fallback():
    M, _ = symbolic("multivector", "M")
    big = M * M * M
    res = simplify(big, budget=0.0)
    assert res.complete is False
    assert res.value.identical(big)

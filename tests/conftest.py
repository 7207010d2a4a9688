"""Helpers shared by the test files (imported as ``from conftest import ...``)."""

from __future__ import annotations

import dataclasses

import sympy

from gacalc.language import GacalcError


def ok(session, text, filename=None) -> list:
    """Run statements that must all succeed; their results."""
    results = session.run(text, filename)
    errors = [r for r in results if isinstance(r, GacalcError)]
    assert not errors, errors[0].caret_text()
    return results


def patch_builtin(monkeypatch, name, impl):
    """Replace the implementation of a built-in for one test."""
    from gacalc.language import builtins

    monkeypatch.setitem(builtins.BUILTINS, name,
                        dataclasses.replace(builtins.BUILTINS[name], impl=impl))


def same(a, b) -> bool:
    """Two multivectors are equal: their difference simplifies to zero."""
    from gacalc.simplify import is_zero

    return is_zero(a - b) is True


def stereographic_unit(u, v) -> tuple:
    """A rational unit vector (x, y, z): inverse stereographic projection of (u, v)
    (common practice)."""
    u, v = sympy.Rational(u), sympy.Rational(v)
    d = u**2 + v**2 + 1
    return (2 * u / d, 2 * v / d, (u**2 + v**2 - 1) / d)

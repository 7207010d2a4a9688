"""Scalars shown factored when that is shorter: flint's multivariate factorisation.

A display rule, like the half-angle merge: the value is unchanged, only its written form.
``show`` asks for it on its scalar items and conditions; (a1 b2 - a2 b1)^2 reads better
than its six-term expansion, and a condition a^2 + b^2 of a product often factors into
the conditions of its factors.
"""

from __future__ import annotations

from gacalc.lazy import sympy

from gacalc.algebra.coefficients import from_expr, poly_to_expr

MAX_TERMS = 400       # longer polynomials are left as they are (factoring would be slow)


def _product(content, factors, reg):
    out = sympy.Rational(int(content.p), int(content.q))
    for factor, multiplicity in factors:
        out *= poly_to_expr(factor, reg) ** multiplicity
    return out


def factored(expr):
    """expr or an equal product of its flint factors, whichever is shorter as text."""
    if not isinstance(expr, sympy.Expr) or expr.is_number or expr.has(sympy.Float):
        return expr
    if expr.is_Pow and not expr.exp.is_Integer:      # a root (a norm): factor under it
        inner = factored(expr.base)
        return inner ** expr.exp if inner is not expr.base else expr
    try:
        coef = from_expr(expr)
    except (ValueError, TypeError, ArithmeticError):
        return expr
    if coef.expr is not None:
        return expr
    reg, num, den = coef._own_parts()
    if len(num) > MAX_TERMS or (den is not None and len(den) > MAX_TERMS):
        return expr
    content, factors = num.factor()
    if len(factors) < 2 and all(m == 1 for _, m in factors) and den is None:
        return expr                     # irreducible: nothing to gain
    result = _product(content, factors, reg)
    if den is not None:
        dcontent, dfactors = den.factor()
        result = result / _product(dcontent, dfactors, reg)
    return result if len(str(result)) < len(str(expr)) else expr

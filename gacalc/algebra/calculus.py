"""Derivatives of multivectors: d/ds, the vector derivative, Jacobians, rotor rates, series.

A coefficient is a rational function num/den of generators (gacalc.algebra.coefficients);
its derivative follows the chain rule through them, d c/ds = sum_k (dc/dg_k) (dg_k/ds).
The partial derivatives dc/dg_k are taken on the flint polynomials themselves (the fast
path); only dg_k/ds, the derivative of one generator (cos(u), sqrt(p), r1(t), ...), goes
through sympy's ``diff`` on the expression the generator stands for, once per generator
and symbol (kept in the algebra context).  Functions of a scalar, r1(t), and their
derivatives are generators too, so derivatives of declared time-dependent values stay in
the domain.

Conventions (README, Conventions): the vector derivative is nabla F = sum_i e_i dF/dx_i
(e_i on the left); a rotor path satisfies dR/dt = -1/2 Omega R, so Omega = -2 dR/dt R^-1
(a bivector for a scaled rotor) and its axis vector is w = dual(Omega), Omega = w I.
"""

from __future__ import annotations

import math

from gacalc.lazy import sympy

from .coefficients import Coef, from_expr
from .context import current, registry
from .multivector import AlgebraError, Multivector

_CACHE = "calculus.generator_derivatives"


def is_scalar_symbol(expr) -> bool:
    """A plain real scalar symbol (what can be differentiated with respect to)."""
    return isinstance(expr, sympy.Symbol)


def _generator_derivative(info, pos: int, s) -> Coef:
    """d g/ds of one generator as a coefficient (cached per context, generator and s)."""
    cache = current().store(_CACHE, dict)
    key = (info.expr, s)
    found = cache.get(key)
    if found is None:
        if info.kind == "symbol":
            found = Coef.constant(1 if info.expr == s else 0)
        elif info.kind == "root":
            base, n = info.root        # d base^(1/n) = base' base^(1/n) / (n base)
            root = Coef(registry().gen(pos))
            found = differentiate_coef(base, s) * root / (base * Coef.constant(n))
        else:
            found = from_expr(_named_dummies(sympy.diff(info.expr, s)))
        cache[key] = found
    return found


def _named_dummies(expr):
    """sympy writes f'(2 t) as Subs(Derivative(f(_xi), _xi), _xi, 2 t); give the bound
    variable a real name (xi) so the text is valid input and reads back the same."""
    dummies = sorted(expr.atoms(sympy.Dummy), key=str)
    if not dummies:
        return expr
    names = ["xi"] + [f"xi{k}" for k in range(2, len(dummies) + 1)]
    return expr.xreplace({d: sympy.Symbol(n, real=True) for d, n in zip(dummies, names)})


def differentiate_coef(c: Coef, s) -> Coef:
    """dc/ds for a coefficient and a real scalar symbol s."""
    if c.expr is not None:       # floating point: sympy Expr mode
        return Coef.from_expr_mode(sympy.diff(c.expr, s))
    num, den = c.parts()
    reg = registry()
    positions = set()
    for p in (num, den):
        if p is not None:
            positions.update(pos for pos, d in enumerate(p.degrees()) if d > 0)
    total = Coef.constant(0)
    for pos in sorted(positions):
        if pos == 0:
            continue
        info = reg.info(pos)
        if s not in info.expr.free_symbols:
            continue
        rate = _generator_derivative(info, pos, s)
        if rate.is_zero():
            continue
        # positions are stable while the registry grows: re-read num, den in its context
        num, den = c.parts()
        dnum = Coef(num.derivative(pos))
        if den is None:
            partial = dnum
        else:
            dden = Coef(den.derivative(pos))
            d = Coef(den)
            partial = (dnum * d - Coef(num) * dden) / (d * d)
        total = total + partial * rate
    return total


def diff(x: Multivector, s, k: int = 1) -> Multivector:
    """The k-th derivative of a multivector with respect to the real scalar symbol s."""
    if not is_scalar_symbol(s):
        raise AlgebraError("derivatives are taken with respect to a scalar symbol")
    for _ in range(k):
        x = Multivector.from_coefs(None if c is None else differentiate_coef(c, s) for c in x.coefs())
        if x.is_zero():
            break
    return x


# ---------------------------------------------------------------------------
# the vector derivative


def vector_symbols(x: Multivector):
    """The three coordinate symbols of a vector variable x = x1 e1 + x2 e2 + x3 e3, or None
    when x is not a vector of three distinct plain symbols (a declared vector)."""
    coefs = x.coefs()
    if any(c is not None for i, c in enumerate(coefs) if i not in (1, 2, 3)):
        return None
    out = []
    for i in (1, 2, 3):
        e = x[i]
        if not is_scalar_symbol(e):
            return None
        out.append(e)
    return tuple(out) if len(set(out)) == 3 else None


def _basis_vectors():
    return [Multivector({i: 1}) for i in (1, 2, 3)]


def partials(f: Multivector, coords) -> list:
    """[dF/dx1, dF/dx2, dF/dx3]."""
    return [diff(f, c) for c in coords]


def nabla(f: Multivector, coords) -> Multivector:
    """The vector derivative sum_i e_i dF/dx_i (geometric product, e_i on the left)."""
    total = Multivector({})
    for e, d in zip(_basis_vectors(), partials(f, coords)):
        total = total + e * d
    return total


def divergence(f: Multivector, coords) -> Multivector:
    """sum_i e_i _| dF/dx_i: the divergence of a vector field (lowers grade by one)."""
    total = Multivector({})
    for e, d in zip(_basis_vectors(), partials(f, coords)):
        total = total + e.lc(d)
    return total


def curl(f: Multivector, coords) -> Multivector:
    """The Gibbs curl of a vector field: dual(nabla /\\ F)."""
    if not f.grades() <= {1}:
        raise AlgebraError("curl needs a vector field")
    total = Multivector({})
    for e, d in zip(_basis_vectors(), partials(f, coords)):
        total = total + e.outer(d)
    return total.dual()


def directional(f: Multivector, coords, u: Multivector) -> Multivector:
    """(u . nabla) F = sum_i u_i dF/dx_i."""
    if not u.grades() <= {1}:
        raise AlgebraError("the direction must be a vector")
    total = Multivector({})
    for i, d in zip((1, 2, 3), partials(f, coords)):
        c = u.coefs()[i]
        if c is not None:
            total = total + d.scale(c)
    return total


def jacobian(f: Multivector, variables, conditions=()) -> sympy.Matrix:
    """The matrix of dF_i/dv_j: rows e1, e2, e3 for a vector F (one row for a scalar F),
    one column per scalar variable; entries in the simplifier's display form."""
    if f.grades() <= {0}:
        rows = (0,)
    elif f.grades() <= {1}:
        rows = (1, 2, 3)
    else:
        raise AlgebraError("the Jacobian needs a vector (or scalar) valued function")
    simplifier = current().simplifier
    columns = [simplifier.simplify(diff(f, v), conditions) for v in variables]
    return sympy.Matrix(len(rows), len(columns), lambda i, j: columns[j][rows[i]])


# ---------------------------------------------------------------------------
# rotor kinematics


def angular_velocity(r: Multivector, t, unit: bool | None = None) -> Multivector:
    """Omega with dR/dt = -1/2 Omega R, i.e. Omega = -2 <dR/dt R^-1>_2.

    For a unit rotor (``unit`` True, or R R~ simplifying to 1) R^-1 = R~; a scaled rotor
    uses its inverse, whose scale only adds a scalar part that the grade-2 part drops."""
    if not r.grades() <= {0, 2}:
        raise AlgebraError("angular_velocity needs a rotor (an even multivector)")
    rate = diff(r, t)
    if unit is None:
        unit = current().simplifier.is_zero(r * r.rev() - 1) is True
    inverse = r.rev() if unit else r.inverse()
    return (rate * inverse).grade(2).scale(-2)


def angular_velocity_vector(r: Multivector, t, unit: bool | None = None) -> Multivector:
    """The axis vector w of Omega = w I (so w = dual(Omega)); dx/dt = w x x for x = R x0 R~."""
    return angular_velocity(r, t, unit).dual()


# ---------------------------------------------------------------------------
# series


def _at(x: Multivector, s, s0) -> Multivector:
    """x with s = s0; AlgebraError when a component is not defined there (a pole)."""
    values = {}
    for k, e in x.items():
        v = e.subs(s, s0)
        if v.has(sympy.zoo, sympy.nan, sympy.oo, -sympy.oo):
            raise AlgebraError(f"not defined at {s} = {s0}: no Taylor series there")
        values[k] = v
    return Multivector(values)


def series(x: Multivector, s, s0, n: int) -> Multivector:
    """Taylor polynomial sum_{k <= n} X^(k)(s0) (s - s0)^k / k! of a multivector in s."""
    if not is_scalar_symbol(s):
        raise AlgebraError("a series is taken in a scalar symbol")
    if isinstance(s0, sympy.Basic) and s in s0.free_symbols:
        raise AlgebraError("the expansion point must not contain the series variable")
    total = Multivector({})
    derivative = x
    step = Multivector({0: s - s0})
    power = Multivector({0: 1})
    for k in range(n + 1):
        value = _at(derivative, s, s0)
        total = total + (value * power).scale(sympy.Rational(1, math.factorial(k)))
        if k == n:
            break
        derivative = diff(derivative, s)
        power = power * step
    return total

"""Built-ins of calculus and kinematics: diff, nabla, div, curl, ddir, jacobian,
angular_velocity, angular_velocity_vector, series.  The mathematics is in
gacalc.algebra.calculus; this module checks arguments and points errors at them."""

from __future__ import annotations

from .builtins import builtin

MAX_DERIVATIVE_ORDER = 40
MAX_SERIES_ORDER = 40


def _calculus():
    from gacalc.algebra import calculus

    return calculus


def _scalar_symbol(ctx, index: int, what: str = "derivatives are taken"):
    """The argument as a real scalar symbol, or a one-line error at it."""
    value = ctx.args[index]
    from gacalc.algebra import Multivector

    if isinstance(value, Multivector) and (value.is_scalar() or value.is_zero()):
        expr = value.scalar_part()
        if _calculus().is_scalar_symbol(expr):
            return expr
    ctx.fail(f"{what} with respect to a scalar symbol such as t, not this", index)


def _vector_variable(ctx, index: int):
    """The coordinate symbols of a declared vector (vector x: x1, x2, x3)."""
    from gacalc.algebra import Multivector

    value = ctx.args[index]
    coords = _calculus().vector_symbols(value) if isinstance(value, Multivector) else None
    if coords is None:
        ctx.fail("the variable must be a declared vector (such as x after 'vector x'), "
                 "whose components are plain symbols", index)
    if any(condition.free_symbols & set(coords) for condition in ctx.conditions()):
        ctx.fail("the variable is constrained by a side condition (such as 'unit'); "
                 "differentiate with respect to a free vector", index)
    return coords


def _field(ctx, index: int = 0):
    return ctx.multivector(index)


@builtin("diff(X, s, [k])", "derivative of X with respect to the scalar symbol s (k-th "
         "derivative with k); through trig, exp, sqrt, products, inverses and declared "
         "functions such as vector r(t); a real matrix entry by entry", "diff(rotor(e12, 2 t), t)", "calculus")
def _diff(ctx, x, s, k=None):
    variable = _scalar_symbol(ctx, 1)
    order = 1 if k is None else ctx.integer(2, 0, MAX_DERIVATIVE_ORDER)
    if _is_real_matrix(x):      # matrix(R) and friends: entry by entry
        from gacalc.algebra import Multivector

        return x.applyfunc(lambda e: _calculus().diff(Multivector.scalar(e), variable,
                                                      order)[0])
    return _calculus().diff(_field(ctx), variable, order)


def _is_real_matrix(value) -> bool:
    import sympy

    return isinstance(value, sympy.MatrixBase) and not any(e.has(sympy.I) for e in value)


@builtin("nabla(F, x)", "vector derivative sum e_i dF/dx_i with respect to a declared "
         "vector x: gradient of a scalar, div + curl bivector of a vector field",
         "vector x; nabla(x . x, x)", "calculus")
def _nabla(ctx, f, x):
    return _calculus().nabla(_field(ctx), _vector_variable(ctx, 1))


@builtin("div(F, x)", "divergence sum e_i _| dF/dx_i with respect to a declared vector x",
         "vector x; div(x, x)", "calculus")
def _div(ctx, f, x):
    return _calculus().divergence(_field(ctx), _vector_variable(ctx, 1))


@builtin("curl(F, x)", "Gibbs curl of a vector field: dual(nabla /\\ F) with respect to a "
         "declared vector x", "vector x; curl(cross(e3, x), x)", "calculus")
def _curl(ctx, f, x):
    value = _field(ctx)
    coords = _vector_variable(ctx, 1)
    if not value.grades() <= {1}:
        ctx.fail("curl needs a vector field", 0)
    return _calculus().curl(value, coords)


@builtin("ddir(F, x, u)", "directional derivative (u . nabla) F with respect to a declared "
         "vector x along the vector u", "vector x; ddir(x . x, x, e1)", "calculus")
def _ddir(ctx, f, x, u):
    value = _field(ctx)
    coords = _vector_variable(ctx, 1)
    return _calculus().directional(value, coords, ctx.vector(2))


@builtin("jacobian(F, v)", "matrix of dF_i/dv_j of a vector (or scalar) F, with respect to a "
         "declared vector v or a list of scalar symbols (s1, s2, ...)",
         "rotor R; jacobian(rotate(R, e1), (R0, R23, R31, R12))", "calculus")
def _jacobian(ctx, f, v):
    value = _field(ctx)
    variables = _jacobian_variables(ctx, 1)
    if not value.grades() <= {0, 1}:
        ctx.fail("the Jacobian needs a vector (or scalar) valued F", 0)
    return _calculus().jacobian(value, variables, ctx.conditions())


def _jacobian_variables(ctx, index: int):
    """A declared vector's coordinates, or the scalar symbols of a list."""
    from gacalc.algebra import Multivector

    value = ctx.args[index]
    if isinstance(value, Multivector):
        if value.is_scalar() and not value.is_zero():
            return (_scalar_symbol(ctx, index, "a Jacobian is taken"),)
        return _vector_variable(ctx, index)
    items = _list_items(value)
    if items is None:
        ctx.fail("the variables must be a declared vector or a list of scalar symbols "
                 "(s1, s2, ...)", index)
    calculus = _calculus()
    out = []
    for item in items:
        expr = item.scalar_part() if isinstance(item, Multivector) and item.is_scalar() else None
        if expr is None or not calculus.is_scalar_symbol(expr):
            ctx.fail("every entry of the list must be a scalar symbol", index)
        if expr in out:
            ctx.fail(f"{expr} appears twice in the list", index)
        out.append(expr)
    if not out:
        ctx.fail("the list of variables is empty", index)
    return tuple(out)


def _list_items(value):
    """The entries of a list value (the LIST kind of gacalc.values), or None."""
    from gacalc.values import kind_of

    kind = kind_of(value)
    if kind is None or kind.name != "list":
        return None
    return list(value)


_OMEGA_HELP = ("the bivector Omega of a rotor path R(t), with dR/dt = -1/2 Omega R "
               "(space frame); Omega = w I for the axis vector w")


@builtin("angular_velocity(R, t)", "angular velocity: " + _OMEGA_HELP,
         "angular_velocity(rotor(e12, 3 t), t)", "calculus", chain=(0, 0, 0))
def _angular_velocity(ctx, r, t):
    rotor = _rotor_path(ctx)
    return _calculus().angular_velocity(rotor, _scalar_symbol(ctx, 1), _unit(ctx))


@builtin("angular_velocity_vector(R, t)", "axis vector w of the angular velocity, "
         "Omega = w I, so dx/dt = cross(w, x) for x = R x0 R~",
         "angular_velocity_vector(rotor(e3, 2 t), t)", "calculus", chain=(0, 0, 0))
def _angular_velocity_vector(ctx, r, t):
    rotor = _rotor_path(ctx)
    return _calculus().angular_velocity_vector(rotor, _scalar_symbol(ctx, 1), _unit(ctx))


def _rotor_path(ctx):
    rotor = ctx.multivector(0)
    if not rotor.grades() <= {0, 2} or rotor.is_zero():
        ctx.fail("the first argument must be a rotor (scalar + bivector)", 0)
    return rotor


def _unit(ctx):
    """Whether the rotor is unit, with the session's conditions (R R~ = 1)."""
    from gacalc.algebra.context import current

    rotor = ctx.args[0]
    return current().simplifier.is_zero(rotor * rotor.rev() - 1, ctx.conditions()) is True


@builtin("series(X, s, s0, n)", "Taylor polynomial of X in the scalar symbol s about s0, "
         "through the power (s - s0)^n", "series(rotor(e12, h), h, 0, 2)", "calculus")
def _series(ctx, x, s, s0, n):
    value = _field(ctx)
    variable = _scalar_symbol(ctx, 1, "a series is taken")
    point = ctx.scalar(2)
    if variable in point.free_symbols:
        ctx.fail("the expansion point must not contain the series variable", 2)
    order = ctx.integer(3, 0, MAX_SERIES_ORDER)
    return _calculus().series(value, variable, point, order)

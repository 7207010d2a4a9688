"""The table of built-in functions: name, arity, one-line help, a runnable example.

Each implementation receives a CallContext (gacalc.language.evaluator) and the argument
values.  The core modules are imported inside the function bodies, so importing this
table (the token table does, for highlighting) stays cheap and never needs sympy.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Callable


# How often a built-in multiplies its arguments together, as argument positions in the
# order of the products: a rotor sandwich R x R~ is (0, 1, 0), a norm A A~ is (0, 0).
# The size limits estimate the chain before the call (gacalc.language.limits); LINEAR,
# the default, declares a built-in linear in its arguments (grade parts, involutions,
# scalar functions, representations), whose result is checked after the call.
LINEAR: tuple[int, ...] = ()


@dataclass(frozen=True)
class Builtin:
    name: str
    min_args: int
    max_args: int
    signature: str
    help: str
    example: str
    impl: Callable
    category: str
    chain: tuple[int, ...] = LINEAR
    estimate: Callable | None = None    # (args, span): its own size check instead of chain
    words: bool = False                 # takes words in quotes ("zyx") as arguments

    def arity_text(self) -> str:
        if self.min_args == self.max_args:
            count = self.min_args
            return f"{count} argument" + ("" if count == 1 else "s")
        return f"{self.min_args} to {self.max_args} arguments"


BUILTINS: dict[str, Builtin] = {}


def builtin(signature: str, help: str, example: str, category: str,
            min_args: int | None = None, max_args: int | None = None, *,
            chain: tuple[int, ...] = LINEAR, estimate: Callable | None = None,
            words: bool = False):
    """Register an implementation; arity defaults to the count in the signature.
    ``chain`` (or ``estimate``) is what the size limits check before a call; ``words``
    lets arguments be words in quotes (they arrive as Python strings)."""
    name, _, rest = signature.partition("(")
    params = [p.strip() for p in rest.rstrip(")").split(",") if p.strip()]
    required = [p for p in params if not p.startswith("[")]

    def register(function: Callable) -> Callable:
        BUILTINS[name] = Builtin(
            name=name,
            min_args=len(required) if min_args is None else min_args,
            max_args=len(params) if max_args is None else max_args,
            signature=signature, help=help, example=example, impl=function,
            category=category, chain=chain, estimate=estimate, words=words)
        return function

    return register


def _core():
    import gacalc.algebra as algebra

    return algebra


def _sympy():
    import sympy

    return sympy


def _scalar_mv(x):
    sympy = _sympy()
    if isinstance(x, sympy.Basic) and x.has(sympy.zoo, sympy.nan, sympy.oo):
        from .errors import GacalcMathError

        raise GacalcMathError("the result is undefined (a pole or a division by zero)")
    return _core().Multivector.scalar(x)


def _limits():
    from . import limits

    return limits


def _rotors():
    from gacalc.algebra import rotors

    return rotors


def _versors():
    from gacalc.algebra import versors

    return versors


def _representations():
    from gacalc.algebra import representations

    return representations


# Parts and involutions -------------------------------------------------------------
@builtin("grade(A, [k])", "grade-k part of A; with one argument, the grade of a "
         "homogeneous A", "grade(3 + e1 + e12, 2)", "parts")
def _grade(ctx, a, k=None):
    a = ctx.multivector(0)
    if k is None:
        grades = sorted(a.grades())
        if not grades:
            ctx.fail("0 has no grade", 0)
        if len(grades) > 1:
            listed = ", ".join(str(g) for g in grades[:-1]) + f" and {grades[-1]}"
            ctx.fail(f"this value has grades {listed}: grade(A, k) picks one", 0)
        return _scalar_mv(grades[0])
    return a.grade(ctx.integer(1, 0, 3))


@builtin("even(A)", "even part: grades 0 and 2", "even(1 + e1 + e12 + e123)", "parts")
def _even(ctx, a):
    return ctx.multivector(0).even()


@builtin("odd(A)", "odd part: grades 1 and 3", "odd(1 + e1 + e12 + e123)", "parts")
def _odd(ctx, a):
    return ctx.multivector(0).odd()


@builtin("component(A, blade)", "coefficient of a basis blade in A (blade such as e12)",
         "component(3 e1 + 5 e12, e12)", "parts")
def _component(ctx, a, blade):
    a = ctx.multivector(0)
    b = ctx.multivector(1)
    items = b.items()
    sympy = _sympy()
    if len(items) != 1 or items[0][1] not in (sympy.Integer(1), sympy.Integer(-1)):
        ctx.fail("the second argument must be a basis blade such as e1 or e12", 1)
    index, sign = items[0]
    return _scalar_mv(a[index] * sign)


@builtin("rev(A)", "reverse (also written A~): reverses the order of vector factors",
         "rev(e1 e2)", "involutions")
def _rev(ctx, a):
    return ctx.multivector(0).rev()


@builtin("involute(A)", "grade involution: negates the odd grades", "involute(1 + e1 + e12)",
         "involutions")
def _involute(ctx, a):
    return ctx.multivector(0).involute()


@builtin("conjugate(A)", "Clifford conjugate: reverse and grade involution together",
         "conjugate(1 + e1 + e12 + e123)", "involutions")
def _conjugate(ctx, a):
    return ctx.multivector(0).conjugate()


@builtin("dual(A)", "dual: A I^-1", "dual(e1)", "involutions")
def _dual(ctx, a):
    return ctx.multivector(0).dual()


@builtin("undual(A)", "inverse of dual: A I", "undual(e23)", "involutions")
def _undual(ctx, a):
    return ctx.multivector(0).undual()


# Norms and inverses ---------------------------------------------------------------
@builtin("norm(A)", "norm: sqrt(<A A~>)", "norm(3 e1 + 4 e2)", "norms",
         chain=(0, 0))
def _norm(ctx, a):
    return _scalar_mv(ctx.multivector(0).norm())


@builtin("norm2(A)", "squared norm: <A A~>", "norm2(3 e1 + 4 e2)", "norms",
         chain=(0, 0))
def _norm2(ctx, a):
    return _scalar_mv(ctx.multivector(0).norm2())


@builtin("inverse(A)", "inverse of any invertible multivector, matrix or linear map "
         "(also A^-1)", "inverse(1 + e1 + e12)", "norms",
         chain=(0, 0, 0, 0))
def _inverse(ctx, a):
    return ctx.inverse(a, 0)    # the value's kind computes it


# Products --------------------------------------------------------------------------
@builtin("cross(a, b)", "Gibbs cross product of two vectors: dual(a /\\ b)",
         "cross(e1, e2)", "products",
         chain=(0, 1))
def _cross(ctx, a, b):
    return _core().cross(ctx.vector(0), ctx.vector(1))


@builtin("comm(A, B)", "commutator product (A B - B A)/2", "comm(e12, e1)", "products",
         chain=(0, 1))
def _comm(ctx, a, b):
    return ctx.multivector(0).comm(ctx.multivector(1))


@builtin("anticomm(A, B)", "anticommutator product (A B + B A)/2", "anticomm(e1, e1 + e2)",
         "products",
         chain=(0, 1))
def _anticomm(ctx, a, b):
    return ctx.multivector(0).anticomm(ctx.multivector(1))


# Versors and rotors ----------------------------------------------------------------
@builtin("project(x, B)", "projection of x onto the blade B: (x _| B) B^-1",
         "project(e1 + e3, e12)", "versors",
         chain=(0, 1, 1, 1, 1))
def _project(ctx, x, b):
    return _versors().project(ctx.multivector(0), ctx.multivector(1))


@builtin("reject(x, B)", "rejection of x from the blade B: x minus its projection",
         "reject(e1 + e3, e12)", "versors",
         chain=(0, 1, 1, 1, 1))
def _reject(ctx, x, b):
    return _versors().reject(ctx.multivector(0), ctx.multivector(1))


@builtin("reflect(X, n)", "reflection of X in the plane with normal vector n",
         "reflect(e1 + e2, e1)", "versors",
         chain=(1, 0, 1))
def _reflect(ctx, x, n):
    return _versors().reflect(ctx.multivector(0), ctx.vector(1))


@builtin("apply(V, X)", "versor V applied to X: V X V^-1, with the grade involution of X "
         "for odd V", "apply(e1, e2 + e1)", "versors",
         chain=(0, 1, 0, 0, 0))
def _apply(ctx, v, x):
    return _versors().apply_versor(ctx.multivector(0), ctx.multivector(1))


@builtin("rotor(B, theta)", "rotor exp(-B theta/2) for a unit bivector B or a unit axis "
         "vector n (plane n I); rotor(a, b) turns the direction of a into that of b (any "
         "nonzero lengths)",
         "rotor(e12, pi/2)", "rotors",
         chain=(0, 0, 0, 1))
def _rotor(ctx, first, second):
    first = ctx.multivector(0)
    second = ctx.multivector(1)
    if second.is_scalar() or second.is_zero():
        return _rotors().rotor(first, second.scalar_part(), ctx.conditions())
    if first.grades() == {1} and second.grades() == {1}:
        rotor, arbitrary = _rotors().rotor_between(first, second, ctx.conditions())
        if _rotors().lengths_unknown(first, second, ctx.conditions()):
            from .syntax import Name, unparse

            a, b = (unparse(node) for node in ctx.node.args[:2])
            pa, pb = (text if isinstance(node, Name) else f"({text})"
                      for text, node in zip((a, b), ctx.node.args))
            ctx.note(f"rotor({a}, {b}) turns the direction of {a} into that of {b}: valid "
                     f"where both are nonzero and not opposite (|{a}| |{b}| + {pa} . {pb} "
                     "!= 0)")
        if arbitrary:
            ctx.note("the vectors are opposite: any plane containing them works; "
                     "one was chosen")
        return rotor
    ctx.fail("the second argument must be an angle (a scalar) or, with a vector first, "
             "a vector", 1)


@builtin("rotate(R, x)", "rotation of x by the rotor R: R x R~", "rotate(rotor(e12, pi/2), e1)",
         "rotors",
         chain=(0, 1, 0))
def _rotate(ctx, r, x):
    return _rotors().rotate(ctx.multivector(0), ctx.multivector(1), ctx.conditions())


@builtin("angle(R)", "rotation angle of a rotor; angle(A, B) is the angle between lines "
         "(vectors) and planes (bivectors)", "angle(rotor(e12, pi/3))", "rotors",
         min_args=1, max_args=2,
         chain=(0, 0, 0))
def _angle(ctx, r, b=None):
    first = ctx.multivector(0)
    if b is None:
        return _scalar_mv(_rotors().rotor_angle(first, ctx.conditions()))
    from gacalc.algebra import subspaces

    # two lines or two planes: [0, pi]; a line and a plane: [-pi/2, pi/2] (README)
    return _scalar_mv(subspaces.angle(first, ctx.multivector(1), ctx.conditions()))


@builtin("axis(R)", "unit rotation axis of a rotor (right-hand rule)",
         "axis(rotor(e3, pi/2))", "rotors",
         chain=(0, 0, 0))
def _axis(ctx, r):
    return _rotors().rotor_axis(ctx.multivector(0), ctx.conditions())


@builtin("plane(R)", "unit rotation plane (bivector) of a rotor", "plane(rotor(e12, pi/2))",
         "rotors",
         chain=(0, 0, 0))
def _plane(ctx, r):
    return _rotors().rotor_plane(ctx.multivector(0), ctx.conditions())


@builtin("power(R, q)", "rational power of a rotor: the rotation scaled by q",
         "power(rotor(e12, pi/2), 1/2)", "rotors",
         chain=(0, 0, 0))
def _power(ctx, r, q):
    return _rotors().power(ctx.multivector(0), ctx.rational(1), ctx.conditions())


@builtin("slerp(R1, R2, t)", "spherical interpolation between rotors along the shorter arc",
         "slerp(1, rotor(e12, pi/2), 1/2)", "rotors",
         chain=(0, 1, 0, 1))
def _slerp(ctx, r1, r2, t):
    return _rotors().slerp(ctx.multivector(0), ctx.multivector(1), ctx.scalar(2),
                          ctx.conditions())


# exp, log, sqrt: scalar functions on scalars, the algebra's on multivectors ---------
@builtin("exp(A)", "exponential: of a scalar, or of any multivector (closed form)",
         "exp(-e12 pi/4)", "functions",
         chain=(0, 0, 0))
def _exp(ctx, a):
    value = ctx.multivector(0)
    if value.is_scalar() or value.is_zero():
        return _scalar_mv(_sympy().exp(value.scalar_part()))
    return _rotors().exp(value)


@builtin("log(A)", "logarithm: of a scalar, or of a rotor (principal branch, a bivector)",
         "log(rotor(e12, pi/3))", "functions",
         chain=(0, 0, 0))
def _log(ctx, a):
    value = ctx.multivector(0)
    if value.is_scalar() or value.is_zero():
        if value.is_zero():
            ctx.fail("log(0) is undefined", 0)
        return _scalar_mv(_sympy().log(value.scalar_part()))
    return _rotors().log(value, ctx.conditions())


@builtin("sqrt(A)", "square root: of a scalar, or of a rotor (half the rotation)",
         "sqrt(rotor(e12, pi/2))", "functions",
         chain=(0, 0, 0))
def _sqrt(ctx, a):
    value = ctx.multivector(0)
    if value.is_scalar() or value.is_zero():
        return _scalar_mv(_sympy().sqrt(value.scalar_part()))
    return _rotors().sqrt(value, ctx.conditions())


def _scalar_function(name: str, sympy_name: str, help: str, example: str):
    @builtin(f"{name}(x)", help, example, "scalars")
    def implementation(ctx, x):
        function = getattr(_sympy(), sympy_name)
        return _scalar_mv(function(ctx.scalar(0)))

    return implementation


_scalar_function("sin", "sin", "sine of a scalar", "sin(pi/6)")
_scalar_function("cos", "cos", "cosine of a scalar", "cos(pi/3)")
_scalar_function("tan", "tan", "tangent of a scalar", "tan(pi/4)")
_scalar_function("asin", "asin", "inverse sine of a scalar", "asin(1/2)")
_scalar_function("acos", "acos", "inverse cosine of a scalar", "acos(1/2)")
_scalar_function("atan", "atan", "inverse tangent of a scalar", "atan(1)")
_scalar_function("sinh", "sinh", "hyperbolic sine of a scalar", "sinh(0)")
_scalar_function("cosh", "cosh", "hyperbolic cosine of a scalar", "cosh(0)")
_scalar_function("tanh", "tanh", "hyperbolic tangent of a scalar", "tanh(0)")
_scalar_function("abs", "Abs", "absolute value of a scalar", "abs(-3/2)")


@builtin("atan2(y, x)", "angle of the point (x, y) from the x axis, in (-pi, pi]",
         "atan2(1, -1)", "scalars")
def _atan2(ctx, y, x):
    return _scalar_mv(_sympy().atan2(ctx.scalar(0), ctx.scalar(1)))


# Representations ---------------------------------------------------------------------
@builtin("matrix(R)", "3x3 rotation matrix of a rotor (acting on column vectors)",
         "matrix(rotor(e12, pi/2))", "representations",
         chain=(0, 0, 0))
def _matrix(ctx, r):
    return _representations().rotation_matrix(ctx.multivector(0), ctx.conditions())


@builtin("from_matrix(M)", "rotor of a 3x3 rotation matrix (a matrix value, or its nine "
         "entries row by row)", "from_matrix(matrix(rotor(e12, pi/2)))", "representations",
         min_args=1, max_args=9)
def _from_matrix(ctx, *args):
    matrix = ctx.matrix_argument(args, 3, 3, "from_matrix")
    return _representations().from_rotation_matrix(matrix, ctx.conditions())


@builtin("pauli(A)", "2x2 complex Pauli matrix of A (e1, e2, e3 -> sigma x, y, z; "
         "I -> i)", "pauli(e1 + e12)", "representations")
def _pauli(ctx, a):
    return _representations().pauli(ctx.multivector(0))


@builtin("from_pauli(M)", "multivector of a 2x2 complex matrix (a matrix value, or four "
         "entries written with I as the imaginary unit)", "from_pauli(pauli(e1 + e12))",
         "representations", min_args=1, max_args=4)
def _from_pauli(ctx, *args):
    matrix = ctx.matrix_argument(args, 2, 2, "from_pauli", complex_entries=True)
    return _representations().from_pauli(matrix)


@builtin("quaternion(R)", "Hamilton quaternion of an even multivector (i = -e23, "
         "j = -e31, k = -e12), or the quaternion w + x i + y j + z k of quaternion(w, x, y, z)",
         "quaternion(rotor(e12, pi/2))", "representations", min_args=1, max_args=4)
def _quaternion(ctx, *args):
    if len(args) == 1:
        return _representations().quaternion(ctx.multivector(0))
    if len(args) != 4:
        ctx.fail("quaternion takes an even multivector, or four scalars w, x, y, z")
    from sympy.algebras.quaternion import Quaternion

    return Quaternion(*(ctx.scalar(i) for i in range(4)))


@builtin("from_quaternion(q)", "even multivector of a quaternion (a quaternion value, or "
         "w, x, y, z)", "from_quaternion(0, 0, 0, 1)", "representations",
         min_args=1, max_args=4)
def _from_quaternion(ctx, *args):
    representations = _representations()
    if len(args) == 1:
        return representations.from_quaternion(ctx.quaternion(0))
    if len(args) != 4:
        ctx.fail("from_quaternion takes a quaternion value or four scalars w, x, y, z")
    from sympy.algebras.quaternion import Quaternion

    w, x, y, z = (ctx.scalar(i) for i in range(4))
    return representations.from_quaternion(Quaternion(w, x, y, z))


# Symbols and numbers -------------------------------------------------------------
@builtin("subs(A, t, value, ...)", "A (any value) with scalar symbols (or declared functions such as "
         "u(t)) replaced by values, all at once: subs(A, t, v, s, w) or "
         "subs(A, (t, v), (s, w))", "subs(cos(t) e1 + s e2, t, pi, s, 2)", "symbols",
         min_args=2, max_args=99,
         estimate=lambda args, span: _limits().check_substitutions(args, span))
def _subs(ctx, a, *rest):
    from gacalc.values import kind_of

    pairs = _substitution_pairs(ctx, rest)
    kind = kind_of(a)
    mapped = None if kind is None else kind.map_scalars(a, _substitution(ctx, pairs))
    if mapped is None:
        ctx.multivector(0)   # says what subs accepts
    return mapped


def _substitution(ctx, pairs):
    """The substitution of every pair in one sympy scalar, as a function."""
    sympy = _sympy()
    from sympy.core.function import AppliedUndef

    keys = [key for key, _ in pairs]
    if any(v.has(*keys) for _, v in pairs):
        # simultaneous, not in sequence: subs(A, a1, a2, a2, a1) swaps, a value never
        # sees another replacement (sympy's simultaneous substitution)
        if not all(isinstance(k, sympy.Symbol) for k in keys):
            ctx.fail("a value mentions a replaced function; substitute it in a call of "
                     "its own")
        mapping = dict(pairs)
        return lambda e: e.subs(mapping, simultaneous=True)

    def in_sequence(e):
        # no value mentions a replaced symbol: one after the other is the same as at once
        for key, replacement in pairs:
            e = e.subs(key, replacement)
            if isinstance(key, AppliedUndef):
                e = e.doit()      # a declared function (scalar u(t)): derivatives follow
        return e
    return in_sequence


def _substitution_pairs(ctx, rest) -> list:
    """[(symbol or u(t), value)] from t, v, s, w, ... or (t, v), (s, w), ... arguments,
    each symbol once."""
    from sympy.core.function import AppliedUndef

    from gacalc.values.sequence import ValueList

    sympy = _sympy()
    evaluator = ctx.evaluator
    pairs, index = [], 1
    while index < len(ctx.args):
        item = ctx.args[index]
        if isinstance(item, ValueList):
            if len(item) != 2:
                ctx.fail("a substitution in a list is a pair (t, value)", index)
            span = ctx.span(index)
            key = evaluator.scalar(item[0], span, "the symbol of a substitution")
            replacement = evaluator.scalar(item[1], span, "the value of a substitution")
            position, index = index, index + 1
        else:
            if index + 1 >= len(ctx.args):
                ctx.fail("each symbol needs a value after it: subs(A, t, value, ...)", index)
            key = ctx.scalar(index)
            replacement = ctx.scalar(index + 1)
            position, index = index, index + 2
        if not isinstance(key, (sympy.Symbol, AppliedUndef)):
            ctx.fail("a substitution replaces a scalar symbol such as t or a1 (or a "
                     "declared function such as u(t))", position)
        if any(key == k for k, _ in pairs):
            ctx.fail(f"{_spelled(key)} is substituted twice", position)
        pairs.append((key, replacement))
    return pairs


def _spelled(expr) -> str:
    from gacalc.algebra.spelling import input_text

    return input_text(expr)


@builtin("numeric(A, [digits])", "floating-point approximation of A (15 digits by default)",
         "numeric(rotor(e12, 1))", "symbols")
def _numeric(ctx, a, digits=None):
    # multivectors, matrix(R) and pauli(A) (every entry, complex ones too), quaternions
    from gacalc.values import kind_of

    places = 15 if digits is None else ctx.integer(1, 1, 1000)
    kind = kind_of(a)
    approx = None if kind is None else kind.numeric(a, places)
    if approx is None:
        ctx.multivector(0)  # says what numeric accepts
    return approx


@builtin("ln(x)", "natural logarithm of a scalar (log also accepts rotors)", "ln(exp(2))",
         "scalars")
def _ln(ctx, x):
    value = ctx.scalar(0)
    if value == 0:
        ctx.fail("ln(0) is undefined", 0)
    return _scalar_mv(_sympy().log(value))


from . import builtins_calculus  # noqa: E402,F401  (diff, nabla, jacobian, ...)
from . import builtins_subspaces  # noqa: E402,F401  (meet, join, factor, frames, linmap)
from . import builtins_attitude  # noqa: E402,F401  (Euler angles, rotation vectors)

BUILTIN_NAMES: tuple[str, ...] = tuple(sorted(BUILTINS))

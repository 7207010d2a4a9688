"""The coefficient domain: exact rational functions over QQ in a growing set of generators.

Everything a multivector coefficient can be is written over *generators*: real scalar
symbols, and opaque atoms for what is not polynomial in them (cos(u), sin(u), sqrt(p),
exp(x), atan2(y, x), pi, ...).  A coefficient is num/den with num, den python-flint
``fmpq_mpoly`` polynomials in those generators, cancelled to lowest terms.  The geometric
product then costs a few sparse polynomial multiplications in C instead of expanding
sympy trees; sympy ``Expr`` is produced only at the edges (``to_expr``), and the ASCII text
of a coefficient is printed straight from the polynomial.

Callers outside gacalc.algebra and gacalc.simplify never see this module's types: they
pass and receive sympy objects.  Relations between generators (cos^2 + sin^2 = 1,
sqrt(p)^2 = p) are *not* applied here; that is the simplifier's job (gacalc.simplify).

Floating-point coefficients (only produced on request, by evalf) are kept as sympy Expr
in an "expr" mode, the honest fallback for what the polynomial domain cannot hold.
"""

from __future__ import annotations

from decimal import Decimal
from fractions import Fraction

import re

import flint
from flint.utils.flint_exceptions import DomainError as FlintDomainError
import sympy
from sympy.printing.str import StrPrinter

_ORDER = "deglex"  # higher degree first, then generators in order of first use


class DomainError(ValueError):
    """A sympy object that cannot be a real multivector coefficient."""


# ---------------------------------------------------------------------------
# Generators


class GeneratorInfo:
    """What a generator stands for; the simplifier reads ``kind`` and the fields."""

    __slots__ = ("expr", "name", "kind", "trig", "root")

    def __init__(self, expr, name, kind, trig=None, root=None):
        self.expr = expr  # the sympy Expr the generator stands for
        self.name = name  # ASCII text, valid gacalc input; also the flint variable name
        self.kind = kind  # 'symbol', 'cos', 'sin', 'root', 'other'
        self.trig = trig  # (q, u) for cos(q u) / sin(q u): q > 0 rational, u the base
        self.root = root  # (base Coef, n) for base^(1/n)


class _Registry:
    """The generators seen so far, in order of first appearance, and their flint context."""

    def __init__(self):
        self.infos: list[GeneratorInfo] = []
        self.by_expr: dict = {}
        self.names: set[str] = set()
        self.ctx = flint.fmpq_mpoly_ctx.get(("_one",), _ORDER)
        self.gens = self.ctx.gens()
        self._display_key = None
        self._display_ctx = None

    def generator(self, expr, kind="other", trig=None, root=None):
        """The flint polynomial of the generator for ``expr``, registering it if new."""
        idx = self.by_expr.get(expr)
        if idx is None:
            name = _as_factor(ascii_text(expr))
            if name in self.names or not name.isascii():
                name = f"_g{len(self.infos)}_{abs(hash(name)) % 10**6}"
            idx = len(self.infos)
            info = GeneratorInfo(expr, name, kind, trig, root)
            # '_one' keeps the context non-empty before the first generator arrives.
            # Build the new context first so an interrupt cannot leave the registry torn.
            ctx = flint.fmpq_mpoly_ctx.get(("_one",) + tuple(i.name for i in self.infos) + (name,), _ORDER)
            gens = ctx.gens()
            self.infos.append(info)
            self.by_expr[expr] = idx
            self.names.add(name)
            self.ctx, self.gens = ctx, gens
        return self.gens[idx + 1]

    def info(self, position: int) -> GeneratorInfo:
        """Info of the generator at a flint variable position (position 0 is '_one')."""
        return self.infos[position - 1]

    def lift(self, p):
        if p.context() is self.ctx:
            return p
        return p.project_to_context(self.ctx)

    def display(self, p):
        """p in a context whose variables are sorted by name, so that printed term order
        depends on the symbols alone, not on the order a process first met them."""
        key = len(self.infos)
        if self._display_key != key:
            names = sorted((i.name for i in self.infos), key=_display_order)
            self._display_ctx = flint.fmpq_mpoly_ctx.get(("_one",) + tuple(names), _ORDER)
            self._display_key = key
        return p.project_to_context(self._display_ctx)


def _as_factor(text: str) -> str:
    """Generator text that stays one factor when printed with ^k or *: a name or a call, else
    parenthesised (2^(1/4) -> (2^(1/4)), so its cube prints as (2^(1/4))^3)."""
    m = re.match(r"[A-Za-z_][A-Za-z0-9_]*", text)
    if m and m.end() == len(text):
        return text
    if m and text[m.end()] == "(" and text.endswith(")"):
        depth = 0
        for i, ch in enumerate(text[m.end():], m.end()):
            depth += ch == "("
            depth -= ch == ")"
            if depth == 0:
                if i == len(text) - 1:
                    return text
                break
    return f"({text})"


def _display_order(name: str):
    """Plain symbols first, then functions and radicals; digits compare as numbers (a2 < a10)."""
    compound = not name.replace("_", "").isalnum()
    parts = re.split(r"(\d+)", name)
    return (compound, [int(x) if x.isdigit() else x for x in parts])


REGISTRY = _Registry()


def generators_of(coef: "Coef") -> list[GeneratorInfo]:
    """The generators a coefficient actually uses."""
    if coef.expr is not None:
        return []
    used = set()
    for p in (coef.num, coef.den):
        if p is None:
            continue
        p = REGISTRY.lift(p)
        for pos, d in enumerate(p.degrees()):
            if d > 0:
                used.add(pos)
    return [REGISTRY.info(pos) for pos in sorted(used)]


# ---------------------------------------------------------------------------
# Coefficients


def _fmpq_to_rational(c) -> sympy.Rational:
    return sympy.Rational(int(c.p), int(c.q))


class Coef:
    """An exact coefficient: num/den over the generators, or a sympy Expr (floats only)."""

    __slots__ = ("num", "den", "expr")

    def __init__(self, num=None, den=None, expr=None):
        self.num = num  # fmpq_mpoly, or None in expr mode
        self.den = den  # fmpq_mpoly with leading coefficient 1, or None for a polynomial
        self.expr = expr  # sympy Expr in expr mode

    # -- construction --------------------------------------------------------

    @staticmethod
    def constant(value) -> "Coef":
        if isinstance(value, sympy.Rational):
            value = flint.fmpq(int(value.p), int(value.q))
        elif isinstance(value, Fraction):
            value = flint.fmpq(value.numerator, value.denominator)
        return Coef(REGISTRY.ctx.constant(value))

    @staticmethod
    def _ratio(num, den) -> "Coef":
        """num/den in lowest terms with a monic denominator; ZeroDivisionError on den = 0."""
        if den.is_zero():
            raise ZeroDivisionError("division by zero")
        if den.is_constant():
            return Coef(num / den.leading_coefficient())
        if num.is_zero():
            return Coef(num)
        g = num.gcd(den)
        if not g.is_one():
            num, den = num / g, den / g
        lc = den.leading_coefficient()
        if lc != 1:
            num, den = num / lc, den / lc
        if den.is_one():
            return Coef(num)
        return Coef(num, den)

    def _parts(self):
        # Lift into the current context once and keep the lifted polynomials: the value is
        # unchanged, and a long-lived coefficient (a declared symbol) stops paying for it.
        ctx = REGISTRY.ctx
        if self.num.context() is not ctx:
            self.num = self.num.project_to_context(ctx)
        if self.den is not None and self.den.context() is not ctx:
            self.den = self.den.project_to_context(ctx)
        return self.num, self.den

    # -- queries -------------------------------------------------------------

    def is_zero(self) -> bool:
        if self.expr is not None:
            return self.expr == 0
        return self.num.is_zero()

    def is_constant(self) -> bool:
        if self.expr is not None:
            return self.expr.is_number
        return self.den is None and self.num.is_constant()

    def constant_value(self):
        """The rational value of a constant coefficient (a flint fmpq)."""
        return self.num.leading_coefficient() if not self.num.is_zero() else flint.fmpq(0)

    def is_rational(self) -> bool:
        """A plain rational number (no generators)."""
        return self.expr is None and self.den is None and self.num.is_constant()

    # -- arithmetic ----------------------------------------------------------

    def __add__(self, other: "Coef") -> "Coef":
        if self.expr is not None or other.expr is not None:
            return Coef.from_expr_mode(self.to_expr() + other.to_expr())
        n1, d1 = self._parts()
        n2, d2 = other._parts()
        if d1 is None and d2 is None:
            return Coef(n1 + n2)
        if d1 is None:
            return Coef._ratio(n1 * d2 + n2, d2)
        if d2 is None:
            return Coef._ratio(n1 + n2 * d1, d1)
        if d1 == d2:
            return Coef._ratio(n1 + n2, d1)
        return Coef._ratio(n1 * d2 + n2 * d1, d1 * d2)

    def __neg__(self) -> "Coef":
        if self.expr is not None:
            return Coef(expr=-self.expr)
        return Coef(-self.num, self.den)

    def __sub__(self, other: "Coef") -> "Coef":
        return self + (-other)

    def __mul__(self, other: "Coef") -> "Coef":
        if self.expr is not None or other.expr is not None:
            return Coef.from_expr_mode(self.to_expr() * other.to_expr())
        n1, d1 = self._parts()
        n2, d2 = other._parts()
        if d1 is None and d2 is None:
            return Coef(n1 * n2)
        one = REGISTRY.ctx.constant(1)
        return Coef._ratio(n1 * n2, (d1 if d1 is not None else one) * (d2 if d2 is not None else one))

    def inverse(self) -> "Coef":
        if self.is_zero():
            raise ZeroDivisionError("division by zero")
        if self.expr is not None:
            return Coef.from_expr_mode(1 / self.expr)
        n, d = self._parts()
        return Coef._ratio(d if d is not None else REGISTRY.ctx.constant(1), n)

    def __truediv__(self, other: "Coef") -> "Coef":
        return self * other.inverse()

    def __pow__(self, n: int) -> "Coef":
        if n < 0:
            return self.inverse() ** (-n)
        if self.expr is not None:
            return Coef.from_expr_mode(self.expr**n)
        num, den = self._parts()
        return Coef(num**n, den**n if den is not None else None)

    def identical(self, other: "Coef") -> bool:
        """Equal as rational functions of the generators (no relations applied)."""
        return (self - other).is_zero()

    # -- conversion ----------------------------------------------------------

    @staticmethod
    def from_expr_mode(expr) -> "Coef":
        """Expr-mode coefficient; drops back to the exact domain when no float remains."""
        expr = sympy.expand(expr)
        if not expr.has(sympy.Float):
            return from_expr(expr)
        return Coef(expr=expr)

    def to_expr(self):
        if self.expr is not None:
            return self.expr
        num, den = self._parts()
        e = poly_to_expr(num)
        if den is not None:
            e = e / poly_to_expr(den)
        return e

    def text(self) -> str:
        """ASCII text, valid gacalc input: '*' products, '^' powers, '/' fractions."""
        if self.expr is not None:
            return ascii_text(self.expr)
        num, den = self._parts()
        t = str(REGISTRY.display(num))
        if den is None:
            return t
        if len(num) > 1:
            t = f"({t})"
        d = str(REGISTRY.display(den))
        if len(den) > 1 or "*" in d or "^" in d:
            d = f"({d})"
        return f"{t}/{d}"

    def __repr__(self):
        return f"Coef({self.text()})"


def poly_to_expr(p):
    gens = [sympy.Integer(1)] + [i.expr for i in REGISTRY.infos]
    terms = []
    for monom, c in zip(p.monoms(), p.coeffs()):
        factors = [_fmpq_to_rational(c)]
        for pos, e in enumerate(monom):
            if e:
                factors.append(gens[pos] ** e)
        terms.append(sympy.Mul(*factors))
    return sympy.Add(*terms)


# ---------------------------------------------------------------------------
# sympy Expr -> Coef


# the other trigonometric functions as quotients of cos and sin: (numerator, denominator)
_TRIG_REWRITES = {
    sympy.tan: lambda a: (sympy.sin(a), sympy.cos(a)),
    sympy.cot: lambda a: (sympy.cos(a), sympy.sin(a)),
    sympy.sec: lambda a: (sympy.Integer(1), sympy.cos(a)),
    sympy.csc: lambda a: (sympy.Integer(1), sympy.sin(a)),
}


def from_expr(expr) -> Coef:
    """Convert a sympy expression into the domain (new atoms become generators)."""
    if isinstance(expr, (int, Fraction)):
        return Coef.constant(expr)
    if not isinstance(expr, sympy.Basic):
        raise DomainError(f"not a scalar: {expr!r}")
    if expr.is_Rational:
        return Coef.constant(expr)
    if expr.is_Float:
        return Coef(expr=expr)
    if expr is sympy.I or (expr.is_number and expr.is_real is False):
        raise DomainError("multivector coefficients are real; use I (e123) for the unit imaginary")
    if expr.has(sympy.zoo, sympy.oo, sympy.nan, -sympy.oo):
        raise DomainError("infinite or undefined value")
    if expr.is_Add:
        total = Coef.constant(0)
        for t in expr.args:
            total = total + from_expr(t)
        return total
    if expr.is_Mul:
        total = Coef.constant(1)
        for t in expr.args:
            total = total * from_expr(t)
        return total
    if expr.is_Pow:
        return _from_pow(expr)
    if expr.is_Symbol:
        if expr.is_real is False:
            raise DomainError(f"{expr} is not real")
        return Coef(REGISTRY.generator(expr, "symbol"))
    if isinstance(expr, (sympy.cos, sympy.sin)):
        return trig(type(expr).__name__, expr.args[0])
    for fn, rewrite in _TRIG_REWRITES.items():
        if isinstance(expr, fn):
            num, den = rewrite(expr.args[0])
            return from_expr(num) / from_expr(den)
    if isinstance(expr, (sympy.atan2, sympy.atan)) and not expr.free_symbols:
        # atan(z) is atan2(z, 1); sympy writes atan2(y, x) with x > 0 as atan(y/x)
        exact = _exact_atan2(*(expr.args if isinstance(expr, sympy.atan2) else (expr.args[0], 1)))
        if exact is not None:
            return exact
    if isinstance(expr, sympy.exp):
        arg = canonical_expr(expr.args[0])
        return Coef(REGISTRY.generator(sympy.exp(arg), "other"))
    if isinstance(expr, sympy.Function) or expr.is_Atom:
        if getattr(expr, "is_Boolean", False) or expr.is_Relational:
            raise DomainError("a condition is not a value")
        args = [canonical_expr(a) for a in expr.args]
        canon = expr.func(*args) if args else expr
        if canon is not expr and canon != expr:
            return from_expr(canon)
        return Coef(REGISTRY.generator(canon, "other"))
    raise DomainError(f"cannot use {type(expr).__name__} as a coefficient")


def canonical_expr(expr):
    """The canonical sympy form of an expression (through the domain)."""
    c = from_expr(expr)
    return c.to_expr()


def _from_pow(expr) -> Coef:
    base, e = expr.args
    if e.is_Integer:
        return from_expr(base) ** int(e)
    if e.is_Rational:
        p, n = int(e.p), int(e.q)
        bc = from_expr(base)
        if bc.is_constant() and bc.expr is None:
            value = _fmpq_to_rational(bc.constant_value())
            if value < 0 and n % 2 == 0:
                raise DomainError("even root of a negative number is not real")
            gexpr = sympy.Pow(value, sympy.Rational(1, n))
            if gexpr.is_Rational:  # a perfect power
                return Coef.constant(gexpr) ** p
            if not (gexpr.is_Pow and gexpr.args[1] == sympy.Rational(1, n) and gexpr.args[0] == value):
                return from_expr(gexpr) ** p  # sympy pulled out a factor: 8^(1/2) = 2 sqrt(2)
        else:
            if n == 2:
                exact = _exact_square_root(bc)
                if exact is not None:
                    return exact**p
            gexpr = sympy.Pow(bc.to_expr(), sympy.Rational(1, n), evaluate=False)
        g = Coef(REGISTRY.generator(gexpr, "root", root=(bc, n)))
        return g**p
    # symbolic exponent: an opaque atom
    canon = sympy.Pow(canonical_expr(base), canonical_expr(e))
    if canon.is_Pow:
        return Coef(REGISTRY.generator(canon, "other"))
    return from_expr(canon)


def _exact_square_root(bc: Coef):
    """sqrt of a perfect square q^2 (also over half angles: 1/2 - cos(u)/2 = sin(u/2)^2):
    q itself when q is a number of known sign, else |q| (a radical of q^2).  None if
    the base is not a perfect square."""
    if bc.expr is not None:
        return None
    from gacalc.simplify.relations import over_half_angles, sine_form

    half = over_half_angles(bc)
    halves = [] if half is None else [half, sine_form(half.num) / (Coef(half.den) if half.den is not None else Coef.constant(1))]
    for cand in [bc, *halves]:
        if cand is None or cand.expr is not None:
            continue
        num, den = cand._parts()
        try:
            q = Coef(num.sqrt()) / (Coef(den.sqrt()) if den is not None else Coef.constant(1))
        except FlintDomainError:
            continue
        q_expr = q.to_expr()
        if not q_expr.free_symbols:
            # sqrt(q^2) = q needs q >= 0 proved: a certified sign, never a float guess
            from gacalc.simplify.signs import certified_sign

            sign = certified_sign(q_expr)
            if sign is not None:
                return q if sign > 0 else -q
            continue
        return Coef(REGISTRY.generator(sympy.Abs(q_expr), "root", root=(bc, 2)))
    return None


def _exact_atan2(y, x):
    """atan2(k sin u, k cos u) = u for a number u in (-pi, pi) and a number k > 0, proved by
    exact arithmetic (y cos u - x sin u = 0) plus a numeric sign with a wide margin."""
    yc, xc = from_expr(y), from_expr(x)
    angles = {info.trig[0] * info.trig[1] for info in generators_of(yc) + generators_of(xc)
              if info.kind in ("cos", "sin")}
    from gacalc.simplify.signs import certified_sign

    shifted = {u + k * sympy.pi for u in angles for k in (-2, -1, 0, 1, 2)}
    for u in sorted(shifted, key=sympy.default_sort_key):
        # -pi < u < pi and k > 0 must be proved (certified signs), not read off floats
        if u.free_symbols or certified_sign(sympy.pi - sympy.Abs(u)) != 1:
            continue
        c, sn = trig("cos", u), trig("sin", u)
        if not _vanishes(yc * c - xc * sn):
            continue
        if certified_sign((xc * c + yc * sn).to_expr()) == 1:
            return from_expr(u)
    return None


def _vanishes(c: Coef) -> bool:
    from gacalc.simplify import decide_zero

    return decide_zero(c) is True


def trig(kind: str, arg) -> Coef:
    """cos(arg) or sin(arg) in the domain, with arg a sum of rational multiples of bases.

    Addition theorems split sums, parity removes signs, so the generators are always
    cos(q u), sin(q u) with q > 0: the simplifier can then relate them.
    """
    arg = canonical_expr(arg)
    if arg.is_Add:
        first, rest = arg.args[0], sympy.Add(*arg.args[1:])
        c1, s1 = trig("cos", first), trig("sin", first)
        c2, s2 = trig("cos", rest), trig("sin", rest)
        if kind == "cos":
            return c1 * c2 - s1 * s2
        return s1 * c2 + c1 * s2
    q, u = arg.as_coeff_Mul()
    if not q.is_Rational:
        fn = sympy.cos if kind == "cos" else sympy.sin
        return Coef(expr=fn(arg))
    if q == 0:
        return Coef.constant(1 if kind == "cos" else 0)
    sign = 1
    if q < 0:
        q = -q
        if kind == "sin":
            sign = -1
    fn = sympy.cos if kind == "cos" else sympy.sin
    value = fn(q * u)
    if not isinstance(value, fn):  # sympy knew a value (cos(pi/3) = 1/2, ...)
        c = from_expr(value)
    else:
        c = Coef(REGISTRY.generator(value, kind, trig=(sympy.Rational(q), u)))
    return c if sign > 0 else -c


# ---------------------------------------------------------------------------
# ASCII text of sympy expressions (generator names and expr-mode coefficients)


class _AsciiPrinter(StrPrinter):
    """sympy's StrPrinter with gacalc's power operator and function names."""

    _renames = {"Abs": "abs", "atan2": "atan2", "exp": "exp", "log": "ln"}

    def _print_Pow(self, expr, rational=False):
        base, e = expr.args
        if e == sympy.Rational(1, 2):
            return f"sqrt({self._print(base)})"
        if e == -1:
            return f"1/{self.parenthesize(base, 60)}"
        if e.is_Rational and e.q != 1:
            return f"{self.parenthesize(base, 60)}^({self._print(e)})"
        if e.is_Number and e.is_negative:
            return f"1/{self.parenthesize(base, 60)}^{self._print(-e)}"
        if e.is_Atom and not e.is_negative:
            return f"{self.parenthesize(base, 60)}^{self._print(e)}"
        return f"{self.parenthesize(base, 60)}^({self._print(e)})"

    def _print_Function(self, expr):
        name = self._renames.get(expr.func.__name__, expr.func.__name__)
        return f"{name}({', '.join(self._print(a) for a in expr.args)})"

    def _print_Exp1(self, expr):
        return "exp(1)"

    def _print_Float(self, expr):
        # positional notation (the language has no exponent syntax), every digit kept
        s = super()._print_Float(expr)
        if "e" not in s.lower():
            return s
        return format(Decimal(s), "f")


_PRINTER = _AsciiPrinter({"order": "none"})


def ascii_text(expr) -> str:
    return _PRINTER.doprint(expr)

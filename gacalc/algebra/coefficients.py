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

The generators live in the registry of the current algebra context (gacalc.algebra.context),
one per session; a coefficient is read back through the registry its polynomials belong to.

Floating-point coefficients (only produced on request, by evalf) are kept as sympy Expr
in an "expr" mode, the honest fallback for what the polynomial domain cannot hold.
"""

from __future__ import annotations

import functools
from fractions import Fraction

import re

import flint

from gacalc.lazy import loaded, sympy

from .context import current, registry
from .generators import GeneratorInfo, GeneratorRegistry, owner_of
from .rational_text import rational_factors_behind


class DomainError(ValueError):
    """A sympy object that cannot be a real multivector coefficient."""


# ---------------------------------------------------------------------------
# Generators (the registry itself lives in generators.py, one per algebra context)


def generator(expr, kind="other", trig=None, root=None):
    """The polynomial of the generator for a sympy Expr in the current registry, registering it if new."""
    reg = registry()
    pos = reg.position(expr)
    if pos is None:
        pos = reg.add(expr, _as_factor(ascii_text(expr)), kind, trig, root)
    return reg.gen(pos)


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


def generators_of(coef: "Coef") -> list[GeneratorInfo]:
    """The generators a coefficient actually uses."""
    if coef.expr is not None:
        return []
    reg = coef.owner()
    used = set()
    for p in (coef.num, coef.den):
        if p is None:
            continue
        p = reg.lift(p)
        for pos, d in enumerate(p.degrees()):
            if d > 0:
                used.add(pos)
    return [reg.info(pos) for pos in sorted(used)]


# ---------------------------------------------------------------------------
# Coefficients


def _fmpq_to_rational(c) -> sympy.Rational:
    return sympy.Rational(int(c.p), int(c.q))


class Coef:
    """An exact coefficient: num/den over the generators, or a sympy Expr (floats only)."""

    __slots__ = ("num", "den", "expr", "_rational")

    def __init__(self, num=None, den=None, expr=None):
        self.num = num  # fmpq_mpoly, or None in expr mode
        self.den = den  # fmpq_mpoly with leading coefficient 1, or None for a polynomial
        self.expr = expr  # sympy Expr in expr mode
        # is_rational, once asked: the value never changes (lifting into a larger context
        # rewrites the polynomials, not what they are), and flint's is_constant costs
        # a microsecond, asked for every coefficient of every product
        self._rational = None

    # -- construction --------------------------------------------------------

    @staticmethod
    def constant(value) -> "Coef":
        """A rational constant (int, Fraction, sympy Rational or flint fmpq)."""
        if loaded("sympy") and isinstance(value, sympy.Rational):
            value = flint.fmpq(int(value.p), int(value.q))
        elif isinstance(value, Fraction):
            value = flint.fmpq(value.numerator, value.denominator)
        coef = Coef(registry().constant(value))
        coef._rational = True
        return coef

    @staticmethod
    def constants(values) -> list:
        """Coef.constant of each value, None for a zero one: the registry looked up once
        (a literal's eight components)."""
        make = registry().constant
        out = []
        for value in values:
            if not value:
                out.append(None)
                continue
            if isinstance(value, Fraction):
                value = flint.fmpq(value.numerator, value.denominator)
            elif not isinstance(value, (int, flint.fmpq)):
                out.append(Coef.constant(value))
                continue
            coef = Coef(make(value))
            coef._rational = True
            out.append(coef)
        return out

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

    def parts(self):
        """(numerator, denominator or None) as polynomials in the current registry's context."""
        # Lift into the current context once and keep the lifted polynomials: the value is
        # unchanged, and a long-lived coefficient (a declared symbol) stops paying for it.
        reg = registry()
        ctx = reg.ctx
        if self.num.context() is not ctx:
            if not reg.owns(self.num):
                self._adopt(reg)
                ctx = reg.ctx  # adopting may have registered generators
            self.num = self.num.project_to_context(ctx)
        if self.den is not None and self.den.context() is not ctx:
            self.den = self.den.project_to_context(ctx)
        return self.num, self.den

    def _adopt(self, reg):
        """Rewrite a coefficient of another registry (another session's) over ``reg``, the
        current one: variable names may mean different things there, so go through sympy."""
        if self.den is None and self.num.is_constant():
            self.num = reg.constant(self.constant_value())
            return
        c = from_expr(self.to_expr())
        self.num, self.den = c.num, c.den

    def owner(self) -> GeneratorRegistry:
        """The registry the coefficient's polynomials belong to (where it reads its generators)."""
        return owner_of(self.num) or registry()

    def _own_parts(self):
        """(num, den) lifted within their own registry, for reading (printing, sympy)."""
        reg = self.owner()
        num = self.num = reg.lift(self.num)
        if self.den is not None:
            self.den = reg.lift(self.den)
        return reg, num, self.den

    # -- queries -------------------------------------------------------------

    def is_zero(self) -> bool:
        """Zero as a rational function of the generators (no relations applied)."""
        if self.expr is not None:
            return self.expr == 0
        return self.num.is_zero()

    def is_constant(self) -> bool:
        """No generator appears (a rational, or a number in expr mode)."""
        if self.expr is not None:
            return self.expr.is_number
        return self.den is None and self.num.is_constant()

    def constant_value(self):
        """The rational value of a constant coefficient (a flint fmpq)."""
        return self.num.leading_coefficient() if not self.num.is_zero() else flint.fmpq(0)

    def is_rational(self) -> bool:
        """A plain rational number (no generators)."""
        rational = self._rational
        if rational is None:
            rational = self._rational = (self.expr is None and self.den is None
                                         and self.num.is_constant())
        return rational

    # -- arithmetic ----------------------------------------------------------

    def __add__(self, other: "Coef") -> "Coef":
        if self.expr is not None or other.expr is not None:
            return Coef.from_expr_mode(self.to_expr() + other.to_expr())
        (n1, d1), (n2, d2) = _both_parts(self, other)
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
        if self.den is None and other.den is None and self.expr is None and \
                other.expr is None:
            n1, n2 = _both_parts(self, other)
            return Coef(n1[0] - n2[0])      # polynomials: one subtraction, no negation
        return self + (-other)

    def __mul__(self, other: "Coef") -> "Coef":
        if self.expr is not None or other.expr is not None:
            return Coef.from_expr_mode(self.to_expr() * other.to_expr())
        (n1, d1), (n2, d2) = _both_parts(self, other)
        if d1 is None and d2 is None:
            return Coef(n1 * n2)
        one = registry().constant(1)
        return Coef._ratio(n1 * n2, (d1 if d1 is not None else one) * (d2 if d2 is not None else one))

    def inverse(self) -> "Coef":
        """1/self; ZeroDivisionError for zero."""
        if self.is_zero():
            raise ZeroDivisionError("division by zero")
        if self.expr is not None:
            return Coef.from_expr_mode(1 / self.expr)
        n, d = self.parts()
        return Coef._ratio(d if d is not None else registry().constant(1), n)

    def __truediv__(self, other: "Coef") -> "Coef":
        return self * other.inverse()

    def __pow__(self, n: int) -> "Coef":
        if n < 0:
            return self.inverse() ** (-n)
        if self.expr is not None:
            return Coef.from_expr_mode(self.expr**n)
        num, den = self.parts()
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
        """The coefficient as a sympy Expr."""
        if self.expr is not None:
            return self.expr
        reg, num, den = self._own_parts()
        e = poly_to_expr(num, reg)
        if den is not None:
            e = e / poly_to_expr(den, reg)
        return e

    def text(self) -> str:
        """ASCII text, valid gacalc input: '*' products, '^' powers, '/' fractions."""
        if self.expr is not None:
            return ascii_text(self.expr)
        reg, num, den = self._own_parts()
        t = rational_factors_behind(str(reg.display(num)))
        if den is None:
            return t
        if len(num) > 1:
            t = f"({t})"
        d = str(reg.display(den))
        if len(den) > 1 or "*" in d or "^" in d:
            d = f"({d})"
        return f"{t}/{d}"

    def __repr__(self):
        return f"Coef({self.text()})"


def poly_to_expr(p, reg: GeneratorRegistry | None = None):
    """A registry polynomial as a sympy Expr (read through the registry it belongs to)."""
    reg = reg or owner_of(p) or registry()
    p = reg.lift(p)
    gens = [sympy.Integer(1)] + [i.expr for i in reg.infos]
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


@functools.cache
def _trig_rewrites():
    """The other trigonometric functions as quotients of cos and sin: (numerator, denominator)."""
    return {
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
        return Coef(generator(expr, "symbol"))
    if isinstance(expr, (sympy.cos, sympy.sin)):
        return trig(type(expr).__name__, expr.args[0])
    for fn, rewrite in _trig_rewrites().items():
        if isinstance(expr, fn):
            num, den = rewrite(expr.args[0])
            return from_expr(num) / from_expr(den)
    if isinstance(expr, (sympy.atan2, sympy.atan)) and not expr.free_symbols:
        # atan(z) is atan2(z, 1); sympy writes atan2(y, x) with x > 0 as atan(y/x)
        exact = current().simplifier.exact_atan2(*(expr.args if isinstance(expr, sympy.atan2) else (expr.args[0], 1)))
        if exact is not None:
            return exact
    if isinstance(expr, sympy.exp):
        arg = canonical_expr(expr.args[0])
        return Coef(generator(sympy.exp(arg), "other"))
    if isinstance(expr, (sympy.Derivative, sympy.Subs)):
        # derivatives of functions of a scalar (r1'(t) of a declared vector r(t)): atoms
        return Coef(generator(expr, "other"))
    if isinstance(expr, sympy.Function) or expr.is_Atom:
        if getattr(expr, "is_Boolean", False) or expr.is_Relational:
            raise DomainError("a condition is not a value")
        args = [canonical_expr(a) for a in expr.args]
        canon = expr.func(*args) if args else expr
        if canon is not expr and canon != expr:
            return from_expr(canon)
        return Coef(generator(canon, "other"))
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
                exact = current().simplifier.exact_square_root(bc)
                if exact is not None:
                    return exact**p
            gexpr = sympy.Pow(bc.to_expr(), sympy.Rational(1, n), evaluate=False)
        g = Coef(generator(gexpr, "root", root=(bc, n)))
        return g**p
    # symbolic exponent: an opaque atom
    canon = sympy.Pow(canonical_expr(base), canonical_expr(e))
    if canon.is_Pow:
        return Coef(generator(canon, "other"))
    return from_expr(canon)


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
        c = Coef(generator(value, kind, trig=(sympy.Rational(q), u)))
    return c if sign > 0 else -c


def ascii_text(expr) -> str:
    """Input text of a sympy expression in sympy's argument order (generator names)."""
    from .spelling import input_text

    return input_text(expr, order="none")


def _both_parts(a: "Coef", b: "Coef"):
    """The parts of two coefficients in one flint context: adopting the second from another
    session's registry can add generators after the first was lifted, so lift it again."""
    first, second = a.parts(), b.parts()
    if first[0].context() is not second[0].context():
        first = a.parts()
    return first, second


"""The immutable Cl(3,0) multivector and its products, involutions, norms and inverse."""

from __future__ import annotations

from fractions import Fraction
from numbers import Integral

from gacalc.lazy import loaded, sympy

from .basis import BASIS_GRADES, BASIS_INDICES, BASIS_NAMES, PRODUCT_TABLE, PSEUDOSCALAR, basis_of_word
from .coefficients import Coef, DomainError, from_expr, generators_of, poly_to_expr
from .context import current


class AlgebraError(ArithmeticError):
    """A mathematical request the algebra cannot satisfy (message is user-facing)."""


class NotInvertibleError(AlgebraError):
    """The multivector has no inverse; ``condition`` is the sympy Expr that vanishes."""

    def __init__(self, message, condition=None):
        super().__init__(message)
        self.condition = condition


def _product_table(keep):
    """table[i][j] = (sign, k) for the basis pairs whose product term is kept, else None."""
    table = []
    for i in range(8):
        row = []
        for j in range(8):
            sign, k = PRODUCT_TABLE[i][j]
            row.append((sign, k) if keep(BASIS_GRADES[i], BASIS_GRADES[j], BASIS_GRADES[k]) else None)
        table.append(tuple(row))
    return tuple(table)


# Every product of Cl(3,0) is the geometric product restricted to certain grade triples.
_GEOMETRIC = _product_table(lambda r, s, g: True)
_OUTER = _product_table(lambda r, s, g: g == r + s)
_LEFT = _product_table(lambda r, s, g: s >= r and g == s - r)
_RIGHT = _product_table(lambda r, s, g: r >= s and g == r - s)
_HESTENES = _product_table(lambda r, s, g: r > 0 and s > 0 and g == abs(r - s))
_SCALAR = _product_table(lambda r, s, g: g == 0)


def _is_scalar(x) -> bool:
    """A plain number or a sympy object (none exists before sympy is imported)."""
    return isinstance(x, (Integral, Fraction)) or (loaded("sympy") and isinstance(x, sympy.Basic))


def _to_coef(x) -> Coef:
    try:
        return from_expr(x)
    except DomainError as exc:
        raise AlgebraError(str(exc)) from None


class Multivector:
    """An element of Cl(3,0): eight coefficients in the basis 1, e1, e2, e3, e23, e31, e12, e123.

    Immutable.  Zero coefficients are never stored.  ``==`` means the difference simplifies
    to zero (through the installed simplifier, see gacalc.algebra.context); ``identical`` is
    the cheap exact comparison.
    """

    __slots__ = ("_c", "__weakref__")

    def __init__(self, components=None):
        c = [None] * 8
        if components:
            for key, value in dict(components).items():
                k = key if isinstance(key, int) else _index_of(key)
                coef = value if isinstance(value, Coef) else _to_coef(value)
                if not coef.is_zero():
                    c[k] = coef if c[k] is None else c[k] + coef
                    if c[k].is_zero():
                        c[k] = None
        self._c = tuple(c)

    @classmethod
    def from_coefs(cls, coefs) -> "Multivector":
        """The multivector of eight domain coefficients (None or Coef each), zeros dropped."""
        mv = cls.__new__(cls)
        mv._c = tuple([None if (x is None or x.is_zero()) else x for x in coefs])
        return mv

    @classmethod
    def from_rationals(cls, values) -> "Multivector":
        """The multivector of rational components in basis order (int or Fraction; up to
        eight, the missing ones zero), zeros dropped: the literal path of the language,
        which computes number-and-blade sums exactly in fractions, builds its value here
        without going through sympy."""
        c = Coef.constants(values)
        if len(c) > 8:
            raise ValueError("a multivector of Cl(3,0) has eight components")
        mv = cls.__new__(cls)
        mv._c = tuple(c + [None] * (8 - len(c)))
        return mv

    @classmethod
    def scalar(cls, x) -> "Multivector":
        return x if isinstance(x, Multivector) else cls({0: x})

    # -- access ----------------------------------------------------------------

    def __getitem__(self, key):
        k = int(key) if isinstance(key, Integral) else _index_of(key)   # sympy's Integer too
        c = self._c[k]
        return sympy.Integer(0) if c is None else c.to_expr()

    def coefs(self) -> tuple:
        """The raw domain coefficients (for gacalc.algebra and gacalc.simplify only)."""
        return self._c

    def items(self):
        return [(k, c.to_expr()) for k, c in enumerate(self._c) if c is not None]

    def to_expr_dict(self) -> dict:
        return dict(self.items())

    def shared_denominator(self):
        """(numerator, denominator) when two or more components have the same non-constant
        denominator and no component has another: self = numerator / denominator, both
        Multivectors (the denominator a scalar).  None otherwise.  For printing a value
        with its denominator written once."""
        present = [c for c in self._c if c is not None]
        if len(present) < 2 or any(c.expr is not None for c in present):
            return None
        # Read each coefficient in its own registry: printing may run outside the session's
        # algebra context, and lifting into another registry can rewrite a denominator
        # (1/sqrt(2) becomes sqrt(2)/2), so test and split the same parts.
        parts = [None if c is None else c._own_parts()[1:] for c in self._c]
        dens = [p[1] for p in parts if p is not None]
        if any(d is None for d in dens) or any(d != dens[0] for d in dens[1:]):
            return None
        numerator = Multivector.from_coefs(None if p is None else Coef(p[0]) for p in parts)
        return numerator, Multivector.from_coefs([Coef(dens[0])] + [None] * 7)

    def coefficient_texts(self):
        """(index, ASCII coefficient text) for the nonzero components, in basis order."""
        return [(k, c.text()) for k, c in enumerate(self._c) if c is not None]

    @property
    def free_symbols(self) -> set:
        # read off the generators each coefficient uses: no sympy conversion of the terms
        out = set()
        for c in self._c:
            if c is None:
                continue
            if c.expr is not None:
                out |= c.expr.free_symbols
                continue
            for info in generators_of(c):
                out |= info.expr.free_symbols
        return out

    def is_zero(self) -> bool:
        return all(c is None for c in self._c)

    def is_scalar(self) -> bool:
        return all(c is None for c in self._c[1:])

    def scalar_part(self):
        return self[0]

    def rational_scalar(self) -> Fraction | None:
        """The value as a Fraction when it is a rational scalar, else None (read from the
        polynomial: needs no sympy)."""
        if not self.is_scalar():
            return None
        c = self._c[0]
        if c is None:
            return Fraction(0)
        if not c.is_rational():
            return None
        q = c.constant_value()
        return Fraction(int(q.p), int(q.q))

    def grades(self) -> frozenset:
        return frozenset(BASIS_GRADES[k] for k, c in enumerate(self._c) if c is not None)

    def is_homogeneous(self) -> bool:
        return len(self.grades()) <= 1

    # -- sums and scalar multiples -------------------------------------------------

    def __add__(self, other):
        other = _coerce(other)
        if other is NotImplemented:
            return other
        return Multivector.from_coefs(
            [b if a is None else (a if b is None else a + b) for a, b in zip(self._c, other._c)]
        )

    __radd__ = __add__

    def __neg__(self):
        return Multivector.from_coefs([None if a is None else -a for a in self._c])

    def __pos__(self):
        return self

    def __sub__(self, other):
        other = _coerce(other)
        if other is NotImplemented:
            return other
        # componentwise, without negating the whole of other first (a check's L - R)
        return Multivector.from_coefs(
            [(None if b is None else -b) if a is None else (a if b is None else a - b)
             for a, b in zip(self._c, other._c)]
        )

    def __rsub__(self, other):
        other = _coerce(other)
        if other is NotImplemented:
            return other
        return other + (-self)

    def scale(self, factor) -> "Multivector":
        f = factor if isinstance(factor, Coef) else _to_coef(factor)
        return Multivector.from_coefs(None if a is None else a * f for a in self._c)

    # -- products --------------------------------------------------------------------

    def _product(self, other, table) -> "Multivector":
        other = _coerce(other)
        left = [(i, x) for i, x in enumerate(self._c) if x is not None]
        right = [(j, y) for j, y in enumerate(other._c) if y is not None]
        if all(c.is_rational() for _, c in left) and all(c.is_rational() for _, c in right):
            return _rational_product(left, right, table)
        if all(c.expr is None and c.den is None for _, c in left + right):
            return _polynomial_product(left, right, table)
        out = [None] * 8
        for i, x in left:
            row = table[i]
            for j, y in right:
                entry = row[j]
                if entry is None:
                    continue
                sign, k = entry
                t = x * y
                acc = out[k]
                if acc is None:
                    out[k] = t if sign > 0 else -t
                else:
                    out[k] = acc + t if sign > 0 else acc - t
        return Multivector.from_coefs(out)

    def __mul__(self, other):
        if _coerce(other) is NotImplemented:
            return NotImplemented
        return self._product(other, _GEOMETRIC)

    def __rmul__(self, other):
        other = _coerce(other)
        if other is NotImplemented:
            return other
        return other._product(self, _GEOMETRIC)

    def outer(self, other):
        return self._product(other, _OUTER)

    def lc(self, other):
        """Left contraction A ⌋ B."""
        return self._product(other, _LEFT)

    def rc(self, other):
        """Right contraction A ⌊ B."""
        return self._product(other, _RIGHT)

    def inner(self, other):
        """Hestenes inner product: <A_r B_s>_|r-s|, zero when either factor is a scalar."""
        return self._product(other, _HESTENES)

    def scalar_product(self, other):
        return self._product(other, _SCALAR)

    def comm(self, other):
        other = _coerce(other)
        return (self * other - other * self).scale(Fraction(1, 2))

    def anticomm(self, other):
        other = _coerce(other)
        return (self * other + other * self).scale(Fraction(1, 2))

    def __truediv__(self, other):
        other = _coerce(other)
        if other is NotImplemented:
            return other
        if other.is_scalar():
            c = other._c[0]
            if c is None:
                raise AlgebraError("division by zero")
            return self.scale(c.inverse())
        return self * other.inverse()

    def __rtruediv__(self, other):
        other = _coerce(other)
        if other is NotImplemented:
            return other
        return other / self

    def __pow__(self, n):
        if loaded("sympy") and isinstance(n, sympy.Integer):
            n = int(n)
        if not isinstance(n, Integral):
            raise AlgebraError("only integer powers of a multivector; use the rotor functions for others")
        n = int(n)
        if n < 0:
            return self.inverse() ** (-n)
        result, base = ONE, self
        while n:
            if n & 1:
                result = result * base
            n >>= 1
            if n:
                base = base * base
        return result

    # -- grades and involutions -------------------------------------------------------

    def grade(self, k: int) -> "Multivector":
        return Multivector.from_coefs(c if BASIS_GRADES[i] == k else None for i, c in enumerate(self._c))

    def even(self):
        return Multivector.from_coefs(c if BASIS_GRADES[i] % 2 == 0 else None for i, c in enumerate(self._c))

    def odd(self):
        return Multivector.from_coefs(c if BASIS_GRADES[i] % 2 == 1 else None for i, c in enumerate(self._c))

    def _signed(self, sign_of_grade) -> "Multivector":
        return Multivector.from_coefs(
            None if c is None else (c if sign_of_grade(BASIS_GRADES[i]) > 0 else -c)
            for i, c in enumerate(self._c)
        )

    def rev(self):
        """Reverse: grade r picks up (-1)^(r(r-1)/2)."""
        return self._signed(lambda r: -1 if (r * (r - 1) // 2) % 2 else 1)

    def involute(self):
        """Grade involution: grade r picks up (-1)^r."""
        return self._signed(lambda r: -1 if r % 2 else 1)

    def conjugate(self):
        """Clifford conjugate: reverse and grade involution combined."""
        return self._signed(lambda r: -1 if (r * (r + 1) // 2) % 2 else 1)

    def dual(self):
        """A I^-1 (I^-1 = -I)."""
        return -(self * I)

    def undual(self):
        """A I."""
        return self * I

    # -- norms and inverse ----------------------------------------------------------------

    def norm2(self):
        """<A A~>_0: the sum of the squared coefficients in Cl(3,0)."""
        return self.scalar_product(self.rev())[0]

    def norm(self):
        return sympy.sqrt(simplified_scalar(self.norm2()))

    def central_norm(self):
        """(a, b) with A Ā = a + b I: the product is central, and that is what inverts A."""
        p = self * self.conjugate()
        return p._c[0], p._c[PSEUDOSCALAR]

    def inverse_with_condition(self, as_value: bool = False):
        """(A^-1, condition): condition is a sympy Expr that must be nonzero, or None.
        ``as_value``: the condition as a scalar Multivector instead, when it is a
        polynomial (a reader that goes on computing with it need not write a long
        polynomial out as an Expr and read it back).

        A^-1 = Ā (a - b I) / (a^2 + b^2), where A Ā = a + b I.
        """
        simplifier = current().simplifier
        a, b = self.central_norm()
        zero = Coef.constant(0)
        a, b = simplifier.reduce(a or zero), simplifier.reduce(b or zero)
        d = simplifier.reduce(a * a + b * b)
        verdict = simplifier.decide_zero(d)
        if verdict is True:
            cond = _condition_text_expr(d)
            if a.is_zero() and b.is_zero():
                message = "not invertible: it times its Clifford conjugate is 0 (a zero divisor)"
            else:
                message = f"not invertible: a^2 + b^2 = 0 for A*conjugate(A) = a + b*I (a^2 + b^2 = {cond})"
            raise NotInvertibleError(message, cond)
        numer = self.conjugate() * Multivector.from_coefs([a, None, None, None, None, None, None, -b])
        inv = numer.scale(d.inverse())
        if as_value and d.expr is None and not d.is_constant():
            return inv, Multivector.from_coefs([_square_free_coef(d)] + [None] * 7)
        condition = None if d.is_constant() else _condition_text_expr(d)
        if condition is not None and condition.is_number and (verdict is False or condition != 0):
            condition = None  # a number proved nonzero: no condition to state ("1 != 0")
        return inv, condition

    def inverse(self):
        return self.inverse_with_condition()[0]

    # -- comparison, substitution, display -------------------------------------------------

    def identical(self, other) -> bool:
        """Equal as rational functions of the generators, no relations applied."""
        other = _coerce(other)
        if other is NotImplemented:
            return False
        return (self - other).is_zero()

    def equals(self, other, conditions=()) -> bool:
        other = _coerce(other)
        if other is NotImplemented:
            return False
        return current().simplifier.is_zero(self - other, conditions) is True

    def __eq__(self, other):
        if _coerce(other) is NotImplemented:
            return NotImplemented
        return self.equals(other)

    def __ne__(self, other):
        eq = self.__eq__(other)
        return eq if eq is NotImplemented else not eq

    def __hash__(self):
        # Equality is decided by simplification, so no syntactic hash is invariant under it;
        # hash on the set of grades that cannot vanish... is not invariant either.  A
        # constant hash is the honest choice: correct, only slow in large sets.
        return hash(Multivector)

    def subs(self, mapping) -> "Multivector":
        return Multivector({k: e.subs(mapping) for k, e in self.items()})

    def map_coefficients(self, fn) -> "Multivector":
        return Multivector({k: fn(e) for k, e in self.items()})

    def evalf(self, n: int = 15) -> "Multivector":
        return self.map_coefficients(lambda e: sympy.N(e, n))

    def simplified(self, conditions=()) -> "Multivector":
        """The value with its coefficients simplified (as the language shows them), under
        optional side conditions (sympy Exprs equal to zero); the installed simplifier."""
        return current().simplifier.simplify(self, conditions)

    def to_sympy(self, component: str | None = None, grade: int | None = None):
        """One component as a sympy Expr (``A.to_sympy("e12")``), or a dict basis name ->
        Expr of all eight components, or of one grade's (``A.to_sympy(grade=1)``)."""
        from .conversion import to_sympy

        return to_sympy(self, component, grade)

    def to_numpy(self, grade: int | None = None):
        """The components as a float numpy array: all eight in basis order, or one grade's
        (``A.to_numpy(grade=1)`` is x, y, z).  ValueError naming the symbols left unset."""
        from .conversion import to_numpy

        return to_numpy(self, grade)

    def __invert__(self):
        # ~A is the reverse, as A~ in the language
        return self.rev()

    def __str__(self):
        parts = []
        for k, text in self.coefficient_texts():
            if k == 0:
                parts.append(text)
                continue
            if text == "1":
                parts.append(BASIS_NAMES[k])
            elif text == "-1":
                parts.append("-" + BASIS_NAMES[k])
            elif " " in text or "/" in text:
                parts.append(f"({text})*{BASIS_NAMES[k]}")
            else:
                parts.append(f"{text}*{BASIS_NAMES[k]}")
        if not parts:
            return "0"
        out = parts[0]
        for p in parts[1:]:
            out += " - " + p[1:] if p.startswith("-") else " + " + p
        return out

    def __repr__(self):
        return f"Multivector({self})"

    def _repr_latex_(self):
        # rich display in notebooks, through the printer gacalc.export installs
        latex = current().hooks.latex
        return None if latex is None else f"$${latex(self)}$$"


def simplified_scalar(expr, conditions=()):
    """A sympy scalar through the installed simplifier (as gacalc.simplify.simplify_scalar)."""
    return current().simplifier.simplify(Multivector({0: expr}), conditions)[0]


def _rational_product(left, right, table) -> "Multivector":
    """The same product for purely rational operands, in flint's fmpq (no polynomials)."""
    lq = [(i, c.constant_value()) for i, c in left]
    rq = [(j, c.constant_value()) for j, c in right]
    out = [0] * 8
    for i, x in lq:
        row = table[i]
        for j, y in rq:
            entry = row[j]
            if entry is not None:
                sign, k = entry
                out[k] = out[k] + x * y if sign > 0 else out[k] - x * y
    return Multivector.from_coefs(Coef.constant(v) if v else None for v in out)


def _polynomial_product(left, right, table) -> "Multivector":
    """The same product when every coefficient is a polynomial (no denominators): sums of
    products of the numerators in one flint context, as Coef's + and * would compute
    them, without a Coef per intermediate term."""
    numerators = _numerators(left + right)
    lp, rp = numerators[:len(left)], numerators[len(left):]
    out = [None] * 8
    for (i, _), x in zip(left, lp):
        row = table[i]
        for (j, _), y in zip(right, rp):
            entry = row[j]
            if entry is None:
                continue
            sign, k = entry
            acc = out[k]
            if acc is None:
                out[k] = x * y if sign > 0 else -(x * y)
            else:
                out[k] = acc + x * y if sign > 0 else acc - x * y
    return Multivector.from_coefs(None if n is None else Coef(n) for n in out)


def _numerators(coefs) -> list:
    """The numerators of polynomial coefficients, all lifted into the current context
    (adopting one from another session's registry may add generators, so lift again)."""
    numerators = [c.parts()[0] for _, c in coefs]
    ctx = numerators[0].context() if numerators else None
    if any(n.context() is not ctx for n in numerators):
        numerators = [c.parts()[0] for _, c in coefs]
    return numerators


def _condition_text_expr(d: Coef):
    """The vanishing condition a^2 + b^2 as a sympy Expr, with repeated factors taken once.

    The square-free part is taken by flint on the numerator polynomial (milliseconds on
    the degree-8 norm of a general product, where sympy's together/sqf_part took 30 s)."""
    if d.expr is not None:
        expr = d.expr
        if expr.is_number:
            return expr
        from sympy.polys.polyerrors import BasePolynomialError

        try:
            return sympy.sqf_part(sympy.numer(sympy.together(expr)))
        except (BasePolynomialError, ValueError):
            return expr
    if d.is_constant():
        return d.to_expr()
    return _square_free_coef(d).to_expr()


def _square_free_coef(d: Coef) -> Coef:
    """The square-free part of a polynomial coefficient's numerator, by flint, as a Coef
    (what _condition_text_expr writes out)."""
    _, num, _ = d._own_parts()
    _, factors = num.factor_squarefree()
    part = None
    for factor, _ in factors:
        part = factor if part is None else part * factor
    return Coef(part)


def _index_of(key) -> int:
    if isinstance(key, str):
        if key in BASIS_NAMES:
            return BASIS_NAMES.index(key)
        if key.startswith("e") and key[1:].isdigit():
            raise AlgebraError(f"{key} is not in the basis order; use blade({key[1:]!r})")
    raise KeyError(f"not a basis element: {key!r}")


def _coerce(x):
    if isinstance(x, Multivector):
        return x
    if _is_scalar(x):
        if loaded("sympy") and isinstance(x, sympy.Basic) and not isinstance(x, sympy.Expr):
            return NotImplemented
        return Multivector({0: x})
    return NotImplemented


def as_multivector(x, what: str) -> Multivector:
    """x as a Multivector (a plain scalar becomes one); AlgebraError naming ``what`` otherwise."""
    if isinstance(x, Multivector):
        return x
    if (isinstance(x, (Integral, Fraction)) or (loaded("sympy") and isinstance(x, sympy.Expr))) \
            and not isinstance(x, bool):
        return Multivector.scalar(x)
    raise AlgebraError(f"{what} needs a multivector; got {type(x).__name__}")


def blade(indices: str | tuple = "") -> Multivector:
    """The basis blade of an index string: blade('21') = -e12, blade('11') = 1, blade('312') = e123."""
    word = tuple(int(ch) for ch in indices) if isinstance(indices, str) else tuple(indices)
    if any(i not in (1, 2, 3) for i in word):
        raise AlgebraError("basis vector indices are 1, 2 and 3")
    sign, k = basis_of_word(word)
    return Multivector({k: sign})


def vector(x, y, z) -> Multivector:
    return Multivector({1: x, 2: y, 3: z})


def bivector(b23, b31, b12) -> Multivector:
    return Multivector({4: b23, 5: b31, 6: b12})


def cross(a: Multivector, b: Multivector) -> Multivector:
    """Gibbs cross product of two vectors: a × b = dual(a ∧ b), so e1 × e2 = e3."""
    a, b = _coerce(a), _coerce(b)
    for v in (a, b):
        if not v.grades() <= {1}:
            raise AlgebraError("cross product needs two vectors")
    return a.outer(b).dual()


ONE = Multivector({0: 1})
e1, e2, e3 = (Multivector({k: 1}) for k in (1, 2, 3))
e23, e31, e12 = (Multivector({k: 1}) for k in (4, 5, 6))
I = Multivector({7: 1})

__all__ = [
    "AlgebraError", "NotInvertibleError", "Multivector", "as_multivector", "blade", "vector", "bivector", "cross",
    "ONE", "e1", "e2", "e3", "e23", "e31", "e12", "I", "BASIS_INDICES",
]

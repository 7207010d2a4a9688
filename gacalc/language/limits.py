"""Size limits on values: refuse a product or power *before* it runs when its result
would be too large to compute, print or read.

The core multiplies coefficients in C (python-flint); such a call cannot be interrupted
by Ctrl-C or by the statement's time budget, so a product like (a + b + ... + h)^50
(about 2.6e8 terms) must be refused from the sizes of its operands.  The estimates are
upper bounds built from two counts, whichever is smaller:

- term pairs: a product of polynomials with s and t terms has at most s*t terms (and
  costs about s*t multiplications); a power p^n of a t-term polynomial has at most
  C(n + t - 1, t - 1) terms (one per multiset of chosen terms);
- dense size: a polynomial of total degree d in v generators has at most C(v + d, v)
  terms, per basis blade.

Coefficient sizes are bounded too: the height (bits of numerator and denominator) of a
product is at most the sum of the operands' heights plus log2 of the number of terms
that can add up, and Python cannot even print an integer of more than 4300 digits.

Sizes are read from the core's coefficient domain (``Multivector.coefs()``) here and
only here; the rest of the language sees values through the public core API.
"""

from __future__ import annotations

import math
import operator
import weakref
from dataclasses import dataclass

from .errors import GacalcLimitError, Span


def value_size(value):
    """The size of any value as its kind measures it (None: small)."""
    from gacalc.values import size

    return size(value)

MAX_TERMS = 50_000                 # terms in a value (all blades, numerators and denominators)
MAX_PRODUCT_WORK = 20_000_000      # term-by-term multiplications in one product
MAX_COEFFICIENT_DIGITS = 4_000     # decimal digits of one coefficient's numbers
CHAIN_SLACK = 1000                 # how far past the limits an estimated chain step may go
MAX_COEFFICIENT_BITS = int(MAX_COEFFICIENT_DIGITS * math.log2(10)) + 1

_LIMIT_HINT = "split the computation, or work with fewer symbols or smaller exponents"


@dataclass(frozen=True)
class Size:
    """What the estimates need to know about a value (exact or an upper bound)."""

    terms: int                   # total number of terms over all blades
    blades: int                  # number of nonzero blades (1 for a scalar)
    generators: frozenset        # positions of the generators (symbols, cos t, ...) used
    degree: int                  # largest total degree of a numerator or denominator
    bits: int                    # largest height of a coefficient's rational numbers
    rational: bool = False       # some coefficient has a denominator or is a float

    @property
    def polynomial(self) -> bool:
        return not self.rational


ZERO_SIZE = Size(0, 0, frozenset(), 0, 0)


def size_of(value) -> Size:
    """The exact size of a multivector (non-multivectors count as small).

    Values are immutable and the same operand (a declared M) is measured again and again,
    so sizes are kept per algebra context by the value's identity, for as long as the
    value lives (a weak reference drops the entry with it)."""
    coefs = getattr(value, "coefs", None)
    if coefs is None:
        return ZERO_SIZE
    cache, key, known = _cached(value)
    if known is not None:
        return known
    size = _measure(coefs())
    _keep(cache, key, value, size)
    return size


def _keep(cache: dict, key, value, entry):
    """cache[key] = (a weak reference to value, entry), dropped with the value."""
    try:
        reference = weakref.ref(value, lambda _, key=key, cache=cache: cache.pop(key, None))
    except TypeError:            # a value kind without weak references: not kept
        return
    cache[key] = (reference, entry)


_SIZES = "language.limits.sizes"


def _cached(value):
    """(the size cache, the value's key in it, its kept Size or None)."""
    from gacalc.algebra.context import current

    cache = current().store(_SIZES, dict)
    key = id(value)
    known = cache.get(key)
    if known is not None and known[0]() is value:
        return cache, key, known[1]
    return cache, key, None


_height_bits = operator.methodcaller("height_bits")


def _terms_and_bits(value):
    """(terms, bits) of a multivector as ``_measure`` counts them, without reading degrees
    and generators (two thirds of its cost), or None for a float expression.  Enough to
    pass a product whose pair count is small: see ``check_product``."""
    cache, key, known = _cached(value)
    if known is not None:
        return known.terms, known.bits
    quick = cache.get((key,))             # kept like sizes (a declared M is read often)
    if quick is not None and quick[0]() is value:
        return quick[1]
    terms = bits = 0
    heights = []
    for coef in value.coefs():
        if coef is None:
            continue
        if coef.expr is not None:
            return None
        num, den = coef.num, coef.den
        terms += len(num)
        heights.extend(map(_height_bits, num.coeffs()))
        if den is not None:
            terms += len(den)
            heights.extend(map(_height_bits, den.coeffs()))
    result = terms, max(heights, default=0)
    _keep(cache, (key,), value, result)
    return result


def _measure(coefs) -> Size:
    terms = blades = degree = bits = 0
    generators: set = set()
    rational = False
    for coef in coefs:
        if coef is None:
            continue
        blades += 1
        if coef.expr is not None:          # a float expression (numeric results)
            terms += _expr_terms(coef.expr)
            rational = True
            continue
        num, den = coef.num, coef.den
        if coef.is_rational():             # a rational number (never zero in a value)
            terms += len(num)
            for c in num.coeffs():
                bits = max(bits, int(c.height_bits()))
            continue
        for poly in (num, den):
            if poly is None:
                continue
            terms += len(poly)
            degree = max(degree, int(poly.total_degree()))
            generators.update(i for i, d in enumerate(poly.degrees()) if d > 0)
            for c in poly.coeffs():
                bits = max(bits, int(c.height_bits()))
        rational = rational or den is not None
    return Size(terms, blades, frozenset(generators), degree, bits, rational)


def terms_of(value) -> int:
    """Number of terms, without the cost of reading coefficient heights."""
    coefs = getattr(value, "coefs", None)
    if coefs is None:
        return 0
    total = 0
    for coef in coefs():
        if coef is None:
            continue
        if coef.expr is not None:
            total += _expr_terms(coef.expr)
            continue
        total += len(coef.num) + (len(coef.den) if coef.den is not None else 0)
    return total


def _expr_terms(expr) -> int:
    import sympy

    return len(sympy.Add.make_args(expr))


# Bounds ----------------------------------------------------------------------------------
def _comb(n: int, k: int) -> float:
    """C(n, k) exactly while it is small; a float (or inf) from lgamma when it is huge,
    so that bounds for absurd inputs cost nothing to compute."""
    if k <= 0 or n <= k:
        return 1.0
    k = min(k, n - k)
    log_value = math.lgamma(n + 1) - math.lgamma(k + 1) - math.lgamma(n - k + 1)
    if log_value < 120:                 # below about 1e52: exact
        return float(math.comb(n, k))
    return math.exp(log_value) if log_value < 700 else math.inf


def _dense_terms(generators: int, degree: int) -> float:
    """Most monomials a polynomial of total degree <= degree in that many generators has."""
    return _comb(generators + degree, generators)


def product_size(a: Size, b: Size) -> tuple[Size, float]:
    """(bound on the size of a*b for any product of the algebra, term pairs it costs)."""
    if not a.terms or not b.terms:
        return ZERO_SIZE, 0.0
    pairs = float(a.terms) * float(b.terms)
    generators = a.generators | b.generators
    degree = a.degree + b.degree
    blades = min(8, a.blades * b.blades)
    terms = pairs
    if a.polynomial and b.polynomial:
        terms = min(pairs, blades * _dense_terms(len(generators), degree))
    bits = a.bits + b.bits + math.log2(pairs) + 1
    return Size(_clip(terms), blades, generators, degree, int(bits),
                a.rational or b.rational), pairs


def power_size(a: Size, n: int) -> Size:
    """Bound on the size of a^n for a whole n >= 1."""
    if n <= 1 or not a.terms:
        return a
    multisets = _comb(n + a.terms - 1, a.terms - 1)
    blades = a.blades if a.blades <= 1 else 8
    terms = multisets
    if a.polynomial:
        terms = min(multisets, blades * _dense_terms(len(a.generators), n * a.degree))
    bits = n * (a.bits + math.log2(max(a.terms, 1)) + 1)
    return Size(_clip(terms), blades, a.generators, n * a.degree, _clip(bits), a.rational)


def _clip(x: float) -> int:
    return math.ceil(x) if x < 1e18 else 10**18


# Guards ----------------------------------------------------------------------------------
def check_size(size: Size, span: Span | None, what: str = "the result"):
    """Refuse a value (or a bound on one) over the limits."""
    if size.terms > MAX_TERMS:
        raise GacalcLimitError(f"{what} could have {_up_to(size.terms)} terms (the limit "
                               f"is {MAX_TERMS:,})", span, hint=_LIMIT_HINT)
    if size.bits > MAX_COEFFICIENT_BITS:
        digits = int(size.bits / math.log2(10))
        raise GacalcLimitError(f"{what} could have numbers of {_up_to(digits)} digits "
                               f"(the limit is {MAX_COEFFICIENT_DIGITS:,})", span,
                               hint=_LIMIT_HINT)


def check_product(a, b, span: Span | None, what: str = "this product",
                  result_bound: bool = True) -> None:
    """Refuse a product of two multivectors that would be too large or too slow.
    ``result_bound=False`` checks the work only (the caller has bounded the result)."""
    if _surely_small(a, b):
        return
    size, pairs = product_size(size_of(a), size_of(b))
    _check_work(pairs, span, what)
    if result_bound:
        check_size(size, span, what)


def _surely_small(a, b) -> bool:
    """Whether the product passes check_product whatever the operands' degrees and
    generators: its pair count is within MAX_TERMS (which bounds the result's terms and
    the work) and the height bound product_size computes is within the limit.  Most
    products of a script are so, and the check then costs a third of the full measure."""
    if getattr(a, "coefs", None) is None or getattr(b, "coefs", None) is None:
        return False
    ta, tb = _terms_and_bits(a), _terms_and_bits(b)
    if ta is None or tb is None:
        return False
    pairs = ta[0] * tb[0]
    if not pairs:
        return True                       # a zero operand: ZERO_SIZE, nothing to refuse
    return (pairs <= MAX_TERMS and
            ta[1] + tb[1] + math.log2(pairs) + 1 < MAX_COEFFICIENT_BITS)


def _check_work(pairs: float, span: Span | None, what: str):
    if pairs > MAX_PRODUCT_WORK:
        raise GacalcLimitError(f"{what} would need about {_count(pairs)} term "
                               f"multiplications (the limit is {MAX_PRODUCT_WORK:,})", span,
                               hint=_LIMIT_HINT)


def check_power(a, n: int, span: Span | None) -> Size:
    """Refuse A^n (n >= 2) whose result would be too large."""
    size = power_size(size_of(a), n)
    check_size(size, span, "this power")
    return size


def check_chain(values, span: Span | None, what: str) -> None:
    """Refuse a computation that multiplies these values together in turn (rotor sandwiches,
    inverses and norms multiply an argument with itself)."""
    sizes = [size for size in map(value_size, values) if size is not None]
    if not sizes:
        return
    current = sizes[0]
    for step, following in enumerate(sizes[1:]):
        current, pairs = product_size(current, following)
        if step == 0:
            # exact operand sizes: the usual limits
            _check_work(pairs, span, what)
            check_size(current, span, what)
        elif pairs > CHAIN_SLACK * MAX_PRODUCT_WORK or current.terms > CHAIN_SLACK * MAX_TERMS:
            # later steps multiply upper bounds that are often far from the truth (a versor
            # that is a multiple of I stays one term); refuse only the hopeless, the exact
            # result is checked after the call and the statement runs under its time budget
            _check_work(pairs / CHAIN_SLACK, span, what)
            check_size(Size(current.terms // CHAIN_SLACK, current.blades, current.generators,
                            current.degree, current.bits, current.rational), span, what)


def check_value(value, span: Span | None, what: str = "the result"):
    """Refuse a computed value over the limits (after functions that cannot be estimated)."""
    size = value_size(value)
    if size is not None:
        check_size(size, span, what)


def _up_to(x: float) -> str:
    return _count(x) if x >= 1e15 else "up to " + _count(x)


def _count(x: float) -> str:
    """A large count in words a person reads at a glance."""
    if x >= 1e15:
        return "more than a million billion"
    for size, word in ((1e12, "trillion"), (1e9, "billion"), (1e6, "million")):
        if x >= size:
            return f"{x / size:.3g} {word}"
    return f"{int(x):,}"


def check_sum(a, b, span: Span | None):
    """Sums of fractions multiply numerators and denominators (a/p + b/q =
    (a q + b p)/(p q)): refuse those that would be a too large product.  Sums of
    polynomials only add terms; ``check_terms`` looks at their result."""
    if not (_has_denominator(a) or _has_denominator(b)):
        return
    _check_work(float(terms_of(a)) * float(terms_of(b)), span, "this sum of fractions")


def check_terms(value, span: Span | None, what: str = "the result"):
    """Refuse a value with too many terms (cheap: no coefficient heights)."""
    count = terms_of(value)
    if count > MAX_TERMS:
        raise GacalcLimitError(f"{what} has {_count(count)} terms (the limit is "
                               f"{MAX_TERMS:,})", span, hint=_LIMIT_HINT)


def _has_denominator(value) -> bool:
    coefs = getattr(value, "coefs", None)
    return coefs is not None and any(c is not None and c.den is not None for c in coefs())


def check_call(builtin, args: list, span: Span | None):
    """Refuse a built-in call whose products would be too large, before it runs: the
    built-in's own estimate, or the chain of products it declares (gacalc.language.builtins)."""
    if builtin.estimate is not None:
        builtin.estimate(args, span)
        return
    values = [args[i] for i in builtin.chain if i < len(args)]
    if values:
        check_chain(values, span, f"{builtin.name}(...) here")


def check_substitutions(args, span):
    """subs(A, t, v, s, w, ...) or subs(A, (t, v), ...): each replacement against A."""
    replacements = []
    rest = list(args[1:])
    while rest:
        item = rest.pop(0)
        if isinstance(item, tuple) and len(item) == 2:       # a (t, v) list
            replacements.append(item[1])
        elif rest:
            replacements.append(rest.pop(0))
    for replacement in replacements:
        check_substitution([args[0], None, replacement], span)


def check_substitution(args, span):
    """subs(A, t, v): each t^k in A becomes v^k."""
    if len(args) != 3:
        return
    value, replacement = args[0], args[2]
    if not (hasattr(value, "coefs") and hasattr(replacement, "coefs")):
        return
    a, v = size_of(value), size_of(replacement)
    power = power_size(v, max(a.degree, 1))
    size, pairs = product_size(a, power)
    _check_work(pairs, span, "this substitution")
    check_size(size, span, "this substitution")

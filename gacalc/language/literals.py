"""Rational literals evaluated in plain fractions: numbers times blades, and sums of them.

A script's literal multivectors, ``((3/2)*e1 + (-7/4)*e2 + ...)``, would otherwise go
through the general evaluator node by node: a Multivector, a size check and a product
per term.  Here a subtree made only of numbers, blade names, negation, sums, products and
division by a nonzero number is computed as eight Fractions and becomes one Multivector
at the end (``Multivector.from_rationals``).  The arithmetic is exact, so the value is the
one the general path computes.

Wherever the general path would do more than arithmetic -- a name that is not a blade
(or is bound to a value), a division by zero or by a multivector, numbers near the size
limits, nesting near the depth limit, a matrix entry -- ``evaluate_literal`` returns None
and the evaluator takes the general path, which raises the errors with their positions.
"""

from __future__ import annotations

import re
from fractions import Fraction
from functools import lru_cache

from gacalc.algebra import Multivector
from gacalc.algebra.basis import PRODUCT_TABLE, basis_of_word

from . import limits
from . import syntax as S

_BLADE_NAME = re.compile(r"e[1-3]+\Z")
_PSEUDOSCALAR_NAME = "I"
# a product of two values is refused by the limits when its height bound (the operands'
# heights plus at most log2(64 pairs) + 1 bits) passes this; stay clear of it
_PAIR_BITS = 7


@lru_cache(maxsize=256)
def _blade_like(name: str) -> int:
    """1 for a blade name (e1, e21, e123, I), 0 for any other name."""
    return 1 if name == _PSEUDOSCALAR_NAME or _BLADE_NAME.match(name) else 0


@lru_cache(maxsize=256)
def _blade_components(name: str):
    """(sign, basis position) of a blade name: e21 is -e12, e11 is 1, I is e123."""
    if name == _PSEUDOSCALAR_NAME:
        return 1, 7
    return basis_of_word(tuple(int(ch) for ch in name[1:]))


def literal_height(node, memo: dict) -> int:
    """The height of a literal-shaped subtree (1 for a leaf), 0 when it is not one.

    Shape only: numbers, blade names (and I), negation, sums and products.  Memoised by
    node identity, so an evaluator asks about each node once."""
    kind = type(node)
    if kind is S.Number:                   # leaves: cheaper to look at than to remember
        return 1
    if kind is S.Name:
        return _blade_like(node.name)
    key = id(node)
    height = memo.get(key)
    if height is not None:
        return height
    if kind is S.Negate:
        below = literal_height(node.operand, memo)
        height = below + 1 if below else 0
    elif kind is S.Sum or kind is S.Product:
        height = 0
        for child in node.terms if kind is S.Sum else node.factors:
            below = 1 if type(child) is S.Number else literal_height(child, memo)
            if not below:
                height = 0
                break
            height = max(height, below + 1)
    else:
        height = 0
    memo[key] = height
    return height


class _NotLiteral(Exception):
    """The subtree needs the general path after all (raised inside, never escapes)."""


def evaluate_literal(node, frame, values: dict, dependence: dict, memo: dict,
                     depth: int, max_depth: int):
    """The Multivector of a literal subtree, or None for the general path.

    ``frame``, ``values`` and ``dependence`` are what the evaluator looks names up in
    (a bound name is not a blade); ``depth`` is the evaluator's depth at ``node``, so
    that a tree the general path would refuse as too deep is left to it."""
    height = literal_height(node, memo)
    if not height or depth + height - 1 > max_depth:
        return None
    try:
        components = _value(node, frame or {}, values, dependence)
    except _NotLiteral:
        return None
    dense = [0] * 8
    for position, x in components.items():
        dense[position] = x
    return Multivector.from_rationals(dense)


# Values are sparse: {basis position: nonzero int or Fraction}; a literal term touches
# one blade, so most operations see one entry.
def _value(node, frame, values, dependence) -> dict:
    kind = type(node)
    if kind is S.Number:
        value = node.value
        if value.denominator == 1:
            value = value.numerator        # whole numbers as ints: cheaper arithmetic
        return {0: value} if value else {}
    if kind is S.Name:
        name = node.name
        if name in frame or name in values or name in dependence:
            raise _NotLiteral
        sign, position = _blade_components(name)
        return {position: sign}
    if kind is S.Negate:
        return {k: -x for k, x in _value(node.operand, frame, values, dependence).items()}
    if kind is S.Sum:
        total = _value(node.terms[0], frame, values, dependence)
        for sign, term in zip(node.signs[1:], node.terms[1:]):
            for k, x in _value(term, frame, values, dependence).items():
                if k in total:
                    x = total[k] + x if sign > 0 else total[k] - x
                    if x:
                        total[k] = x
                    else:
                        del total[k]
                else:
                    total[k] = x if sign > 0 else -x
        return total
    # a product chain, left to right as the general path multiplies it
    total = _value(node.factors[0], frame, values, dependence)
    for op, factor in zip(node.ops[1:], node.factors[1:]):
        value = _value(factor, frame, values, dependence)
        if op == "/":
            divisor = value.get(0)
            if divisor is None or len(value) > 1:
                raise _NotLiteral          # division by zero or by a multivector
            total = {k: _quotient(x, divisor) for k, x in total.items()}
        else:
            total = _product(total, value)
    return total


def _quotient(x, divisor):
    if isinstance(x, int) and isinstance(divisor, int):
        return Fraction(x, divisor)
    return Fraction(x) / divisor


def _bits(x) -> int:
    """flint's height_bits of a rational: bits of its numerator or denominator."""
    if isinstance(x, int):
        return x.bit_length()
    return max(x.numerator.bit_length(), x.denominator.bit_length())


def _height(components: dict) -> int:
    """The largest height of the components."""
    return max(map(_bits, components.values()), default=0)


def _product(left: dict, right: dict) -> dict:
    """The geometric product of two sparse component dicts (the core's sign table);
    _NotLiteral where the limits could refuse it (let them say so)."""
    if len(left) == 1 and len(right) == 1:          # a number times a blade
        (i, x), = left.items()
        (j, y), = right.items()
        if _bits(x) + _bits(y) + _PAIR_BITS > limits.MAX_COEFFICIENT_BITS:
            raise _NotLiteral
        sign, k = PRODUCT_TABLE[i][j]
        if y == 1 or y == -1:
            return {k: x if sign * y > 0 else -x}
        if x == 1 or x == -1:
            return {k: y if sign * x > 0 else -y}
        return {k: x * y if sign > 0 else -(x * y)}
    if _height(left) + _height(right) + _PAIR_BITS > limits.MAX_COEFFICIENT_BITS:
        raise _NotLiteral
    out: dict = {}
    for i, x in left.items():
        row = PRODUCT_TABLE[i]
        for j, y in right.items():
            sign, k = row[j]
            term = x * y if sign > 0 else -(x * y)
            if k in out:
                term = out[k] + term
                if not term:
                    del out[k]
                    continue
            out[k] = term
    return out

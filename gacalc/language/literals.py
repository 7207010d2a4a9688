"""Rational literals evaluated in exact rationals: numbers times blades, and sums of them.

A script's literal multivectors, ``((3/2)*e1 + (-7/4)*e2 + ...)``, would otherwise go
through the general evaluator node by node: a Multivector, a size check and a product
per term.  Here a subtree made only of numbers, blade names, negation, sums, products and
division by a nonzero number is computed as eight rationals and becomes one Multivector
at the end (``Multivector.from_rationals``).  The arithmetic is exact, so the value is the
one the general path computes.

Wherever the general path would do more than arithmetic -- a name that is not a blade
(or is bound to a value), a division by zero or by a multivector, numbers near the size
limits, nesting near the depth limit, a matrix entry -- ``evaluate_literal`` returns None
and the evaluator takes the general path, which raises the errors with their positions.
"""

from __future__ import annotations

import re
from functools import lru_cache

from flint import fmpq

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


class _NotLiteral(Exception):
    """The subtree needs the general path after all (raised inside, never escapes)."""


# memo entry of a node the general path must evaluate (or that failed here)
_GENERAL = object()


def evaluate_literal(node, frame, values: dict, dependence: dict, memo: dict,
                     depth: int, max_depth: int):
    """The Multivector of a literal subtree, or None for the general path.

    ``frame``, ``values`` and ``dependence`` are what the evaluator looks names up in
    (a bound name is not a blade); ``depth`` is the evaluator's depth at ``node``, so
    that a tree the general path would refuse as too deep is left to it.  ``memo`` is the
    evaluator's: a subtree that is not literal is marked so, and the literal children
    computed before the failure are kept, so that the general path, which asks again
    about each child (one level deeper), finds them computed: every node is read once.
    Entries are keyed by node identity and depth and hold the node, so that no other node
    can take its identity while the memo lives."""
    known = memo.get((id(node), depth))
    if known is not None:
        components = known[1]
        if components is _GENERAL:
            return None
    else:
        try:
            components = _value(node, frame or {}, values, dependence, memo, depth,
                                max_depth)
        except _NotLiteral:
            return None
    dense = [0] * 8
    for position, x in components.items():
        dense[position] = x
    return Multivector.from_rationals(dense)


# Values are sparse: {basis position: nonzero int or flint fmpq}; a literal term touches
# one blade, so most operations see one entry.  fmpq rather than Fraction: its arithmetic
# runs in C, and the coefficient domain takes it as it is.
def _value(node, frame, values, dependence, memo, depth, max_depth) -> dict:
    if depth > max_depth:
        raise _NotLiteral                  # the general path says "too deeply nested"
    kind = type(node)
    if kind is S.Number:
        return _number(node.value)
    if kind is S.Name:
        return _blade(node.name, frame, values, dependence)
    if kind is S.Negate:
        try:
            below = _value(node.operand, frame, values, dependence, memo, depth + 1,
                           max_depth)
        except _NotLiteral:
            memo[id(node), depth] = (node, _GENERAL)
            raise
        return {k: -x for k, x in below.items()}
    if kind is S.Sum:
        children = node.terms
    elif kind is S.Product:
        children = node.factors
        if len(children) == 2 and type(children[1]) is S.Name and node.ops[1] != "/" \
                and depth < max_depth:
            # a number times a blade, every term of a script's literals: at once
            first = children[0]
            try:
                left = _number(first.value) if type(first) is S.Number else \
                    _value(first, frame, values, dependence, memo, depth + 1, max_depth)
            except _NotLiteral:
                memo[id(node), depth] = (node, _GENERAL)
                raise
            try:
                right = _blade(children[1].name, frame, values, dependence)
            except _NotLiteral:           # (literal) M: keep the literal for the general path
                memo[id(node), depth] = (node, _GENERAL)
                memo[id(first), depth + 1] = (first, left)
                raise
            return _product(left, right)
    else:
        raise _NotLiteral
    parts = []
    for child in children:
        try:
            parts.append(_value(child, frame, values, dependence, memo, depth + 1,
                                max_depth))
        except _NotLiteral:
            memo[id(node), depth] = (node, _GENERAL)
            for done, part in zip(children, parts):
                memo[id(done), depth + 1] = (done, part)   # the general path asks again
            raise
    if kind is S.Sum:
        return _sum(parts, node.signs)
    return _chain(parts, node.ops)


def _number(value) -> dict:
    """A Number node's Fraction as sparse components."""
    if value.denominator == 1:
        value = value.numerator            # whole numbers as ints: cheaper arithmetic
    else:
        value = fmpq(value.numerator, value.denominator)
    return {0: value} if value else {}


def _blade(name, frame, values, dependence) -> dict:
    if not _blade_like(name) or name in frame or name in values or name in dependence:
        raise _NotLiteral
    sign, position = _blade_components(name)
    return {position: sign}


def _sum(parts, signs) -> dict:
    total = dict(parts[0])
    for sign, part in zip(signs[1:], parts[1:]):
        for k, x in part.items():
            if k in total:
                x = total[k] + x if sign > 0 else total[k] - x
                if x:
                    total[k] = x
                else:
                    del total[k]
            else:
                total[k] = x if sign > 0 else -x
    return total


def _chain(parts, ops) -> dict:
    """A product chain, left to right as the general path multiplies it."""
    total = parts[0]
    for op, value in zip(ops[1:], parts[1:]):
        if op == "/":
            divisor = value.get(0)
            if divisor is None or len(value) > 1:
                raise _NotLiteral          # division by zero or by a multivector
            total = {k: _quotient(x, divisor) for k, x in total.items()}
        else:
            total = _product(total, value)
    return total


def _quotient(x, divisor):
    """x / divisor exactly (ints or fmpq; the quotient of two ints made an fmpq)."""
    if isinstance(x, int) and isinstance(divisor, int):
        return fmpq(x, divisor)
    return x / divisor


def _bits(x) -> int:
    """flint's height_bits of a rational: bits of its numerator or denominator."""
    if isinstance(x, int):
        return abs(x).bit_length()
    return x.height_bits()


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

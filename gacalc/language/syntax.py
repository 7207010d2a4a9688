"""Syntax tree of the gacalc language.  Every node carries the span of its text.

Sums, products and same-operator wedge-family chains are flat (lists of operands), so
a long sum is a wide node, not a deep one.  ``unparse`` writes a node back as text,
optionally fully parenthesised (for echoing how an input was read) and in Unicode.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from fractions import Fraction

from . import tokens as T
from .errors import Span


@dataclass
class Node:
    span: Span = field(repr=False, compare=False)


# Expressions -------------------------------------------------------------------
@dataclass
class Number(Node):
    value: Fraction
    text: str


@dataclass
class Name(Node):
    name: str


@dataclass
class Sum(Node):
    """terms[0] ± terms[1] ± ...; signs[i] is +1 or -1 (signs[0] is always +1)."""

    terms: list
    signs: list


@dataclass
class Product(Node):
    """factors[0] op[1] factors[1] ...; ops[i] in {'*', '/', ''} ('' = juxtaposition)."""

    factors: list
    ops: list


@dataclass
class Wedge(Node):
    """A chain of one wedge-family operator: kind is WEDGE, LCONTRACT, RCONTRACT, INNER.

    /\\ and . chains group from the left, _| from the right (a _| b _| C = a _| (b _| C)),
    |_ from the left (A |_ b |_ a = (A |_ b) |_ a)."""

    op: str
    operands: list


@dataclass
class Negate(Node):
    operand: Node


@dataclass
class Reverse(Node):
    operand: Node


@dataclass
class Power(Node):
    base: Node
    exponent: Node


@dataclass
class GradePart(Node):
    """<A>k (grade k) or <A> (grade 0, the scalar part)."""

    operand: Node
    grade: int | None


@dataclass
class Call(Node):
    """``name(args)``: a call when name is a function, a product when it is a value.

    ``spaced`` records whitespace between the name and '(' (``k (a + b)``)."""

    name: str
    name_span: Span = field(repr=False, compare=False)
    args: list
    spaced: bool


# Statements --------------------------------------------------------------------
@dataclass
class Statement(Node):
    silent: bool = field(default=False, kw_only=True)


@dataclass
class ExpressionStatement(Statement):
    expr: Node


@dataclass
class Assign(Statement):
    name: str
    name_span: Span = field(repr=False, compare=False)
    expr: Node


@dataclass
class Param:
    name: str
    span: Span = field(repr=False, compare=False)


@dataclass
class FunctionDef(Statement):
    name: str
    name_span: Span = field(repr=False, compare=False)
    params: list
    body: Node


@dataclass
class Declare(Statement):
    kind: str                 # one of tokens.DECLARATION_KINDS
    names: list               # list of Param (name + span)
    unit: bool


@dataclass
class Condition(Node):
    """L = R, a scalar side condition."""

    left: Node
    right: Node


@dataclass
class Check(Statement):
    left: Node
    right: Node
    given: list


@dataclass
class Assume(Statement):
    """assume C, C... ; ``clear`` for ``assume none``; no conditions and not clear lists."""

    conditions: list
    clear: bool


@dataclass
class Show(Statement):
    expr: Node
    against: Node | None
    latex: bool


@dataclass
class Emit(Statement):
    target: str               # one of tokens.EMIT_TARGETS
    expr: Node
    as_name: str | None
    path: str | None
    path_span: Span | None = field(default=None, repr=False, compare=False)


@dataclass
class Use(Statement):
    path: str
    path_span: Span = field(repr=False, compare=False)


@dataclass
class Save(Statement):
    path: str
    path_span: Span = field(repr=False, compare=False)
    force: bool


@dataclass
class Help(Statement):
    topic: str | None


# Unparsing ---------------------------------------------------------------------
_PREC_SUM, _PREC_PRODUCT, _PREC_WEDGE, _PREC_NEGATE, _PREC_POSTFIX, _PREC_ATOM = range(6)


def _op(kind: str, unicode: bool) -> str:
    return T.OPERATOR_SPELLINGS[kind][1 if unicode else 0]


def _greek(name: str, unicode: bool) -> str:
    return T.greek(name) if unicode else name


def unparse(node: Node, unicode: bool = False, parenthesize: bool = False) -> str:
    """Text of an expression node; ``parenthesize`` makes every grouping explicit."""
    text, _ = _unparse(node, unicode, parenthesize)
    return text


def _wrap(child, at_least: int, unicode: bool, full: bool) -> str:
    text, prec = _unparse(child, unicode, full)
    if prec < at_least or (full and prec < _PREC_ATOM and not isinstance(child, Number)):
        return f"({text})"
    return text


def _unparse(node, unicode, full):
    if isinstance(node, Number):
        return node.text, _PREC_ATOM
    if isinstance(node, Name):
        return _greek(node.name, unicode), _PREC_ATOM
    if isinstance(node, Sum):
        parts = [_wrap(node.terms[0], _PREC_SUM, unicode, full)]
        for sign, term in zip(node.signs[1:], node.terms[1:]):
            op = _op(T.PLUS, unicode) if sign > 0 else _op(T.MINUS, unicode)
            parts.append(f" {op} {_wrap(term, _PREC_PRODUCT, unicode, full)}")
        return "".join(parts), _PREC_SUM
    if isinstance(node, Product) and full and "/" in node.ops[1:] and len(node.factors) > 2:
        # left to right: ((a / b) c) ...
        text = _wrap(node.factors[0], _PREC_PRODUCT, unicode, full)
        for index, (op, factor) in enumerate(zip(node.ops[1:], node.factors[1:])):
            written = {"*": " * ", "/": " / ", "": " "}[op]
            if index:
                text = f"({text})"
            text += written + _wrap(factor, _PREC_WEDGE, unicode, full)
        return text, _PREC_PRODUCT
    if isinstance(node, Product):
        parts = [_wrap(node.factors[0], _PREC_PRODUCT, unicode, full)]
        for op, factor in zip(node.ops[1:], node.factors[1:]):
            written = {"*": " * ", "/": " / ", "": " "}[op]
            text = _wrap(factor, _PREC_WEDGE, unicode, full)
            if op == "" and isinstance(factor, Negate) and not text.startswith("("):
                text = f"({text})"      # 'a -b' would read as a difference
            parts.append(written + text)
        return "".join(parts), _PREC_PRODUCT
    if isinstance(node, Wedge):
        op = f" {_op(node.op, unicode)} "
        texts = [_wrap(operand, _PREC_NEGATE, unicode, full) for operand in node.operands]
        if full and len(texts) > 2:
            if node.op == T.LCONTRACT:   # groups from the right
                text = texts[-1]
                for index, left in enumerate(reversed(texts[:-1])):
                    text = f"{left}{op}({text})" if index else f"{left}{op}{text}"
            else:
                text = texts[0]
                for index, right in enumerate(texts[1:]):
                    text = f"({text}){op}{right}" if index else f"{text}{op}{right}"
            return text, _PREC_WEDGE
        return op.join(texts), _PREC_WEDGE
    if isinstance(node, Negate):
        return f"{_op(T.MINUS, unicode)}{_wrap(node.operand, _PREC_NEGATE, unicode, full)}", \
            _PREC_NEGATE
    if isinstance(node, Reverse):
        return f"{_wrap(node.operand, _PREC_POSTFIX, unicode, full)}{_op(T.REVERSE, unicode)}", \
            _PREC_POSTFIX
    if isinstance(node, Power):
        base = _wrap(node.base, _PREC_ATOM, unicode, False)
        exponent = node.exponent
        if isinstance(exponent, Number) and exponent.value.denominator == 1:
            return f"{base}^{exponent.text}", _PREC_POSTFIX
        if (isinstance(exponent, Negate) and isinstance(exponent.operand, Number)
                and exponent.operand.value.denominator == 1):
            return f"{base}^-{exponent.operand.text}", _PREC_POSTFIX
        return f"{base}^({unparse(exponent, unicode, full)})", _PREC_POSTFIX
    if isinstance(node, GradePart):
        left, right = _op(T.LANGLE, unicode), _op(T.RANGLE, unicode)
        grade = "" if node.grade is None else str(node.grade)
        return f"{left}{unparse(node.operand, unicode, full)}{right}{grade}", _PREC_ATOM
    if isinstance(node, Call):
        args = ", ".join(unparse(arg, unicode, full) for arg in node.args)
        space = " " if node.spaced else ""
        return f"{_greek(node.name, unicode)}{space}({args})", _PREC_ATOM
    raise TypeError(f"not an expression node: {node!r}")

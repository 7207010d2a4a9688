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


@dataclass
class Text(Node):
    """``"zyx"``: a word in double quotes, accepted only as an argument of the built-ins
    that name a convention with one (``euler_angles(R, "zyx")``); never a value."""

    value: str


@dataclass
class ListLiteral(Node):
    """``(a, b, c)``: a list of values (two or more items, in parentheses)."""

    items: list


@dataclass
class Index(Node):
    """``X[k]``: item k of a list (1-based), written right against its operand."""

    base: Node
    indices: list


@dataclass
class MatrixLiteral(Node):
    """[a, b; c, d]: rows of entries (scalars; i is the complex unit inside)."""

    rows: list                # list of lists of Node


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
    depends: tuple = ()       # declared as a function of these scalars: vector r(t)


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
    # scalar a in (0, pi), b, c in [0, 1]: name -> Interval
    intervals: dict = field(default_factory=dict, kw_only=True)


@dataclass
class Interval(Node):
    """(low, high) with open or closed ends: ``scalar a in (0, pi]``."""

    low: Node
    high: Node
    low_open: bool
    high_open: bool


@dataclass
class Condition(Node):
    """L = R, a scalar side condition; or a range L < R, L <= R, L > R, L >= R."""

    left: Node
    right: Node
    relation: str = field(default="=", kw_only=True)   # one of = < <= > >=


@dataclass
class Check(Statement):
    left: Node
    right: Node
    given: list
    rotation: bool = field(default=False, kw_only=True)   # check L == R as rotation


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
class FormulaStatement(Statement):
    """formula EXPR (``expr`` set), or the setting: formula auto / formula off (``mode``)."""

    expr: Node | None
    mode: str | None = None    # 'auto' or 'off' for the setting, None for formula EXPR


@dataclass
class Emit(Statement):
    target: str               # one of tokens.EMIT_TARGETS
    expr: Node
    as_name: str | None
    path: str | None
    path_span: Span | None = field(default=None, repr=False, compare=False)
    components: bool = False  # emit TARGET components EXPR: no formula, the components


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
class BudgetSetting(Statement):
    """budget SECONDS / budget none (no limit): the time of each later statement;
    ``budget`` alone (``seconds`` None) prints it."""

    seconds: float | None


@dataclass
class Help(Statement):
    topic: str | None


@dataclass
class Draw(Statement):
    """draw X, ... [to "file.svg"|"file.png"]"""

    exprs: list
    path: str | None
    path_span: Span | None = field(default=None, repr=False, compare=False)


# Unparsing ---------------------------------------------------------------------
_PREC_SUM, _PREC_PRODUCT, _PREC_WEDGE, _PREC_NEGATE, _PREC_POSTFIX, _PREC_ATOM = range(6)


def _op(kind: str, unicode: bool) -> str:
    return T.OPERATOR_SPELLINGS[kind][1 if unicode else 0]


def _greek(name: str, unicode: bool) -> str:
    return T.greek(name) if unicode else name


def walk(node: Node):
    """Every node of a tree, the node itself first (iteratively: trees may be wide)."""
    pending = [node]
    while pending:
        current = pending.pop()
        yield current
        for value in vars(current).values():
            if isinstance(value, Node):
                pending.append(value)
            elif isinstance(value, list):
                for item in value:
                    if isinstance(item, list):   # the rows of a matrix literal
                        pending.extend(entry for entry in item if isinstance(entry, Node))
                    elif isinstance(item, Node):
                        pending.append(item)


def unparse(node: Node, unicode: bool = False, parenthesize: bool = False) -> str:
    """Text of an expression node; ``parenthesize`` makes every grouping explicit."""
    text, _ = _Unparser(unicode, parenthesize).visit(node)
    return text


class _Unparser:
    """One method per expression node, like ``ast.NodeVisitor``: each returns the text
    and the precedence level of what it wrote."""

    def __init__(self, unicode: bool, full: bool):
        self.unicode = unicode
        self.full = full

    def visit(self, node) -> tuple[str, int]:
        method = getattr(self, "visit_" + type(node).__name__, None)
        if method is None:
            raise TypeError(f"not an expression node: {node!r}")
        return method(node)

    def text(self, node, full: bool | None = None) -> str:
        """A child's text, unwrapped (inside brackets of its own)."""
        if full is None or full == self.full:
            return self.visit(node)[0]
        return _Unparser(self.unicode, full).visit(node)[0]

    def wrap(self, child, at_least: int, full: bool | None = None) -> str:
        full = self.full if full is None else full
        text, prec = (self if full == self.full else _Unparser(self.unicode, full)).visit(child)
        if prec < at_least or (full and prec < _PREC_ATOM and not isinstance(child, Number)):
            return f"({text})"
        return text

    def op(self, kind: str) -> str:
        return _op(kind, self.unicode)

    def visit_Number(self, node):
        return node.text, _PREC_ATOM

    def visit_Name(self, node):
        return _greek(node.name, self.unicode), _PREC_ATOM

    def visit_Sum(self, node):
        parts = [self.wrap(node.terms[0], _PREC_SUM)]
        for sign, term in zip(node.signs[1:], node.terms[1:]):
            op = self.op(T.PLUS) if sign > 0 else self.op(T.MINUS)
            parts.append(f" {op} {self.wrap(term, _PREC_PRODUCT)}")
        return "".join(parts), _PREC_SUM

    def visit_Product(self, node):
        if self.full and "/" in node.ops[1:] and len(node.factors) > 2:
            # left to right: ((a / b) c) ...
            text = self.wrap(node.factors[0], _PREC_PRODUCT)
            for index, (op, factor) in enumerate(zip(node.ops[1:], node.factors[1:])):
                written = _PRODUCT_OPS[op]
                if index:
                    text = f"({text})"
                text += written + self.wrap(factor, _PREC_WEDGE)
            return text, _PREC_PRODUCT
        parts = [self.wrap(node.factors[0], _PREC_PRODUCT)]
        for op, factor in zip(node.ops[1:], node.factors[1:]):
            text = self.wrap(factor, _PREC_WEDGE)
            if op == "" and isinstance(factor, Negate) and not text.startswith("("):
                text = f"({text})"      # 'a -b' would read as a difference
            parts.append(_PRODUCT_OPS[op] + text)
        return "".join(parts), _PREC_PRODUCT

    def visit_Wedge(self, node):
        op = f" {self.op(node.op)} "
        texts = [self.wrap(operand, _PREC_NEGATE) for operand in node.operands]
        if self.full and len(texts) > 2:
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

    def visit_Negate(self, node):
        return f"{self.op(T.MINUS)}{self.wrap(node.operand, _PREC_NEGATE)}", _PREC_NEGATE

    def visit_Reverse(self, node):
        return f"{self.wrap(node.operand, _PREC_POSTFIX)}{self.op(T.REVERSE)}", _PREC_POSTFIX

    def visit_Power(self, node):
        base = self.wrap(node.base, _PREC_ATOM, full=False)
        exponent = node.exponent
        if isinstance(exponent, Number) and exponent.value.denominator == 1:
            return f"{base}^{exponent.text}", _PREC_POSTFIX
        if (isinstance(exponent, Negate) and isinstance(exponent.operand, Number)
                and exponent.operand.value.denominator == 1):
            return f"{base}^-{exponent.operand.text}", _PREC_POSTFIX
        return f"{base}^({self.text(exponent)})", _PREC_POSTFIX

    def visit_GradePart(self, node):
        left, right = self.op(T.LANGLE), self.op(T.RANGLE)
        grade = "" if node.grade is None else str(node.grade)
        return f"{left}{self.text(node.operand)}{right}{grade}", _PREC_ATOM

    def visit_MatrixLiteral(self, node):
        rows = "; ".join(", ".join(self.text(entry) for entry in row) for row in node.rows)
        return f"[{rows}]", _PREC_ATOM

    def visit_Call(self, node):
        args = ", ".join(self.text(arg) for arg in node.args)
        space = " " if node.spaced else ""
        return f"{_greek(node.name, self.unicode)}{space}({args})", _PREC_ATOM

    def visit_Text(self, node):
        return f'"{node.value}"', _PREC_ATOM

    def visit_ListLiteral(self, node):
        return "(" + ", ".join(self.text(item) for item in node.items) + ")", _PREC_ATOM

    def visit_Index(self, node):
        indices = ", ".join(self.text(index) for index in node.indices)
        return f"{self.wrap(node.base, _PREC_ATOM)}[{indices}]", _PREC_POSTFIX


_PRODUCT_OPS = {"*": " * ", "/": " / ", "": " "}

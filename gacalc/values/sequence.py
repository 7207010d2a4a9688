"""Lists of values: ``(a, b, c)`` literals and what built-ins such as a frame return.

A list holds any values (multivectors, matrices, quaternions, lists) in order; item k is
``L[k]``, counted from 1 as in the mathematics (a frame's first vector is F[1]).  Lists
do not add or multiply; they compare item by item in ``check``.
"""

from __future__ import annotations

from gacalc.language.errors import GacalcTypeError

from . import kind_of, register
from .kind import ValueKind


class ValueList(tuple):
    """An immutable list of gacalc values (a tuple, so it hashes and compares by item)."""

    def __repr__(self):
        return f"ValueList({', '.join(repr(item) for item in self)})"


def value_list(items) -> ValueList:
    return ValueList(items)


class ListKind(ValueKind):
    name = "list"
    block_text = False

    def matches(self, value) -> bool:
        return isinstance(value, ValueList)

    def describe(self, value) -> str:
        count = len(value)
        return f"a list of {count} item" + ("" if count == 1 else "s")

    # Text ------------------------------------------------------------------------------
    def text(self, value, unicode=False, width=78, indent=0) -> str:
        texts = [_item_text(item, unicode, width, indent + 1) for item in value]
        if len(texts) == 1 and "\n" not in texts[0]:
            return f"({texts[0]},)"       # (a) would read back as a itself
        one_line = "(" + ", ".join(texts) + ")"
        if "\n" not in one_line and len(one_line) + indent <= width:
            return one_line
        # One item per line; the open bracket continues every line to the last.
        pad = " " * (indent + 1)
        lines = []
        for position, text in enumerate(texts):
            text = text.replace("\n", "\n" + pad)
            lead = "(" if position == 0 else pad
            tail = ",)" if len(texts) == 1 else ")" if position == len(texts) - 1 else ","
            lines.append(lead + text + tail)
        return "\n".join(lines)

    # Indexing ----------------------------------------------------------------------------
    def index(self, evaluator, value, indices, spans):
        if len(indices) != 1:
            raise GacalcTypeError(f"a list takes one index, not {len(indices)}", spans[1])
        position = evaluator.index_number(indices[0], spans[0], len(value))
        return value[position - 1]

    # Conditions, comparison ------------------------------------------------------------
    def symbols(self, value) -> frozenset:
        out = frozenset()
        for item in value:
            out |= _kind(item).symbols(item)
        return out

    def simplify(self, value, conditions, budget):
        items, complete = [], True
        for item in value:
            simplified, done = _kind(item).simplify(item, conditions, budget)
            items.append(simplified)
            complete = complete and done
        return ValueList(items), complete

    def differences(self, left, right):
        if not self.matches(right) or len(left) != len(right):
            return None
        out = []
        for a, b in zip(left, right):
            kind = _kind(a)
            if kind_of(b) is not kind:
                return None
            parts = kind.differences(a, b)
            if parts is None:
                return None
            out.extend(parts)
        return out

    def reassemble(self, like, differences):
        items, position = [], 0
        for item in like:
            kind = _kind(item)
            count = len(kind.differences(item, item))
            items.append(kind.reassemble(item, differences[position:position + count]))
            position += count
        return ValueList(items)

    # Numbers -----------------------------------------------------------------------------
    def scalars(self, value) -> list:
        out = []
        for item in value:
            out.extend(_kind(item).scalars(item))
        return out

    def map_scalars(self, value, fn):
        items = [_kind(item).map_scalars(item, fn) for item in value]
        return None if any(item is None for item in items) else ValueList(items)

    def is_exact_constant(self, value) -> bool:
        return all(_kind(item).is_exact_constant(item) for item in value)

    def numeric(self, value, digits):
        items = [_kind(item).numeric(item, digits) for item in value]
        return None if any(item is None for item in items) else ValueList(items)

    # show, emit, limits ------------------------------------------------------------------
    def report(self, value, simplifier, against=None):
        from gacalc.forms.report import VALUE, Report, ReportItem

        items = [ReportItem(f"item {position}", item, section=VALUE)
                 for position, item in enumerate(value, start=1)]
        return Report(self.describe(value), "list", items, simplifier.complete)

    def report_lines(self, value, unicode, width):
        return self.text(value, unicode, width - 2).split("\n")

    def latex(self, value) -> str:
        return r"\left(" + ",\\; ".join(_kind(item).latex(item) for item in value) \
            + r"\right)"

    def export(self, value):
        from gacalc.export import ExportError

        raise ExportError("a list has no single export form: emit its items one by one "
                          "(emit latex L[1])")

    def size(self, value):
        # The limits guard one value at a time: the largest item is the list's size.
        sizes = [size for size in (_kind(item).size(item) for item in value)
                 if size is not None]
        return max(sizes, key=lambda size: size.terms) if sizes else None


def _kind(item) -> ValueKind:
    kind = kind_of(item)
    if kind is None:      # a bug: lists hold gacalc values only
        raise TypeError(f"not a gacalc value in a list: {type(item).__name__}")
    return kind


def _item_text(item, unicode, width, indent) -> str:
    return _kind(item).text(item, unicode, width, indent)


LIST = register(ListKind())

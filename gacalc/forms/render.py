"""Text and LaTeX renderings of a derived-forms report.

Text layout (our own): values on the left, labels on the right after ``#``, in one
column.  Anything that is valid gacalc input (multivectors, scalars) stands bare;
everything else (matrices, quaternions, verdicts in words, notes, section rules) sits
in a comment, so a report pasted back into gacalc reads without error.  A value too
wide for the left column gets its label on a line of its own just above it.

LaTeX: one ``aligned`` block, a row ``\\text{label} & value`` per item, the notes and
conditions in a further column — ready to drop into a displayed equation.
"""

from __future__ import annotations

import textwrap

from gacalc.lazy import sympy

from .report import Report, ReportItem

WIDTH = 80
MAX_VALUE_COLUMN = 46   # values wider than this get their label on a line above
MIN_VALUE_COLUMN = 16
RULE_WIDTH = 60


# ---------------------------------------------------------------------------
# text


def render_text(report: Report, unicode: bool = False) -> str:
    from .naming import name_repeats, use_names

    lines = [f"# derived forms: {report.title}"]
    blocks = [(item, _value_lines(item, unicode)) for item in report.items]
    # long scalars repeated across items (denominator, condition, norm) are named once
    names = name_repeats(["\n".join(v) + "\n(" + _condition_text(item, unicode) + ")"
                          for item, v in blocks])
    if names:
        blocks = [(item, [use_names(line, names) for line in v]) for item, v in blocks]
    column = _label_column(blocks)
    section = None
    for item, value_lines in blocks:
        if item.section != section:
            section = item.section
            lines.append(_rule(section, unicode))
            if section == report.items[0].section and names:
                lines.extend(_named_lines(names, column))
        lines.extend(_item_lines(item, value_lines, column, unicode, names))
    return "\n".join(lines)


def _named_lines(names, column) -> list:
    """``D = ...`` definitions (valid input, before their first use)."""
    out = []
    for name, text in names:
        line = f"{name} = {text}"
        label = f"# where {name}: named once, used below"
        out.extend([line.ljust(column) + label] if len(line) <= column - 2 else [label, line])
    return out


def _rule(section: str, unicode: bool) -> str:
    dash = "\u2500" if unicode else "-"
    head = f"# {dash * 2} {section} "
    return head + dash * max(0, RULE_WIDTH - len(head))


def _label_column(blocks) -> int:
    widths = [max(len(line) for line in v) for _, v in blocks
              if v and len(v) == 1 and len(v[0]) <= MAX_VALUE_COLUMN]
    return max([MIN_VALUE_COLUMN] + widths) + 2


def _value_lines(item: ReportItem, unicode: bool) -> list:
    """The value as lines of text; [] for a verdict in words (printed beside the label)."""
    from gacalc.printing import quaternion_text, scalar_text
    from gacalc.values import kind_of

    value = item.value
    if item.formula is not None:
        return [item.formula.text(unicode)]
    if isinstance(value, str) or _omitted(item):
        return []
    if isinstance(value, tuple) and kind_of(value) is None:     # a quaternion (w, x, y, z)
        line = "# " + quaternion_text(sympy.Quaternion(*value), unicode)
        if len(line) <= WIDTH:
            return [line]
        return [f"#   {part}  {scalar_text(c, unicode)}" for part, c in zip("wxyz", value)]
    kind = kind_of(value)
    if kind is not None:
        return kind.report_lines(value, unicode, WIDTH)
    return scalar_text(_factored(value), unicode).split("\n")


def _factored(expr):
    """A scalar as written in a report: factored when that is shorter (display only)."""
    from gacalc.simplify.factoring import factored

    return factored(expr)


def _omitted(item: ReportItem) -> str:
    """The omission line of an item too long to read; a formula for it is short enough."""
    return item.omitted if item.formula is None else ""


def _condition_text(item: ReportItem, unicode: bool) -> str:
    """The condition in the layout of the value texts (for naming repeats), or ''."""
    if item.condition is None or item.condition_formula is not None:
        return ""
    from gacalc.printing.text import value_text

    try:
        from gacalc.algebra import Multivector

        return value_text(Multivector({0: _factored(item.condition)}), unicode, 10**6)
    except (ArithmeticError, ValueError, TypeError):
        return ""


def _annotation(item: ReportItem, unicode: bool, names=()) -> str:
    """Note and condition of an item as one sentence (may be empty)."""
    from gacalc.printing import scalar_text

    if _omitted(item):
        return _omitted(item)
    parts = [item.note] if item.note else []
    if item.condition_omitted and item.condition_formula is None:
        parts.append(item.condition_omitted)
    elif item.condition is not None:
        neq = "\u2260" if unicode else "!="
        condition = (item.condition_formula.text(unicode) if item.condition_formula is not None
                     else scalar_text(_factored(item.condition), unicode))
        named = dict((text, name) for name, text in names).get(_condition_text(item, unicode)) \
            if names else None
        parts.append(f"where {named or condition} {neq} 0")
    return "; ".join(parts)


def _item_lines(item: ReportItem, value_lines: list, column: int, unicode: bool,
                names=()) -> list:
    """A short value with its label beside it in the label column; a verdict in words,
    or a value too long for the left column, as a block: its label line, then the value.
    A note that does not fit on the label's line follows it, indented, across the page."""
    label = item.label + (f": {item.value}" if item.is_text else
                          ": omitted" if _omitted(item) else "")
    beside = len(value_lines) == 1 and len(value_lines[0]) <= column - 2
    if beside:
        first = value_lines[0].ljust(column) + "# " + label
    else:
        first = "# " + label
    out = [first]
    annotation = _annotation(item, unicode, names)
    if annotation:
        joined = first + (" \u00b7 " if unicode else " -- ") + annotation
        if len(joined) <= WIDTH:
            out[0] = joined
        else:
            out.extend("#     " + chunk for chunk in textwrap.wrap(annotation, WIDTH - 6))
    if not beside:
        out.extend(value_lines)
    return out


# ---------------------------------------------------------------------------
# LaTeX


def render_latex(report: Report, notes: bool = True) -> str:
    """One aligned block: \\text{label} & value, with notes in a third column."""
    rows = []
    for _, label, value, remark in latex_rows(report):
        row = r"\text{%s} & %s" % (_latex_text(label), value)
        if remark and notes:
            row += r" && " + remark
        rows.append(row)
    return "\\begin{aligned}\n" + " \\\\\n".join(rows) + "\n\\end{aligned}"


def latex_rows(report: Report) -> list:
    """(section, label, value as LaTeX, remark as LaTeX or "") for each item: the cells of
    a report laid out by another front end (a notebook's HTML table)."""
    return [(item.section, item.label, _latex_item_value(item), _latex_remark(item))
            for item in report.items]


def _latex_item_value(item: ReportItem) -> str:
    """A formula when one was proved; one word for a value too long to read."""
    if item.formula is not None:
        return item.formula.latex()
    return _latex_value("omitted" if _omitted(item) else item.value)


def _latex_value(value) -> str:
    from gacalc.export import latex_of
    from gacalc.values import kind_of

    if isinstance(value, str):
        return r"\text{%s}" % _latex_text(value)
    kind = kind_of(value)
    if isinstance(value, tuple) and kind is None:                 # a quaternion (w, x, y, z)
        return r"\left(%s\right)" % ", ".join(latex_of(c) for c in value)
    if kind is not None:
        return kind.latex(value)
    return latex_of(value)


def _latex_remark(item: ReportItem) -> str:
    from gacalc.export import latex_of

    if _omitted(item):
        return r"\text{%s}" % _latex_text(_omitted(item))
    parts = []
    if item.note:
        parts.append(r"\text{%s}" % _latex_text(item.note))
    if item.condition_formula is not None:
        parts.append(r"\text{where } %s \neq 0" % item.condition_formula.latex())
    elif item.condition_omitted:
        parts.append(r"\text{%s}" % _latex_text(item.condition_omitted))
    elif item.condition is not None:
        parts.append(r"\text{where } %s \neq 0" % latex_of(item.condition))
    return r",\ ".join(parts)


_LATEX_SPECIALS = {
    "\\": r"\textbackslash{}", "{": r"\{", "}": r"\}", "#": r"\#", "$": r"\$", "%": r"\%",
    "&": r"\&", "_": r"\_", "^": r"\^{}", "~": r"\~{}", "<": r"\textless{}", ">": r"\textgreater{}",
}


def _latex_text(text: str) -> str:
    return "".join(_LATEX_SPECIALS.get(ch, ch) for ch in text)

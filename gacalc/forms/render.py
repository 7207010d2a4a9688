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

import sympy

from .report import Report, ReportItem

WIDTH = 80
MAX_VALUE_COLUMN = 46   # values wider than this get their label on a line above
MIN_VALUE_COLUMN = 16
RULE_WIDTH = 60


# ---------------------------------------------------------------------------
# text


def render_text(report: Report, unicode: bool = False) -> str:
    lines = [f"# derived forms: {report.title}"]
    blocks = [(item, _value_lines(item, unicode)) for item in report.items]
    column = _label_column(blocks)
    section = None
    for item, value_lines in blocks:
        if item.section != section:
            section = item.section
            lines.append(_rule(section, unicode))
        lines.extend(_item_lines(item, value_lines, column, unicode))
    return "\n".join(lines)


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
    if isinstance(value, str):
        return []
    if isinstance(value, tuple):
        line = "# " + quaternion_text(sympy.Quaternion(*value), unicode)
        if len(line) <= WIDTH:
            return [line]
        return [f"#   {part}  {scalar_text(c, unicode)}" for part, c in zip("wxyz", value)]
    kind = kind_of(value)
    if kind is not None:
        return kind.report_lines(value, unicode, WIDTH)
    return scalar_text(value, unicode).split("\n")


def _annotation(item: ReportItem, unicode: bool) -> str:
    """Note and condition of an item as one sentence (may be empty)."""
    from gacalc.printing import scalar_text

    parts = [item.note] if item.note else []
    if item.condition is not None:
        neq = "\u2260" if unicode else "!="
        parts.append(f"where {scalar_text(item.condition, unicode)} {neq} 0")
    return "; ".join(parts)


def _item_lines(item: ReportItem, value_lines: list, column: int, unicode: bool) -> list:
    """A short value with its label beside it in the label column; a verdict in words,
    or a value too long for the left column, as a block: its label line, then the value.
    A note that does not fit on the label's line follows it, indented, across the page."""
    label = item.label + (f": {item.value}" if item.is_text else "")
    beside = len(value_lines) == 1 and len(value_lines[0]) <= column - 2
    if beside:
        first = value_lines[0].ljust(column) + "# " + label
    else:
        first = "# " + label
    out = [first]
    annotation = _annotation(item, unicode)
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
    return [(item.section, item.label, _latex_value(item.value), _latex_remark(item))
            for item in report.items]


def _latex_value(value) -> str:
    from gacalc.export import latex_of
    from gacalc.values import kind_of

    if isinstance(value, str):
        return r"\text{%s}" % _latex_text(value)
    if isinstance(value, tuple):
        return r"\left(%s\right)" % ", ".join(latex_of(c) for c in value)
    kind = kind_of(value)
    if kind is not None:
        return kind.latex(value)
    return latex_of(value)


def _latex_remark(item: ReportItem) -> str:
    from gacalc.export import latex_of

    parts = []
    if item.note:
        parts.append(r"\text{%s}" % _latex_text(item.note))
    if item.condition is not None:
        parts.append(r"\text{where } %s \neq 0" % latex_of(item.condition))
    return r",\ ".join(parts)


_LATEX_SPECIALS = {
    "\\": r"\textbackslash{}", "{": r"\{", "}": r"\}", "#": r"\#", "$": r"\$", "%": r"\%",
    "&": r"\&", "_": r"\_", "^": r"\^{}", "~": r"\~{}", "<": r"\textless{}", ">": r"\textgreater{}",
}


def _latex_text(text: str) -> str:
    return "".join(_LATEX_SPECIALS.get(ch, ch) for ch in text)

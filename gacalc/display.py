"""Results as rich-display bundles (mime type -> data), for notebooks and other front ends.

Every bundle has ``text/plain`` (the text the terminal prints, valid input where it is a
value); values and declarations add ``text/latex`` (typeset by the notebook's MathJax),
``show`` and ``check`` add ``text/html`` (a table whose cells are LaTeX), pictures add
``image/svg+xml`` or ``image/png``.  Nothing here imports IPython.
"""

from __future__ import annotations

import base64
import html

__all__ = ["bundle", "error_text", "name_latex", "show_html"]


def bundle(result) -> dict | None:
    """The mime bundle of one result of Session.run, or None when it shows nothing
    (a silenced value)."""
    kind = getattr(result, "kind", None)
    if kind == "value" and result.silent:
        return None
    data = {"text/plain": result.text}
    maker = _MAKERS.get(kind)
    if maker is not None:
        data.update(maker(result))
    return data


def error_text(error) -> str:
    """An error as the one-line message with its source line and carets."""
    return error.caret_text()


def name_latex(name: str) -> str:
    """A gacalc name in LaTeX: Greek letters and subscripts as sympy spells symbols."""
    import sympy

    return sympy.latex(sympy.Symbol(name))


def _value_latex(value) -> str:
    from gacalc.values import kind_of

    kind = kind_of(value)
    if kind is None:
        from gacalc.export import latex_of

        return latex_of(value)
    return kind.latex(value)


def _value(result) -> dict:
    body = _value_latex(result.value)
    if result.name is not None:
        body = f"{name_latex(result.name)} = {body}"
    return {"text/latex": f"$\\displaystyle {body}$"}


def _declaration(result) -> dict:
    rows = [f"{name_latex(name)} &= {_value_latex(value)}"
            for name, value in result.values.items()]
    if not rows:
        return {}
    return {"text/latex": "$\\displaystyle \\begin{aligned}" + " \\\\ ".join(rows)
                          + "\\end{aligned}$"}


def show_html(report) -> str:
    """A show report as an HTML table: a heading row per section, then label, value and
    remark cells (the last two LaTeX in $...$)."""
    from gacalc.forms.render import latex_rows

    lines = ['<table class="gacalc-show">',
             f"<caption>{html.escape(report.title)}</caption>"]
    section = None
    for item_section, label, value, remark in latex_rows(report):
        if item_section and item_section != section:
            section = item_section
            lines.append(f'<tr><th colspan="3">{html.escape(section)}</th></tr>')
        remark_cell = _math_cell(remark) if remark else "<td></td>"
        lines.append(f"<tr><td>{html.escape(label)}</td>{_math_cell(value)}{remark_cell}</tr>")
    if not report.complete:
        lines.append('<tr><td colspan="3">simplification ran out of time: some values are '
                     "correct but not fully simplified</td></tr>")
    lines.append("</table>")
    return "\n".join(lines)


def _math_cell(latex: str) -> str:
    return f'<td class="math">${html.escape(latex, quote=False)}$</td>'


def _show(result) -> dict:
    if result.report is None or not hasattr(result.report, "items"):
        return {}
    data = {"text/html": show_html(result.report)}
    if result.latex:
        data["text/latex"] = f"$\\displaystyle {result.report_text}$"
    return data


def _check(result) -> dict:
    words = {"holds": "held", "fails": "FAILED", "undecided": "undecided"}[result.outcome]
    given = (f" given {html.escape(', '.join(result.conditions))}"
             if result.conditions else "")
    parts = [f'<div class="gacalc-check"><b>{words}</b>{given}: '
             f"<code>{html.escape(result.statement_text)}</code>"]
    if result.difference is not None:
        difference = html.escape(_value_latex(result.difference), quote=False)
        parts.append(f'<br>$L - R = {difference}$')
    if result.witness is not None:         # where the two sides differ
        point, value = result.witness
        at = html.escape(_value_latex(value), quote=False)
        parts.append(f"<br>$L - R = {at}$ at <code>{html.escape(point)}</code>")
    if result.outcome == "undecided":      # why: the budget, or the method's limit
        why = ("within the time budget" if result.out_of_time or not result.reason
               else result.reason)
        parts.append(f"<br>({html.escape(why)})")
    parts.append("</div>")
    return {"text/html": "".join(parts)}


def _draw(result) -> dict:
    if result.format == "svg":
        return {"image/svg+xml": result.image.decode("utf-8")}
    return {"image/png": base64.b64encode(result.image).decode("ascii")}


_MAKERS = {"value": _value, "declaration": _declaration, "show": _show, "check": _check,
           "draw": _draw}

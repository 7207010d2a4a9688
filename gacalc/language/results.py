"""Results of running gacalc statements (what Session.run returns, besides errors).

Every result has ``kind`` ('value', 'check', 'note', 'declaration', 'show', 'emit',
'help', 'file', 'draw'), ``span`` / ``filename`` / ``line`` / ``column`` of the statement,
``silent`` (the statement ended with ';'), ``text`` (in the session's display mode)
and ``render(unicode=False)``.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from .errors import Positioned, Span


def _block_text(value) -> bool:
    """Whether multi-line text of the value goes below "name =" (its kind says)."""
    from gacalc.values import kind_of

    kind = kind_of(value)
    return kind is None or kind.block_text


@dataclass
class Result(Positioned):
    """Common part of every result: where it came from and how to show it."""

    kind: str = field(init=False, default="result")
    span: Span | None = field(default=None, kw_only=True, repr=False)
    silent: bool = field(default=False, kw_only=True)
    unicode: bool = field(default=False, kw_only=True, repr=False)
    width: int = field(default=78, kw_only=True, repr=False)

    @property
    def statement_text(self) -> str:
        return " ".join(self.span.text.split()) if self.span is not None else ""

    @property
    def text(self) -> str:
        """The rendered result; a bug in a printer becomes one line naming the log file
        with its traceback (front-ends print results outside the session's guard)."""
        failed = self.__dict__.get("_failed_text")
        if failed is not None:           # reported once: reading the text again re-logs nothing
            return failed
        try:
            return self.render(self.unicode)
        except Exception as error:       # noqa: BLE001 - our bug, reported, not raised
            from gacalc.diagnostics import summary, write_internal_error

            where = self.span.location if self.span is not None else ""
            path = write_internal_error(error, self.statement_text, where)
            message = f"internal error while printing this result ({summary(error)})"
            message += f"; the traceback is in {path}" if path is not None else ""
            self.__dict__["_failed_text"] = message
            return message

    def render(self, unicode: bool = False) -> str:   # pragma: no cover - overridden
        raise NotImplementedError

    def __str__(self) -> str:
        return self.text


@dataclass
class ValueResult(Result):
    """The value of an expression or an assignment (``name`` is set for assignments)."""

    value: object = None
    name: str | None = None
    complete: bool = True
    formula: object = None     # a gacalc.formulas.Formula under 'formula auto', when found

    def __post_init__(self):
        self.kind = "value"

    def _body(self, unicode: bool, indent: int) -> str:
        from gacalc.printing.text import value_text

        if self.formula is not None:
            return self.formula.text(unicode)
        return value_text(self.value, unicode, self.width, indent=indent)

    def render(self, unicode: bool = False) -> str:
        from gacalc.printing.text import numeric_note

        if self.name is None:
            text = self._body(unicode, 0)
        else:
            head = f"{self.name} = "
            body = self._body(unicode, len(head))
            if "\n" in body and _block_text(self.value):
                text = f"{self.name} =\n{body}"
            else:
                text = head + body
        note = numeric_note(self.value, text, unicode)  # only for long exact values
        return text if note is None else f"{text}\n{note}"

    def _repr_latex_(self):
        from gacalc.export import latex_of

        return f"$\\displaystyle {latex_of(self.value)}$"


@dataclass
class FormulaResult(Result):
    """formula EXPR: ``formula`` (gacalc.formulas.Formula, proved equal to ``value``) or
    None with ``message`` saying why; then the text is that line and the components."""

    value: object = None
    formula: object = None
    message: str = ""

    def __post_init__(self):
        self.kind = "formula"

    @property
    def found(self) -> bool:
        return self.formula is not None

    def render(self, unicode: bool = False) -> str:
        from gacalc.printing.text import value_text

        if self.formula is not None:
            return self.formula.text(unicode)
        return f"note: {self.message}\n{value_text(self.value, unicode, self.width)}"


@dataclass
class CheckResult(Result):
    """outcome is 'holds', 'fails' or 'undecided'; ``difference`` is L - R simplified."""

    outcome: str = "undecided"
    difference: object = None
    conditions: list = field(default_factory=list)   # texts of the conditions it used
    complete: bool = True
    out_of_time: bool = False     # undecided because the time budget ran out
    reason: str = ""              # undecided otherwise: the limit the method reached
    witness: tuple | None = None  # (point text, L - R there) of a failure at a point
    rotation: bool = False     # check L == R as rotation: ``difference`` is then L R~
    note: str = ""             # the sign found (as rotation); a failure's sign-only line

    def __post_init__(self):
        self.kind = "check"

    @property
    def passed(self) -> bool:
        return self.outcome == "holds"

    def difference_text(self, unicode: bool = False) -> str:
        from gacalc.printing.text import value_text

        return value_text(self.difference, unicode, self.width - 8) \
            if self.difference is not None else ""

    def render(self, unicode: bool = False) -> str:
        statement = self.statement_text
        if self.rotation:
            return self._render_rotation(statement, unicode)
        if self.outcome == "holds":
            if self.conditions:
                return f"held given {', '.join(self.conditions)}: {statement}"
            return f"held: {statement}"
        if self.outcome == "fails":
            difference = self.difference_text(unicode).replace("\n", "\n      ")
            given = f" (given {', '.join(self.conditions)})" if self.conditions else ""
            note = "".join(f"\n  {line}" for line in self.note.splitlines())
            return (f"FAILED: {statement}{given}\n  L - R = {difference}"
                    + self._witness_line(unicode) + note)
        if self.out_of_time or not self.reason:
            return (f"undecided: {statement} (could not decide whether L - R is zero within "
                    "the time budget)")
        return f"undecided: {statement} (not decided: {self.reason})"

    def _witness_line(self, unicode: bool) -> str:
        if self.witness is None:
            return ""
        from gacalc.printing.text import unicode_text, value_text

        point, value = self.witness
        text = value_text(value, unicode, 10**6).replace("\n", " ")
        return f"\n  L - R = {text} at {unicode_text(point) if unicode else point}"

    def _render_rotation(self, statement: str, unicode: bool) -> str:
        """check L == R as rotation: the sign it found, or L R~ when that is not +-1."""
        if self.outcome == "holds":
            given = f" given {', '.join(self.conditions)}" if self.conditions else ""
            return f"held{given}: {statement} (the same rotation: {self.note})"
        if self.outcome == "fails":
            product = self.difference_text(unicode).replace("\n", "\n      ")
            given = f", given {', '.join(self.conditions)}" if self.conditions else ""
            return (f"FAILED: {statement} (L R~ is neither 1 nor -1{given}: different rotations)"
                    f"\n  L R~ = {product}")
        return f"undecided: {statement} (could not decide whether L R~ is 1 or -1)"


@dataclass
class NoteResult(Result):
    message: str = ""

    def __post_init__(self):
        self.kind = "note"

    def render(self, unicode: bool = False) -> str:
        return f"note: {self.message}"


@dataclass
class DeclarationResult(Result):
    """A declaration: the symbolic values it created and the conditions it implies."""

    declared_kind: str = ""
    values: dict = field(default_factory=dict)        # name -> Multivector
    conditions: list = field(default_factory=list)    # Condition

    def __post_init__(self):
        self.kind = "declaration"

    def render(self, unicode: bool = False) -> str:
        from gacalc.printing.text import value_text

        lines = []
        for name, value in self.values.items():
            text = value_text(value, unicode, 10**6)
            joint = "\n" if "\n" in text else " "     # a matrix's rows start below
            lines.append(f"{self.declared_kind} {name} ={joint}{text}")
        for text in dict.fromkeys(condition.text for condition in self.conditions):
            lines.append(f"  with {text}")   # a range's two ends share one text
        return "\n".join(lines)


@dataclass
class ShowResult(Result):
    """The derived-forms report of ``show`` (``report`` is gacalc.forms' object)."""

    report: object = None
    report_text: str = ""
    latex: bool = False

    def __post_init__(self):
        self.kind = "show"

    def render(self, unicode: bool = False) -> str:
        to_text = getattr(self.report, "to_text", None)
        if self.latex or not callable(to_text):
            return self.report_text
        return to_text(unicode=unicode)


@dataclass
class EmitResult(Result):
    target: str = ""
    code: str = ""
    path: str | None = None

    def __post_init__(self):
        self.kind = "emit"

    def render(self, unicode: bool = False) -> str:
        if self.path is not None:
            return f"wrote {self.target} to {self.path}"
        return self.code


@dataclass
class DrawResult(Result):
    """A picture (gacalc.pictures): ``scene`` its items, ``figure`` the matplotlib Figure,
    ``image`` the SVG or PNG bytes (``format``), ``path`` the file written or None."""

    scene: object = None
    figure: object = field(default=None, repr=False)
    image: bytes = field(default=b"", repr=False)
    format: str = "svg"
    path: str | None = None

    def __post_init__(self):
        self.kind = "draw"

    def render(self, unicode: bool = False) -> str:
        what = self.scene.summary() if self.scene is not None else "nothing"
        if self.path is not None:
            return f"drew {what} to {self.path}"
        return f"picture of {what}"

    def _repr_svg_(self):
        return self.image.decode("utf-8") if self.format == "svg" else None

    def _repr_png_(self):
        return self.image if self.format == "png" else None


@dataclass
class HelpResult(Result):
    help: str = ""

    def __post_init__(self):
        self.kind = "help"

    def render(self, unicode: bool = False) -> str:
        return self.help


@dataclass
class FileResult(Result):
    """A file read by ``use`` or written by ``save``."""

    action: str = ""          # 'used' or 'saved'
    path: str = ""
    count: int = 0

    def __post_init__(self):
        self.kind = "file"

    def render(self, unicode: bool = False) -> str:
        if self.action == "saved":
            return f"saved {self.count} statement{'s' if self.count != 1 else ''} to {self.path}"
        return f"used {self.path} ({self.count} statement{'s' if self.count != 1 else ''})"



"""Errors of the gacalc language, each tied to a place in the source text.

Every mistake a user can make ends as a :class:`GacalcError` (or a subclass):
a one-line message, the span of the offending text, and ``caret_text()`` which
renders ``file:line:col: message`` followed by the source line and carets.
"""

from __future__ import annotations

import bisect
import re

_LINE_BREAK = re.compile("\n")


class Source:
    """A piece of program text and the file it came from (None for typed input)."""

    def __init__(self, text: str, filename: str | None = None):
        self.text = text
        self.filename = filename
        # found by the regex engine: a long script is not walked character by character
        self._line_starts = [0] + [match.end() for match in _LINE_BREAK.finditer(text)]

    @property
    def display_name(self) -> str:
        return self.filename if self.filename is not None else "<input>"

    def line_column(self, offset: int) -> tuple[int, int]:
        """1-based line and column of a character offset."""
        offset = max(0, min(offset, len(self.text)))
        line_index = bisect.bisect_right(self._line_starts, offset) - 1
        return line_index + 1, offset - self._line_starts[line_index] + 1

    def line_text(self, line: int) -> str:
        start = self._line_starts[line - 1]
        end = self.text.find("\n", start)
        if end < 0:
            end = len(self.text)
        return self.text[start:end].rstrip("\r")

    def span(self, start: int, end: int) -> "Span":
        return Span(self, start, end)


class Span:
    """Half-open character range [start, end) in a Source.

    Immutable by convention; a plain class with slots rather than a frozen dataclass
    because the scanner makes one per token (a frozen dataclass costs four times as
    much to create).  Equality and hashing use (start, end), as before: the source is
    not compared."""

    __slots__ = ("source", "start", "end")

    def __init__(self, source: Source, start: int, end: int):
        self.source = source
        self.start = start
        self.end = end

    def __eq__(self, other):
        if other.__class__ is not Span:
            return NotImplemented
        return self.start == other.start and self.end == other.end

    def __hash__(self):
        return hash((self.start, self.end))

    def __repr__(self):
        return f"Span(start={self.start!r}, end={self.end!r})"

    @property
    def line(self) -> int:
        return self.source.line_column(self.start)[0]

    @property
    def column(self) -> int:
        return self.source.line_column(self.start)[1]

    @property
    def filename(self) -> str | None:
        return self.source.filename

    @property
    def location(self) -> str:
        """'file:line:column' (``<input>`` for typed text)."""
        line, column = self.source.line_column(self.start)
        return f"{self.source.display_name}:{line}:{column}"

    @property
    def text(self) -> str:
        return self.source.text[self.start:self.end]

    def to(self, other: "Span") -> "Span":
        """The span covering self and other."""
        return Span(self.source, min(self.start, other.start), max(self.end, other.end))


class Positioned:
    """filename, line and column of an object's ``span`` (None without one)."""

    span: Span | None

    @property
    def filename(self) -> str | None:
        return self.span.filename if self.span is not None else None

    @property
    def line(self) -> int | None:
        return self.span.line if self.span is not None else None

    @property
    def column(self) -> int | None:
        return self.span.column if self.span is not None else None


class GacalcError(Positioned, Exception):
    """A user mistake (or a refusal) with its place in the source."""

    kind = "error"

    def __init__(self, message: str, span: Span | None = None, hint: str | None = None):
        super().__init__(message)
        self.message = message
        self.span = span
        self.hint = hint

    # Position -----------------------------------------------------------------
    def with_span(self, span: Span | None) -> "GacalcError":
        """Attach a span when the error has none yet (errors raised deep inside)."""
        if self.span is None and span is not None:
            self.span = span
        return self

    # Rendering ------------------------------------------------------------------
    def full_message(self) -> str:
        return self.message if not self.hint else f"{self.message} ({self.hint})"

    def location_text(self) -> str:
        if self.span is None:
            return ""
        return self.span.location

    def __str__(self) -> str:
        where = self.location_text()
        return f"{where}: {self.full_message()}" if where else self.full_message()

    def caret_text(self) -> str:
        """'file:line:col: message', the source line, and carets under the span."""
        head = str(self)
        if self.span is None:
            return head
        source = self.span.source
        line_text = source.line_text(self.line)
        column = self.column
        end_line, end_column = source.line_column(self.span.end)
        width = (end_column - column) if end_line == self.line else len(line_text) - column + 1
        width = max(1, width)
        shown = line_text.replace("\t", " ")
        return f"{head}\n  {shown}\n  {' ' * (column - 1)}{'^' * width}"


class GacalcSyntaxError(GacalcError):
    kind = "syntax"


class GacalcNameError(GacalcError):
    kind = "name"


class GacalcTypeError(GacalcError):
    """Wrong kind of value: a grade where another is needed, wrong arity..."""

    kind = "type"


class GacalcMathError(GacalcError):
    """Not invertible, division by zero and other mathematical refusals."""

    kind = "math"


class GacalcLimitError(GacalcError):
    """An input or computation exceeds one of the language's limits."""

    kind = "limit"


class GacalcFileError(GacalcError):
    kind = "file"


class GacalcInterrupt(GacalcError):
    """The statement was abandoned by Ctrl-C / SIGINT; the session is unchanged."""

    kind = "interrupt"


class GacalcInternalError(GacalcError):
    """A bug in gacalc itself; ``traceback_text`` holds the Python traceback."""

    kind = "internal"

    def __init__(self, message: str, span: Span | None = None, traceback_text: str = ""):
        super().__init__(message, span)
        self.traceback_text = traceback_text

"""The script runner: runs gacalc text through a Session and prints what it gives.

Each result is printed as the Session renders it; checks are tallied (held, failed,
undecided); the first error of a file stops that file and is printed to stderr as
``file:line:column: message`` with the source line and a caret.  When any check ran,
a file's output ends with the line ``N passed, M failed`` (an undecided check counts
as not passed).  Exit status: 0 all checks held, 1 a check did not hold, 2 an error,
130 interrupted by Ctrl-C.

This module knows nothing of parsing or printing values: the Session does both.
"""

from __future__ import annotations

import os
import sys
from dataclasses import dataclass, field

EXIT_OK = 0
EXIT_CHECK_FAILED = 1
EXIT_ERROR = 2
EXIT_INTERRUPTED = 130   # the shell convention for a program stopped by SIGINT
ECHO_INDENT = "    "     # results under an echoed script line


# Terminal styling ----------------------------------------------------------------------
class Style:
    """ANSI colours for a terminal; every method is the identity when colour is off."""

    _CODES = {"held": "32", "failed": "31;1", "undecided": "33", "error": "31",
              "note": "36", "source": "2", "heading": "1"}

    def __init__(self, color: bool):
        self.color = color

    def paint(self, role: str, text: str) -> str:
        if not self.color or not text:
            return text
        return f"\x1b[{self._CODES[role]}m{text}\x1b[0m"

    def first_line(self, role: str, text: str) -> str:
        head, newline, rest = text.partition("\n")
        return self.paint(role, head) + newline + rest


def wants_color(stream, allowed: bool = True) -> bool:
    """Colour only for a terminal, never when NO_COLOR is set (no-color.org convention)."""
    if not allowed or os.environ.get("NO_COLOR"):
        return False
    if os.environ.get("TERM") == "dumb":
        return False
    isatty = getattr(stream, "isatty", None)
    return bool(isatty and isatty())


def stream_accepts_unicode(stream) -> bool:
    encoding = (getattr(stream, "encoding", None) or "").lower().replace("-", "")
    return encoding in ("utf8", "utf16", "utf32", "utf8sig")


# Internal errors ------------------------------------------------------------------------
def log_internal_error(error) -> str | None:
    """The log entry of an internal error: the path the session wrote it to, or (for an
    error that never went through a session) a new entry by gacalc.diagnostics, the one
    writer of the log.  The path or None when the log cannot be written."""
    if hasattr(error, "log_path"):
        return error.log_path
    from gacalc.diagnostics import write_internal_error

    statement = error.span.text if getattr(error, "span", None) is not None else ""
    path = write_internal_error(error, statement, error.location_text(),
                                getattr(error, "traceback_text", None))
    error.log_path = str(path) if path is not None else None
    return error.log_path


def error_text(error) -> str:
    """An error as printed: position, message, source line and caret (one line if none)."""
    text = error.caret_text()
    if getattr(error, "kind", "") == "internal":
        logged = log_internal_error(error)
        text += "\n  this is a bug in gacalc; the session is unchanged"
        if logged and logged not in error.message:     # the session's message names it
            text += f"; details were written to {logged}"
    return text


def styled_result(result, style: Style) -> str | None:
    """A Session result as printed, or None when its statement was silenced with ';'.
    A check always reports, even after ';': its outcome is its whole point."""
    if result.kind == "check":
        role = {"holds": "held", "fails": "failed"}.get(result.outcome, "undecided")
        return style.first_line(role, result.text)
    if result.silent:
        return None
    if result.kind == "note":
        return style.paint("note", result.text)
    return result.text


# Tallies -------------------------------------------------------------------------------
@dataclass
class Tally:
    passed: int = 0
    failed: int = 0
    undecided: int = 0
    out_of_time: int = 0        # the undecided ones whose time budget ran out
    errors: int = 0
    interrupted: bool = False
    files: int = 0

    @property
    def checks(self) -> int:
        return self.passed + self.failed + self.undecided

    def add(self, other: "Tally"):
        self.passed += other.passed
        self.failed += other.failed
        self.undecided += other.undecided
        self.out_of_time += other.out_of_time
        self.errors += other.errors
        self.interrupted = self.interrupted or other.interrupted
        self.files += other.files

    def summary_lines(self) -> list[str]:
        if not self.checks:
            return []
        lines = []
        if self.undecided:
            lines.append(f"({self.undecided_text()}, counted as failed)")
        lines.append(f"{self.passed} passed, {self.failed + self.undecided} failed")
        return lines

    def undecided_text(self) -> str:
        """'2 undecided' with how many of them ran out of time (the rest met a limit of
        the method, said on their own lines)."""
        if self.out_of_time == self.undecided:
            return f"{self.undecided} undecided within the time budget"
        if self.out_of_time:
            return f"{self.undecided} undecided, {self.out_of_time} of them within the time budget"
        return f"{self.undecided} undecided"

    def exit_status(self) -> int:
        if self.interrupted:
            return EXIT_INTERRUPTED
        if self.errors:
            return EXIT_ERROR
        if self.failed or self.undecided:
            return EXIT_CHECK_FAILED
        return EXIT_OK


# The runner ----------------------------------------------------------------------------
@dataclass
class RunOptions:
    unicode: bool = False
    color: bool = False
    echo: bool = False          # print the script's own lines before their results
    width: int = 78
    budget: float | None = None
    emit_dir: str | None = None  # every emit writes a file there instead of the screen
    statement_budget: float | None = None   # seconds per statement (None: the default)


@dataclass
class _Echo:
    """Prints the lines of the top-level script up to each statement as it runs."""

    text: str
    filename: str | None
    printed: int = 0                       # lines printed so far
    lines: list = field(default_factory=list)

    def __post_init__(self):
        self.lines = self.text.splitlines()

    def owns(self, span) -> bool:
        return (span is not None and span.source.filename == self.filename
                and span.source.text == self.text)

    def through(self, line: int) -> list[str]:
        chunk = self.lines[self.printed:line]
        self.printed = max(self.printed, line)
        return chunk


class ScriptRunner:
    """Runs script text or files, printing results to ``out`` and errors to ``err``."""

    def __init__(self, options: RunOptions | None = None, out=None, err=None):
        self.options = options or RunOptions()
        self.out = out if out is not None else sys.stdout
        self.err = err if err is not None else sys.stderr
        self.style = Style(self.options.color)

    def new_session(self):
        from gacalc.language import Session

        return Session(unicode=self.options.unicode, budget=self.options.budget,
                       emit_dir=self.options.emit_dir,
                       width=self.options.width,
                       statement_budget=self.options.statement_budget)

    # Output ---------------------------------------------------------------------------
    def _print(self, text: str = ""):
        print(text, file=self.out)

    def _print_error(self, text: str):
        self.out.flush()
        print(text, file=self.err)
        self.err.flush()

    def _print_result(self, result, tally: Tally, indent: str = ""):
        if result.kind == "check":
            if result.outcome == "holds":
                tally.passed += 1
            elif result.outcome == "fails":
                tally.failed += 1
            else:
                tally.undecided += 1
                tally.out_of_time += bool(getattr(result, "out_of_time", False)
                                          or not getattr(result, "reason", ""))
        text = styled_result(result, self.style)
        if text is None:
            return
        if indent:
            text = "\n".join(indent + line for line in text.split("\n"))
        self._print(text)

    # Running --------------------------------------------------------------------------
    def run_text(self, text: str, filename: str | None = None, session=None) -> Tally:
        """Run one script; prints its results and, when checks ran, its summary line."""
        from gacalc.language.errors import GacalcError

        session = session if session is not None else self.new_session()
        tally = Tally(files=1)
        echo = _Echo(text, filename) if self.options.echo else None
        try:
            for result in session.iter_run(text, filename):
                if isinstance(result, GacalcError):
                    if result.kind == "interrupt":
                        tally.interrupted = True
                    else:
                        tally.errors += 1
                    self._print_error(self.style.first_line("error", error_text(result)))
                    break
                if echo is not None and echo.owns(result.span):
                    end_line = result.span.source.line_column(result.span.end)[0]
                    for line in echo.through(end_line):
                        self._print(line)
                self._print_result(result, tally, indent=ECHO_INDENT if echo else "")
            else:
                if echo is not None:
                    for line in echo.through(len(echo.lines)):
                        self._print(line)
        except KeyboardInterrupt:
            # Ctrl-C between statements (while parsing): the session is untouched.
            tally.interrupted = True
            self._print_error("interrupted")
        if not tally.interrupted:
            for line in tally.summary_lines():
                self._print(line)
        self.out.flush()
        return tally

    def run_file(self, path: str) -> Tally:
        from gacalc.language.errors import GacalcFileError
        from gacalc.textfiles import read_script

        try:
            text = read_script(path)
        except (OSError, UnicodeDecodeError) as error:
            reason = getattr(error, "strerror", None) or str(error)
            self._print_error(self.style.first_line(
                "error", str(GacalcFileError(f"{path}: cannot read the script: {reason}"))))
            return Tally(errors=1, files=1)
        return self.run_text(text, path)

    def run_files(self, paths: list[str], headings: bool | None = None,
                  titles: dict | None = None, jobs: int = 1) -> Tally:
        """Each file in a fresh session; with several files, a heading for each (its
        title, default the path) and a closing line over all of them.  ``jobs`` > 1 runs
        the files in that many worker processes (gacalc.batch); the output is the same."""
        headings = len(paths) > 1 if headings is None else headings
        titles = titles or {}
        total = Tally()
        parallel = None
        if jobs > 1 and len(paths) > 1:
            from gacalc.batch import ParallelFiles

            parallel = ParallelFiles(paths, self.options, jobs)
            finished = iter(parallel)
        try:
            for index, path in enumerate(paths):
                if headings:
                    if index:
                        self._print()
                    self._print(self.style.paint("heading", f"== {titles.get(path, path)} =="))
                if parallel is None:
                    tally = self.run_file(path)
                else:
                    tally = self._replay_next(finished)
                total.add(tally)
                if tally.interrupted:
                    break
        except BaseException:
            if parallel is not None:       # Ctrl-C while printing, a closed pipe: stop all
                parallel.close(interrupted=True)
            raise
        if parallel is not None:
            parallel.close(interrupted=total.interrupted)
        if len(paths) > 1 and total.checks and not total.interrupted:
            self._print()
            self._print(f"all {total.files} files: {total.passed} passed, "
                        f"{total.failed + total.undecided} failed")
        return total

    def _replay_next(self, finished) -> Tally:
        """The next file's recorded output, printed; Ctrl-C while waiting stops the run."""
        from gacalc.batch import replay

        self.out.flush()            # the heading shows while the file is still running
        try:
            chunks, tally = next(finished)
        except KeyboardInterrupt:
            self._print_error("interrupted")
            return Tally(interrupted=True)
        replay(chunks, self.out, self.err)
        return tally

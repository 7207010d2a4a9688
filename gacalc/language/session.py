"""Sessions: run gacalc text statement by statement and return structured results.

    from gacalc.language import Session
    session = Session()
    for result in session.run("vector a, b\\ncheck a b == a . b + a /\\\\ b"):
        print(result.text)

``run`` returns a list of results: ValueResult, CheckResult, NoteResult,
DeclarationResult, ShowResult, EmitResult, HelpResult and, as the last item when a
statement fails, the GacalcError itself (message, span, filename, line, column,
``caret_text()``).  Running stops at the first error; statements before it have run.
A statement that fails (or is interrupted with Ctrl-C) leaves the session exactly as
it was: each statement runs on a copy of the state, committed when it succeeds.

The session knows nothing of terminals; the CLI and REPL format its results.  This
module holds the state and the run loop; the executor of each statement is in
gacalc.language.statements, those that read and write files in gacalc.language.files.
"""

from __future__ import annotations

import math
import os
import traceback
from typing import Iterator

from gacalc.algebra import AlgebraError
from gacalc.algebra.context import INSTALLED, AlgebraContext, install_latex
from gacalc.lazy import freeze_imported
import gacalc.simplify  # noqa: F401  (installs the simplifier the algebra calls)
from gacalc.textfiles import read_script

from . import syntax as S
from . import tokens as T
from .builtins import BUILTINS
from .errors import (GacalcError, GacalcFileError, GacalcInternalError, GacalcInterrupt,
                     GacalcLimitError, GacalcMathError, Source, Span)
from .evaluator import State
from .files import MAX_INPUT_CHARS, SAVE_HEADER, FileStatements, RunContext, os_reason
from .help import topic_entry
from .parser import iter_statements
from .results import (CheckResult, DeclarationResult, EmitResult, FileResult, FormulaResult,
                      HelpResult, NoteResult, Result, ShowResult, ValueResult)
from .scanner import needs_more_input
from .statements import MIN_SIMPLIFY_BUDGET, StatementExecutors
from .watchdog import StatementClock, StatementTimeout, statement_budget

__all__ = ["Session", "Result", "ValueResult", "CheckResult", "NoteResult",
           "DeclarationResult", "ShowResult", "EmitResult", "HelpResult", "FileResult", "FormulaResult",
           "MAX_INPUT_CHARS", "SAVE_HEADER", "MIN_SIMPLIFY_BUDGET"]


def _latex_display(value) -> str:
    # values a session hands out display as LaTeX in notebooks; the export API (and
    # sympy's printers) load on the first display, not at start-up
    from gacalc.export import latex_of

    return latex_of(value)


if INSTALLED.latex is None:
    install_latex(_latex_display)

DEFAULT_BUDGET = 10.0             # seconds for one simplification
DEFAULT_STATEMENT_BUDGET = 30.0   # seconds of wall-clock time for one statement
# The REPL's default is lower: a person is waiting at the prompt, and a script run
# unattended may take its time.  Both are set by --statement-budget.
REPL_STATEMENT_BUDGET = 10.0
# A session's generator registry is renewed (only the generators its values use kept)
# when it holds more than this many, or twice what the last renewal kept.
RENEW_REGISTRY_ABOVE = 64


# The session -------------------------------------------------------------------------
class Session(StatementExecutors, FileStatements):
    """Names, functions, declarations and conditions, and the statements that change them.

    Options: ``unicode`` (display mode of result texts), ``budget`` (seconds per
    simplification), ``width`` (line width of printed values), ``base_dir`` (where
    relative paths of typed input resolve; default: the current directory), ``emit_dir``
    (when set, every emit writes a file there: ``to "file"`` paths resolve under it, and an
    emit without ``to`` goes to NAME.tex / .py / .c), ``statement_budget`` (wall-clock
    seconds per statement, default 30; ``math.inf`` for none), ``formulas`` (print every
    result as a coordinate-free formula when one is found; ``formula auto`` / ``off``).

    A statement that runs out of its budget is abandoned with a GacalcLimitError; a
    simplification that runs out (of its own budget or of what the statement has left)
    gives the correct unsimplified value with a note."""

    def __init__(self, *, unicode: bool = False, budget: float | None = None,
                 width: int = 78, base_dir: str | None = None, emit_dir: str | None = None,
                 statement_budget: float | None = None, formulas: bool = False):
        self.unicode = unicode
        self.formulas = formulas      # 'formula auto': results print as formulas when found
        self.budget = DEFAULT_BUDGET if budget is None else budget
        self.statement_budget = (DEFAULT_STATEMENT_BUDGET if statement_budget is None
                                 else statement_budget)
        self.width = width
        self.base_dir = base_dir
        self.emit_dir = emit_dir
        self._state = State()
        self.algebra = AlgebraContext()   # this session's generators and caches
        self._working: State | None = None
        self._clock = StatementClock()
        self._pending_budget: float | None = None   # set by a budget statement that runs
        self._renew_above = RENEW_REGISTRY_ABOVE       # generators before a fresh registry
        self.current_span: Span | None = None   # statement being run (for interrupts)

    # Read-only views of the state ----------------------------------------------------
    @property
    def _view(self) -> State:
        return self._working if self._working is not None else self._state

    @property
    def values(self) -> dict:
        """name -> value of every assigned or declared name."""
        return dict(self._view.values)

    @property
    def functions(self) -> dict:
        """name -> UserFunction (name, params, body, text)."""
        return dict(self._view.functions)

    @property
    def declarations(self) -> dict:
        """name -> kind ('scalar', 'vector', 'bivector', 'rotor', 'multivector')."""
        return dict(self._view.declarations)

    @property
    def unit_names(self) -> set:
        return set(self._view.unit_names)

    @property
    def conditions(self) -> list:
        """Active side conditions (Condition: expr = 0, text, origin)."""
        return self._view.conditions()

    @property
    def ans(self):
        return self._view.ans

    def get(self, name: str):
        """The value of a name, or None."""
        return self._view.values.get(name)

    def completion_words(self) -> list[tuple[str, str]]:
        """(word, one-line description) for names, functions, kinds and keywords."""
        view = self._view
        words = []
        for name, value in sorted(view.values.items()):
            kind = view.declarations.get(name)
            words.append((name, f"declared {kind}" if kind else "value"))
        for name, function in sorted(view.functions.items()):
            words.append((name, f"function {name}({', '.join(function.params)})"))
        for name, builtin in sorted(BUILTINS.items()):
            words.append((name, builtin.help))
        for word in T.KEYWORDS + T.DECLARATION_KINDS:
            topic = topic_entry(word)
            words.append((word, topic[0] if topic else "keyword"))
        words.extend([("pi", "the constant pi"), ("I", "the pseudoscalar e123"),
                      ("ans", "the last result")])
        return words

    @staticmethod
    def needs_more_input(text: str) -> bool:
        """True while typed text has open brackets or ends with an operator."""
        return needs_more_input(text)

    def format(self, value, unicode: bool | None = None) -> str:
        from gacalc.printing.text import value_text

        return value_text(value, self.unicode if unicode is None else unicode, self.width)

    # Running ------------------------------------------------------------------------
    def run(self, text: str, filename: str | None = None) -> list:
        """Run statements; a list of results, ending with the GacalcError if one failed."""
        return list(self.iter_run(text, filename))

    run_statement = run

    def run_file(self, path: str) -> list:
        """Run a script file (relative ``use`` paths resolve next to it)."""
        try:
            text = read_script(path)
        except (OSError, UnicodeDecodeError) as error:
            return [GacalcFileError(f"cannot read {path}: {os_reason(error)}")]
        return self.run(text, filename=path)

    def iter_run(self, text: str, filename: str | None = None) -> Iterator:
        """Like run, but yields each statement's results as soon as it has run."""
        source = Source(text, filename)
        if len(text) > MAX_INPUT_CHARS:
            yield GacalcLimitError(f"input too long ({len(text)} characters; the limit is "
                                   f"{MAX_INPUT_CHARS})", Span(source, 0, 0))
            return
        base = os.path.dirname(os.path.abspath(filename)) if filename else \
            (self.base_dir or os.getcwd())
        stack = [os.path.abspath(filename)] if filename else []
        context = RunContext(base, stack)
        statements = iter_statements(source)
        done = 0          # where the last statement ended (for an interrupt while reading)
        while True:
            try:
                statement = next(statements)
            except StopIteration:
                return
            except GacalcError as error:
                yield error
                return
            except RecursionError:
                yield GacalcLimitError("input nested too deeply", _next_span(source, done))
                return
            except KeyboardInterrupt:
                yield GacalcInterrupt("interrupted while reading the next statement; "
                                      "the statements before it have run",
                                      _next_span(source, done))
                return
            except Exception as error:   # a bug in the scanner or parser
                yield _internal_error(error, _next_span(source, done))
                return
            results = self._run_one(statement, context)
            freeze_imported()
            done = statement.span.end
            yield from results
            if results and isinstance(results[-1], GacalcError):
                return

    def _seconds(self) -> float | None:
        seconds = self.statement_budget if self._pending_budget is None else \
            self._pending_budget
        if seconds is None or seconds <= 0 or math.isinf(seconds):
            return None
        return float(seconds)

    def _run_one(self, statement: S.Statement, context: RunContext) -> list:
        scratch = self._state.copy()
        self._working = scratch
        self.current_span = statement.span
        results: list = []
        self._pending_budget = None
        try:
            with statement_budget(self._clock, self._seconds()), self.algebra.active():
                self._execute(statement, scratch, results, context)
        except GacalcError as error:
            return _with_span(results, error, statement.span)
        except AlgebraError as error:
            # e.g. inconsistent side conditions, found while simplifying
            return [GacalcMathError(_short(error), statement.span)]
        except KeyboardInterrupt:
            return [GacalcInterrupt("interrupted: the statement was abandoned and the "
                                    "session is unchanged", statement.span)]
        except StatementTimeout:
            return [GacalcLimitError(
                f"the statement ran out of its time budget ({self._seconds():g} s) and was "
                "abandoned; the session is unchanged", statement.span,
                hint="a simpler form, fewer symbols, or a larger budget: budget SECONDS")]
        except RecursionError:
            return [GacalcLimitError("expression too deeply nested to evaluate",
                                     statement.span)]
        except MemoryError:
            return [GacalcLimitError("out of memory: the result is too large",
                                     statement.span)]
        except Exception as error:   # a bug in gacalc: report it, keep the session
            return [_internal_error(error, statement.span)]
        finally:
            self._working = None
            self.current_span = None
            pending, self._pending_budget = self._pending_budget, None
        self._state = scratch           # one assignment: the commit is atomic
        if pending is not None:
            self.statement_budget = pending
        if len(self.algebra.registry) > self._renew_above:
            self._renew_algebra()
        return results

    def _renew_algebra(self):
        """Start a fresh generator registry holding only what the session's values use,
        so that symbols declared and dropped long ago cost nothing (gacalc.algebra.compaction).
        The next renewal waits until the registry has doubled again: the work stays in
        proportion to the growth."""
        from gacalc.algebra.compaction import renewed

        try:
            self.algebra = renewed(self.algebra, (self._state,))
        except KeyboardInterrupt:
            pass       # values are unchanged either way; renew after a later statement
        self._renew_above = max(RENEW_REGISTRY_ABOVE, 2 * len(self.algebra.registry))

    # Statements ---------------------------------------------------------------------
    def _execute(self, statement: S.Statement, state: State, results: list,
                 context: RunContext):
        handler = getattr(self, "_do_" + type(statement).__name__)
        handler(statement, state, results, context)

# Helpers ------------------------------------------------------------------------------
def _with_span(results: list, error: GacalcError, span: Span) -> list:
    error.with_span(span)
    return [error]


def _internal_error(error: Exception, span: Span | None) -> GacalcInternalError:
    """A bug in gacalc: the traceback goes to the state-directory log, the user gets one
    line naming it (``log_path`` holds the path, None when it could not be written)."""
    from gacalc.diagnostics import summary, write_internal_error

    tb_text = traceback.format_exc()
    where = statement = ""
    if span is not None:
        where, statement = span.location, span.text
    path = write_internal_error(error, statement, where, tb_text)
    message = f"internal error ({summary(error)})"
    if path is not None:
        message += f"; the traceback is in {path}"
    internal = GacalcInternalError(message, span, tb_text)
    internal.log_path = str(path) if path is not None else None
    return internal


def _next_span(source: Source, offset: int) -> Span:
    """Where the statement after ``offset`` begins (separators skipped)."""
    text = source.text
    while offset < len(text) and text[offset] in " \t\r\n;":
        offset += 1
    return Span(source, offset, min(offset + 1, len(text)))


def _short(error: Exception) -> str:
    text = str(error).strip().splitlines()
    return text[0][:160] if text else "no message"



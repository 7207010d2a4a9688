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

The session knows nothing of terminals; the CLI and REPL format its results.
"""

from __future__ import annotations

import math
import os
import traceback
from typing import Iterator

from gacalc.algebra import AlgebraError
from gacalc.algebra.context import AlgebraContext
import gacalc.simplify  # noqa: F401  (installs the simplifier the algebra calls)

from . import syntax as S
from .builtins import BUILTINS, HELP_TOPICS, help_text
from .errors import (GacalcError, GacalcFileError, GacalcInternalError, GacalcInterrupt,
                     GacalcLimitError, GacalcMathError, GacalcNameError, GacalcTypeError,
                     Source, Span)
from .evaluator import (Condition, Evaluator, State, UserFunction, is_matrix, is_multivector,
                        is_quaternion, relevant_conditions)
from .parser import iter_statements
from .results import (CheckResult, DeclarationResult, EmitResult, FileResult, HelpResult,
                      NoteResult, Result, ShowResult, ValueResult)
from .scanner import needs_more_input
from . import limits
from . import tokens as T
from .watchdog import StatementClock, StatementTimeout, restart, statement_budget

__all__ = ["Session", "Result", "ValueResult", "CheckResult", "NoteResult",
           "DeclarationResult", "ShowResult", "EmitResult", "HelpResult", "FileResult"]

MAX_INPUT_CHARS = 2_000_000
SAVE_HEADER = "# gacalc session"
DEFAULT_BUDGET = 10.0             # seconds for one simplification
DEFAULT_STATEMENT_BUDGET = 30.0   # seconds of wall-clock time for one statement
MIN_SIMPLIFY_BUDGET = 0.05        # below this a simplification is not worth starting


# The session -------------------------------------------------------------------------
class _RunContext:
    """Per-run bookkeeping: which files are being read (for relative paths and cycles)."""

    def __init__(self, base_dir: str, stack: list[str]):
        self.base_dir = base_dir
        self.stack = stack


class Session:
    """Names, functions, declarations and conditions, and the statements that change them.

    Options: ``unicode`` (display mode of result texts), ``budget`` (seconds per
    simplification), ``width`` (line width of printed values), ``base_dir`` (where
    relative paths of typed input resolve; default: the current directory), ``emit_dir``
    (when set, every emit writes a file there: ``to "file"`` paths resolve under it, and an
    emit without ``to`` goes to NAME.tex / .py / .c), ``statement_budget`` (wall-clock
    seconds per statement, default 30; ``math.inf`` for none).

    A statement that runs out of its budget is abandoned with a GacalcLimitError; a
    simplification that runs out (of its own budget or of what the statement has left)
    gives the correct unsimplified value with a note."""

    def __init__(self, *, unicode: bool = False, budget: float | None = None,
                 width: int = 78, base_dir: str | None = None, emit_dir: str | None = None,
                 statement_budget: float | None = None):
        self.unicode = unicode
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
            topic = HELP_TOPICS.get(word)
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
            with open(path, encoding="utf-8-sig") as handle:   # a BOM is not text
                text = handle.read()
        except (OSError, UnicodeDecodeError) as error:
            return [GacalcFileError(f"cannot read {path}: {_os_reason(error)}")]
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
        context = _RunContext(base, stack)
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
            done = statement.span.end
            yield from results
            if results and isinstance(results[-1], GacalcError):
                return

    def _seconds(self) -> float | None:
        seconds = self.statement_budget
        if seconds is None or seconds <= 0 or math.isinf(seconds):
            return None
        return float(seconds)

    def _run_one(self, statement: S.Statement, context: _RunContext) -> list:
        scratch = self._state.copy()
        self._working = scratch
        self.current_span = statement.span
        results: list = []
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
                hint="a simpler form, fewer symbols, or a larger statement budget")]
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
        self._state = scratch           # one assignment: the commit is atomic
        return results

    # Statements ---------------------------------------------------------------------
    def _execute(self, statement: S.Statement, state: State, results: list,
                 context: _RunContext):
        handler = getattr(self, "_do_" + type(statement).__name__)
        handler(statement, state, results, context)

    def _result(self, cls, statement, **fields):
        return cls(span=statement.span, silent=statement.silent, unicode=self.unicode,
                   width=self.width, **fields)

    def _flush_notes(self, evaluator: Evaluator, results: list, statement):
        for text, span in evaluator.notes:
            results.append(NoteResult(message=text, span=span or statement.span,
                                      unicode=self.unicode, width=self.width))
        evaluator.notes.clear()

    def _log(self, state: State, statement: S.Statement):
        text = statement.span.text.strip()
        state.log.append(text if text.endswith(";") else text + ";")

    def _evaluate(self, node, state: State, results: list, statement, extra=None):
        evaluator = Evaluator(state, extra, self._clock)
        try:
            value = evaluator.evaluate(node)
        finally:
            self._flush_notes(evaluator, results, statement)
        return value

    def _simplified(self, value, state: State, extra: list | None = None):
        """(value, complete, conditions used) through gacalc.simplify."""
        if not is_multivector(value):
            return value, True, []
        from gacalc.simplify import simplify

        conditions = relevant_conditions(state.conditions() + list(extra or ()), value)
        outcome = simplify(value, [c.expr for c in conditions], self._simplify_budget())
        return outcome.value, outcome.complete, conditions

    def _simplify_budget(self):
        """The simplifier's budget: its own, but never past the statement's deadline
        (simplify arms its own SIGALRM alarm; the statement's deadline uses another
        signal, see gacalc.language.watchdog)."""
        from gacalc.simplify import Budget

        seconds = float(self.budget)
        remaining = self._clock.remaining()
        if remaining is not None:
            seconds = min(seconds, max(remaining - MIN_SIMPLIFY_BUDGET, 0.0))
        return Budget(seconds)

    def _do_ExpressionStatement(self, statement, state, results, context):
        value = self._evaluate(statement.expr, state, results, statement)
        value, complete, _ = self._simplified(value, state)
        state.ans = value
        self._log(state, statement)
        if not complete:
            results.append(self._note(statement, "simplification ran out of time: the value "
                                      "is correct but not fully simplified"))
        results.append(self._result(ValueResult, statement, value=value, complete=complete))

    def _note(self, statement, message):
        return NoteResult(message=message, span=statement.span, unicode=self.unicode,
                          width=self.width)

    def _do_Assign(self, statement, state, results, context):
        value = self._evaluate(statement.expr, state, results, statement)
        value, complete, _ = self._simplified(value, state)
        name = statement.name
        state.functions.pop(name, None)
        state.declarations.pop(name, None)
        state.unit_names.discard(name)
        state.values[name] = value
        state.ans = value
        self._log(state, statement)
        if not complete:
            results.append(self._note(statement, "simplification ran out of time: the value "
                                      "is correct but not fully simplified"))
        results.append(self._result(ValueResult, statement, value=value, name=name,
                                    complete=complete))

    def _do_FunctionDef(self, statement, state, results, context):
        name = statement.name
        params = [param.name for param in statement.params]
        for call in _calls(statement.body):
            if call.name == name and call.name not in params:
                raise GacalcTypeError(f"{name} calls itself: without conditionals the "
                                      "recursion would never end", call.name_span)
        state.values.pop(name, None)
        state.declarations.pop(name, None)
        state.unit_names.discard(name)
        state.functions[name] = UserFunction(name, params, statement.body,
                                             " ".join(statement.span.text.split()))
        self._log(state, statement)
        if not statement.silent:
            results.append(self._note(statement, f"defined {name}({', '.join(params)})"))

    def _do_Declare(self, statement, state, results, context):
        from gacalc.algebra import symbolic

        kind = statement.kind
        if statement.unit and kind not in ("vector", "bivector", "rotor"):
            raise GacalcTypeError(f"'unit' applies to vectors, bivectors and rotors, not to a "
                                  f"{kind}", statement.span)
        created, all_conditions = {}, []
        for param in statement.names:
            name = param.name
            value, exprs = symbolic(kind, name, unit=statement.unit)
            components = sorted(str(s) for s in value.free_symbols) if kind != "scalar" else []
            for component in components:
                clash = _reserved_kind(component)
                if clash:
                    raise GacalcNameError(f"{kind} {name} would have a component {component}, "
                                          f"which is {clash}; choose another name", param.span)
            text = _unit_text(kind, name) if exprs else None
            conditions = [Condition(expr, text, "declaration") for expr in exprs]
            state.values[name] = value
            state.functions.pop(name, None)
            state.declarations[name] = kind
            if statement.unit or exprs:
                state.unit_names.add(name)
            else:
                state.unit_names.discard(name)
            state.facts[name] = conditions
            state.known_symbols.update(components or [name])
            created[name] = value
            all_conditions.extend(conditions)
        self._log(state, statement)
        results.append(self._result(DeclarationResult, statement, declared_kind=kind,
                                    values=created, conditions=all_conditions))

    def _conditions(self, nodes, state, results, statement, origin) -> list[Condition]:
        out = []
        for node in nodes:
            evaluator = Evaluator(state, None, self._clock)
            try:
                left = evaluator.evaluate(node.left)
                right = evaluator.evaluate(node.right)
                if not (is_multivector(left) and is_multivector(right)):
                    raise GacalcTypeError("a condition is an equation between multivectors "
                                          "(usually scalars)", node.span)
                difference = left - right
            finally:
                self._flush_notes(evaluator, results, statement)
            text = " ".join(node.span.text.split())
            exprs = [expr for _, expr in difference.items()]
            if not exprs:
                results.append(self._note(statement, f"the condition {text} always holds"))
                continue
            for expr in exprs:
                if expr.is_number:
                    raise GacalcMathError(f"the condition {text} can never hold", node.span)
                out.append(Condition(expr, text, origin))
        return out

    def _do_Check(self, statement, state, results, context):
        from gacalc.simplify import is_zero

        given = self._conditions(statement.given, state, results, statement, "given")
        left = self._evaluate(statement.left, state, results, statement, given)
        right = self._evaluate(statement.right, state, results, statement, given)
        differences = _differences(left, right, statement)
        conditions = relevant_conditions(state.conditions() + given, differences)
        exprs = [c.expr for c in conditions]
        verdicts = [is_zero(d, (), self._simplify_budget()) for d in differences]
        used: list[Condition] = []
        if not all(v is True for v in verdicts) and exprs:
            verdicts = [is_zero(d, exprs, self._simplify_budget()) for d in differences]
            used = conditions
        if all(v is True for v in verdicts):
            outcome = "holds"
        elif any(v is False for v in verdicts):
            outcome = "fails"
        else:
            outcome = "undecided"
        difference, complete = None, True
        if outcome != "holds":
            simplified = [self._simplified(d, state, given) for d in differences]
            complete = all(s[1] for s in simplified)
            difference = _reassemble(left, right, [s[0] for s in simplified])
        texts = _unique(c.text for c in used)
        results.append(self._result(CheckResult, statement, outcome=outcome,
                                    difference=difference, conditions=texts,
                                    complete=complete))

    def _do_Assume(self, statement, state, results, context):
        if statement.clear:
            state.assumptions = []
            self._log(state, statement)
            results.append(self._note(statement, "no assumptions are active now"))
            return
        if not statement.conditions:
            active = state.conditions()
            if not active:
                message = "no conditions are active"
            else:
                message = "active conditions: " + "; ".join(_unique(c.text for c in active))
            results.append(self._note(statement, message))
            return
        new = self._conditions(statement.conditions, state, results, statement, "assume")
        state.assumptions = state.assumptions + new
        _check_consistent(state.conditions(), new)
        self._log(state, statement)
        if not statement.silent:
            results.append(self._note(statement, "assuming " + "; ".join(
                _unique(c.text for c in new))))

    def _do_Show(self, statement, state, results, context):
        value = self._evaluate(statement.expr, state, results, statement)
        value, _, _ = self._simplified(value, state)
        against = None
        if statement.against is not None:
            against = self._evaluate(statement.against, state, results, statement)
        try:
            from gacalc.forms import build_report
        except ImportError:
            raise GacalcError("show is not available yet (gacalc.forms is missing)",
                              statement.span) from None
        values = [v for v in (value, against) if is_multivector(v)]
        for shown in values:       # the report multiplies the value with itself (norms...)
            limits.check_chain([shown, shown, shown], statement.span, "the report of show")
        conditions = [c.expr for c in relevant_conditions(state.conditions(), values)]
        report = build_report(value, session=self, against=against, conditions=conditions)
        if statement.latex:
            text = _report_text(report, "latex")
        else:
            text = _report_text(report, "unicode" if self.unicode else "text")
        results.append(self._result(ShowResult, statement, report=report, report_text=text,
                                    latex=statement.latex))

    def _do_Emit(self, statement, state, results, context):
        value = self._evaluate(statement.expr, state, results, statement)
        value, _, _ = self._simplified(value, state)
        try:
            from gacalc import export
        except ImportError:
            raise GacalcError("emit is not available yet (gacalc.export is missing)",
                              statement.span) from None
        name = statement.as_name
        if name is None and isinstance(statement.expr, S.Name):
            name = statement.expr.name
        declared = dict(state.declarations)
        try:
            code = export.emit(statement.target, value, name=name, declared=declared,
                               options={})
        except export.ExportError as error:
            raise GacalcError(f"emit {statement.target}: {error}", statement.span) from None
        path = None
        if self.emit_dir is not None:
            relative = statement.path or f"{name or 'gacalc_value'}{_EMIT_SUFFIX[statement.target]}"
            path = os.path.abspath(os.path.join(self.emit_dir, os.path.expanduser(relative)))
        elif statement.path is not None:
            path = _resolve(statement.path, statement, context)
        if path is not None:
            try:
                export.write_atomically(path, code if code.endswith("\n") else code + "\n")
            except export.ExportError as error:
                raise GacalcFileError(str(error), statement.path_span or statement.span) from None
            except OSError as error:
                raise GacalcFileError(f"cannot write {path}: {_os_reason(error)}",
                                      statement.path_span) from None
        results.append(self._result(EmitResult, statement, target=statement.target,
                                    code=code, path=path))

    def _do_Use(self, statement, state, results, context):
        path = _resolve(statement.path, statement, context)
        if path in context.stack:
            raise GacalcFileError(f"use of {path} would read it again while it is being read "
                                  "(a cycle)", statement.path_span)
        try:
            with open(path, encoding="utf-8-sig") as handle:   # a BOM is not text
                text = handle.read()
        except (OSError, UnicodeDecodeError) as error:
            raise GacalcFileError(f"cannot read {path}: {_os_reason(error)}",
                                  statement.path_span) from None
        if len(text) > MAX_INPUT_CHARS:
            raise GacalcLimitError(f"{path} is too long ({len(text)} characters)",
                                   statement.path_span)
        inner = _RunContext(os.path.dirname(path), context.stack + [path])
        count = 0
        for inner_statement in iter_statements(Source(text, path)):
            restart(self._clock)       # each statement of the file has its own budget
            self._execute(inner_statement, state, results, inner)
            count += 1
        results.append(self._result(FileResult, statement, action="used", path=path,
                                    count=count))

    def _do_Save(self, statement, state, results, context):
        path = _resolve(statement.path, statement, context)
        if os.path.exists(path) and not statement.force:
            if os.path.isdir(path):
                raise GacalcFileError(f"{path} is a directory", statement.path_span)
            if not _is_saved_session(path):
                raise GacalcFileError(
                    f"{path} exists and is not a saved gacalc session; write save "
                    f"\"{statement.path}\" force to overwrite it", statement.path_span)
        lines = [f"{SAVE_HEADER}: re-creates the names, functions, declarations and "
                 "conditions", *state.log]
        try:
            _write_atomically(path, "\n".join(lines) + "\n")
        except OSError as error:     # the message already names the path and the reason
            raise GacalcFileError(str(error), statement.path_span) from None
        results.append(self._result(FileResult, statement, action="saved", path=path,
                                    count=len(state.log)))

    def _do_Help(self, statement, state, results, context):
        text = help_text(statement.topic, state.functions)
        if text is None:
            raise GacalcNameError(f"no help on {statement.topic!r}",
                                  statement.span, hint="help lists the topics")
        results.append(self._result(HelpResult, statement, help=text))


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
        where = f"{span.source.display_name}:{span.line}:{span.column}"
        statement = span.text
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


def _os_reason(error: Exception) -> str:
    return getattr(error, "strerror", None) or _short(error)


def _reserved_kind(name: str) -> str | None:
    import re

    if re.fullmatch(r"e[0-9]+", name):
        return "a basis blade name"
    if name in BUILTINS:
        return "a built-in function"
    if name in T.KEYWORDS or name in T.CONSTANTS or name == "ans":
        return "a reserved name"
    return None


def _unit_text(kind: str, name: str) -> str:
    return {"vector": f"{name} is a unit vector", "bivector": f"{name} is a unit bivector",
            "rotor": f"{name} is a unit rotor"}.get(kind, f"{name} has norm 1")


def _calls(node):
    """Every Call node in an expression tree (iteratively: trees may be wide)."""
    pending = [node]
    while pending:
        current = pending.pop()
        if isinstance(current, S.Call):
            yield current
        for value in vars(current).values():
            if isinstance(value, S.Node):
                pending.append(value)
            elif isinstance(value, list):
                pending.extend(item for item in value if isinstance(item, S.Node))


def _check_consistent(active: list, new: list):
    """Refuse new assumptions that contradict the active conditions they touch
    (the Gröbner basis of the set is {1}); AlgebraError says why."""
    if not new:
        return
    try:
        from gacalc.simplify.conditions import ConditionSet
    except ImportError:
        return
    from gacalc.algebra import Multivector

    probe = Multivector.scalar(sum(condition.expr for condition in new))
    connected = relevant_conditions(active, [probe])
    ConditionSet.of(tuple(condition.expr for condition in connected))


def _differences(left, right, statement) -> list:
    """L - R as a list of multivectors (one per matrix entry for matrices)."""
    from gacalc.algebra import Multivector

    if is_multivector(left) and is_multivector(right):
        return [left - right]
    if is_matrix(left) and is_matrix(right) and left.shape == right.shape:
        return [Multivector.scalar(x) if not x.has(_imaginary()) else _complex_mv(x)
                for x in (left - right)]
    if is_quaternion(left) and is_quaternion(right):
        d = left - right
        return [Multivector.scalar(part) for part in (d.a, d.b, d.c, d.d)]
    from gacalc.printing.text import describe_value

    raise GacalcTypeError(f"cannot compare {describe_value(left)} with "
                          f"{describe_value(right)}", statement.span)


def _imaginary():
    import sympy

    return sympy.I


def _complex_mv(x):
    """A complex scalar a + b i as the central multivector a + b I (Pauli picture)."""
    import sympy

    from gacalc.algebra import Multivector

    real, imaginary = sympy.re(x), sympy.im(x)
    return Multivector({0: real, 7: imaginary})


def _reassemble(left, right, differences):
    """The difference in the shape of the compared values."""
    import sympy

    if is_multivector(left):
        return differences[0]
    if is_matrix(left):
        entries = [d.scalar_part() + sympy.I * d["e123"] for d in differences]
        return sympy.Matrix(left.rows, left.cols, entries)
    from sympy.algebras.quaternion import Quaternion

    return Quaternion(*[d.scalar_part() for d in differences])


def _unique(texts) -> list:
    seen, out = set(), []
    for text in texts:
        if text not in seen:
            seen.add(text)
            out.append(text)
    return out


def _report_text(report, mode: str) -> str:
    """Text of a forms report in a mode, whatever methods the report object offers."""
    for method in (f"to_{mode}", mode, "render"):
        function = getattr(report, method, None)
        if callable(function):
            try:
                return function() if method != "render" else function(mode)
            except TypeError:
                continue
    return str(report)


_EMIT_SUFFIX = {"latex": ".tex", "python": ".py", "numpy": ".py", "c": ".c"}


def _resolve(path: str, statement: S.Statement, context: _RunContext) -> str:
    expanded = os.path.expanduser(path)
    if not os.path.isabs(expanded):
        expanded = os.path.join(context.base_dir, expanded)
    return os.path.abspath(expanded)


def _is_saved_session(path: str) -> bool:
    try:
        with open(path, encoding="utf-8-sig") as handle:
            return handle.readline().startswith(SAVE_HEADER)
    except (OSError, UnicodeDecodeError):
        return False


def _write_atomically(path: str, text: str):
    """Write through a temporary file in the same directory and os.replace (gacalc.export's
    writer: a reader sees the old file or all of the new one, and an existing file keeps
    its permissions).  Raises OSError."""
    from gacalc.export import ExportError, write_atomically

    try:
        write_atomically(path, text)
    except ExportError as error:        # "cannot write PATH: REASON"
        raise OSError(str(error)) from None

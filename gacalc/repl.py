"""The interactive calculator on prompt_toolkit: a thin layer over a Session.

- history kept across sessions in the user's data directory (one entry per input);
- completion of names, functions, kinds and keywords with their one-line help;
- highlighting by the lexer generated from the language's token table;
- Enter runs the input unless brackets are still open or the line ends with an
  operator (then it starts a new line; Esc Enter always starts one);
- a bottom toolbar with the declared names, the output mode, whether results print as
  formulas (F3 switches, like the statements formula auto / formula off) and active
  assumptions;
- Ctrl-C while a statement runs abandons it and keeps every name (the statement runs
  in the main thread; the Session discards its partial state); Ctrl-C at the prompt
  clears the line; Ctrl-D leaves.

Only this module imports prompt_toolkit and pygments, and only when the REPL starts.
"""

from __future__ import annotations

import re
import sys

from gacalc import __version__
from gacalc.language import syntax as S
from gacalc.runner import Style, error_text, styled_result

PROMPT = "cl3: "   # our own; no well-known program answers with it
CONTINUATION = "...: "
WELCOME = (f"gacalc {__version__}: geometric algebra of 3-D space, Cl(3,0). "
           "Type help for the language, Ctrl-D to leave.")
_WORD_BEFORE_CURSOR = re.compile(r"[^\W\d_]\w*\Z")
_QUIT_WORDS = ("quit", "exit")


# Completion ---------------------------------------------------------------------------
def completion_candidates(session, prefix: str) -> list[tuple[str, str]]:
    """(word, meta) of every completion word starting with ``prefix``; each word once."""
    seen = set()
    out = []
    for word, meta in session.completion_words():
        if word.startswith(prefix) and word not in seen:
            seen.add(word)
            out.append((word, meta))
    return out


def _make_completer(session):
    from prompt_toolkit.completion import Completer, Completion

    class GacalcCompleter(Completer):
        """Names the session knows, built-in functions, kinds and statement keywords."""

        def get_completions(self, document, complete_event):
            match = _WORD_BEFORE_CURSOR.search(document.text_before_cursor)
            if match is None:
                return
            prefix = match.group()
            for word, meta in completion_candidates(session, prefix):
                if word != prefix:
                    yield Completion(word, start_position=-len(prefix), display_meta=meta)

    return GacalcCompleter()


# Toolbar ------------------------------------------------------------------------------
def toolbar_text(session, width: int = 100) -> str:
    """One line: declared names by kind, other names, output mode, active assumptions."""
    by_kind: dict[str, list[str]] = {}
    for name, kind in session.declarations.items():
        by_kind.setdefault(kind, []).append(name)
    parts = [f"{kind}: {' '.join(sorted(names))}" for kind, names in sorted(by_kind.items())]
    others = sorted(name for name in session.values if name not in session.declarations)
    if others:
        parts.append("values: " + " ".join(others))
    functions = sorted(session.functions)
    if functions:
        parts.append("functions: " + " ".join(f"{name}()" for name in functions))
    assumed = [c.text for c in session.conditions if getattr(c, "origin", "") == "assume"]
    names = " | ".join(parts) if parts else "no names yet"
    mode = "unicode" if session.unicode else "ascii"
    shown = "formulas" if getattr(session, "formulas", False) else "components"
    tail = f"  [{mode}, F2 switches | {shown}, F3 switches]"
    if assumed:
        tail = f"  assuming {'; '.join(dict.fromkeys(assumed))}" + tail
    text = f" {names}{tail}"
    if len(text) > width:
        text = text[:max(0, width - 1)] + "…"
    return text


# How an input was read -------------------------------------------------------------------
def _explicitly_grouped(node) -> bool:
    """True when the node's text is wrapped in parentheses in the source."""
    text = node.span.source.text
    return text[:node.span.start].rstrip().endswith("(") and \
        text[node.span.end:].lstrip().startswith(")")


def _surprising(node) -> bool:
    """A reading that can surprise: a wedge-family chain inside a product without
    parentheses (``a . b c`` is (a . b) c), or a division followed by more factors
    (``a / b c`` is a b^-1 c)."""
    for current in S.walk(node):
        if isinstance(current, S.Product):
            if any(isinstance(f, S.Wedge) and not _explicitly_grouped(f)
                   for f in current.factors):
                return True
            if "/" in current.ops[:-1]:
                return True
    return False


def reading_of(text: str, unicode: bool) -> str | None:
    """The fully parenthesised reading of a one-statement input, when it could surprise."""
    from gacalc.language.errors import GacalcError
    from gacalc.language.parser import parse

    try:
        statements = parse(text)
    except (GacalcError, RecursionError):
        return None
    if len(statements) != 1:
        return None
    statement = statements[0]
    expr = getattr(statement, "expr", None)
    if not isinstance(statement, (S.ExpressionStatement, S.Assign)) or expr is None:
        return None
    if not _surprising(expr):
        return None
    return S.unparse(expr, unicode=unicode, parenthesize=True)


# The loop --------------------------------------------------------------------------------
class Repl:
    """Reads inputs, runs them in one Session, prints results to ``out``."""

    def __init__(self, session=None, *, unicode: bool = True, color: bool = True,
                 budget: float | None = None, out=None, history=None, input=None,
                 output=None, statement_budget: float | None = None):
        if session is None:
            from gacalc.language import Session
            from gacalc.language.session import REPL_STATEMENT_BUDGET

            session = Session(unicode=unicode, budget=budget, statement_budget=(
                REPL_STATEMENT_BUDGET if statement_budget is None else statement_budget))
        self.session = session
        self.color = color
        self.style = Style(color)
        self.out = out if out is not None else sys.stdout
        self._history = history
        self._input = input
        self._output = output
        self._prompt_session = None

    # Output ----------------------------------------------------------------------------
    def _print(self, text: str = ""):
        print(text, file=self.out)
        self.out.flush()

    def show_error(self, error):
        """Typed input: the message, then the line and the caret (no '<input>' prefix)."""
        if getattr(error, "kind", "") == "interrupt":
            self._print(self.style.paint("error", error.full_message()))
            return
        if error.span is not None and error.span.filename is None and \
                getattr(error, "kind", "") != "internal":
            lines = error.caret_text().split("\n")
            line = error.line
            where = f" (line {line})" if "\n" in error.span.source.text.strip() else ""
            self._print(self.style.paint("error", f"error{where}: {error.full_message()}"))
            for extra in lines[1:]:
                self._print(extra)
            return
        self._print(self.style.first_line("error", error_text(error)))

    def show_result(self, result):
        text = styled_result(result, self.style)
        if text is not None:
            self._print(text)

    # One input ---------------------------------------------------------------------------
    def handle(self, text: str) -> bool:
        """Run one input; False when the user asked to leave."""
        from gacalc.language.errors import GacalcError

        stripped = text.strip()
        if not stripped:
            return True
        if stripped in _QUIT_WORDS and self.session.get(stripped) is None:
            return False
        reading = reading_of(text, self.session.unicode)
        if reading is not None:
            self._print(self.style.paint("source", f"read as {reading}"))
        printing = False
        try:
            for result in self.session.iter_run(text):
                printing = True
                if isinstance(result, GacalcError):
                    self.show_error(result)
                    break
                self.show_result(result)
                printing = False
        except KeyboardInterrupt:
            # A statement interrupted while it runs comes back from the Session as a
            # GacalcInterrupt; this is Ctrl-C while parsing (nothing ran) or printing.
            if printing:
                message = ("interrupted while printing: that statement had finished and is "
                           "kept; the statements after it did not run")
            else:
                message = "interrupted: the session is unchanged"
            self._print(self.style.paint("error", message))
        return True

    # prompt_toolkit --------------------------------------------------------------------------
    def _history_object(self):
        if self._history is not None:
            return self._history
        from prompt_toolkit.history import FileHistory, InMemoryHistory

        from gacalc.paths import ensure_parent, history_file

        path = history_file()
        if ensure_parent(path):
            try:
                path.touch(exist_ok=True)
                return FileHistory(str(path))
            except OSError:
                pass
        return InMemoryHistory()

    def _key_bindings(self):
        from prompt_toolkit.key_binding import KeyBindings

        bindings = KeyBindings()
        session = self.session

        @bindings.add("enter")
        def _enter(event):
            buffer = event.current_buffer
            at_end = not buffer.document.text_after_cursor.strip()
            if at_end and session.needs_more_input(buffer.text):
                buffer.insert_text("\n")
            else:
                buffer.validate_and_handle()

        @bindings.add("escape", "enter")
        def _newline(event):
            event.current_buffer.insert_text("\n")

        @bindings.add("f2")
        def _switch_mode(event):
            session.unicode = not session.unicode

        @bindings.add("f3")
        def _switch_formulas(event):
            # results as formulas (formula auto) or as components (formula off)
            session.formulas = not session.formulas

        return bindings

    def prompt_session(self):
        if self._prompt_session is not None:
            return self._prompt_session
        from prompt_toolkit import PromptSession
        from prompt_toolkit.output import ColorDepth

        options = {}
        if self.color:
            from prompt_toolkit.lexers import PygmentsLexer

            from gacalc.highlight import GacalcLexer

            options["lexer"] = PygmentsLexer(GacalcLexer)
        else:
            options["color_depth"] = ColorDepth.MONOCHROME
        if self._input is not None:
            options["input"] = self._input
        if self._output is not None:
            options["output"] = self._output

        def continuation(width, line_number, wrap_count):
            return CONTINUATION.rjust(width) if width >= len(CONTINUATION) else CONTINUATION

        def toolbar():
            try:
                from prompt_toolkit.application.current import get_app

                width = get_app().output.get_size().columns
            except Exception:          # no running application (tests): any width
                width = 100
            return toolbar_text(self.session, width)

        self._prompt_session = PromptSession(
            PROMPT, multiline=True, prompt_continuation=continuation,
            history=self._history_object(), completer=_make_completer(self.session),
            complete_while_typing=True, key_bindings=self._key_bindings(),
            bottom_toolbar=toolbar, enable_history_search=False, **options)
        return self._prompt_session

    def run(self) -> int:
        prompt_session = self.prompt_session()
        self._print(WELCOME)
        while True:
            try:
                text = prompt_session.prompt()
            except KeyboardInterrupt:
                continue             # Ctrl-C at the prompt: drop the line
            except EOFError:
                break                # Ctrl-D
            if not self.handle(text):
                break
        return 0


def run_repl(*, unicode: bool = True, color: bool = True, budget: float | None = None,
             statement_budget: float | None = None) -> int:
    return Repl(unicode=unicode, color=color, budget=budget,
                statement_budget=statement_budget).run()

"""The REPL on prompt_toolkit, driven through a pipe input and DummyOutput.

Every run happens in a worker thread joined with a timeout, so a test whose input
is missing something fails instead of hanging the suite."""

import io
import threading

import pytest
from prompt_toolkit.application import create_app_session
from prompt_toolkit.document import Document
from prompt_toolkit.history import FileHistory, InMemoryHistory
from prompt_toolkit.input import create_pipe_input
from prompt_toolkit.output import DummyOutput

from gacalc.language import Session
from gacalc.repl import (CONTINUATION, PROMPT, WELCOME, Repl, _make_completer,
                         completion_candidates, reading_of, toolbar_text)

TIMEOUT = 30  # seconds; generous for a loaded machine, only reached when input is missing
ENTER = "\r"
CTRL_D = "\x04"
CTRL_C = "\x03"


def drive(keys: str, history=None, session=None, unicode=False):
    """Run a REPL on the given keystrokes; (exit status, printed text, repl)."""
    out = io.StringIO()
    outcome = {}
    with create_pipe_input() as pipe:
        repl = Repl(session, unicode=unicode, color=False, out=out,
                    history=history or InMemoryHistory(), input=pipe, output=DummyOutput())

        def work():
            with create_app_session(input=pipe, output=DummyOutput()):
                outcome["status"] = repl.run()

        worker = threading.Thread(target=work, daemon=True)
        worker.start()
        pipe.send_text(keys)
        worker.join(TIMEOUT)
        if worker.is_alive():
            pipe.close()
            worker.join(5)
            pytest.fail(f"the REPL did not finish within {TIMEOUT} s; output so far:\n"
                        + out.getvalue())
    return outcome.get("status"), out.getvalue(), repl


def test_prompt_texts_are_our_own():
    assert PROMPT == "cl3: " and CONTINUATION == "...: "


def test_declare_compute_and_leave_with_ctrl_d():
    status, out, repl = drive("vector a, b" + ENTER + "a b" + ENTER + CTRL_D)
    assert status == 0
    assert "vector a = a1*e1 + a2*e2 + a3*e3" in out
    # a b = a . b + a /\ b: the scalar part, then the e23, e31, e12 components; compared
    # as a value, since term order in sums follows the order symbols appeared in the process
    product = out.split("vector b = b1*e1 + b2*e2 + b3*e3\n", 1)[1]
    assert product.index("e23") < product.index("e31") < product.index("e12")
    check = Session().run(f"vector a, b\ncheck ({product}) == a . b + a /\\ b")[-1]
    assert check.outcome == "holds"
    assert set(repl.session.declarations) == {"a", "b"}


def test_open_bracket_continues_on_the_next_line():
    status, out, repl = drive("x = (e1 +" + ENTER + " e2)" + ENTER + CTRL_D)
    assert "x = e1 + e2" in out
    assert "never closed" not in out
    assert repl.session.get("x") is not None


def test_trailing_operator_continues_too():
    status, out, _ = drive("y = e1 *" + ENTER + "e2" + ENTER + CTRL_D)
    assert "y = e12" in out


def test_errors_show_message_line_and_caret_and_keep_names():
    status, out, repl = drive("z = e3" + ENTER + "w = z / (e1 - e1)" + ENTER + "z" + ENTER
                              + CTRL_D)
    lines = out.splitlines()
    error_at = next(i for i, line in enumerate(lines) if line.startswith("error: "))
    assert lines[error_at] == "error: division by zero"
    assert lines[error_at + 1].strip() == "w = z / (e1 - e1)"
    assert set(lines[error_at + 2].strip()) == {"^"}
    assert lines[error_at + 3] == "e3"
    assert repl.session.get("w") is None


def test_ctrl_c_abandons_the_statement_and_keeps_every_name(monkeypatch):
    # The statement raises KeyboardInterrupt in the middle of its evaluation, as Ctrl-C
    # does in the terminal; the names from before stay, the half-done one never appears.
    from gacalc.algebra import Multivector

    real_outer = Multivector.outer

    def interrupt_on_e3(self, other):
        if other.identical(Multivector({"e3": 1})):
            raise KeyboardInterrupt
        return real_outer(self, other)

    monkeypatch.setattr(Multivector, "outer", interrupt_on_e3)
    keys = ("vector a" + ENTER + "c = a /\\ e2" + ENTER + "c = a /\\ e3" + ENTER
            + "a" + ENTER + CTRL_D)
    status, out, repl = drive(keys)
    assert "interrupted" in out
    assert "a1*e1 + a2*e2 + a3*e3" in out.split("interrupted", 1)[1]
    assert repl.session.get("c").identical(repl.session.get("a").outer(Multivector({"e2": 1})))
    assert set(repl.session.declarations) == {"a"}


def test_ctrl_c_at_the_prompt_drops_the_line():
    status, out, repl = drive("q = e1" + CTRL_C + "r = e2" + ENTER + CTRL_D)
    assert "r = e2" in out
    assert repl.session.get("q") is None


def test_help_and_help_name():
    status, out, _ = drive("help" + ENTER + "help reflect" + ENTER + CTRL_D)
    assert "statements:" in out
    assert "reflect(X, n)" in out and "example: reflect(" in out


def test_quit_word_leaves_unless_it_is_a_name():
    status, out, _ = drive("quit" + ENTER + "e1" + ENTER + CTRL_D)
    assert status == 0 and out.splitlines() == [WELCOME]     # left before running e1
    session = Session()
    session.run("quit = e2")
    status, out, _ = drive("quit" + ENTER + CTRL_D, session=session)
    assert out.splitlines()[-1] == "e2"


def test_reading_echo_for_surprising_grouping():
    status, out, _ = drive("vector a, b" + ENTER + "a . b e1" + ENTER + CTRL_D)
    assert "read as (a . b) e1" in out
    assert reading_of("(a . b) c", unicode=False) is None
    assert reading_of("a / b c", unicode=False) == "(a / b) c"    # a b^-1 c
    assert reading_of("x = a . b c", unicode=True) == "(a · b) c"
    assert reading_of("a b + c", unicode=False) is None


def test_history_persists_in_a_file(tmp_path):
    path = tmp_path / "history"
    drive("n = e1" + ENTER + "n n" + ENTER + CTRL_D, history=FileHistory(str(path)))
    assert [entry for entry in FileHistory(str(path)).load_history_strings()] == \
        ["n n", "n = e1"]            # newest first
    # a second REPL finds them: up-arrow recalls the last input
    status, out, _ = drive("\x1b[A" + ENTER + CTRL_D, history=FileHistory(str(path)))
    assert "note: n is a new scalar symbol" in out


def test_history_goes_to_the_xdg_data_directory(tmp_path, monkeypatch):
    monkeypatch.setenv("XDG_DATA_HOME", str(tmp_path))
    repl = Repl(unicode=False, color=False, out=io.StringIO())
    history = repl._history_object()
    assert isinstance(history, FileHistory)
    assert history.filename == str(tmp_path / "gacalc" / "history")


def test_completion_of_names_functions_kinds_and_keywords():
    session = Session()
    session.run("vector velocity\nveer(x) = x x")
    completer = _make_completer(session)

    def complete(text):
        return {c.text: c.display_meta_text for c in
                completer.get_completions(Document(text), None)}

    found = complete("ve")
    assert found["velocity"] == "declared vector"
    assert found["vector"].startswith("declare symbolic vectors")
    assert found["veer"] == "function veer(x)"
    assert "reflect" in complete("x = ref")
    assert complete("rotate(rot")["rotor"].startswith("rotor exp(-B theta/2)")
    assert "check" in complete("ch")
    assert complete("2 ") == {}
    words = [word for word, _ in completion_candidates(session, "")]
    assert len(words) == len(set(words))


def test_toolbar_shows_names_mode_and_assumptions():
    session = Session()
    assert "no names yet" in toolbar_text(session)
    session.run("vector a, b\nrotor R\nx = e1\nf(t) = t\nassume a . b = 0")
    text = toolbar_text(session, width=200)
    assert "vector: a b" in text and "rotor: R" in text
    assert "values: x" in text and "functions: f()" in text
    assert "assuming a . b = 0" in text
    assert "[ascii" in text
    assert len(toolbar_text(session, width=30)) == 30


def test_f2_switches_the_output_mode():
    status, out, repl = drive("scalar theta" + ENTER + "\x1bOQ" + "theta e1" + ENTER + CTRL_D)
    assert repl.session.unicode is True
    assert "θ e1" in out

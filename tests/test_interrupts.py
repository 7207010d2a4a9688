"""Interrupts and internal errors: an abandoned statement leaves the session as it was.

Ctrl-C (KeyboardInterrupt, or a real SIGINT) during a statement, during a used file or
while the next statement is being read ends in a GacalcInterrupt with a position; a bug
in gacalc ends in a GacalcInternalError whose one-line message names the log file in the
user's state directory that holds the traceback.  SIGINT to a script run through the CLI
reports file:line and exits with a non-zero status.  (The REPL's Ctrl-C in a pseudo-
terminal is tested in tests/test_pty.py.)
"""

from __future__ import annotations

import os
import signal
import subprocess
import sys
import time
from pathlib import Path

import pytest

from gacalc.language import Session
from gacalc.language.errors import GacalcInternalError, GacalcInterrupt

from conftest import patch_builtin

ROOT = Path(__file__).resolve().parents[1]


def snapshot(session: Session):
    """Everything a statement could change, in comparable form."""
    return ({name: str(value) for name, value in session.values.items()},
            {name: f.text for name, f in session.functions.items()},
            dict(session.declarations), sorted(session.unit_names),
            [c.text for c in session.conditions], str(session.ans),
            list(session._state.log), sorted(session._state.known_symbols))


def prepared_session(**options) -> Session:
    session = Session(**options)
    results = session.run("vector n unit\nx = e1 + e2\nf(v) = v x\nassume t = 1\n"
                          "y = f(e3)\n")
    assert not any(r.kind in ("error", "interrupt") for r in results
                   if hasattr(r, "caret_text"))
    return session


def _raise_keyboard_interrupt(ctx, *args):
    raise KeyboardInterrupt


# Ctrl-C inside the session ------------------------------------------------------------
def test_ctrl_c_abandons_the_statement_and_keeps_every_name(monkeypatch):
    session = prepared_session()
    before = snapshot(session)
    patch_builtin(monkeypatch, "norm", _raise_keyboard_interrupt)
    error = session.run("y = norm(x) + n")[-1]
    assert isinstance(error, GacalcInterrupt) and "session is unchanged" in error.message
    assert (error.line, error.column) == (1, 1)
    assert snapshot(session) == before


def test_statements_before_the_interrupted_one_are_kept(monkeypatch):
    session = prepared_session()
    patch_builtin(monkeypatch, "norm", _raise_keyboard_interrupt)
    results = session.run("x = 5\ny = norm(x) + n\nz = 3")
    assert results[0].kind == "value" and session.get("x").scalar_part() == 5
    assert isinstance(results[-1], GacalcInterrupt) and results[-1].line == 2
    assert "z" not in session.values and str(session.get("y")) != "None"


def test_ctrl_c_in_any_kind_of_statement_changes_nothing(monkeypatch):
    session = prepared_session()
    before = snapshot(session)
    patch_builtin(monkeypatch, "norm", _raise_keyboard_interrupt)
    for text in ["x = norm(e1)", "n = norm(e1)", "f(norm(e1))",
                 "check norm(x) == 1", "assume norm(x) = 2", "show norm(x)",
                 "emit latex norm(x)"]:
        results = session.run(text)
        assert isinstance(results[-1], GacalcInterrupt), text
    assert snapshot(session) == before


def test_a_real_sigint_during_a_computation(monkeypatch):
    def interrupted_work(ctx, *args):
        signal.raise_signal(signal.SIGINT)       # Ctrl-C arrives while this runs
        end = time.monotonic() + 30
        while time.monotonic() < end:
            pass
        raise AssertionError("SIGINT was not delivered")

    patch_builtin(monkeypatch, "rev", interrupted_work)
    session = prepared_session(statement_budget=60)
    before = snapshot(session)
    previous_usr1 = signal.getsignal(signal.SIGUSR1)
    error = session.run("x = rev(x)")[-1]
    assert isinstance(error, GacalcInterrupt)
    assert snapshot(session) == before
    assert signal.getsignal(signal.SIGUSR1) == previous_usr1   # budget handler removed


def test_ctrl_c_inside_a_used_file_undoes_the_whole_file(tmp_path, monkeypatch):
    (tmp_path / "lib.gac").write_text("p = 1\nvector q\nr = rev(q)\ns = 4\n")
    patch_builtin(monkeypatch, "rev", _raise_keyboard_interrupt)
    session = prepared_session(base_dir=str(tmp_path))
    before = snapshot(session)
    error = session.run('use "lib.gac"')[-1]
    assert isinstance(error, GacalcInterrupt)
    assert snapshot(session) == before
    assert all(session.get(name) is None for name in "pqrs")


def test_ctrl_c_while_reading_the_next_statement(monkeypatch):
    from gacalc.language import parser

    original = parser.parse_statement_tokens
    calls = []

    def interrupted_parse(tokens, terminator, *rest):
        calls.append(tokens)
        if len(calls) == 2:
            raise KeyboardInterrupt
        return original(tokens, terminator, *rest)

    monkeypatch.setattr(parser, "parse_statement_tokens", interrupted_parse)
    session = Session()
    results = session.run("a = e1\n\nb = e2\nc = e3", filename="steps.gac")
    assert results[0].kind == "value" and session.get("a") is not None
    error = results[-1]
    assert isinstance(error, GacalcInterrupt)
    assert (error.filename, error.line, error.column) == ("steps.gac", 3, 1)
    assert session.get("b") is None and session.get("c") is None


# SIGINT to a script run through the CLI ------------------------------------------------
def _cli_env(tmp_path):
    env = dict(os.environ)
    env["PYTHONPATH"] = str(ROOT) + os.pathsep + env.get("PYTHONPATH", "")
    env["XDG_STATE_HOME"] = str(tmp_path / "state")
    env["XDG_DATA_HOME"] = str(tmp_path / "data")
    env["NO_COLOR"] = "1"
    return env


@pytest.mark.skipif(sys.platform == "win32", reason="POSIX signals")
def test_sigint_to_a_script_reports_where_it_stopped(tmp_path):
    # f30 evaluates its body 2^30 times: it runs until something stops it.
    lines = ["x = e1", "f0(v) = v + e1"]
    lines += [f"f{k}(v) = f{k - 1}(v) + f{k - 1}(v)" for k in range(1, 31)]
    lines += ['emit latex x to "started.tex"', "y = f30(x)", "z = 2"]
    script = tmp_path / "long.gac"
    script.write_text("\n".join(lines) + "\n")
    slow_line = lines.index("y = f30(x)") + 1
    process = subprocess.Popen([sys.executable, "-m", "gacalc", "long.gac"], cwd=tmp_path,
                               env=_cli_env(tmp_path), stdout=subprocess.PIPE,
                               stderr=subprocess.PIPE, text=True)
    try:
        marker = tmp_path / "started.tex"
        waited = 0.0
        while not marker.exists() and process.poll() is None and waited < 120:
            time.sleep(0.05)
            waited += 0.05
        assert marker.exists(), "the script never reached the slow statement"
        time.sleep(0.5)                 # let it get into the slow statement
        process.send_signal(signal.SIGINT)
        out, err = process.communicate(timeout=120)
    finally:
        if process.poll() is None:
            process.kill()
            process.communicate()
    assert process.returncode != 0 and process.returncode == 130
    assert "Traceback" not in err and "Traceback" not in out
    assert "interrupted" in err
    assert any(f"long.gac:{line}:" in err for line in (slow_line - 1, slow_line)), err
    assert f"wrote latex to {marker}" in out        # what ran before was printed


# Internal errors -----------------------------------------------------------------------
def _bug(ctx, *args):
    raise RuntimeError("simulated bug in a built-in")


def test_an_internal_error_names_the_log_with_the_traceback(tmp_path, monkeypatch):
    monkeypatch.setenv("XDG_STATE_HOME", str(tmp_path))
    patch_builtin(monkeypatch, "dual", _bug)
    session = prepared_session()
    before = snapshot(session)
    error = session.run("x = dual(x)")[-1]
    assert isinstance(error, GacalcInternalError)
    log = tmp_path / "gacalc" / "internal-errors.log"
    # one line for the user: the summary and the log's path, no traceback
    assert "\n" not in error.message
    assert "RuntimeError: simulated bug in a built-in" in error.message
    assert str(log) in error.message and error.log_path == str(log)
    assert "Traceback" not in error.caret_text()
    text = log.read_text()
    assert "Traceback (most recent call last)" in text and "_bug" in text
    assert "x = dual(x)" in text and "<input>:1:1" in text
    # the session is unchanged and keeps working
    assert snapshot(session) == before
    assert session.run("x x")[-1].text == "2"


def test_an_internal_error_without_a_writable_state_directory(tmp_path, monkeypatch):
    blocker = tmp_path / "not-a-directory"
    blocker.write_text("")
    monkeypatch.setenv("XDG_STATE_HOME", str(blocker))
    patch_builtin(monkeypatch, "dual", _bug)
    error = Session().run("dual(e1)")[-1]
    assert isinstance(error, GacalcInternalError)
    assert error.log_path is None and "RuntimeError" in error.message
    assert "traceback" in error.traceback_text.lower()


def test_a_parser_bug_is_an_internal_error_too(tmp_path, monkeypatch):
    from gacalc.language import parser

    monkeypatch.setenv("XDG_STATE_HOME", str(tmp_path))

    def broken(*args):
        raise IndexError("simulated parser bug")

    monkeypatch.setattr(parser, "parse_statement_tokens", broken)
    error = Session().run("e1 e2")[-1]
    assert isinstance(error, GacalcInternalError) and "IndexError" in error.message
    assert "simulated parser bug" in (tmp_path / "gacalc" / "internal-errors.log").read_text()


def test_diagnostics_entry_format(tmp_path, monkeypatch):
    from gacalc.diagnostics import summary, write_internal_error

    monkeypatch.setenv("XDG_STATE_HOME", str(tmp_path))
    try:
        raise ValueError("first line\nsecond line")
    except ValueError as error:
        path = write_internal_error(error, "y = " + "x" * 5000, "demo.gac:3:1")
        assert summary(error) == "ValueError: first line"
    text = Path(path).read_text()
    assert "demo.gac:3:1: ValueError: first line" in text
    assert "statement: y = xxx" in text and len(text) < 4000    # long statements are cut
    assert "Traceback" in text and "second line" in text


def test_a_printing_bug_is_one_line_not_a_traceback(tmp_path, monkeypatch):
    from gacalc.printing import text as printing

    monkeypatch.setenv("XDG_STATE_HOME", str(tmp_path))
    result = Session().run("e1 + e2")[-1]

    def broken(*args, **kwargs):
        raise KeyError("simulated printer bug")

    monkeypatch.setattr(printing, "value_text", broken)
    text = result.text
    assert text.startswith("internal error while printing this result (KeyError")
    assert "\n" not in text and str(tmp_path / "gacalc" / "internal-errors.log") in text
    assert "simulated printer bug" in (tmp_path / "gacalc" / "internal-errors.log").read_text()

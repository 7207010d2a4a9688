"""The gacalc command line: exit statuses, the summary line, standard-input mode, the
error format, options, and a startup that does not import the REPL's libraries."""

import io
import os
import re
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

from gacalc import __version__
from gacalc.cli import main

ROOT = Path(__file__).resolve().parents[1]
SUBPROCESS_TIMEOUT = 120


def gacalc(*args, stdin="", env=None):
    """Run ``python -m gacalc`` as a separate program; (status, stdout, stderr)."""
    environment = dict(os.environ)
    environment["PYTHONPATH"] = str(ROOT) + os.pathsep + environment.get("PYTHONPATH", "")
    environment.pop("NO_COLOR", None)
    environment.update(env or {})
    done = subprocess.run([sys.executable, "-m", "gacalc", *args], input=stdin,
                          capture_output=True, text=True, encoding="utf-8",
                          timeout=SUBPROCESS_TIMEOUT, env=environment, cwd=ROOT)
    return done.returncode, done.stdout, done.stderr


def run_main(args, capsys, stdin=None, monkeypatch=None):
    if stdin is not None:
        monkeypatch.setattr(sys, "stdin", io.StringIO(stdin))
    status = main(args)
    captured = capsys.readouterr()
    return status, captured.out, captured.err


# As separate programs ---------------------------------------------------------------------
def test_statements_do_not_import_prompt_toolkit_or_pygments():
    code = ("import sys\nfrom gacalc.cli import main\nstatus = main(['-e', '1'])\n"
            "loaded = sorted(m for m in sys.modules if m.split('.')[0] in "
            "('prompt_toolkit', 'pygments'))\nprint('loaded:', loaded)\nsys.exit(status)\n")
    environment = dict(os.environ, PYTHONPATH=str(ROOT))
    done = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                          timeout=SUBPROCESS_TIMEOUT, env=environment)
    assert done.returncode == 0, done.stderr
    assert done.stdout.splitlines() == ["1", "loaded: []"]


def test_piped_statements_run_as_a_script_without_prompt_or_escapes():
    script = "vector a\ncheck a a == a . a\nrotate(rotor(e12, pi/2), e1)\n"
    status, out, err = gacalc(stdin=script)
    assert status == 0, err
    assert "\x1b" not in out and "cl3:" not in out
    # a quarter turn in the e12 plane takes e1 to e2 (DESIGN.md rotor convention)
    assert out.splitlines()[-2:] == ["e2", "1 passed, 0 failed"]


def test_failed_check_exit_one_with_difference(tmp_path):
    script = tmp_path / "anti.gac"
    # e1 e2 = -e2 e1 (vectors that are orthogonal anticommute, common practice), so
    # checking e1 e2 == e2 e1 fails with L - R = 2 e12.
    script.write_text("check e1 e2 == -e2 e1\ncheck e1 e2 == e2 e1\n")
    status, out, err = gacalc(str(script))
    assert status == 1, err
    assert "L - R = 2*e12" in out
    assert out.splitlines()[-1] == "1 passed, 1 failed"


def test_error_exit_two_with_position_source_line_and_caret(tmp_path):
    script = tmp_path / "bad.gac"
    script.write_text("x = e1\ny = x ~~ )\n")
    status, out, err = gacalc(str(script))
    assert status == 2
    assert out.splitlines() == ["x = e1"]
    head, line, caret = err.splitlines()[:3]
    match = re.match(r"(.+):(\d+):(\d+): ", head)
    assert match and match.group(1) == str(script) and match.group(2) == "2"
    column = int(match.group(3))
    assert line == "  y = x ~~ )"
    assert caret == "  " + " " * (column - 1) + "^" * (len(caret) - 2 - (column - 1))
    assert line[2 + column - 1] == ")"


def test_one_demo_end_to_end():
    status, out, err = gacalc("--demo", "periscope")
    assert status == 0, err
    assert out.splitlines()[0] == "== demo periscope.gac =="
    assert re.search(r"^[1-9]\d* passed, 0 failed$", out, re.MULTILINE)


def _installed_program():
    candidate = Path(sys.executable).with_name("gacalc")
    return str(candidate) if candidate.exists() else shutil.which("gacalc")


@pytest.mark.skipif(_installed_program() is None, reason="the gacalc program is not installed")
def test_installed_console_script():
    done = subprocess.run([_installed_program(), "-e", "e1 e2 e3"], capture_output=True,
                          text=True, timeout=SUBPROCESS_TIMEOUT)
    assert (done.returncode, done.stdout) == (0, "e123\n")


# In-process ------------------------------------------------------------------------------
def test_version(capsys):
    with pytest.raises(SystemExit) as stop:
        main(["--version"])
    assert stop.value.code == 0
    assert capsys.readouterr().out.strip() == f"gacalc {__version__}"


def test_help_has_examples(capsys):
    with pytest.raises(SystemExit):
        main(["--help"])
    text = capsys.readouterr().out
    assert "examples:" in text and "gacalc --demo" in text and "-e 'vector a, b; a b'" in text
    assert "exit status: 0" in text


def test_statements_options_share_one_session(capsys):
    status, out, _ = run_main(["-e", "n = e1", "-e", "check n n == 1"], capsys)
    assert status == 0
    assert out.splitlines() == ["n = e1", "held: check n n == 1", "1 passed, 0 failed"]


def test_semicolons_separate_statements_and_checks_still_report(capsys):
    status, out, _ = run_main(["-e", "vector a; check a /\\ a == 0; a . a"], capsys)
    # the ';' after the declaration silences it; the check reports anyway
    lines = out.splitlines()
    assert lines[0] == "held: check a /\\ a == 0" and lines[-1] == "1 passed, 0 failed"
    assert sorted(lines[1].split(" + ")) == ["a1^2", "a2^2", "a3^2"]
    assert status == 0


def test_error_in_statements_names_the_command_line(capsys):
    status, out, err = run_main(["-e", "x = (e1"], capsys)
    assert status == 2
    assert err.startswith("<command line>:1:5: ")


def test_stdin_dash_and_automatic(capsys, monkeypatch):
    status, out, _ = run_main(["-"], capsys, stdin="e1 e1\n", monkeypatch=monkeypatch)
    assert (status, out) == (0, "1\n")
    status, out, _ = run_main([], capsys, stdin="e2 e1\n", monkeypatch=monkeypatch)
    assert (status, out) == (0, "-e12\n")
    status, out, err = run_main(["<missing>"], capsys)
    assert status == 2 and "cannot read" in err


def test_stdin_error_position(capsys, monkeypatch):
    status, out, err = run_main([], capsys, stdin="x = e1\nx ^ \n", monkeypatch=monkeypatch)
    assert status == 2
    assert err.startswith("<stdin>:2:")


def test_ascii_and_unicode_modes(capsys):
    _, ascii_out, _ = run_main(["--ascii", "-e", "scalar theta; cos(theta) e1 - e2"], capsys)
    _, unicode_out, _ = run_main(["--unicode", "-e", "scalar theta; cos(theta) e1 - e2"],
                                 capsys)
    assert ascii_out.splitlines()[-1] == "cos(theta)*e1 - e2"
    assert unicode_out.splitlines()[-1] == "cos(θ) e1 − e2"


def test_ascii_and_unicode_exclude_each_other(capsys):
    with pytest.raises(SystemExit) as stop:
        main(["--ascii", "--unicode", "-e", "1"])
    assert stop.value.code == 2


def test_unknown_demo_is_a_usage_error(capsys):
    with pytest.raises(SystemExit) as stop:
        main(["--demo", "submarine"])
    assert stop.value.code == 2
    assert "periscope" in capsys.readouterr().err


def test_budget_must_be_positive(capsys):
    with pytest.raises(SystemExit) as stop:
        main(["--budget", "0", "-e", "1"])
    assert stop.value.code == 2


def test_dash_must_be_alone(capsys, tmp_path):
    script = tmp_path / "s.gac"
    script.write_text("1\n")
    status, _, err = run_main([str(script), "-"], capsys)
    assert status == 2 and "only file" in err


def test_several_files_get_headings(capsys, tmp_path):
    first, second = tmp_path / "a.gac", tmp_path / "b.gac"
    first.write_text("check e1 == e1\n")
    second.write_text("check e2 == e2\n")
    status, out, _ = run_main([str(first), str(second)], capsys)
    assert status == 0
    assert f"== {first} ==" in out and out.splitlines()[-1] == "all 2 files: 2 passed, 0 failed"


def test_user_directories_follow_xdg(monkeypatch, tmp_path):
    # XDG Base Directory Specification: absolute $XDG_DATA_HOME / $XDG_STATE_HOME win;
    # a relative value is invalid and ignored.
    from gacalc import paths

    monkeypatch.setenv("XDG_DATA_HOME", str(tmp_path / "data"))
    monkeypatch.setenv("XDG_STATE_HOME", str(tmp_path / "state"))
    assert paths.history_file() == tmp_path / "data" / "gacalc" / "history"
    assert paths.internal_error_log() == tmp_path / "state" / "gacalc" / "internal-errors.log"
    monkeypatch.setenv("XDG_DATA_HOME", "relative/dir")
    monkeypatch.setattr(sys, "platform", "linux")
    monkeypatch.setenv("HOME", str(tmp_path / "home"))
    assert paths.data_dir() == tmp_path / "home" / ".local" / "share" / "gacalc"


def test_statement_budget_flag_reaches_the_sessions(monkeypatch):
    # the flag's value is what each script session gets (deterministic: no timing)
    from gacalc import runner

    seen = []
    original = runner.ScriptRunner.new_session

    def recording(self):
        session = original(self)
        seen.append(session.statement_budget)
        return session

    monkeypatch.setattr(runner.ScriptRunner, "new_session", recording)
    assert main(["--ascii", "--statement-budget", "7.5", "-e", "e1 e2"]) == 0
    assert seen and all(budget == 7.5 for budget in seen)


def test_statement_budget_must_be_positive(capsys):
    with pytest.raises(SystemExit):
        main(["--statement-budget", "0", "-e", "e1"])
    assert "--statement-budget must be a positive" in capsys.readouterr().err


def test_the_repl_waits_less_than_a_script():
    from gacalc.language.session import DEFAULT_STATEMENT_BUDGET, REPL_STATEMENT_BUDGET
    from gacalc.repl import Repl
    from gacalc.runner import RunOptions, ScriptRunner

    assert Repl(unicode=False, color=False, out=io.StringIO()).session.statement_budget \
        == REPL_STATEMENT_BUDGET < DEFAULT_STATEMENT_BUDGET
    assert Repl(unicode=False, color=False, out=io.StringIO(),
                statement_budget=3).session.statement_budget == 3
    runner = ScriptRunner(RunOptions(statement_budget=7))
    assert runner.new_session().statement_budget == 7
    assert ScriptRunner(RunOptions()).new_session().statement_budget \
        == DEFAULT_STATEMENT_BUDGET

"""The script runner over a Session: results, check outcomes, errors with carets,
``use`` across files, the closing summary line, exit statuses."""

import io
import re

from gacalc.runner import (EXIT_CHECK_FAILED, EXIT_ERROR, EXIT_INTERRUPTED, EXIT_OK,
                           RunOptions, ScriptRunner, Tally, log_internal_error)

SUMMARY = re.compile(r"^(\d+) passed, (\d+) failed$", re.MULTILINE)


def reads_back_as(printed, expected, declarations=""):
    """The printed text, read back by gacalc, equals ``expected`` (term order in printed
    sums depends on the order symbols first appeared in the process, so tests compare
    values, not strings, where several symbols meet)."""
    from gacalc.language import Session

    outcome = Session().run(f"{declarations}\ncheck ({printed}) == {expected}")[-1]
    return getattr(outcome, "outcome", None) == "holds"


def run(text, filename="t.gac", **options):
    out, err = io.StringIO(), io.StringIO()
    tally = ScriptRunner(RunOptions(**options), out=out, err=err).run_text(text, filename)
    return tally, out.getvalue(), err.getvalue()


def test_results_checks_and_summary():
    # a b = a . b + a /\ b for vectors, the defining split of the geometric product
    # (common practice); a b = b a fails, with a b - b a = 2 a /\ b.
    tally, out, err = run("vector a, b\n"
                          "check a b == a . b + a /\\ b\n"
                          "check a b == b a\n"
                          "e1 e2\n")
    assert err == ""
    lines = out.splitlines()
    assert "held: check a b == a . b + a /\\ b" in lines
    assert any(line.startswith("FAILED: check a b == b a") for line in lines)
    # the failure shows L - R = a b - b a = 2 a /\ b, grade by grade in basis order
    first = next(i for i, line in enumerate(lines) if line.startswith("FAILED"))
    failure = "\n".join(lines[first:-2])     # up to the value of e1 e2 and the summary
    difference = failure.split("L - R = ", 1)[1]
    assert failure.index("e23") < failure.index("e31") < failure.index("e12")
    assert reads_back_as(difference, "2 a /\\ b", "vector a, b")
    # continues after the failed check, and ends with the summary alone on its line
    assert lines[-2] == "e12"
    assert lines[-1] == "1 passed, 1 failed"
    assert (tally.passed, tally.failed, tally.exit_status()) == (1, 1, EXIT_CHECK_FAILED)


def test_no_summary_without_checks():
    tally, out, _ = run("x = e1 + e2\nx x\n")
    assert out.splitlines() == ["x = e1 + e2", "2"]
    assert SUMMARY.search(out) is None
    assert tally.exit_status() == EXIT_OK


def test_all_held_exit_zero_even_when_silenced():
    tally, out, _ = run("check e1 e2 == -e2 e1;\ncheck e12 e12 == -1;\n")
    assert out.count("held:") == 2          # a check reports even after ';'
    assert out.splitlines()[-1] == "2 passed, 0 failed"
    assert tally.exit_status() == EXIT_OK


def test_error_stops_the_file_with_position_and_caret():
    text = "x = e1\ncheck x x == 1\ny = x / (e1 - e1)\nz = 3\n"
    tally, out, err = run(text, filename="mirrors.gac")
    assert "z = 3" not in out                      # stopped at the error
    assert out.splitlines()[-1] == "1 passed, 0 failed"
    first, source_line, caret = err.splitlines()[:3]
    assert re.match(r"mirrors\.gac:3:\d+: ", first)
    column = int(first.split(":")[2])
    assert source_line.strip() == "y = x / (e1 - e1)"
    # the caret sits under the reported column of the source line
    assert caret.index("^") - (len(source_line) - len(source_line.lstrip())) == column - 1
    assert tally.exit_status() == EXIT_ERROR


def test_syntax_error_after_good_statements():
    tally, out, err = run("a = e1\nb = (a\n", filename="s.gac")
    assert out.splitlines() == ["a = e1"]
    assert err.startswith("s.gac:2:5: ")
    assert "^" in err.splitlines()[2]
    assert tally.exit_status() == EXIT_ERROR


def test_use_resolves_next_to_the_including_file(tmp_path):
    (tmp_path / "lib").mkdir()
    (tmp_path / "lib" / "mirrors.gac").write_text("use \"normals.gac\"\nm = n1 n2\n")
    (tmp_path / "lib" / "normals.gac").write_text("n1 = e1\nn2 = e2\n")
    main = tmp_path / "main.gac"
    main.write_text('use "lib/mirrors.gac"\ncheck m == e12\n')
    out, err = io.StringIO(), io.StringIO()
    tally = ScriptRunner(out=out, err=err).run_file(str(main))
    assert err.getvalue() == ""
    assert "held: check m == e12" in out.getvalue()
    assert tally.exit_status() == EXIT_OK


def test_use_refuses_a_cycle(tmp_path):
    (tmp_path / "a.gac").write_text('x = 1\nuse "b.gac"\n')
    (tmp_path / "b.gac").write_text('use "a.gac"\n')
    out, err = io.StringIO(), io.StringIO()
    tally = ScriptRunner(out=out, err=err).run_file(str(tmp_path / "a.gac"))
    message = err.getvalue()
    assert "b.gac:1:5:" in message and "cycle" in message
    assert tally.exit_status() == EXIT_ERROR


def test_checks_inside_used_files_count(tmp_path):
    (tmp_path / "facts.gac").write_text("check e1 e1 == 1\ncheck e1 e2 == e12\n")
    (tmp_path / "main.gac").write_text('use "facts.gac"\ncheck I I == -1\n')
    out = io.StringIO()
    tally = ScriptRunner(out=out, err=io.StringIO()).run_file(str(tmp_path / "main.gac"))
    assert out.getvalue().splitlines()[-1] == "3 passed, 0 failed"
    assert tally.passed == 3


def test_unreadable_file_is_an_error_line(tmp_path):
    out, err = io.StringIO(), io.StringIO()
    tally = ScriptRunner(out=out, err=err).run_file(str(tmp_path / "missing.gac"))
    assert "missing.gac" in err.getvalue() and "cannot read" in err.getvalue()
    assert len(err.getvalue().strip().splitlines()) == 1
    assert tally.exit_status() == EXIT_ERROR


def test_several_files_fresh_sessions_and_total(tmp_path):
    first = tmp_path / "one.gac"
    second = tmp_path / "two.gac"
    first.write_text("p = e1\ncheck p p == 1\n")
    second.write_text("check p == e1\n")    # p is a new scalar symbol here: fails
    out = io.StringIO()
    total = ScriptRunner(out=out, err=io.StringIO()).run_files([str(first), str(second)])
    text = out.getvalue()
    assert f"== {first} ==" in text and f"== {second} ==" in text
    assert SUMMARY.findall(text) == [("1", "0"), ("0", "1")]
    assert text.splitlines()[-1] == "all 2 files: 1 passed, 1 failed"
    assert total.exit_status() == EXIT_CHECK_FAILED


def test_error_in_one_file_does_not_stop_the_next(tmp_path):
    bad = tmp_path / "bad.gac"
    good = tmp_path / "good.gac"
    bad.write_text("x = (\n")
    good.write_text("check e2 e2 == 1\n")
    out, err = io.StringIO(), io.StringIO()
    total = ScriptRunner(out=out, err=err).run_files([str(bad), str(good)])
    assert "held: check e2 e2 == 1" in out.getvalue()
    assert total.exit_status() == EXIT_ERROR


def test_echo_prints_the_script_lines_before_their_results():
    text = "# mirrors\nn = e1\n\ncheck n n == 1   # unit\n# done\n"
    _, out, _ = run(text, echo=True)
    assert out.splitlines() == [
        "# mirrors", "n = e1", "    n = e1", "", "check n n == 1   # unit",
        "    held: check n n == 1", "# done", "1 passed, 0 failed"]


def test_unicode_option_reaches_the_printed_values():
    _, out, _ = run("scalar theta\nx = cos(theta) e1 - e2\n", unicode=True)
    assert "x = cos(θ) e1 − e2" in out


def test_colour_only_when_asked():
    _, plain, _ = run("check e1 == e2\n")
    _, coloured, _ = run("check e1 == e2\n", color=True)
    assert "\x1b[" not in plain
    assert "\x1b[31;1mFAILED" in coloured


def test_tally_statuses():
    assert Tally(passed=3).exit_status() == EXIT_OK
    assert Tally(passed=3, undecided=1).exit_status() == EXIT_CHECK_FAILED
    assert Tally(failed=1, errors=1).exit_status() == EXIT_ERROR
    assert Tally(errors=1, interrupted=True).exit_status() == EXIT_INTERRUPTED
    assert Tally(passed=2, undecided=1).summary_lines()[-1] == "2 passed, 1 failed"
    assert Tally().summary_lines() == []


def test_interrupt_inside_a_statement_stops_the_run(monkeypatch):
    # Ctrl-C arrives as KeyboardInterrupt in the middle of an evaluation.
    from gacalc.algebra import Multivector

    def interrupted(self, other):
        raise KeyboardInterrupt

    monkeypatch.setattr(Multivector, "outer", interrupted)
    tally, out, err = run("x = e1\ny = x /\\ e2\nz = 1\n")
    assert out.splitlines() == ["x = e1"]
    assert "interrupted" in err and "t.gac:2:1" in err
    assert tally.exit_status() == EXIT_INTERRUPTED


def test_internal_error_is_logged_in_the_state_directory(tmp_path, monkeypatch):
    monkeypatch.setenv("XDG_STATE_HOME", str(tmp_path))
    from gacalc.algebra import Multivector

    def broken(self, other):
        raise RuntimeError("simulated bug")

    monkeypatch.setattr(Multivector, "outer", broken)
    tally, out, err = run("x = e1 /\\ e2\n")
    assert "internal error" in err and "bug in gacalc" in err
    assert "Traceback" not in err
    log = tmp_path / "gacalc" / "internal-errors.log"
    assert log.is_file()
    assert "RuntimeError: simulated bug" in log.read_text()
    assert tally.exit_status() == EXIT_ERROR
    # one bug, one entry: the session writes it and the runner names the same file, once
    assert log.read_text().count("--- ") == 1
    assert err.count(str(log)) == 1


def test_log_internal_error_without_a_writable_directory(monkeypatch, tmp_path):
    blocker = tmp_path / "file"
    blocker.write_text("")
    monkeypatch.setenv("XDG_STATE_HOME", str(blocker))   # a file where a directory goes
    from gacalc.language.errors import GacalcInternalError

    assert log_internal_error(GacalcInternalError("x", None, "tb")) is None


def test_a_printer_bug_is_logged_once_however_often_its_text_is_read(tmp_path, monkeypatch):
    monkeypatch.setenv("XDG_STATE_HOME", str(tmp_path))
    import gacalc.printing.text as text_printer

    def broken(*args, **kwargs):
        raise RuntimeError("simulated printer bug")

    monkeypatch.setattr(text_printer, "value_text", broken)
    from gacalc.language import Session

    result = Session().run("e1 + e2")[-1]
    first, second = result.text, str(result)
    assert first == second and "internal error while printing" in first
    log = tmp_path / "gacalc" / "internal-errors.log"
    assert log.read_text().count("--- ") == 1
    tally, out, err = run("e1 + e2\ncheck e1 == e1\n")
    assert "internal error while printing" in out and tally.passed == 1
    assert log.read_text().count("--- ") == 2          # one more bug, one more entry

"""Session API: results, files (use, save, emit to), help, completion, LaTeX display."""

import os

import pytest

from gacalc.algebra import blade
from gacalc.language import GacalcError, Session
from gacalc.language.errors import GacalcFileError, GacalcLimitError
from gacalc.language.session import (MAX_INPUT_CHARS, SAVE_HEADER, CheckResult,
                                     DeclarationResult, EmitResult, FileResult, HelpResult,
                                     NoteResult, ShowResult, ValueResult)

from conftest import ok


def test_results_are_structured():
    session = Session()
    results = ok(session, "vector a, b\nx = a /\\ b;\ncheck x == -(b /\\ a)\nx")
    kinds = [r.kind for r in results]
    assert kinds == ["declaration", "value", "check", "value"]
    declaration, assignment, check, shown = results
    assert isinstance(declaration, DeclarationResult) and set(declaration.values) == {"a", "b"}
    assert assignment.name == "x" and assignment.silent
    assert assignment.text.startswith("x = (a2*b3 - a3*b2)*e23")
    assert isinstance(check, CheckResult) and check.passed and check.line == 3
    assert check.statement_text == "check x == -(b /\\ a)"
    assert not shown.silent and shown.value.identical(session.values["x"])


def test_errors_carry_position_and_filename():
    session = Session()
    results = session.run("x = 1\ny = nrom(x)\nz = 3", filename="demo.gac")
    error = results[-1]
    assert isinstance(error, GacalcError)
    assert (error.filename, error.line, error.column) == ("demo.gac", 2, 5)
    assert error.caret_text() == ("demo.gac:2:5: unknown function nrom (did you mean norm?)\n"
                                  "  y = nrom(x)\n"
                                  "      ^^^^")
    assert session.get("x") is not None and session.get("z") is None   # stopped at the error


def test_iter_run_yields_results_before_a_later_error():
    session = Session()
    stream = session.iter_run("a = 1\nb = 2\nc = (")
    first = next(stream)
    assert isinstance(first, ValueResult) and first.name == "a"
    rest = list(stream)
    assert isinstance(rest[-1], GacalcError)


def test_unicode_mode_results():
    session = Session(unicode=True)
    results = ok(session, "theta^2 e12 - e1")
    assert results[-1].text == "−e1 + θ² e12"
    assert results[-1].render(unicode=False) == "-e1 + theta^2*e12"


def test_input_length_limit():
    result = Session().run("1" * (MAX_INPUT_CHARS + 1))
    assert isinstance(result[-1], GacalcLimitError)


def test_views_of_the_state():
    session = Session()
    ok(session, "vector n unit; rotor R; f(x) = x x; assume n1 = 0")
    assert session.declarations == {"n": "vector", "R": "rotor"}
    assert session.functions["f"].params == ["x"]
    texts = [c.text for c in session.conditions]
    assert "n is a unit vector" in texts and "R is a unit rotor" in texts and "n1 = 0" in texts
    words = dict(session.completion_words())
    assert words["n"] == "declared vector"
    assert "norm" in words and "check" in words and words["f"] == "function f(x)"
    assert Session.needs_more_input("f(")


def test_help():
    session = Session()
    overview = ok(session, "help")[-1]
    assert isinstance(overview, HelpResult) and "functions:" in overview.text
    assert "example: norm(3 e1 + 4 e2)" in ok(session, "help norm")[-1].text
    assert "operators, loosest to tightest" in ok(session, "help /\\")[-1].text
    rotor_help = ok(session, "help rotor")[-1].text
    assert "rotor(B, theta)" in rotor_help and "rotor R" in rotor_help
    ok(session, "f(x) = x~")
    assert "f(x) = x~" in ok(session, "help f")[-1].text
    assert "no help on" in session.run("help nothing_here")[-1].message


# Files ------------------------------------------------------------------------------
def test_use_runs_a_file_relative_to_the_including_file(tmp_path):
    library = tmp_path / "lib"
    library.mkdir()
    (library / "inner.gac").write_text("vector a\ninner = 2 a\n")
    (library / "outer.gac").write_text('use "inner.gac"\nouter = inner + e1\n')
    session = Session()
    results = ok(session, 'use "lib/outer.gac"', filename=str(tmp_path / "main.gac"))
    used = [r for r in results if isinstance(r, FileResult)]
    assert [os.path.basename(r.path) for r in used] == ["inner.gac", "outer.gac"]
    assert session.get("outer") is not None and session.declarations == {"a": "vector"}


def test_use_refuses_cycles_and_missing_files(tmp_path):
    (tmp_path / "a.gac").write_text('x = 1\nuse "b.gac"\n')
    (tmp_path / "b.gac").write_text('use "a.gac"\n')
    session = Session(base_dir=str(tmp_path))
    error = session.run('use "a.gac"')[-1]
    assert isinstance(error, GacalcFileError) and "cycle" in error.message
    assert error.filename == str(tmp_path / "b.gac")
    assert session.get("x") is None                      # the whole use was undone
    missing = session.run('use "missing.gac"')[-1]
    assert "cannot read" in missing.message and "No such file" in missing.message
    assert missing.column == 5


def test_an_error_inside_a_used_file_points_into_that_file(tmp_path):
    (tmp_path / "bad.gac").write_text("y = 2\nz = (1 +\n")
    session = Session(base_dir=str(tmp_path))
    error = session.run('use "bad.gac"')[-1]
    assert error.filename == str(tmp_path / "bad.gac") and error.line == 2
    assert session.get("y") is None


def test_save_writes_a_script_that_recreates_the_session(tmp_path):
    session = Session(base_dir=str(tmp_path))
    ok(session, "vector n unit\nscalar t\nx = rotate(rotor(n, t), e1);\n"
                "f(v) = v~ v\nassume t = 1\nx")
    saved = ok(session, 'save "state.gac"')[-1]
    assert isinstance(saved, FileResult) and saved.path == str(tmp_path / "state.gac")
    text = (tmp_path / "state.gac").read_text()
    assert text.startswith(SAVE_HEADER)
    fresh = Session(base_dir=str(tmp_path))
    ok(fresh, 'use "state.gac"')
    assert fresh.values["x"] == session.values["x"]
    assert fresh.declarations == session.declarations
    assert set(fresh.functions) == {"f"}
    assert [c.text for c in fresh.conditions] == [c.text for c in session.conditions]
    assert not [r for r in fresh.run('use "state.gac"') if isinstance(r, GacalcError)]


def test_save_refuses_to_overwrite_other_files_without_force(tmp_path):
    other = tmp_path / "notes.txt"
    other.write_text("my notes\n")
    session = Session(base_dir=str(tmp_path))
    ok(session, "x = 1")
    error = session.run('save "notes.txt"')[-1]
    assert isinstance(error, GacalcFileError) and "force" in error.message
    assert other.read_text() == "my notes\n"
    ok(session, 'save "notes.txt" force')
    assert other.read_text().startswith(SAVE_HEADER)
    ok(session, 'save "notes.txt"')                       # a saved session: fine
    assert not [p for p in os.listdir(tmp_path) if p.endswith(".tmp")]


def test_save_reports_unwritable_paths(tmp_path):
    session = Session(base_dir=str(tmp_path))
    error = session.run('save "no/such/dir/x.gac"')[-1]
    assert isinstance(error, GacalcFileError) and "cannot write" in error.message


def test_emit_to_a_file_and_to_text(tmp_path):
    pytest.importorskip("gacalc.export")
    session = Session(base_dir=str(tmp_path))
    ok(session, "vector a, b")
    code = ok(session, "emit python a /\\ b as wedge")[-1]
    assert isinstance(code, EmitResult) and "def wedge(a, b)" in code.code
    namespace = {}
    exec(compile(code.code, "<emitted>", "exec"), namespace)   # the test runs the output
    assert namespace["wedge"]([1, 0, 0], [0, 1, 0]) == (0, 0, 1)
    written = ok(session, 'emit c a b as ab to "ab.c"')[-1]
    assert written.path == str(tmp_path / "ab.c")
    assert "ab" in (tmp_path / "ab.c").read_text()
    assert written.text == f"wrote c to {tmp_path / 'ab.c'}"


def test_show_builds_a_report():
    pytest.importorskip("gacalc.forms")
    session = Session()
    shown = ok(session, "show rotor(e12, pi/3)")[-1]
    assert isinstance(shown, ShowResult) and shown.report is not None
    assert shown.text.strip()


def test_value_results_display_as_latex():
    pytest.importorskip("gacalc.export")
    result = ok(Session(), "theta e12")[-1]
    latex = result._repr_latex_()
    assert latex.startswith("$") and "theta" in latex and "e}_{12}" in latex


def test_notes_are_results_with_positions():
    results = ok(Session(), "x = 1\ny = t")
    note = [r for r in results if isinstance(r, NoteResult)][0]
    assert note.text == "note: t is a new scalar symbol" and note.line == 2


def test_no_user_text_reaches_eval_or_sympify(monkeypatch):
    import builtins

    import sympy

    def forbidden(*args, **kwargs):
        raise AssertionError("user text reached a string evaluator")

    monkeypatch.setattr(builtins, "eval", forbidden)
    monkeypatch.setattr(builtins, "exec", forbidden)
    monkeypatch.setattr(sympy, "sympify", forbidden)
    monkeypatch.setattr(sympy, "parse_expr", forbidden, raising=False)
    session = Session()
    results = session.run('vector a\n__import__("os")\nos.system("ls")\nx = a a + cos(t)')
    assert isinstance(results[-1], GacalcError)     # __import__ is not a name
    results = session.run("x = a a + cos(t) + sqrt(2) e12; check x == x")
    assert isinstance(results[-1], CheckResult) and results[-1].passed


def test_rebinding_a_declared_name_says_so_and_keeps_earlier_values():
    s = Session()
    results = ok(s, "scalar theta\nx = cos(theta)\ntheta = 2")
    notes = [r.text for r in results if r.kind == "note"]
    assert notes == ["note: theta was a declared scalar symbol and is now a value; values "
                     "computed before keep the symbol theta"]
    import sympy

    theta = sympy.Symbol("theta", real=True)
    assert s.get("x")[0] == sympy.cos(theta)        # x still holds the symbol
    assert ok(s, "cos(theta)")[-1].value[0] == sympy.cos(2)
    # a second assignment changes a plain value: nothing to say
    assert not [r for r in ok(s, "theta = 3") if r.kind == "note"]
    results = ok(s, "vector a\na = e1\nf(u) = u\nf = 2")
    notes = [r.text for r in results if r.kind == "note"]
    assert "note: a was a declared vector (a1, a2, a3) and is now a value; values computed " \
           "before keep its components" in notes
    assert "note: f was the function f(u) and is now a value" in notes


def test_assume_of_conditions_that_always_hold_says_only_that():
    s = Session()
    results = ok(s, "theta = 2\nassume theta > 0")
    assert [r.text for r in results if r.kind == "note"] == [
        "note: the condition theta > 0 always holds"]

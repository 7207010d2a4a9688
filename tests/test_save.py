"""Nothing lost: ``save`` writes a script that re-creates the session, atomically, and
never overwrites a file it did not write unless told to; a script run that stops at an
error has printed everything before the error."""

from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

import pytest

from gacalc.language import Session
from gacalc.language.errors import GacalcFileError
from gacalc.language.session import SAVE_HEADER

from conftest import ok

ROOT = Path(__file__).resolve().parents[1]

# A periscope's mirror pair and a gimbal: declarations (plain and unit), assignments,
# functions, assumptions, a used file, Greek names and values that depend on ans.
SESSION_SCRIPT = """\
vector n unit
vector a, b
bivector B
rotor R
scalar theta
m1 = e1 + e2
m2 = -e1 - e2
mirror(x, v) = -v x v^-1
image = mirror(mirror(a, m1), m2)
1 + 1
twice = ans * 2
g(t) = rotor(e12, t)
turned = rotate(g(θ), e1)
assume a . b = 0
α = 3/4 e3 + cos(theta) e12
"""


def state_of(session: Session):
    return (sorted(session.values), {k: f.text for k, f in session.functions.items()},
            session.declarations, session.unit_names,
            sorted(c.text for c in session.conditions))


def test_a_saved_session_reloads_with_equal_values(tmp_path):
    (tmp_path / "lib.gac").write_text("vector u\nw = u /\\ e3\n")
    original = Session(base_dir=str(tmp_path))
    ok(original, SESSION_SCRIPT + 'use "lib.gac"\n')
    result = ok(original, 'save "mirrors.gac"')[-1]
    saved = tmp_path / "mirrors.gac"
    # the statement shows the path it wrote
    assert result.kind == "file" and result.path == str(saved)
    assert str(saved) in result.text
    text = saved.read_text(encoding="utf-8")
    assert text.startswith(SAVE_HEADER)
    assert "α = 3/4 e3 + cos(theta) e12;" in text
    (tmp_path / "lib.gac").unlink()        # the saved script does not need the used file
    reloaded = Session(base_dir=str(tmp_path))
    ok(reloaded, 'use "mirrors.gac"')
    assert state_of(reloaded) == state_of(original)
    for name, value in original.values.items():
        assert reloaded.values[name].equals(value), name
    assert reloaded.get("twice").scalar_part() == 4
    # the reflection in two mirrors with normals m1, m2 = -m1 gives a back the same
    # (two reflections in one plane: common practice); and the unit condition holds
    assert reloaded.get("image").equals(reloaded.get("a"))
    assert ok(reloaded, "check n n == 1")[-1].passed
    assert ok(reloaded, "check a . b == 0")[-1].passed     # the assumption came back


def test_a_saved_session_is_a_script_the_command_line_runs(tmp_path):
    session = Session(base_dir=str(tmp_path))
    ok(session, SESSION_SCRIPT + 'save "s.gac"')
    completed = subprocess.run([sys.executable, "-m", "gacalc", "s.gac"], cwd=tmp_path,
                               env=_env(tmp_path), capture_output=True, text=True,
                               timeout=300)
    assert completed.returncode == 0, completed.stderr
    assert completed.stderr == ""


def test_reloading_does_not_rerun_side_effects(tmp_path):
    session = Session(base_dir=str(tmp_path))
    ok(session, 'x = e1\nemit python x to "x.py"\nshow x\nsave "s.gac"')
    (tmp_path / "x.py").unlink()
    text = (tmp_path / "s.gac").read_text()
    assert "emit" not in text and "show" not in text and "save" not in text
    ok(Session(base_dir=str(tmp_path)), 'use "s.gac"')
    assert not (tmp_path / "x.py").exists()


def test_save_refuses_to_overwrite_a_file_it_did_not_write(tmp_path):
    notes = tmp_path / "notes.txt"
    notes.write_text("my notes\n")
    session = Session(base_dir=str(tmp_path))
    ok(session, "x = e1")
    error = session.run('save "notes.txt"')[-1]
    assert isinstance(error, GacalcFileError)
    assert 'force' in error.message and str(notes) in error.message
    assert notes.read_text() == "my notes\n"
    # a hand-written script is protected too: only files saved by gacalc are replaced
    script = tmp_path / "mine.gac"
    script.write_text("vector a\ncheck a a == a . a\n")
    assert isinstance(session.run('save "mine.gac"')[-1], GacalcFileError)
    assert script.read_text().startswith("vector a")
    # the force form overwrites
    ok(session, 'save "notes.txt" force')
    assert notes.read_text().startswith(SAVE_HEADER)
    # a file saved by gacalc is replaced without force
    ok(session, "y = e2")
    ok(session, 'save "notes.txt"')
    assert "y = e2;" in notes.read_text()


def test_save_to_a_directory_or_a_missing_folder_is_a_file_error(tmp_path):
    session = Session(base_dir=str(tmp_path))
    (tmp_path / "folder").mkdir()
    error = session.run('save "folder"')[-1]
    assert isinstance(error, GacalcFileError) and "directory" in error.message
    error = session.run('save "missing/s.gac"')[-1]
    assert isinstance(error, GacalcFileError) and "missing" in error.message
    assert error.line == 1 and error.column == 6          # points at the path


def test_save_is_atomic(tmp_path, monkeypatch):
    session = Session(base_dir=str(tmp_path))
    ok(session, 'x = e1\nsave "s.gac"')
    target = tmp_path / "s.gac"
    old = target.read_text()
    ok(session, "y = e2")

    def failing_replace(source, destination):
        raise OSError(28, "No space left on device")

    monkeypatch.setattr(os, "replace", failing_replace)
    error = session.run('save "s.gac"')[-1]
    monkeypatch.undo()
    assert isinstance(error, GacalcFileError) and "No space left" in error.message
    assert target.read_text() == old                      # the old file is intact
    assert sorted(p.name for p in tmp_path.iterdir()) == ["s.gac"]   # no temporary left
    # and a successful save goes through a temporary file and os.replace
    replaced = []
    real_replace = os.replace

    def recording_replace(source, destination):
        replaced.append((os.path.dirname(source), destination))
        real_replace(source, destination)

    monkeypatch.setattr(os, "replace", recording_replace)
    ok(session, 'save "s.gac"')
    assert replaced == [(str(tmp_path), str(target))]
    assert "y = e2;" in target.read_text()


def test_save_keeps_the_usual_file_mode(tmp_path):
    session = Session(base_dir=str(tmp_path))
    ok(session, 'x = e1\nsave "s.gac"')
    umask = os.umask(0)
    os.umask(umask)
    assert (tmp_path / "s.gac").stat().st_mode & 0o777 == 0o666 & ~umask


def test_failed_statements_are_not_saved(tmp_path):
    session = Session(base_dir=str(tmp_path))
    ok(session, "x = e1")
    session.run("y = x / 0")
    session.run("z = (")
    ok(session, 'save "s.gac"')
    lines = (tmp_path / "s.gac").read_text().splitlines()
    assert lines[1:] == ["x = e1;"]


# A script that stops at an error has printed everything before it -------------------
def _env(tmp_path):
    env = dict(os.environ)
    env["PYTHONPATH"] = str(ROOT) + os.pathsep + env.get("PYTHONPATH", "")
    env["XDG_STATE_HOME"] = str(tmp_path / "state")
    env["XDG_DATA_HOME"] = str(tmp_path / "data")
    env["NO_COLOR"] = "1"
    return env


def test_a_script_stopped_by_an_error_printed_everything_before_it(tmp_path):
    script = tmp_path / "periscope.gac"
    script.write_text("m1 = e1 + e2\n"
                      "check m1 m1 == 2\n"
                      "m1 /\\ e3\n"
                      "emit latex m1\n"
                      "broken = m1 / (e1 - e1)\n"
                      "after = 1\n")
    completed = subprocess.run([sys.executable, "-m", "gacalc", "periscope.gac"],
                               cwd=tmp_path, env=_env(tmp_path), stdout=subprocess.PIPE,
                               stderr=subprocess.STDOUT, text=True, timeout=300)
    assert completed.returncode == 2
    out = completed.stdout
    # (e1 + e2) /\ e3 = e13 + e23 = e23 - e31
    expected_in_order = ["m1 = e1 + e2", "held: check m1 m1 == 2", "e23 - e31",
                         "\\mathbf{e}_{1}", "periscope.gac:5:16: division by zero"]
    positions = [out.find(piece) for piece in expected_in_order]
    assert all(p >= 0 for p in positions), out
    assert positions == sorted(positions), out       # results first, then the error
    assert "after" not in out and "Traceback" not in out

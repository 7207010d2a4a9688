"""Every shipped demo script runs cleanly (exit status 0, its summary line, no failed
check), and the README shows what gacalc really does: its transcripts are replayed and
every row of its table of built-in functions is checked."""

import io
import re
import shlex
from pathlib import Path

import pytest

from gacalc.examples import DEMO_ORDER, example_paths, summary_of
from gacalc.runner import EXIT_OK, RunOptions, ScriptRunner

SUMMARY = re.compile(r"^(\d+) passed, (\d+) failed$")


def test_the_four_demos_are_shipped():
    names = [path.stem for path in example_paths()]
    assert names[:4] == list(DEMO_ORDER)
    for path in example_paths():
        assert summary_of(path), f"{path.name} starts with a one-line summary comment"


@pytest.mark.parametrize("path", example_paths(), ids=lambda p: p.name)
def test_example_runs_and_every_check_holds(path):
    out, err = io.StringIO(), io.StringIO()
    tally = ScriptRunner(RunOptions(), out=out, err=err).run_file(str(path))
    assert err.getvalue() == ""
    assert tally.exit_status() == EXIT_OK, out.getvalue()
    last = out.getvalue().splitlines()[-1]
    match = SUMMARY.match(last)
    assert match, last
    assert int(match.group(1)) >= 3 and match.group(2) == "0"
    assert "FAILED" not in out.getvalue() and "undecided" not in out.getvalue()
    assert "internal error" not in out.getvalue()


def test_demos_end_with_checks():
    # "each ending with checks that hold": the last statement of every demo is a check
    for path in example_paths():
        statements = [line for line in path.read_text(encoding="utf-8").splitlines()
                      if line.strip() and not line.lstrip().startswith("#")]
        assert statements[-1].startswith("check "), path.name


# The README: its transcripts and its table of built-in functions are what gacalc does.

README = Path(__file__).resolve().parents[1] / "README.md"


def _code_blocks(text):
    """Indented (4-space) code blocks of the README, as lists of lines."""
    blocks, current = [], []
    for line in text.splitlines():
        if line.startswith("    ") or (current and not line.strip()):
            current.append(line[4:])
        else:
            if current:
                blocks.append(current)
            current = []
    if current:
        blocks.append(current)
    return [[line for line in block] for block in blocks]


def _strip_blank_tail(lines):
    while lines and not lines[-1].strip():
        lines = lines[:-1]
    return lines


def _gacalc(args, stdin="", cwd=None):
    """stdout + stderr lines of ``python -m gacalc`` in a fresh process: the order of
    terms in printed sums follows the order symbols first appeared in the process, so
    transcripts are compared in a process of their own."""
    import os
    import subprocess
    import sys

    root = str(README.parent)
    env = dict(os.environ, PYTHONPATH=root + os.pathsep + os.environ.get("PYTHONPATH", ""))
    env.pop("NO_COLOR", None)
    done = subprocess.run([sys.executable, "-m", "gacalc", "--ascii", *args], input=stdin,
                          capture_output=True, text=True, encoding="utf-8", timeout=120,
                          env=env, cwd=cwd or root)
    return done.stdout.splitlines() + done.stderr.splitlines()


def test_readme_repl_transcripts_are_what_gacalc_prints():
    blocks = [b for b in _code_blocks(README.read_text(encoding="utf-8"))
              if b and b[0].startswith("cl3: ")]
    assert len(blocks) >= 2
    checked = 0
    for block in blocks:
        if any("emit " in line for line in block):
            continue          # writes files and machine-dependent paths: see test_cli
        block = _strip_blank_tail(block)
        statements = [line[len("cl3: "):] for line in block if line.startswith("cl3: ")]
        expected = [line for line in block if not line.startswith("cl3: ")]
        # piped statements run as a script: the same results, no prompts
        assert _gacalc([], stdin="\n".join(statements) + "\n") == expected, block[0]
        checked += len(statements)
    assert checked >= 8


def test_readme_command_transcripts_are_what_gacalc_prints(tmp_path):
    blocks = _code_blocks(README.read_text(encoding="utf-8"))
    scripts = {block[0].split(":")[0].lstrip("# "): "\n".join(block) + "\n"
               for block in blocks if block and block[0].startswith("# ")
               and block[0].split(":")[0].endswith(".gac")}
    assert "mirrors.gac" in scripts
    for name, text in scripts.items():
        (tmp_path / name).write_text(text, encoding="utf-8")
    transcripts = [_strip_blank_tail(b) for b in blocks if b and b[0].startswith("$ gacalc")]
    assert len(transcripts) >= 3
    for block in transcripts:
        args = shlex.split(block[0][len("$ gacalc"):])
        assert _gacalc(args, cwd=tmp_path) == block[1:], block[0]


def _builtin_rows():
    text = README.read_text(encoding="utf-8")
    table = text.split("<!-- builtins:", 1)[1].split("\n\n", 1)[0]
    rows = []
    for line in table.splitlines()[3:]:
        cells = [cell.strip() for cell in line.strip().strip("|").split(" | ")]
        rows.append([cell.strip("`") for cell in cells])
    return rows


def test_readme_lists_every_builtin_function():
    from gacalc.language.builtins import BUILTINS

    listed = set()
    for row in _builtin_rows():
        for signature in row[0].split("`, `"):
            listed.add(signature.split("(")[0])
    assert listed == set(BUILTINS)


def test_readme_builtin_examples_give_the_values_shown():
    """Each value cell is exactly what gacalc prints, and it reads back as the value."""
    from gacalc.language import GacalcError, Session

    for function, meaning, example, value in _builtin_rows():
        session = Session()
        results = session.run(example)
        assert not isinstance(results[-1], GacalcError), (example, results[-1])
        assert results[-1].text == value, example
        if example.startswith("numeric("):
            continue    # floating point: the decimal digits are not the binary value
        outcome = Session().run(f"check {example} == {value}")[-1]
        assert getattr(outcome, "outcome", None) == "holds", (example, value, outcome)


def test_readme_export_block_runs_and_the_python_works(tmp_path):
    import importlib.util
    import math

    from gacalc.language import GacalcError, Session

    block = next(b for b in _code_blocks(README.read_text(encoding="utf-8"))
                 if b and b[0].startswith("cl3: ") and any("emit " in line for line in b))
    statements = [line[len("cl3: "):] for line in block if line.startswith("cl3: ")]
    session = Session(base_dir=str(tmp_path))
    # the names the tutorial defined before this block
    prelude = "vector a, b\nscalar theta\nR = rotor(e12, theta)\n"
    results = session.run(prelude + "\n".join(statements))
    assert not any(isinstance(r, GacalcError) for r in results), results[-1]
    spec = importlib.util.spec_from_file_location("turn", tmp_path / "turn.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    # a quarter turn about e3 takes e1 to e2 (right-hand rule, DESIGN.md conventions)
    x, y, z = module.turn((1.0, 0.0, 0.0), (0.0, 0.0, 1.0), math.pi / 2)
    assert (round(x, 12), round(y, 12), round(z, 12)) == (0.0, 1.0, 0.0)

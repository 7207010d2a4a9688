"""`gacalc --emit-dir DIR`: a script's emits go to files (the CLI form of `emit ... to`)."""

import os
import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent


def run(args, cwd):
    env = {**os.environ, "PYTHONPATH": str(ROOT)}
    return subprocess.run([sys.executable, "-m", "gacalc", *args], cwd=cwd, env=env,
                          capture_output=True, text=True, timeout=120)


def test_every_emit_becomes_a_file(tmp_path):
    script = tmp_path / "kernel.gac"
    script.write_text('vector a, b\nemit c a b as wedge_ab\nemit latex components a /\\ b\nemit python a b to "sub/ab.py"\n')
    (tmp_path / "out" / "sub").mkdir(parents=True)
    done = run(["--emit-dir", "out", str(script)], tmp_path)
    assert done.returncode == 0, done.stderr
    c_text = (tmp_path / "out" / "wedge_ab.c").read_text()
    assert "void wedge_ab(" in c_text
    assert (tmp_path / "out" / "gacalc_value.tex").read_text().strip().startswith("\\begin")
    # the written Python runs and gives a b for two concrete vectors (e1 e2 = e12)
    namespace = {}
    exec(compile((tmp_path / "out" / "sub" / "ab.py").read_text(), "ab.py", "exec"), namespace)
    fn = next(v for k, v in namespace.items() if callable(v) and not k.startswith("_"))
    assert list(fn([1, 0, 0], [0, 1, 0])) == [0, 0, 0, 1]  # components 1, e23, e31, e12
    assert "wrote c to" in done.stdout


def test_a_missing_folder_under_emit_dir_is_a_plain_error(tmp_path):
    done = run(["--emit-dir", "out", "-e", 'vector a\nemit c a to "no/such/a.c"'], tmp_path)
    assert done.returncode == 2
    assert "cannot write" in done.stderr and "Traceback" not in done.stderr + done.stdout

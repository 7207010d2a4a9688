"""``gacalc -j N FILE...``: script files in parallel processes give the sequential output,
byte for byte on stdout and on stderr, and the same exit status (the worst file wins)."""

import os
import signal
import subprocess
import sys
import time
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]
SUBPROCESS_TIMEOUT = 180

# A periscope's mirror pair: two reflections make a rotation (common practice: the
# composition of two reflections in planes at angle a/2 is a rotation by a).
PERISCOPE = """\
n1 = e1
n2 = (e1 + e2)/sqrt(2)
v = 3 e1 + 2 e2 + e3
check reflect(reflect(v, n1), n2) == rotate(rotor(e12, pi/2), v)
rotor(e12, pi/2)
"""
# a check that fails: e1 and e2 anticommute (DESIGN.md conventions), they do not commute
FAILING = """\
check e1 e1 == 1
check e1 e2 == e2 e1
check e2 e2 == 1
"""
# an error in the middle of a file: the statements before it have run, the rest not
ERRORING = """\
x = e1 + e2
x x
y = x +
check e1 == e1
"""
GIMBAL = """\
scalar a, b
R = rotor(e12, a) rotor(e23, b)
check R R~ == 1
rotate(rotor(e12, a), e1)
"""
# (no show here: its sections have time budgets, so under load its text may vary between
# two runs whatever -j does)
UNICODE = "theta = pi/3\nrotor(e12, theta)\nvector a\na /\\ e1\n"


def _files(tmp_path, named):
    paths = []
    for name, text in named:
        path = tmp_path / name
        path.write_text(text, encoding="utf-8")
        paths.append(name)
    return paths


def gacalc(args, cwd):
    """Run ``python -m gacalc`` as a separate program; (status, stdout bytes, stderr bytes)."""
    environment = dict(os.environ)
    environment["PYTHONPATH"] = str(ROOT) + os.pathsep + environment.get("PYTHONPATH", "")
    environment.pop("NO_COLOR", None)
    done = subprocess.run([sys.executable, "-m", "gacalc", *args], capture_output=True,
                          timeout=SUBPROCESS_TIMEOUT, env=environment, cwd=cwd)
    return done.returncode, done.stdout, done.stderr


def test_two_jobs_print_what_one_job_prints(tmp_path):
    names = _files(tmp_path, [("periscope.gac", PERISCOPE), ("failing.gac", FAILING),
                              ("erroring.gac", ERRORING), ("gimbal.gac", GIMBAL),
                              ("unicode.gac", UNICODE)])
    for mode in ("--ascii", "--unicode"):
        sequential = gacalc([mode, *names], tmp_path)
        parallel = gacalc([mode, "-j", "2", *names], tmp_path)
        assert parallel == sequential
        status, out, err = parallel
        assert status == 2                                  # the error is the worst
        text = out.decode("utf-8")
        assert text.index("== periscope.gac ==") < text.index("== failing.gac ==") \
            < text.index("== erroring.gac ==") < text.index("== gimbal.gac ==")
        assert text.rstrip().endswith("all 5 files: 4 passed, 1 failed")
        assert err.decode("utf-8").startswith("erroring.gac:4:")


def test_more_jobs_than_files_and_a_missing_file(tmp_path):
    names = _files(tmp_path, [("periscope.gac", PERISCOPE), ("gimbal.gac", GIMBAL)])
    names.insert(1, "missing.gac")
    sequential = gacalc(names, tmp_path)
    assert gacalc(["-j", "8", *names], tmp_path) == sequential
    assert sequential[0] == 2 and b"missing.gac" in sequential[2]


@pytest.mark.parametrize("named, status", [
    ([("periscope.gac", PERISCOPE), ("gimbal.gac", GIMBAL)], 0),
    ([("periscope.gac", PERISCOPE), ("failing.gac", FAILING)], 1),
    ([("failing.gac", FAILING), ("erroring.gac", ERRORING)], 2),
])
def test_exit_status_is_the_worst_file(tmp_path, named, status):
    names = _files(tmp_path, named)
    assert gacalc(["-j", "2", *names], tmp_path)[0] == status
    assert gacalc(names, tmp_path)[0] == status


def test_one_job_is_the_sequential_run(tmp_path):
    names = _files(tmp_path, [("periscope.gac", PERISCOPE), ("failing.gac", FAILING)])
    assert gacalc(["-j", "1", *names], tmp_path) == gacalc(names, tmp_path)


def test_jobs_must_be_a_positive_count(tmp_path):
    names = _files(tmp_path, [("periscope.gac", PERISCOPE)])
    status, out, err = gacalc(["-j", "0", *names], tmp_path)
    assert status == 2 and b"-j/--jobs" in err and b"Traceback" not in err


def test_ctrl_c_stops_the_workers(tmp_path):
    # a file far longer than the test waits for: it is interrupted, never finished
    slow = "multivector A, B\n" + "show A B\n" * 400
    names = _files(tmp_path, [("slow1.gac", slow), ("slow2.gac", slow)])
    environment = dict(os.environ, PYTHONPATH=str(ROOT))

    def default_sigint():            # a shell's background job may ignore SIGINT
        os.setsid()
        signal.signal(signal.SIGINT, signal.SIG_DFL)

    process = subprocess.Popen([sys.executable, "-m", "gacalc", "-j", "2", *names],
                               stdout=subprocess.PIPE, stderr=subprocess.PIPE,
                               cwd=tmp_path, env=environment, preexec_fn=default_sigint)
    try:
        # the parent prints the first heading once the workers exist
        assert process.stdout.readline() == b"== slow1.gac ==\n"
        os.killpg(process.pid, signal.SIGINT)
        out, err = process.communicate(timeout=SUBPROCESS_TIMEOUT)
    finally:
        if process.poll() is None:
            os.killpg(process.pid, signal.SIGKILL)
            process.wait()
    assert process.returncode == 130
    assert err.decode().strip().endswith("interrupted") and b"Traceback" not in err
    # the pool is joined before the program exits: no worker is left in its group
    with pytest.raises(ProcessLookupError):
        os.killpg(process.pid, 0)


def test_flags_pass_through_to_the_workers(tmp_path):
    # the budget statement prints the budget each worker's session received
    names = _files(tmp_path, [("one.gac", "budget\n"), ("two.gac", "budget\nx = 1/0\n")])
    sequential = gacalc(["--statement-budget", "7", *names], tmp_path)
    parallel = gacalc(["--statement-budget", "7", "-j", "2", *names], tmp_path)
    assert parallel == sequential
    assert parallel[1].decode().count("each statement may run 7 s") == 2
    assert parallel[0] == 2

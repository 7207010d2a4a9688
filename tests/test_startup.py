"""Start-up: a rational statement runs without importing sympy or the REPL's libraries.

`gacalc -e 'e1 e2'` is run as its own program with a small wrapper that reports which
heavy libraries ended up in sys.modules.  The values printed are checked against the
conventions of DESIGN.md and tests/ga_reference.py (an independent numpy Cl(3,0)), and the
first statement that does need sympy must still work in the same process.  No timing
here: the start-up time is measured by `python scripts/bench.py --only startup`.
"""

import json
import os
import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest

import ga_reference as ref
from gacalc.algebra.conversion import to_numpy
from gacalc.api import Session
from gacalc.lazy import LazyModule, loaded

ROOT = Path(__file__).resolve().parents[1]
HEAVY = ("sympy", "mpmath", "prompt_toolkit", "pygments", "IPython", "matplotlib", "numpy")

# Runs `python -m gacalc ARGS` (the same module the command runs) and then reports, on a
# last stderr line, the heavy libraries that were imported.  PRELOAD names modules to
# import first (the path with sympy already in memory, for comparison).
WRAPPER = """
import json, os, runpy, sys
for name in filter(None, os.environ.get("PRELOAD", "").split(",")):
    __import__(name)
sys.argv = ["gacalc", *json.loads(sys.argv[1])]
status = 0
try:
    runpy.run_module("gacalc", run_name="__main__", alter_sys=True)
except SystemExit as stop:
    status = stop.code or 0
heavy = %r
sys.stdout.flush()
print("LOADED " + json.dumps(sorted({m.split(".")[0] for m in sys.modules} & set(heavy))),
      file=sys.stderr)
sys.exit(status)
""" % (HEAVY,)


def run_gacalc(*args, preload=()):
    """(status, stdout, stderr without the report line, heavy modules loaded)."""
    environment = dict(os.environ, PRELOAD=",".join(preload))
    environment["PYTHONPATH"] = str(ROOT) + os.pathsep + environment.get("PYTHONPATH", "")
    environment.pop("NO_COLOR", None)
    done = subprocess.run([sys.executable, "-c", WRAPPER, json.dumps(list(args))],
                          capture_output=True, text=True, encoding="utf-8", timeout=120,
                          env=environment, cwd=ROOT)
    *errors, report = done.stderr.rstrip("\n").split("\n")
    assert report.startswith("LOADED "), done.stderr
    return done.returncode, done.stdout, "\n".join(errors), json.loads(report[7:])


# Rational statements and what they print.  Sources: DESIGN.md's conventions (basis order,
# e1 e2 = e12, dual(A) = A I^-1, 1-based list indexing, the check summary line); for a
# vector v, v v = |v|^2 and v^-1 = v/|v|^2 (common practice).
RATIONAL = [
    ("e1 e2", ["e12"]),
    ("2 e1 + 3/4 e23", ["2*e1 + 3/4*e23"]),
    ("(e1 + 2 e2)^3", ["5*e1 + 10*e2"]),            # (e1 + 2 e2)^2 = 5
    ("1/(e1 + e2)", ["1/2*e1 + 1/2*e2"]),           # v / |v|^2
    ("(1 + e12)^-1", ["1/2 - 1/2*e12"]),             # (1 + e12)(1 - e12) = 1 - e12^2 = 2
    ("e1^-1", ["e1"]),
    ("(3/2)^-3 e1", ["8/27*e1"]),
    ("comm(e1, e2) + anticomm(e1, e2)", ["e12"]),    # (ab - ba)/2 + (ab + ba)/2 = ab
    ("dual(e1)", ["-e23"]),                         # e1 (-e123) = -e23
    ("grade(e1 + e12, 1)", ["e1"]),
    ("(e1, e2)[2]", ["e2"]),
    ("check e1 e2 == -e2 e1", ["held: check e1 e2 == -e2 e1", "1 passed, 0 failed"]),
]


@pytest.mark.parametrize("statement, expected", RATIONAL, ids=[s for s, _ in RATIONAL])
def test_rational_statement_imports_nothing_heavy(statement, expected):
    status, out, err, heavy = run_gacalc("-e", statement)
    assert status == 0, err
    assert heavy == []
    assert out.splitlines() == expected


def test_products_of_rational_multivectors_match_the_reference_without_sympy():
    # (1/3 e1 - 5/7 e123)(e2 + 2/3) and the square of 1/2 e1 + e12, printed by a process
    # that never imports sympy, read back here and compared with tests/ga_reference.py
    statements = ["(1/3 e1 - 5/7 e123) (e2 + 2/3)", "x = 1/2 e1 + e12; x x"]
    a = ref.mv(e1=1 / 3, e123=-5 / 7)
    b = ref.mv(e2=1, s=2 / 3)
    x = ref.mv(e1=1 / 2, e12=1)
    expected = [ref.gp(a, b), ref.gp(x, x)]
    session = Session()
    for statement, want in zip(statements, expected):
        status, out, err, heavy = run_gacalc("-e", statement)
        assert status == 0 and heavy == [], (err, heavy)
        printed = out.splitlines()[-1].split(" = ")[-1]
        value = session.evaluate(printed)
        assert np.allclose(to_numpy(value), want), (printed, want)


def test_output_is_the_same_with_sympy_already_imported():
    statements = [s for s, _ in RATIONAL] + ["x = 1/2 e1 + e12; x x; x^2; -x; x^0",
                                             "e1 +", "e1 e4"]
    args = [arg for s in statements for arg in ("-e", s)]
    light = run_gacalc(*args)
    with_sympy = run_gacalc(*args, preload=("sympy",))
    assert light[3] == [] and "sympy" in with_sympy[3]
    assert light[:3] == with_sympy[:3]


def test_an_error_is_reported_without_importing_sympy():
    status, out, err, heavy = run_gacalc("-e", "e1 +")
    assert status == 2 and heavy == []
    assert err.splitlines()[0] == ("<command line>:1:5: expected an operand after '+', "
                                   "found the end of the input")


def test_a_script_file_of_rational_checks_imports_nothing_heavy(tmp_path):
    script = tmp_path / "mirrors.gac"
    # two mirrors e1 and e2 compose to the half turn e1 e2 = e12 in their plane, whose
    # square is -1 (common practice)
    script.write_text("turn = e1 e2\ncheck turn turn == -1\ncheck turn^2 == -1\n",
                      encoding="utf-8")
    status, out, err, heavy = run_gacalc(str(script))
    assert status == 0, err
    assert heavy == []
    assert out.splitlines()[-1] == "2 passed, 0 failed"


def test_the_first_statement_needing_sympy_still_works_in_the_same_process():
    status, out, err, heavy = run_gacalc("-e", "e1 e2\nsin(t) e1\nsqrt(2) e2")
    assert status == 0, err
    assert "sympy" in heavy and "prompt_toolkit" not in heavy and "pygments" not in heavy
    assert out.splitlines() == ["e12", "note: t is a new scalar symbol",
                                "sin(t)*e1", "sqrt(2)*e2"]


# The lazy stand-in itself ------------------------------------------------------------
def test_lazy_module_passes_reads_and_writes_to_the_module():
    fractions = LazyModule("fractions")
    assert fractions.Fraction(1, 2) == 0.5
    stand_in = LazyModule("types", "SimpleNamespace")
    assert stand_in.__name__ == "SimpleNamespace"
    assert loaded("fractions") and not loaded("no_such_module_for_gacalc")


def test_lazy_module_sees_a_monkeypatched_module(monkeypatch):
    # nothing is cached in the stand-in: the sandbox tests patch sympy.sympify this way
    import json as real

    stand_in = LazyModule("json")
    monkeypatch.setattr(real, "dumps", lambda value: "patched")
    assert stand_in.dumps(1) == "patched"


def test_stand_ins_are_replaced_by_the_module_once_it_is_imported():
    # after the first use, module globals hold sympy itself (reads at full speed)
    code = ("import sys\nimport gacalc.algebra.coefficients as c\nimport gacalc.algebra.signs as s\n"
            "before = type(c.sympy).__name__, type(s.iv).__name__\n"
            "c.sympy.Integer(2); s.iv.prec\n"
            "from gacalc.lazy import sympy as later\n"
            "print(before, c.sympy is sys.modules['sympy'], type(s.iv).__name__, "
            "later is sys.modules['sympy'])\n")
    environment = dict(os.environ, PYTHONPATH=str(ROOT))
    done = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                          timeout=120, env=environment, cwd=ROOT)
    assert done.returncode == 0, done.stderr
    assert done.stdout.split() == ["('LazyModule',", "'LazyModule')", "True",
                                   "MPIntervalContext", "True"]

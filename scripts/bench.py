#!/usr/bin/env python3
"""Benchmarks: gacalc against plain-sympy routes, run side by side in one process.

Each case runs gacalc through ``Session.run`` (the user's own path, printed text included)
and a baseline written with plain sympy, alternating A B A B with sympy's cache cleared
between runs; medians are reported.  Lines printed (the last one is the summary):

    ratio products k=K: X        chained products of k general symbolic multivectors
    ratio rotor: X               R x R~ simplified under the unit condition
    ratio script: X              200 identity checks through the script runner (target 20×)
    startup: X × import sympy    whole-process time of `gacalc -e 'e1 e2'` (target 0.8×)
    latency median: X ms (...)   typical REPL statements through the Session API
    memory: X × import sympy     peak RSS of running every demo script
    rotor kernel ops (...)       operation counts of the emitted R x R~ kernel (export)
    recognition: ...             `formula EXPR` against plain `EXPR` (ratio) for the handbook
                                 identities, and the slowest case in ms (target: 200 ms)
    show: ...                    wall time of one `show` of a general product, (a+b)^6, a
                                 symbolic rotor and a cube (targets 1 s for the product,
                                 2 s for the others)
    jobs: X × faster             `gacalc -j 2` on eight script files against one after the
                                 other (wall time of the whole command; 2 cores: at most 2×)
    min ratio: X                 the smallest product ratio for k = 3..5

Usage: python scripts/bench.py [--quick] [--only NAME[,NAME]]   (names: see --help)
"""

from __future__ import annotations

import argparse
import os
import random
import statistics
import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

import sympy as sp  # noqa: E402
from sympy.core.cache import clear_cache  # noqa: E402

BASIS = ("1", "e1", "e2", "e3", "e23", "e31", "e12", "e123")
SUFFIX = ("0", "1", "2", "3", "23", "31", "12", "123")


# --------------------------------------------------------------------------- timing


def timed(fn):
    clear_cache()
    t0 = time.perf_counter()
    fn()
    return time.perf_counter() - t0


def side_by_side(a, b, repeats):
    """Median seconds of a and b, run alternately."""
    ta, tb = [], []
    for _ in range(repeats):
        ta.append(timed(a))
        tb.append(timed(b))
    return statistics.median(ta), statistics.median(tb)


def new_session():
    from gacalc.language.session import Session

    return Session()


def run_ok(session, text):
    results = session.run(text)
    for r in results:
        if getattr(r, "error", None) is not None or type(r).__name__.endswith("Error"):
            raise RuntimeError(f"gacalc failed on {text!r}: {r}")
    return results


# --------------------------------------------------------------------------- Pauli baseline

S1 = sp.Matrix([[0, 1], [1, 0]])
S2 = sp.Matrix([[0, -sp.I], [sp.I, 0]])
S3 = sp.Matrix([[1, 0], [0, -1]])
ID = sp.eye(2)
PAULI_BASIS = (ID, S1, S2, S3, S2 * S3, S3 * S1, S1 * S2, sp.I * ID)


def pauli_of(components):
    m = sp.zeros(2, 2)
    for c, b in zip(components, PAULI_BASIS):
        m += c * b
    return m


def components_of_pauli(m):
    """Back to the 8 real components: c_k = Re tr(B_k^-1 M) / 2 with real symbols."""
    out = []
    for b in PAULI_BASIS:
        t = sp.expand((b.inv() * m).trace() / 2)
        out.append(sp.expand(sp.re(t)))
    return out


def symbolic_components(name):
    return [sp.Symbol(name + s, real=True) for s in SUFFIX]


# --------------------------------------------------------------------------- cases


def case_products(k, repeats):
    names = [chr(ord("A") + i) for i in range(k)]
    text = "multivector " + ", ".join(names) + "\n" + " ".join(names)

    def ours():
        s = new_session()
        res = run_ok(s, text)
        assert res[-1].text

    def baseline():
        m = pauli_of(symbolic_components(names[0]))
        for n in names[1:]:
            m = (m * pauli_of(symbolic_components(n))).applyfunc(sp.expand)
        comps = components_of_pauli(m)
        " + ".join(f"({c})*{b}" for c, b in zip(comps, BASIS))

    return side_by_side(ours, baseline, repeats)


def case_rotor(repeats):
    text = "vector n unit\nvector x\nR = rotor(n, theta)\nR x R~"

    def ours():
        s = new_session()
        res = run_ok(s, text)
        assert "cos(theta)" in res[-1].text and "theta/2" not in res[-1].text

    def baseline():
        from sympy.algebras.quaternion import Quaternion

        th = sp.Symbol("theta", real=True)
        n1, n2, n3, x1, x2, x3 = sp.symbols("n1 n2 n3 x1 x2 x3", real=True)
        q = Quaternion(sp.cos(th / 2), n1 * sp.sin(th / 2), n2 * sp.sin(th / 2), n3 * sp.sin(th / 2))
        out = Quaternion.rotate_point((x1, x2, x3), q)
        unit = [n1**2 + n2**2 + n3**2 - 1]
        simplified = []
        for c in out:
            c = sp.trigsimp(sp.expand(c))
            num, den = sp.fraction(sp.together(c))
            # reduce modulo the unit condition, the other symbols and trig as coefficients
            num = sp.reduced(sp.expand(num), unit, n1, n2, n3, domain="EX")[1]
            den = sp.reduced(sp.expand(den), unit, n1, n2, n3, domain="EX")[1]
            simplified.append(sp.trigsimp(num / den))
        str(simplified)

    return side_by_side(ours, baseline, repeats)


def identity_script(count=200, seed=7):
    """A deterministic script of identity checks, and the same identities for Pauli matrices.

    The Pauli side is a list of callables so that building the products is timed too."""
    rng = random.Random(seed)
    lines = ["vector a, b, c", "multivector M, N"]
    pauli_cases = []

    def rv():
        return [sp.Rational(rng.randint(-9, 9), rng.randint(1, 5)) for _ in range(8)]

    def M():
        return pauli_of(symbolic_components("M"))

    def N():
        return pauli_of(symbolic_components("N"))

    def vec(name):
        return pauli_of([0, *symbolic_components(name)[1:4], 0, 0, 0, 0])

    templates = ["assoc", "rev", "vecsplit", "inverse", "dist"]
    for i in range(count):
        kind = templates[i % len(templates)]
        A, B = rv(), rv()
        la, lb = (" + ".join(f"({x})*{b}" if b != "1" else f"({x})" for x, b in zip(v, BASIS)) for v in (A, B))
        if kind == "assoc":
            lines.append(f"check ({la}) (({lb}) M) == (({la}) ({lb})) M")
            pauli_cases.append(lambda A=A, B=B: (pauli_of(A) * (pauli_of(B) * M()), (pauli_of(A) * pauli_of(B)) * M()))
        elif kind == "rev":
            lines.append(f"check (({la}) M)~ == M~ ({la})~")
            pauli_cases.append(lambda A=A: ((pauli_of(A) * M()).H, M().H * pauli_of(A).H))
        elif kind == "vecsplit":
            lines.append("check a b == a . b + a /\\ b")
            pauli_cases.append(lambda: (vec("a") * vec("b"), (vec("a") * vec("b") + vec("b") * vec("a")) / 2
                                        + (vec("a") * vec("b") - vec("b") * vec("a")) / 2))
        elif kind == "inverse":
            lines.append(f"check ({la}) ({la})^-1 == 1")
            pauli_cases.append(lambda A=A: (pauli_of(A) * pauli_of(A).inv(), ID))
        else:
            lines.append(f"check ({la}) (M + N) == ({la}) M + ({la}) N")
            pauli_cases.append(lambda A=A: (pauli_of(A) * (M() + N()), pauli_of(A) * M() + pauli_of(A) * N()))
    return "\n".join(lines) + "\n", pauli_cases


def case_script(repeats):
    text, pauli_cases = identity_script()
    # both sides' libraries are imported before timing (sympy at the top of this file):
    # start-up has a case of its own
    import io

    import gacalc.language.session  # noqa: F401  (the runner imports it on first use)
    from gacalc.runner import ScriptRunner

    def ours():
        out = io.StringIO()
        tally = ScriptRunner(out=out, err=out).run_text(text, "bench.gac")
        assert tally.exit_status() == 0 and tally.passed == len(pauli_cases), out.getvalue()[-600:]

    def baseline():
        for case in pauli_cases:
            lhs, rhs = case()
            assert (lhs - rhs).applyfunc(sp.expand) == sp.zeros(2, 2)

    return side_by_side(ours, baseline, repeats)


def wall(cmd, repeats):
    times = []
    for _ in range(repeats):
        t0 = time.perf_counter()
        subprocess.run(cmd, check=True, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
        times.append(time.perf_counter() - t0)
    return statistics.median(times)


def wall_side_by_side(a, b, repeats):
    """Median wall seconds of two commands, run alternately."""
    ta, tb = [], []
    for _ in range(repeats):
        ta.append(wall(a, 1))
        tb.append(wall(b, 1))
    return statistics.median(ta), statistics.median(tb)


def case_startup(repeats):
    py = sys.executable
    return wall_side_by_side([py, "-m", "gacalc", "-e", "e1 e2"], [py, "-c", "import sympy"],
                             repeats)


# `show` of values the language builds in one statement: (label, setup, value, target s)
SHOW_CASES = (
    ("A B", "multivector A, B", "A B", 1.0),
    ("(a+b)^6", "vector a, b", "(a+b)^6", 2.0),
    ("rotor R", "rotor R", "R", 2.0),
    ("R^3", "multivector R", "R^3", 2.0),
)


def case_show(repeats):
    """{label: (median seconds of `show VALUE`, the plain `VALUE`, target seconds)}: each in
    a session where the setup has run; the plain value is the baseline side by side."""
    out = {}
    for label, setup, value, target in SHOW_CASES:
        shows, plains = [], []
        for _ in range(repeats):
            s = new_session()
            run_ok(s, setup)
            shows.append(timed(lambda: run_ok(s, "show " + value)))
            s = new_session()
            run_ok(s, setup)
            plains.append(timed(lambda: run_ok(s, value)))
        out[label] = (statistics.median(shows), statistics.median(plains), target)
    return out


def case_jobs(repeats, files=8, checks=100):
    """(sequential s, -j 2 s): eight script files of identity checks, whole commands."""
    import tempfile

    with tempfile.TemporaryDirectory() as folder:
        paths = []
        for k in range(files):
            path = Path(folder) / f"checks{k}.gac"
            path.write_text(identity_script(checks, seed=100 + k)[0], encoding="utf-8")
            paths.append(str(path))
        py = sys.executable
        return wall_side_by_side([py, "-m", "gacalc", *paths],
                                 [py, "-m", "gacalc", "-j", "2", *paths], repeats)


LATENCY_CASES = {
    "declare": ("", "vector a, b, c"),
    "product": ("vector a, b, c", "a b"),
    "wedge3": ("vector a, b, c", "a /\\ b /\\ c"),
    "show rotor": ("R = rotor(e12, theta)", "show R"),
    "unit check": ("vector n unit", "check n n == 1"),
}


def case_latency(repeats):
    out = {}
    for label, (setup, stmt) in LATENCY_CASES.items():
        times = []
        for _ in range(repeats):
            s = new_session()
            if setup:
                run_ok(s, setup)
            times.append(timed(lambda: run_ok(s, stmt)))
        out[label] = statistics.median(times) * 1000
    return out


RECOGNITION_SETUP = "vector a, b, c, d\nvector m, n unit\nscalar t"
RECOGNITION_CASES = {
    "BAC-CAB": "a _| (b /\\ c)",
    "Lagrange": "norm2(cross(a, b))",
    "scalar quadruple": "cross(a, b) . cross(c, d)",
    "vector quadruple": "cross(cross(a, b), cross(c, d))",
    "Rodrigues": "rotate(rotor(n, t), a)",
    "bivector inverse": "inverse(a /\\ b)",
    "two reflections": "reflect(reflect(a, m), n)",
}


def case_recognition(repeats):
    """{label: (formula ms, plain ms)}: the statement `formula EXPR` against `EXPR`, the
    same value without recognition, side by side in one session each."""
    out = {}
    for label, expr in RECOGNITION_CASES.items():
        s = new_session()
        run_ok(s, RECOGNITION_SETUP)
        run_ok(s, expr)                      # first-use notes and caches out of the way
        ours, base = side_by_side(lambda: run_ok(s, "formula " + expr),
                                  lambda: run_ok(s, expr), repeats)
        out[label] = (ours * 1000, base * 1000)
    return out


def peak_rss_kib(cmd):
    """Peak resident set size of a child process, via GNU time's format or resource."""
    code = (
        "import resource, subprocess, sys; subprocess.run(sys.argv[1:], stdout=subprocess.DEVNULL, "
        "stderr=subprocess.DEVNULL); print(resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss)"
    )
    res = subprocess.run([sys.executable, "-c", code, *cmd], capture_output=True, text=True, check=True)
    return int(res.stdout.strip())


def case_memory():
    examples = sorted((ROOT / "gacalc" / "examples").glob("*.gac"))
    ours = max(peak_rss_kib([sys.executable, "-m", "gacalc", str(p)]) for p in examples) if examples else 0
    base = peak_rss_kib([sys.executable, "-c", "import sympy"])
    return ours, base


# --------------------------------------------------------------------------- main


CASES = ("products", "rotor", "script", "startup", "latency", "memory", "kernel",
         "recognition", "show", "jobs")


def main():
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--quick", action="store_true", help="fewer repeats, k up to 4 (under 4 minutes)")
    ap.add_argument("--only", metavar="NAME[,NAME]", default=None,
                    help="run only these cases: " + ", ".join(CASES))
    args = ap.parse_args()
    chosen = CASES if args.only is None else tuple(n.strip() for n in args.only.split(",") if n.strip())
    unknown = [n for n in chosen if n not in CASES]
    if unknown:
        ap.error(f"unknown case {', '.join(unknown)} (the cases are {', '.join(CASES)})")
    repeats = 3 if args.quick else 5
    ks = (2, 3, 4) if args.quick else (2, 3, 4, 5)

    from gacalc.algebra.coefficients import registry

    print(f"SYMPY_GROUND_TYPES={os.environ.get('SYMPY_GROUND_TYPES', '(unset)')} "
          f"sympy {sp.__version__}; coefficient domain: {type(registry().ctx).__name__} "
          f"(python-flint) rational functions")
    ratios = {}
    if "products" in chosen:
        for k in ks:
            ours, base = case_products(k, 1 if k == 5 else repeats)
            ratios[k] = base / ours
            print(f"ratio products k={k}: {ratios[k]:.1f}   (gacalc {ours*1000:.1f} ms, Pauli matrices {base*1000:.1f} ms)")
    if "rotor" in chosen:
        ours, base = case_rotor(repeats)
        print(f"ratio rotor: {base/ours:.1f}   (gacalc {ours*1000:.1f} ms, Quaternion+trigsimp {base*1000:.1f} ms)")
    if "script" in chosen:
        ours, base = case_script(1 if args.quick else 3)
        print(f"ratio script: {base/ours:.1f}   (gacalc {ours:.2f} s, Pauli matrices {base:.2f} s; target 20)")
    if "startup" in chosen:
        ours, base = case_startup(5 if args.quick else 10)
        print(f"startup: {ours/base:.2f} × import sympy   (gacalc -e 'e1 e2' {ours*1000:.0f} ms, "
              f"import sympy {base*1000:.0f} ms; target 0.8)")
    if "latency" in chosen:
        lat = case_latency(5 if args.quick else 15)
        print("latency median: " + ", ".join(f"{label} {ms:.1f} ms" for label, ms in lat.items()))
    if "memory" in chosen:
        ours, base = case_memory()
        print(f"memory: {ours/base:.2f} × import sympy   (demos {ours/1024:.0f} MiB, import sympy {base/1024:.0f} MiB)")
    if "kernel" in chosen:
        from gacalc.export import rotor_kernel_counts

        counts = rotor_kernel_counts()
        print("rotor kernel ops (sympy.count_ops): " + "; ".join(
            f"{form} " + " ".join(f"{op}={n}" for op, n in sorted(ops.items())) for form, ops in counts.items()))
    if "recognition" in chosen:
        recognition = case_recognition(repeats)
        print("recognition (formula EXPR / EXPR): " + ", ".join(
            f"{label} {ours / base:.1f} ({ours:.0f} ms)" for label, (ours, base) in recognition.items())
            + f"; slowest {max(ours for ours, _ in recognition.values()):.0f} ms (target 200 ms)")
    if "show" in chosen:
        shows = case_show(2 if args.quick else 3)
        print("show (wall time, plain value beside): " + ", ".join(
            f"{label} {show:.2f} s ({plain:.2f} s; target {target:g} s"
            f"{', met' if show <= target else ', MISSED'})"
            for label, (show, plain, target) in shows.items()))
    if "jobs" in chosen:
        sequential, parallel = case_jobs(1 if args.quick else 3)
        print(f"jobs: {sequential/parallel:.2f} × faster   (gacalc -j 2 on 8 files {parallel:.2f} s, "
              f"one after the other {sequential:.2f} s)")
    small = [ratios[k] for k in ratios if k >= 3]
    if small:
        print(f"min ratio: {min(small):.1f}")


if __name__ == "__main__":
    main()

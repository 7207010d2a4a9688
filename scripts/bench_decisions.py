#!/usr/bin/env python3
"""Benchmark: checks whose L - R has functions with relations the rules do not model
(abs, exp, log, atan2, several roots), side by side.

Cases (each run A B A B with sympy's cache cleared between runs; medians reported):

    against sympy: the checks through gacalc against sympy.simplify(L - R) == 0 of the
        same expressions built in sympy directly (a general-purpose route)
    witness search: the same checks with the sample points of gacalc.simplify.decision
        (SAMPLE_POINTS) against one sample point (the zero test before the search)

Prints one line per case, "ratio CASE: X" (B seconds / A seconds; above 1 means the
first route is faster).  Usage: python scripts/bench_decisions.py [--repeats N]
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

import sympy as sp  # noqa: E402

sys.path.insert(0, str(ROOT / "scripts"))
from bench import side_by_side  # noqa: E402  (one timing helper for all benchmarks)

# (gacalc check, the same L - R in sympy); both holding and failing ones
t, u = sp.symbols("t u", real=True)
CHECKS = [
    ("check exp(t) exp(u) == exp(t + u)", sp.exp(t) * sp.exp(u) - sp.exp(t + u)),
    ("check abs(t u) == abs(t) abs(u)", sp.Abs(t * u) - sp.Abs(t) * sp.Abs(u)),
    ("check log(exp(t)) == t", sp.log(sp.exp(t)) - t),
    ("check sqrt(2) sqrt(3) e1 == sqrt(6) e1", sp.sqrt(2) * sp.sqrt(3) - sp.sqrt(6)),
    ("check abs(t) == t", sp.Abs(t) - t),
    ("check atan2(sin(t), cos(t)) == t", sp.atan2(sp.sin(t), sp.cos(t)) - t),
    ("check log(t^2) == 2 log(t)", sp.log(t ** 2) - 2 * sp.log(t)),
]


def gacalc_checks():
    from gacalc.language import Session

    session = Session()
    for text, _ in CHECKS:
        result = session.run(text)[-1]
        assert getattr(result, "kind", "") == "check", result
        result.render()


def sympy_checks():
    for _, difference in CHECKS:
        sp.simplify(difference) == 0


def with_points(count):
    import gacalc.simplify.decision as decision

    def run():
        saved = decision.SAMPLE_POINTS
        decision.SAMPLE_POINTS = count
        try:
            gacalc_checks()
        finally:
            decision.SAMPLE_POINTS = saved
    return run


def main():
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--repeats", type=int, default=5)
    repeats = parser.parse_args().repeats
    gacalc_checks()      # warm up imports
    a, b = side_by_side(gacalc_checks, sympy_checks, repeats)
    print(f"gacalc {a:.3f} s, sympy.simplify {b:.3f} s")
    print(f"ratio against sympy: {b / a:.2f}")
    import gacalc.simplify.decision as decision

    a, b = side_by_side(with_points(decision.SAMPLE_POINTS), with_points(1), repeats)
    print(f"{decision.SAMPLE_POINTS} sample points {a:.3f} s, one point {b:.3f} s")
    print(f"ratio witness search: {b / a:.2f}")


if __name__ == "__main__":
    main()

#!/usr/bin/env python3
"""Benchmark: Euler angles through gacalc against sympy's Quaternion.to_euler, side by side.

Cases (each run A B A B with sympy's cache cleared between runs; medians reported):

    symbolic: the 24 conventions (12 sequences, intrinsic and extrinsic) of a declared
              rotor R, gacalc's euler_angles (formulas in R0, R23, R31, R12 with the
              gimbal-lock condition) against sympy's to_euler of the symbolic quaternion
    exact:    yaw, pitch, roll of rotor(e3, pi/3) rotor(e2, pi/5) rotor(e1, pi/7): gacalc
              (exact angles pi/3, pi/5, pi/7 proved) against sympy's to_euler("ZYX") of the
              same quaternion followed by sympy.simplify of each angle

Prints one line per case, "ratio CASE: X" (sympy seconds / gacalc seconds; above 1 means
gacalc is faster).  Usage: python scripts/bench_attitude.py [--repeats N]
"""

from __future__ import annotations

import argparse
import itertools
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))
sys.path.insert(0, str(ROOT / "scripts"))

import sympy as sp  # noqa: E402
from bench import side_by_side  # noqa: E402  (one timing helper for all benchmarks)

SEQUENCES = ["".join(s) for s in itertools.product("xyz", repeat=3)
             if s[0] != s[1] and s[1] != s[2]]


def symbolic_case():
    import gacalc.simplify  # noqa: F401  (installs the simplifier)
    from gacalc.algebra import attitude, symbolic
    from sympy.algebras.quaternion import Quaternion

    R, conditions = symbolic("rotor", "R")
    w, b23, b31, b12 = (R[k] for k in (0, 4, 5, 6))
    q = Quaternion(w, -b23, -b31, -b12)

    def ours():
        for sequence, intrinsic in itertools.product(SEQUENCES, (True, False)):
            attitude.euler_angles(R, attitude.axis_sequence(sequence, intrinsic), conditions)

    def theirs():
        for sequence, intrinsic in itertools.product(SEQUENCES, (True, False)):
            q.to_euler(sequence.upper() if intrinsic else sequence)

    return ours, theirs


def exact_case():
    import gacalc.simplify  # noqa: F401
    from gacalc.algebra import attitude, e1, e2, e3
    from gacalc.algebra.rotors import rotor
    from sympy.algebras.quaternion import Quaternion

    R = rotor(e3, sp.pi / 3) * rotor(e2, sp.pi / 5) * rotor(e1, sp.pi / 7)
    q = Quaternion(R[0], -R[4], -R[5], -R[6])

    def ours():
        attitude.euler_angles(R, attitude.axis_sequence("zyx"))

    def theirs():
        [sp.simplify(angle) for angle in q.to_euler("ZYX")]

    return ours, theirs


def main(argv=None):
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--repeats", type=int, default=3)
    args = parser.parse_args(argv)
    for name, case in (("symbolic", symbolic_case), ("exact", exact_case)):
        ours, theirs = case()
        t_ours, t_theirs = side_by_side(ours, theirs, args.repeats)
        print(f"{name}: gacalc {t_ours:.3f} s, sympy {t_theirs:.3f} s")
        print(f"ratio {name}: {t_theirs / t_ours:.2f}")


if __name__ == "__main__":
    main()

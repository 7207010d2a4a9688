#!/usr/bin/env python3
"""Benchmark: linear maps through gacalc against a plain-sympy route, side by side.

Cases (each run A B A B with sympy's cache cleared between runs; medians reported):

    apply: a declared matrix3 M applied to a general multivector X (f(X), printed),
           against sympy: the outermorphism as the block matrix diag(1, M, C2(M), det M)
           (C2 the second compound matrix of 2x2 minors) times X's coefficient column
    inverse: inverse(linmap(M)) printed, against sympy's M.inv() printed

Prints one line per case, "ratio CASE: X" (sympy seconds / gacalc seconds; above 1 means
gacalc is faster).  Usage: python scripts/bench_linmap.py [--repeats N]
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




def gacalc_run(text):
    from gacalc.language import Session

    def run():
        results = Session().run(text)
        assert all(getattr(r, "kind", "") != "error" for r in results), results[-1]
        for result in results:
            result.render()
    return run


def _symbols(prefix, names):
    return [sp.Symbol(prefix + n, real=True) for n in names]


def sympy_apply():
    M = sp.Matrix(3, 3, _symbols("M", [f"{i}{j}" for i in "123" for j in "123"]))
    x = sp.Matrix(_symbols("X", ["0", "1", "2", "3", "23", "31", "12", "123"]))
    pairs = [(1, 2), (2, 0), (0, 1)]        # e23, e31, e12 as index pairs
    compound = sp.Matrix(3, 3, lambda r, c: M.extract(list(pairs[r]), list(pairs[c])).det())
    block = sp.diag(sp.Matrix([[1]]), M, compound, sp.Matrix([[M.det()]]))
    image = (block * x).applyfunc(sp.expand)
    str(image)


def sympy_inverse():
    M = sp.Matrix(3, 3, _symbols("M", [f"{i}{j}" for i in "123" for j in "123"]))
    str(M.inv())


def main():
    parser = argparse.ArgumentParser()
    parser.add_argument("--repeats", type=int, default=7)
    repeats = parser.parse_args().repeats
    cases = {
        "apply": (gacalc_run("matrix3 M\nmultivector X\nlinmap(M)(X)"), sympy_apply),
        "inverse": (gacalc_run("matrix3 M\ninverse(linmap(M))"), sympy_inverse),
    }
    for name, (ours, theirs) in cases.items():
        ours()      # warm imports
        t_ours, t_theirs = side_by_side(ours, theirs, repeats)
        print(f"ratio {name}: {t_theirs / t_ours:.2f}  (gacalc {t_ours * 1000:.1f} ms, "
              f"sympy {t_theirs * 1000:.1f} ms)")


if __name__ == "__main__":
    main()

"""Benchmark of gacalc's derivatives against plain sympy, side by side in one process.

Each case differentiates a value in t: gacalc's chain rule through the generators (on
the flint polynomials, gacalc.algebra.calculus.diff) against sympy.diff + expand of the
same components as sympy Exprs (the route without gacalc's domain).  Prints the median
seconds of each and the ratio sympy / gacalc.

    python scripts/bench_calculus.py [repeats]
"""

from __future__ import annotations

import os
import statistics
import sys

import sympy

import gacalc.simplify  # noqa: F401  (installs the simplifier)
from gacalc.algebra import Multivector, symbolic
from gacalc.algebra.context import AlgebraContext
from gacalc.algebra import calculus, rotors

t, a, b = sympy.symbols("t a b", real=True)


def values():
    """(label, multivector) cases: a rotor chain acting on a vector, a general product."""
    e12, e23, e31 = (Multivector({k: 1}) for k in (6, 4, 5))
    x, _ = symbolic("vector", "x")
    chain = rotors.rotor(e12, a * t) * rotors.rotor(e23, b * t**2) * rotors.rotor(e31, sympy.sin(t))
    turned = chain * x * chain.rev()
    m1, _ = symbolic("multivector", "M")
    m2 = m1.subs({s: s * t + sympy.cos(t) for s in m1.free_symbols})
    return [("d/dt of R1 R2 R3 x (R1 R2 R3)~", turned),
            ("d2/dt2 of the same", turned, 2),
            ("d/dt of M(t) M(t) M(t), general M", m2 * m2 * m2)]


sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
from bench import timed  # noqa: E402  (one timing helper for all benchmarks)


def _fresh_diff(value, order):
    # each run pays for the generators' own derivatives (no cache from the previous run)
    from gacalc.algebra.context import current

    current()._stores.pop(calculus._CACHE, None)
    return calculus.diff(value, t, order)


def main(repeats=5):
    with AlgebraContext().active():
        for case in values():
            label, value = case[0], case[1]
            order = case[2] if len(case) > 2 else 1
            exprs = [e for _, e in value.items()]
            ours, theirs = [], []
            for _ in range(repeats):
                ours.append(timed(lambda: _fresh_diff(value, order)))
                theirs.append(timed(lambda: [sympy.expand(sympy.diff(e, t, order)) for e in exprs]))
            g, s = statistics.median(ours), statistics.median(theirs)
            print(f"{label:40} gacalc {g:8.4f} s   sympy {s:8.4f} s   ratio {s / g:6.1f}x")


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 5)

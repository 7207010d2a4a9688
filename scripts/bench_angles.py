"""Cost of the multiple-angle rewrite (gacalc.simplify.angles) on the benchmark cases.

    python scripts/bench_angles.py [repeats]

Each case runs alternately with the rewrite on and switched off (the display form found
before it), in one process; printed are the medians and the ratio on/off.  The cases are
bench.py's rotor and latency cases plus same-plane products, which the rewrite collapses.
"""

from __future__ import annotations

import os
import statistics
import sys

sys.path.insert(0, os.path.dirname(__file__))

import bench  # noqa: E402  (timed, new_session, run_ok, LATENCY_CASES)

EXTRA_CASES = {
    "R^5": ("scalar t", "rotor(e12, t)^5"),
    "three same-plane rotors": ("scalar a, b, c", "rotor(e12, a) rotor(e12, b) rotor(e12, c)"),
    "shared unit axis": ("vector n unit\nscalar p, t", "rotor(n, t) rotor(n, p)"),
    "gimbal (two planes)": ("scalar a, b, c", "rotor(e12, a) rotor(e31, b) rotor(e23, c)"),
}


def _switch(on: bool):
    from gacalc.simplify import angles, relations

    relations.collapse_angles = angles.collapse_angles if on else (lambda p, best, budget: best)


def _case(setup, statement, repeats):
    times = {True: [], False: []}
    for _ in range(repeats):
        for on in (True, False):
            _switch(on)
            session = bench.new_session()
            if setup:
                bench.run_ok(session, setup)
            times[on].append(bench.timed(lambda: bench.run_ok(session, statement)))
    _switch(True)
    return statistics.median(times[True]), statistics.median(times[False])


def main():
    repeats = int(sys.argv[1]) if len(sys.argv) > 1 else 7
    rotor_setup, rotor_statement = "vector n unit\nvector x\nR = rotor(n, theta)", "R x R~"
    cases = {"rotor R x R~": (rotor_setup, rotor_statement), **bench.LATENCY_CASES, **EXTRA_CASES}
    for label, (setup, statement) in cases.items():
        on, off = _case(setup, statement, repeats)
        print(f"{label:26s} on {on * 1000:8.1f} ms   off {off * 1000:8.1f} ms   ratio {on / off:5.2f}")


if __name__ == "__main__":
    main()

"""The kinematics items of `show` for a rotor that depends on a time symbol: the angular
velocity Omega (dR/dt = -1/2 Omega R) and its axis vector w (Omega = w I)."""

from __future__ import annotations

from .report import Report, ReportItem

KINEMATICS = "kinematics"


def add_kinematics(report: Report, value, times, conditions=(), budget=None) -> Report:
    """Append Omega and w for each time symbol the rotor depends on (report kind rotor or
    even versor); other reports are returned as they are."""
    from gacalc.algebra import Multivector
    from gacalc.algebra.calculus import angular_velocity
    from gacalc.simplify import simplify

    if report.kind not in ("rotor", "even versor") or not isinstance(value, Multivector):
        return report
    unit = report.kind == "rotor"
    for t in sorted(set(times) & value.free_symbols, key=str):
        omega = simplify(angular_velocity(value, t, unit), conditions, budget=budget)
        axis = simplify(omega.value.dual(), conditions, budget=budget)
        report.complete = report.complete and omega.complete and axis.complete
        report.items.append(ReportItem(f"angular velocity ({t})", omega.value,
                                       f"Omega: dR/d{t} = -1/2 Omega R", KINEMATICS))
        report.items.append(ReportItem(f"angular velocity vector ({t})", axis.value,
                                       f"w = dual(Omega), Omega = w I; dx/d{t} = cross(w, x)",
                                       KINEMATICS))
    return report

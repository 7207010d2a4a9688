"""Derived forms: the report `show` prints about a value, and its text and LaTeX renderings.

    build_report(value, session=None, against=None, conditions=()) -> Report
    render_text(report, unicode=False) -> str
    render_latex(report) -> str
"""

from .render import render_latex, render_text
from .report import Report, ReportItem, build_report, rotor_angle_plane

__all__ = ["build_report", "render_text", "render_latex", "Report", "ReportItem", "rotor_angle_plane"]

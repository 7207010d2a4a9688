"""A scene drawn with matplotlib (an optional extra: ``pip install 'gacalc[draw]'``).

Only matplotlib's object API is used (``matplotlib.figure.Figure``, no pyplot), so drawing
never opens a window, picks no GUI backend and keeps no global figure state.  Each drawn
item carries a gid (``arrow-1``, ``disc-1``, ``arc-1``, ``plane-1`` and their heads), which
matplotlib writes as the id of the item's group in an SVG file.
"""

from __future__ import annotations

import io
import math

import numpy as np

from .scene import Scene

DPI = 100
VIEW = (24.0, -56.0)        # elevation, azimuth in degrees
COLOURS = {"vector": "#1f5fa8", "reference": "#7a7a7a", "image": "#c0392b",
           "disc": "#2e8b57", "arc": "#d4870f", "plane": "#8e6fbf"}
FORMATS = ("svg", "png")


class MissingMatplotlib(ImportError):
    """matplotlib is not installed (the message says how to get it)."""


def _matplotlib():
    try:
        import matplotlib  # noqa: F401
        from matplotlib.figure import Figure
        from mpl_toolkits.mplot3d.art3d import Poly3DCollection
    except ImportError:
        from . import MISSING

        raise MissingMatplotlib(MISSING) from None
    return Figure, Poly3DCollection


def figure_of(scene: Scene, size: tuple[int, int] = (640, 480)):
    """A matplotlib Figure of the scene, ``size`` pixels wide and high at DPI."""
    Figure, Poly3DCollection = _matplotlib()
    width, height = size
    figure = Figure(figsize=(width / DPI, height / DPI), dpi=DPI)
    axes = figure.add_subplot(projection="3d")
    axes.view_init(*VIEW)
    reach = 1.15 * scene.extent()
    head = 0.09 * reach
    eye = _eye(*VIEW)
    painter = _Painter(axes, Poly3DCollection, head, eye)
    for i, plane in enumerate(scene.planes, 1):
        painter.polygon(plane.corners(), COLOURS["plane"], 0.18, f"plane-{i}")
        axes.text(*(plane.corners()[0]), plane.label, color=COLOURS["plane"], fontsize=9)
    for i, disc in enumerate(scene.discs, 1):
        rim = disc.rim()
        painter.polygon(rim, COLOURS["disc"], 0.25, f"disc-{i}")
        turn = rim[: int(0.8 * len(rim))]        # the circulation, u towards v
        painter.path(turn, COLOURS["disc"], f"circulation-{i}")
        painter.head(turn[-2], turn[-1], COLOURS["disc"], f"circulation-head-{i}",
                     limit=False)
        axes.text(*(disc.center + disc.radius * disc.u), disc.label,
                  color=COLOURS["disc"], fontsize=9)
    for i, arc in enumerate(scene.arcs, 1):
        painter.path(arc.points, COLOURS["arc"], f"arc-{i}")
        if len(arc.points) > 1 and abs(arc.angle) > 1e-9:
            painter.head(arc.points[-2], arc.points[-1], COLOURS["arc"], f"arc-head-{i}",
                         limit=False)
        axis = arc.axis * reach * 0.9
        painter.path(np.array([-axis, axis]), COLOURS["arc"], f"axis-{i}", dashed=True)
        middle = arc.points[len(arc.points) // 2]
        axes.text(*middle, arc.label, color=COLOURS["arc"], fontsize=9)
    for i, arrow in enumerate(scene.arrows, 1):
        colour = COLOURS[arrow.role]
        painter.path(np.array([arrow.start, arrow.end]), colour, f"arrow-{i}",
                     dashed=arrow.role == "reference")
        painter.head(arrow.start, arrow.end, colour, f"arrowhead-{i}")
        axes.text(*arrow.end, " " + arrow.label, color=colour, fontsize=9)
    axes.set_xlim(-reach, reach)
    axes.set_ylim(-reach, reach)
    axes.set_zlim(-reach, reach)
    axes.set_box_aspect((1, 1, 1))
    axes.set_xlabel("e1")
    axes.set_ylabel("e2")
    axes.set_zlabel("e3")
    return figure


def image_of(figure, fmt: str) -> bytes:
    """The figure as SVG or PNG bytes (no date in the SVG, so a picture is reproducible)."""
    import matplotlib

    if fmt not in FORMATS:
        raise ValueError(f"pictures are {' or '.join(FORMATS)}, not {fmt}")
    buffer = io.BytesIO()
    metadata = {"Date": None} if fmt == "svg" else {"Software": "gacalc"}
    with matplotlib.rc_context({"svg.hashsalt": "gacalc", "svg.fonttype": "path"}):
        figure.savefig(buffer, format=fmt, dpi=DPI, metadata=metadata)
    return buffer.getvalue()


def _eye(elevation: float, azimuth: float) -> np.ndarray:
    e, a = math.radians(elevation), math.radians(azimuth)
    return np.array([math.cos(e) * math.cos(a), math.cos(e) * math.sin(a), math.sin(e)])


class _Painter:
    """Lines, polygons and arrowheads on 3-D axes, each tagged with its gid."""

    def __init__(self, axes, polygons, head: float, eye: np.ndarray):
        self.axes, self.polygons, self.size, self.eye = axes, polygons, head, eye

    def path(self, points, colour, gid, dashed=False):
        points = np.asarray(points, dtype=float)
        (line,) = self.axes.plot(points[:, 0], points[:, 1], points[:, 2], color=colour,
                                 linewidth=1.2 if dashed else 1.8,
                                 linestyle="--" if dashed else "-")
        line.set_gid(gid)
        return line

    def polygon(self, corners, colour, alpha, gid):
        patch = self.polygons([np.asarray(corners, dtype=float)], facecolor=colour,
                              edgecolor=colour, alpha=alpha, linewidths=0.8)
        patch.set_gid(gid)
        self.axes.add_collection3d(patch)
        return patch

    def head(self, start, end, colour, gid, limit=True):
        """A flat triangle at ``end`` pointing from ``start``, turned towards the eye."""
        d = np.asarray(end, dtype=float) - np.asarray(start, dtype=float)
        length = float(np.linalg.norm(d))
        if length == 0:
            return None
        d /= length
        side = np.cross(d, self.eye)
        if np.linalg.norm(side) < 1e-6:
            side = np.cross(d, np.eye(3)[int(np.argmin(np.abs(d)))])
        side /= np.linalg.norm(side)
        size = min(self.size, 0.5 * length) if limit else self.size   # short arrows
        back = np.asarray(end) - size * d
        triangle = [np.asarray(end), back + 0.45 * size * side, back - 0.45 * size * side]
        return self.polygon(triangle, colour, 1.0, gid)

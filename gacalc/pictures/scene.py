"""What a picture shows, as plain numbers: arrows, oriented discs, arcs and mirror planes.

The scene is built from numeric gacalc values and knows nothing of matplotlib (that is
gacalc.pictures.render's job), so its geometry can be checked on its own.  Conventions are
the project's: a bivector B has the normal dual(B) = B I^-1 (e12 -> e3) and circulates from
u to v with u /\\ v along B; a rotor R = cos(t/2) - sin(t/2) n I turns by t about n
(right-hand rule); a vector n is the normal of the mirror plane it reflects in.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

ARC_POINTS = 64        # points along a rotor's arc and a disc's rim


@dataclass
class Arrow:
    """A vector from ``start`` to ``end``; role 'vector', 'reference' or 'image'."""

    start: np.ndarray
    end: np.ndarray
    label: str
    role: str = "vector"


@dataclass
class Disc:
    """An oriented disc of area |B| in the plane of B; the circulation runs u -> v."""

    center: np.ndarray
    u: np.ndarray
    v: np.ndarray
    radius: float
    label: str

    @property
    def normal(self) -> np.ndarray:
        return np.cross(self.u, self.v)

    def rim(self, points: int = ARC_POINTS) -> np.ndarray:
        t = np.linspace(0.0, 2 * math.pi, points)
        return (self.center + self.radius * (np.outer(np.cos(t), self.u)
                                             + np.outer(np.sin(t), self.v)))


@dataclass
class Arc:
    """The path a reference vector's tip takes under a rotation; ``axis`` and ``angle``."""

    points: np.ndarray
    axis: np.ndarray
    angle: float
    label: str


@dataclass
class Plane:
    """A square patch of a mirror plane through the origin with unit ``normal``."""

    normal: np.ndarray
    half_size: float
    label: str

    def corners(self) -> np.ndarray:
        u, v = plane_basis(self.normal)
        s = self.half_size
        return np.array([s * (a * u + b * v) for a, b in ((1, 1), (-1, 1), (-1, -1), (1, -1))])


@dataclass
class Scene:
    arrows: list = field(default_factory=list)
    discs: list = field(default_factory=list)
    arcs: list = field(default_factory=list)
    planes: list = field(default_factory=list)

    def extent(self) -> float:
        """The half-width of a cube around the origin that holds everything."""
        points = [np.zeros(3)]
        points += [a.end for a in self.arrows] + [a.start for a in self.arrows]
        points += [p for d in self.discs for p in d.rim(16)]
        points += [p for a in self.arcs for p in a.points]
        reach = max(float(np.max(np.abs(p))) for p in points)
        return reach if reach > 0 else 1.0

    def counts(self) -> dict:
        return {"arrows": len(self.arrows), "discs": len(self.discs),
                "arcs": len(self.arcs), "planes": len(self.planes)}

    def summary(self) -> str:
        words = []
        for name, count in self.counts().items():
            if count:
                words.append(f"{count} {name[:-1] if count == 1 else name}")
        return ", ".join(words) if words else "nothing"


# Geometry helpers ---------------------------------------------------------------------
def plane_basis(normal: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Orthonormal u, v with u x v = normal / |normal|; u is the basis vector least aligned
    with the normal, made perpendicular (so e3 gives u = e1, v = e2)."""
    n = normal / np.linalg.norm(normal)
    helper = np.eye(3)[int(np.argmin(np.abs(n)))]
    u = helper - np.dot(helper, n) * n
    u /= np.linalg.norm(u)
    return u, np.cross(n, u)


def rotate_about(x: np.ndarray, axis: np.ndarray, angle: float) -> np.ndarray:
    """Rodrigues' rotation formula (right-hand rule about the unit axis)."""
    k = axis / np.linalg.norm(axis)
    return (x * math.cos(angle) + np.cross(k, x) * math.sin(angle)
            + k * np.dot(k, x) * (1 - math.cos(angle)))


# Components (basis order 1, e1, e2, e3, e23, e31, e12, e123) -> scene items ----------
def vector_part(c: np.ndarray) -> np.ndarray:
    return np.array(c[1:4], dtype=float)


def bivector_part(c: np.ndarray) -> np.ndarray:
    """(B23, B31, B12): also the components of dual(B), the plane's normal."""
    return np.array(c[4:7], dtype=float)


def disc_of(c: np.ndarray, label: str) -> Disc | None:
    b = bivector_part(c)
    area = float(np.linalg.norm(b))
    if area == 0:
        return None
    u, v = plane_basis(b)
    return Disc(np.zeros(3), u, v, math.sqrt(area / math.pi), label)


def rotor_axis_angle(c: np.ndarray) -> tuple[np.ndarray, float] | None:
    """Axis and angle of the rotation of an even value (scaled to a unit rotor); None
    for the identity."""
    w, b = float(c[0]), bivector_part(c)
    s = float(np.linalg.norm(b))
    if s == 0:
        return None
    # R = cos(t/2) - sin(t/2) n I and n I has the components of n in (e23, e31, e12)
    return -b / s, 2 * math.atan2(s, w)


def reference_for(axis: np.ndarray) -> np.ndarray:
    """A unit vector in the plane of rotation (when no vector is given to turn)."""
    return plane_basis(axis)[0]


def arc_of(x: np.ndarray, axis: np.ndarray, angle: float, label: str) -> Arc:
    steps = np.linspace(0.0, angle, ARC_POINTS)
    return Arc(np.array([rotate_about(x, axis, t) for t in steps]), axis, angle, label)

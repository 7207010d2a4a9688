"""An independent floating-point Cl(3,0), used as the reference by tests/test_consistency.py.

It shares no code with gacalc: the multiplication table is built here from the blade sign
rule (concatenate the index lists, count the transpositions that sort them, cancel
e_i e_i = +1; common practice, e.g. Dorst, Fontijne & Mann, "Geometric Algebra for
Computer Science", section 19.1, from memory), values are numpy arrays of 8 components in
the basis order 1, e1, e2, e3, e23, e31, e12, e123 (DESIGN.md), exponentials come from
scipy.linalg.expm of the 8x8 left-regular matrix, and rotation conversions that need a
reference (from_matrix) use scipy.spatial.transform.Rotation.
"""

from __future__ import annotations

import itertools

import numpy as np
import scipy.linalg
from scipy.spatial.transform import Rotation

BLADES = [(), (1,), (2,), (3,), (2, 3), (3, 1), (1, 2), (1, 2, 3)]
GRADES = np.array([len(b) for b in BLADES])


def _canonical(indices):
    """(sign, sorted index tuple with repeated pairs removed) of a product of basis vectors."""
    idx = list(indices)
    sign = 1
    for i in range(len(idx)):  # bubble sort, one sign flip per transposition
        for j in range(len(idx) - 1 - i):
            if idx[j] > idx[j + 1]:
                idx[j], idx[j + 1] = idx[j + 1], idx[j]
                sign = -sign
    out = []
    for k in idx:
        if out and out[-1] == k:
            out.pop()  # e_k e_k = +1 in Cl(3,0)
        else:
            out.append(k)
    return sign, tuple(out)


_SORTED = {}
for _k, _b in enumerate(BLADES):
    _s, _t = _canonical(_b)
    _SORTED[_t] = (_s, _k)  # e31 is stored as (1, 3) with sign -1

# TABLE[i, j, k]: coefficient of blade k in blade_i blade_j
TABLE = np.zeros((8, 8, 8))
for _i, _j in itertools.product(range(8), range(8)):
    _s, _t = _canonical(BLADES[_i] + BLADES[_j])
    _s2, _k = _SORTED[_t]
    TABLE[_i, _j, _k] = _s * _s2


def _masked(select):
    """The product table restricted to triples (i, j, k) where select(gi, gj, gk)."""
    t = TABLE.copy()
    for i, j, k in itertools.product(range(8), range(8), range(8)):
        if not select(GRADES[i], GRADES[j], GRADES[k]):
            t[i, j, k] = 0
    return t


OUTER = _masked(lambda r, s, g: g == r + s)
LEFT = _masked(lambda r, s, g: g == s - r)
RIGHT = _masked(lambda r, s, g: g == r - s)
INNER = _masked(lambda r, s, g: r > 0 and s > 0 and g == abs(r - s))


def mv(**parts):
    """A multivector from named components: mv(s=1, e12=2)."""
    names = ["s", "e1", "e2", "e3", "e23", "e31", "e12", "e123"]
    out = np.zeros(8)
    for name, value in parts.items():
        out[names.index(name)] = value
    return out


def basis(k):
    out = np.zeros(8)
    out[k] = 1.0
    return out


ONE = basis(0)
I = basis(7)


def gp(a, b):
    return np.einsum("i,j,ijk->k", a, b, TABLE)


def outer(a, b):
    return np.einsum("i,j,ijk->k", a, b, OUTER)


def lcont(a, b):
    return np.einsum("i,j,ijk->k", a, b, LEFT)


def rcont(a, b):
    return np.einsum("i,j,ijk->k", a, b, RIGHT)


def inner(a, b):
    return np.einsum("i,j,ijk->k", a, b, INNER)


def left_matrix(a):
    """The 8x8 matrix L(a) with L(a) @ b = a b."""
    return np.einsum("i,ijk->kj", a, TABLE)


def grade(a, g):
    return np.where(GRADES == g, a, 0.0)


def rev(a):
    return a * np.array([(-1) ** (g * (g - 1) // 2) for g in GRADES])


def involute(a):
    return a * np.array([(-1) ** g for g in GRADES])


def conjugate(a):
    return rev(involute(a))


def dual(a):
    return gp(a, -I)  # A I^-1 with I^-1 = -I


def undual(a):
    return gp(a, I)


def comm(a, b):
    return 0.5 * (gp(a, b) - gp(b, a))


def invertible(a) -> bool:
    return abs(np.linalg.det(left_matrix(a))) > 1e-10


def inverse(a):
    return np.linalg.solve(left_matrix(a), ONE)


def power(a, k: int):
    out = ONE
    for _ in range(k):
        out = gp(out, a)
    return out


def exp(a):
    return scipy.linalg.expm(left_matrix(a)) @ ONE


def norm2(a):
    return float(gp(a, rev(a))[0])


# ---------------------------------------------------------------------------
# rotors


def rotor(blade, theta):
    """exp(-B theta/2) for a unit bivector B, or B = n I for a unit vector n."""
    B = gp(blade, I) if GRADES[np.nonzero(blade)[0]].max() == 1 else blade
    return exp(-B * (theta / 2))


def rotor_between(a, b):
    a = a / np.sqrt(norm2(a))
    b = b / np.sqrt(norm2(b))
    r = ONE + gp(b, a)
    return r / np.sqrt(norm2(r))


def log(R):
    """Principal log: phi B^ with R = cos(phi) + B^ sin(phi), phi in [0, pi]."""
    b = grade(R, 2)
    nb = np.sqrt(norm2(b))
    if nb < 1e-15:
        return np.zeros(8) if R[0] > 0 else basis(6) * np.pi
    return b / nb * np.arctan2(nb, R[0])


def rotor_power(R, q):
    return exp(log(R) * q)


def slerp(R1, R2, t):
    D = gp(rev(R1), R2)
    if D[0] < 0:
        D = -D
    return gp(R1, rotor_power(D, t))


def rotate(R, x):
    return gp(gp(R, x), rev(R))


def rotation_matrix(R):
    cols = [rotate(R, basis(k))[1:4] for k in (1, 2, 3)]
    return np.array(cols).T


def quaternion(R):
    """(w, x, y, z) with i = -e23, j = -e31, k = -e12 (DESIGN.md)."""
    return np.array([R[0], -R[4], -R[5], -R[6]])


def scipy_rotation(R) -> Rotation:
    w, x, y, z = quaternion(R)
    return Rotation.from_quat([x, y, z, w])  # scipy: scalar last


def from_matrix(M):
    """Through scipy's Rotation (the reference); scalar part made >= 0."""
    x, y, z, w = Rotation.from_matrix(M).as_quat()
    R = np.zeros(8)
    R[0], R[4], R[5], R[6] = w, -x, -y, -z
    return -R if R[0] < 0 else R


def angle(R):
    return 2 * np.arctan2(np.sqrt(norm2(grade(R, 2))), R[0])


def plane(R):
    b = grade(R, 2)
    return -b / np.sqrt(norm2(b))


def axis(R):
    return dual(plane(R))


# ---------------------------------------------------------------------------
# Pauli matrices: e1, e2, e3 -> sigma x, y, z (DESIGN.md)

SIGMA = [np.array([[0, 1], [1, 0]], complex), np.array([[0, -1j], [1j, 0]], complex),
         np.array([[1, 0], [0, -1]], complex)]


def pauli(a):
    out = np.zeros((2, 2), complex)
    for k, blade in enumerate(BLADES):
        m = np.eye(2, dtype=complex)
        for i in blade:
            m = m @ SIGMA[i - 1]
        out += a[k] * m
    return out

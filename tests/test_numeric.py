"""numeric on every kind of value: matrices (rotation matrices, Pauli matrices with complex
entries), linear maps, quaternions and lists, checked against numpy and scipy."""

from __future__ import annotations

import numpy as np
from scipy.spatial.transform import Rotation

from conftest import ok
from gacalc.language import Session

# Pauli matrices (the standard definition, e.g. any quantum mechanics text)
_SX = np.array([[0, 1], [1, 0]], dtype=complex)
_SY = np.array([[0, -1j], [1j, 0]])
_SZ = np.array([[1, 0], [0, -1]], dtype=complex)


def _numeric(text, session=None):
    return ok(session or Session(), f"numeric({text})")[-1].value


def _array(matrix):
    return np.array(matrix.tolist(), dtype=complex)


def test_numeric_pauli_matrix_with_complex_entries():
    value = _numeric("pauli(1/3 + e1 + 2 e2 + cos(pi/5) e123)")
    # e123 -> i times the identity (DESIGN.md convention); numpy as the reference
    expected = (np.eye(2) / 3 + _SX + 2 * _SY + np.cos(np.pi / 5) * 1j * np.eye(2))
    assert np.allclose(_array(value), expected, atol=1e-14)


def test_numeric_rotation_matrix_against_scipy():
    value = _numeric("matrix(rotor(e12, pi/3))")
    # rotor(e12, t) turns e1 toward e2: a rotation about +z by t (scipy as the reference)
    expected = Rotation.from_rotvec([0, 0, np.pi / 3]).as_matrix()
    assert np.allclose(_array(value).real, expected, atol=1e-14)


def test_numeric_linear_map_and_list():
    session = Session()
    f = _numeric("linmap(1, 2, 3, 4, 5, 6, 7, 8, pi)", session)
    assert np.allclose(np.array(f.matrix.tolist(), dtype=float),
                       [[1, 2, 3], [4, 5, 6], [7, 8, np.pi]], atol=1e-14)
    items = _numeric("(sqrt(2) e1, pauli(e2), quaternion(rotor(e12, 1)))", session)
    assert np.isclose(float(items[0][1]), np.sqrt(2))
    assert np.allclose(_array(items[1]), _SY)
    # rotor(e12, 1) = cos(1/2) - sin(1/2) e12, quaternion k = -e12 (DESIGN.md): w, z
    q = items[2]
    assert np.allclose([float(q.a), float(q.d)], [np.cos(0.5), np.sin(0.5)])


def test_numeric_keeps_the_digits_asked_for():
    value = _numeric("pauli(cos(pi/5) e123), 30")
    # cos(pi/5) = (1 + sqrt(5))/4 = 0.809016994374947424102293417183 (handbook value)
    assert str(value[0, 0]).startswith("0.80901699437494742410229341718")

"""Rules that need a sign, and the exact values that went wrong without one.

Every expected value comes from outside gacalc: mpmath at high precision, numpy, or
scipy.spatial.transform (named beside each check).
"""

from __future__ import annotations

import mpmath
import numpy as np
import sympy
from scipy.spatial.transform import Rotation, Slerp

from gacalc.algebra.coefficients import from_expr
from gacalc.language import Session
from gacalc.language.errors import GacalcError
from gacalc.simplify import display_coef
from gacalc.algebra.signs import certified_sign

mpmath.mp.dps = 40


def _run(session, text):
    results = session.run(text)
    assert results and not isinstance(results[-1], GacalcError), results[-1].caret_text()
    return results


def _floats(mv):
    out = np.zeros(8)
    for k, e in mv.items():
        out[k] = float(sympy.N(e, 40))
    return out


# certified signs --------------------------------------------------------------------------
def test_certified_sign_of_known_numbers():
    # 355/113 exceeds pi by about 2.7e-7 (common practice: the classical approximation)
    assert certified_sign(sympy.pi - sympy.Rational(355, 113)) == -1
    # cos(3) < 0 since pi/2 < 3 < 3 pi/2 (common practice)
    assert certified_sign(sympy.cos(3)) == -1
    # sqrt(2) + sqrt(3) = sqrt(5 + 2 sqrt(6)) (square both sides): zero is never "proved"
    zero = sympy.sqrt(2) + sympy.sqrt(3) - sympy.sqrt(5 + 2 * sympy.sqrt(6))
    assert certified_sign(zero) is None
    # ... but a difference of 1e-200 is, where a 30-digit float would see only noise
    assert certified_sign(zero + sympy.Rational(1, 10**200)) == 1
    assert certified_sign(zero - sympy.Rational(1, 10**200)) == -1
    assert certified_sign(sympy.Symbol("t")) is None


def test_square_root_of_a_negative_quantity_squared():
    # sqrt((pi - 355/113)^2) = 355/113 - pi, a positive number (sign as above)
    session = Session()
    _run(session, "x = sqrt((pi - 355/113)^2);")
    value = session.get("x")[0]
    assert sympy.N(value - (sympy.Rational(355, 113) - sympy.pi), 50) == 0
    assert abs(float(sympy.N(value, 30)) - float(mpmath.mpf(355) / 113 - mpmath.pi)) < 1e-20


# half-angle merging with a full angle that sympy writes as a fraction -----------------------
def test_display_of_half_angle_whose_full_angle_has_a_denominator():
    # cos(atan(c))  = 1/sqrt(1 + c^2): merging cos^2(u/2) -> (1 + cos u)/2 must keep the
    # denominator.  Reference: mpmath at 40 digits.
    x = sympy.cos(sympy.atan(sympy.cos(1)) / 2) ** 2
    shown = display_coef(from_expr(x)).to_expr()
    expected = mpmath.cos(mpmath.atan(mpmath.cos(1)) / 2) ** 2
    assert abs(sympy.N(shown, 30) - sympy.Float(str(expected), 30)) < 1e-25


def test_matrix_of_slerp_is_a_rotation_equal_to_scipy_slerp():
    session = Session()
    _run(session, "M = matrix(slerp(rotor(e23, 1), rotor(e12, 3), 1/2));")
    M = np.array(sympy.N(session.get("M"), 30).tolist(), dtype=float)
    assert np.abs(M.T @ M - np.eye(3)).max() < 1e-12  # orthogonal (common practice)
    assert abs(np.linalg.det(M) - 1) < 1e-12
    # reference: scipy.spatial.transform.Slerp between a turn of 1 about e1 and 3 about e3
    expected = Slerp([0, 1], Rotation.from_rotvec([[1, 0, 0], [0, 0, 3]]))([0.5]).as_matrix()[0]
    assert np.abs(M - expected).max() < 1e-12


def test_inverse_of_a_slerp_is_its_inverse():
    session = Session()
    _run(session, "S = slerp(-1/6 + 1/6 e12 + 1/2 e31 + 5/6 e23, rotor(-e2 - 3 e3, e3), 1/2);"
                  "T = S^-1; P = numeric(S T);")
    # R R^-1 = 1 (definition of the inverse)
    assert np.abs(_floats(session.get("P")) - np.eye(8)[0]).max() < 1e-12


# from_matrix(matrix(R)) ---------------------------------------------------------------------
def _round_trip(text):
    session = Session()
    _run(session, f"R = {text}; F = from_matrix(matrix(R));")
    R, F = _floats(session.get("R")), _floats(session.get("F"))
    sign = 1 if R @ F >= 0 else -1
    # R and -R are the same rotation (common practice); from_matrix returns one of them
    assert np.abs(F - sign * R).max() < 1e-12, (R, F)


def test_from_matrix_accepts_rotation_with_rational_axis():
    # 8/9, -1/9, 4/9 is a unit vector (64 + 1 + 16 = 81)
    _round_trip("rotor(dual(8/9 e1 - 1/9 e2 + 4/9 e3), 2)")


def test_from_matrix_of_exp_times_fractional_power():
    _round_trip("exp(1/3 e12) power(rotor(2/3 e1 - 2/3 e2 + 1/3 e3, 1), -7/16)")


def test_from_matrix_still_refuses_a_non_rotation():
    session = Session()
    results = session.run("from_matrix(1, 0, 0, 0, 1, 0, 0, 0, cos(1))")
    assert isinstance(results[-1], GacalcError)
    assert "not orthogonal" in results[-1].caret_text()


# numeric of matrices, quaternions and Pauli matrices ------------------------------------------
def test_numeric_of_representations():
    session = Session()
    _run(session, "M = numeric(matrix(rotor(e12, 1))); Q = numeric(quaternion(rotor(e12, 1)));"
                  "P = numeric(pauli(rotor(e12, 1)));")
    M = np.array(session.get("M").tolist(), dtype=float)
    # reference: scipy's Rotation, a turn of 1 about e3 (rotor(e12, t) turns e1 toward e2)
    assert np.abs(M - Rotation.from_rotvec([0, 0, 1]).as_matrix()).max() < 1e-14
    q = session.get("Q")
    assert isinstance(q.a, sympy.Float) and isinstance(q.d, sympy.Float)  # no cos(1/2) left
    x, y, z, w = Rotation.from_rotvec([0, 0, 1]).as_quat()
    assert np.abs(np.array([float(q.a), float(q.b), float(q.c), float(q.d)]) - [w, x, y, z]).max() < 1e-14
    P = np.array(session.get("P").tolist(), dtype=complex)
    # Pauli: e12 -> sigma_x sigma_y = i sigma_z, so cos(1/2) - e12 sin(1/2) -> diag(e^{-i/2}, e^{i/2})
    assert np.abs(P - np.diag([np.exp(-0.5j), np.exp(0.5j)])).max() < 1e-14


# long exact values come with their numeric value ----------------------------------------------
def _note_numbers(line):
    import re

    return [float(x) for x in re.findall(r"-?\d+\.\d+", line.replace(" - ", " -"))]


def test_long_exact_value_gets_a_numeric_note():
    session = Session()
    results = _run(session, "slerp(rotor(e23, 1), rotor(e12, 3), 1/2)")
    lines = results[-1].text.splitlines()
    note = lines[-1]
    assert note.startswith("  ~= ") and len(lines[0]) > 300
    # reference: scipy's Slerp; quaternion (w, x, y, z) -> rotor w - x e23 - y e31 - z e12
    x, y, z, w = Slerp([0, 1], Rotation.from_rotvec([[1, 0, 0], [0, 0, 3]]))([0.5]).as_quat()[0]
    expected = [c for c in (w, -x, -y, -z) if abs(c) > 1e-12]
    got = _note_numbers(note)
    sign = 1 if got[0] * expected[0] > 0 else -1  # a rotor and its negative: one rotation
    assert np.allclose(got, [sign * c for c in expected], atol=1e-9)
    unicode = results[-1].render(unicode=True).splitlines()[-1]
    assert unicode.startswith("  ≈ ")


def test_short_and_symbolic_values_get_no_note():
    session = Session()
    short = _run(session, "rotor(e12, 1)")[-1].text
    assert short == "cos(1/2) - sin(1/2)*e12"  # DESIGN.md: rotor(B, t) = cos(t/2) - B sin(t/2)
    scalar_t = _run(session, "scalar t; (1 + t)^30")[-1].text  # long, but has a symbol
    assert len(scalar_t) > 300 and "~=" not in scalar_t


def test_products_of_numeric_angles_display_as_sums():
    # over the common angle 1/96 the components are polynomials of degree 53; the
    # product-to-sum form is short.  Reference: scipy's Rotation (composition A * B applies
    # B first, like the rotor product; exp(t e12) = rotor(e12, -2 t) turns by -2 t about e3).
    session = Session()
    text = _run(session, "R = exp(1/3 e12) power(rotor(2/3 e1 - 2/3 e2 + 1/3 e3, 1), -7/16)")[-1].text
    assert len(text) < 300 and "cos(1/96)" not in text
    n = np.array([2, -2, 1]) / 3
    rot = Rotation.from_rotvec([0, 0, -2 / 3]) * Rotation.from_rotvec(-7 / 16 * n)
    x, y, z, w = rot.as_quat()
    R = _floats(session.get("R"))
    expected = np.array([w, 0, 0, 0, -x, -y, -z, 0])
    sign = 1 if R @ expected > 0 else -1
    assert np.abs(R - sign * expected).max() < 1e-12


def test_inverse_of_a_numeric_rotor_states_no_condition():
    # a numeric a^2 + b^2 proved nonzero needs no "valid where" note (it used to say 1 != 0)
    session = Session()
    results = _run(session, "S = slerp(-1/6 + 1/6 e12 + 1/2 e31 + 5/6 e23, rotor(-e2 - 3 e3, e3), 1/2);"
                            "T = S^-1;")
    assert not any(r.kind == "note" and "valid where" in r.text for r in results)
    symbolic = _run(Session(), "scalar t; (t + e1)^-1;")
    # (t + e1)(t - e1) = t^2 - 1: invertible where t^2 - 1 != 0 (common practice)
    assert any(r.kind == "note" and "valid where" in r.text for r in symbolic)

"""rotor(a, b) for vectors of any nonzero length: the rotor of the directions, printed with
the lengths in one shared denominator and its condition said; rotor(n, theta) still
refuses an axis that is not known to be unit, naming what to do."""

from __future__ import annotations

import numpy as np
import sympy
from scipy.spatial.transform import Rotation

from conftest import ok
from gacalc.language import GacalcError, Session


def _session():
    s = Session()
    ok(s, "vector a, b")
    return s


def test_symbolic_non_unit_vectors_turn_direction_into_direction():
    s = _session()
    results = ok(s, "R = rotor(a, b)")
    notes = [r.text for r in results if r.kind == "note"]
    assert notes == ["note: rotor(a, b) turns the direction of a into that of b: valid where "
                     "both are nonzero and not opposite (|a| |b| + a . b != 0)"]
    # R a R~ = |a|/|b| b and R R~ = 1 (the defining properties of the rotor, DESIGN.md)
    assert ok(s, "check rotate(R, a) norm(b) == norm(a) b")[-1].outcome == "holds"
    assert ok(s, "check R R~ == 1")[-1].outcome == "holds"


def test_the_lengths_appear_in_one_shared_denominator():
    s = _session()
    text = ok(s, "R = rotor(a, b)")[-1].text
    # one '/' joins the numerator to the shared denominator, which holds |a| |b| + a . b
    assert text.count(")/(") == 1
    assert "sqrt(a1*b1 + a2*b2 + a3*b3 + sqrt(a1^2 + a2^2 + a3^2)*sqrt(b1^2 + b2^2 + b3^2))" in text
    # and it is far shorter than the normalise-first form (which repeated that root in
    # every coefficient): 4 coefficients plus one denominator
    assert text.count("sqrt(a1^2 + a2^2 + a3^2)") <= 2


def test_symbolic_rotor_against_scipy_at_a_point():
    s = _session()
    ok(s, "R = rotor(a, b)")
    point = "a1, 1, a2, 2, a3, 3, b1, -1, b2, 0, b3, 2"
    m = ok(s, f"numeric(matrix(subs(R, {point})))")[-1].value
    a, b = np.array([1.0, 2, 3]), np.array([-1.0, 0, 2])
    # reference: scipy's Rotation from the rotation vector of the shortest arc, axis
    # a x b / |a x b| and angle acos(a.b / |a||b|) (common practice)
    axis = np.cross(a, b) / np.linalg.norm(np.cross(a, b))
    angle = np.arccos(a @ b / np.linalg.norm(a) / np.linalg.norm(b))
    expected = Rotation.from_rotvec(axis * angle).as_matrix()
    assert np.allclose(np.array(m.tolist(), dtype=float), expected, atol=1e-12)


def test_unit_vectors_keep_the_short_form_and_say_nothing():
    s = Session()
    results = ok(s, "vector a unit\nvector b unit\nrotor(a, b)")
    assert not [r for r in results if r.kind == "note"]
    assert results[-1].text.endswith("/sqrt(2 + 2*a1*b1 + 2*a2*b2 + 2*a3*b3)")


def test_parallel_vectors_of_different_lengths_give_the_identity():
    assert ok(_session(), "rotor(a, 2 a)")[-1].value == sympy.Integer(1)


def test_rotor_of_an_axis_of_unknown_length_refuses_and_says_what_to_do():
    s = Session()
    for text, words in [("vector n\nrotor(n, t)", "declare it unit, as in vector n unit"),
                        ("rotor(2 e3, t)", "has norm 2 (divide it by its norm)")]:
        error = s.run(text)[-1]
        assert isinstance(error, GacalcError) and words in error.message, error

"""`check L == R as rotation` (a rotor and its negative are one rotation) and the failure
line of a plain check whose sides differ only in sign."""

from __future__ import annotations

import numpy as np
import pytest
from scipy.spatial.transform import Rotation

import ga_reference as ref
from conftest import ok
from gacalc.language import GacalcError, Session

RNG = np.random.default_rng(4)


def _render(session, text):
    return ok(session, text)[-1].render()


@pytest.fixture
def session():
    s = Session()
    ok(s, "scalar t\nvector n unit\nrotor S")
    return s


def test_a_rotor_and_its_negative_are_one_rotation(session):
    result = ok(session, "check -S == S as rotation")[-1]
    assert result.outcome == "holds"
    assert result.render() == ("held given S is a unit rotor: check -S == S as rotation "
                               "(the same rotation: L = -R)")
    assert _render(session, "check S == S as rotation").endswith("(the same rotation: L = R)")


def test_a_turn_by_two_pi_more_is_the_negative_rotor(session):
    # rotor(B, t + 2 pi) = -rotor(B, t): exp(-B pi) = -1 for a unit bivector (common practice)
    assert _render(session, "check rotor(e12, t + 2 pi) == rotor(e12, t) as rotation") == (
        "held: check rotor(e12, t + 2 pi) == rotor(e12, t) as rotation "
        "(the same rotation: L = -R)")
    # the plain check fails, and says the sides differ only in sign
    assert _render(session, "check rotor(e12, t + 2 pi) == rotor(e12, t)") == (
        "FAILED: check rotor(e12, t + 2 pi) == rotor(e12, t)\n"
        "  L - R = -2*cos(t/2) + 2*sin(t/2)*e12\n"
        "  L == -R: the two sides differ only in sign\n"
        "  for rotors, 'check L == R as rotation' compares the rotations")


def test_the_opposite_axis_and_the_complementary_angle(session):
    # a turn by t about n is a turn by 2 pi - t about -n (common practice); R = -R'
    result = ok(session, "check rotor(n, t) == rotor(-n, 2 pi - t) as rotation")[-1]
    assert result.outcome == "holds" and result.note == "L = -R"
    assert ok(session, "check rotor(n, t) == rotor(-n, -t) as rotation")[-1].note == "L = R"
    # numerically: scipy's Rotation (rotation vectors t n and (2 pi - t)(-n)) agrees that they
    # are one rotation, and the numpy reference rotors are negatives of each other
    for _ in range(5):
        axis = RNG.normal(size=3)
        axis /= np.linalg.norm(axis)
        t = RNG.uniform(-6, 6)
        first = Rotation.from_rotvec(t * axis).as_matrix()
        second = Rotation.from_rotvec((2 * np.pi - t) * -axis).as_matrix()
        assert np.allclose(first, second)
        vector = ref.mv(e1=axis[0], e2=axis[1], e3=axis[2])
        left, right = ref.rotor(vector, t), ref.rotor(-vector, 2 * np.pi - t)
        assert np.allclose(left, -right)
        assert np.allclose(ref.rotation_matrix(left), first)


def test_different_rotations_fail_with_their_quotient(session):
    result = ok(session, "check rotor(e12, t + 1) == rotor(e12, t) as rotation")[-1]
    assert result.outcome == "fails"
    assert result.render() == (
        "FAILED: check rotor(e12, t + 1) == rotor(e12, t) as rotation (L R~ is neither 1 nor "
        "-1: different rotations)\n  L R~ = cos(1/2) - sin(1/2)*e12")


@pytest.mark.parametrize("text, message", [
    ("check e1 == rotor(e12, t) as rotation",
     "'as rotation' compares rotors; L has odd grades (grades 1), so it is not a rotor"),
    ("check rotor(e12, t) == 2 rotor(e12, t) as rotation",
     "'as rotation' compares rotors; R R~ is not 1, so R is not a rotor (divide by its norm first)"),
    ("check pauli(e1) == 1 as rotation",
     "'as rotation' compares rotors; L is a 2x2 matrix, not a rotor"),
    ("check S == S as frame", "a check compares 'as rotation': check L == R as rotation"),
])
def test_non_rotors_are_refused_in_one_line(session, text, message):
    ok(session, "x = rotor(e12, t)")
    results = session.run(text)
    error = results[-1]
    assert isinstance(error, GacalcError)
    assert error.message == message
    assert "\n" not in error.message
    # the session is as it was
    assert session.format(session.get("x")) == "cos(t/2) - sin(t/2)*e12"


def test_the_sign_line_appears_only_when_proved(session):
    # L + R = 0 proved: the line is there; for vectors without the rotor hint
    assert _render(session, "check -e1 == e1").endswith(
        "\n  L == -R: the two sides differ only in sign")
    # L + R is not zero: no such line
    text = _render(session, "check e1 == e2")
    assert "differ only in sign" not in text
    text = _render(session, "check rotor(e12, t + 1) == rotor(e12, t)")
    assert text.startswith("FAILED") and "differ only in sign" not in text
    # a check that holds says nothing of the kind
    assert "sign" not in _render(session, "check S == S")


# unit quaternions with rational components (2^2 + 3^2 + 6^2 = 7^2, 3^2 + 4^2 = 5^2)
_QUATERNIONS = [(1, 1, 1, 1, 2), (3, 4, 0, 0, 5), (0, 2, 3, 6, 7), (2, 0, -6, 3, 7)]


@pytest.mark.parametrize("w, x, y, z, d", _QUATERNIONS)
def test_a_unit_quaternion_and_its_negative_are_one_rotation(session, w, x, y, z, d):
    q = f"quaternion({w}/{d}, {x}/{d}, {y}/{d}, {z}/{d})"
    minus = f"quaternion({-w}/{d}, {-x}/{d}, {-y}/{d}, {-z}/{d})"
    result = ok(session, f"check {q} == {minus} as rotation")[-1]
    assert result.outcome == "holds" and result.note == "L = -R"
    assert ok(session, f"check {q} == {q} as rotation")[-1].note == "L = R"
    # a quaternion against the rotor it stands for (from_quaternion), and its negative
    assert ok(session, f"check {q} == -from_quaternion({q}) as rotation")[-1].note == "L = -R"
    # scipy's Rotation (scalar-last quaternions) agrees: q and -q give one matrix
    first = Rotation.from_quat([x / d, y / d, z / d, w / d]).as_matrix()
    second = Rotation.from_quat([-x / d, -y / d, -z / d, -w / d]).as_matrix()
    assert np.allclose(first, second)


def test_different_quaternions_fail_as_scipy_says(session):
    (w1, x1, y1, z1, d1), (w2, x2, y2, z2, d2) = _QUATERNIONS[1], _QUATERNIONS[2]
    text = (f"check quaternion({w1}/{d1}, {x1}/{d1}, {y1}/{d1}, {z1}/{d1}) == "
            f"quaternion({w2}/{d2}, {x2}/{d2}, {y2}/{d2}, {z2}/{d2}) as rotation")
    assert ok(session, text)[-1].outcome == "fails"
    first = Rotation.from_quat([x1 / d1, y1 / d1, z1 / d1, w1 / d1]).as_matrix()
    second = Rotation.from_quat([x2 / d2, y2 / d2, z2 / d2, w2 / d2]).as_matrix()
    assert not np.allclose(first, second)


def test_a_turn_by_two_pi_more_as_quaternions(session):
    # q(t + 2 pi) = -q(t) (common practice): one rotation, and the plain check fails
    text = "check quaternion(rotor(n, t + 2 pi)) == quaternion(rotor(n, t)) as rotation"
    assert ok(session, text)[-1].note == "L = -R"
    plain = "check quaternion(rotor(n, t + 2 pi)) == quaternion(rotor(n, t))"
    result = ok(session, plain)[-1]
    assert result.outcome == "fails"
    assert result.render().endswith(
        "\n  L == -R: the two sides differ only in sign"
        "\n  for unit quaternions, 'check L == R as rotation' compares the rotations")


@pytest.mark.parametrize("text, message", [
    ("check quaternion(1 + e12) == 1 as rotation",
     "'as rotation' compares rotations; L is not a unit quaternion (divide by its norm first)"),
    ("check 1 == quaternion(0, 0, 0, 0) as rotation",
     "'as rotation' compares rotations; R is the zero quaternion"),
])
def test_quaternions_that_are_not_rotations_are_refused_in_one_line(session, text, message):
    error = session.run(text)[-1]
    assert isinstance(error, GacalcError) and error.message == message

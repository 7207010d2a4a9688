"""Attitude conventions: Euler / Tait-Bryan angles and rotation vectors.

Outside reference: scipy.spatial.transform.Rotation (from_euler, as_euler, from_rotvec,
as_rotvec, from_quat, as_quat).  scipy writes quaternions as (x, y, z, w) and an axis
sequence in upper case for intrinsic rotations, lower case for extrinsic ones (scipy's
documentation of Rotation.from_euler).  A rotor maps to a quaternion through the Hamilton
convention of gacalc (README): R = w - x e23 - y e31 - z e12.
"""

from __future__ import annotations

import itertools
import warnings

import numpy as np
import pytest
import sympy
from scipy.spatial.transform import Rotation

from conftest import ok
from gacalc.algebra import Multivector
from gacalc.algebra import attitude as A
from gacalc.language import GacalcError, Session
from gacalc.language.results import NoteResult
from gacalc.values import kind_of

SEQUENCES = ["".join(s) for s in itertools.product("xyz", repeat=3)
             if s[0] != s[1] and s[1] != s[2]]
TAIT_BRYAN = [s for s in SEQUENCES if s[0] != s[2]]
PROPER = [s for s in SEQUENCES if s[0] == s[2]]
RNG = np.random.default_rng(1687)


def scipy_sequence(sequence: str, intrinsic: bool) -> str:
    return sequence.upper() if intrinsic else sequence


def quaternion_of(R: Multivector) -> np.ndarray:
    """scipy's (x, y, z, w) of a rotor (Hamilton: i = -e23, j = -e31, k = -e12)."""
    w, b23, b31, b12 = (float(sympy.N(R[k], 30)) for k in (0, 4, 5, 6))
    return np.array([-b23, -b31, -b12, w])


def rotor_of(quat) -> Multivector:
    """The floating-point rotor of scipy's quaternion (x, y, z, w)."""
    x, y, z, w = (sympy.Float(float(c)) for c in quat)
    return Multivector({0: w, 4: -x, 5: -y, 6: -z})


def same_rotation(q1, q2, tol=1e-10) -> bool:
    """Quaternions q and -q are the same rotation."""
    return min(np.abs(q1 - q2).max(), np.abs(q1 + q2).max()) < tol


def random_angles(sequence: str) -> list:
    """Exact rational angles away from gimbal lock (the middle one in its open range)."""
    outer = [sympy.Rational(int(RNG.integers(-310, 310)), 100) for _ in range(2)]
    if sequence[0] != sequence[2]:
        middle = sympy.Rational(int(RNG.integers(-150, 150)), 100)
    else:
        middle = sympy.Rational(int(RNG.integers(5, 310)), 100)
    return [outer[0], middle, outer[1]]


def results(session, text):
    return ok(session, text)


def value(session, text):
    return [r for r in results(session, text) if hasattr(r, "value")][-1].value


def notes(found) -> str:
    return "\n".join(r.message for r in found if isinstance(r, NoteResult))


# -- the rotor of three angles ----------------------------------------------------------------


@pytest.mark.parametrize("sequence", SEQUENCES)
@pytest.mark.parametrize("intrinsic", [True, False])
def test_from_euler_angles_matches_scipy_from_euler(sequence, intrinsic):
    # scipy.spatial.transform.Rotation.from_euler is the reference
    for _ in range(3):
        angles = random_angles(sequence)
        R = A.from_euler_angles(A.axis_sequence(sequence, intrinsic), angles)
        expected = Rotation.from_euler(scipy_sequence(sequence, intrinsic),
                                       [float(t) for t in angles]).as_quat()
        assert same_rotation(quaternion_of(R), expected)


# -- the angles of a rotor ----------------------------------------------------------------------


@pytest.mark.parametrize("sequence", SEQUENCES)
@pytest.mark.parametrize("intrinsic", [True, False])
def test_euler_angles_of_random_rotations_match_scipy_as_euler(sequence, intrinsic):
    # scipy.spatial.transform.Rotation.as_euler (same ranges: outer angles in (-pi, pi],
    # middle in [-pi/2, pi/2] for Tait-Bryan and [0, pi] for proper Euler sequences)
    rotations = Rotation.random(4, random_state=int(RNG.integers(1 << 30)))
    convention = A.axis_sequence(sequence, intrinsic)
    for rotation in rotations:
        got = A.euler_angles(rotor_of(rotation.as_quat()), convention)
        assert got.locked is None
        expected = rotation.as_euler(scipy_sequence(sequence, intrinsic))
        assert np.allclose([float(t) for t in got.angles], expected, atol=1e-9)


@pytest.mark.parametrize("sequence", SEQUENCES)
@pytest.mark.parametrize("intrinsic", [True, False])
def test_exact_angles_come_back_exactly(sequence, intrinsic):
    # angles p/q pi away from lock: the rotor of from_euler_angles gives them back exactly,
    # and scipy's as_euler agrees numerically
    convention = A.axis_sequence(sequence, intrinsic)
    middle = sympy.pi / 5 if sequence[0] != sequence[2] else 2 * sympy.pi / 5
    angles = [sympy.pi / 3, middle, -sympy.pi / 4]
    R = A.from_euler_angles(convention, angles)
    got = A.euler_angles(R, convention)
    assert list(got.angles) == angles
    expected = Rotation.from_quat(quaternion_of(R)).as_euler(
        scipy_sequence(sequence, intrinsic))
    assert np.allclose([float(t) for t in angles], expected)


@pytest.mark.parametrize("sequence", SEQUENCES)
@pytest.mark.parametrize("intrinsic", [True, False])
def test_round_trip_reproduces_the_rotation(sequence, intrinsic):
    convention = A.axis_sequence(sequence, intrinsic)
    for rotation in Rotation.random(3, random_state=int(RNG.integers(1 << 30))):
        R = rotor_of(rotation.as_quat())
        again = A.from_euler_angles(convention, A.euler_angles(R, convention).angles)
        assert same_rotation(quaternion_of(again), rotation.as_quat(), tol=1e-9)


# -- gimbal lock ---------------------------------------------------------------------------------


def _locked_middles(sequence):
    return (sympy.pi / 2, -sympy.pi / 2) if sequence[0] != sequence[2] else (0, sympy.pi)


@pytest.mark.parametrize("sequence", SEQUENCES)
@pytest.mark.parametrize("intrinsic", [True, False])
def test_gimbal_lock_sets_the_third_angle_to_zero_as_scipy_does(sequence, intrinsic):
    # scipy's as_euler warns at gimbal lock and sets the third angle to 0 (its documentation);
    # ours does the same without a warning, noting the lock instead
    convention = A.axis_sequence(sequence, intrinsic)
    for middle in _locked_middles(sequence):
        angles = [sympy.Rational(1, 3), middle, sympy.Rational(-1, 2)]
        R = A.from_euler_angles(convention, angles)
        got = A.euler_angles(R, convention)
        assert got.locked in (1, -1)
        assert got.angles[1] == middle and got.angles[2] == 0
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")     # scipy: "Gimbal lock detected"
            expected = Rotation.from_quat(quaternion_of(R)).as_euler(
                scipy_sequence(sequence, intrinsic))
        assert np.allclose([float(t) for t in got.angles], expected, atol=1e-12)
        again = A.from_euler_angles(convention, got.angles)
        assert same_rotation(quaternion_of(again), quaternion_of(R), tol=1e-12)


def test_gimbal_lock_of_a_floating_point_rotor():
    # pitch pi/2 in yaw-pitch-roll, from scipy; the float middle term is clamped to 1
    rotation = Rotation.from_euler("ZYX", [0.4, np.pi / 2, 0.0])
    got = A.euler_angles(rotor_of(rotation.as_quat()), A.axis_sequence("zyx"))
    assert got.locked == 1
    assert np.allclose([float(t) for t in got.angles], [0.4, np.pi / 2, 0.0], atol=1e-7)


def test_gimbal_lock_is_noted_in_the_language():
    s = Session()
    found = results(s, 'euler_angles(from_euler_angles("zyx", 1/3, pi/2, -1/2), "zyx")')
    assert "gimbal lock: the middle angle is at pi/2" in notes(found)
    assert "third angle was set to 0" in notes(found)
    assert tuple(value(s, "ans")) == tuple(Multivector.scalar(x) for x in
                                         (sympy.Rational(5, 6), sympy.pi / 2, 0))


def test_symbolic_rotor_gives_formulas_and_the_lock_condition():
    # the formulas in R0, R23, R31, R12, evaluated at a random unit quaternion, agree with
    # scipy's as_euler there
    s = Session()
    ok(s, "rotor R")
    found = results(s, 'A = euler_angles(R, "zyx")')
    assert "gimbal lock where 2*R0*R31 + 2*R12*R23 = 1 or -1" in notes(found)
    angles = value(s, "A")
    rotation = Rotation.random(random_state=44)
    x, y, z, w = rotation.as_quat()
    point = {sympy.Symbol("R0", real=True): w, sympy.Symbol("R23", real=True): -x,
             sympy.Symbol("R31", real=True): -y, sympy.Symbol("R12", real=True): -z}
    got = [float(item.scalar_part().subs(point)) for item in angles]
    assert np.allclose(got, rotation.as_euler("ZYX"))


def test_proper_euler_lock_condition_is_the_middle_cosine():
    s = Session()
    ok(s, "rotor R")
    found = results(s, 'euler_angles(R, "zxz")')
    assert "(the middle angle at 0 or pi)" in notes(found)


# -- symbolic angles --------------------------------------------------------------------------


def test_yaw_of_a_symbolic_angle_simplifies_under_its_range():
    s = Session()
    ok(s, "scalar a in (0, pi)")
    found = results(s, 'euler_angles(rotor(e12, a), "zyx")')
    assert "gimbal lock" not in notes(found)
    a = sympy.Symbol("a", real=True)
    assert tuple(found[-1].value) == (Multivector.scalar(a), Multivector.scalar(0),
                                      Multivector.scalar(0))


def test_pitch_in_its_open_range_is_never_locked():
    s = Session()
    ok(s, "scalar b in (-pi/2, pi/2)")
    found = results(s, 'euler_angles(rotor(e2, b), "zyx")')
    assert "gimbal lock" not in notes(found)
    b = sympy.Symbol("b", real=True)
    assert tuple(found[-1].value) == tuple(Multivector.scalar(x) for x in (0, b, 0))


def test_pitch_without_range_notes_where_it_locks():
    s = Session()
    found = results(s, 'euler_angles(rotor(e2, b), "zyx")')
    assert "gimbal lock where sin(b) = 1 or -1" in notes(found)


def test_symbolic_yaw_pitch_roll_round_trip():
    # common practice: intrinsic zyx of R = Rz(a) Ry(b) Rx(c) is (a, b, c) on the open ranges
    s = Session()
    ok(s, "scalar a in (0, pi/2)\nscalar b in (0, pi/2)\nscalar c in (0, pi/2)")
    got = value(s, 'euler_angles(from_euler_angles("zyx", a, b, c), "zyx")')
    names = [sympy.Symbol(n, real=True) for n in "abc"]
    assert tuple(got) == tuple(Multivector.scalar(n) for n in names)


# -- rotation vectors ---------------------------------------------------------------------------


def test_rotation_vector_matches_scipy_as_rotvec():
    # scipy.spatial.transform.Rotation.as_rotvec (|theta| <= pi)
    for rotation in Rotation.random(20, random_state=7):
        got = A.rotation_vector(rotor_of(rotation.as_quat())).vector
        assert np.allclose([float(got[k]) for k in (1, 2, 3)], rotation.as_rotvec(),
                           atol=1e-9)


def test_from_rotation_vector_matches_scipy_from_rotvec():
    # scipy.spatial.transform.Rotation.from_rotvec; exact vectors p/q (e1, e2, e3)
    for _ in range(10):
        v = [sympy.Rational(int(RNG.integers(-300, 300)), 100) for _ in range(3)]
        R = A.from_rotation_vector(Multivector({1: v[0], 2: v[1], 3: v[2]}))
        expected = Rotation.from_rotvec([float(c) for c in v]).as_quat()
        assert same_rotation(quaternion_of(R), expected)


def test_rotation_vector_takes_the_short_way():
    s = Session()
    # rotor(e12, 3 pi/2) turns by 3 pi/2 about e3, which is -pi/2 about e3 (scipy as_rotvec
    # of the same rotation says the same)
    got = value(s, "rotation_vector(rotor(e12, 3/2 pi))")
    assert got == Multivector({3: -sympy.pi / 2})
    expected = Rotation.from_rotvec([0, 0, 3 * np.pi / 2]).as_rotvec()
    assert np.allclose([0, 0, float(got[3])], expected)
    assert value(s, "rotation_vector(-1)") == Multivector()
    assert value(s, "rotation_vector(rotor(e1, pi))") == Multivector({1: sympy.pi})


def test_symbolic_rotation_vector_both_ways():
    s = Session()
    ok(s, "scalar c in (0, pi)")
    c = sympy.Symbol("c", real=True)
    assert value(s, "rotation_vector(rotor(e12, c))") == Multivector({3: c})
    assert value(s, "rotation_vector(rotor(e12, -c))") == Multivector({3: -c})
    back = value(s, "from_rotation_vector(c e1)")
    assert back == Multivector({0: sympy.cos(c / 2), 4: -sympy.sin(c / 2)})   # rotor(e1, c)
    results(s, "check from_rotation_vector(rotation_vector(rotor(e1 /\\ e2, c))) == "
               "rotor(e12, c)")


def test_rotation_vector_about_a_symbolic_axis_is_the_angle_times_the_axis():
    # rotor(n, t) for unit n and t in (-pi, pi) has rotation vector t n (common practice):
    # read through the common factor sin(t/2) of the bivector, with no |v| left over
    s = Session()
    ok(s, "scalar t in (-pi, pi)\nvector n unit")
    t = sympy.Symbol("t", real=True)
    n = [sympy.Symbol(f"n{k}", real=True) for k in (1, 2, 3)]
    assert value(s, "rotation_vector(rotor(n, t))") == Multivector(
        {k: t * n[k - 1] for k in (1, 2, 3)})
    # an axis with rational components: its norm comes out of the factor
    assert value(s, "rotation_vector(rotor((3/5) e1 + (4/5) e2, t))") == Multivector(
        {1: 3 * t / 5, 2: 4 * t / 5})
    results(s, "check from_rotation_vector(rotation_vector(rotor(n, t))) == rotor(n, t)")
    # numerically at a point, against scipy's rotation vector of the same quaternion
    got = value(s, "subs(rotation_vector(rotor(n, t)), t, 5/2, n1, 2/7, n2, 3/7, n3, 6/7)")
    half = 1.25
    quat = [np.sin(half) * 2 / 7, np.sin(half) * 3 / 7, np.sin(half) * 6 / 7, np.cos(half)]
    expected = Rotation.from_quat(quat).as_rotvec()
    assert np.allclose([float(got[k]) for k in (1, 2, 3)], expected)
    assert np.allclose(expected, 2.5 * np.array([2, 3, 6]) / 7)


def test_rotation_vector_of_unknown_sign_says_what_it_assumes():
    s = Session()
    found = results(s, "rotation_vector(rotor(e12, a))")
    assert "holds where R0 != 0" in notes(found)
    assert "'scalar a in (-pi, pi)'" in notes(found)


# -- the language: words, errors, printing ------------------------------------------------------


def test_printed_angles_read_back():
    s = Session()
    got = value(s, 'euler_angles(from_euler_angles("zyx", pi/3, pi/4, pi/6), "zyx")')
    text = kind_of(got).text(got)
    assert text == "(pi/3, pi/4, pi/6)"
    assert value(s, text) == got


def test_angles_may_be_given_as_a_list_and_extrinsic():
    s = Session()
    ok(s, 'R = from_euler_angles("xyz", (pi/3, pi/5, pi/7), "extrinsic")')
    same = value(s, 'from_euler_angles("zyx", pi/7, pi/5, pi/3)')   # reversed intrinsic
    assert value(s, "R") == same
    got = value(s, 'euler_angles(R, "xyz", "extrinsic")')
    assert kind_of(got).text(got) == "(pi/3, pi/5, pi/7)"


def test_the_default_is_intrinsic():
    s = Session()
    ok(s, 'R = from_euler_angles("zyx", pi/3, pi/5, pi/7)')
    assert value(s, 'euler_angles(R, "zyx")') == value(s, 'euler_angles(R, "zyx", "intrinsic")')


@pytest.mark.parametrize("text, words, at", [
    ('euler_angles(rotor(e12, 1), "zzx")', "neighbouring axes of a sequence differ", '"zzx"'),
    ('euler_angles(rotor(e12, 1), "abc")', "three letters from x, y, z", '"abc"'),
    ('euler_angles(rotor(e12, 1), "zyx", "sideways")', 'not "sideways"', '"sideways"'),
    ('euler_angles(rotor(e12, 1), zyx)', "must be a word in quotes", "zyx"),
    ('euler_angles("zyx", rotor(e12, 1))', "must be a word in quotes", "rotor"),
    ('euler_angles(e1, "zyx")', "needs a rotor", "euler_angles"),
    ('euler_angles(2 + e12, "zyx")', "needs a rotor", "euler_angles"),
    ('from_euler_angles("zyx", 1, 2)', "three angles", "from_euler_angles"),
    ('from_euler_angles("zyx", "a", 1, 2)', "an angle goes here", '"a"'),
    ('from_euler_angles("zyx", (1, 2))', "not a list of 2", "(1, 2)"),
    ('from_euler_angles("zyx", e1, 2, 3)', "must be a scalar", "e1"),
    ('rotation_vector(e1)', "needs a rotor", "rotation_vector"),
    ('from_rotation_vector(e12)', "must be a vector", "e12"),
    ('norm("zyx")', "takes no words in quotes", '"zyx"'),
    ('f(x) = x\nf("zyx")', "is a word in quotes, not a value", '"zyx"'),
    ('x = "zyx"', "is a word in quotes", '"zyx"'),
    ('1 + "zyx"', "is a word in quotes", '"zyx"'),
])
def test_bad_input_is_one_line_with_its_position(text, words, at):
    s = Session()
    ok(s, "y = 1")
    found = s.run(text)
    failure = found[-1]
    assert isinstance(failure, GacalcError), found
    assert words in failure.message
    assert "\n" not in failure.message
    assert failure.span.column == text.splitlines()[-1].index(at) + 1
    assert value(s, "y") == Multivector.scalar(1)      # the session is as it was


def test_words_unparse_and_highlight_as_strings():
    from gacalc.highlight import GacalcLexer
    from gacalc.language.parser import read_expression
    from gacalc.language.syntax import unparse

    node = read_expression('euler_angles(R, "zyx", "extrinsic")')
    assert unparse(node) == 'euler_angles(R, "zyx", "extrinsic")'
    kinds = [str(kind) for kind, text in GacalcLexer().get_tokens('euler_angles(R, "zyx")')
             if text == '"zyx"']
    assert kinds == ["Token.Literal.String"]


def test_show_of_a_rotor_lists_yaw_pitch_roll():
    # scipy's as_euler("ZYX") of the same rotation is the reference
    from gacalc.forms import build_report

    R = A.from_euler_angles(A.axis_sequence("zyx"), [sympy.pi / 3, sympy.pi / 4, sympy.pi / 6])
    item = build_report(R).item("yaw, pitch, roll")
    assert "intrinsic zyx" in item.note
    expected = Rotation.from_quat(quaternion_of(R)).as_euler("ZYX")
    assert np.allclose([float(a.scalar_part()) for a in item.value], expected)
    assert item.value[1] == Multivector.scalar(sympy.pi / 4)     # the middle angle exactly
    locked = build_report(A.from_euler_angles(A.axis_sequence("zyx"), [1, sympy.pi / 2, 0]))
    assert "gimbal lock" in locked.item("yaw, pitch, roll").note


def test_upper_case_axes_are_refused_with_the_convention_words():
    # scipy's upper case means intrinsic; ours says so in words, so case is not accepted
    s = Session()
    failure = s.run('euler_angles(rotor(e3, 1), "ZYX")')[-1]
    assert isinstance(failure, GacalcError)
    assert 'lower case, "zyx"' in failure.message and '"extrinsic"' in failure.message


def test_floating_point_angles_print_as_floats():
    s = Session()
    got = value(s, 'euler_angles(numeric(rotor(e3, 1) rotor(e2, 1/2)), "zyx")')
    assert kind_of(got).text(got) == "(1.0, 0.5, 0.0)"


def test_yaw_pitch_roll_out_of_time_leaves_the_other_forms(monkeypatch):
    # the item runs under its own share of the section budget: when it runs out, only
    # it is replaced by a line naming euler_angles (no timing here: the running out is
    # simulated)
    from gacalc.forms import build_report
    from gacalc.forms import report as report_module
    from gacalc.simplify.budget import BudgetExceeded

    def out_of_time(self, r, prefix):
        raise BudgetExceeded("time budget ran out")

    monkeypatch.setattr(report_module._Builder, "_attitude_item", out_of_time)
    # sections get a minute (a busy machine must not time out the real ones)
    report = build_report(A.from_euler_angles(A.axis_sequence("zyx"), [sympy.pi / 3, 0, 0]),
                          section_seconds=60, source="R")
    assert "quaternion" in report and "rotation matrix" in report
    item = report.item("yaw, pitch, roll")
    assert item.value == "omitted" and 'euler_angles(R, "zyx")' in item.note


@pytest.mark.parametrize("intrinsic", [True, False])
def test_symbolic_formulas_agree_with_sympy_quaternion_to_euler(intrinsic):
    # sympy.algebras.quaternion.Quaternion.to_euler (sympy's own Euler angles, upper case
    # = intrinsic as in scipy) is a second reference: our formulas in R0, R23, R31, R12 at
    # a random unit quaternion against sympy's angles of that quaternion (sympy's outer
    # angles are not wrapped to (-pi, pi], so they agree modulo 2 pi)
    from sympy.algebras.quaternion import Quaternion

    from gacalc.algebra import symbolic

    R, conditions = symbolic("rotor", "R")
    names = {name: sympy.Symbol(name, real=True) for name in ("R0", "R23", "R31", "R12")}
    rotation = Rotation.random(random_state=91 + intrinsic)
    x, y, z, w = rotation.as_quat()
    point = {names["R0"]: w, names["R23"]: -x, names["R31"]: -y, names["R12"]: -z}
    for sequence in SEQUENCES:
        got = A.euler_angles(R, A.axis_sequence(sequence, intrinsic), conditions)
        ours = [float(angle.subs(point)) for angle in got.angles]
        reference = Quaternion(w, x, y, z).to_euler(scipy_sequence(sequence, intrinsic))
        # sympy adds two atan2 values without wrapping: compare the angles modulo 2 pi
        gap = np.array(ours) - np.array([float(a) for a in reference])
        assert np.allclose(np.angle(np.exp(1j * gap)), 0, atol=1e-9), sequence

"""The derived-forms report (gacalc.forms): each item against an outside reference.

References: scipy.spatial.transform.Rotation (a rotor's angle, axis, matrix, quaternion),
numpy.linalg (norms, inverses, determinants, angles), numpy.cross, sympy's Pauli matrices
(sympy.physics.matrices.msigma) and scipy.linalg.expm for the matrix picture, and
published formulas named beside each check (Rodrigues, Householder, the unit-quaternion
rotation matrix).
"""

import math

import numpy as np
import pytest
import sympy
from scipy.linalg import expm
from scipy.spatial.transform import Rotation
from sympy.physics.matrices import msigma

from gacalc.algebra import I, Multivector, e1, e2, e3, e12, e23, e31, symbolic, vector
from gacalc.algebra.rotors import rotor
from gacalc.forms import Report, ReportItem, build_report, render_latex, render_text
from gacalc.simplify import simplify, simplify_scalar
from gacalc.values.sequence import ValueList

theta = sympy.Symbol("theta", real=True)


# ---------------------------------------------------------------------------
# numeric helpers (references are computed in numpy, never by gacalc)


def num(e) -> float:
    return float(sympy.N(e, 30))


def coefficients(mv) -> np.ndarray:
    return np.array([num(mv[k]) for k in range(8)])


def vec(mv) -> np.ndarray:
    return coefficients(mv)[1:4]


def array(m, dtype=float) -> np.ndarray:
    return np.array(sympy.N(sympy.Matrix(m), 30).tolist(), dtype=dtype)


# Pauli matrices from sympy (sigma_x, sigma_y, sigma_z); the products give the bivectors
# and the trivector, so this picture is built without gacalc's product table.
SIGMA = [np.array(msigma(i).tolist(), dtype=complex) for i in (1, 2, 3)]
ONE2 = np.eye(2, dtype=complex)
PAULI_BASIS = [ONE2, SIGMA[0], SIGMA[1], SIGMA[2], SIGMA[1] @ SIGMA[2], SIGMA[2] @ SIGMA[0],
               SIGMA[0] @ SIGMA[1], SIGMA[0] @ SIGMA[1] @ SIGMA[2]]


def pauli_reference(mv) -> np.ndarray:
    return sum(c * b for c, b in zip(coefficients(mv), PAULI_BASIS))


def vector_of_pauli(m) -> np.ndarray:
    """The vector part of a 2x2 matrix: x_i = Re tr(sigma_i M) / 2."""
    return np.array([np.trace(s @ m).real / 2 for s in SIGMA])


def quaternion_of(mv):
    """Hamilton (w, x, y, z) with i = -e23, j = -e31, k = -e12 (DESIGN.md conventions)."""
    return np.array([num(mv[0]), -num(mv[4]), -num(mv[5]), -num(mv[6])])


def same_rotation(r1: Rotation, r2: Rotation) -> bool:
    return (r1.inv() * r2).magnitude() < 1e-9


def is_zero_expr(e, conditions=()) -> bool:
    return simplify_scalar(e, conditions) == 0


def mv_equal(a, b, conditions=()) -> bool:
    return simplify(a - b, conditions).value.is_zero()


# ---------------------------------------------------------------------------
# rotors: scipy Rotation is the reference

ROTOR_CASES = [
    ((0, 0, 1), sympy.pi / 2),
    ((sympy.Rational(1, 3), sympy.Rational(2, 3), sympy.Rational(2, 3)), 2 * sympy.pi / 3),
    ((0, sympy.Rational(3, 5), sympy.Rational(4, 5)), 5 * sympy.pi / 3),  # angle > pi
    ((sympy.Rational(2, 7), sympy.Rational(-3, 7), sympy.Rational(6, 7)), sympy.pi / 5),
]


@pytest.fixture(scope="module", params=range(len(ROTOR_CASES)))
def rotor_case(request):
    axis, angle = ROTOR_CASES[request.param]
    r = rotor(vector(*axis), angle)
    return np.array([num(a) for a in axis]), angle, r, build_report(r)


def test_rotor_kind_angle_axis_match_scipy(rotor_case):
    axis, angle, r, report = rotor_case
    assert report.kind == "rotor"
    # rotor(n, t) turns by t about n (right-hand rule), as scipy's from_rotvec(t n) does
    reference = Rotation.from_rotvec(num(angle) * axis)
    reported = Rotation.from_rotvec(num(report["angle"]) * vec(report["axis"]))
    assert same_rotation(reference, reported)
    # the rotor's own angle is in [0, 2 pi] and here equals the angle it was built with
    assert is_zero_expr(report["angle"] - angle)
    # scipy's rotation vector uses the angle in [0, pi]: -R (2 pi - t about -n) for t > pi
    a, n = num(report["angle"]), vec(report["axis"])
    expected_rotvec = a * n if a <= math.pi else (a - 2 * math.pi) * n
    assert np.allclose(reference.as_rotvec(), expected_rotvec)


def test_rotor_matrix_matches_scipy(rotor_case):
    axis, angle, r, report = rotor_case
    reference = Rotation.from_rotvec(num(angle) * axis).as_matrix()
    assert np.allclose(array(report["rotation matrix"]), reference)


def test_rotor_quaternion_matches_scipy(rotor_case):
    axis, angle, r, report = rotor_case
    q = np.array([num(c) for c in report["quaternion"]])
    reference = Rotation.from_rotvec(num(angle) * axis)
    # a quaternion and its negative are the same rotation: compare up to sign
    scipy_q = reference.as_quat(scalar_first=True)
    assert np.allclose(q, scipy_q) or np.allclose(q, -scipy_q)
    assert np.allclose(Rotation.from_quat(q, scalar_first=True).as_matrix(), reference.as_matrix())
    assert "i = -e23" in report.item("quaternion").note


def test_rotor_pauli_and_log(rotor_case):
    axis, angle, r, report = rotor_case
    assert np.allclose(array(report["Pauli matrix"], complex), pauli_reference(r))
    # exp(log R) = R, checked with the matrix exponential of the Pauli picture (scipy)
    assert np.allclose(expm(pauli_reference(report["log"])), pauli_reference(r))
    assert mv_equal(report["same rotation"], -r)
    assert "same rotation" in report.item("same rotation").note


def test_rotor_with_negative_scalar_part_has_angle_above_pi():
    # R = -(cos(pi/8) - sin(pi/8) e12): the rotor angle is 2 pi - pi/4 about -e3
    r = -rotor(e3, sympy.pi / 4)
    report = build_report(r)
    assert is_zero_expr(report["angle"] - 7 * sympy.pi / 4)
    assert mv_equal(report["axis"], -e3)
    reference = Rotation.from_rotvec([0, 0, math.pi / 4])
    assert np.allclose(array(report["rotation matrix"]), reference.as_matrix())


def test_symbolic_rotor_about_e3_gives_closed_forms():
    r = rotor(e3, theta)  # cos(theta/2) - sin(theta/2) e12
    report = build_report(r)
    assert report.kind == "rotor"
    assert report["angle"] == theta
    assert "0 <= theta <= 2*pi" in report.item("angle").note  # the principal-range caveat
    assert mv_equal(report["plane"], e12) and mv_equal(report["axis"], e3)
    # the rotation about z, a handbook matrix (common practice)
    expected = sympy.Matrix([[sympy.cos(theta), -sympy.sin(theta), 0],
                             [sympy.sin(theta), sympy.cos(theta), 0], [0, 0, 1]])
    got = sympy.Matrix(report["rotation matrix"])
    assert all(is_zero_expr(x) for x in got - expected)
    # the axis-angle quaternion (cos t/2, sin t/2 n), Hamilton's convention
    w, x, y, z = report["quaternion"]
    assert is_zero_expr(w - sympy.cos(theta / 2)) and x == 0 and y == 0
    assert is_zero_expr(z - sympy.sin(theta / 2))
    assert mv_equal(report["log"], e12.scale(-theta / 2))
    # closed forms: no floating point anywhere, and no atan2 left in the angle
    for item in report.items:
        value = item.value
        exprs = (value.to_expr_dict().values() if isinstance(value, Multivector)
                 else list(value) if isinstance(value, (tuple, sympy.MatrixBase))
                 else [] if isinstance(value, str) else [value])
        assert not any(isinstance(e, sympy.Basic) and e.has(sympy.Float) for e in exprs), item.label
    assert not report["angle"].has(sympy.atan2)
    # and the closed form agrees with scipy at a sample angle
    at = {theta: sympy.Rational(7, 10)}
    assert np.allclose(array(got.subs(at)), Rotation.from_rotvec([0, 0, 0.7]).as_matrix())


def test_symbolic_rotor_about_unit_axis_matches_rodrigues():
    n, conditions = symbolic("vector", "n", unit=True)
    r = rotor(n, theta, conditions=conditions)
    report = build_report(r, conditions=conditions)
    assert report.kind == "rotor"
    assert report["angle"] == theta
    assert mv_equal(report["axis"], n, conditions)
    # Rodrigues' rotation formula: cos t 1 + sin t [n]x + (1 - cos t) n n^T
    nx = sympy.Matrix([n[1], n[2], n[3]])
    cross = sympy.Matrix([[0, -nx[2], nx[1]], [nx[2], 0, -nx[0]], [-nx[1], nx[0], 0]])
    rodrigues = (sympy.cos(theta) * sympy.eye(3) + sympy.sin(theta) * cross
                 + (1 - sympy.cos(theta)) * nx * nx.T)
    got = sympy.Matrix(report["rotation matrix"])
    assert all(is_zero_expr(x, conditions) for x in got - rodrigues)


def test_declared_rotor_matrix_is_the_unit_quaternion_formula():
    r, conditions = symbolic("rotor", "R")
    report = build_report(r, conditions=conditions)
    assert report.kind == "rotor"
    w, x, y, z = report["quaternion"]
    R0, R23, R31, R12 = (r[k] for k in (0, 4, 5, 6))
    assert (w, x, y, z) == (R0, -R23, -R31, -R12)
    # the rotation matrix of a unit quaternion (published formula, e.g. Shoemake 1985)
    expected = sympy.Matrix([
        [1 - 2 * (y**2 + z**2), 2 * (x * y - z * w), 2 * (x * z + y * w)],
        [2 * (x * y + z * w), 1 - 2 * (x**2 + z**2), 2 * (y * z - x * w)],
        [2 * (x * z - y * w), 2 * (y * z + x * w), 1 - 2 * (x**2 + y**2)]])
    got = sympy.Matrix(report["rotation matrix"])
    assert all(is_zero_expr(v, conditions) for v in got - expected)


def test_symbolic_rotor_without_unit_condition_is_an_even_versor():
    r, _ = symbolic("rotor", "R")  # the unit condition not passed
    report = build_report(r)
    assert report.kind == "even versor"
    assert report.item("versor").condition is not None
    # the angle is read from V itself; at a sample point it matches scipy
    point = {r[0]: 1, r[4]: 2, r[5]: -1, r[6]: 3}
    q = np.array([1, -2, 1, -3]) / math.sqrt(15)
    reference = Rotation.from_quat(q, scalar_first=True)
    angle = num(report["rotor angle"].subs(point))
    axis = vec(report["rotor axis"].subs(point))
    assert same_rotation(reference, Rotation.from_rotvec(angle * axis))


def test_even_versor_scale_and_rotor():
    v = 2 + 2 * e12
    report = build_report(v)
    assert report.kind == "even versor"
    assert np.isclose(num(report["scale |V|"]), np.linalg.norm(coefficients(v)))
    unit = report["rotor V/|V|"]
    q = quaternion_of(unit)
    assert np.allclose(array(report["rotor rotation matrix"]),
                       Rotation.from_quat(q, scalar_first=True).as_matrix())


# ---------------------------------------------------------------------------
# the common part: grades, involutions, norms, inverse, dual


GENERAL = 1 + 2 * e1 - e23 + 3 * I


def test_grades_and_parity():
    assert build_report(rotor(e3, theta))["grades"] == "0, 2 (even)"
    assert build_report(e1 + 2 * I)["grades"] == "1, 3 (odd)"
    report = build_report(GENERAL)
    assert report["grades"] == "0, 1, 2, 3 (mixed parity)"
    for k, label in enumerate(("scalar part", "vector part", "bivector part", "trivector part")):
        assert mv_equal(report[label], GENERAL.grade(k))


def test_involutions_follow_the_sign_table():
    # reverse flips grades 2, 3; grade involution 1, 3; Clifford conjugate 1, 2
    # (common practice; the sign patterns (-1)^(r(r-1)/2), (-1)^r and their product)
    x = 1 + e1 + e2 + e3 + e23 + e31 + e12 + I
    report = build_report(x)
    assert np.allclose(coefficients(report["reverse"]), [1, 1, 1, 1, -1, -1, -1, -1])
    assert np.allclose(coefficients(report["grade involution"]), [1, -1, -1, -1, 1, 1, 1, -1])
    assert np.allclose(coefficients(report["Clifford conjugate"]), [1, -1, -1, -1, -1, -1, -1, 1])


def test_norms_match_numpy():
    report = build_report(GENERAL)
    assert np.isclose(num(report["norm"]), np.linalg.norm(coefficients(GENERAL)))
    assert np.isclose(num(report["norm2"]), np.linalg.norm(coefficients(GENERAL)) ** 2)


def test_inverse_matches_numpy_inverse_of_the_pauli_matrix():
    report = build_report(GENERAL)
    inverse = report["inverse"]
    assert np.allclose(pauli_reference(inverse), np.linalg.inv(pauli_reference(GENERAL)))
    assert report.item("inverse").condition is None


def test_no_inverse_when_the_pauli_matrix_is_singular():
    x = 1 + e1  # (1 + e1)(1 - e1) = 0
    assert np.isclose(np.linalg.det(pauli_reference(x)), 0)
    report = build_report(x)
    assert report["inverse"] == "none"
    assert "not invertible" in report.item("inverse").note


def test_symbolic_inverse_carries_its_condition():
    m, _ = symbolic("multivector", "M")
    report = build_report(m)
    item = report.item("inverse")
    assert item.condition is not None and item.condition.free_symbols
    point = {s: sympy.Rational(k + 2, 3 + k) for k, s in enumerate(sorted(m.free_symbols, key=str))}
    inverse = item.value.subs(point)
    assert np.allclose(pauli_reference(inverse), np.linalg.inv(pauli_reference(m.subs(point))))
    assert num(item.condition.subs(point)) != 0


def test_dual_of_a_bivector_is_the_cross_product():
    u, w = np.array([1, 2, 0]), np.array([0, 1, 3])
    b = vector(*map(int, u)).outer(vector(*map(int, w)))
    report = build_report(b)
    assert report.kind == "bivector"
    assert report["blade"] == "yes" and "every homogeneous element is a blade" in report.item("blade").note
    normal = np.cross(u, w)  # numpy's Gibbs cross product; DESIGN: a x b = dual(a ^ b)
    assert np.allclose(vec(report["dual"]), normal)
    assert np.allclose(vec(report["normal axis (dual)"]), normal)
    area = np.linalg.norm(normal)  # parallelogram area |u x w|
    assert np.isclose(num(report["area"]), area)
    assert np.isclose(num(report["square"]), -area**2)
    assert np.allclose(coefficients(report["unit plane"]), coefficients(b) / area)


# ---------------------------------------------------------------------------
# vectors, odd versors, the rest


def test_vector_magnitude_direction_and_mirror():
    x = vector(3, 4, 12)
    report = build_report(x)
    assert report.kind == "vector"
    v = np.array([3, 4, 12])
    assert np.isclose(num(report["magnitude"]), np.linalg.norm(v))  # 13
    assert report["magnitude"] == 13
    assert np.allclose(vec(report["direction"]), v / 13)
    plane = coefficients(report["plane (dual)"])[4:7]  # (B23, B31, B12): the plane's normal
    assert np.allclose(np.cross(plane, v), 0) and np.linalg.norm(plane) > 0
    n = v / 13
    householder = np.eye(3) - 2 * np.outer(n, n)  # the Householder reflection
    assert np.allclose(array(report["reflection matrix"]), householder)
    assert report["acts as"] == "reflection"
    assert np.allclose(vec(report["mirror normal"]), n)


def test_symbolic_unit_vector_has_magnitude_one():
    n, conditions = symbolic("vector", "n", unit=True)
    report = build_report(n, conditions=conditions)
    assert report["magnitude"] == 1
    assert report.item("direction").condition is None
    assert mv_equal(report["inverse"], n, conditions)


def test_rotary_reflection_matches_scipy_and_the_pauli_picture():
    v = vector(1, 2, 2) + 3 * I
    report = build_report(v)
    assert report.kind == "odd versor"
    assert report["acts as"] == "rotary reflection"
    m = array(report["map matrix"])
    # the map x -> V x^ V^-1 = -V x V^-1, computed with numpy in the Pauli picture
    pv = pauli_reference(v)
    reference = np.column_stack([
        vector_of_pauli(-pv @ SIGMA[k] @ np.linalg.inv(pv)) for k in range(3)])
    assert np.allclose(m, reference)
    assert np.isclose(np.linalg.det(m), -1)
    # = rotation by the reported angle about n after the reflection in the plane normal to n
    n = vec(report["mirror normal"])
    rotation = Rotation.from_rotvec(num(report["rotation angle"]) * n).as_matrix()
    assert np.allclose(m, rotation @ (np.eye(3) - 2 * np.outer(n, n)))


def test_trivector_and_scalar():
    report = build_report(2 * I)
    assert report.kind == "trivector"
    assert report["acts as"] == "point reflection"
    assert report["volume (dual)"] == Multivector({0: 2})
    assert build_report(Multivector({0: 5})).kind == "scalar"
    assert build_report(Multivector({})).kind == "zero"


def test_undecidable_part_gives_an_undecided_kind():
    from gacalc.simplify import is_zero

    t, u = sympy.symbols("t u", real=True)
    # log(t u) = log t + log u holds for positive t, u only (common practice), so for real
    # symbols the simplifier may not decide it; the report must then say "undecided"
    c = sympy.log(t * u) - sympy.log(t) - sympy.log(u)
    report = build_report(e1 + e12.scale(c))
    verdict = is_zero(Multivector({0: c}))
    if verdict is None:
        assert report.kind == "undecided" and "undecided" in report["grades"]
    else:
        assert report.kind == ("vector" if verdict else "general")


def test_unit_bivector_is_also_a_half_turn_rotor():
    report = build_report(e31)
    assert report.kind == "bivector"
    assert report["rotor"] == "yes"


def test_general_pauli_and_central_part():
    report = build_report(GENERAL)
    assert report.kind == "general"
    assert np.allclose(array(report["Pauli matrix"], complex), pauli_reference(GENERAL))
    central = report["central part"]
    assert mv_equal(central, 1 + 3 * I)
    # the central part commutes with sigma_x, sigma_y, sigma_z (numpy)
    pc = pauli_reference(central)
    assert all(np.allclose(pc @ s, s @ pc) for s in SIGMA)


# ---------------------------------------------------------------------------
# x against B


def test_vector_against_vector():
    xs, bs = np.array([1, 2, 2]), np.array([2, -1, 3])
    x, b = vector(*map(int, xs)), vector(*map(int, bs))
    report = build_report(x, against=b)
    proj = xs.dot(bs) / bs.dot(bs) * bs  # orthogonal projection onto a line
    assert np.allclose(vec(report["projection"]), proj)
    assert np.allclose(vec(report["rejection"]), xs - proj)
    assert np.isclose(num(report["|projection|"]), np.linalg.norm(proj))
    assert np.isclose(num(report["|rejection|"]), np.linalg.norm(xs - proj))
    cosine = xs.dot(bs) / (np.linalg.norm(xs) * np.linalg.norm(bs))
    assert np.isclose(num(report["angle"]), np.arccos(cosine))
    r = report["rotor x -> B"]
    turn = Rotation.from_quat(quaternion_of(r), scalar_first=True)
    assert np.allclose(turn.apply(xs), np.linalg.norm(xs) * bs / np.linalg.norm(bs))
    axis = np.cross(xs, bs)  # the turn is in the plane of x and B
    expected = Rotation.from_rotvec(np.arccos(cosine) * axis / np.linalg.norm(axis))
    assert same_rotation(turn, expected)


def test_vector_against_plane():
    xs = np.array([1, 2, 3])
    u, w = np.array([1, 1, 0]), np.array([0, 1, 2])
    b = vector(*map(int, u)).outer(vector(*map(int, w)))
    report = build_report(vector(*map(int, xs)), against=b)
    n = np.cross(u, w) / np.linalg.norm(np.cross(u, w))
    rej = xs.dot(n) * n
    assert np.allclose(vec(report["projection"]), xs - rej)
    assert np.allclose(vec(report["rejection"]), rej)
    assert np.isclose(num(report["angle"]), np.arcsin(abs(xs.dot(n)) / np.linalg.norm(xs)))
    assert "rotor x -> B" not in report


def test_opposite_vectors_pick_one_plane():
    report = build_report(e1, against=-2 * e1)
    r = report["rotor x -> B"]
    turn = Rotation.from_quat(quaternion_of(r), scalar_first=True)
    assert np.allclose(turn.apply([1, 0, 0]), [-1, 0, 0])
    assert "one choice" in report.item("rotor x -> B").note


def test_symbolic_vectors_against_each_other():
    a, _ = symbolic("vector", "a")
    b, _ = symbolic("vector", "b")
    report = build_report(a, against=b)
    label = "rotor x -> B (unnormalized)"
    point = {a[1]: 1, a[2]: 2, a[3]: -1, b[1]: 3, b[2]: 0, b[3]: 4}
    v = report[label].subs(point)
    turn = Rotation.from_quat(quaternion_of(v) / np.linalg.norm(quaternion_of(v)),
                              scalar_first=True)
    assert np.allclose(turn.apply([1, 2, -1]), math.sqrt(6) * np.array([3, 0, 4]) / 5)
    cosine = (3 - 4) / (math.sqrt(6) * 5)
    assert np.isclose(num(report["angle"].subs(point)), np.arccos(cosine))


def test_against_needs_a_vector_for_the_angle_and_a_blade():
    report = build_report(1 + e1, against=e2)
    assert report["angle"] == "none"
    report = build_report(e1, against=1 + e12)
    assert report["projection"] == "none"
    assert "blade" in report.item("projection").note


# ---------------------------------------------------------------------------
# other values, structured data


def test_matrix_and_quaternion_values_are_reported_as_they_are():
    m = sympy.Matrix([[1, 2], [3, 4]])
    report = build_report(m)
    assert report.kind == "matrix" and report["value"] == m
    q = sympy.Quaternion(1, 2, 3, 4)
    report = build_report(q)
    assert report.kind == "quaternion" and report.items[0].value == (1, 2, 3, 4)


def test_to_dict_is_plain_structured_data():
    data = build_report(e1 + e2).to_dict()
    assert data["kind"] == "vector" and data["complete"] is True
    labels = [item["label"] for item in data["items"]]
    assert labels[0] == "value" and "magnitude" in labels
    assert all(set(item) == {"label", "value", "note", "section", "condition"}
               for item in data["items"])


def test_bad_value_is_refused_with_a_message():
    from gacalc.algebra import AlgebraError

    with pytest.raises(AlgebraError, match="show needs"):
        build_report("e1")


# ---------------------------------------------------------------------------
# rendering


RENDER_CASES = [
    lambda: build_report(rotor(e3, theta)),
    lambda: build_report(rotor(vector(0, sympy.Rational(3, 5), sympy.Rational(4, 5)), sympy.pi / 3)),
    lambda: build_report(vector(1, 2, 3), against=e12 + e23),
    lambda: build_report(GENERAL),
    lambda: build_report(vector(1, 2, 2) + 3 * I),
]


@pytest.fixture(scope="module")
def rendered_reports():
    return [case() for case in RENDER_CASES]


@pytest.mark.parametrize("unicode", [False, True])
def test_text_fits_80_columns_and_pastes_back(rendered_reports, unicode):
    from gacalc.language import Session
    from gacalc.language.session import Result

    for report in rendered_reports:
        text = render_text(report, unicode=unicode)
        assert all(len(line) <= 80 for line in text.splitlines()), text
        # the whole report reads back without error: values bare, everything else comments
        results = Session().run(text)
        assert all(isinstance(r, Result) and r.kind in ("value", "note") for r in results), \
            [r for r in results if not isinstance(r, Result)]
        values = [r for r in results if r.kind == "value"]
        printable = [it for it in report.items if isinstance(it.value, Multivector)
                     or (isinstance(it.value, sympy.Expr) and not isinstance(it.value, sympy.MatrixBase))
                     or isinstance(it.value, ValueList)]      # yaw, pitch, roll of a rotor
        assert len(values) == len(printable)
        pairs = []
        for result, item in zip(values, printable):
            if isinstance(item.value, ValueList):
                assert isinstance(result.value, ValueList)
                pairs.extend(zip(result.value, item.value))
            else:
                pairs.append((result.value, item.value))
        for got, expected in pairs:
            expected = expected if isinstance(expected, Multivector) else Multivector({0: expected})
            # compare numerically (pasted names are fresh symbols of the new session)
            at = {s: sympy.Rational(3, 7) for s in got.free_symbols}
            at_expected = {s: sympy.Rational(3, 7) for s in expected.free_symbols}
            assert np.allclose(coefficients(got.subs(at)), coefficients(expected.subs(at_expected)))


def test_text_labels_every_item(rendered_reports):
    for report in rendered_reports:
        text = render_text(report)
        for item in report.items:
            assert "# " + item.label in text


def test_latex_is_one_aligned_block_katex_accepts(rendered_reports):
    from test_export_latex import katex_errors

    blocks = [render_latex(report) for report in rendered_reports]
    for report, block in zip(rendered_reports, blocks):
        assert block.startswith("\\begin{aligned}\n") and block.endswith("\n\\end{aligned}")
        rows = block.split("\n")[1:-1]
        assert len(rows) == len(report.items)
        assert all(row.startswith("\\text{") and " & " in row for row in rows)
    errors = katex_errors(blocks)
    assert errors == [None] * len(blocks), errors


def test_report_offers_the_session_renderings():
    report = build_report(e1)
    assert report.to_text() == render_text(report)
    assert report.to_unicode() == render_text(report, unicode=True)
    assert report.to_latex() == render_latex(report)
    assert isinstance(report, Report) and isinstance(report.items[0], ReportItem)

"""Calculus and kinematics: diff, nabla, div, curl, ddir, jacobian, angular_velocity, series.

Outside references, named beside each check: sympy's own ``diff`` and ``series`` on the
components (an independent route: sympy Exprs, not gacalc's flint chain rule), numpy
central finite differences of the undifferentiated value (lambdified by sympy), scipy's
Rotation for the matrix derivative, and the textbook identities of vector calculus
(Hestenes & Sobczyk, "Clifford Algebra to Geometric Calculus", ch. 2; any vector
analysis handbook for the Gibbs forms).
"""

from __future__ import annotations

import random

import numpy as np
import pytest
import sympy
from scipy.spatial.transform import Rotation

from conftest import ok
from gacalc.algebra import Multivector
from gacalc.language import GacalcError, Session
from gacalc.language.results import CheckResult, ValueResult

t = sympy.Symbol("t", real=True)


def value(session, text):
    """The value of the last statement of ``text``."""
    results = ok(session, text)
    found = [r for r in results if isinstance(r, ValueResult)]
    return found[-1].value


def holds(session, text):
    results = ok(session, text)
    checks = [r for r in results if isinstance(r, CheckResult)]
    assert checks and all(c.outcome == "holds" for c in checks), [c.text for c in checks]


def error(session, text) -> GacalcError:
    results = session.run(text)
    assert isinstance(results[-1], GacalcError), results
    return results[-1]


def numeric_components(mv: Multivector, symbols):
    """A numpy function of the symbols giving the 8 components (sympy.lambdify)."""
    exprs = [mv[k] for k in range(8)]
    return sympy.lambdify(symbols, exprs, "numpy")


# -- the "Done when" lines, literally ------------------------------------------


def test_done_when_rotor_rate_and_gradient_of_square():
    s = Session()
    # dR/dt = -1/2 w B R for R = rotor(B, w t), B constant unit (common practice)
    holds(s, "scalar w, t; check diff(rotor(e12, w t), t) == -w/2 e12 rotor(e12, w t)")
    # grad(x . x) = 2 x (Hestenes & Sobczyk ch. 2)
    holds(s, "vector x; check nabla(x . x, x) == 2 x")


# -- diff against sympy's diff on the components ------------------------------------------

EXPRESSIONS = [
    "rotor(e12, w t) (t e1 + sin(t) e2) rotor(e12, w t)~",
    "inverse(1 + t e1 + t^2 e23)",
    "exp(e31 t) + sqrt(1 + t^2) e3",
    "rotor((3 e1 + 4 e2)/5, t^2) e3 / (2 + cos(t))",
    "cos(3 t) sin(t/2) e123 + tan(t) e1",
]


@pytest.mark.parametrize("text", EXPRESSIONS)
def test_diff_agrees_with_sympy_diff_of_components(text):
    s = Session()
    ok(s, "scalar w, t")
    x = value(s, text)
    d = value(s, f"diff({text}, t)")
    d2 = value(s, f"diff({text}, t, 2)")
    rng = random.Random(text)
    for _ in range(5):
        point = {t: sympy.Rational(rng.randint(-90, 90), 37),
                 sympy.Symbol("w", real=True): sympy.Rational(rng.randint(1, 50), 17)}
        for k in range(8):
            # reference: sympy.diff of the component expression (independent route)
            want = sympy.diff(x[k], t).xreplace(point)
            want2 = sympy.diff(x[k], t, 2).xreplace(point)
            assert abs(complex(sympy.N(d[k].xreplace(point) - want, 30))) < 1e-20
            assert abs(complex(sympy.N(d2[k].xreplace(point) - want2, 30))) < 1e-20


@pytest.mark.parametrize("text", EXPRESSIONS)
def test_diff_agrees_with_central_finite_differences(text):
    s = Session()
    ok(s, "scalar w, t")
    w = sympy.Symbol("w", real=True)
    f = numeric_components(value(s, text), (t, w))
    df = numeric_components(value(s, f"diff({text}, t)"), (t, w))
    rng = np.random.default_rng(7)
    h = 1e-6
    for _ in range(5):
        tt, ww = rng.uniform(-1.5, 1.5), rng.uniform(0.2, 3)
        # numpy central difference (f(t+h) - f(t-h)) / 2h, error O(h^2)
        fd = (np.array(f(tt + h, ww), float) - np.array(f(tt - h, ww), float)) / (2 * h)
        assert np.allclose(np.array(df(tt, ww), float), fd, atol=1e-6)


def test_declared_functions_of_time_print_and_read_back():
    s = Session()
    ok(s, "vector r(t); scalar u(t)")
    d = value(s, "diff(u r, t)")
    text = str(d)
    assert "diff(u(t), t)" in text and "r1(t)" in text
    # the printed value is input that gives the same value (paste back)
    holds(s, f"check diff(u r, t) == {text}")
    second = value(s, "diff(r . r, t, 2)")
    assert "diff(r1(t), t, 2)" in str(second)
    holds(s, f"check diff(r . r, t, 2) == {second}")
    # bare component names are the functions: diff(r1, t) is r1'(t)
    holds(s, "check diff(r1, t) == diff(r1(t), t)")
    # a declared function replaced by an expression: its derivatives follow
    # (sin'' + sin = 0, common practice)
    holds(s, "check subs(diff(u, t, 2) + u, u, sin(t)) == 0")
    holds(s, "check subs(diff(u r, t), u, t^2) == 2 t r + t^2 diff(r, t)")
    # at another argument: chain rule through the point (sympy Subs, printed as subs)
    shifted = value(s, "diff(r1(2 t), t)")
    holds(s, f"check diff(r1(2 t), t) == {shifted}")


def test_product_rule_for_the_geometric_product():
    # (A B)' = A' B + A B' (common practice: the product is bilinear)
    s = Session()
    ok(s, "multivector A(t), B(t)")
    holds(s, "check diff(A B, t) == diff(A, t) B + A diff(B, t)")
    holds(s, "check diff(A /\\ B, t) == diff(A, t) /\\ B + A /\\ diff(B, t)")


# -- the vector derivative: named identities ----------------------------------------------


def test_vector_derivative_identities():
    s = Session()
    ok(s, "vector x, a")
    # Hestenes & Sobczyk, ch. 2: nabla . x = 3 and nabla /\ x = 0, so nabla x = 3
    holds(s, "check div(x, x) == 3")
    holds(s, "check grade(nabla(x, x), 2) == 0")
    holds(s, "check nabla(x, x) == 3")
    # grad (x . a) = a for constant a
    holds(s, "check nabla(x . a, x) == a")
    # grad |x| = x / |x|
    holds(s, "check nabla(norm(x), x) == x / norm(x)")
    # Laplacian of 1/|x| vanishes for x != 0 (the Newtonian potential is harmonic)
    holds(s, "check nabla(nabla(1/norm(x), x), x) == 0")
    # div (a x x) = 0 and curl (a x x) = 2 a for constant a (vector analysis handbook)
    holds(s, "check div(cross(a, x), x) == 0")
    holds(s, "check curl(cross(a, x), x) == 2 a")
    # the curl is the dual of the bivector part of nabla F
    holds(s, "f = (x1 x2) e1 + sin(x3) e2 + x1^2 x3 e3; "
             "check curl(f, x) == dual(grade(nabla(f, x), 2))")
    # directional derivative: (u . nabla)(x . x) = 2 u . x
    holds(s, "vector u; check ddir(x . x, x, u) == 2 u . x")


def test_gradient_agrees_with_sympy_diff():
    s = Session()
    ok(s, "vector x")
    f = "exp(x1 x2) + sin(x3) x1 / (1 + x2^2)"
    g = value(s, f"nabla({f}, x)")
    scalar = value(s, f)[0]
    for k, xi in zip((1, 2, 3), sympy.symbols("x1 x2 x3", real=True)):
        # sympy.diff of the scalar field is the reference gradient
        assert sympy.simplify(g[k] - sympy.diff(scalar, xi)) == 0


# -- Jacobians, and emitted code against finite differences ----------------------------------


def test_jacobian_of_rotated_vector_is_the_rotation_matrix():
    s = Session()
    ok(s, "rotor R; vector a")
    # d(R a R~)/da is the rotation matrix of R (linearity, common practice)
    holds(s, "check jacobian(rotate(R, a), a) == matrix(R)")


def rotated(theta, phi, a):
    """scipy reference: rotor(e12, theta) rotor(e23, phi) acting on a (rotations about e3
    after... composed as R = R1 R2, so R2 acts first)."""
    r = Rotation.from_rotvec([0, 0, theta]) * Rotation.from_rotvec([phi, 0, 0])
    return r.apply(a)


def test_emitted_jacobian_agrees_with_finite_differences(tmp_path):
    from test_export_c import compile_and_run

    s = Session()
    ok(s, "scalar theta, phi; a = 2 e1 - e2 + 3 e3; R = rotor(e12, theta) rotor(e23, phi)")
    jac = value(s, "J = jacobian(rotate(R, a), theta)")
    assert jac.shape == (3, 1)
    rng = random.Random(5)
    samples = [{sympy.Symbol("phi", real=True): rng.uniform(-3, 3),
                sympy.Symbol("theta", real=True): rng.uniform(-3, 3)} for _ in range(6)]
    results = compile_and_run(tmp_path, jac, {}, False, samples)
    a = np.array([2.0, -1.0, 3.0])
    h = 1e-6
    for values, got in zip(samples, results):
        th = values[sympy.Symbol("theta", real=True)]
        ph = values[sympy.Symbol("phi", real=True)]
        # central finite difference of scipy's rotation (independent of gacalc)
        fd = (rotated(th + h, ph, a) - rotated(th - h, ph, a)) / (2 * h)
        assert np.allclose(got, fd, atol=1e-6), (got, fd)
    # and the Python emitter gives the same numbers
    results = [r for r in ok(s, "emit python J") if hasattr(r, "code")]
    namespace: dict = {}
    exec(compile(results[-1].code, "emitted", "exec"), namespace)  # our generated code
    values = samples[0]
    th, ph = values[sympy.Symbol("theta", real=True)], values[sympy.Symbol("phi", real=True)]
    got = np.array(namespace["J"](phi=ph, theta=th), float).ravel()
    fd = (rotated(th + h, ph, a) - rotated(th - h, ph, a)) / (2 * h)
    assert np.allclose(got, fd, atol=1e-6)


# -- rotor kinematics ---------------------------------------------------------------------------


def test_angular_velocity_of_a_constant_rate_rotor():
    s = Session()
    ok(s, "scalar w, t")
    # R = rotor(B, w t) turns at the constant rate w in B: Omega = w B (common practice)
    holds(s, "check angular_velocity(rotor(e12, w t), t) == w e12")
    holds(s, "check angular_velocity(rotor(e31, w t), t) == w e31")
    # axis form: rotor(n, angle) turns about n (right-hand rule), so w n
    holds(s, "check angular_velocity_vector(rotor(e3, w t), t) == w e3")
    # a scaled rotor has the same angular velocity
    holds(s, "check angular_velocity(3 rotor(e12, w t), t) == w e12")
    # 1 + t e12 is sqrt(1 + t^2) rotor(e12, -2 atan(t)): Omega = d(-2 atan t)/dt e12
    holds(s, "check angular_velocity(1 + t e12, t) == -2/(1 + t^2) e12")


def test_derivative_of_a_rotated_vector_is_cross_product_with_omega():
    # d/dt (R x R~) = x _| Omega = w x x for R = R(t), x constant (Hestenes, New
    # Foundations for Classical Mechanics, ch. 5: dR/dt = -1/2 Omega R)
    s = Session()
    ok(s, "vector x; rotor R(t)")
    holds(s, "check diff(rotate(R, x), t) == rotate(R, x) _| angular_velocity(R, t)")
    holds(s, "check diff(rotate(R, x), t) == "
             "cross(angular_velocity_vector(R, t), rotate(R, x))")
    holds(s, "check diff(R, t) == -1/2 angular_velocity(R, t) R")


def skew(w):
    return np.array([[0, -w[2], w[1]], [w[2], 0, -w[0]], [-w[1], w[0], 0]])


def test_matrix_derivative_is_skew_omega_times_matrix_with_scipy():
    s = Session()
    ok(s, "scalar t; R = rotor(e12, 2 t) rotor(e23, t^2) rotor(e31, sin(t))")
    w = value(s, "angular_velocity_vector(R, t)")
    m = value(s, "matrix(R)")
    r_expr = value(s, "R")
    w_f = sympy.lambdify(t, [w[k] for k in (1, 2, 3)], "numpy")
    m_f = sympy.lambdify(t, m, "numpy")

    def scipy_matrix(tt):
        # scipy's Rotation from the quaternion (x, y, z, w) of R: Hamilton
        # i = -e23, j = -e31, k = -e12 (DESIGN.md conventions)
        comps = [complex(sympy.N(r_expr[k].subs(t, tt))).real for k in (0, 4, 5, 6)]
        q = [-comps[1], -comps[2], -comps[3], comps[0]]
        return Rotation.from_quat(q).as_matrix()

    # diff of the matrix value, entry by entry, against sympy.diff of the entries
    mdot = value(s, "diff(matrix(R), t)")
    assert all(sympy.simplify(a - sympy.diff(b, t)) == 0 for a, b in zip(mdot, m))
    rng = np.random.default_rng(11)
    h = 1e-6
    for tt in rng.uniform(-2, 2, 4):
        assert np.allclose(np.array(m_f(tt), float), scipy_matrix(tt), atol=1e-12)
        # M' = [w]x M (Poisson's kinematic equation), M' by central differences of scipy's
        mdot = (scipy_matrix(tt + h) - scipy_matrix(tt - h)) / (2 * h)
        assert np.allclose(skew(np.array(w_f(tt), float)) @ scipy_matrix(tt), mdot, atol=1e-6)


def test_show_reports_angular_velocity_of_a_time_dependent_rotor():
    s = Session()
    results = ok(s, "scalar w, t; show rotor(e12, w t)")
    text = results[-1].report_text
    assert "angular velocity (t)" in text and "w*e12" in text
    assert "w*e3" in text
    results = ok(s, "rotor Q(s); show Q")
    assert "angular velocity (s)" in results[-1].report_text
    # a rotor that does not depend on a time symbol gets no kinematics section
    results = ok(s, "show rotor(e12, w)")
    assert "angular velocity" not in results[-1].report_text


# -- series --------------------------------------------------------------------------------------


def test_series_agrees_with_sympy_series():
    s = Session()
    ok(s, "scalar a, b, h")
    x = value(s, "X = rotor(e12, h a) rotor(e23, h b) e1")
    approx = value(s, "series(X, h, 0, 3)")
    h = sympy.Symbol("h", real=True)
    for k in range(8):
        # sympy's series of the component is the reference
        want = sympy.series(x[k], h, 0, 4).removeO()
        assert sympy.expand(approx[k] - want) == 0
    # small angles: the first-order term of R1 R2 is -(a e12 + b e23) h / 2 (common practice)
    holds(s, "check series(rotor(e12, h a) rotor(e23, h b), h, 0, 1) == 1 - h (a e12 + b e23)/2")
    # about another point
    holds(s, "check series(exp(e12 h), h, 1, 1) == exp(e12) + (h - 1) e12 exp(e12)")


# -- errors: one line, with the position ------------------------------------------------------


@pytest.mark.parametrize("text, column", [
    ("vector x; diff(x, 2 t)", 19),
    ("vector x; diff(x, x)", 19),
    ("vector x; nabla(x, e1)", 20),
    ("vector x; nabla(x . x, 2 x)", 24),
    ("vector n unit; nabla(n, n)", 25),
    ("vector x; curl(x . x, x)", 16),
    ("scalar t; series(e1, t, t, 2)", 25),
    ("scalar t; diff(e1, t, -1)", 23),
    ("vector x; jacobian(x e12, x)", 20),
    ("scalar t; angular_velocity(e1 t, t)", 28),
    ("scalar t; series(e1/t, t, 0, 2)", 11),
    ("scalar t; jacobian(e1 t, (t, 2))", 26),
    ("vector r(t); r(1, 2)", 14),
])
def test_errors_are_one_line_with_position(text, column):
    s = Session()
    before = s.run("y = 1")
    assert not isinstance(before[-1], GacalcError)
    e = error(s, text)
    assert "\n" not in e.message
    assert e.column == column, (e.column, e.caret_text())
    # the session is as it was
    assert str(value(s, "y")) == "1"


def test_emitted_angular_velocity_of_a_declared_rotor_path():
    # emit turns R0(t)... into the input R and diff(R0(t), t)... into R_dt (an even
    # sequence); fed a rotor path and its finite-difference rate, the code gives Omega
    s = Session()
    ok(s, "rotor R(t)")
    code = [r for r in ok(s, "emit python angular_velocity(R, t) as omega")
            if hasattr(r, "code")][-1].code
    assert "def omega(R, R_dt):" in code
    namespace: dict = {}
    exec(compile(code, "emitted", "exec"), namespace)  # our generated code

    def path(tt):
        # rotor(e12, 3 t) as (R0, R23, R31, R12): cos(3t/2) - sin(3t/2) e12 (DESIGN.md)
        return np.array([np.cos(1.5 * tt), 0.0, 0.0, -np.sin(1.5 * tt)])

    h = 1e-6
    for tt in (0.3, -1.2, 2.0):
        rate = (path(tt + h) - path(tt - h)) / (2 * h)
        got = np.array(namespace["omega"](path(tt), rate), float)
        # Omega = 3 e12 for a rotation at rate 3 in the e12 plane (common practice)
        assert np.allclose(got, [0, 0, 3], atol=1e-6)


def test_emitted_c_jacobian_with_respect_to_rotor_parameters(tmp_path):
    # the optimiser's case: d(R a R~)/d(R0, R23, R31, R12) for a list of the rotor's
    # components, emitted to C (gcc -Wall -Wextra -Werror) and compared with central finite
    # differences of R a R~ in tests/ga_reference.py (an independent numpy Cl(3,0))
    import ga_reference as ga
    from test_export_c import compile_and_run

    s = Session()
    ok(s, "rotor R; vector a")
    jac = value(s, "J = jacobian(rotate(R, a), (R0, R23, R31, R12))")
    assert jac.shape == (3, 4)
    declared = {"R": "rotor", "a": "vector"}
    names = ["R0", "R23", "R31", "R12", "a1", "a2", "a3"]
    rng = random.Random(17)
    samples = []
    for _ in range(5):
        q = np.array([rng.uniform(-1, 1) for _ in range(4)])
        q /= np.linalg.norm(q)
        numbers = list(q) + [rng.uniform(-2, 2) for _ in range(3)]
        samples.append({sympy.Symbol(n, real=True): float(x) for n, x in zip(names, numbers)})
    results = compile_and_run(tmp_path, jac, declared, False, samples)
    h = 1e-6
    for values, got in zip(samples, results):
        r = np.array([values[sympy.Symbol(n, real=True)] for n in names[:4]])
        x = np.zeros(8)
        x[1:4] = [values[sympy.Symbol(n, real=True)] for n in names[4:]]
        columns = []
        for j, index in enumerate((0, 4, 5, 6)):
            def turned(shift):
                rotor = np.zeros(8)
                rotor[[0, 4, 5, 6]] = r
                rotor[index] += shift
                return ga.gp(ga.gp(rotor, x), ga.rev(rotor))[1:4]
            columns.append((turned(h) - turned(-h)) / (2 * h))
        want = np.array(columns).T.ravel()     # row-major 3x4
        assert np.allclose(got, want, atol=1e-6), (got, want)

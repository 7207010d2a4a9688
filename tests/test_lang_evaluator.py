"""The evaluator through Session.run: operators, names, functions, errors, limits.

Cross-checks against outside references are marked with their source; facts of the
trade without a single source are marked "common practice".
"""

from fractions import Fraction
import random

import pytest
import sympy

from gacalc.algebra import Multivector, blade, symbolic
from gacalc.language import GacalcError, Session
from gacalc.language.errors import (GacalcLimitError, GacalcMathError, GacalcNameError,
                                    GacalcTypeError)
from gacalc.language.session import CheckResult, NoteResult, ValueResult


def run(text, session=None):
    session = session or Session()
    results = session.run(text)
    errors = [r for r in results if isinstance(r, GacalcError)]
    assert not errors, errors[0].caret_text()
    return results


def value(text, session=None):
    values = [r for r in run(text, session) if isinstance(r, ValueResult)]
    return values[-1].value


def error(text, session=None):
    results = (session or Session()).run(text)
    assert results and isinstance(results[-1], GacalcError), results
    return results[-1]


def mv(**components):
    return Multivector({name: sympy.Rational(Fraction(c)) for name, c in components.items()})


def sym(name):
    return sympy.Symbol(name, real=True)


# Operators on basis blades (common practice: e_i e_i = 1, e_i e_j = -e_j e_i) ---------
@pytest.mark.parametrize("text, expected", [
    ("e1 e2", blade("12")),
    ("e1 * e2", blade("12")),
    ("e2 e1", -blade("12")),
    ("e21", -blade("12")),
    ("e312", blade("123")),
    ("e11", Multivector.scalar(1)),
    ("e12 e12", Multivector.scalar(-1)),
    ("I I", Multivector.scalar(-1)),
    ("I", blade("123")),
    ("e1 /\\ e2", blade("12")),
    ("e1 ∧ e1", Multivector()),
    ("e1 _| e12", blade("2")),
    ("e12 |_ e2", blade("1")),
    ("e1 . e12", blade("2")),
    ("2 . e1", Multivector()),          # Hestenes inner product: zero with a scalar
    ("e12~", -blade("12")),
    ("(e1 e2 e3)~", -blade("123")),
    ("e1^-1", blade("1")),
    ("(2 e1)^-1", blade("1") / 2),
    ("e12^2", Multivector.scalar(-1)),
    ("<3 + e1 + e12>", Multivector.scalar(3)),
    ("<3 + e1 + e12>2", blade("12")),
    ("<3 + e1 + e12>1", blade("1")),
    ("-e1", -blade("1")),
    ("e1 / 2", blade("1") / 2),
    ("e1 / e2", blade("12")),            # e1 e2^-1 = e1 e2
    ("2e1", 2 * blade("1")),
    ("0.25 e3", blade("3") / 4),
    ("e1 . e2 e3", Multivector()),      # (e1 . e2) e3 = 0: wedge family binds tighter
    ("e1 e2 . e2", blade("1")),         # e1 (e2 . e2)
])
def test_operators_on_blades(text, expected):
    assert value(text).identical(expected) or value(text) == expected


def test_numbers_are_exact():
    result = value("0.1 + 0.2")
    assert result.scalar_part() == sympy.Rational(3, 10)
    assert value("1/3 + 1/6").scalar_part() == sympy.Rational(1, 2)


def test_juxtaposition_equals_star():
    session = Session()
    run("vector a, b, c", session)
    assert value("a (b + c)", session) == value("a*b + a*c", session)
    assert value("(a + b)(a - b)", session) == value("(a + b)*(a - b)", session)
    assert value("2 a b", session) == value("2*a*b", session)


def test_geometric_product_splits_into_inner_and_outer_for_vectors():
    # a b = a . b + a /\ b for vectors (common practice); checked at random rational points
    rng = random.Random(3)
    for _ in range(5):
        a = [Fraction(rng.randint(-9, 9), rng.randint(1, 5)) for _ in range(3)]
        b = [Fraction(rng.randint(-9, 9), rng.randint(1, 5)) for _ in range(3)]
        text_a = " + ".join(f"({x})*e{i + 1}" for i, x in enumerate(a))
        text_b = " + ".join(f"({x})*e{i + 1}" for i, x in enumerate(b))
        product = value(f"({text_a})({text_b})")
        split = value(f"({text_a}) . ({text_b}) + ({text_a}) /\\ ({text_b})")
        assert product.identical(split)
        dot = sum(x * y for x, y in zip(a, b))
        assert product.scalar_part() == sympy.Rational(dot.numerator, dot.denominator)


def test_cross_and_triple_product_against_numpy():
    # numpy.cross and numpy.linalg.det as outside references
    numpy = pytest.importorskip("numpy")
    rng = random.Random(7)
    for _ in range(4):
        a, b, c = ([rng.randint(-6, 6) for _ in range(3)] for _ in range(3))
        vec = lambda v: f"({v[0]} e1 + {v[1]} e2 + {v[2]} e3)"
        cross = value(f"cross({vec(a)}, {vec(b)})")
        assert [int(cross[f"e{i}"]) for i in (1, 2, 3)] == list(numpy.cross(a, b))
        trivector = value(f"{vec(a)} /\\ {vec(b)} /\\ {vec(c)}")
        det = round(numpy.linalg.det(numpy.array([a, b, c]).T))
        assert trivector.identical(det * blade("123"))


def test_pseudoscalar_is_central():
    # I commutes with everything in Cl(3,0) (common practice)
    session = Session()
    run("multivector M", session)
    assert value("I M - M I", session).is_zero()


# Names ------------------------------------------------------------------------------
def test_unknown_name_is_a_real_symbol_with_one_note():
    session = Session()
    results = run("t + t", session)
    notes = [r for r in results if isinstance(r, NoteResult)]
    assert [n.message for n in notes] == ["t is a new scalar symbol"]
    assert results[-1].value.identical(Multivector.scalar(2 * sym("t")))
    again = run("t", session)
    assert not [r for r in again if isinstance(r, NoteResult)]


def test_misspelled_value_names_get_a_hint_in_the_note():
    session = Session()
    run("theta = 1", session)
    notes = [r for r in run("thetta", session) if isinstance(r, NoteResult)]
    assert "did you mean theta?" in notes[0].message


def test_declared_components_are_the_core_symbols():
    session = Session()
    run("vector a", session)
    a, _ = symbolic("vector", "a")
    assert value("a", session).identical(a)
    results = run("a1", session)              # a component: no "new symbol" note
    assert not [r for r in results if isinstance(r, NoteResult)]
    assert results[-1].value.identical(Multivector.scalar(sym("a1")))


def test_greek_input_names_the_same_symbol():
    session = Session()
    run("theta = 3", session)
    assert value("θ", session).scalar_part() == 3


def test_constants():
    assert value("pi").scalar_part() == sympy.pi
    assert value("cos(pi)").scalar_part() == -1


def test_ans_holds_the_last_result():
    session = Session()
    run("2 e1", session)
    assert value("ans + e1", session).identical(3 * blade("1"))
    assert "ans has no value yet" in error("ans").message


def test_call_or_product():
    session = Session()
    run("x = 2 e1; f(y) = y y", session)
    assert value("x(e2)", session).identical(2 * blade("12"))        # a value: product
    assert value("f(e1 + e2)", session).scalar_part() == 2           # a function: call
    assert value("k (1 + 1)", session).identical(Multivector.scalar(2 * sym("k")))
    assert value("e1(e2)", session).identical(blade("12"))


# User functions ------------------------------------------------------------------------
def test_functions_have_lexical_parameters():
    session = Session()
    run("f(x) = x + t", session)                  # t: the global name, not a caller's
    run("g(t) = f(1)", session)
    result = value("g(100)", session)
    assert result.identical(Multivector.scalar(1 + sym("t")))
    run("t = 5", session)                          # globals are read when called
    assert value("g(100)", session).scalar_part() == 6


def test_function_errors():
    session = Session()
    run("f(x, y) = x y", session)
    assert "f takes 2 arguments, not 1: f(x, y)" in error("f(1)", session).message
    assert "calls itself" in error("h(x) = h(x) + 1").message
    run("p(x) = q(x); q(x) = p(x)", session)
    assert isinstance(error("p(1)", session), GacalcLimitError)


def test_redefinition_switches_between_value_and_function():
    session = Session()
    run("f = 3", session)
    run("f(x) = x", session)
    assert value("f(2)", session).scalar_part() == 2
    run("f = 4", session)
    assert value("f(2)", session).scalar_part() == 8              # now a product


# Built-in functions ----------------------------------------------------------------------
def test_every_builtin_example_runs():
    from gacalc.language.builtins import BUILTINS

    for name, function in BUILTINS.items():
        results = Session().run(function.example)
        errors = [r for r in results if isinstance(r, GacalcError)]
        assert not errors, f"{name}: {errors[0].caret_text()}"
        assert name in function.example


def test_builtin_results():
    assert value("norm(3 e1 + 4 e2)").scalar_part() == 5
    assert value("grade(3 + e1 + e12, 2)").identical(blade("12"))
    assert value("grade(e12)").scalar_part() == 2
    assert value("dual(e1)") == value("e1 I^-1")
    assert value("undual(e23)") == value("e23 I")
    assert value("rotate(rotor(e12, pi/2), e1)") == blade("2")   # DESIGN.md convention
    assert value("angle(rotor(e12, pi/3))").scalar_part() == sympy.pi / 3
    assert value("axis(rotor(e3, pi/2))") == blade("3")
    assert value("component(3 e1 + 5 e12, e21)").scalar_part() == -5
    assert value("subs(cos(t) e1, t, pi)").identical(-blade("1"))
    assert value("atan2(1, -1)").scalar_part() == 3 * sympy.pi / 4


def test_builtin_errors():
    assert "norm takes 1 argument, not 2: norm(A)" in error("norm(e1, e2)").message
    assert "must be a vector, not a bivector" in error("cross(e1, e12)").message
    assert "must be a scalar, not a vector" in error("sin(e1)").message
    assert "has grades 1 and 2" in error("grade(e1 + e12)").message
    assert "whole number from 0 to 3" in error("grade(e1, 4)").message
    assert "undefined" in error("tan(pi/2)").message
    unknown = error("nrom(e1)")
    assert isinstance(unknown, GacalcNameError)
    assert unknown.hint == "did you mean norm?"
    assert "unknown function foo" in error("foo(1, 2)").message
    assert "norm is a function" in error("norm").message


def test_wrong_grade_errors_point_at_the_argument():
    result = error("cross(e1, e1 + e12)")
    assert result.span.text == "e1 + e12"


# Mathematical refusals --------------------------------------------------------------
def test_division_by_zero():
    assert isinstance(error("1/0"), GacalcMathError)
    assert "division by zero" in error("e1 / (e2 - e2)").message
    assert "division by zero" in error("0^-1").message


def test_not_invertible():
    # (1 + e1)(1 - e1) = 0, so 1 + e1 has no inverse (common practice: null multivectors)
    result = error("(1 + e1)^-1")
    assert isinstance(result, GacalcMathError), result.caret_text()
    assert "invertible" in result.message


def test_undecidable_inverse_is_noted():
    results = run("inverse(a + b e123)")
    notes = [r.message for r in results if isinstance(r, NoteResult)]
    assert any("the inverse is valid where" in n for n in notes)


def test_unknown_blade_names():
    assert "there is no e4 in Cl(3,0)" in error("e4").message
    assert "there is no e0" in error("e0 + 1").message


# Checks -------------------------------------------------------------------------------
def test_check_outcomes():
    session = Session()
    run("vector a, b", session)
    held = run("check a b == a . b + a /\\ b", session)[-1]
    assert isinstance(held, CheckResult) and held.passed
    failed = run("check a b == b a", session)[-1]
    assert failed.outcome == "fails"
    assert failed.difference == value("2 a /\\ b", session)
    assert "L - R =" in failed.text


def test_check_with_conditions_says_given():
    session = Session()
    run("vector a, b", session)
    held = run("check (a + b)^2 == a^2 + b^2 given a . b = 0", session)[-1]
    assert held.passed and held.conditions == ["a . b = 0"]
    plain = run("check (a + b)^2 == a^2 + b^2", session)[-1]
    assert plain.outcome == "fails"


def test_assume_applies_to_later_statements_and_none_drops_it():
    session = Session()
    run("vector a, b; assume a . b = 0", session)
    assert run("check a b == a /\\ b", session)[-1].passed
    assert value("a . b", session).is_zero()
    run("assume none", session)
    assert not run("check a b == a /\\ b", session)[-1].passed


def test_unit_declaration_conditions():
    session = Session()
    run("vector n unit", session)
    assert value("n n", session).scalar_part() == 1
    assert run("check n~ == n^-1", session)[-1].passed


def test_impossible_condition_is_an_error():
    assert "can never hold" in error("check 1 == 1 given 1 = 2").message


# Limits and atomicity ----------------------------------------------------------------
def test_exponent_limit():
    assert isinstance(error("2^100000"), GacalcLimitError)
    assert isinstance(error("e1^(10^5)"), GacalcLimitError)
    assert value("2^100").scalar_part() == 2**100


def test_call_depth_limit_is_an_error():
    from gacalc.language.evaluator import MAX_CALL_DEPTH

    session = Session()
    run("f0(x) = x + 1", session)
    for level in range(1, MAX_CALL_DEPTH + 5):
        run(f"f{level}(x) = f{level - 1}(x)", session)
    assert value(f"f{MAX_CALL_DEPTH - 2}(0)", session).scalar_part() == 1
    result = error(f"f{MAX_CALL_DEPTH + 4}(0)", session)
    assert isinstance(result, GacalcLimitError), result
    assert value("f0(f0(f0(f0(f0(0)))))", session).scalar_part() == 5  # nesting is not depth


def test_a_failing_statement_leaves_the_session_unchanged():
    session = Session()
    run("x = e1; vector a", session)
    before = (dict(session.values), dict(session.declarations), session.ans)
    error("x = 1/0", session)
    assert session.values["x"].identical(blade("1"))
    # statements are atomic one by one: 'vector q' committed before the failing one
    error("vector q; y = nrom(q)", session)
    assert "q" in session.values and session.get("y") is None
    error("y = 2; z = (1 + e1)^-1", session)
    assert session.get("y") is not None and session.get("z") is None
    assert session.values["a"].identical(before[0]["a"])


def test_interrupt_leaves_the_session_unchanged(monkeypatch):
    from gacalc.language import evaluator
    from gacalc.language.errors import GacalcInterrupt

    session = Session()
    run("x = e1", session)
    original = evaluator.Evaluator._eval_Wedge

    def interrupted(self, node, frame):
        raise KeyboardInterrupt

    monkeypatch.setattr(evaluator.Evaluator, "_eval_Wedge", interrupted)
    result = session.run("x = e2; y = e1 /\\ e2")
    assert isinstance(result[-1], GacalcInterrupt)
    assert session.get("y") is None
    monkeypatch.setattr(evaluator.Evaluator, "_eval_Wedge", original)
    assert session.values["x"].identical(blade("2"))     # the first statement committed


def test_internal_errors_are_reported_not_raised(monkeypatch):
    from gacalc.language import evaluator
    from gacalc.language.errors import GacalcInternalError

    def broken(self, node, frame):
        raise TypeError("a bug")

    monkeypatch.setattr(evaluator.Evaluator, "_eval_Reverse", broken)
    session = Session()
    result = session.run("x = e1~")[-1]
    assert isinstance(result, GacalcInternalError)
    assert "TypeError" in result.message and "a bug" in result.traceback_text
    assert session.get("x") is None


# Matrices and quaternions ------------------------------------------------------------
def test_matrix_values():
    # scipy.spatial.transform.Rotation as the outside reference for the 3x3 matrix
    rotation = pytest.importorskip("scipy.spatial.transform").Rotation
    numpy = pytest.importorskip("numpy")
    matrix = value("matrix(rotor(e12, pi/3))")
    expected = rotation.from_rotvec([0, 0, numpy.pi / 3]).as_matrix()
    assert numpy.allclose(numpy.array(matrix.evalf(), dtype=float), expected)
    product = value("matrix(rotor(e12, pi/3)) matrix(rotor(e12, pi/6))")
    assert numpy.allclose(numpy.array(product.evalf(), dtype=float),
                          rotation.from_rotvec([0, 0, numpy.pi / 2]).as_matrix())


def test_quaternion_values_follow_hamilton():
    # Hamilton's i j = k with i = -e23, j = -e31, k = -e12 (DESIGN.md); sympy's Quaternion
    from sympy.algebras.quaternion import Quaternion

    q = value("quaternion(-e23) quaternion(-e31)")
    assert q == Quaternion(0, 0, 0, 1)
    assert value("from_quaternion(0, 0, 0, 1)").identical(-blade("12"))


def test_pauli_values():
    # sympy.physics.matrices.msigma as the outside reference
    from sympy.physics.matrices import msigma

    assert value("pauli(e1)") == msigma(1)
    assert value("pauli(e2)") == msigma(2)
    assert value("pauli(I)") == sympy.I * sympy.eye(2)
    assert run("check pauli(e1) pauli(e2) == pauli(I e3)")[-1].passed


def test_inconsistent_conditions_are_reported_not_used():
    # a1 = 2 and a . a = 1 cannot both hold for a real vector
    session = Session()
    run("vector a; assume a1 = 2", session)
    refused = error("assume a . a = 1", session)
    assert isinstance(refused, GacalcMathError) and "inconsistent" in refused.message
    assert [c.text for c in session.conditions] == ["a1 = 2"]       # the session is as it was
    given = error("check a == 0 given a2 = 1, a2 = 3", session)
    assert "inconsistent" in given.message


def test_number_size_limits():
    from gacalc.language.parser import MAX_NUMBER_DIGITS

    assert isinstance(error("x = " + "9" * (MAX_NUMBER_DIGITS + 1)), GacalcLimitError)
    assert isinstance(error("(10^999)^5"), GacalcLimitError)
    long_exponent = error("2^1000^1000")
    assert isinstance(long_exponent, GacalcLimitError) and len(long_exponent.message) < 80
    assert value("(10^999) 10").scalar_part() == 10**1000


def test_deep_postfix_chains_are_limited():
    assert isinstance(error("a" + "~" * 10000), GacalcLimitError)
    assert value("e12" + "~" * 20).identical(blade("12"))

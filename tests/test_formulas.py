"""Results as coordinate-free formulas (gacalc.formulas, the formula statement).

Every printed formula is parsed back by gacalc and checked equal to the value exactly
(``check`` proves it symbolically), and compared with the handbook formula on random
numeric instances in numpy.
"""

from __future__ import annotations

import random
import re

import numpy as np
import pytest

from conftest import ok
from gacalc.language import GacalcError, Session

COMPONENT = re.compile(r"\b[a-dmn][123]\b")


def session(declare="vector a, b, c, d\nvector m, n unit\nscalar t"):
    s = Session()
    ok(s, declare)
    return s


def formula_of(s, expr):
    result = ok(s, f"formula {expr}")[-1]
    assert result.kind == "formula"
    return result


def proved(s, expr) -> str:
    """The printed formula of expr, after checking it reads back as the same value."""
    result = formula_of(s, expr)
    assert result.found, result.message
    text = result.text
    assert not COMPONENT.search(text), text
    check = ok(s, f"check ({text}) == ({expr})")[-1]
    assert check.outcome == "holds", (text, check.text)
    return text


def numeric(s, text, values):
    """A printed formula evaluated by gacalc at numeric vectors (name -> 3 numbers)."""
    t = Session()
    lines = [f"{name} = {v[0]}*e1 + {v[1]}*e2 + {v[2]}*e3" for name, v in values.items()]
    ok(t, "\n".join(lines))
    value = ok(t, text)[-1].value
    return np.array([float(value[k]) for k in range(8)])


def random_vectors(names, seed, unit=()):
    rng = random.Random(seed)
    out = {}
    for name in names:
        v = [rng.randint(-9, 9) for _ in range(3)]
        if name in unit:
            from conftest import stereographic_unit

            v = stereographic_unit(rng.randint(-5, 5), rng.randint(1, 5))
        out[name] = v
    return out


def as_mv(vector):
    out = np.zeros(8)
    out[1:4] = [float(x) for x in vector]
    return out


# Outside references ---------------------------------------------------------------------
def test_bac_cab_rule():
    # BAC-CAB rule a x (b x c) = b (a . c) - c (a . b): Riley, Hobson & Bence, Mathematical
    # Methods for Physics and Engineering, 3rd ed., section 7.6.3 (from memory); in GA the
    # contraction a _| (b /\ c) = (a . b) c - (a . c) b (Hestenes, New Foundations for
    # Classical Mechanics, ch. 2, from memory).
    s = session()
    text = proved(s, "a _| (b /\\ c)")
    assert text == "(a . b) c - (a . c) b"
    assert proved(s, "cross(a, cross(b, c))") == "(a . c) b - (a . b) c"
    for seed in range(5):
        v = random_vectors("abc", seed)
        a, b, c = (np.array(v[k], float) for k in "abc")
        expected = np.cross(a, np.cross(b, c))          # numpy as the reference
        assert np.allclose(numeric(s, text, v)[1:4], -expected)   # a _| (b /\\ c) = -a x (b x c)
        assert np.allclose(numeric(s, "(a . c) b - (a . b) c", v)[1:4], expected)


def test_lagrange_identity():
    # Lagrange's identity |a x b|^2 = |a|^2 |b|^2 - (a . b)^2 (Riley, Hobson & Bence,
    # section 7.6, from memory)
    s = session()
    expected = "(a . a) (b . b) - (a . b)^2"
    assert proved(s, "norm2(cross(a, b))") == expected
    assert proved(s, "norm2(a /\\ b)") == expected
    for seed in range(5):
        v = random_vectors("ab", seed)
        a, b = (np.array(v[k], float) for k in "ab")
        assert np.isclose(numeric(s, expected, v)[0], np.linalg.norm(np.cross(a, b)) ** 2)


def test_quadruple_products():
    # scalar quadruple product (Binet-Cauchy) (a x b) . (c x d) = (a . c)(b . d) - (a . d)(b . c)
    # and vector quadruple product (a x b) x (c x d) = [a, b, d] c - [a, b, c] d
    # (Riley, Hobson & Bence, section 7.6.3, exercises; from memory)
    s = session()
    scalar = proved(s, "cross(a, b) . cross(c, d)")
    assert scalar == "(a . c) (b . d) - (a . d) (b . c)"
    vector = proved(s, "cross(cross(a, b), cross(c, d))")
    for seed in range(4):
        v = random_vectors("abcd", seed)
        a, b, c, d = (np.array(v[k], float) for k in "abcd")
        assert np.isclose(numeric(s, scalar, v)[0], np.cross(a, b) @ np.cross(c, d))
        assert np.allclose(numeric(s, vector, v)[1:4], np.cross(np.cross(a, b), np.cross(c, d)))


def test_rodrigues_formula():
    # Rodrigues' rotation formula v cos t + (k x v) sin t + k (k . v)(1 - cos t)
    # (O. Rodrigues, J. Math. Pures Appl. 5 (1840); as in Goldstein, Classical Mechanics,
    # eq. 4.62, from memory); numbers against scipy's Rotation.from_rotvec.
    from scipy.spatial.transform import Rotation

    s = session()
    text = proved(s, "rotate(rotor(n, t), a)")
    assert text == "cos(t) a + (1 - cos(t)) (a . n) n + sin(t) cross(n, a)"
    for seed in range(4):
        v = random_vectors("an", seed, unit="n")
        angle = 0.3 + seed
        t = Session()
        ok(t, f"n = {v['n'][0]}*e1 + {v['n'][1]}*e2 + {v['n'][2]}*e3\n"
              f"a = {v['a'][0]}*e1 + {v['a'][1]}*e2 + {v['a'][2]}*e3\nt = {angle}")
        value = ok(t, text)[-1].value.evalf()
        axis = np.array([float(x) for x in v["n"]])
        expected = Rotation.from_rotvec(angle * axis).apply(np.array(v["a"], float))
        assert np.allclose([float(value[k]) for k in (1, 2, 3)], expected)


def test_two_reflections_make_a_rotor_in_the_normals():
    # a product of two reflections in planes with unit normals m, n is the rotor
    # n m = n . m + n /\\ m, written in the normals (common practice: Hestenes,
    # New Foundations for Classical Mechanics, ch. 5, from memory)
    s = session()
    assert proved(s, "n m") == "(m . n) + n /\\ m"
    text = proved(s, "reflect(reflect(a, m), n)")
    assert "m" in text and "n" in text


def test_inverse_and_norm_of_a_bivector():
    s = session()
    assert proved(s, "inverse(a /\\ b)") == "(b /\\ a)/((a . a) (b . b) - (a . b)^2)"
    assert proved(s, "inverse(a)") == "a/(a . a)"
    assert proved(s, "a b c") == "(b . c) a - (a . c) b + (a . b) c + a /\\ b /\\ c"


@pytest.mark.parametrize("expr", [
    "a b", "I a", "a I", "a /\\ b /\\ c", "(a /\\ b) . (c /\\ d)", "n a n", "rotor(n, t)",
    "t a + 3", "(a . b)/(a . c) c", "a ((a . b) + t)^2", "inverse(a + I b)", "cross(a, n) m",
])
def test_printed_formulas_read_back_equal(expr):
    proved(session(), expr)


def test_unicode_formula_reads_back():
    s = session()
    result = formula_of(s, "a _| (b /\\ c)")
    text = result.render(unicode=True)
    assert "·" in text
    assert ok(s, f"check ({text}) == a _| (b /\\ c)")[-1].outcome == "holds"


def test_bivector_declarations_enter_through_their_duals():
    s = session("vector a\nbivector B")
    text = proved(s, "a _| B")
    assert "dual(B)" in text


# Honest fallbacks ---------------------------------------------------------------------
@pytest.mark.parametrize("expr, why", [
    ("a1 e1", "not a rotation-covariant"),                  # not equivariant
    ("x e1 + y e2", "basis directions of its own"),         # components typed explicitly
    ("a + e1", "not a rotation-covariant"),
    ("a1*a + b", "not a rotation-covariant"),
])
def test_no_formula_falls_back_to_components(expr, why):
    s = session()
    result = formula_of(s, expr)
    assert not result.found
    assert why in result.message
    lines = result.text.split("\n")
    assert lines[0].startswith("note: no formula")
    assert lines[1] == ok(s, expr)[-1].text        # the components follow


def test_declared_rotor_is_not_used():
    s = session("vector a\nrotor R")
    result = formula_of(s, "R a R~")
    assert not result.found and "components of R" in result.message


def test_budget_stops_the_search():
    from gacalc.formulas import recognize, variables_of
    from gacalc.simplify.budget import Budget

    s = session()
    value = ok(s, "x = a _| (b /\\ c)")[-1].value
    with s.algebra.active():
        variables, _ = variables_of(s.declarations, s.values, s.unit_names)
        outcome = recognize(value, variables, budget=Budget(0.0))
    assert not outcome.found and "budget" in outcome.message


# The statement and the setting ----------------------------------------------------------
def test_formula_sets_ans():
    s = session()
    ok(s, "formula a /\\ b")
    assert ok(s, "check ans == a /\\ b")[-1].outcome == "holds"


def test_formula_needs_a_value():
    s = session()
    error = s.run("formula")[-1]
    assert isinstance(error, GacalcError) and "formula needs a value" in str(error)


def test_formula_auto_prints_every_result_as_a_formula():
    s = session()
    ok(s, "formula auto")
    assert s.formulas
    assert ok(s, "x = a _| (b /\\ c)")[-1].text == "x = (a . b) c - (a . c) b"
    assert ok(s, "a1 e1")[-1].text == "a1*e1"           # no formula: components
    ok(s, "formula off")
    assert not s.formulas
    assert "a1*b1" in ok(s, "a _| (b /\\ c)")[-1].text


def test_a_name_called_off_still_works_as_a_value():
    s = session()
    ok(s, "off = a")
    assert formula_of(s, "(off)").text == "a"


# show --------------------------------------------------------------------------------
def test_show_prints_norm_and_inverse_in_terms_of_the_vectors():
    s = session()
    report = ok(s, "show a /\\ b")[-1]
    text = report.text
    lagrange = "(a . a) (b . b) - (a . b)^2"
    assert f"{lagrange}" in text
    lines = {line.split("#")[1].split("--")[0].strip(): line.split("#")[0].strip()
             for line in text.splitlines() if not line.startswith("#") and "#" in line}
    assert lines["norm2"] == lagrange
    assert lines["norm"] == f"sqrt({lagrange})"
    assert lines["inverse"] == f"(b /\\ a)/({lagrange})"
    assert lines["formula"] == "a /\\ b"
    # every formula line reads back as the value the report computed
    for label, expected in (("norm2", "norm2(a /\\ b)"), ("inverse", "inverse(a /\\ b)"),
                            ("dual", "dual(a /\\ b)"), ("reverse", "(a /\\ b)~")):
        assert ok(s, f"check {lines[label]} == {expected}")[-1].outcome == "holds"
    assert f"where {lagrange} != 0" in text
    assert "a1*b2" in text                      # the components stay in the value item


def test_show_says_when_there_is_no_formula():
    s = session()
    text = ok(s, "show a1 e1")[-1].text
    assert "# formula: none" in text


def test_toolbar_shows_the_formula_setting():
    from gacalc.repl import toolbar_text

    s = session()
    assert "components, F3" in toolbar_text(s, width=400)
    ok(s, "formula auto")
    assert "formulas, F3" in toolbar_text(s, width=400)


# emit ---------------------------------------------------------------------------------
def emitted(s, text):
    return ok(s, text)[-1].code


def test_emit_latex_writes_the_formula_as_a_paper_does():
    from test_export_latex import assert_katex_accepts

    s = session()
    fragments = [emitted(s, "emit latex a _| (b /\\ c)"),
                 emitted(s, "emit latex inverse(a /\\ b) as Binv"),
                 emitted(s, "emit latex rotate(rotor(n, t), a)"),
                 emitted(s, "emit latex a /\\ b /\\ c + cross(a, b) . c")]
    assert fragments[0] == r"(\mathbf{a} \cdot \mathbf{b}) \mathbf{c} - (\mathbf{a} \cdot \mathbf{c}) \mathbf{b}"
    assert r"\lvert \mathbf{a} \rvert^{2}" in fragments[1] and r"\frac" in fragments[1]
    assert r"\times" in fragments[2] and r"\wedge" in fragments[3]
    assert_katex_accepts(fragments)
    components = emitted(s, "emit latex components a _| (b /\\ c)")
    assert "a_{1}" in components and r"\cdot" not in components


def _load(tmp_path, code, name):
    import importlib.util

    path = tmp_path / f"{name}.py"
    path.write_text(code, encoding="utf-8")
    spec = importlib.util.spec_from_file_location(name, path)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return getattr(module, name)


def test_emit_python_computes_through_dot_and_cross_when_cheaper(tmp_path):
    from scipy.spatial.transform import Rotation

    s = session()
    code = emitted(s, "emit python rotate(rotor(n, t), a) as turn")
    assert "Computed through dot and cross products" in code
    turn = _load(tmp_path, code, "turn")
    rng = np.random.default_rng(7)
    for _ in range(5):
        axis = rng.normal(size=3)
        axis /= np.linalg.norm(axis)
        a, angle = rng.normal(size=3), rng.uniform(-3, 3)
        expected = Rotation.from_rotvec(angle * axis).apply(a)   # scipy as the reference
        assert np.allclose(turn(a=list(a), n=list(axis), t=angle), expected)
    code = emitted(s, "emit python inverse(a /\\ b) as inv")
    inv = _load(tmp_path, code, "inv")
    for _ in range(5):
        a, b = rng.normal(size=3), rng.normal(size=3)
        # (a /\ b)^-1 = -(a /\ b)/|a /\ b|^2; its components are -cross(a, b)/|a x b|^2
        # (common practice: B^2 = -|B|^2 for a bivector in Cl(3,0))
        x = np.cross(a, b)
        assert np.allclose(inv(a=list(a), b=list(b)), -x / (x @ x))


def test_emit_keeps_components_when_they_are_cheaper():
    s = session()
    code = emitted(s, "emit python a /\\ b as w")
    assert "Computed through" not in code
    code = emitted(s, "emit python components rotate(rotor(n, t), a) as turn")
    assert "Computed through" not in code


def test_emit_c_through_the_formula_compiles_and_agrees(tmp_path):
    import shutil
    import subprocess

    gcc = shutil.which("gcc")
    if gcc is None:
        pytest.skip("gcc is not installed")
    s = session()
    code = emitted(s, "emit c rotate(rotor(n, t), a) as turn")
    assert "Computed through dot and cross products" in code
    driver = ("#include <stdio.h>\nvoid turn(const double *a, const double *n, double t, "
              "double *out);\nint main(void){double a[3]={1,2,3}, n[3]={0.6,0,0.8}, out[3];"
              "turn(a, n, 0.5, out);printf(\"%.17g %.17g %.17g\\n\", out[0], out[1], out[2]);"
              "return 0;}\n")
    (tmp_path / "turn.c").write_text(code)
    (tmp_path / "main.c").write_text(driver)
    built = subprocess.run([gcc, "-std=c99", "-Wall", "-Werror", str(tmp_path / "turn.c"),
                            str(tmp_path / "main.c"), "-o", str(tmp_path / "prog"), "-lm"],
                           capture_output=True, text=True)
    assert built.returncode == 0, built.stderr
    out = subprocess.run([str(tmp_path / "prog")], capture_output=True, text=True).stdout
    from scipy.spatial.transform import Rotation

    expected = Rotation.from_rotvec(0.5 * np.array([0.6, 0, 0.8])).apply([1, 2, 3])
    assert np.allclose([float(x) for x in out.split()], expected)


# Common denominators in the text layout --------------------------------------------------
@pytest.mark.parametrize("expr", ["inverse(a /\\ b)", "inverse(a)", "(e1 + e2)/(1 + t)",
                                  "inverse(a + b /\\ c)"])
def test_a_shared_denominator_is_written_once_and_reads_back(expr):
    s = session()
    text = ok(s, expr)[-1].text
    value = ok(s, f"x = {expr}")[-1].value
    shared = value.shared_denominator()
    if shared is not None:
        assert text.startswith("(") and text.count(")/") >= 1
    check = ok(s, f"check ({text}) == {expr}")[-1]
    assert check.outcome == "holds"


def test_the_bivector_inverse_prints_its_denominator_once():
    s = session()
    text = ok(s, "inverse(a /\\ b)")[-1].text
    assert text.count("a1^2*b2^2") == 1


def test_show_names_a_repeated_long_scalar_once():
    s = session("multivector M")
    text = ok(s, "show M")[-1].text
    assert "\nD = M0^4" in text and ")/D" in text and "where D != 0" in text
    definition = next(line for line in text.splitlines() if line.startswith("D = "))
    inverse = next(line for line in text.splitlines() if line.endswith(")/D"))
    assert text.count("M0^4") == 1
    start = text.index("# inverse")
    body = text[start:].split("\n", 1)[1].split("\n# dual")[0]
    t = Session()
    ok(t, "multivector M\n" + definition)
    assert ok(t, f"check {body} == inverse(M)")[-1].outcome == "holds"
    assert inverse

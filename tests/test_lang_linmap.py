"""Subspaces and linear maps through the language: the issue's "done when" lines,
round-trip text, show, emit, conditions and errors."""

from __future__ import annotations

import numpy as np
import pytest

from conftest import ok
from gacalc.language import GacalcError, Session
from gacalc.values import kind_of
from gacalc.values.linmap import LINMAP


def _last(session, text):
    return ok(session, text)[-1]


def _checks(results):
    return [r for r in results if getattr(r, "kind", "") == "check"]


def _notes(results):
    return [r.message for r in results if getattr(r, "kind", "") == "note"]


def _error(session, text) -> GacalcError:
    result = session.run(text)[-1]
    assert isinstance(result, GacalcError), result
    return result


def test_done_when_meet_of_two_coordinate_planes():
    session = Session()
    results = ok(session, "check meet(e12, e23) /\\ e2 == 0\nm = meet(e12, e23)")
    assert _checks(results)[0].outcome == "holds"
    assert results[-1].value.grades() == {1}          # meet nonzero: the line e2


def test_done_when_determinant_and_outermorphism():
    session = Session()
    results = ok(session, "f = linmap(2, 1, 0, 0, 3, 1, 1, 0, 4)\nd = det(f)\n"
                          "check f(e1 /\\ e2) == f(e1) /\\ f(e2)")
    # numpy.linalg.det of the same rows
    expected = np.linalg.det(np.array([[2, 1, 0], [0, 3, 1], [1, 0, 4]], float))
    assert round(expected) == 25
    assert results[1].value.scalar_part() == 25
    assert _checks(results)[0].outcome == "holds"


def test_application_composition_and_scaling():
    session = Session()
    ok(session, "f = linmap(2, 1, 0, 0, 3, 1, 1, 0, 4)\ng = linmap(e2, -e1, e3)")
    # f(X), f X and f*X all apply the map; f g is f after g
    for text in ("check f(e1) == 2 e1 + e3", "check f e1 == f(e1)", "check f*e1 == f(e1)",
                 "check (f g)(e1) == f(g(e1))", "check f g e1 == f(g(e1))",
                 "check f(2) == 2", "check (2 f)(e1) == 2 f(e1)", "check f(I) == det(f) I",
                 "check (f + g)(e1) == f(e1) + g(e1)", "check f^2 == f f",
                 "check f^-1 f == linmap(1, 0, 0, 0, 1, 0, 0, 0, 1)",
                 "check inverse(f) == f^-1", "h = adjoint(f)", "check h(e1) . e2 == e1 . f(e2)"):
        result = _last(session, text)
        assert text.startswith("h =") or result.outcome == "holds", text


def test_printed_linear_map_reads_back_as_itself():
    session = Session()
    for text in ("linmap(2, 1, 0, 0, 3, 1, 1, 0, 4)", "linmap(1/2, -3, 0, 0, 1, 0, 7, 0, 1)",
                 "linmap(cos(t), -sin(t), 0, sin(t), cos(t), 0, 0, 0, 1)",
                 "625 inverse(linmap(2, 1, 0, 0, 3, 1, 1, 0, 4))"):
        first = _last(session, text)
        assert kind_of(first.value) is LINMAP
        again = _last(session, first.text)
        assert _last(session, f"check {first.text} == {again.text}").outcome == "holds"
        assert again.text == first.text


def test_long_symbolic_map_prints_rows_that_read_back():
    session = Session()
    ok(session, "matrix3 M")
    shown = _last(session, "inverse(linmap(M))")
    assert "\n" in shown.text
    back = _last(session, f"check inverse(linmap(M)) == {shown.text}")
    assert back.outcome == "holds"


def test_declared_matrix_and_symbolic_map():
    session = Session()
    results = ok(session, "matrix3 M\nf = linmap(M)\ncheck det(f) == det(M)\n"
                          "g = inverse(f)\ncheck g f == linmap(1, 0, 0, 0, 1, 0, 0, 0, 1)")
    assert all(c.outcome == "holds" for c in _checks(results))
    notes = _notes(results)
    assert any(n.startswith("the inverse is valid where") and "M11*M22*M33" in n
               for n in notes)
    assert "M11" in session.get("M")[0, 0].name


def test_show_reports_determinant_orthogonality_and_rotor():
    session = Session()
    report = _last(session, "show linmap(e2, -e1, e3)").report
    assert report["determinant"] == 1
    assert report["orthogonal"] == "yes" and report["special orthogonal"] == "yes"
    # the quarter turn e1 -> e2 is rotor(e12, pi/2) (DESIGN.md rotor convention)
    check = _last(session, f"check {report.item('rotor').value} == rotor(e12, pi/2)")
    assert check.outcome == "holds"
    mirror = _last(session, "show linmap(-e1, e2, e3)").report
    assert mirror["orthogonal"] == "yes" and mirror["special orthogonal"] == "no"
    assert "rotor" not in mirror
    shear = _last(session, "show linmap(1, 1, 0, 0, 1, 0, 0, 0, 1)").report
    assert shear["orthogonal"] == "no"


def test_emit_python_of_a_linear_map_runs(tmp_path):
    session = Session()
    result = _last(session, "emit python linmap(2, 1, 0, 0, 3, 1, 1, 0, 4) as f")
    namespace = {}
    exec(compile(result.code, "emitted", "exec"), namespace)   # our generated code, not user text
    assert np.allclose(np.array(namespace["f"](), float),
                       [[2, 1, 0], [0, 3, 1], [1, 0, 4]])
    ok(session, "matrix3 M")
    code = _last(session, "emit c det(linmap(M))").code
    assert "M[0]" in code and "M[8]" in code


def test_angles_between_lines_and_planes():
    session = Session()
    for text in ("check angle(e1 + e3, e12) == pi/4", "check angle(e1 - e3, e12) == -pi/4",
                 "check angle(e12, e23) == pi/2", "check angle(e1, e2) == pi/2",
                 "check angle(e12, e1 /\\ (e2 + e3)) == pi/4"):
        assert _last(session, text).outcome == "holds", text


def test_join_is_blade_and_frame_matrix():
    session = Session()
    for text in ("check join(e12, e23) == I", "check join(e1, e2) == e12",
                 "check join(e1, e12) == e12", "check meet(e1 + e2, e12) == e1 + e2",
                 "check is_blade(e1 /\\ (e2 + e3)) == 1", "check is_blade(e1 + e12) == 0",
                 "check det(frame_matrix(e1, e1 + e2, e3)) == 1",
                 "check linmap(frame_matrix(e1, e1 + e2, e3)) == linmap(e1, e1 + e2, e3)"):
        assert _last(session, text).outcome == "holds", text


@pytest.mark.parametrize("text, words", [
    ("inverse(linmap(1, 2, 3, 2, 4, 6, 0, 0, 1))", "det(f) = 0"),
    ("linmap(1, 2)", "linmap"),
    ("linmap(e1, e2, e12)", "vector"),
    ("det(e1)", "linear map"),
    ("meet(e1 + e12, e1)", "single grade"),
    ("factor(e1 /\\ (2 e1))", "parallel"),
    ("reciprocal(e1, e2, e1 + e2)", "one plane"),
    ("e1 / linmap(1, 0, 0, 0, 1, 0, 0, 0, 1)", "divide"),
])
def test_bad_input_is_a_one_line_error_and_the_session_is_kept(text, words):
    session = Session()
    ok(session, "x = 1")
    error = _error(session, text)
    assert words in error.message and "\n" not in error.message
    assert error.span is not None
    assert session.get("x") == 1


def test_symbolic_meet_and_join_state_their_conditions():
    session = Session()
    results = ok(session, "vector a, b\nj = join(a, b)")
    assert any(n.startswith("the join is valid where") for n in _notes(results))


def test_done_when_reciprocal_frame_of_declared_vectors():
    session = Session()
    results = ok(session, "vector a, b, c\ncheck reciprocal(a, b, c)[1] . a == 1\n"
                          "F = reciprocal(a, b, c)\ncheck F[2] . b == 1\ncheck F[3] . a == 0")
    assert all(c.outcome == "holds" for c in _checks(results))
    # the condition is the frame's volume a ^ b ^ c, stated like the inverse's
    assert any(n.startswith("the reciprocal frame is valid where") and "a1*b2*c3" in n
               for n in _notes(results))


def test_factor_and_reciprocal_return_lists_that_read_back():
    session = Session()
    for text in ("factor(e12 + e23)", "factor(2 e123)", "reciprocal(e1, e1 + e2, e3)"):
        first = _last(session, text)
        assert _last(session, f"check {text} == {first.text}").outcome == "holds", text
    assert _last(session, "check factor(e1 /\\ (e1 + e2))[1] /\\ factor(e1 /\\ (e1 + e2))[2]"
                          " == e1 /\\ e2").outcome == "holds"
    assert _last(session, "check factor(e1 /\\ (e1 + e2))[1] . factor(e1 /\\ (e1 + e2))[2]"
                          " == 0").outcome == "holds"


def test_rotation_map_of_a_symbolic_rotor_reports_the_rotor():
    session = Session()
    ok(session, "rotor R\nf = linmap(matrix(R))")
    report = _last(session, "show f").report
    # under the unit-rotor condition f is a rotation with det 1 (DESIGN.md: matrix(R))
    assert report["determinant"] == 1 and report["special orthogonal"] == "yes"
    assert _last(session, f"check {report.item('rotor').value} == R").outcome == "holds"
    assert _last(session, "check f(e1 /\\ e2) == R e12 R~").outcome == "holds"


def test_reciprocal_frame_is_the_inverse_transpose_of_the_frame_matrix():
    # the reciprocal lattice: columns of inv(A).T (a handbook fact, see test_subspaces)
    session = Session()
    ok(session, "vector a, b, c\nF = reciprocal(a, b, c)")
    check = _last(session, "check linmap(F[1], F[2], F[3]) == adjoint(inverse(linmap(a, b, c)))")
    assert check.outcome == "holds"


def test_is_blade_of_a_symbolic_multivector_says_it_is_generic():
    session = Session()
    results = ok(session, "multivector M\nis_blade(M)")
    assert results[-1].value == 0
    assert any("general values" in n for n in _notes(results))


def test_latex_of_a_linear_map_and_its_report_renders_in_katex():
    from test_export_latex import assert_katex_accepts

    session = Session()
    ok(session, "matrix3 M")
    texts = [_last(session, "show latex linmap(e2, -e1, e3)").report_text,
             _last(session, "show latex linmap(M)").report_text,
             _last(session, "emit latex inverse(linmap(M))").code]
    assert_katex_accepts(texts)

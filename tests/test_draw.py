"""Pictures: the draw statement and gacalc.draw (gacalc/pictures).

The SVG is read back as XML (matplotlib writes an artist's gid as the id of its group),
the PNG's size from its IHDR chunk (PNG specification, ISO/IEC 15948, section 11.2.2), and
the geometry from the figure's own data (Line3D.get_data_3d).  Reference values: scipy's
Rotation for the rotor arcs, the Householder reflection x - 2 (x.n) n / (n.n) for mirrors
(common practice), the dual of a bivector as its normal (DESIGN.md: e1 x e2 = e3).
"""

from __future__ import annotations

import struct
import sys
import xml.etree.ElementTree as ET

import numpy as np
import pytest
from scipy.spatial.transform import Rotation

pytest.importorskip("matplotlib")

import gacalc  # noqa: E402
from gacalc import GacalcError, Session  # noqa: E402

SVG = "{http://www.w3.org/2000/svg}"


def _ids(svg_bytes) -> list:
    root = ET.fromstring(svg_bytes)
    return [g.get("id") for g in root.iter(SVG + "g") if g.get("id")]


def _lines(result) -> dict:
    (axes,) = result.figure.axes
    return {line.get_gid(): np.array(line.get_data_3d()).T for line in axes.get_lines()
            if line.get_gid()}


def test_svg_has_one_group_per_drawn_item(tmp_path):
    s = Session(base_dir=str(tmp_path))
    (result,) = s.run('draw e1 + 2 e2, e12, rotor(e23, pi/3), reflect(e1 + e3, e1) '
                      'to "items.svg"')
    assert result.kind == "draw" and result.path == str(tmp_path / "items.svg")
    ids = _ids((tmp_path / "items.svg").read_bytes())
    # e1 + 2 e2: 1 arrow; rotor: reference and turned arrows; reflect: x and its image
    assert sorted(i for i in ids if i.startswith("arrow-")) == [f"arrow-{k}" for k in range(1, 6)]
    assert sorted(i for i in ids if i.startswith("arrowhead-")) == \
        [f"arrowhead-{k}" for k in range(1, 6)]
    assert [i for i in ids if i.startswith("disc-")] == ["disc-1"]
    assert [i for i in ids if i.startswith("arc-")] == ["arc-1", "arc-head-1"]
    assert [i for i in ids if i.startswith("plane-")] == ["plane-1"]
    assert result.text == f"drew 5 arrows, 1 disc, 1 arc, 1 plane to {result.path}"


def test_png_has_the_requested_size(tmp_path):
    path = tmp_path / "small.png"
    gacalc.draw("e1", "e2 + e3", to=str(path), size=(400, 300))
    data = path.read_bytes()
    assert data[:8] == b"\x89PNG\r\n\x1a\n" and data[12:16] == b"IHDR"
    assert struct.unpack(">II", data[16:24]) == (400, 300)


def test_arrow_end_points_are_the_components():
    s = Session()
    s.inline_pictures = True
    s.evaluate("a = 3 e1 - 2 e2 + 1/2 e3\nb = -e3")
    result = s.run("draw a, b, a + b")[-1]
    lines = _lines(result)
    for gid, value in (("arrow-1", "a"), ("arrow-2", "b"), ("arrow-3", "a + b")):
        start, end = lines[gid][0], lines[gid][-1]
        assert np.allclose(start, 0)
        assert np.allclose(end, s.evaluate(value).to_numpy(grade=1))
    assert result.path is None and result.image.lstrip().startswith(b"<?xml")


def test_rotation_arc_ends_where_scipy_turns_the_vector():
    s = Session()
    s.inline_pictures = True
    s.evaluate("R = rotor((e1 + e2 + e3)/sqrt(3), 2 pi/5)")
    result = s.run("draw rotate(R, e1 + 2 e3)")[-1]
    lines = _lines(result)
    x = np.array([1.0, 0.0, 2.0])
    axis = np.ones(3) / np.sqrt(3)
    expected = Rotation.from_rotvec(axis * 2 * np.pi / 5).apply(x)   # right-hand rule
    assert np.allclose(lines["arc-1"][0], x)
    assert np.allclose(lines["arc-1"][-1], expected)
    assert np.allclose(lines["arrow-2"][-1], expected)                  # the language's image
    assert np.allclose(lines["arrow-2"][-1],
                       s.evaluate("rotate(R, e1 + 2 e3)").to_numpy(grade=1))
    # every point of the arc keeps its distance to the axis line (a circle about it)
    offsets = lines["arc-1"] - np.outer(lines["arc-1"] @ axis, axis)
    assert np.allclose(np.linalg.norm(offsets, axis=1), np.linalg.norm(offsets[0]))


def test_a_bare_rotor_turns_a_reference_vector_of_its_plane():
    s = Session()
    s.inline_pictures = True
    result = s.run("draw rotor(e12, pi/2)")[-1]
    (arc,) = result.scene.arcs
    # rotor(e12, pi/2) turns e1 to e2 (DESIGN.md)
    assert np.allclose(arc.points[0], [1, 0, 0]) and np.allclose(arc.points[-1], [0, 1, 0])
    assert np.allclose(arc.axis, [0, 0, 1])


def test_reflection_draws_the_mirror_plane_and_the_image():
    s = Session()
    s.inline_pictures = True
    result = s.run("draw reflect(2 e1 + e2 - e3, e1 + e2)")[-1]
    (plane,) = result.scene.planes
    n = np.array([1.0, 1.0, 0.0])
    x = np.array([2.0, 1.0, -1.0])
    assert np.allclose(plane.normal, n / np.linalg.norm(n))
    assert np.allclose(plane.corners() @ plane.normal, 0)     # the plane is normal to n
    image = x - 2 * (x @ n) / (n @ n) * n                    # Householder reflection
    lines = _lines(result)
    assert np.allclose(lines["arrow-1"][-1], x)
    assert np.allclose(lines["arrow-2"][-1], image)


def test_bivector_disc_has_its_area_normal_and_circulation():
    s = Session()
    s.inline_pictures = True
    (disc,) = s.run("draw 3 e12")[-1].scene.discs
    assert np.isclose(np.pi * disc.radius ** 2, 3)           # area |B|
    assert np.allclose(disc.normal, [0, 0, 1])               # dual(e12) = e3
    assert np.allclose(disc.u, [1, 0, 0]) and np.allclose(disc.v, [0, 1, 0])  # e1 -> e2
    (tilted,) = s.run("draw e23 + e31")[-1].scene.discs
    assert np.allclose(tilted.normal, np.array([1, 1, 0]) / np.sqrt(2))   # dual: e1 + e2


def test_symbolic_values_name_the_unset_symbols():
    s = Session()
    s.evaluate("vector a\nscalar t")
    (error,) = s.run("draw a, rotor(e12, t), e1")
    assert isinstance(error, GacalcError)
    assert "no value for a1, a2, a3, t" in error.message
    assert "subs(" in error.full_message()
    (ok,) = s.run('draw subs(rotor(e12, t), t, pi/4) to "/dev/null/x.svg"')
    assert "cannot write" in ok.message          # numbers now: only the path fails


def test_terminal_writes_a_new_file_and_says_where(tmp_path):
    s = Session(base_dir=str(tmp_path))
    first = s.run("draw e1")[-1]
    second = s.run("draw e2")[-1]
    assert first.path == str(tmp_path / "drawing-1.svg")
    assert second.path == str(tmp_path / "drawing-2.svg")
    assert first.text == f"drew 1 arrow to {first.path}"
    ET.fromstring((tmp_path / "drawing-1.svg").read_bytes())


@pytest.mark.parametrize("text, message", [
    ("draw", "draw needs values"),
    ("draw e1,", "missing value after ','"),
    ('draw e1 to "picture.pdf"', "draw writes .svg or .png files"),
    ("draw e1 to picture", "expected a file name in quotes"),
    ("draw 2 + e123", "nothing to draw"),
    ("draw pauli(e1)", "draw takes multivectors"),
])
def test_mistakes_are_one_line_errors(text, message, tmp_path):
    s = Session(base_dir=str(tmp_path))
    s.evaluate("keep = e1")
    (error,) = s.run(text)
    assert isinstance(error, GacalcError) and message in error.message
    assert error.span is not None
    assert s.values.keys() == {"keep"} and not list(tmp_path.iterdir())


def test_parts_that_cannot_be_drawn_get_a_note(tmp_path):
    s = Session(base_dir=str(tmp_path))
    note, result = s.run("draw 2 + e1 + e123")
    assert note.text == "note: the scalar and trivector parts are of 2 + e1 + e123 not drawn" \
        or "not drawn" in note.text
    assert result.scene.counts()["arrows"] == 1


def test_missing_matplotlib_is_a_clear_message(monkeypatch, tmp_path):
    for name in [m for m in sys.modules if m == "matplotlib" or m.startswith("matplotlib.")
                 or m.startswith("mpl_toolkits")]:
        monkeypatch.setitem(sys.modules, name, None)
    monkeypatch.setitem(sys.modules, "matplotlib", None)
    (error,) = Session(base_dir=str(tmp_path)).run("draw e1")
    assert isinstance(error, GacalcError)
    assert error.message == "draw needs matplotlib, which is not installed: " \
                            "pip install 'gacalc[draw]'"


def test_help_describes_draw():
    (result,) = Session().run("help draw")
    assert "reflect(x, n)" in result.text and "gacalc[draw]" in result.text

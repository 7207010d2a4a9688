"""A real notebook in a real kernel: %load_ext gacalc, %%gac cells, rich outputs.

One kernel (ipykernel, registered from this test's own Python so it runs in CI's fresh
virtual environment) executes one notebook (nbclient, nbformat); the outputs' mime types
and contents are checked, the LaTeX through KaTeX (tests/test_export_latex.py's helper).
Expected mathematics: the rotation of e1 by rotor(e12, theta) is cos(theta) e1 +
sin(theta) e2 (the project's rotor convention, DESIGN.md; Rodrigues' formula), e1 e2 = -e2 e1
(anticommuting orthogonal vectors, common practice).
"""

from __future__ import annotations

import html.parser
import json
import re
import sys

import pytest

nbformat = pytest.importorskip("nbformat")
nbclient = pytest.importorskip("nbclient")
pytest.importorskip("ipykernel")

from test_export_latex import assert_katex_accepts  # noqa: E402

KERNEL = "gacalc-test"

CELLS = [
    ("code", "%load_ext gacalc"),
    ("code", "%%gac\nscalar theta\nR = rotor(e12, theta)\nv = rotate(R, e1)\nR;"),
    ("code", "%%gac\nshow rotor(e12, pi/3)"),
    ("code", "%%gac\ncheck v == cos(theta) e1 + sin(theta) e2\ncheck e1 e2 == e2 e1"),
    ("code", "%%gac\ny = 2 e1\nw = v ? 2\nz = 3"),
    ("code", "import gacalc\n"
             "s = gacalc.session()\n"
             "print(sorted(s.values))\n"
             "print(s['v'])\n"
             "s['u'] = gacalc.e1 + gacalc.e3"),
    ("code", "%gac u . e3"),
    ("code", "%%gac\ndraw u, e12, rotor(e12, pi/2)"),
    ("code", "%gac draw theta e1"),
]


@pytest.fixture(scope="module")
def executed(tmp_path_factory):
    """The notebook after one run in a fresh kernel of this interpreter."""
    root = tmp_path_factory.mktemp("jupyter")
    spec = root / "kernels" / KERNEL
    spec.mkdir(parents=True)
    (spec / "kernel.json").write_text(json.dumps({
        "argv": [sys.executable, "-m", "ipykernel_launcher", "-f", "{connection_file}"],
        "display_name": "gacalc test", "language": "python"}))
    notebook = nbformat.v4.new_notebook()
    notebook.cells = [nbformat.v4.new_code_cell(source) for _, source in CELLS]
    monkey = pytest.MonkeyPatch()
    monkey.setenv("JUPYTER_PATH", str(root))
    monkey.setenv("JUPYTER_PLATFORM_DIRS", "1")
    try:
        client = nbclient.NotebookClient(notebook, kernel_name=KERNEL, timeout=300,
                                         resources={"metadata": {"path": str(root)}})
        client.execute()
    finally:
        monkey.undo()
    return notebook


def _outputs(notebook, index):
    return notebook.cells[index].outputs


def _displays(notebook, index):
    return [o for o in _outputs(notebook, index) if o.output_type == "display_data"]


def _stream(notebook, index, name):
    return "".join(o.text for o in _outputs(notebook, index)
                   if o.output_type == "stream" and o.name == name)


def test_no_cell_shows_a_python_traceback(executed):
    for cell in executed.cells:
        for output in cell.outputs:
            assert output.output_type != "error", output
            assert "Traceback" not in json.dumps(output), output


def test_declarations_and_values_display_as_latex_with_text(executed):
    displays = _displays(executed, 1)
    # scalar theta, R = ..., v = ... (R; is silent)
    assert len(displays) == 3
    for output in displays:
        assert {"text/latex", "text/plain"} <= set(output.data)
    value = displays[2].data
    assert value["text/plain"] == "v = cos(theta)*e1 + sin(theta)*e2"
    assert value["text/latex"].startswith("$\\displaystyle v = ")
    assert "\\cos{\\left(\\theta \\right)} \\mathbf{e}_{1}" in value["text/latex"]


def test_show_is_an_html_table_with_latex_cells(executed):
    (output,) = _displays(executed, 2)
    page = output.data["text/html"]
    assert page.startswith('<table class="gacalc-show">')
    cells = _math_cells(page)
    assert len(cells) > 10
    # angle pi/3 and plane e12 of rotor(e12, pi/3) (DESIGN.md rotor convention)
    assert "\\frac{\\pi}{3}" in cells
    assert "\\mathbf{e}_{12}" in cells
    assert "derived forms" in output.data["text/plain"]


def test_checks_use_the_names_of_earlier_cells(executed):
    held, failed = _displays(executed, 3)
    assert "<b>held</b>" in held.data["text/html"]
    assert held.data["text/plain"].startswith("held: check v ==")
    assert "<b>FAILED</b>" in failed.data["text/html"]
    # e1 e2 - e2 e1 = 2 e12
    assert "L - R = 2 \\mathbf{e}_{12}" in failed.data["text/html"]


def test_an_error_is_the_caret_message_and_changes_nothing(executed):
    displays = _displays(executed, 4)
    assert [d.data["text/plain"] for d in displays] == ["y = 2*e1"]
    message = _stream(executed, 4, "stderr")
    assert message.startswith("<input>:2:")
    assert "w = v ? 2" in message and "^" in message
    names = _stream(executed, 5, "stdout").splitlines()
    assert names[0] == repr(sorted(["theta", "R", "v", "y"]))   # no w, no z
    assert names[1] == "cos(theta)*e1 + sin(theta)*e2"


def test_values_set_from_python_reach_the_line_magic(executed):
    (output,) = _displays(executed, 6)
    assert output.data["text/plain"] == "1"
    assert output.data["text/latex"] == "$\\displaystyle 1$"


def test_draw_shows_its_picture_inline(executed):
    (output,) = _displays(executed, 7)
    svg = output.data["image/svg+xml"]
    assert svg.lstrip().startswith("<?xml") and "</svg>" in svg
    for gid in ("arrow-1", "disc-1", "arc-1"):
        assert f'id="{gid}"' in svg
    assert output.data["text/plain"].startswith("picture of ")
    message = _stream(executed, 8, "stderr")
    assert "no value for theta" in message


def test_every_latex_of_the_notebook_passes_katex(executed):
    fragments = []
    for cell in executed.cells:
        for output in cell.outputs:
            data = output.get("data", {})
            if "text/latex" in data:
                fragments.append(_unwrap(data["text/latex"]))
            if "text/html" in data:
                fragments.extend(_math_cells(data["text/html"]))
    assert len(fragments) > 20
    assert_katex_accepts(fragments)


def _unwrap(latex: str) -> str:
    assert latex.startswith("$") and latex.endswith("$"), latex
    return latex.strip("$")


class _MathCollector(html.parser.HTMLParser):
    """The text of every $...$ in an HTML page, entities decoded as a browser does."""

    def __init__(self):
        super().__init__(convert_charrefs=True)
        self.text = []

    def handle_data(self, data):
        self.text.append(data)


def _math_cells(page: str) -> list:
    collector = _MathCollector()
    collector.feed(page)
    return re.findall(r"\$([^$]+)\$", "".join(collector.text))

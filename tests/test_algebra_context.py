"""The algebra's bottom: one context per session, deterministic generator names, hooks instead
of imports of the layers above (simplify, language, printing, export, forms)."""

from __future__ import annotations

import ast
import json
import os
import subprocess
import sys
import textwrap
from pathlib import Path

import numpy as np
import sympy as sp

import gacalc.simplify  # noqa: F401  (installs the simplifier the algebra compares with)
from gacalc.algebra import Multivector, e1, e2, e12
from gacalc.algebra.coefficients import from_expr
from gacalc.algebra.context import AlgebraContext, Hooks, Simplifier, current
from gacalc.language import Session

ALGEBRA = Path(__file__).resolve().parent.parent / "gacalc" / "algebra"
ABOVE_THE_ALGEBRA = ("gacalc.simplify", "gacalc.language", "gacalc.printing", "gacalc.export",
                     "gacalc.forms")


def _run_python(code: str, **env) -> subprocess.CompletedProcess:
    return subprocess.run([sys.executable, "-c", textwrap.dedent(code)], capture_output=True,
                          text=True, timeout=300, env={**os.environ, **env})


def _names(session: Session) -> list[str]:
    return [info.name for info in session.algebra.registry.infos]


def test_two_sessions_keep_separate_registries():
    first, second = Session(), Session()
    x, y = sp.symbols("x y", real=True)
    out1 = first.run("(x + y) e1 * (x - y) e1")
    out2 = second.run("scalar u; cos(u) e12")
    # the geometric product of parallel vectors is their dot product (common practice);
    # the expansion of (x + y)(x - y) is sympy's
    assert sp.expand(out1[-1].value[0] - (x + y) * (x - y)) == 0
    assert set(_names(first)) == {"x", "y"}
    assert "cos(u)" in _names(second) and not {"x", "y"} & set(_names(second))
    assert not {"u", "cos(u)"} & set(_names(first))
    # values are read through their own registry even after the run, outside the session
    assert out2[-1].value["e12"] == sp.cos(sp.Symbol("u", real=True))


def test_many_generators_in_one_session_leave_a_fresh_one_alone():
    script = "vector n unit\nscalar theta\nrotate(rotor(n, theta), e1 + e2)\ncheck norm2(n) == 1\n"
    before = [r.text for r in Session().run(script)]
    busy = Session()
    with busy.algebra.active():
        for k in range(1000):
            from_expr(sp.Symbol(f"g{k}", real=True))
    fresh = Session()
    after = [r.text for r in fresh.run(script)]
    assert len(busy.algebra.registry) >= 1000
    assert after == before
    assert not any(name.startswith("g") for name in _names(fresh))
    # Rodrigues' rotation formula (O. Rodrigues, 1840) for x = e1 + e2 about the unit axis n,
    # x cos(t) + (n x x) sin(t) + n (n . x)(1 - cos(t)), with the cross product from sympy
    n1, n2, n3, t = sp.symbols("n1 n2 n3 theta", real=True)
    n, x = sp.Matrix([n1, n2, n3]), sp.Matrix([1, 1, 0])
    expected = x * sp.cos(t) + n.cross(x) * sp.sin(t) + n * n.dot(x) * (1 - sp.cos(t))
    value = fresh.run("rotate(rotor(n, theta), e1 + e2)")[-1].value
    unit = {n1: sp.Rational(2, 7), n2: sp.Rational(3, 7), n3: sp.Rational(6, 7)}  # 4 + 9 + 36 = 49
    for k, name in enumerate(("e1", "e2", "e3")):
        assert sp.simplify((value[name] - expected[k]).subs(unit)) == 0


def test_a_name_used_elsewhere_keeps_its_text_in_a_session():
    # library code in the default context meets a symbol x with other assumptions first
    from_expr(sp.Symbol("x", positive=True))
    results = Session().run("x^2 + 1")
    assert results[-1].text.endswith("x^2 + 1")


def test_a_value_carried_into_another_context_keeps_its_meaning():
    x_real, x_positive = sp.Symbol("x", real=True), sp.Symbol("x", positive=True)
    home, other = AlgebraContext(), AlgebraContext()
    with home.active():
        value = Multivector({0: x_real + 1, "e1": x_real})
    with other.active():
        # here the flint variable named "x" is another symbol; x_real gets a fallback name
        from_expr(x_positive)
        square = value * value
    # (x + 1 + x e1)^2 = (x + 1)^2 + x^2 + 2 x (x + 1) e1, since e1 e1 = 1 (common practice);
    # expansions by sympy
    assert sp.expand(square[0] - ((x_real + 1) ** 2 + x_real**2)) == 0
    assert sp.expand(square["e1"] - 2 * x_real * (x_real + 1)) == 0
    assert square[0].free_symbols == {x_real}


def test_fallback_generator_names_do_not_depend_on_the_hash_seed():
    code = """
        import sympy as sp
        from gacalc.algebra.context import AlgebraContext
        from gacalc.algebra.coefficients import from_expr
        context = AlgebraContext()
        with context.active():
            # the same text twice (two assumption sets) and a non-ASCII name need fallbacks
            c = from_expr(sp.Symbol("x") + sp.Symbol("x", positive=True) + sp.Symbol("\u03c8"))
            print([i.name for i in context.registry.infos], c.text())
    """
    outputs = {_run_python(code, PYTHONHASHSEED=seed).stdout for seed in ("1", "2", "12345")}
    assert len(outputs) == 1
    (output,) = outputs
    assert "_g" in output, output


def test_the_algebra_works_with_simplify_blocked():
    code = """
        import json, sys
        sys.modules["gacalc.simplify"] = None  # any import of it now fails
        from gacalc.algebra import vector
        a, b = vector(1, 2, 3), vector(4, -5, 6)
        p = a * b
        print(p[0], p["e23"], p["e31"], p["e12"])
        print(json.dumps(sorted(m for m in sys.modules if m.startswith("gacalc.") and sys.modules[m] is not None)))
    """
    done = _run_python(code)
    assert done.returncode == 0, done.stderr
    scalar, b23, b31, b12 = (int(v) for v in done.stdout.split("\n")[0].split())
    # a b = a . b + a ^ b; the bivector a ^ b is the dual of the cross product a x b,
    # with e23, e31, e12 taking its x, y, z components (DESIGN.md); reference: numpy
    a, b = np.array([1, 2, 3]), np.array([4, -5, 6])
    assert scalar == np.dot(a, b)
    assert [b23, b31, b12] == list(np.cross(a, b))
    loaded = json.loads(done.stdout.split("\n")[1])
    assert "gacalc.algebra.multivector" in loaded
    assert not any(m.startswith(ABOVE_THE_ALGEBRA) for m in loaded)


def _imported_modules(path: Path) -> set[str]:
    """Absolute names of everything a module of gacalc.algebra imports (relative ones resolved)."""
    out = set()
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
        if isinstance(node, ast.Import):
            out.update(alias.name for alias in node.names)
        elif isinstance(node, ast.ImportFrom):
            if node.level:
                base = ["gacalc", "algebra"][: 2 - (node.level - 1)]
                module = ".".join(base + ([node.module] if node.module else []))
            else:
                module = node.module
            out.add(module)
            out.update(f"{module}.{alias.name}" for alias in node.names)
    return out


def test_no_algebra_module_imports_the_layers_above():
    modules = sorted(ALGEBRA.glob("*.py"))
    assert len(modules) >= 8
    offenders = {
        path.name: sorted(m for m in _imported_modules(path) if m.startswith(ABOVE_THE_ALGEBRA))
        for path in modules
    }
    assert {name: found for name, found in offenders.items() if found} == {}


def test_import_scan_sees_relative_and_absolute_imports(tmp_path):
    # the scan itself must catch the spellings a violation could take
    probe = tmp_path / "probe.py"
    probe.write_text("from ..simplify import is_zero\nimport gacalc.export\n"
                     "def f():\n    from gacalc.forms import report\n", encoding="utf-8")
    found = _imported_modules(probe)
    assert {"gacalc.simplify", "gacalc.export", "gacalc.forms"} <= found


def test_exact_defaults_without_a_simplifier():
    u = sp.Symbol("u", real=True)
    pythagoras = Multivector({0: sp.cos(u) ** 2 + sp.sin(u) ** 2})
    bare = AlgebraContext(Hooks(Simplifier()))
    with bare.active():
        assert current() is bare
        # e1 e1 = 1 holds structurally (DESIGN.md: e1.e1 = +1)
        assert e1 * e1 == 1
        # cos^2 + sin^2 = 1 (common practice) needs the relations: undecided without them
        assert Simplifier().is_zero(pythagoras - 1) is None
        assert not pythagoras.equals(1)
    assert pythagoras.equals(1)  # the default context uses the installed simplifier


def test_latex_display_comes_from_the_installed_printer():
    from gacalc.export import latex_of

    value = e1 + 2 * e12
    # IPython's rich display protocol: _repr_latex_ returns LaTeX text or None (common practice)
    assert value._repr_latex_() == f"$${latex_of(value)}$$"
    with AlgebraContext(Hooks(latex=None)).active():
        assert value._repr_latex_() is None
    assert (e1 + e2)._repr_latex_().startswith("$$")


def test_values_from_a_session_display_as_latex_in_a_fresh_process():
    # A notebook user who only runs a Session still gets rich display of the values it hands
    # out (IPython's _repr_latex_ protocol, common practice), without importing the export API.
    code = ("from gacalc.language.session import Session\n"
            "s = Session(); s.run('x = e1 + 2 e12')\n"
            "print(s.get('x')._repr_latex_())\n")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                         check=True, cwd=ALGEBRA.parent.parent).stdout
    assert out.startswith("$$") and "e}_{1}" in out and "e}_{12}" in out

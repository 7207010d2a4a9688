"""LaTeX output, validated by a real TeX parser: KaTeX (npm package katex) through node.

KaTeX is installed by scripts/install_katex.sh. In CI (CI set) a missing node or KaTeX
fails these tests; locally they skip.
"""

import json
import os
import re
import shutil
import subprocess
import sys
from pathlib import Path

import pytest
import sympy

from gacalc.export import emit, latex_of
from test_export_values import (add, bivector, case, multivector, product, reverse, rotor,
                                symbols, to_pauli, vector)

ROOT = Path(__file__).resolve().parent.parent
VALIDATOR = ROOT / 'tests' / 'katex' / 'validate.js'
EXAMPLES = ROOT / 'gacalc' / 'examples'


def _missing(reason):
    if os.environ.get('CI'):
        pytest.fail(f'{reason}: the LaTeX output cannot be validated (CI installs KaTeX '
                    'with scripts/install_katex.sh)')
    pytest.skip(reason)


def katex_errors(fragments):
    """KaTeX's verdict on each fragment: None when it renders, else the parse error."""
    node = shutil.which('node')
    if not node:
        _missing('node is not installed')
    ran = subprocess.run([node, str(VALIDATOR)], input=json.dumps(fragments),
                         capture_output=True, text=True, timeout=120)
    if ran.returncode == 3:
        _missing('KaTeX is not installed')
    assert ran.returncode == 0, ran.stderr
    return json.loads(ran.stdout)


def assert_katex_accepts(fragments):
    errors = katex_errors(list(fragments))
    bad = [(f, e) for f, e in zip(fragments, errors) if e is not None]
    assert not bad, bad


def test_katex_rejects_broken_latex():
    # The validator itself must be able to fail.
    errors = katex_errors([r'\frac{a}{b}', r'\frac{a', r'\left( a', r'\begin{pmatrix} a'])
    assert errors[0] is None
    assert all(error is not None for error in errors[1:])


def _tricky_cases():
    a1, b1, c, theta, phi, lam, Omega, speed, omega_max = symbols(
        'a1 b1 c theta phi lambda Omega speed omega_max')
    nested = {0: 1 / (1 + a1 / (b1 + 1 / c)), 6: -sympy.Rational(3, 7) / (theta + 1)}
    greek = {0: sympy.cos(theta / 2), 4: -lam * sympy.sin(phi), 5: Omega ** 2,
             6: omega_max * sympy.exp(-speed), 7: sympy.sqrt(2) / 2}
    functions = {0: sympy.atan2(a1, b1), 1: sympy.Abs(c) - sympy.sqrt(a1 ** 2 + b1 ** 2),
                 2: sympy.Float('0.125') * c, 3: sympy.log(1 + c ** 2)}
    long_sum = product(multivector('M'), multivector('N'))
    turning = {0: sympy.cos(theta / 2), 6: -sympy.sin(theta / 2), 7: phi}
    rotation = product(rotor('R'), vector('x'), reverse(rotor('R')))
    return [
        ('nested fractions', nested, {}),
        ('greek and multi-letter names', greek, {}),
        ('functions', functions, {}),
        ('long sum', long_sum, {}),
        ('long sum, wedge blades', long_sum, {'options': {'wedge': True}}),
        ('long sum, named', long_sum, {'name': 'P'}),
        ('long sum, forced flat', long_sum, {'options': {'aligned': False}}),
        ('short, forced aligned', turning, {'options': {'aligned': True}, 'name': 'R'}),
        ('rotor wedge', turning, {'options': {'wedge': True}}),
        ('rotated vector', rotation, {}),
        ('bivector product', product(bivector('B'), vector('omega')), {}),
        ('pauli matrix', to_pauli(add(vector('a'), {0: theta})), {}),
        ('rotation matrix', case('rotation_matrix')[0], {'name': 'M'}),
        ('zero', {}, {}),
        ('constant', {0: sympy.Rational(-1, 2)}, {}),
        ('negative blade', {6: sympy.Integer(-1), 1: sympy.Integer(1)}, {}),
    ]


TRICKY = _tricky_cases()


def test_tricky_cases_render_in_katex():
    fragments = [emit('latex', value, **settings) for _, value, settings in TRICKY]
    assert_katex_accepts(fragments)


# Runs the CLI on one script (argv: fragments file, script) and records every LaTeX
# fragment the export package renders on the way.
RECORDER = '''
import json, sys
import gacalc.export.latex as latex
fragments = []
original = latex.render
def recording(*args, **kwargs):
    text = original(*args, **kwargs)
    fragments.append(text)
    return text
latex.render = recording
from gacalc.cli import main
out = sys.argv[1]
sys.argv = ["gacalc", sys.argv[2]]
try:
    main()
except SystemExit:
    pass
with open(out, "w") as stream:
    json.dump(fragments, stream)
'''


def test_example_fragments_render_in_katex(tmp_path):
    # Every LaTeX fragment the shipped example scripts emit, run through the real CLI.
    statement = re.compile(r'^\s*emit\s+latex\b', re.MULTILINE)
    scripts = sorted(p for p in EXAMPLES.glob('*.gac') if statement.search(p.read_text()))
    if not scripts:
        pytest.skip('no example script emits LaTeX yet')
    work = tmp_path / 'examples'
    shutil.copytree(EXAMPLES, work)
    recorded = tmp_path / 'fragments.json'
    runner = tmp_path / 'record.py'
    runner.write_text(RECORDER)
    fragments = []
    for script in scripts:
        ran = subprocess.run([sys.executable, str(runner), str(recorded),
                              str(work / script.name)],
                             cwd=work, capture_output=True, text=True, timeout=300,
                             env={**os.environ, 'PYTHONPATH': str(ROOT)})
        assert recorded.exists(), ran.stderr
        found = json.loads(recorded.read_text())
        assert found, f'{script.name} has emit latex but produced no LaTeX: {ran.stderr}'
        fragments.extend(found)
        recorded.unlink()
    assert_katex_accepts(fragments)


def test_vector_product_layout():
    value, _ = case('vector_product')
    text = emit('latex', value, options={'aligned': False})
    assert text == (r'a_{1} b_{1} + a_{2} b_{2} + a_{3} b_{3}'
                    r' + \left(a_{2} b_{3} - a_{3} b_{2}\right) \mathbf{e}_{23}'
                    r' - \left(a_{1} b_{3} - a_{3} b_{1}\right) \mathbf{e}_{31}'
                    r' + \left(a_{1} b_{2} - a_{2} b_{1}\right) \mathbf{e}_{12}')


def test_wedge_option_writes_basis_vectors():
    theta = symbols('theta')
    value = {0: sympy.cos(theta), 6: sympy.sin(theta), 7: sympy.Integer(2)}
    text = emit('latex', value, options={'wedge': True})
    assert r'\sin{\left(\theta \right)} \mathbf{e}_{1} \wedge \mathbf{e}_{2}' in text
    assert r'2 \mathbf{e}_{1} \wedge \mathbf{e}_{2} \wedge \mathbf{e}_{3}' in text
    assert r'\mathbf{e}_{12}' not in text


def test_long_results_are_aligned_grade_by_grade():
    text = emit('latex', product(multivector('M'), multivector('N')))
    lines = text.splitlines()
    assert lines[0] == r'\begin{aligned}' and lines[-1] == r'\end{aligned}'
    body = lines[1:-1]
    assert all(line.startswith('&') for line in body)
    # Basis order down the page: the scalar first, the pseudoscalar last.
    assert r'\mathbf{e}' not in body[0] and body[-1].endswith(r'\mathbf{e}_{123}')
    blades = [line.rsplit(r'\mathbf{e}_{', 1)[-1].rstrip(r'} \\') for line in body[1:]]
    assert blades == ['1', '2', '3', '23', '31', '12', '123']


def test_short_results_stay_on_one_line():
    value, _ = case('bivector_times_vector')
    assert r'\begin{aligned}' not in emit('latex', {6: symbols('theta')})
    assert '\n' not in latex_of({0: sympy.Integer(1), 1: symbols('theta')})


def test_matrices_are_pmatrix():
    text = emit('latex', to_pauli(vector('a')))
    assert text.startswith(r'\begin{pmatrix}') and text.endswith(r'\end{pmatrix}')
    assert r'a_{1} - i a_{2}' in text


def test_names_and_symbols_print_as_in_papers():
    speed, theta = symbols('speed theta')
    text = latex_of({0: speed * theta})
    assert r'\mathit{speed}' in text and r'\theta' in text
    assert emit('latex', {0: theta}, name='phi') == r'\phi = \theta'


def test_latex_of_matches_emit():
    for _, value, settings in TRICKY:
        if not settings:
            assert latex_of(value) == emit('latex', value)


def test_a_scalar_sum_keeps_its_signs():
    # reference: sympy's own LaTeX of the same scalar; pulling the minus of -t + |t| out
    # front without parentheses printed -t - |t|, another value
    import sympy

    from gacalc.algebra import Multivector
    from gacalc.export import latex_of

    t = sympy.Symbol("t", real=True)
    for scalar in (sympy.Abs(t) - t, -3 - t, t - sympy.Abs(t)):
        assert latex_of(Multivector({0: scalar})) == sympy.latex(scalar)

"""Golden files for a few emits (catch unintended formatting changes) and determinism.

To accept an intended change, regenerate with GACALC_UPDATE_GOLDEN=1 and review the diff.
"""

import difflib
import json
import os
import subprocess
import sys
from pathlib import Path

import pytest
import sympy

from gacalc.export import emit
from test_export_values import ROTOR_DECLARED, case, product, rotor_sandwich, symbols, vector

GOLDEN = Path(__file__).resolve().parent / 'golden'
ROOT = Path(__file__).resolve().parent.parent


def _turning_rotor():
    theta, phi = symbols('theta phi')
    return {0: sympy.cos(theta / 2), 6: -sympy.sin(theta / 2), 7: phi}


EMITS = {
    'latex_vector_product.tex': lambda: emit('latex', product(vector('a'), vector('b'))),
    'latex_turning_rotor_wedge.tex': lambda: emit('latex', _turning_rotor(), name='R',
                                                  options={'wedge': True}),
    'latex_rotation_matrix.tex': lambda: emit('latex', case('rotation_matrix')[0]),
    'python_rotor_kernel.py': lambda: emit('python', rotor_sandwich(),
                                           declared=ROTOR_DECLARED, name='rotate_point'),
    'numpy_spin_precession.py': lambda: emit('numpy', *case('spin_precession')[:1],
                                             declared=case('spin_precession')[1],
                                             name='precess'),
    'c_rotor_kernel.c': lambda: emit('c', rotor_sandwich(), declared=ROTOR_DECLARED,
                                     name='rotate_point'),
    'c_float_spin_precession.c': lambda: emit('c', case('spin_precession')[0],
                                              declared=case('spin_precession')[1],
                                              name='precess', options={'float': True}),
    'c_pauli_matrix.c': lambda: emit('c', case('pauli_matrix')[0],
                                     declared=case('pauli_matrix')[1], name='pauli_of'),
}


@pytest.mark.parametrize('file_name', sorted(EMITS))
def test_emit_matches_golden_file(file_name):
    text = EMITS[file_name]()
    if not text.endswith('\n'):
        text += '\n'   # LaTeX fragments carry no final newline; the files do.
    path = GOLDEN / file_name
    if os.environ.get('GACALC_UPDATE_GOLDEN'):
        path.parent.mkdir(exist_ok=True)
        path.write_text(text, encoding='utf-8')
    expected = path.read_text(encoding='utf-8')
    if text != expected:
        diff = ''.join(difflib.unified_diff(expected.splitlines(True), text.splitlines(True),
                                            'golden', 'emitted'))
        pytest.fail(f'{file_name} differs from its golden file:\n{diff}')


PROBE = r'''
import json, sys
sys.path.insert(0, sys.argv[1])
from test_export_values import CASES, case
from gacalc.export import emit
texts = {}
for name in sorted(CASES):
    value, declared = case(name)
    for target in ('latex', 'python', 'numpy', 'c'):
        texts[f'{name} {target}'] = emit(target, value, declared=declared)
print(json.dumps(texts))
'''


def test_output_is_byte_identical_across_runs():
    # Different hash seeds reorder every set and dict of symbols: output must not move.
    outputs = []
    for seed in ('1', '2'):
        ran = subprocess.run([sys.executable, '-c', PROBE, str(Path(__file__).parent)],
                             capture_output=True, text=True, timeout=300,
                             env={**os.environ, 'PYTHONHASHSEED': seed,
                                  'PYTHONPATH': str(ROOT)})
        assert ran.returncode == 0, ran.stderr
        outputs.append(json.loads(ran.stdout))
    for key in outputs[0]:
        assert outputs[0][key] == outputs[1][key], key

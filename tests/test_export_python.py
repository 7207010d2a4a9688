"""Emitted Python and NumPy modules, run by a real interpreter in a subprocess.

Each module is written to a temporary file, imported by a small driver in a fresh
`python` process and called at random inputs; the results must agree with sympy's own
evaluation of the symbolic value (30 digits) to 1e-12 relative.
"""

import builtins
import json
import keyword
import random
import subprocess
import sys

import pytest
import sympy

from gacalc.export import ExportError, emit
from test_export_values import CASES, agree, case, layout, reference, sample

DRIVER = r'''
import importlib.util, json, sys
spec = importlib.util.spec_from_file_location('emitted', sys.argv[1])
module = importlib.util.module_from_spec(spec)
spec.loader.exec_module(module)
function = getattr(module, sys.argv[2])
use_numpy = sys.argv[3] == 'numpy'
if use_numpy:
    import numpy

def flat(result):
    if use_numpy and hasattr(result, 'shape') and len(getattr(result, 'shape', ())) >= 2 \
            and not isinstance(result, tuple):
        rows, cols = result.shape[:2]
        result = [result[r][c] for r in range(rows) for c in range(cols)]
    items = []
    for item in result:
        if isinstance(item, tuple):
            items.extend(item)
        else:
            items.append(item)
    return items

def plain(number):
    if use_numpy:
        return [[complex(z).real, complex(z).imag] for z in numpy.ravel(number)]
    z = complex(number)
    return [z.real, z.imag]

calls = json.load(sys.stdin)
if use_numpy:
    calls = {k: numpy.array(v) for k, v in calls.items()}
    print(json.dumps([plain(item) for item in flat(function(**calls))]))
else:
    print(json.dumps([[plain(item) for item in flat(function(**call))] for call in calls]))
'''


def python_name(name):
    # The documented renaming: a name Python reserves gets a trailing underscore.
    reserved = set(keyword.kwlist) | set(keyword.softkwlist) | set(dir(builtins)) | {
        'math', 'numpy', 'components'}
    return name + '_' if name in reserved else name


def keyword_arguments(value, declared, values):
    arguments = {}
    for name, symbols in layout(value, declared):
        if len(symbols) > 1:
            arguments[python_name(name)] = [values.get(s, 0.0) for s in symbols]
        else:
            arguments[python_name(name)] = values[symbols[0]]
    return arguments


def run_module(tmp_path, text, function_name, calls, flavour):
    module = tmp_path / f'emitted_{flavour}.py'
    module.write_text(text, encoding='utf-8')
    driver = tmp_path / 'driver.py'
    driver.write_text(DRIVER, encoding='utf-8')
    completed = subprocess.run(
        [sys.executable, str(driver), str(module), function_name, flavour],
        input=json.dumps(calls), capture_output=True, text=True, timeout=120)
    assert completed.returncode == 0, completed.stderr
    return json.loads(completed.stdout)


@pytest.mark.parametrize('name', sorted(CASES))
def test_python_module_agrees_with_sympy(tmp_path, name):
    value, declared = case(name)
    text = emit('python', value, declared=declared, name='evaluate')
    rng = random.Random(name)
    samples = [sample(value, declared, rng) for _ in range(12)]
    calls = [keyword_arguments(value, declared, values) for values in samples]
    results = run_module(tmp_path, text, 'evaluate', calls, 'python')
    for values, got in zip(samples, results):
        expected = reference(value, values)
        assert agree([complex(*pair) for pair in got], expected), (values, got, expected)


@pytest.mark.parametrize('name', sorted(CASES))
def test_numpy_module_works_elementwise(tmp_path, name):
    value, declared = case(name)
    text = emit('numpy', value, declared=declared, name='evaluate')
    rng = random.Random('numpy ' + name)
    samples = [sample(value, declared, rng) for _ in range(25)]
    per_sample = [keyword_arguments(value, declared, values) for values in samples]
    # One call on arrays: a sequence argument of shape (k, 25), a scalar of shape (25,).
    batched = {}
    for key in per_sample[0] if per_sample else ():
        columns = [arguments[key] for arguments in per_sample]
        batched[key] = (list(map(list, zip(*columns))) if isinstance(columns[0], list)
                        else columns)
    results = run_module(tmp_path, text, 'evaluate', batched, 'numpy')
    if not batched:  # a constant: every component comes back as a 0-d array
        samples = samples[:1]
    for position, values in enumerate(samples):
        expected = reference(value, values)
        got = [complex(*component[position]) for component in results]
        if batched:
            assert all(len(component) == len(samples) for component in results)
        assert agree(got, expected), (values, got, expected)


def test_docstring_names_components_in_basis_order():
    value, declared = case('vector_product')
    text = emit('python', value, declared=declared)
    assert 'def gacalc_value(a, b):' in text
    assert 'Returns the non-zero components (1, e23, e31, e12)' in text
    assert '1, e1, e2, e3, e23, e31, e12, e123' in text


def test_vector_arguments_are_sequences_and_scalars_follow_sorted():
    value, declared = case('spin_precession')
    text = emit('python', value, declared=declared)
    # s declared; lambda (a Python keyword, renamed), omega, t are free scalars by name.
    assert 'def gacalc_value(s, lambda_, omega, t):' in text
    assert 's[0]' in text and 's1' not in text.split('"""')[-1]
    assert 'import math' in text


def test_shared_subexpressions_become_numbered_temporaries():
    value, declared = case('rotation_matrix')
    text = emit('python', value, declared=declared)
    assert '    tmp0 = ' in text
    # Temporaries are numbered in order of definition, each defined once.
    defined = [line.split('=')[0].strip() for line in text.splitlines()
               if line.startswith('    tmp')]
    assert defined == [f'tmp{i}' for i in range(len(defined))]


def test_rotor_kernel_notes_the_unit_assumption():
    value, declared = case('rotor_sandwich')
    text = emit('python', value, declared=declared)
    assert 'R R~ = 1' in text
    value, declared = case('even_not_unit')
    assert 'R~ = 1' not in emit('python', value, declared=declared)


def test_zero_value_returns_empty_tuple():
    assert 'return ()' in emit('python', {})


def test_bad_function_name_is_refused():
    for bad in ('2fast', 'lambda', 'a-b', ''):
        with pytest.raises(ExportError):
            emit('python', {1: sympy.Symbol('t')}, name=bad)


def test_temporaries_avoid_user_names():
    # A scalar named tmp0 must not be overwritten by a temporary.
    tmp0, y = sympy.symbols('tmp0 y', real=True)
    value = {0: (tmp0 + y) ** 2 + sympy.sin(tmp0 + y), 1: sympy.cos(tmp0 + y)}
    text = emit('python', value)
    assert 'tmp0 = ' not in text
    assert 'tmp1 = tmp0 + y' in text

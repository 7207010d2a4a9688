"""Emitted C99, compiled by gcc with -std=c99 -Wall -Wextra -Werror -O2 and run.

A small driver is generated from the argument layout the emitter promises (declared
sequences in name order, then free scalars in name order, then out); it reads random
inputs on stdin and prints the outputs, which must agree with sympy's evaluation of the
symbolic value: 1e-12 relative in double, 1e-5 in float.
"""

import os
import random
import shutil
import subprocess

import pytest
import sympy

from gacalc.export import ExportError, emit, operation_counts, rotor_kernel_counts
from test_export_values import (CASES, ROTOR_DECLARED, agree, case, expressions_of, layout,
                                product, reference, reverse, rotor, rotor_sandwich, sample,
                                vector)

GCC_FLAGS = ['-std=c99', '-Wall', '-Wextra', '-Werror', '-O2']


def gcc():
    found = shutil.which('gcc')
    if found:
        return found
    if os.environ.get('CI'):
        pytest.fail('gcc is missing: the C output cannot be checked (install gcc in CI)')
    pytest.skip('gcc is not installed')


def output_count(value):
    expressions = expressions_of(value)
    if isinstance(value, sympy.MatrixBase) and any(sympy.im(e) != 0 for e in expressions):
        return 2 * len(expressions)   # real, imaginary part of each entry
    return len(expressions)


def driver_source(value, declared, c_type):
    arguments = layout(value, declared)
    parameters, declarations, reads, passed = [], [], [], []
    scan = '%f' if c_type == 'float' else '%lf'
    for name, symbols in arguments:
        local = f'in_{name}'
        if len(symbols) > 1:
            parameters.append(f'const {c_type} *')
            declarations.append(f'    {c_type} {local}[{len(symbols)}];')
            for i in range(len(symbols)):
                reads.append(f'        if (scanf("{scan}", &{local}[{i}]) != 1) return 1;')
        else:
            parameters.append(c_type)
            declarations.append(f'    {c_type} {local};')
            reads.append(f'        if (scanf("{scan}", &{local}) != 1) return 1;')
        passed.append(local)
    count = output_count(value)
    parameters.append(f'{c_type} *')
    passed.append('out')
    return '\n'.join([
        '#include <stdio.h>',
        f"void evaluate({', '.join(parameters)});",
        'int main(void)',
        '{',
        *declarations,
        f'    {c_type} out[{max(count, 1)}];',
        '    int samples, s, k;',
        '    if (scanf("%d", &samples) != 1) return 1;',
        '    for (s = 0; s < samples; ++s) {',
        *reads,
        f"        evaluate({', '.join(passed)});",
        f'        for (k = 0; k < {count}; ++k) printf("%.17g ", (double)out[k]);',
        '        printf("\\n");',
        '    }',
        '    return 0;',
        '}',
        '',
    ])


def compile_and_run(tmp_path, value, declared, single, samples):
    c_type = 'float' if single else 'double'
    options = {'float': True} if single else None
    source = tmp_path / 'emitted.c'
    source.write_text(emit('c', value, declared=declared, name='evaluate', options=options))
    driver = tmp_path / 'driver.c'
    driver.write_text(driver_source(value, declared, c_type))
    program = tmp_path / 'program'
    built = subprocess.run([gcc(), *GCC_FLAGS, str(source), str(driver), '-o', str(program),
                            '-lm'], capture_output=True, text=True, timeout=120)
    assert built.returncode == 0, built.stderr + source.read_text()
    numbers = [str(len(samples))]
    for values in samples:
        for _, symbols in layout(value, declared):
            numbers.extend(repr(values.get(symbol, 0.0)) for symbol in symbols)
    ran = subprocess.run([str(program)], input=' '.join(numbers), capture_output=True,
                         text=True, timeout=60)
    assert ran.returncode == 0, ran.stderr
    return [[float(word) for word in line.split()] for line in ran.stdout.splitlines()]


def as_complex(value, flat):
    if isinstance(value, sympy.MatrixBase) and output_count(value) == 2 * len(list(value)):
        return [complex(flat[2 * i], flat[2 * i + 1]) for i in range(len(flat) // 2)]
    return [complex(number) for number in flat]


@pytest.mark.parametrize('single', [False, True], ids=['double', 'float'])
@pytest.mark.parametrize('name', sorted(CASES))
def test_c_function_agrees_with_sympy(tmp_path, name, single):
    value, declared = case(name)
    rng = random.Random(f'c {name} {single}')
    samples = [sample(value, declared, rng) for _ in range(10)]
    results = compile_and_run(tmp_path, value, declared, single, samples)
    assert len(results) == len(samples)
    for values, flat in zip(samples, results):
        expected = reference(value, values)
        got = as_complex(value, flat)
        assert agree(got, expected, 1e-5 if single else 1e-12), (values, got, expected)


def test_c_header_states_inputs_layout_and_basis_order():
    value, declared = case('rotor_sandwich')
    text = emit('c', value, declared=declared, name='rotate_point')
    assert 'void rotate_point(const double *R, const double *x, double *out)' in text
    assert 'R[4]: rotor R = (R0, R23, R31, R12)' in text
    assert 'out[3] = (e1, e2, e3)' in text
    assert '1, e1, e2, e3, e23, e31, e12, e123' in text
    assert 'R R~ = 1' in text
    includes = [line for line in text.splitlines() if line.startswith('#include')]
    assert includes == ['#include <math.h>']
    assert '    const double tmp0 = ' in text


def test_float_option_uses_float_functions():
    value, declared = case('spin_precession')
    text = emit('c', value, declared=declared, options={'float': True})
    assert 'const float *s' in text and 'float *out' in text
    assert 'sinf(' in text and 'double' not in text


def test_constants_are_c99_not_posix_macros():
    # M_PI is POSIX, not C99: with -std=c99 it is undefined, so pi must be a literal.
    text = emit('c', {0: sympy.pi * sympy.Symbol('t', real=True) + sympy.E})
    assert 'M_PI' not in text and 'M_E' not in text
    assert '3.14159265358979' in text


def test_unsupported_function_is_a_one_line_error():
    t = sympy.Symbol('t', real=True)
    with pytest.raises(ExportError) as raised:
        emit('c', {0: sympy.Function('wobble')(t)})
    assert '\n' not in str(raised.value) and 'wobble' in str(raised.value)


# --- the rotor-applied-to-vector kernel -----------------------------------------------

def test_rotor_kernel_costs_no_more_than_the_quaternion_formula():
    # Optimised quaternion-vector rotation t = 2 q x v, v' = v + w t + q x t: 15
    # multiplications and 15 additions (a fact of the trade, from memory).
    counts = rotor_kernel_counts()
    emitted = counts['emitted']
    assert emitted.get('MUL', 0) <= 15
    assert emitted.get('ADD', 0) + emitted.get('SUB', 0) <= 15
    assert emitted.get('POW', 0) == 0
    assert counts['cse'].get('MUL', 0) > emitted['MUL']


def test_rotor_kernel_found_in_independently_built_sandwiches():
    # Values built through the Pauli matrices, not the emitter's own formula.
    x, r = vector('x'), rotor('R')
    forms = [rotor_sandwich(),
             product(reverse(r), x, r),
             {i: 3 * c for i, c in product(r, x, reverse(r)).items()}]
    counts = [operation_counts(value, ROTOR_DECLARED) for value in forms]
    assert counts[0]['MUL'] <= 15 and counts[1]['MUL'] <= 15
    # Three times a rotation is not a rotation: no kernel, so no unit assumption.
    assert counts[2]['MUL'] > 15
    assert 'R R~ = 1' not in emit('c', forms[2], declared=ROTOR_DECLARED)


def test_rotor_kernel_matches_scipy_rotation(tmp_path):
    # Reference: scipy's Rotation.from_quat (scalar-last x, y, z, w) with DESIGN.md's
    # quaternion mapping w = R0, (x, y, z) = -(R23, R31, R12).
    rotation = pytest.importorskip('scipy.spatial.transform').Rotation
    rng = random.Random(7)
    value, declared = rotor_sandwich(), ROTOR_DECLARED
    samples = [sample(value, declared, rng) for _ in range(20)]
    results = compile_and_run(tmp_path, value, declared, False, samples)
    R0, R23, R31, R12 = rotor('R').values()
    x1, x2, x3 = vector('x').values()
    for values, got in zip(samples, results):
        quat = [-values[R23], -values[R31], -values[R12], values[R0]]
        expected = rotation.from_quat(quat).apply([values[x1], values[x2], values[x3]])
        assert agree(got, list(expected)), (got, expected)

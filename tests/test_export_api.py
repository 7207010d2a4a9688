"""The emit API as the language calls it: inputs accepted, errors, the core's values."""

from fractions import Fraction
import re
from pathlib import Path

import pytest

from gacalc.export import (ExportError, emit, latex_of, operation_counts,
                           rotor_kernel_counts)
from test_export_values import ROTOR_DECLARED, rotor_sandwich, symbols, vector

PACKAGE = Path(__file__).resolve().parent.parent / 'gacalc' / 'export'


def test_basis_names_and_indices_are_the_same_keys():
    t = symbols('t')
    assert emit('c', {'e12': t, '1': 2}) == emit('c', {6: t, 0: 2})


def test_exact_python_numbers_are_accepted_and_zeros_dropped():
    text = emit('python', {0: Fraction(1, 3), 1: 0, 6: 2})
    assert 'return (\n        1/3,\n        2,\n    )' in text
    assert '(1, e12)' in text


def test_a_lone_scalar_is_a_scalar_value():
    t = symbols('t')
    assert emit('latex', t ** 2) == 't^{2}'


def test_strings_are_never_parsed():
    with pytest.raises(ExportError):
        emit('python', {0: 'a + b'})


@pytest.mark.parametrize('call', [
    lambda: emit('fortran', {0: 1}),
    lambda: emit('c', {0: 1}, options={'colour': True}),
    lambda: emit('c', {9: 1}),
    lambda: emit('c', {1: symbols('a1')}, declared={'a': 'spinor'}),
    lambda: emit('c', {0: 1}, name='int'),
    lambda: emit('latex', {0: 1}, options={'aligned': 'yes'}),
])
def test_bad_requests_are_one_line_errors(call):
    with pytest.raises(ExportError) as raised:
        call()
    assert '\n' not in str(raised.value)


def test_c_keyword_scalars_are_renamed():
    double, y = symbols('double y')
    text = emit('c', {0: double * y})
    assert 'void gacalc_value(double double_, double y, double *out)' in text


def test_undeclared_components_are_scalars():
    # Without the declaration, a1 a2 a3 are three scalar arguments in name order.
    text = emit('python', vector('a'))
    assert 'def gacalc_value(a1, a2, a3):' in text


def test_operation_counts_report():
    counts = rotor_kernel_counts()
    assert set(counts) == {'expanded', 'cse', 'cse_grouped', 'emitted', 'trade_reference'}
    assert operation_counts(rotor_sandwich(), ROTOR_DECLARED) == counts['emitted']
    assert counts['expanded']['MUL'] > counts['cse']['MUL'] > counts['emitted']['MUL']


def test_no_string_evaluation_in_export_source():
    # DESIGN.md: no user text reaches eval/exec/sympify/parse_expr anywhere in gacalc.
    # (re.compile is fine: a method call, hence the look-behind for a dot.)
    forbidden = re.compile(r'(?<![\w.])(sympify|eval|exec|compile)\(|parse_expr')
    for path in PACKAGE.glob('*.py'):
        assert not forbidden.search(path.read_text()), path.name


def test_multivectors_of_the_core_export_like_their_dicts():
    algebra = pytest.importorskip('gacalc.algebra')
    R, _ = algebra.symbolic('rotor', 'R')
    x, _ = algebra.symbolic('vector', 'x')
    a, _ = algebra.symbolic('vector', 'a')
    for value in (R * x * R.rev(), a * x + 3 * algebra.e12, R.rev() * x * R + a):
        declared = {'R': 'rotor', 'x': 'vector', 'a': 'vector'}
        for target in ('latex', 'python', 'numpy', 'c'):
            assert emit(target, value, declared=declared) == \
                emit(target, value.to_expr_dict(), declared=declared)
    # The core's own R x R~ goes through the rotor kernel.
    assert operation_counts(R * x * R.rev(), ROTOR_DECLARED)['MUL'] <= 15
    assert latex_of(algebra.e12) == r'\mathbf{e}_{12}'

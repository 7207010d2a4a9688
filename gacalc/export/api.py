"""The export API (gacalc.export re-exports it): LaTeX, Python/NumPy and C99.

    emit(target, value, *, name=None, declared=None, options=None) -> str
    latex_of(value) -> str
    write_atomically(path, text)
    operation_counts(value, declared=None) -> {'MUL': n, 'ADD': n, ...}
    rotor_kernel_counts() -> the rotor-applied-to-vector figures for the benchmark

value is a Multivector (anything with to_expr_dict()), a dict {basis index or name:
coefficient}, a sympy Matrix or a lone scalar. declared maps names of declared symbolic
values to their kind ('scalar', 'vector', 'bivector', 'trivector', 'rotor', 'even',
'multivector'): their components become one sequence argument (vector a: a1 a2 a3 ->
a[0] a[1] a[2]; rotor R: R0 R23 R31 R12 -> R[0..3]); other free symbols become scalar
arguments in name order. A declared rotor is taken as unit (R R~ = 1), an 'even' one not.
"""

import sympy

from gacalc.algebra.context import install_latex

from . import c as _c
from . import latex as _latex
from .common import DEFAULT_NAME, ExportError, read_options, read_value
from .files import write_atomically
from . import rotor_kernel as _rotor_kernel
from .targets import TARGETS

__all__ = ['emit', 'latex_of', 'write_atomically', 'operation_counts',
           'rotor_kernel_counts', 'ExportError', 'TARGETS', 'DEFAULT_NAME']


def emit(target_name, value, *, name=None, declared=None, options=None):
    """The text of value for a target of gacalc.export.targets ('latex', 'python',
    'numpy', 'c', ...).

    options: {'float': True} for C in float, {'wedge': True} for LaTeX blades as wedge
    products of basis vectors, {'aligned': True/False/None} for LaTeX's multi-line form
    (None: automatic). Options that do not concern the target are ignored.
    Raises ExportError with a one-line message for anything it cannot write.
    """
    options = read_options(options)
    data = read_value(value)
    chosen = TARGETS.get(target_name)
    if chosen is None:
        raise ExportError(f"unknown export target {target_name!r} "
                          f"(known: {', '.join(TARGETS)})")
    return chosen(data, name=name, declared=declared, options=options)


def latex_of(value, options=None):
    """A single LaTeX fragment (math-mode body, no delimiters), e.g. for _repr_latex_."""
    return _latex.render(read_value(value), options=read_options(options))


# Notebooks show multivectors through this printer (Multivector._repr_latex_ asks the hook).
install_latex(latex_of)


def operation_counts(value, declared=None):
    """sympy.count_ops of the C code emit('c', value, declared=declared) writes."""
    return _c.operation_counts(read_value(value), declared)


def rotor_kernel_counts():
    """Operation counts (sympy.count_ops) for R x R~ with a symbolic rotor R0 R23 R31 R12
    and vector x1 x2 x3, for the benchmark.

    'expanded': the components written out as polynomials, nothing shared;
    'cse': the C code for them with sympy.cse alone (R and x not declared);
    'cse_grouped': the same with x declared, so grouped by x1 x2 x3 (a rotation matrix);
    'emitted': the C code for a declared rotor R and vector x (the rotor kernel);
    'trade_reference': the optimised quaternion-vector rotation, 15 multiplications
    and 15 additions (a fact of the trade).
    """
    rotor = _rotor_kernel.rotor_symbols('R')
    vector = _rotor_kernel.vector_symbols('x')
    components = _rotor_kernel.sandwich_components(rotor, vector)
    value = dict(zip((1, 2, 3), components))
    expanded = sympy.Integer(0)
    for expr in components:
        expanded += sympy.count_ops(expr, visual=True)
    return {
        'expanded': _counts_of(expanded),
        'cse': operation_counts(value, {}),
        'cse_grouped': operation_counts(value, {'x': 'vector'}),
        'emitted': operation_counts(value, {'R': 'rotor', 'x': 'vector'}),
        'trade_reference': {'ADD': 15, 'MUL': 15},
    }


def _counts_of(visual):
    return dict(sorted((str(term), int(coefficient))
                       for term, coefficient in visual.as_coefficients_dict().items()
                       if term.is_Symbol))

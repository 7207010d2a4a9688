"""Export of gacalc values: LaTeX for papers, Python/NumPy and C99 for programs.

    emit(target, value, *, name=None, declared=None, options=None) -> str
    latex_of(value) -> str
    write_atomically(path, text)
    operation_counts(value, declared=None) -> {'MUL': n, 'ADD': n, ...}
    rotor_kernel_counts() -> the rotor-applied-to-vector figures for the benchmark

The targets (name, file suffix, emitter, help line) are one table,
gacalc.export.targets, which the token table, the parser, the session and help read;
importing that table is cheap, so this package loads its emitters (and sympy) on first
use of the API (gacalc.export.api).
"""

_API = ('emit', 'latex_of', 'write_atomically', 'operation_counts', 'rotor_kernel_counts',
        'ExportError', 'TARGETS', 'DEFAULT_NAME')

__all__ = list(_API)


def __getattr__(name):
    if name not in _API:
        raise AttributeError(f"module 'gacalc.export' has no attribute {name!r}")
    from . import api

    return getattr(api, name)

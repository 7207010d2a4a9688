"""What every emitter shares: the error type, the value read into plain sympy data,
and the layout of the generated function's arguments.

The emitters accept a Multivector (anything with ``to_expr_dict()``), a plain dict
{basis index or name: coefficient}, a sympy Matrix, or a lone scalar.
"""

from dataclasses import dataclass
from fractions import Fraction
import keyword
import re

import sympy
from sympy.printing.codeprinter import PrintMethodNotImplementedError

from gacalc.algebra.basis import BASIS_NAMES
from gacalc.algebra.symbolic import KIND_COMPONENTS

BASIS_ORDER_TEXT = ', '.join(BASIS_NAMES)

# Component names of each declared kind, in the order they are passed as a sequence
# (the core's table of declared kinds, gacalc.algebra.symbolic).
KIND_SUFFIXES = {kind: suffixes for kind, (_, suffixes) in KIND_COMPONENTS.items()
                 if kind != 'scalar'}
KIND_BASIS = {kind: tuple(BASIS_NAMES[index] for index in indices)
              for kind, (indices, _) in KIND_COMPONENTS.items() if kind != 'scalar'}
# a declared 3x3 matrix (matrix3 M) is passed as its nine entries, row by row
KIND_SUFFIXES['matrix3'] = tuple(f'{i}{j}' for i in (1, 2, 3) for j in (1, 2, 3))
KIND_BASIS['matrix3'] = ('row by row',)
KINDS = tuple(KIND_SUFFIXES) + ('scalar',)

DEFAULT_NAME = 'gacalc_value'
_OPTION_NAMES = {'float', 'wedge', 'aligned', 'formula'}  # formula: gacalc.formulas.Formula
_IDENTIFIER = re.compile(r'[A-Za-z][A-Za-z0-9_]*\Z')


class ExportError(ValueError):
    """A value or request the emitters cannot turn into text; the message is one line."""


def as_expr(coefficient):
    """A coefficient as a sympy object, built without any string parsing."""
    if isinstance(coefficient, sympy.Basic):
        return coefficient
    if isinstance(coefficient, bool):
        raise ExportError('a coefficient cannot be a truth value')
    if isinstance(coefficient, int):
        return sympy.Integer(coefficient)
    if isinstance(coefficient, Fraction):
        return sympy.Rational(coefficient.numerator, coefficient.denominator)
    if isinstance(coefficient, float):
        return sympy.Float(coefficient)
    raise ExportError(f'cannot export a coefficient of type {type(coefficient).__name__}')


def _basis_index(key):
    if isinstance(key, int) and not isinstance(key, bool) and 0 <= key < len(BASIS_NAMES):
        return key
    if isinstance(key, str) and key in BASIS_NAMES:
        return BASIS_NAMES.index(key)
    raise ExportError(f'{key!r} is not a basis blade of Cl(3,0)')


@dataclass(frozen=True)
class Value:
    """A value ready for printing: either multivector components or a matrix.

    ``components`` holds the non-zero (index, Expr) pairs in basis order; ``matrix``
    is an immutable sympy matrix, or None for a multivector.
    """
    components: tuple = ()
    matrix: object = None

    @property
    def is_matrix(self):
        return self.matrix is not None

    def expressions(self):
        """Every expression the value consists of, in output order."""
        if self.is_matrix:
            return list(self.matrix)
        return [expr for _, expr in self.components]

    def vector_slots(self):
        """Output positions of the e1, e2, e3 components (None where zero, or for a
        matrix), so that the code emitters can look for rotated vectors."""
        if self.is_matrix:
            return None
        positions = {index: position for position, (index, _) in enumerate(self.components)}
        return [positions.get(index) for index in (1, 2, 3)]

    @property
    def free_symbols(self):
        found = set()
        for expr in self.expressions():
            found |= expr.free_symbols
        return found


def read_value(value):
    """Turn any accepted value into a Value; zero components are dropped."""
    if isinstance(value, Value):
        return value
    if isinstance(value, sympy.MatrixBase):
        if value.shape[0] == 0 or value.shape[1] == 0:
            raise ExportError('cannot export an empty matrix')
        return Value(matrix=sympy.ImmutableMatrix(value.applyfunc(as_expr)))
    if hasattr(value, 'to_expr_dict'):
        mapping = value.to_expr_dict()
    elif isinstance(value, dict):
        mapping = value
    else:
        mapping = {0: value}
    by_index = {}
    for key, coefficient in mapping.items():
        index = _basis_index(key)
        expr = as_expr(coefficient)
        if index in by_index:
            expr = by_index[index] + expr
        by_index[index] = expr
    return Value(components=tuple((index, by_index[index]) for index in sorted(by_index)
                                  if by_index[index] != 0))


def read_options(options):
    options = dict(options or {})
    unknown = sorted(set(options) - _OPTION_NAMES)
    if unknown:
        raise ExportError(f"unknown export option {unknown[0]!r} "
                          f"(known: {', '.join(sorted(_OPTION_NAMES))})")
    if options.get('aligned') not in (True, False, None):
        raise ExportError("option 'aligned' takes true, false or nothing (automatic)")
    return options


def check_function_name(name, reserved):
    if name is None:
        return DEFAULT_NAME
    if not isinstance(name, str) or not _IDENTIFIER.match(name) or name in reserved:
        raise ExportError(f'{name!r} cannot name a generated function: use letters, '
                          f'digits and underscores, starting with a letter, and no keyword')
    return name


@dataclass(frozen=True)
class Argument:
    """One argument of a generated function.

    kind is 'scalar' or a declared kind; symbols are the sympy Symbols it carries, in
    sequence order (a single symbol for a scalar). ``name`` is the source name and
    ``code_name`` the identifier used in code (renamed when it clashes with a keyword).
    """
    name: str
    kind: str
    symbols: tuple
    code_name: str

    @property
    def is_sequence(self):
        return self.kind != 'scalar'

    def describe(self):
        """Text for a header comment or docstring."""
        if not self.is_sequence:
            return (f"{self.code_name}: scalar" if self.code_name == self.name
                    else f"{self.code_name}: scalar {self.name}")
        parts = ', '.join(symbol.name for symbol in self.symbols)
        basis = ', '.join(KIND_BASIS[self.kind])
        where = f'on ({basis})' if self.kind in KIND_COMPONENTS else basis
        return (f'{self.code_name}[{len(self.symbols)}]: {self.kind} {self.name} = '
                f'({parts}) {where}')


def _free_code_name(name, taken):
    candidate = name
    while candidate in taken:
        candidate += '_'
    return candidate


def layout_arguments(free_symbols, declared, reserved):
    """The arguments of the generated function for the given free symbols.

    Declared values whose components occur become one sequence argument each (in name
    order); every other free symbol is a scalar argument (in name order after them).
    """
    declared = dict(declared or {})
    by_name = {symbol.name: symbol for symbol in free_symbols}
    if len(by_name) != len(free_symbols):
        raise ExportError('two different symbols share the name '
                          + _shared_name(free_symbols))
    sequences, used = [], set()
    for name in sorted(declared):
        kind = declared[name]
        if kind not in KINDS:
            raise ExportError(f'unknown kind {kind!r} declared for {name}')
        if kind == 'scalar':
            continue
        names = [name + suffix for suffix in KIND_SUFFIXES[kind]]
        if not any(component in by_name for component in names):
            continue
        symbols = tuple(by_name.get(component) or sympy.Symbol(component, real=True)
                        for component in names)
        sequences.append((name, kind, symbols))
        used.update(names)
    scalars = [(name, 'scalar', (by_name[name],)) for name in sorted(by_name)
               if name not in used]
    taken = set(reserved)
    arguments = []
    for name, kind, symbols in sequences + scalars:
        code_name = _free_code_name(name, taken)
        taken.add(code_name)
        arguments.append(Argument(name, kind, symbols, code_name))
    return arguments


def _shared_name(symbols):
    seen = set()
    for symbol in sorted(symbols, key=lambda s: s.name):
        if symbol.name in seen:
            return symbol.name
        seen.add(symbol.name)
    return '?'


def symbol_texts(arguments, index_text):
    """{Symbol: code text} for every argument symbol; index_text(name, i) -> 'a[0]'."""
    texts = {}
    for argument in arguments:
        if argument.is_sequence:
            for position, symbol in enumerate(argument.symbols):
                texts[symbol] = index_text(argument.code_name, position)
        else:
            texts[argument.symbols[0]] = argument.code_name
    return texts


def python_reserved():
    return set(keyword.kwlist) | set(getattr(keyword, 'softkwlist', ())) | {
        'math', 'numpy', 'cmath', 'None', 'True', 'False'}


def output_labels(value):
    """Names of the outputs in order: basis names, or matrix entry positions."""
    if value.is_matrix:
        rows, cols = value.matrix.shape
        return [f'[{r}][{c}]' for r in range(rows) for c in range(cols)]
    return [BASIS_NAMES[index] for index, _ in value.components]


def print_or_refuse(printer, expr, language):
    """printer.doprint(expr), or an ExportError naming what language cannot express."""
    try:
        return printer.doprint(expr)
    except PrintMethodNotImplementedError as error:
        what = str(error).splitlines()[0].rsplit(': ', 1)[-1]
        raise ExportError(f'cannot write this value in {language}: {what} has no '
                          f'{language} counterpart') from None

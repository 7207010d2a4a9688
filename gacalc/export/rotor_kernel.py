"""Recognise rotor sandwiches R x R~ in a vector result and emit the cheap kernel.

Written out, R x R~ for a rotor R = R0 + R23 e23 + R31 e31 + R12 e12 and a vector x is a
quadratic form in the rotor components (the Euler-Rodrigues matrix applied to x), about
24 multiplications even after common-subexpression elimination. For a unit rotor the same
vector is, with b = (R23, R31, R12),

    u = x × b,   w = R0 u + u × b,   R x R~ = x + w + w,

which costs 15 multiplications and 15 additions: the optimised quaternion-vector rotation
of the trade (t = 2 q×v; v' = v + w t + q×t), here with q = -b (DESIGN.md quaternion
convention) and the factor 2 moved to the end as an addition.

The recogniser does not trust patterns: a candidate (rotor, vector, orientation) is
accepted only when the vector part minus the candidate sandwich reduces to an expression
free of the vector's components modulo the unit condition R0² + R23² + R31² + R12² = 1.
"""

from dataclasses import dataclass

import sympy

from .common import KIND_SUFFIXES


def _dot(a, b):
    return a[0] * b[0] + a[1] * b[1] + a[2] * b[2]


def _cross(a, b):
    return (a[1] * b[2] - a[2] * b[1],
            a[2] * b[0] - a[0] * b[2],
            a[0] * b[1] - a[1] * b[0])


def sandwich_components(rotor, vector, orientation=1):
    """The e1, e2, e3 components of R x R~ (orientation 1) or R~ x R (orientation -1).

    rotor = (R0, R23, R31, R12), vector = (x1, x2, x3), any sympy expressions; no unit
    condition is assumed. This is the quaternion rotation formula
    q v q* = (w² - |u|²) v + 2 (u·v) u + 2 w (u × v) (a standard identity of the trade)
    with w = R0 and u = -orientation·(R23, R31, R12).
    """
    r0 = rotor[0]
    b = tuple(orientation * component for component in rotor[1:])
    scale = r0 ** 2 - _dot(b, b)
    along = 2 * _dot(b, vector)
    turn = _cross(vector, b)
    return tuple(sympy.expand(scale * vector[i] + along * b[i] + 2 * r0 * turn[i])
                 for i in range(3))


def unit_rotor_condition(rotor):
    return sum(component ** 2 for component in rotor) - 1


def reduce_by_unit_rotor(expr, rotor):
    """expr with R0² replaced through the unit condition (remainder in R0), or None
    when expr is not a rational function of R0 that the division understands."""
    numerator, denominator = sympy.fraction(sympy.together(expr))
    condition = unit_rotor_condition(rotor)
    try:
        numerator = sympy.rem(sympy.expand(numerator), condition, rotor[0])
        denominator = sympy.rem(sympy.expand(denominator), condition, rotor[0])
    except (sympy.PolynomialError, sympy.GeneratorsNeeded, sympy.CoercionFailed):
        return None
    numerator = sympy.expand(numerator)
    if numerator == 0:
        return sympy.Integer(0)
    return sympy.cancel(numerator / denominator)


@dataclass(frozen=True)
class Sandwich:
    """One recognised R x R~ (orientation 1) or R~ x R (orientation -1)."""
    rotor_name: str
    vector_name: str
    rotor: tuple
    vector: tuple
    orientation: int

    def describe(self):
        if self.orientation == 1:
            return f'{self.rotor_name} {self.vector_name} {self.rotor_name}~'
        return f'{self.rotor_name}~ {self.vector_name} {self.rotor_name}'


def find_sandwiches(vector_part, arguments):
    """Split a vector part (three expressions e1, e2, e3) into rotor sandwiches plus a rest.

    arguments: the function's Arguments (declared rotors and vectors are candidates).
    Returns (sandwiches, rest) where rest is the vector part minus the sandwiches, already
    reduced by the unit conditions of the rotors used; ([], vector_part) if none fits.
    """
    rotors = [a for a in arguments if a.kind == 'rotor']
    vectors = [a for a in arguments if a.kind == 'vector']
    rest = tuple(vector_part)
    found = []
    for rotor in rotors:
        for vector in vectors:
            for orientation in (1, -1):
                present = set().union(*(expr.free_symbols for expr in rest))
                if not (set(rotor.symbols) <= present and set(vector.symbols) <= present):
                    break
                candidate = sandwich_components(rotor.symbols, vector.symbols, orientation)
                reduced = [reduce_by_unit_rotor(rest[i] - candidate[i], rotor.symbols)
                           for i in range(3)]
                if any(expr is None for expr in reduced):
                    continue
                if any(expr.free_symbols & set(vector.symbols) for expr in reduced):
                    continue
                found.append(Sandwich(rotor.name, vector.name, rotor.symbols,
                                      vector.symbols, orientation))
                rest = tuple(reduced)
                break
    return found, rest


def kernel(sandwich, new_symbol):
    """(assignments, outputs) computing the sandwich for a unit rotor in 15 mul + 15 add.

    new_symbol() hands out the temporaries' symbols. outputs are the terms of the sums
    x_i + w_i + w_i, kept apart so that the doubling stays an addition.
    """
    r0 = sandwich.rotor[0]
    b = tuple(sandwich.orientation * component for component in sandwich.rotor[1:])
    x = sandwich.vector
    assignments = []
    u = []
    for expr in _cross(x, b):
        symbol = new_symbol()
        assignments.append((symbol, expr))
        u.append(symbol)
    w = []
    for i, turned in enumerate(_cross(u, b)):
        symbol = new_symbol()
        assignments.append((symbol, r0 * u[i] + turned))
        w.append(symbol)
    outputs = [(x[i], w[i], w[i]) for i in range(3)]
    return assignments, outputs


def rotor_symbols(name):
    return tuple(sympy.Symbol(name + suffix, real=True) for suffix in KIND_SUFFIXES['rotor'])


def vector_symbols(name):
    return tuple(sympy.Symbol(name + suffix, real=True) for suffix in KIND_SUFFIXES['vector'])

"""Test values for the export tests, built without gacalc's own algebra core.

The geometric product here goes through the Pauli representation (e1, e2, e3 -> sigma_x,
sigma_y, sigma_z, e123 -> i, as in DESIGN.md) with sympy's own matrix product, so the
values the emitters are tested on do not depend on the code under test. The tests in
this file check that representation against published facts.

Other export test files import the helpers: `from test_export_values import ...`.
"""

import random

import sympy
from sympy.algebras.quaternion import Quaternion

BASIS = ('1', 'e1', 'e2', 'e3', 'e23', 'e31', 'e12', 'e123')
ROTOR_DECLARED = {'R': 'rotor', 'x': 'vector'}

_SIGMA = (sympy.Matrix([[0, 1], [1, 0]]),
          sympy.Matrix([[0, -sympy.I], [sympy.I, 0]]),
          sympy.Matrix([[1, 0], [0, -1]]))
_ID = sympy.eye(2)


def symbols(names):
    return sympy.symbols(names, real=True)


def vector(name):
    return {1 + i: s for i, s in enumerate(symbols(f'{name}1 {name}2 {name}3'))}


def bivector(name):
    return dict(zip((4, 5, 6), symbols(f'{name}23 {name}31 {name}12')))


def rotor(name):
    return dict(zip((0, 4, 5, 6), symbols(f'{name}0 {name}23 {name}31 {name}12')))


def multivector(name):
    names = ' '.join(name + s for s in ('0', '1', '2', '3', '23', '31', '12', '123'))
    return dict(zip(range(8), symbols(names)))


def to_pauli(value):
    """2x2 complex matrix of a {index: coefficient} multivector."""
    s1, s2, s3 = _SIGMA
    images = (_ID, s1, s2, s3, s2 * s3, s3 * s1, s1 * s2, s1 * s2 * s3)
    total = sympy.zeros(2, 2)
    for index, coefficient in value.items():
        total += coefficient * images[index]
    return total


def from_pauli(matrix):
    """Back from the matrix: scalar + i pseudoscalar = tr(M)/2, v_k + i b_k = tr(M s_k)/2."""
    def split(z):
        real, imaginary = sympy.expand(z).as_real_imag()
        return sympy.expand(real), sympy.expand(imaginary)
    scalar, pseudo = split(matrix.trace() / 2)
    parts = [split((matrix * s).trace() / 2) for s in _SIGMA]
    components = [scalar, parts[0][0], parts[1][0], parts[2][0],
                  parts[0][1], parts[1][1], parts[2][1], pseudo]
    return {i: c for i, c in enumerate(components) if c != 0}


def product(*factors):
    total = to_pauli({0: sympy.Integer(1)})
    for factor in factors:
        total = total * to_pauli(factor)
    return from_pauli(total)


def reverse(value):
    # Grades 2 and 3 change sign under reversion.
    return {i: (-c if i >= 4 else c) for i, c in value.items()}


def add(*values):
    total = {}
    for value in values:
        for index, coefficient in value.items():
            total[index] = sympy.expand(total.get(index, 0) + coefficient)
    return {i: c for i, c in total.items() if c != 0}


def scale(value, factor):
    return {i: factor * c for i, c in value.items()}


def inverse_of_rotor(value):
    """R^-1 = R~ / (R R~) for an even multivector with R R~ a scalar."""
    norm = product(value, reverse(value))[0]
    return {i: c / norm for i, c in reverse(value).items()}


def rotor_sandwich():
    """R x R~ for a symbolic rotor R and vector x."""
    r = rotor('R')
    return product(r, vector('x'), reverse(r))


def random_unit_rotor(rng):
    components = [rng.uniform(-1, 1) for _ in range(4)]
    norm = sum(c * c for c in components) ** 0.5
    return [c / norm for c in components]


# --- checks of the helpers themselves -------------------------------------------------

def test_basis_products_follow_design_conventions():
    # DESIGN.md: e_i e_i = 1, e1 e2 = e12, e2 e3 = e23, e3 e1 = e31, I^2 = -1.
    e = {k: {k: sympy.Integer(1)} for k in range(8)}
    assert product(e[1], e[1]) == {0: 1}
    assert product(e[1], e[2]) == {6: 1}
    assert product(e[2], e[3]) == {4: 1}
    assert product(e[3], e[1]) == {5: 1}
    assert product(e[2], e[1]) == {6: -1}
    assert product(e[1], e[2], e[3]) == {7: 1}
    assert product(e[7], e[7]) == {0: -1}


def test_vector_product_is_dot_plus_wedge():
    # a b = a.b + a^b, with a^b = (a x b) I (common practice, any GA text).
    a, b = vector('a'), vector('b')
    (a1, a2, a3), (b1, b2, b3) = a.values(), b.values()
    assert product(a, b) == {0: a1 * b1 + a2 * b2 + a3 * b3,
                             4: a2 * b3 - a3 * b2,
                             5: a3 * b1 - a1 * b3,
                             6: a1 * b2 - a2 * b1}


def test_rotor_sandwich_matches_sympy_quaternion_rotation():
    # Reference: sympy's Quaternion.to_rotation_matrix (v' = q v q*), with DESIGN.md's
    # mapping w + xi + yj + zk <-> w - x e23 - y e31 - z e12, valid for any norm once
    # scaled by |q|^2.
    r0, r23, r31, r12 = rotor('R').values()
    x = sympy.Matrix(list(vector('x').values()))
    q = Quaternion(r0, -r23, -r31, -r12)
    norm2 = r0 ** 2 + r23 ** 2 + r31 ** 2 + r12 ** 2
    expected = (q.to_rotation_matrix() * norm2 * x).applyfunc(sympy.simplify)
    sandwich = rotor_sandwich()
    assert set(sandwich) == {1, 2, 3}
    for i in range(3):
        assert sympy.simplify(sandwich[i + 1] - expected[i]) == 0


def test_plane_rotation_turns_e1_toward_e2():
    # DESIGN.md: rotor(e12, theta) = exp(-e12 theta/2) = cos(theta/2) - e12 sin(theta/2)
    # turns e1 toward e2: R e1 R~ = cos(theta) e1 + sin(theta) e2.
    theta = symbols('theta')
    r = {0: sympy.cos(theta / 2), 6: -sympy.sin(theta / 2)}
    turned = product(r, {1: sympy.Integer(1)}, reverse(r))
    assert sympy.simplify(turned[1] - sympy.cos(theta)) == 0
    assert sympy.simplify(turned[2] - sympy.sin(theta)) == 0


def test_random_unit_rotor_is_unit():
    rng = random.Random(1)
    assert abs(sum(c * c for c in random_unit_rotor(rng)) - 1) < 1e-15


# --- the values the code emitters are tested on ----------------------------------------

SUFFIXES = {  # DESIGN.md component names of each declared kind
    'vector': ('1', '2', '3'), 'bivector': ('23', '31', '12'),
    'rotor': ('0', '23', '31', '12'), 'even': ('0', '23', '31', '12'),
    'multivector': ('0', '1', '2', '3', '23', '31', '12', '123'),
}


def _spin_precession():
    # A spin s precessing about e3 at angular rate omega (plane e12), plus a phase
    # lambda on the pseudoscalar and the length of s in the scalar part.
    omega, t, lam = symbols('omega t lambda')
    s = vector('s')
    r = {0: sympy.cos(omega * t / 2), 6: -sympy.sin(omega * t / 2)}
    turned = product(r, s, reverse(r))
    length = sympy.sqrt(sum(c ** 2 for c in s.values()))
    return add(turned, {0: length, 7: lam * sympy.cos(sympy.pi * t)})


def _rotation_matrix():
    # sympy's own Quaternion.to_rotation_matrix (divides by |q|^2): a real rational matrix.
    r0, r23, r31, r12 = rotor('Q').values()
    return Quaternion(r0, -r23, -r31, -r12).to_rotation_matrix()


def _periscope():
    # Periscope mirror pair: x reflected in the planes normal to unit n then to unit m,
    # x -> m n x n m, i.e. a rotation by the rotor m n (written out, so no kernel).
    n, m, x = vector('n'), vector('m'), vector('x')
    return product(m, n, x, n, m)


CASES = {
    # name: (value, declared, unit rotors in the inputs)
    'vector_product': (lambda: product(vector('a'), vector('b')),
                       {'a': 'vector', 'b': 'vector'}),
    'rotor_sandwich': (rotor_sandwich, ROTOR_DECLARED),
    'reverse_sandwich_plus_offset': (
        lambda: add(product(reverse(rotor('R')), vector('x'), rotor('R')), vector('d')),
        {'R': 'rotor', 'x': 'vector', 'd': 'vector'}),
    'sandwich_through_inverse': (
        lambda: product(rotor('R'), vector('x'), inverse_of_rotor(rotor('R'))),
        ROTOR_DECLARED),
    'even_not_unit': (lambda: product(rotor('E'), vector('x'), reverse(rotor('E'))),
                      {'E': 'even', 'x': 'vector'}),
    'general_product': (lambda: product(multivector('M'), multivector('N')),
                        {'M': 'multivector', 'N': 'multivector'}),
    'bivector_times_vector': (lambda: product(bivector('B'), vector('a')),
                              {'B': 'bivector', 'a': 'vector'}),
    'periscope': (_periscope, {'n': 'vector', 'm': 'vector', 'x': 'vector'}),
    'spin_precession': (_spin_precession, {'s': 'vector'}),
    'pauli_matrix': (lambda: to_pauli(vector('a')), {'a': 'vector'}),
    'rotation_matrix': (_rotation_matrix, {'Q': 'rotor'}),
    'constant': (lambda: {0: sympy.Rational(1, 2), 6: sympy.sqrt(3) / 2,
                          7: sympy.cos(sympy.pi / 7)}, {}),
    'zero': (lambda: {}, {}),
}


def case(name):
    build, declared = CASES[name]
    return build(), declared


def expressions_of(value):
    if isinstance(value, sympy.MatrixBase):
        return list(value)
    return [value[i] for i in sorted(value) if value[i] != 0]


def free_symbols_of(value):
    found = set()
    for expr in expressions_of(value):
        found |= expr.free_symbols
    return found


def sample(value, declared, rng):
    """Random inputs: {symbol: float}; declared rotors get unit components."""
    values = {}
    by_name = {s.name: s for s in free_symbols_of(value)}
    for name, kind in declared.items():
        if kind == 'scalar':
            continue
        numbers = (random_unit_rotor(rng) if kind == 'rotor'
                   else [rng.uniform(-2, 2) for _ in SUFFIXES[kind]])
        for suffix, number in zip(SUFFIXES[kind], numbers):
            values[sympy.Symbol(name + suffix, real=True)] = number
    for name, symbol in by_name.items():
        values.setdefault(symbol, rng.uniform(-2, 2))
    return values


def layout(value, declared):
    """The argument layout the emitters promise: declared sequences in name order, then
    the other free symbols as scalars in name order. [(name, [symbols])]"""
    names = {s.name for s in free_symbols_of(value)}
    sequences, used = [], set()
    for name in sorted(declared):
        kind = declared[name]
        if kind == 'scalar':
            continue
        components = [name + suffix for suffix in SUFFIXES[kind]]
        if names & set(components):
            sequences.append((name, [sympy.Symbol(c, real=True) for c in components]))
            used |= set(components)
    scalars = [(name, [sympy.Symbol(name, real=True)]) for name in sorted(names - used)]
    return sequences + scalars


def reference(value, values):
    """The value's expressions evaluated by sympy at the inputs (30 digits)."""
    substitution = {symbol: sympy.Float(number, 30) for symbol, number in values.items()}
    return [complex(sympy.N(expr.xreplace(substitution), 30))
            for expr in expressions_of(value)]


def agree(got, expected, tolerance=1e-12):
    """Relative agreement of a whole result: |got - expected| <= tol * max(1, max|expected|)."""
    if len(got) != len(expected):
        return False
    size = max([1.0] + [abs(e) for e in expected])
    return all(abs(g - e) <= tolerance * size for g, e in zip(got, expected))


def test_cases_build():
    for name in CASES:
        value, _ = case(name)
        assert isinstance(value, (dict, sympy.MatrixBase)), name

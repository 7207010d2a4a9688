"""Symbolic multivectors of a declared kind, and the side conditions the kind implies."""

from __future__ import annotations

from gacalc.lazy import sympy

from .multivector import AlgebraError, Multivector

# kind -> (basis indices, component name suffixes); names follow DESIGN.md:
# vector a -> a1 a2 a3; bivector B -> B23 B31 B12; rotor R -> R0 R23 R31 R12;
# multivector M -> M0 M1 M2 M3 M23 M31 M12 M123.
KIND_COMPONENTS = {
    "scalar": ((0,), ("",)),
    "vector": ((1, 2, 3), ("1", "2", "3")),
    "bivector": ((4, 5, 6), ("23", "31", "12")),
    "trivector": ((7,), ("123",)),
    "rotor": ((0, 4, 5, 6), ("0", "23", "31", "12")),
    "even": ((0, 4, 5, 6), ("0", "23", "31", "12")),
    "multivector": ((0, 1, 2, 3, 4, 5, 6, 7), ("0", "1", "2", "3", "23", "31", "12", "123")),
}

# kinds whose unit condition is implied by the declaration itself
UNIT_BY_DEFAULT = {"rotor"}


def component_symbols(kind: str, name: str, depends: tuple = ()) -> list:
    """The components: real symbols, or real functions of the scalars ``depends``
    (vector r(t) -> r1(t), r2(t), r3(t))."""
    try:
        _, suffixes = KIND_COMPONENTS[kind]
    except KeyError:
        raise AlgebraError(f"unknown kind {kind!r}") from None
    if depends:
        return [sympy.Function(name + s, real=True)(*depends) for s in suffixes]
    return [sympy.Symbol(name + s, real=True) for s in suffixes]


def component_names(kind: str, name: str) -> list:
    """The names of the components (a1 a2 a3 for vector a; M11 ... M33 for matrix3 M)."""
    if kind in MATRIX_KINDS:
        return matrix_entry_names(kind, name)
    return [name + s for s in KIND_COMPONENTS[kind][1]]


# matrix3 M -> the 3x3 matrix of entries M11 M12 M13 M21 ... M33 (row, column)
MATRIX_KINDS = {"matrix3": 3}


def matrix_entry_names(kind: str, name: str) -> list:
    n = MATRIX_KINDS[kind]
    return [f"{name}{i}{j}" for i in range(1, n + 1) for j in range(1, n + 1)]


def symbolic(kind: str, name: str, unit: bool = False, depends: tuple = ()):
    """(value, conditions): a Multivector (a sympy Matrix for the matrix kinds); conditions
    are sympy Exprs equal to zero on the declared set.

    ``depends``: real scalar symbols the components are functions of; a unit condition
    then comes with its first derivatives (R R~ = 1 gives <dR/dt R~> = 0)."""
    if kind in MATRIX_KINDS:
        if unit:
            raise AlgebraError("'unit' does not apply to a matrix")
        if depends:
            raise AlgebraError("a declared matrix cannot depend on a variable")
        n = MATRIX_KINDS[kind]
        entries = [sympy.Symbol(e, real=True) for e in matrix_entry_names(kind, name)]
        return sympy.Matrix(n, n, entries), []
    indices, _ = KIND_COMPONENTS.get(kind, (None, None))
    if indices is None:
        raise AlgebraError(f"unknown kind {kind!r}")
    syms = component_symbols(kind, name, depends)
    mv = Multivector(dict(zip(indices, syms)))
    conditions = []
    if unit or kind in UNIT_BY_DEFAULT:
        if kind == "scalar":
            raise AlgebraError("a unit scalar is just ±1")
        conditions.append(sympy.Add(*[s**2 for s in syms]) - 1)
        for variable in depends:
            conditions.append(sympy.Add(*[s * sympy.diff(s, variable) for s in syms]))
    return mv, conditions

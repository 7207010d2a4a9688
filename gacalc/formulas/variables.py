"""The declared names a formula may use: vectors, and bivectors through their dual vectors.

A bivector B enters the candidate basis as the vector dual(B) = B I^-1 (so B = dual(B) I):
every bivector in 3-D is the dual of a vector, and the invariant theory is the one of
vectors.  A unit declaration (``vector n unit``) means n . n = 1: the engine never uses
that dot product and reduces polynomials modulo it.
"""

from __future__ import annotations

from dataclasses import dataclass

from gacalc.algebra.multivector import Multivector

RECOGNISED_KINDS = ("vector", "bivector")


@dataclass(frozen=True)
class Variable:
    name: str                 # the declared name
    kind: str                 # 'vector' or 'bivector'
    vector: Multivector       # the vector the basis is built from (dual(B) for a bivector)
    symbols: tuple            # its component symbols (sympy Symbols)
    unit: bool = False

    @property
    def text(self) -> str:
        """How the vector is written in a formula."""
        return self.name if self.kind == "vector" else f"dual({self.name})"


def variable(name: str, kind: str, value: Multivector, unit: bool = False) -> Variable:
    """The Variable of a declared name whose value is its symbolic multivector."""
    vector = value if kind == "vector" else value.dual()
    symbols = tuple(sorted(value.free_symbols, key=str))
    return Variable(name, kind, vector, symbols, unit)


def variables_of(declarations: dict, values: dict, unit_names=()) -> tuple[list, list]:
    """(variables, other declared names) from a session's declarations: the vectors and
    bivectors still bound to their symbolic values, and the names of the declared
    multivectors of other kinds (rotors, general multivectors), which formulas cannot use."""
    out, others = [], []
    for name, kind in declarations.items():
        value = values.get(name)
        if not isinstance(value, Multivector):
            continue
        if kind in RECOGNISED_KINDS:
            out.append(variable(name, kind, value, name in unit_names))
        elif kind != "scalar":
            others.append((name, tuple(value.free_symbols)))
    return out, others

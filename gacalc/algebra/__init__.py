"""The Cl(3,0) core: basis, multivectors, products, involutions, norms, inverse.

Knows nothing of the gacalc language.  Coefficients are kept in an exact polynomial
domain (gacalc.algebra.coefficients) that callers never see: they pass and get sympy.
Equality, inverses and the unit checks of rotors ask the simplifier installed in
gacalc.algebra.context: import gacalc.simplify to have the standard one (the language does);
without it zero means structurally zero.
"""

from .basis import BASIS_GRADES, BASIS_NAMES
from .multivector import (
    ONE, AlgebraError, I, Multivector, NotInvertibleError, bivector, blade, cross, e1, e2, e3,
    e12, e23, e31, vector,
)
from .symbolic import component_symbols, symbolic

__all__ = [
    "BASIS_GRADES", "BASIS_NAMES", "ONE", "AlgebraError", "I", "Multivector", "NotInvertibleError",
    "bivector", "blade", "cross", "e1", "e2", "e3", "e12", "e23", "e31", "vector", "symbolic",
    "component_symbols",
]

"""A multivector's components handed to other libraries: sympy expressions and numpy arrays.

Components are always in the basis order 1; e1, e2, e3; e23, e31, e12; e123, keyed by
the basis names.  numpy is imported only when an array is asked for.
"""

from __future__ import annotations

from gacalc.lazy import sympy

from .basis import BASIS_GRADES, BASIS_NAMES


class NotNumericError(ValueError):
    """A value with free symbols asked for as numbers; ``symbols`` names them, sorted."""

    def __init__(self, symbols):
        self.symbols = sorted(str(s) for s in symbols)
        super().__init__("the value still has symbols without numbers: "
                         + ", ".join(self.symbols))


def _indices(grade: int | None) -> list[int]:
    if grade is None:
        return list(range(8))
    if grade not in (0, 1, 2, 3):
        raise ValueError(f"Cl(3,0) has grades 0 to 3, not {grade!r}")
    return [k for k in range(8) if BASIS_GRADES[k] == grade]


def to_sympy(mv, component: str | None = None, grade: int | None = None):
    """One component as a sympy Expr (``component='e12'``), or a dict blade name -> Expr
    of every component (of one grade with ``grade=k``), zeros included."""
    if component is not None:
        if grade is not None:
            raise TypeError("give a component or a grade, not both")
        return mv[component]
    return {BASIS_NAMES[k]: mv[k] for k in _indices(grade)}


def to_numpy(mv, grade: int | None = None):
    """The components as a float numpy array (all 8, or the 1/3/3/1 of one grade).

    NotNumericError (a ValueError) when a component still has free symbols."""
    import numpy

    free = mv.free_symbols
    if free:
        raise NotNumericError(free)
    values = []
    for k in _indices(grade):
        number = sympy.N(mv[k])
        if not number.is_real:
            raise ValueError(f"the {BASIS_NAMES[k]} component {number} is not a real number")
        values.append(float(number))
    return numpy.array(values, dtype=float)

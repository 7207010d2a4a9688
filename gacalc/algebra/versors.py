"""Projections onto blades, reflections in planes, and the action of versors.

Conventions (DESIGN.md "Versor application"): a versor V acts on any multivector X as

    X  ↦  V X̂ V⁻¹      with X̂ the grade involution when V is odd (X itself when V is even),

so a single vector n acts as the reflection in the plane it is normal to: a vector in the
plane stays, n ↦ −n, and bivectors and the trivector follow as the outermorphism of that
map (a plane containing n changes orientation, the plane ⟂ n stays, I ↦ −I).

In Cl(3,0) every homogeneous element is a blade, and every nonzero element that is purely
even (scalar + bivector) or purely odd (vector + trivector) is a versor — a scaled product
of unit vectors — with V Ṽ = ⟨V Ṽ⟩₀ = the sum of its squared coefficients.  So V⁻¹ = Ṽ / |V|²
here, cheaper and tidier than the general inverse.
"""

from __future__ import annotations

from .context import current
from .multivector import (as_multivector as _as_multivector, AlgebraError, Multivector, NotInvertibleError,
                          simplified_scalar)

EVEN, ODD = "even", "odd"


def _grade_words(grades) -> str:
    gs = sorted(grades)
    if not gs:
        return "zero"
    if len(gs) == 1:
        return f"grade {gs[0]}"
    return "a multivector of grades " + ", ".join(map(str, gs[:-1])) + f" and {gs[-1]}"


def _vanishes(mv: Multivector):
    """True / False / None: does the multivector simplify to zero?"""
    if mv.is_zero():
        return True
    return current().simplifier.is_zero(mv)


def classify_versor(V) -> str | None:
    """'even' or 'odd' when V is a versor of that parity, None when it is not one.

    Decided structurally first (which grades are stored), then symbolically: a stored
    component may still simplify to zero (sin² + cos² − 1).  None also covers the
    undecidable case: a part that cannot be shown to vanish counts as present.
    """
    V = _as_multivector(V, "classify_versor")
    even_part, odd_part = V.even(), V.odd()
    even_zero = _vanishes(even_part)
    odd_zero = _vanishes(odd_part)
    if even_zero is True and odd_zero is True:
        return None  # zero is no versor
    if odd_zero is True:
        return EVEN
    if even_zero is True:
        return ODD
    return None


def is_versor(V) -> bool | None:
    """True when V is a versor, False when provably not, None when undecided."""
    V = _as_multivector(V, "is_versor")
    parity = classify_versor(V)
    if parity is not None:
        return True
    if _vanishes(V) is True:
        return False
    # both parts present: False only if both parts are provably nonzero
    even_zero, odd_zero = _vanishes(V.even()), _vanishes(V.odd())
    if even_zero is False and odd_zero is False:
        return False
    return None


def versor_parity(V, what: str = "apply_versor") -> str:
    """'even' or 'odd'; raises AlgebraError with a plain message when V is not a versor."""
    V = _as_multivector(V, what)
    grades = V.grades()
    if not grades:
        raise AlgebraError(f"{what} needs a nonzero versor; got 0")
    if all(g % 2 == 0 for g in grades):
        return EVEN
    if all(g % 2 == 1 for g in grades):
        return ODD
    parity = classify_versor(V)
    if parity is None:
        raise AlgebraError(
            f"{what} needs a versor (purely even or purely odd); got {_grade_words(grades)}"
        )
    return parity


def versor_inverse(V, what: str = "apply_versor", noun: str = "versor") -> Multivector:
    """V⁻¹ = Ṽ / (V Ṽ) for a versor (or blade) V of Cl(3,0): V Ṽ is the scalar |V|²."""
    n2 = simplified_scalar(V.norm2())
    if n2 == 0:
        raise NotInvertibleError(f"{what} needs a nonzero {noun}; this one simplifies to 0", n2)
    rev = V.rev()
    return rev if n2 == 1 else rev / n2


def apply_versor(V, X) -> Multivector:
    """V X̂ V⁻¹: the versor's action on any multivector X (grade involution for odd V)."""
    V = _as_multivector(V, "apply_versor")
    X = _as_multivector(X, "apply_versor")
    parity = versor_parity(V, "apply_versor")
    if parity == ODD:
        # the even part of an odd versor simplifies to zero; drop it so the sandwich is exact
        V = V.odd()
        X = X.involute()
    else:
        V = V.even()
    return V * X * versor_inverse(V, "apply_versor")


def reflect(X, n) -> Multivector:
    """Reflection of any multivector X in the plane through the origin with normal vector n.

    X ↦ n X̂ n⁻¹: for a vector x this is x − 2 (x·n) n / (n·n) (the Householder map);
    other grades follow as its outermorphism.  n need not be unit.
    """
    n = _as_multivector(n, "reflect")
    X = _as_multivector(X, "reflect")
    grades = n.grades()
    if grades != {1}:
        hint = " (for a mirror plane given as a bivector B, use its dual)" if grades == {2} else ""
        got = "0" if not grades else _grade_words(grades)
        raise AlgebraError(f"reflect needs the nonzero normal vector of the mirror plane; got {got}{hint}")
    return apply_versor(n, X)


def _blade_check(B, what: str) -> Multivector:
    B = _as_multivector(B, what)
    grades = B.grades()
    if not grades:
        raise AlgebraError(f"{what} needs a nonzero blade; got 0")
    if len(grades) != 1:
        raise AlgebraError(f"{what} needs a blade (a single grade); got {_grade_words(grades)}")
    return B


def project(x, B) -> Multivector:
    """Orthogonal projection (x ⌋ B) B⁻¹ of x onto the subspace of the blade B.

    For a vector x and a line (vector B) or plane (bivector B) this is the usual
    orthogonal projection; for a blade x of higher grade it is the projection of each
    factor (x ⌋ B vanishes when grade(x) > grade(B)); it is linear, so a general x is
    projected grade by grade.  Scalars project to themselves.  B need not be unit.
    """
    x = _as_multivector(x, "project")
    B = _blade_check(B, "project")
    return x.lc(B) * versor_inverse(B, "project", "blade")


def reject(x, B) -> Multivector:
    """x minus its projection onto B; for a vector x this is (x ∧ B) B⁻¹, the part ⟂ B."""
    return _as_multivector(x, "reject") - project(x, B)


__all__ = [
    "project", "reject", "reflect", "apply_versor", "classify_versor", "is_versor",
    "versor_parity", "versor_inverse",
]

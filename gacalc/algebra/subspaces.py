"""Blades as subspaces: blade test, join and meet, factorisation, angles, reciprocal frames.

A nonzero blade of grade k stands for the k-dimensional subspace through the origin it
spans (its orientation and weight ride along).  In 3-D every homogeneous element is a
blade (common practice), so "is a blade" means "has a single nonzero grade".

Conventions (stated in README):
- join(A, B) = A ∧ B when that is nonzero (the subspaces share only the origin); when one
  blade contains the other the join is the containing blade (A when both span the same
  subspace); two different planes join to the whole space, I.
- meet(A, B) = (B ⌋ J⁻¹) ⌋ A with J = join(A, B) (the formula of Dorst, Fontijne and
  Mann, "Geometric Algebra for Computer Science", sec. 5.6).  Two planes meet in their
  common line, a vector, and meet(e12, e23) = e2; a subspace meets one it lies in in
  itself; subspaces with only the origin in common meet in a scalar.
- angle between blades: two vectors (lines) in [0, pi]; a vector and a plane in
  [-pi/2, pi/2], positive when the vector points to the side of the plane's normal
  dual(B); two planes in [0, pi], the angle between their normals.

Each function takes the scalar side conditions in force (sympy Exprs equal to zero) and
returns, beside its value, the conditions (sympy Exprs that must be nonzero) under which
the value holds when a case distinction depends on the values of symbols (the way the
inverse states its condition).
"""

from __future__ import annotations

from gacalc.lazy import sympy

from .context import current
from .multivector import AlgebraError, Multivector, _condition_text_expr
from .versors import project, versor_inverse

_I = Multivector({7: 1})
_I_INVERSE = -_I
_BASIS_VECTORS = tuple(Multivector({k: 1}) for k in (1, 2, 3))
_GRADE_WORDS = {0: "a scalar", 1: "a vector", 2: "a bivector", 3: "a trivector"}


def _is_zero(mv: Multivector, conditions):
    if mv.is_zero():
        return True
    return current().simplifier.is_zero(mv, tuple(conditions))


def nonzero_condition(mv: Multivector):
    """The sympy Expr that is nonzero exactly where mv is (the sum of its squared
    components, numerator, repeated factors once); None when that is a nonzero number."""
    square = mv.scalar_product(mv.rev()).coefs()[0]
    if square is None:
        return sympy.Integer(0)
    if square.is_constant():
        return None
    return _condition_text_expr(current().simplifier.reduce(square))


def _note(conditions_out: list, mv: Multivector):
    """Record where mv is nonzero when that depends on the symbols (a test that is not
    identically zero can still vanish for some values of them)."""
    condition = nonzero_condition(mv)
    if condition is not None and not condition.is_number and condition not in conditions_out:
        conditions_out.append(condition)


def surviving_grades(a: Multivector, conditions=()):
    """(grades whose part is not proved zero, grades whose vanishing is undecided)."""
    present, undecided = [], []
    for k in sorted(a.grades()):
        verdict = _is_zero(a.grade(k), conditions)
        if verdict is not True:
            present.append(k)
            if verdict is None:
                undecided.append(k)
    return present, undecided


def is_blade(a: Multivector, conditions=()):
    """(answer, undecided grades): answer True when at most one grade survives (0 is
    the zero blade), False when two or more do (undecided parts taken as nonzero)."""
    present, undecided = surviving_grades(a, conditions)
    return len(present) <= 1, undecided


def as_blade(a: Multivector, what: str, conditions=(), conditions_out=None):
    """(the blade with its vanishing grades dropped, its grade); AlgebraError for 0 and
    for a mixture of grades."""
    present, undecided = surviving_grades(a, conditions)
    if not present:
        raise AlgebraError(f"{what} needs a nonzero blade; got 0")
    if len(present) > 1:
        listed = ", ".join(str(k) for k in present[:-1]) + f" and {present[-1]}"
        raise AlgebraError(f"{what} needs a blade (a single grade); got grades {listed}")
    grade = present[0]
    blade = a.grade(grade)
    if undecided and conditions_out is not None:
        _note(conditions_out, blade)
    return blade, grade


# join and meet ------------------------------------------------------------------------
def join(a: Multivector, b: Multivector, conditions=()):
    """(J, conditions): the smallest subspace containing both blades (see module doc)."""
    out: list = []
    a, ga = as_blade(a, "join", conditions, out)
    b, gb = as_blade(b, "join", conditions, out)
    return _join(a, ga, b, gb, conditions, out), out


def _join(a, ga, b, gb, conditions, out):
    wedge = a.outer(b)
    if _is_zero(wedge, conditions) is not True:
        _note(out, wedge)           # symbolic: holds where the wedge does not vanish
        return wedge
    small, big = (a, b) if ga < gb else (b, a)
    rejection = small - project(small, big)
    if _is_zero(rejection, conditions) is True:
        _note(out, big)
        return big
    _note(out, rejection)
    # in 3-D the only case left: two different planes, which together span all of space
    return _I


def meet(a: Multivector, b: Multivector, conditions=()):
    """(M, conditions): M = (B ⌋ J⁻¹) ⌋ A with J = join(A, B), the common subspace."""
    out: list = []
    a, ga = as_blade(a, "meet", conditions, out)
    b, gb = as_blade(b, "meet", conditions, out)
    j = _join(a, ga, b, gb, conditions, out)
    return b.lc(versor_inverse(j, "meet", "blade")).lc(a), out


# factorisation ------------------------------------------------------------------------
def factor(b: Multivector, conditions=()):
    """(vectors, conditions): mutually orthogonal vectors whose outer product is the blade.

    Grade 1: the vector itself.  Grade 2: a = the projection onto B of the first basis
    vector not orthogonal to B, then a⁻¹ B (a vector in B orthogonal to a, a ∧ a⁻¹B = B).
    Grade 3: t I = e1 ∧ e2 ∧ (t e3).
    """
    out: list = []
    present, _ = surviving_grades(b, conditions)
    if not present:
        raise AlgebraError("factor: the blade is 0 (its vectors are parallel, or one of "
                           "them is 0), so it has no factors")
    blade, grade = as_blade(b, "factor", conditions, out)
    if grade == 0:
        raise AlgebraError("factor: a scalar has no vector factors; factor takes a vector, "
                           "bivector or trivector")
    if grade == 1:
        return [blade], out
    if grade == 3:
        return [_BASIS_VECTORS[0], _BASIS_VECTORS[1], _BASIS_VECTORS[2] * blade[7]], out
    for e in _BASIS_VECTORS:
        shadow = e.lc(blade)               # zero exactly when e is orthogonal to the plane
        if _is_zero(shadow, conditions) is True:
            continue
        _note(out, shadow)
        first = project(e, blade)
        second = versor_inverse(first, "factor", "vector") * blade
        return [first, second.grade(1)], out
    raise AlgebraError("factor: the bivector is orthogonal to every basis vector, so it is 0")


# angles ------------------------------------------------------------------------------
def angle(a: Multivector, b: Multivector, conditions=()):
    """The principal angle between two blades of grades 1 or 2 (sign convention in the
    module doc), as a sympy expression."""
    a, ga = as_blade(a, "angle", conditions)
    b, gb = as_blade(b, "angle", conditions)
    if not {ga, gb} <= {1, 2}:
        raise AlgebraError(f"angle(A, B) is defined between lines (vectors) and planes "
                           f"(bivectors), not {_GRADE_WORDS[ga]} and {_GRADE_WORDS[gb]}")
    scale = sympy.sqrt(a.norm2() * b.norm2())
    if ga == gb:                                  # lines or planes: [0, pi]
        return sympy.acos(a.scalar_product(b.rev())[0] / scale)
    line, plane = (a, b) if ga == 1 else (b, a)
    # signed: (a ∧ B) I⁻¹ = a · dual(B), so the sine is positive on the normal's side
    return sympy.asin((line.outer(plane) * _I_INVERSE)[0] / scale)


# frames ------------------------------------------------------------------------------
def frame_volume(a: Multivector, b: Multivector, c: Multivector):
    """(a ∧ b ∧ c) I⁻¹: the signed volume of the frame (the determinant of its matrix)."""
    return (a.outer(b).outer(c) * _I_INVERSE)[0]


def reciprocal(a: Multivector, b: Multivector, c: Multivector, conditions=()):
    """([a¹, a², a³], conditions) with a^i · a_j = δ^i_j:
    a¹ = (b ∧ c) I⁻¹ / ((a ∧ b ∧ c) I⁻¹) and cyclically (Hestenes and Sobczyk, "Clifford
    Algebra to Geometric Calculus", sec. 1.3; Doran and Lasenby, sec. 4.3)."""
    volume = frame_volume(a, b, c)
    volume_mv = Multivector.scalar(volume)
    verdict = _is_zero(volume_mv, conditions)
    condition = _condition_text_expr(current().simplifier.reduce(volume_mv.coefs()[0])) \
        if not volume_mv.is_zero() else sympy.Integer(0)
    if verdict is True:
        raise AlgebraError("not a frame: a /\\ b /\\ c = 0 (the three vectors lie in one "
                           "plane), so there is no reciprocal frame")
    out = [] if condition.is_number else [condition]
    frame = [(b.outer(c) * _I_INVERSE) / volume, (c.outer(a) * _I_INVERSE) / volume,
             (a.outer(b) * _I_INVERSE) / volume]
    return frame, out


def frame_matrix(a: Multivector, b: Multivector, c: Multivector) -> sympy.Matrix:
    """The 3x3 matrix with columns a, b, c (it maps e1, e2, e3 to the frame)."""
    return sympy.Matrix([[v[i] for v in (a, b, c)] for i in (1, 2, 3)])


__all__ = ["is_blade", "as_blade", "join", "meet", "factor", "angle", "reciprocal",
           "frame_matrix", "frame_volume", "nonzero_condition", "surviving_grades"]

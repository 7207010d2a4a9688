"""Linear maps of 3-D space and their outermorphisms.

A linear map f is stored as its 3x3 matrix acting on column vectors (column j is f(e_j),
the convention of ``matrix(R)``).  Its outermorphism extends it to every multivector:

    f(1) = 1,   f(a ∧ b) = f(a) ∧ f(b),   f(a ∧ b ∧ c) = det(f) a ∧ b ∧ c,

so the images of the eight basis blades determine it and f(X) is linear in X.  The
determinant is read off f(I) = det(f) I, the adjoint is f̄(a) = Σ_i e_i (f(e_i) · a), and
the inverse is the outermorphism formula f⁻¹(A) = f̄(A I) I⁻¹ / det(f) (Hestenes and
Sobczyk, "Clifford Algebra to Geometric Calculus", ch. 3; Doran and Lasenby, "Geometric
Algebra for Physicists", sec. 4.4).
"""

from __future__ import annotations

from gacalc.lazy import sympy

from .context import current
from .multivector import AlgebraError, Multivector, NotInvertibleError, _condition_text_expr
from .coefficients import from_expr

_I = Multivector({7: 1})
_I_INVERSE = -_I


class LinearMap:
    """An immutable linear map of R^3 (3x3 matrix on column vectors) with its outermorphism."""

    __slots__ = ("matrix", "_blades")

    def __init__(self, matrix):
        m = sympy.ImmutableMatrix(matrix)
        if m.shape != (3, 3):
            raise AlgebraError(f"a linear map of 3-D space needs a 3x3 matrix, not "
                               f"{m.rows}x{m.cols}")
        self.matrix = m
        self._blades = None

    @classmethod
    def from_images(cls, images) -> "LinearMap":
        """The map with f(e1), f(e2), f(e3) = the three given vectors."""
        columns = []
        for k, image in enumerate(images):
            if not image.grades() <= {1}:
                raise AlgebraError(f"the image of e{k + 1} must be a vector")
            columns.append([image[1], image[2], image[3]])
        return cls(sympy.Matrix(columns).T)

    @classmethod
    def identity(cls) -> "LinearMap":
        return cls(sympy.eye(3))

    # The outermorphism ------------------------------------------------------------------
    def image(self, j: int) -> Multivector:
        """f(e_j), j = 1, 2, 3."""
        return Multivector({i + 1: self.matrix[i, j - 1] for i in range(3)})

    def blade_images(self) -> tuple:
        """f of the basis blades 1, e1, e2, e3, e23, e31, e12, e123 (computed once)."""
        if self._blades is None:
            f1, f2, f3 = (self.image(j) for j in (1, 2, 3))
            f12 = f1.outer(f2)
            self._blades = (Multivector.scalar(1), f1, f2, f3, f2.outer(f3), f3.outer(f1),
                            f12, f12.outer(f3))
        return self._blades

    def __call__(self, x: Multivector) -> Multivector:
        images = self.blade_images()
        out = Multivector()
        for k, coef in enumerate(x.coefs()):
            if coef is not None:
                out = out + images[k].scale(coef)
        return out

    def det(self):
        """det(f) from f(I) = det(f) I."""
        return self.blade_images()[7][7]

    # Algebra of maps ----------------------------------------------------------------------
    def compose(self, other: "LinearMap") -> "LinearMap":
        """self ∘ other: (f g)(X) = f(g(X))."""
        return LinearMap(self.matrix * other.matrix)

    def add(self, other: "LinearMap", sign: int = 1) -> "LinearMap":
        return LinearMap(self.matrix + sign * other.matrix)

    def scale(self, factor) -> "LinearMap":
        return LinearMap(self.matrix * factor)

    def adjoint(self) -> "LinearMap":
        """f̄ with f̄(a) · b = a · f(b): f̄(e_i) = Σ_j e_j (f(e_j) · e_i)."""
        images = []
        for i in (1, 2, 3):
            e_i = Multivector({i: 1})
            images.append(Multivector({j: self.image(j).inner(e_i)[0] for j in (1, 2, 3)}))
        return LinearMap.from_images(images)

    def inverse_with_condition(self):
        """(f⁻¹, condition): f⁻¹(e_j) = f̄(e_j I) I⁻¹ / det(f); condition is the sympy
        Expr that must be nonzero (None when det(f) is a nonzero number)."""
        d = self.det()
        d_coef = current().simplifier.reduce(from_expr(d))
        verdict = current().simplifier.decide_zero(d_coef)
        condition = None if d_coef.is_constant() else _condition_text_expr(d_coef)
        if verdict is True:
            raise NotInvertibleError("not invertible: det(f) = 0 (the map flattens space "
                                     "onto a plane or a line)", condition)
        adjoint = self.adjoint()
        images = [adjoint(Multivector({j: 1}) * _I) * _I_INVERSE / d for j in (1, 2, 3)]
        return LinearMap.from_images(images), condition

    def differences(self, other: "LinearMap") -> list:
        return list(self.matrix - other.matrix)

    def map_entries(self, fn) -> "LinearMap":
        return LinearMap(self.matrix.applyfunc(fn))

    def __eq__(self, other):
        if not isinstance(other, LinearMap):
            return NotImplemented
        simplifier = current().simplifier
        return all(simplifier.is_zero(Multivector({0: e})) is True
                   for e in self.differences(other))

    __hash__ = None

    def __repr__(self):
        return f"LinearMap({list(self.matrix)})"


def is_orthogonal(f: LinearMap, conditions=()):
    """True / False / None: is f^T f = 1 (f preserves lengths and angles)?"""
    simplifier = current().simplifier
    gram = f.matrix.T * f.matrix - sympy.eye(3)
    verdicts = [simplifier.is_zero(Multivector({0: e}), conditions) for e in gram]
    if all(v is True for v in verdicts):
        return True
    return False if any(v is False for v in verdicts) else None


__all__ = ["LinearMap", "is_orthogonal"]

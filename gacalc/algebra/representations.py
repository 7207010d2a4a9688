"""Matrix and quaternion pictures of Cl(3,0), both ways.

- Pauli: e1, e2, e3 -> sigma_x, sigma_y, sigma_z and e123 -> i*1, a 2x2 complex matrix.
- Hamilton quaternions for even elements: i = -e23, j = -e31, k = -e12, so
  w + x i + y j + z k <-> w - x e23 - y e31 - z e12, which is the same rotation.
- The 3x3 matrix of the rotation x -> R x R~ (columns are the images of e1, e2, e3), and
  the rotor of a rotation matrix by Shepperd's method (largest of trace and diagonal).
- The 8x8 real matrices of left and right multiplication in the basis order.

Inputs are sympy objects or plain numbers; strings are refused (no text is ever parsed).
"""

from __future__ import annotations

from fractions import Fraction
from functools import reduce
from numbers import Complex, Integral, Real

import sympy
from sympy.algebras import Quaternion

from .basis import BASIS_NAMES
from .coefficients import from_expr, generators_of
from .context import current
from .multivector import as_multivector as _as_multivector, AlgebraError, Multivector, simplified_scalar
from .signs import certified_sign

_HALF = sympy.Rational(1, 2)
_FLOAT_TOLERANCE = 1e-9  # for checking that a floating-point matrix is a rotation


# ---------------------------------------------------------------------------
# reading plain numbers and matrices without parsing text


def _entry(x, what: str):
    """A number or sympy Expr as a sympy Expr; anything else is refused."""
    if isinstance(x, sympy.Expr):
        return x
    if isinstance(x, bool) or isinstance(x, (str, bytes)):
        raise AlgebraError(f"{what}: entries must be numbers, not {type(x).__name__}")
    if isinstance(x, Integral):
        return sympy.Integer(int(x))
    if isinstance(x, Fraction):
        return sympy.Rational(x.numerator, x.denominator)
    if isinstance(x, Real):
        return sympy.Float(float(x))
    if isinstance(x, Complex):
        z = complex(x)
        return sympy.Float(z.real) + sympy.I * sympy.Float(z.imag)
    raise AlgebraError(f"{what}: entries must be numbers, not {type(x).__name__}")


def _as_matrix(m, shape: tuple[int, int], what: str) -> sympy.Matrix:
    """A sympy Matrix of the given shape from a sympy matrix or nested number sequences."""
    if isinstance(m, sympy.MatrixBase):
        if m.shape != shape:
            raise AlgebraError(f"{what} needs a {shape[0]}x{shape[1]} matrix, got {m.shape[0]}x{m.shape[1]}")
        rows = [[_entry(m[i, j], what) for j in range(shape[1])] for i in range(shape[0])]
        return sympy.Matrix(rows)
    try:
        rows = [list(r) for r in m]
    except TypeError:
        raise AlgebraError(f"{what} needs a {shape[0]}x{shape[1]} matrix") from None
    if len(rows) != shape[0] or any(len(r) != shape[1] for r in rows):
        raise AlgebraError(f"{what} needs a {shape[0]}x{shape[1]} matrix")
    return sympy.Matrix([[_entry(x, what) for x in r] for r in rows])


def _is_exactly_zero_odd(a: Multivector) -> bool:
    odd = a.odd()
    if odd.is_zero():
        return True
    return current().simplifier.is_zero(odd) is True


def _simplified(mv: Multivector, conditions=()) -> Multivector:
    return current().simplifier.simplify(mv, conditions)


# ---------------------------------------------------------------------------
# Pauli matrices


def pauli(a: Multivector) -> sympy.Matrix:
    """The 2x2 complex matrix of A with e1, e2, e3 -> sigma_x, sigma_y, sigma_z, e123 -> i.

    Grouping A by the centre {1, I}: e23 = i sigma_x, e31 = i sigma_y, e12 = i sigma_z, so
    A = s 1 + x sigma_x + y sigma_y + z sigma_z with complex s, x, y, z.
    """
    a = _as_multivector(a, "pauli")
    i = sympy.I
    s = a[0] + i * a[7]
    x = a[1] + i * a[4]
    y = a[2] + i * a[5]
    z = a[3] + i * a[6]
    entries = [[s + z, x - i * y], [x + i * y, s - z]]
    return sympy.Matrix([[sympy.expand(e) for e in row] for row in entries])


def from_pauli(m) -> Multivector:
    """The multivector of a 2x2 complex matrix (inverse of ``pauli``)."""
    m = _as_matrix(m, (2, 2), "from_pauli")
    s = (m[0, 0] + m[1, 1]) * _HALF
    z = (m[0, 0] - m[1, 1]) * _HALF
    x = (m[0, 1] + m[1, 0]) * _HALF
    y = (m[1, 0] - m[0, 1]) * _HALF * (-sympy.I)
    parts = {}
    for (re_index, im_index), value in zip(((0, 7), (1, 4), (2, 5), (3, 6)), (s, x, y, z)):
        re, im = sympy.expand_complex(value).as_real_imag()
        parts[re_index] = re
        parts[im_index] = im
    return Multivector(parts)


# ---------------------------------------------------------------------------
# quaternions (Hamilton): i = -e23, j = -e31, k = -e12


def quaternion(a: Multivector) -> Quaternion:
    """The Hamilton quaternion w + x i + y j + z k of an even multivector."""
    a = _as_multivector(a, "quaternion")
    if not _is_exactly_zero_odd(a):
        raise AlgebraError("quaternion needs an even multivector (grades 0 and 2); this one has odd parts")
    return Quaternion(a[0], -a[4], -a[5], -a[6])


def from_quaternion(q) -> Multivector:
    """The even multivector w - x e23 - y e31 - z e12 of w + x i + y j + z k.

    Accepts a sympy Quaternion or a 4-sequence (w, x, y, z).
    """
    if isinstance(q, Quaternion):
        w, x, y, z = q.a, q.b, q.c, q.d
    else:
        try:
            parts = list(q)
        except TypeError:
            raise AlgebraError("from_quaternion needs a quaternion or four numbers (w, x, y, z)") from None
        if len(parts) != 4:
            raise AlgebraError("from_quaternion needs four numbers (w, x, y, z)")
        w, x, y, z = (_entry(p, "from_quaternion") for p in parts)
    return Multivector({0: w, 4: -x, 5: -y, 6: -z})


# ---------------------------------------------------------------------------
# rotation matrices


def _check_unit_rotor(r: Multivector):
    """Refuse a numeric rotor that is plainly not of unit norm (symbolic ones are trusted)."""
    if r.free_symbols:
        return
    n2 = r.norm2()
    if n2.has(sympy.Float):
        if abs(float(n2) - 1) > _FLOAT_TOLERANCE:
            raise AlgebraError(f"matrix needs a unit rotor; this one has norm2 = {float(n2):g}")
        return
    if current().simplifier.is_zero(Multivector({0: n2 - 1})) is False:
        raise AlgebraError(f"matrix needs a unit rotor; this one has norm2 = {n2}")


def rotation_matrix(r: Multivector, conditions=()) -> sympy.Matrix:
    """The 3x3 matrix of x -> R x R~; column j is the image of e_j (j = 1, 2, 3).

    R must be even.  A numeric R must have unit norm; a symbolic one is taken to be a
    unit rotor (pass its side conditions to let the simplifier use them).
    """
    r = _as_multivector(r, "matrix")
    if not _is_exactly_zero_odd(r):
        raise AlgebraError("matrix needs a rotor (an even multivector); this one has odd parts")
    r = r.even()
    _check_unit_rotor(r)
    rr = r.rev()
    columns = []
    for k in (1, 2, 3):
        image = _simplified(r * Multivector({k: 1}) * rr, conditions)
        columns.append([image[1], image[2], image[3]])
    return sympy.Matrix(columns).T


def _check_rotation(m: sympy.Matrix):
    """Refuse a numeric matrix that is not a proper rotation (symbolic ones are trusted)."""
    if m.free_symbols:
        return
    if m.has(sympy.Float):
        gram = m.T * m - sympy.eye(3)
        det = m.det() - 1
        worst = max(abs(complex(sympy.N(v))) for v in list(gram) + [det])
        if worst > _FLOAT_TOLERANCE:
            raise AlgebraError("from_matrix needs a rotation matrix (orthogonal, determinant 1)")
        return
    # Refused only when an entry of M^T M - 1 (or det M - 1) is proved nonzero: decided in
    # the simplifier's canonical form, else by a certified numeric sign (sympy.simplify
    # missed sin(1)^4-style identities and refused true rotations).  Both are formed in
    # the coefficient domain (sympy's det of long trig entries took minutes).
    from gacalc.algebra.coefficients import from_expr

    c = [[from_expr(m[i, j]) for j in range(3)] for i in range(3)]
    one, zero = from_expr(sympy.Integer(1)), from_expr(sympy.Integer(0))
    gram = [c[0][i] * c[0][j] + c[1][i] * c[1][j] + c[2][i] * c[2][j] - (one if i == j else zero)
            for i in range(3) for j in range(i, 3)]
    det = (c[0][0] * (c[1][1] * c[2][2] - c[1][2] * c[2][1])
           - c[0][1] * (c[1][0] * c[2][2] - c[1][2] * c[2][0])
           + c[0][2] * (c[1][0] * c[2][1] - c[1][1] * c[2][0])) - one
    if any(_proved_nonzero(v) for v in gram):
        raise AlgebraError("from_matrix needs a rotation matrix; this one is not orthogonal")
    if _proved_nonzero(det):
        raise AlgebraError("from_matrix needs a rotation, not a reflection (determinant is -1)")


def _proved_nonzero(coef) -> bool:
    """A numeric coefficient is proved nonzero: by the simplifier's decision or a certified
    sign (an undecided one is not refused, like a symbolic matrix)."""
    verdict = current().simplifier.decide_zero(coef)
    if verdict is not None:
        return verdict is False
    return certified_sign(coef.to_expr()) is not None


def _trig_rotor_of_matrix(m, pivot, root) -> Multivector:
    """Shepperd's step in the coefficient domain (sympy's radsimp of long trig entries is
    slow); the scalar part made >= 0 where its sign is proved."""
    entries = {(i, j): from_expr(m[i, j]) for i in range(3) for j in range(3)}  # m[i, j] indexing
    w, x, y, z = _shepperd(entries, pivot, from_expr(root) * from_expr(_HALF))
    if certified_sign(w.to_expr()) == -1:
        w, x, y, z = -w, -x, -y, -z
    return _simplified(Multivector.from_coefs([w, None, None, None, -x, -y, -z, None]))


def _coefficient_root(square):
    """sqrt(square) through the coefficient domain when it is exact (a perfect square, also
    over half angles), as a sympy Expr; None when it would need a new radical."""
    reduced = current().simplifier.reduce(from_expr(square)).to_expr()  # canonical, not the display form
    before = {g.expr for g in generators_of(from_expr(reduced))}
    root = from_expr(sympy.sqrt(reduced))
    if any(g.kind == "root" and g.expr not in before for g in generators_of(root)):
        return None
    return root.to_expr()


def _over_common_angle(m, halve: bool):
    """m (an Expr or a Matrix) with each family cos(q u), sin(q u) written through one
    angle g u (g the gcd of the q's, halved on request) by the multiple-angle formulas;
    None if nothing changes.

    A rotation matrix typed with cos(t) has a rotor in cos(t/2), sin(t/2); writing the
    matrix through t/2 exposes 1 + tr M = 4 cos(t/2)^2 as a perfect square.
    """
    families: dict = {}
    for f in m.atoms(sympy.cos, sympy.sin):
        q, u = f.args[0].as_coeff_Mul()
        if q.is_Rational:
            families.setdefault(u, []).append((f, q))
    rules = {}
    for u, members in families.items():
        g = reduce(sympy.gcd, [abs(q) for _, q in members])
        if halve:
            g = g / 2
        d = sympy.Dummy("d", real=True)
        for f, q in members:
            image = sympy.expand_trig(f.func(int(q / g) * d)).xreplace({d: g * u})
            if image != f:
                rules[f] = image
    return m.xreplace(rules) if rules else None


def _through_one_angle(x):
    """x with each trigonometric family over one angle (so that quotients can cancel)."""
    rewritten = _over_common_angle(x, False)
    return x if rewritten is None else rewritten


def _exact_square_root(x):
    """A square root of x as a rational function when x is a perfect square, else None.

    Either sign will do for a rotor component (R and -R are the same rotation).
    """
    num, den = sympy.fraction(sympy.together(sympy.expand(x)))
    root = sympy.Integer(1)
    for part, power in ((num, 1), (den, -1)):
        try:
            coeff, factors = sympy.factor_list(part)
        except sympy.polys.polyerrors.BasePolynomialError:
            return None
        if coeff < 0 or any(m % 2 for _, m in factors):
            return None
        c_root = sympy.sqrt(coeff)
        if not c_root.is_Rational:
            return None
        root *= (c_root * sympy.Mul(*[f ** (m // 2) for f, m in factors])) ** power
    return root


def _shepperd(m: sympy.Matrix, pivot: int, big):
    """(w, x, y, z) from the pivot component ``big`` (any square root of its square)."""
    inv = (big + big + big + big) ** -1  # 1/(4 big), also for coefficient-domain values
    # 4wx, 4wy, 4wz and 4xy, 4xz, 4yz from the antisymmetric and symmetric off-diagonal parts
    w_x = m[2, 1] - m[1, 2]
    w_y = m[0, 2] - m[2, 0]
    w_z = m[1, 0] - m[0, 1]
    x_y = m[0, 1] + m[1, 0]
    x_z = m[0, 2] + m[2, 0]
    y_z = m[1, 2] + m[2, 1]
    if pivot == 0:
        return big, w_x * inv, w_y * inv, w_z * inv
    if pivot == 1:
        return w_x * inv, big, x_y * inv, x_z * inv
    if pivot == 2:
        return w_y * inv, x_y * inv, big, y_z * inv
    return w_z * inv, x_z * inv, y_z * inv, big


def _four_squares(m: sympy.Matrix):
    """4w^2 = 1 + tr M and 4x^2, 4y^2, 4z^2 = 1 + 2 M_ii - tr M."""
    t = m[0, 0] + m[1, 1] + m[2, 2]
    return [1 + t, 1 + 2 * m[0, 0] - t, 1 + 2 * m[1, 1] - t, 1 + 2 * m[2, 2] - t]


def from_rotation_matrix(m, conditions=()) -> Multivector:
    """The rotor R with x -> R x R~ equal to the rotation matrix M (columns = images).

    Shepperd's method: of 4w^2 = 1 + tr M and 4x^2, 4y^2, 4z^2 = 1 + 2 M_ii - tr M the
    largest is taken through a square root and the other three components come from sums
    and differences of off-diagonal entries divided by it, so nothing small is ever
    divided by; half turns such as diag(1, -1, -1) need no special case.  The sign is
    chosen so that the scalar part is >= 0 (R and -R give the same rotation).

    A symbolic matrix has no "largest": the first of w, x, y, z that is not identically
    zero (under the side conditions) is the pivot, and the result holds where that
    component is nonzero.  When the pivot's square is a perfect square (modulo the
    conditions, also after writing each angle through its half, as for the matrix of
    cos(t/2) - sin(t/2) e12) no radical appears.
    """
    m = _as_matrix(m, (3, 3), "from_matrix")
    _check_rotation(m)
    if m.free_symbols:
        return _symbolic_rotor_of_matrix(m, tuple(conditions or ()))
    squares = _four_squares(m)
    values = [float(sympy.N(c)) for c in squares]
    pivot = max(range(4), key=lambda i: values[i])
    if m.has(sympy.Float):
        comps = _shepperd(m, pivot, sympy.sqrt(squares[pivot]) * _HALF)
    else:
        # exact: cos(1/3) entries give cos(1/6) components rather than nested radicals
        root = None
        if m.has(sympy.cos, sympy.sin):
            root = _coefficient_root(squares[pivot])
            if root is not None:
                return _trig_rotor_of_matrix(m, pivot, root)
            root = _symbolic_root(squares[pivot], ())
        if root is None:
            root = sympy.sqrtdenest(sympy.sqrt(squares[pivot]))
        comps = [_through_one_angle(sympy.radsimp(c)) for c in _shepperd(m, pivot, root * _HALF)]
    if certified_sign(comps[0]) == -1:
        comps = [-c for c in comps]
    rotor = from_quaternion(comps)
    return _simplified(rotor) if m.has(sympy.cos, sympy.sin) else rotor


def _reduced(expr, conditions):
    return simplified_scalar(expr, conditions)


def _symbolic_root(square, conditions):
    """An exact square root of a symbolic pivot square, or None."""
    reduced = _reduced(square, conditions)
    halved = _over_common_angle(reduced, True)
    forms = (square, reduced, _over_common_angle(reduced, False), halved, _cos_squares_as_sin(halved))
    for form in forms:
        if form is not None:
            root = _exact_square_root(form)
            if root is not None:
                return root
    return None


def _cos_squares_as_sin(x):
    """x with cos(v)^2 -> 1 - sin(v)^2 (2 - 2 cos t = 4 sin(t/2)^2 is a square that way)."""
    if x is None or not x.has(sympy.cos):
        return None
    x = sympy.expand(x)
    for f in x.atoms(sympy.cos):
        x = x.subs(f**2, 1 - sympy.sin(f.args[0]) ** 2)
    return sympy.expand(x)


def _symbolic_rotor_of_matrix(m: sympy.Matrix, conditions) -> Multivector:
    squares = _four_squares(m)
    pivot = next((i for i, c in enumerate(squares) if _reduced(c, conditions) != 0), 0)
    root = _symbolic_root(squares[pivot], conditions)
    if root is None:
        root = sympy.sqrt(_reduced(squares[pivot], conditions))
    comps = _shepperd(m, pivot, root * _HALF)
    # numerator and denominator through one angle, so sin(t) / cos(t/2) cancels to 2 sin(t/2)
    comps = [_through_one_angle(c) for c in comps]
    return _simplified(from_quaternion(comps), conditions)


# ---------------------------------------------------------------------------
# matrices of multiplication


def _basis_element(j: int) -> Multivector:
    return Multivector({j: 1})


def _columns_matrix(images) -> sympy.Matrix:
    return sympy.Matrix([[img[k] for k in range(8)] for img in images]).T


def left_matrix(a: Multivector) -> sympy.Matrix:
    """The 8x8 real matrix L with coefficients(A X) = L coefficients(X), basis order."""
    a = _as_multivector(a, "left_matrix")
    return _columns_matrix([a * _basis_element(j) for j in range(8)])


def right_matrix(a: Multivector) -> sympy.Matrix:
    """The 8x8 real matrix of X -> X A, basis order."""
    a = _as_multivector(a, "right_matrix")
    return _columns_matrix([_basis_element(j) * a for j in range(8)])


def coefficient_column(a: Multivector) -> sympy.Matrix:
    """The 8x1 column of coefficients of A in the basis order (what the 8x8 matrices act on)."""
    a = _as_multivector(a, "coefficient_column")
    return sympy.Matrix([a[k] for k in range(8)])


def from_coefficient_column(v) -> Multivector:
    """The multivector of an 8-entry column (or sequence) of coefficients in the basis order."""
    if isinstance(v, sympy.MatrixBase):
        entries = list(v)
    else:
        try:
            entries = list(v)
        except TypeError:
            raise AlgebraError("from_coefficient_column needs 8 numbers") from None
    if len(entries) != 8:
        raise AlgebraError(f"from_coefficient_column needs 8 numbers ({', '.join(BASIS_NAMES)}), got {len(entries)}")
    return Multivector({k: _entry(x, "from_coefficient_column") for k, x in enumerate(entries)})


__all__ = [
    "pauli", "from_pauli", "quaternion", "from_quaternion", "rotation_matrix",
    "from_rotation_matrix", "left_matrix", "right_matrix", "coefficient_column",
    "from_coefficient_column",
]

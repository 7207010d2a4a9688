"""Attitude conventions: Euler / Tait-Bryan angles and rotation vectors of rotors.

Conventions (the rotor ones of gacalc.algebra.rotors; README "Attitude"):
- Rotations are active: R turns vectors, x -> R x R~.  The rotation about a coordinate
  axis is rotor(e_k, t) = cos(t/2) - sin(t/2) e_k I (right-hand rule); angles in radians.
- An axis sequence is three axes from x, y, z, neighbours different: six Tait-Bryan
  sequences (all three axes, e.g. zyx) and six proper Euler sequences (first = last, zxz).
- Intrinsic (about the axes as they move): R = R_1(a) R_2(b) R_3(c), read like matrices
  (the first rotation written is applied last to a vector).  Extrinsic (about the fixed
  axes, in the order written): R = R_3(c) R_2(b) R_1(a).  An extrinsic sequence is the
  intrinsic reversed sequence with the angles reversed.  Yaw-pitch-roll is intrinsic zyx.
- Ranges of the result: first and third angle in (-pi, pi]; the middle one in
  [-pi/2, pi/2] (Tait-Bryan) or [0, pi] (proper Euler).
- Gimbal lock: the middle angle at +-pi/2 (Tait-Bryan) or 0, pi (proper Euler); then only
  a sum or difference of the outer angles is fixed.  The third angle is set to 0 and the
  first takes the whole turn (a documented choice; the rotor is reproduced exactly).

The angles are read from the rotation matrix (entries quadratic in R0, R23, R31, R12):
for an intrinsic Tait-Bryan sequence (i, j, k) with s the sign of the permutation,
b = asin(s M[i][k]), a = atan2(-s M[j][k], M[k][k]), c = atan2(-s M[i][j], M[i][i]);
for a proper sequence (i, j, i) with k the remaining axis, b = acos(M[i][i]),
a = atan2(M[j][i], -s M[k][i]), c = atan2(M[i][j], s M[i][k]) (common practice, e.g.
the rotation-matrix tables of attitude handbooks; checked against scipy in the tests).

Rotation vector: theta n with |theta| <= pi for the rotation rotor(n, theta);
from_rotation_vector(v) = exp(-v I/2).
"""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction

import sympy

from .multivector import I, AlgebraError, Multivector, simplified_scalar
from .representations import rotation_matrix
from .rotors import _require_rotor, _vanishes, exp
from .signs import box_of, certified_sign, sign_on

AXIS_NAMES = "xyz"
_BIVECTOR_SLOT = {0: 4, 1: 5, 2: 6}     # e_k I: e1 -> e23, e2 -> e31, e3 -> e12


@dataclass(frozen=True)
class AxisSequence:
    axes: tuple[int, int, int]   # 0, 1, 2 for x, y, z
    intrinsic: bool = True

    @property
    def text(self) -> str:
        return "".join(AXIS_NAMES[k] for k in self.axes)

    @property
    def proper(self) -> bool:
        """A proper Euler sequence (first axis = last axis), else Tait-Bryan."""
        return self.axes[0] == self.axes[2]


def axis_sequence(text: str, intrinsic: bool = True) -> AxisSequence:
    """The sequence of a word such as "zyx"; AlgebraError with the rule when it is not one."""
    word = text.strip()
    if word.lower() != word and len(word) == 3 and all(ch in AXIS_NAMES for ch in word.lower()):
        raise AlgebraError(f"write the axes in lower case, \"{word.lower()}\": whether the "
                           "turns are about the moving or the fixed axes is the word "
                           "\"intrinsic\" (the default) or \"extrinsic\" after it")
    if len(word) != 3 or any(ch not in AXIS_NAMES for ch in word):
        raise AlgebraError(f"an axis sequence is three letters from x, y, z (such as zyx or "
                           f"zxz), not '{text}'")
    axes = tuple(AXIS_NAMES.index(ch) for ch in word)
    if axes[0] == axes[1] or axes[1] == axes[2]:
        raise AlgebraError(f"'{text}' turns twice about one axis in a row: neighbouring axes "
                           "of a sequence differ (zyx, zxz, ...)")
    return AxisSequence(axes, intrinsic)


def axis_rotor(k: int, angle) -> Multivector:
    """rotor(e_k, angle) = cos(angle/2) - sin(angle/2) e_k I."""
    half = sympy.Integer(angle) / 2 if isinstance(angle, int) else angle / 2
    return Multivector({0: sympy.cos(half), _BIVECTOR_SLOT[k]: -sympy.sin(half)})


def from_euler_angles(sequence: AxisSequence, angles) -> Multivector:
    """The rotor of three angles about the axes of the sequence (see the module notes)."""
    factors = [axis_rotor(k, t) for k, t in zip(sequence.axes, angles)]
    if not sequence.intrinsic:
        factors.reverse()
    return factors[0] * factors[1] * factors[2]


def _sign(i: int, j: int, k: int) -> int:
    """Sign of the permutation (i, j, k) of (0, 1, 2)."""
    return 1 if (i, j, k) in ((0, 1, 2), (1, 2, 0), (2, 0, 1)) else -1


@dataclass(frozen=True)
class EulerResult:
    angles: tuple            # three sympy scalars, in the order of the sequence
    locked: int | None       # +1 / -1 at gimbal lock (middle angle at its upper / lower end)
    condition: object        # sympy scalar x: locked where x = 1 or x = -1 (None: never)


def euler_angles(R, sequence: AxisSequence, conditions=(), exact: str = "all") -> EulerResult:
    """The three angles of a rotor for the sequence, with its gimbal-lock state.  ``exact``
    ("all", "middle" or "none") says which numeric angles are tried as the p/q pi they
    may equal: a proof per angle, quick for the middle one (its sine or cosine is a
    matrix entry), up to a few tenths of a second for the outer ones."""
    R = _require_rotor(R, "euler_angles", conditions)
    M = rotation_matrix(R, conditions)
    floats = any(e.has(sympy.Float) for e in M)
    if sequence.intrinsic:
        axes, zero_first = sequence.axes, False
    else:   # the reversed intrinsic sequence, angles reversed: its first angle is our third
        axes, zero_first = tuple(reversed(sequence.axes)), True
    i, j, last = axes
    k = 3 - i - j                                   # the axis the sequence leaves out, or last
    s = _sign(i, j, k)
    x = simplified_scalar(s * M[i, k] if last != i else M[i, i], conditions)
    if floats and x.is_number:
        x = max(min(x, sympy.Float(1)), sympy.Float(-1))
    locked = _lock(x, conditions)
    if last != i:                                   # Tait-Bryan
        middle = sympy.asin(x)
        first = sympy.atan2(-s * M[j, k], M[k, k])
        third = sympy.atan2(-s * M[i, j], M[i, i])
    else:                                           # proper Euler
        middle = sympy.acos(x)
        first = sympy.atan2(M[j, i], -s * M[k, i])
        third = sympy.atan2(M[i, j], s * M[i, k])
    if locked is not None:
        if zero_first:   # M = R_j(b) R_last(c): row j of M is R_last(-c) e_j
            m = 3 - last - j
            first, third = sympy.Integer(0), sympy.atan2(-_sign(last, j, m) * M[j, m], M[j, j])
        else:            # M = R_i(a) R_j(b): column j of M is R_i(a) e_j
            first, third = sympy.atan2(s * M[k, j], M[j, j]), sympy.Integer(0)
        middle = sympy.asin(locked) if last != i else sympy.acos(locked)
    angles = [first, middle, third]
    if floats:
        angles = [sympy.Float(float(sympy.N(a, 17))) for a in angles]
    angles = [_settled(simplified_scalar(a, conditions), conditions) for a in angles]
    tried = {"all": (0, 1, 2), "middle": (1,), "none": ()}[exact]
    angles = [_exact_angle(a, conditions) if position in tried else a
              for position, a in enumerate(angles)]
    if zero_first:
        angles.reverse()
    condition = None if locked is not None or _never_locked(x, conditions) else x
    if condition is not None and condition.could_extract_minus_sign():
        condition = -condition          # "= 1 or -1" reads the same for -x
    return EulerResult(tuple(angles), locked, condition)


def _settled(angle, conditions):
    """atan2(0, x) is 0 or pi once the sign of x is known (cos(b) > 0 on a stated range)."""
    if isinstance(angle, sympy.atan2) and angle.args[0] == 0:
        sign = _sign_of(angle.args[1], conditions)
        if sign is not None:
            return sympy.Integer(0) if sign > 0 else sympy.pi
    return angle


EXACT_DENOMINATOR = 48    # angles p/q pi and p/q tried as exact values up to this q
_INVERSE_TRIG = (sympy.asin, sympy.acos, sympy.atan, sympy.atan2)


def _exact_angle(angle, conditions):
    """A numeric angle such as asin(2 sqrt(1/2 - sqrt(2)/4) sqrt(1/2 + sqrt(2)/4)) as the
    p/q pi (or p/q) it equals: a candidate from its value, kept only when its sine and
    cosine are proved equal to the angle's (the candidate is within 1e-12, so the branch
    is the same).  Anything else is returned unchanged."""
    if angle.free_symbols or angle.has(sympy.Float) or angle.is_Rational \
            or not angle.has(*_INVERSE_TRIG):
        return angle
    try:
        value = float(sympy.N(angle, 30))
    except (TypeError, ValueError):
        return angle
    for unit in (sympy.pi, sympy.Integer(1)):
        ratio = Fraction(value / float(unit)).limit_denominator(EXACT_DENOMINATOR)
        candidate = sympy.Rational(ratio.numerator, ratio.denominator) * unit
        if abs(float(candidate) - value) > 1e-12:
            continue
        # one equation is enough this close: sin where it is locally one-to-one, else cos
        use_sine = isinstance(angle, sympy.asin) or (
            not isinstance(angle, sympy.acos) and abs(float(sympy.cos(candidate))) > 0.5)
        function = sympy.sin if use_sine else sympy.cos
        if _proved_zero(function(angle) - function(candidate), conditions,
                        algebraic=unit is sympy.pi):
            return candidate
    return angle


def _proved_zero(expr, conditions, algebraic: bool) -> bool:
    """A numeric expression proved to be 0: an algebraic number (radicals of p/q pi
    angles) by its minimal polynomial being the variable itself, others by the
    simplifier's canonical form (trigonometric families over their base angle)."""
    if algebraic:
        variable = sympy.Dummy("t")
        try:
            return sympy.minimal_polynomial(expr, variable) == variable
        except (NotImplementedError, ValueError, TypeError,
                sympy.polys.polyerrors.PolynomialError):
            return False
    return _vanishes(expr, conditions) is True


def _lock(x, conditions):
    """+1 / -1 when x is proved to be 1 / -1, else None."""
    if _vanishes(x - 1, conditions) is True:
        return 1
    if _vanishes(x + 1, conditions) is True:
        return -1
    return None


def _never_locked(x, conditions) -> bool:
    """x^2 < 1 proved: numerically, or on the stated ranges of its symbols."""
    gap = 1 - x**2
    if not x.free_symbols:
        if x.has(sympy.Float):
            return abs(float(x)) < 1
        return certified_sign(sympy.expand(gap)) == 1
    box = box_of(conditions)
    if sign_on(1 - x, box) == 1 and sign_on(1 + x, box) == 1:
        return True
    return sign_on(simplified_scalar(gap, conditions), box) == 1   # 1 - sin(b)^2 = cos(b)^2


# Rotation vectors -----------------------------------------------------------------------
@dataclass(frozen=True)
class RotationVector:
    vector: Multivector
    note: str | None      # what the closed form assumes, when the sign of R0 is unknown


def rotation_vector(R, conditions=()) -> RotationVector:
    """theta n with |theta| <= pi for the rotation of R (R and -R give the same vector).

    With v = sin(theta/2) n read from R (v = -<R>2 I^-1) and c = R0:
    theta n = 2 atan2(|v|, c) v/|v| for c >= 0 (R is replaced by -R when c < 0); a half
    turn (c = 0) gives pi v, the rotor's own orientation.  When the sign of c is unknown
    (symbols without ranges) the form 2 atan(|v|/c) v/|v| holds wherever c != 0.
    """
    R = _require_rotor(R, "rotation_vector", conditions)
    v = -(R.grade(2).dual())
    c = simplified_scalar(R[0], conditions)
    if _vanishes(simplified_scalar(v.norm2(), conditions), conditions) is True:
        return RotationVector(Multivector(), None)
    if _vanishes(c, conditions) is True:
        return RotationVector(v.scale(sympy.pi), None)
    sign = _sign_of(c, conditions)
    if sign == -1:
        c, v = -c, -v
    components = [(k, v[k]) for k in (1, 2, 3) if v[k] != 0]
    note = None
    if len(components) == 1:       # one axis: no square root, the sign stays inside
        k, y = components[0]
        theta = 2 * sympy.atan2(y, c) if sign is not None else 2 * sympy.atan(y / c)
        result = Multivector({k: theta})
    else:
        # v = s u with u a unit vector (rotor(n, t): s = sin(t/2), u = n): then
        # theta n = 2 atan2(s, c) u, whatever the sign of s, and no |v| appears
        size, axis = _unit_factor(v, conditions)
        half = sympy.atan2(size, c) if sign is not None else sympy.atan(size / c)
        result = axis.scale(2 * half)
    if sign is None:
        note = ("rotation_vector holds where R0 != 0 (a half turn has two opposite "
                "rotation vectors)")
        symbols = sorted(c.free_symbols, key=str)
        if len(symbols) == 1:       # rotor(n, t): with t's range known, theta is t itself
            note += (f"; with a range such as 'scalar {symbols[0]} in (-pi, pi)' the angle "
                     "reads back as itself")
    result = result.map_coefficients(lambda e: simplified_scalar(e, conditions))
    return RotationVector(result, note)


def _unit_factor(v, conditions):
    """(s, u) with v = s u and u u = 1: the common factor of v's components when what
    remains is a unit vector under the conditions (sin(t/2) n1, sin(t/2) n2, ... with n
    unit) or a constant multiple of one, otherwise |v| and v/|v|."""
    common = sympy.gcd_terms(sympy.Add(*(v[k] for k in (1, 2, 3))), fraction=False)
    factor = sympy.Mul(*[f for f in sympy.Mul.make_args(common) if not f.is_Add])
    if factor != 1:
        axis = v.map_coefficients(lambda e: sympy.cancel(e / factor))
        square = simplified_scalar(axis.norm2(), conditions)
        if _vanishes(square - 1, conditions) is True:
            return factor, axis
        if square.is_number and square.is_positive:      # (3 e1 + 4 e2) sin(t/2)/5
            root = sympy.sqrt(square)
            return factor * root, axis.scale(1 / root)
    size = sympy.sqrt(simplified_scalar(v.norm2(), conditions))
    return size, v.scale(1 / size)


def _sign_of(c, conditions):
    if c.has(sympy.Float) and c.is_number:
        return 1 if float(c) > 0 else -1
    if not c.free_symbols:
        return certified_sign(c)
    return sign_on(c, box_of(conditions))


def from_rotation_vector(v) -> Multivector:
    """The rotor exp(-v I/2): rotor(n, theta) for v = theta n."""
    if not isinstance(v, Multivector) or not v.grades() <= {1}:
        raise AlgebraError("from_rotation_vector needs a vector theta n")
    if v.is_zero():
        return Multivector.scalar(1)
    return exp((v * I).scale(sympy.Rational(-1, 2)))


__all__ = ["AxisSequence", "axis_sequence", "axis_rotor", "from_euler_angles", "euler_angles",
           "EulerResult", "rotation_vector", "RotationVector", "from_rotation_vector"]

"""Rotors of Cl(3,0), the exponential of any multivector, and the logarithm of a rotor.

Conventions (DESIGN.md):
- rotor(B, θ) = exp(−B θ/2) = cos(θ/2) − B sin(θ/2) for a unit bivector B; x ↦ R x R̃
  turns e1 toward e2 for B = e12.  rotor(n, θ) for a unit vector n uses B = n I, the
  right-hand rule about n (rotor(e3, θ) = rotor(e12, θ)).
- Composition is the geometric product, read right to left like matrices: R2 R1 applies
  R1 first, then R2 (rotate(R2 R1, x) = rotate(R2, rotate(R1, x))).
- R and −R give the same rotation; the rotor functions keep the sign (it is the spinor's).

Every function that takes a rotor needs R R̃ = 1.  That is decided exactly (cos² + sin² = 1
and radicals are known relations); symbolic components that are unit only by assumption
(a declared unit vector or rotor) pass when the assumption comes in ``conditions`` (sympy
Exprs that vanish, as gacalc.algebra.symbolic returns them).  Floating-point rotors pass
within 1e-9.  Otherwise AlgebraError, with a plain message.

Branches (all documented in the function docstrings):
- rotor_angle(R) ∈ [0, 2π] and rotor_plane(R) satisfy R = rotor(plane, angle) exactly.
- log(R) is the principal logarithm: the bivector L with exp(L) = R and |L| ∈ [0, π]
  (half the rotation angle).  log(1) = 0; log(−1) = π e12 (any unit plane would do: chosen).
- sqrt(R) = exp(log(R)/2) = (1 + R)/|1 + R|; sqrt(−1) = e12 (the same choice as log).
- power(R, q) = exp(q log R) on that branch; integer q uses exact products.
- slerp takes the shorter arc: R2 is replaced by −R2 when ⟨R̃1 R2⟩₀ < 0.
"""

from __future__ import annotations

from fractions import Fraction

from gacalc.lazy import sympy

from .context import current
from .multivector import as_multivector as _as_multivector, ONE, AlgebraError, I, Multivector, e12, simplified_scalar
from .signs import box_of, certified_sign, sign_on
from .versors import EVEN, _grade_words, classify_versor

FLOAT_TOLERANCE = 1e-9


# ---------------------------------------------------------------------------
# Argument handling


def _scalar_arg(x, what: str, name: str):
    """A real scalar argument (angle, exponent, parameter) as a sympy Expr."""
    if isinstance(x, Multivector):
        if not x.is_scalar():
            raise AlgebraError(f"{what} needs a scalar {name}; got {_grade_words(x.grades())}")
        return x.scalar_part()
    if isinstance(x, bool):
        raise AlgebraError(f"{what} needs a scalar {name}")
    if isinstance(x, int):
        return sympy.Integer(x)
    if isinstance(x, Fraction):
        return sympy.Rational(x.numerator, x.denominator)
    if isinstance(x, float):
        return sympy.Float(x)
    if isinstance(x, sympy.Expr):
        if x.is_number and x.is_real is False:
            raise AlgebraError(f"{what} needs a real {name}")
        return x
    raise AlgebraError(f"{what} needs a scalar {name}; got {type(x).__name__}")


def _text(expr) -> str:
    """ASCII text of a scalar, as the core prints coefficients."""
    texts = Multivector({0: expr}).coefficient_texts()
    return texts[0][1] if texts else "0"


def _simplified(expr):
    """A scalar in canonical form; numeric radicals rationalised and denested where possible."""
    out = simplified_scalar(expr)
    if _small_algebraic(out):
        out = sympy.sqrtdenest(sympy.radsimp(out))
    return out


RADSIMP_MAX_OPS = 40  # radsimp and sqrtdenest grow quickly; beyond this, keep the plain form


def _small_algebraic(expr) -> bool:
    """A short number built from rationals and radicals only (radsimp's safe ground)."""
    if not expr.is_number or not expr.has(sympy.Pow) or expr.has(sympy.Function):
        return False
    return sympy.count_ops(expr) <= RADSIMP_MAX_OPS


def _tidy(mv: Multivector) -> Multivector:
    """Coefficients reduced modulo the generator relations (sqrt(2)^2 -> 2, sin^2 -> 1 - cos^2),
    numeric ones also rationalised: results built from radicals come back in canonical form."""
    reduce = current().simplifier.reduce
    reduced = Multivector.from_coefs(reduce(c) if c is not None else None for c in mv.coefs())
    if not any(_small_algebraic(e) for _, e in reduced.items()):
        return reduced
    return reduced.map_coefficients(lambda e: _simplified(e) if _small_algebraic(e) else e)


def _even_root(w):
    """Some m with m^2 = w (sign not controlled): sqrt(w), with |g| -> g where that stays exact.

    The callers need m only up to sign (cosh m and sinh(m)/m are even), so a polynomial
    square root beats sqrt(g^2) = |g|.
    """
    w = sympy.factor(_simplified(w))
    m = sympy.sqrt(w)
    if m.has(sympy.Abs):
        bare = m.replace(sympy.Abs, lambda arg: arg)
        if sympy.expand(bare**2 - w) == 0:
            return bare
    return _simplified(m) if m.is_number else m


def _vanishes(expr, conditions=()):
    """True / False / None for 'this scalar is zero' (given the conditions)."""
    is_zero = current().simplifier.is_zero
    mv = Multivector({0: expr})
    verdict = is_zero(mv)
    if verdict is True:
        return True
    if expr.has(sympy.Float) and expr.is_number:
        return abs(complex(sympy.N(expr))) < FLOAT_TOLERANCE
    if conditions:
        verdict = is_zero(mv, conditions)
        if verdict is True:
            return True
    if not expr.free_symbols:
        return verdict
    return None if verdict is False else verdict  # symbolic: "not identically zero" is not "nonzero"


def _unit_verdict(mv: Multivector, conditions=()):
    return _vanishes(mv.norm2() - 1, conditions)


def _require_unit(mv: Multivector, what: str, noun: str, conditions=(), hint: str = ""):
    if _unit_verdict(mv, conditions) is True:
        return
    n2 = _simplified(mv.norm2())
    if not n2.free_symbols:
        if n2 == 0:
            raise AlgebraError(f"{what} needs {noun}; got 0")
        raise AlgebraError(f"{what} needs {noun}; this one has norm "
                           f"{_text(_simplified(sympy.sqrt(n2)))}"
                           + (" (divide it by its norm)" if hint else ""))
    if sympy.count_ops(n2) <= 200:
        n2 = sympy.factor(n2)  # (R0^2 + ...)*(Q0^2 + ...) reads better than its expansion
    raise AlgebraError(f"{what} needs {noun}; cannot tell that {_text(n2)} = 1{hint}")


def _require_rotor(R, what: str, conditions=()) -> Multivector:
    """R as an even multivector with R R~ = 1, or AlgebraError."""
    R = _as_multivector(R, what)
    grades = R.grades()
    if not all(g % 2 == 0 for g in grades):
        if classify_versor(R) != EVEN:
            raise AlgebraError(f"{what} needs a rotor (even, with R R~ = 1); got {_grade_words(grades)}")
        R = R.even()
    _require_unit(R, what, "a rotor (even, with R R~ = 1)", conditions)
    return R


def _normalized(mv: Multivector) -> Multivector:
    """mv / |mv|, written as mv |mv| / |mv|^2 so numeric radicals land in the numerator."""
    n2 = _simplified(mv.norm2())
    if n2 == 1:
        return mv
    return _tidy(mv.scale(_simplified(sympy.sqrt(n2) / n2)))


# ---------------------------------------------------------------------------
# Construction


def rotor(B_or_n, theta, conditions=()) -> Multivector:
    """exp(−B θ/2) = cos(θ/2) − B sin(θ/2) for a unit bivector B, or B = n I for a unit vector n."""
    X = _as_multivector(B_or_n, "rotor")
    theta = _scalar_arg(theta, "rotor", "angle")
    grades = X.grades()
    if grades == {1}:
        B = X * I
    elif grades == {2}:
        B = X
    else:
        got = "0" if not grades else _grade_words(grades)
        raise AlgebraError(f"rotor needs a unit bivector or a unit vector; got {got}")
    # the angle is measured in the unit plane: a longer n would scale it, so no silent
    # normalising here (rotor(a, b) takes directions, so it normalises and says so)
    _require_unit(X, "rotor", "a unit bivector or a unit vector", conditions,
                  " (declare it unit, as in vector n unit, or divide it by its norm)")
    half = theta / 2
    return Multivector({0: sympy.cos(half)}) - B.scale(sympy.sin(half))


def _unit_direction(v: Multivector, what: str, conditions) -> Multivector:
    """v itself when it is known to be unit, else v/|v|; AlgebraError unless a nonzero vector."""
    if v.grades() != {1}:
        got = "0" if v.is_zero() else _grade_words(v.grades())
        raise AlgebraError(f"{what} needs two nonzero vectors; got {got}")
    if _unit_verdict(v, conditions) is True:
        return v
    if _vanishes(v.norm2()) is True:
        raise AlgebraError(f"{what} needs two nonzero vectors; got 0")
    return _normalized(v)


def rotor_between(a, b, conditions=()):
    """(R, arbitrary): the rotor in the plane of a and b that turns the direction of a into b's.

    R = (1 + b a)/|1 + b a| with a, b normalised first (the product b a, not a b, makes
    R a R~ = b for unit vectors); for unit vectors |1 + b a|² = 2(1 + a·b).  When a and b
    are opposite every plane containing a works: the plane of a and the basis vector least
    aligned with it is chosen, R = −B (a half turn), and ``arbitrary`` is True.  For
    symbolic vectors the closed form holds wherever they are not opposite.
    """
    what = "rotor_between"
    a, b = _as_multivector(a, what), _as_multivector(b, what)
    if lengths_unknown(a, b, conditions):
        return _rotor_between_lengths(a, b, what, conditions)
    a = _unit_direction(a, what, conditions)
    b = _unit_direction(b, what, conditions)
    s = _simplified(1 + a.scalar_product(b)[0])
    if _vanishes(s) is True:
        return _half_turn_about(a, what), True
    k = _simplified(sympy.sqrt(2 * s) / (2 * s))
    return _tidy((ONE + b * a).scale(k)), False


def lengths_unknown(a, b, conditions) -> bool:
    """Symbolic vectors not known to be unit: their rotor keeps the lengths in one place."""
    symbolic = any(e.free_symbols for v in (a, b) for _, e in v.items())
    return symbolic and a.grades() == b.grades() == {1} and not all(
        _unit_verdict(v, conditions) is True for v in (a, b))


def _rotor_between_lengths(a, b, what, conditions):
    """R = (|a| |b| + b a)/sqrt(2 |a| |b| (|a| |b| + a.b)): the unit-vector formula
    (1 + b^ a^)/sqrt(2 (1 + a^.b^)) multiplied through by |a| |b|, so the lengths appear
    once in the numerator's scalar and once in the shared denominator (the norm of the
    numerator).  Valid where a, b != 0 and they are not opposite (|a| |b| + a.b != 0)."""
    for v in (a, b):
        if _vanishes(v.norm2(), conditions) is True:
            raise AlgebraError(f"{what} needs two nonzero vectors; got 0")
    # |a| |b| from the factored product: b = 2 a gives 2 |a|^2, not sqrt(4 |a|^2) |a|
    lengths = _simplified(sympy.sqrt(sympy.factor(a.norm2() * b.norm2())))
    s = _simplified(lengths + a.scalar_product(b)[0])
    if _vanishes(s, conditions) is True:
        return _half_turn_about(_normalized(a), what), True
    numerator = Multivector({0: lengths}) + b * a
    return _tidy(numerator.scale(1 / sympy.sqrt(2 * lengths * s))), False


def _half_turn_about(a: Multivector, what: str) -> Multivector:
    """A half-turn rotor in a plane containing the unit vector a (a ↦ −a)."""
    comps = [a[k] for k in (1, 2, 3)]
    if any(c.free_symbols for c in comps):
        raise AlgebraError(
            f"{what}: the vectors are opposite and symbolic, so no single perpendicular plane "
            "can be chosen; give the plane B and use rotor(B, pi)"
        )
    k = min(range(3), key=lambda i: abs(float(sympy.N(comps[i]))))  # first of the least aligned
    basis = Multivector({k + 1: 1})
    B = _normalized(a.outer(basis))
    return -B  # rotor(B, pi) = cos(pi/2) - B sin(pi/2)


def rotate(R, x, conditions=()) -> Multivector:
    """R x R~ for a rotor R and any multivector x (vectors rotate; scalars and I stay)."""
    R = _require_rotor(R, "rotate", conditions)
    x = _as_multivector(x, "rotate")
    return R * x * R.rev()


# ---------------------------------------------------------------------------
# Angle, plane, axis, logarithm


def rotor_angle(R, conditions=()):
    """The angle θ ∈ [0, 2π] with R = rotor(rotor_plane(R), θ): 2 atan2(|⟨R⟩₂|, ⟨R⟩₀).

    θ and the plane together describe the rotor, sign included: −rotor(B, θ) has angle
    2π − θ in the plane −B.  The rotation it performs turns by θ (mod 2π).
    """
    R = _require_rotor(R, "rotor_angle", conditions)
    b = R.grade(2)
    return _simplified(2 * sympy.atan2(b.norm(), R[0]))


def rotor_plane(R, conditions=()) -> Multivector:
    """The unit bivector B with R = cos(θ/2) − B sin(θ/2), sin(θ/2) ≥ 0: −⟨R⟩₂/|⟨R⟩₂|."""
    R = _require_rotor(R, "rotor_plane", conditions)
    b = R.grade(2)
    if _vanishes(b.norm2(), conditions) is True:
        raise AlgebraError("rotor_plane: the rotor is 1 or -1, which turns nothing and has no plane")
    return -_normalized(b)


def rotor_axis(R, conditions=()) -> Multivector:
    """The unit vector n with R = rotor(n, rotor_angle(R)): the plane's dual, n = B I⁻¹."""
    return rotor_plane(R, conditions).dual()


def _log_parts(R: Multivector, conditions=()):
    """(φ, B̂) with R = cos φ + B̂ sin φ, φ ∈ [0, π], B̂ a unit bivector (None when φ = 0)."""
    b = R.grade(2)
    c = R[0]
    if _vanishes(b.norm2(), conditions) is True:
        if _vanishes(c - 1, conditions) is True:
            return sympy.Integer(0), None
        if _vanishes(c + 1, conditions) is True:
            return sympy.pi, e12  # log(-1): every unit plane gives exp(pi B) = -1; e12 is our choice
        raise AlgebraError("log: cannot tell whether the rotor is 1 or -1")
    phi = _simplified(sympy.atan2(b.norm(), c))
    return phi, _normalized(b)


def log(R, conditions=()) -> Multivector:
    """Principal logarithm of a rotor: the bivector L with exp(L) = R and |L| ∈ [0, π].

    L = φ B̂ for R = cos φ + B̂ sin φ, φ = atan2(|⟨R⟩₂|, ⟨R⟩₀).  So log(rotor(B, θ)) = −B θ/2
    for 0 ≤ θ ≤ 2π.  log(1) = 0 and log(−1) = π e12 (a documented choice: every plane works).
    """
    R = _require_rotor(R, "log", conditions)
    phi, B = _log_parts(R, conditions)
    if B is None:
        return Multivector()
    return _tidy(B.scale(phi))


def sqrt(R, conditions=()) -> Multivector:
    """Principal square root exp(log(R)/2) = (1 + R)/|1 + R|, with |1 + R|² = 2(1 + ⟨R⟩₀).

    It is the rotor of half the angle in the same plane.  sqrt(−1) = e12, matching log(−1).
    """
    R = _require_rotor(R, "sqrt", conditions)
    c = R[0]
    if _vanishes(c + 1, conditions) is True:
        return e12
    s = _simplified(1 + c)
    return _tidy((ONE + R).scale(_simplified(sympy.sqrt(2 * s) / (2 * s))))


def _power(R: Multivector, q, conditions=()) -> Multivector:
    if q.is_Integer:
        n = int(q)
        return R ** n if n >= 0 else R.rev() ** (-n)  # R^-1 = R~ for a unit rotor
    phi, B = _log_parts(R, conditions)
    if B is None:
        return ONE
    return _tidy(Multivector({0: sympy.cos(q * phi)}) + B.scale(sympy.sin(q * phi)))


def power(R, q, conditions=()) -> Multivector:
    """R^q = exp(q log R) on the principal branch of log; exact products for integer q.

    q is any real scalar (rational, or a symbol such as a time).  power(−1, q) uses
    log(−1) = π e12: cos(qπ) + e12 sin(qπ).
    """
    R = _require_rotor(R, "power", conditions)
    return _power(R, _scalar_arg(q, "power", "exponent"), conditions)


def slerp(R1, R2, t, conditions=()) -> Multivector:
    """Spherical linear interpolation R1 (R̃1 R2)^t on the shorter arc.

    t = 0 gives R1, t = 1 gives R2 (or −R2, the same rotation, when the arc was flipped).
    Shorter arc: when ⟨R̃1 R2⟩₀ < 0, R2 is replaced by −R2.  With symbolic rotors that
    sign is proved on the ranges among the conditions; when it cannot be decided, the
    rotors are used as given.
    """
    R1 = _require_rotor(R1, "slerp", conditions)
    R2 = _require_rotor(R2, "slerp", conditions)
    t = _scalar_arg(t, "slerp", "parameter")
    D = R1.rev() * R2
    d0 = _simplified(D[0])
    if d0.free_symbols:
        # a sign proved on the stated ranges (scalar t in (pi, 2 pi)), else sympy's own
        proved = sign_on(d0, box_of(conditions))
        negative = proved == -1 if proved is not None else d0.is_negative
    else:
        negative = certified_sign(d0) == -1  # a proved sign; an undecided one keeps R2
    if negative is True:
        D = -D
    return _tidy(R1 * _power(D, t, conditions))


# ---------------------------------------------------------------------------
# Exponential


def _common_factor(F: Multivector):
    """(s, F0) with F = s F0 and F0 numeric, when the coefficients share a symbolic factor."""
    items = F.items()
    if not F.free_symbols:
        return sympy.Integer(1), F
    first = items[0][1]
    ratios = {k: sympy.cancel(c / first) for k, c in items}
    if all(r.is_number for r in ratios.values()):
        return first, Multivector(ratios)
    return sympy.Integer(1), F


def _centre(re, im) -> Multivector:
    """The central element re + im I (the centre {1, I} acts like the complex numbers)."""
    return Multivector({0: re, 7: im})


def _exp_noncentral(F: Multivector) -> Multivector:
    """exp(F) for F = a + I b (vector and bivector parts): cosh λ + F sinh(λ)/λ, λ² = F².

    F² = a·a − b·b + 2 (a·b) I is central.  cosh λ and sinh(λ)/λ are even in λ, so either
    square root in the centre gives the same result.  Cases:
    - F² = 0 (F nilpotent, e.g. e1 + e12): exp(F) = 1 + F.
    - F² real and ≥ 0: cosh/sinh of √(F²); F² real and ≤ 0: cos/sin of √(−F²).
      A numeric unit-free direction F0 with F = s F0 gives the forms of s directly
      (exp(θ e12) = cos θ + e12 sin θ with no |θ|).
    - F² = p + q I with q ≠ 0: λ = x + i y with x² = (|F²| + p)/2, y = q/(2x); for
      numbers x and y = sign(q) √((|F²| − p)/2) are both taken as single radicals, for
      symbols x is any polynomial root (its sign does not matter, y follows it).
      For symbolic F this form is valid away from F² ≤ 0 real (where x = 0).
    - F² real of unknown sign: cosh(√p) and sinh(√p)/√p are real for either sign.
    """
    if F.is_zero():
        return ONE
    s, F0 = _common_factor(F)
    sq = F0 * F0
    if not sq.grades() <= {0, 3}:
        raise AlgebraError("exp: internal error, F^2 is not central")  # cannot happen in Cl(3,0)
    p, q = _simplified(sq[0]), _simplified(sq[7])
    if _vanishes(q) is True:
        if _vanishes(p) is True:
            return ONE + F
        if p.is_nonpositive:
            m = _even_root(-p)
            return Multivector({0: sympy.cos(s * m)}) + F0.scale(sympy.sin(s * m) / m)
        m = _even_root(p)  # p >= 0, or of unknown sign: cosh(sqrt p), sinh(sqrt p)/sqrt p stay real
        return Multivector({0: sympy.cosh(s * m)}) + F0.scale(sympy.sinh(s * m) / m)
    r = _simplified(sympy.sqrt(sympy.factor(p**2 + q**2)))
    x = _even_root((r + p) / 2)  # any x with x^2 = (r + p)/2 will do: y follows its sign
    if q.is_number:
        x = _simplified(sympy.sqrt((r + p) / 2))  # the positive roots: 2 x y = q
        y = sympy.sign(q) * _simplified(sympy.sqrt((r - p) / 2))
    else:
        y = _simplified(q / (2 * x))
    sx, sy = s * x, s * y
    ch, sh, co, si = sympy.cosh(sx), sympy.sinh(sx), sympy.cos(sy), sympy.sin(sy)
    cosh_re, cosh_im = ch * co, sh * si  # cosh(s λ)
    sinh_re, sinh_im = sh * co, ch * si  # sinh(s λ)
    # sinh(s λ) / λ = sinh(s λ) conj(λ) / |λ|², and |λ|² = x² + y² = r
    t_re = _simplified((sinh_re * x + sinh_im * y) / r)
    t_im = _simplified((sinh_im * x - sinh_re * y) / r)
    return _tidy(_centre(cosh_re, cosh_im) + F0 * _centre(t_re, t_im))


def exp(A) -> Multivector:
    """exp of any multivector of Cl(3,0), in closed form.

    A = z + F with z = α + β I central and F = ⟨A⟩₁ + ⟨A⟩₂; z commutes with F, so
    exp(A) = e^α (cos β + I sin β) · exp(F).  For a bivector B this is the familiar
    cos|B| + B sin|B| / |B| (B² = −|B|² in Cl(3,0)).
    """
    A = _as_multivector(A, "exp")
    alpha, beta = A[0], A[7]
    F = A.grade(1) + A.grade(2)
    out = _exp_noncentral(F)
    if beta != 0:
        out = _centre(sympy.cos(beta), sympy.sin(beta)) * out
    if alpha != 0:
        out = out.scale(sympy.exp(alpha))
    return out


__all__ = [
    "rotor", "rotor_between", "rotate", "rotor_angle", "rotor_plane", "rotor_axis",
    "exp", "log", "sqrt", "power", "slerp",
]

"""Side conditions: reduction modulo a Gröbner basis of the conditions and the generator relations.

A condition is a sympy Expr that vanishes on the allowed set ("n is a unit vector":
n1^2 + n2^2 + n3^2 - 1; "a ⟂ b": a1*b1 + a2*b2 + a3*b3).  The ideal used for reduction holds

- the numerator of every condition, written in the coefficient domain after the generator
  relations (each trig family over one base angle, sin^2 -> 1 - cos^2, radical^n -> base);
- cos(g u)^2 + sin(g u)^2 - 1 for every trig family of the conditions, over a base angle g u
  that both the conditions and the polynomial being reduced are rewritten over;
- r^n - base for the radicals of the conditions, and for radicals of the reduced
  polynomial whose base involves the conditions' generators.

Trig families and radicals of a polynomial that do not touch the conditions need nothing:
their relations have leading terms in variables of their own, so the relations module
already reduced them (Buchberger's first criterion: coprime leading terms).

Monomial order: graded reverse lexicographic (grevlex), the usual choice for degree-bounded
results.  The variables run, highest first: radicals, real symbols (in order of first use,
so n1 > n2 > n3), sines, cosines, other atoms (pi, exp(x), ...).  Consequences a user sees:
n1^2 + n2^2 + n3^2 -> 1 (n1^2 is rewritten, a quadric never grows the degree);
sin(u)^2 -> 1 - cos(u)^2 as in the relations module; a symbol tied to a trig value or to
a constant is eliminated in its favour (t = cos(theta) turns t into cos(theta),
theta = pi/2 turns theta into pi/2).  The normal form modulo a Gröbner basis is unique, so
"reduces to zero" decides membership in the ideal.  A nonzero remainder is then made short:
when the basis is small, the orders that put another condition symbol first (n2, then n3)
are tried too and the remainder with the fewest terms is kept, so each coefficient of a
rotated vector keeps the components it naturally has (Rodrigues' formula comes out as
printed in the books).  Zero under one order is zero under all, so zero tests are unchanged.

Generators whose arguments involve the conditions are rebuilt from reduced arguments when
those are no longer (sqrt(n1^2 + n2^2 + n3^2) -> 1, cos(theta) given theta = pi/3 -> 1/2).

Semantics: every polynomial of the ideal vanishes wherever the conditions hold, so reduction
to zero proves an identity on that set.  Generators are treated as independent otherwise,
which can only make fewer identities provable, never a false one.  The converse direction
(a nonzero remainder) is not a proof of failure: ``decide`` looks for a real witness point.
An inconsistent set (Gröbner basis {1}, or a member that is a positive sum of even powers)
raises InconsistentConditionsError instead of proving everything.

Speed: bases are cached per condition tuple and per base-angle choice; reduction itself is
flint's multivariate division (divrem by each basis element until nothing changes) in a
context with the same grevlex order, so only the basis computation goes through sympy.
"""

from __future__ import annotations

import random
from collections import OrderedDict
from functools import reduce as _fold
from math import gcd

import flint
import mpmath
import sympy

from gacalc.algebra.coefficients import REGISTRY, Coef, DomainError, ascii_text, from_expr, trig
from gacalc.algebra.multivector import AlgebraError

from .budget import Budget
from .relations import MAX_MULTIPLE, _multiple_angle, reduce_poly_relations, substitute

ORDER = "grevlex"  # sympy's name; flint's is 'degrevlex' (the same order, checked in the tests)
_FLINT_ORDER = "degrevlex"
_KIND_RANK = {"root": 0, "symbol": 1, "sin": 2, "cos": 3, "other": 4}
_CACHE_SIZE = 64
_MAX_ARGUMENT_DEPTH = 2  # generators inside generator arguments inside ...
MAX_ALTERNATIVE_ORDERS = 3  # extra orders tried for a shorter nonzero remainder ...
MAX_BASIS_FOR_ALTERNATIVES = 8  # ... when the default basis is this small (each costs a basis)


class ConditionError(AlgebraError):
    """A side condition that cannot be used (not a real scalar equation, or inexact)."""


class InconsistentConditionsError(ConditionError):
    """The side conditions cannot hold together; they must not be used to prove anything."""

    def __init__(self, message, conditions=()):
        super().__init__(message)
        self.conditions = tuple(conditions)


# ---------------------------------------------------------------------------
# Small helpers on registry polynomials


def _used(p) -> list[int]:
    return [pos for pos, d in enumerate(REGISTRY.lift(p).degrees()) if d > 0 and pos > 0]


def _info(pos):
    return REGISTRY.info(pos)


def _var_key(pos, promote=None):
    return (_KIND_RANK.get(_info(pos).kind, 4), 0 if pos == promote else 1, pos)


def _terms(c: Coef) -> int:
    return len(c.num) + (len(c.den) if c.den is not None else 0)


def _per_part(c: Coef, fn) -> Coef:
    """fn (registry polynomial -> Coef) applied to numerator and denominator separately."""
    num, den = c._parts()
    out = fn(num)
    if den is None:
        return out
    d = fn(den)
    if d.is_zero():  # the denominator vanishes on the condition set: leave it as it was
        d = Coef(den)
    return out / d


def _rational_gcd(qs):
    nums = [int(q.p) for q in qs]
    dens = [int(q.q) for q in qs]
    lcm = _fold(lambda a, b: a * b // gcd(a, b), dens, 1)
    return sympy.Rational(_fold(gcd, nums), lcm)


def _families(p) -> dict:
    """{base u: set of q} for the trig generators cos(q u), sin(q u) used by p."""
    fams = {}
    for pos in _used(p):
        info = _info(pos)
        if info.kind in ("cos", "sin"):
            q, u = info.trig
            fams.setdefault(u, set()).add(q)
    return fams


def _radicals(p) -> set[int]:
    return {pos for pos in _used(p) if _info(pos).kind == "root"}


def _align(p, angles: dict, budget) -> Coef:
    """Rewrite the trig generators of p whose base u is in ``angles`` over the angle angles[u] u."""
    subs = {}
    for pos in _used(p):
        info = _info(pos)
        if info.kind not in ("cos", "sin"):
            continue
        q, u = info.trig
        g = angles.get(u)
        if g is None or q == g:
            continue
        m = q / g
        if not m.is_Integer or m > MAX_MULTIPLE:
            continue  # not a small multiple: left as an independent generator (sound, weaker)
        c, s = trig("cos", g * u), trig("sin", g * u)
        cm, sm = _multiple_angle(c, s, int(m))
        subs[pos] = cm if info.kind == "cos" else sm
    if not subs:
        return Coef(REGISTRY.lift(p))
    return substitute(p, subs, budget)


def _relations(p, budget) -> Coef:
    return reduce_poly_relations(REGISTRY.lift(p), budget)


def _never_zero_over_reals(p) -> bool:
    """A positive constant plus even powers with positive coefficients: no real zero."""
    p = REGISTRY.lift(p)
    if p.is_zero():
        return False
    has_positive_constant = False
    for monom, coeff in zip(p.monoms(), p.coeffs()):
        if coeff <= 0 or any(e % 2 for e in monom):
            return False
        if not any(monom):
            has_positive_constant = True
    return has_positive_constant


def _to_fmpq(c):
    return flint.fmpq(int(c.numerator), int(c.denominator))


# ---------------------------------------------------------------------------
# A reduced Gröbner basis in a context of its own


class _Basis:
    """A reduced grevlex Gröbner basis over some generators, and reduction modulo it."""

    def __init__(self, polys, angles: dict, budget, promote=None):
        self.angles = dict(angles)
        self.promote = promote
        positions = set()
        for p in polys:
            positions.update(_used(p))
        self.positions = sorted(positions, key=lambda pos: _var_key(pos, promote))
        self.position_set = frozenset(self.positions)
        self.names = tuple(_info(pos).name for pos in self.positions)
        self.is_unit = False
        self.polys = []
        self._projected = OrderedDict()  # basis copies in contexts with a polynomial's extra generators
        if not self.positions:
            # only constants: consistent iff all are zero
            self.is_unit = any(not REGISTRY.lift(p).is_zero() for p in polys)
            return
        self.ctx = flint.fmpq_mpoly_ctx.get(self.names, _FLINT_ORDER)
        local = [REGISTRY.lift(p).project_to_context(self.ctx) for p in polys]
        self.polys = groebner_flint(local, self.ctx, budget)
        self.is_unit = any(g.is_constant() and not g.is_zero() for g in self.polys)

    def exprs(self):
        """The basis as sympy Exprs (for messages and inspection)."""
        out = []
        for g in self.polys:
            out.append(Coef(g.project_to_context(REGISTRY.ctx)).to_expr())
        return out

    def registry_polys(self):
        return [g.project_to_context(REGISTRY.ctx) for g in self.polys]

    def touches(self, p) -> bool:
        return not self.position_set.isdisjoint(_used(p))

    def _context_for(self, p):
        extras = sorted(set(_used(p)) - self.position_set, key=_var_key)  # placement is immaterial
        names = self.names + tuple(_info(pos).name for pos in extras)
        found = self._projected.get(names)
        if found is None:
            ctx = flint.fmpq_mpoly_ctx.get(names, _FLINT_ORDER)
            found = (ctx, [g.project_to_context(ctx) for g in self.polys])
            self._projected[names] = found
            if len(self._projected) > _CACHE_SIZE:
                self._projected.popitem(last=False)
        return found

    def normal_form(self, p, budget=None):
        """The remainder of p (a registry polynomial) modulo the basis, as a registry polynomial."""
        p = REGISTRY.lift(p)
        if not self.polys or not self.touches(p):
            return p
        ctx, basis = self._context_for(p)
        q = p.project_to_context(ctx)
        changed = True
        while changed and not q.is_zero():
            changed = False
            for g in basis:
                if budget is not None:
                    budget.check()
                r = q % g  # flint divrem: no term of r is divisible by the leading term of g
                if r != q:
                    q, changed = r, True
                    if q.is_zero():
                        break
        return q.project_to_context(REGISTRY.ctx)


def groebner_flint(polys, ctx, budget=None):
    """Reduced grevlex Gröbner basis (sympy) of flint polynomials, returned in the same context."""
    polys = [p for p in polys if not p.is_zero()]
    if not polys:
        return []
    if budget is not None:
        budget.check()
    gens = sympy.symbols(f"x0:{ctx.nvars()}", cls=sympy.Dummy)
    sympy_polys = [
        sympy.Poly.from_dict(
            {tuple(m): sympy.Rational(int(c.p), int(c.q)) for m, c in zip(p.monoms(), p.coeffs())},
            *gens,
            domain=sympy.QQ,
        )
        for p in polys
    ]
    basis = sympy.groebner(sympy_polys, *gens, order=ORDER, domain=sympy.QQ)
    out = []
    for g in basis.polys:
        out.append(ctx.from_dict({tuple(m): _to_fmpq(c) for m, c in g.terms()}))
    return out


# ---------------------------------------------------------------------------
# The condition set


def _condition_text(expr) -> str:
    """'lhs = 0' in the coefficients' own text (terms by degree, valid gacalc input)."""
    try:
        c = from_expr(expr)
        text = c.text() if c.expr is None else ascii_text(expr)
    except (DomainError, TypeError):
        text = ascii_text(expr) if isinstance(expr, sympy.Basic) else repr(expr)
    return f"{text} = 0"


def _condition_numerator(expr):
    """The numerator of a condition in the coefficient domain, or ConditionError."""
    if isinstance(expr, sympy.Equality):
        expr = expr.lhs - expr.rhs
    if isinstance(expr, int):
        expr = sympy.Integer(expr)
    if not isinstance(expr, sympy.Expr):
        raise ConditionError(f"a side condition is a scalar expression equal to zero; got {expr!r}")
    try:
        c = from_expr(expr)
    except DomainError as exc:
        raise ConditionError(f"cannot use {_condition_text(expr)} as a condition: {exc}") from None
    if c.expr is not None:
        raise ConditionError(f"a side condition must be exact (no floating-point numbers): {_condition_text(expr)}")
    return REGISTRY.lift(c.num)


class ConditionSet:
    """The ideal of a tuple of side conditions; ``reduce`` is the hook gacalc.simplify calls."""

    _cache: "OrderedDict[tuple, ConditionSet | InconsistentConditionsError]" = OrderedDict()

    @classmethod
    def of(cls, conditions) -> "ConditionSet":
        key = tuple(conditions or ())
        found = cls._cache.get(key)
        if found is None:
            try:
                found = cls(key)
            except InconsistentConditionsError as exc:
                found = exc
            cls._cache[key] = found
            if len(cls._cache) > _CACHE_SIZE:
                cls._cache.popitem(last=False)
        else:
            cls._cache.move_to_end(key)
        if isinstance(found, InconsistentConditionsError):
            raise InconsistentConditionsError(str(found), found.conditions)
        return found

    def __init__(self, conditions=(), budget: Budget | None = None):
        self.conditions = tuple(conditions)
        polys = []
        for expr in self.conditions:
            num = _condition_numerator(expr)
            reduced = _relations(num, budget)
            p = REGISTRY.lift(reduced.num)
            if p.is_zero():
                continue  # holds identically (0 = 0, cos^2 + sin^2 = 1, ...)
            if p.is_constant() or _never_zero_over_reals(p):
                self._inconsistent()
            polys.append(p)
        self.polys = polys
        # one base angle per trig family of the conditions: the rational gcd of its multiples
        fams = {}
        for p in polys:
            for u, qs in _families(p).items():
                fams.setdefault(u, set()).update(qs)
        self.angles = {u: _rational_gcd(sorted(qs)) for u, qs in fams.items()}
        self._bases: "OrderedDict[tuple, _Basis]" = OrderedDict()
        self._argument_cache: dict = {}
        self.basis = self._basis(self.angles, frozenset(), budget)
        if self.basis.is_unit or any(_never_zero_over_reals(g) for g in self.basis.registry_polys()):
            self._inconsistent()

    def _inconsistent(self):
        listed = ", ".join(_condition_text(c) for c in self.conditions)
        raise InconsistentConditionsError(
            f"the conditions {listed} cannot hold together (inconsistent); nothing is proved from them",
            self.conditions,
        )

    def __bool__(self):
        return bool(self.polys)

    def __repr__(self):
        return f"ConditionSet({', '.join(_condition_text(c) for c in self.conditions)})"

    def basis_exprs(self) -> list:
        """The reduced Gröbner basis of the conditions (with their relations), as sympy Exprs."""
        return self.basis.exprs()

    # -- bases per base-angle choice and radical set ---------------------------------------

    def _basis(self, angles: dict, roots: frozenset, budget, promote=None) -> _Basis:
        key = (frozenset(angles.items()), roots, promote)
        found = self._bases.get(key)
        if found is not None:
            self._bases.move_to_end(key)
            return found
        angles = dict(angles)
        for attempt in range(4):  # radical bases can bring trig families of their own: refine, redo
            polys, new_fams = self._ideal_polys(angles, roots, budget)
            refined = dict(angles)
            for u, qs in new_fams.items():
                refined[u] = _rational_gcd(sorted(qs | ({angles[u]} if u in angles else set())))
            if refined == angles or attempt == 3:
                break  # polys are written over ``angles``
            angles = refined
        basis = _Basis(polys, angles, budget, promote)
        self._bases[key] = basis
        if len(self._bases) > _CACHE_SIZE:
            self._bases.popitem(last=False)
        return basis

    def _ideal_polys(self, angles, roots, budget):
        """Generators of the ideal over the given base angles; also families left unaligned."""
        polys = []
        for p in self.polys:
            c = _per_part(_align(p, angles, budget), lambda q: _relations(q, budget))
            polys.append(REGISTRY.lift(c.num))
        pending = set(roots)
        for p in polys:
            pending |= _radicals(p)
        related = set()
        while pending:
            pos = pending.pop()
            if pos in related:
                continue
            related.add(pos)
            base, n = _info(pos).root
            base = _per_part(base, lambda q: _per_part(_align(q, angles, budget), lambda r: _relations(r, budget)))
            num, den = base._parts()
            r = REGISTRY.ctx.gens()[pos]
            rel = r**n * (den if den is not None else REGISTRY.ctx.constant(1)) - num
            polys.append(REGISTRY.lift(rel))
            pending |= _radicals(num) | (_radicals(den) if den is not None else set())
        new_fams = {}  # families the angles do not cover (a radical's base can bring them)
        for p in polys:
            for u, qs in _families(p).items():
                g = angles.get(u)
                if g is None or any(not (q / g).is_Integer for q in qs):
                    new_fams.setdefault(u, set()).update(qs)
        for u, g in angles.items():
            c, s = trig("cos", g * u), trig("sin", g * u)
            if c.is_constant() or s.is_constant() or len(c.num) != 1 or len(s.num) != 1:
                continue  # sympy knows the values: no generator pair to relate
            polys.append(REGISTRY.lift(c.num) ** 2 + REGISTRY.lift(s.num) ** 2 - 1)
        return polys, new_fams

    def _basis_for(self, p, budget, promote=None) -> _Basis:
        """The basis to reduce p with: base angles fine enough for p, p's radicals related."""
        angles = dict(self.angles)
        for u, qs in _families(p).items():
            if u in angles:
                g = _rational_gcd(sorted(qs | {angles[u]}))
                if max(q / g for q in qs | {angles[u]}) <= MAX_MULTIPLE:
                    angles[u] = g
        roots = frozenset()
        basis = self._basis(angles, roots, budget)
        for _ in range(4):
            touching = frozenset(
                pos
                for pos in _radicals(p)
                if pos not in basis.position_set and self._root_touches(pos, basis)
            )
            if touching <= roots:
                break
            roots = roots | touching
            basis = self._basis(angles, roots, budget)
        if promote is not None:
            basis = self._basis(angles, roots, budget, promote)
        return basis

    @staticmethod
    def _root_touches(pos, basis: _Basis) -> bool:
        base, _ = _info(pos).root
        num, den = base._parts()
        used = set(_used(num)) | (set(_used(den)) if den is not None else set())
        if not basis.position_set.isdisjoint(used):
            return True
        return any(_info(q).kind in ("cos", "sin") and _info(q).trig[1] in basis.angles for q in used)

    # -- reduction -----------------------------------------------------------------------------

    def reduce(self, c: Coef, budget: Budget | None = None) -> Coef:
        """c modulo the conditions: numerator and denominator reduced separately."""
        if c is None or c.expr is not None or not self.polys:
            return c
        return _per_part(c, lambda p: self._reduce_poly(p, budget, 0))

    def reduce_expr(self, expr, budget: Budget | None = None):
        """A sympy scalar reduced modulo the conditions, as a sympy Expr."""
        return self.reduce(from_expr(expr), budget).to_expr()

    def _reduce_poly(self, p, budget, depth) -> Coef:
        p = REGISTRY.lift(p)
        if p.is_constant():
            return Coef(p)
        c = self._reduce_arguments(p, budget, depth)
        return _per_part(c, lambda q: _per_part(_relations(q, budget), lambda r: self._modulo_basis(r, budget)))

    def _modulo_basis(self, p, budget) -> Coef:
        p = REGISTRY.lift(p)
        if p.is_constant() or not self._may_touch(p):
            return Coef(p)
        basis = self._basis_for(p, budget)
        c = _align(p, basis.angles, budget)
        c = _per_part(c, lambda q: _relations(q, budget))
        best = _per_part(c, lambda q: Coef(basis.normal_form(q, budget)))
        if best.is_zero():
            return best
        # the shortest normal form among the orders that put another condition symbol first
        for promote in self.alternatives:
            alt = self._basis_for(p, budget, promote)
            candidate = _per_part(c, lambda q: Coef(alt.normal_form(q, budget)))
            if _terms(candidate) < _terms(best):
                best = candidate
        return best

    @property
    def alternatives(self) -> list:
        """Symbol positions to promote in the alternative orders (the default leader excluded)."""
        if len(self.basis.polys) > MAX_BASIS_FOR_ALTERNATIVES:
            return []
        symbols = [pos for pos in self.basis.positions if _info(pos).kind == "symbol"]
        return symbols[1 : 1 + MAX_ALTERNATIVE_ORDERS]

    def _may_touch(self, p) -> bool:
        """Cheap test: p uses a generator of the conditions, one of their trig families, or a radical."""
        used = _used(p)
        if not self.basis.position_set.isdisjoint(used):
            return True
        for pos in used:
            info = _info(pos)
            if info.kind == "root":
                return True
            if info.kind in ("cos", "sin") and info.trig[1] in self.angles:
                return True
        return False

    # -- arguments of generators: cos(theta) given theta = pi/2, sqrt(n1^2 + n2^2 + n3^2) ----------

    def _argument_coefs(self, pos):
        """(rebuild, [argument Coefs]) for a non-symbol generator, or None when it has no arguments."""
        found = self._argument_cache.get(pos)
        if found is not None or pos in self._argument_cache:
            return found
        info = _info(pos)
        out = None
        try:
            if info.kind in ("cos", "sin"):
                q, u = info.trig
                fn = sympy.cos if info.kind == "cos" else sympy.sin
                out = (lambda args, fn=fn, q=q: trig(fn.__name__, q * args[0]), [from_expr(u)])
            elif info.kind == "root":
                base, n = info.root
                out = (lambda args, n=n: from_expr(sympy.Pow(args[0], sympy.Rational(1, n))), [base])
            elif info.kind == "other" and not info.expr.is_Atom and info.expr.args:
                func = info.expr.func
                out = (lambda args, func=func: from_expr(func(*args)), [from_expr(a) for a in info.expr.args])
        except DomainError:
            out = None
        self._argument_cache[pos] = out
        return out

    def _reduce_arguments(self, p, budget, depth) -> Coef:
        """Generators whose arguments get no longer modulo the conditions are rebuilt from them."""
        if depth >= _MAX_ARGUMENT_DEPTH:
            return Coef(p)
        subs = {}
        for pos in _used(p):
            if _info(pos).kind == "symbol":
                continue
            found = self._argument_coefs(pos)
            if found is None:
                continue
            rebuild, args = found
            if not any(self._may_touch_coef(a) for a in args):
                continue
            new_args, changed = [], False
            for a in args:
                r = _per_part(a, lambda q: self._reduce_poly(q, budget, depth + 1)) if self._may_touch_coef(a) else a
                if not r.identical(a) and _terms(r) <= _terms(a):
                    changed = True
                    new_args.append(r)
                else:
                    new_args.append(a)
            if not changed:
                continue
            try:
                subs[pos] = rebuild([a.to_expr() for a in new_args])
            except (DomainError, ZeroDivisionError):
                continue
        if not subs:
            return Coef(p)
        return substitute(p, subs, budget)

    def _may_touch_coef(self, c: Coef) -> bool:
        if c.expr is not None:
            return False
        num, den = c._parts()
        return self._may_touch(num) or (den is not None and self._may_touch(den))

    # -- deciding a nonzero remainder --------------------------------------------------------------

    def decide(self, c: Coef, budget: Budget | None = None):
        """Is the (reduced) coefficient c zero wherever the conditions hold?  True / False / None.

        A nonzero remainder only says c is not in the ideal.  False needs a real witness: a point
        where every condition holds to 45 digits and c is clearly nonzero.  Failing that, c may
        still vanish on the set (sin u given cos u = 1: sin^2 u is in the ideal, sin u is not);
        the Rabinowitsch test (1 in I + (1 - y c)) proves that.  Otherwise undecided.
        """
        if c is None:
            return True
        if c.expr is not None:
            return None
        c = self.reduce(c, budget)
        if c.is_zero():
            return True
        if not self.polys:
            return None
        num = REGISTRY.lift(c.num)
        witness = _Witness(self, budget)
        verdict = witness.decide(num)
        if verdict is not None:
            return verdict
        try:
            return True if self._in_radical(num, budget) else None
        except (sympy.PolynomialError, sympy.polys.polyerrors.CoercionFailed):
            return None

    def _in_radical(self, p, budget) -> bool:
        basis = self._basis_for(p, budget)
        p = REGISTRY.lift(basis.normal_form(p, budget))
        if p.is_zero():
            return True
        names = tuple(_info(pos).name for pos in sorted(set(_used(p)) | basis.position_set, key=_var_key))
        y_name = "_rabinowitsch_y"
        ctx = flint.fmpq_mpoly_ctx.get(names + (y_name,), _FLINT_ORDER)
        y = ctx.gens()[-1]
        polys = [g.project_to_context(ctx) for g in basis.registry_polys()]
        polys.append(1 - y * p.project_to_context(ctx))
        out = groebner_flint(polys, ctx, budget)
        return any(g.is_constant() and not g.is_zero() for g in out)


# ---------------------------------------------------------------------------
# Numeric witnesses on the condition set


class _OutsideDomain(Exception):
    """The point leaves the real domain (even root of a negative number, complex value)."""


class _Witness:
    """Real points where the conditions hold (Newton with a damped minimum-norm step, mpmath)."""

    DIGITS = 60
    TOLERANCE = mpmath.mpf(10) ** -45
    ITERATIONS = 80
    STARTS = 8

    def __init__(self, conditions: ConditionSet, budget):
        self.cs = conditions
        self.budget = budget

    def decide(self, p):
        """False when a witness shows p nonzero on the set; None otherwise."""
        eqs = [Coef(q) for q in self.cs.polys]
        target_coef = Coef(p)
        unknowns = sorted(set().union(*(e.to_expr().free_symbols for e in eqs)), key=str)
        others = sorted(target_coef.to_expr().free_symbols - set(unknowns), key=str)
        rng = random.Random(20240601)
        with mpmath.workdps(self.DIGITS):
            for attempt in range(self.STARTS):
                if self.budget is not None:
                    self.budget.check()
                spread = 0.8 + 0.6 * attempt  # ever wider starts reach the other trig branches
                start = {s: mpmath.mpf(rng.uniform(-spread, spread)) for s in unknowns}
                fixed = {s: mpmath.mpf(rng.uniform(-1.3, 1.3)) for s in others}
                point = self._solve(eqs, unknowns, start, fixed)
                if point is None:
                    continue
                try:
                    value, scale = _evaluate(target_coef, point)
                except _OutsideDomain:
                    continue
                if abs(value) > mpmath.mpf(10) ** -25 * (1 + scale):
                    return False
        return None

    def _solve(self, eqs, unknowns, start, fixed):
        x = [start[s] for s in unknowns]
        h = mpmath.mpf(10) ** -28
        lam = mpmath.mpf(10) ** -40

        def residual(xs):
            point = dict(fixed)
            point.update(zip(unknowns, xs))
            cache = {}
            return [_evaluate(e, point, cache)[0] for e in eqs], point

        try:
            for _ in range(self.ITERATIONS):
                if self.budget is not None:
                    self.budget.check()
                F, point = residual(x)
                if max(abs(v) for v in F) < self.TOLERANCE:
                    return point
                J = mpmath.matrix(len(eqs), len(x))
                for j in range(len(x)):
                    shifted = list(x)
                    shifted[j] += h
                    Fj, _ = residual(shifted)
                    for i in range(len(eqs)):
                        J[i, j] = (Fj[i] - F[i]) / h
                JJt = J * J.T
                for i in range(len(eqs)):
                    JJt[i, i] += lam
                y = mpmath.lu_solve(JJt, mpmath.matrix(F))
                step = J.T * y
                x = [xi - step[i] for i, xi in enumerate(x)]
        except (_OutsideDomain, ZeroDivisionError, ValueError):
            return None
        return None


def _evaluate(c: Coef, point: dict, cache=None):
    """(value, sum of |term values|) of a Coef's numerator at a point {Symbol: mpf}."""
    cache = {} if cache is None else cache
    num = REGISTRY.lift(c.num)
    total = mpmath.mpf(0)
    scale = mpmath.mpf(0)
    for monom, coeff in zip(num.monoms(), num.coeffs()):
        t = mpmath.mpf(int(coeff.p)) / int(coeff.q)
        for pos, e in enumerate(monom):
            if e:
                t *= _generator_value(pos, point, cache) ** int(e)
        total += t
        scale += abs(t)
    if c.den is not None:
        d, _ = _evaluate(Coef(REGISTRY.lift(c.den)), point, cache)
        if d == 0:
            raise _OutsideDomain()
        total /= d
    return total, scale


def _generator_value(pos, point, cache):
    found = cache.get(pos)
    if found is not None:
        return found
    info = _info(pos)
    if info.kind == "symbol":
        value = point.get(info.expr)
        if value is None:
            raise _OutsideDomain()  # a symbol the point does not fix
    elif info.kind in ("cos", "sin"):
        q, u = info.trig
        arg, _ = _evaluate(from_expr(u), point, cache)
        arg *= mpmath.mpf(int(q.p)) / int(q.q)
        value = mpmath.cos(arg) if info.kind == "cos" else mpmath.sin(arg)
    elif info.kind == "root":
        base, n = info.root
        b, _ = _evaluate(base, point, cache)
        if b < 0 and n % 2 == 0:
            raise _OutsideDomain()
        value = mpmath.root(abs(b), n) * (1 if b >= 0 else -1)
    else:
        subs = {s: sympy.Float(point[s], _Witness.DIGITS) for s in info.expr.free_symbols if s in point}
        v = sympy.N(info.expr.subs(subs), _Witness.DIGITS)
        if not v.is_number or v.is_real is False:
            raise _OutsideDomain()
        value = mpmath.mpf(sympy.Float(v, _Witness.DIGITS))
    if isinstance(value, mpmath.mpc):
        raise _OutsideDomain()
    cache[pos] = value
    return value


__all__ = ["ConditionSet", "ConditionError", "InconsistentConditionsError", "ORDER", "groebner_flint"]

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

Monomial order (gacalc.simplify.groebner): grevlex.  The variables run, highest first: radicals, real symbols (in order of first use,
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
(a nonzero remainder) is not a proof of failure: ``decide`` looks for a real witness point
(gacalc.simplify.witness).  An inconsistent set (Gröbner basis {1}, or a member that is a positive sum of even powers)
raises InconsistentConditionsError instead of proving everything.

Speed: condition sets are cached per condition tuple (in the algebra context), bases per
base-angle choice; the bases and the reduction modulo them are gacalc.simplify.groebner.
"""

from __future__ import annotations

from collections import OrderedDict

import flint
from gacalc.lazy import sympy

from gacalc.algebra.coefficients import Coef, DomainError, ascii_text, from_expr, registry, trig
from gacalc.algebra.context import current
from gacalc.algebra.multivector import AlgebraError

from .budget import Budget
from .groebner import FLINT_ORDER, ORDER, Basis, groebner_flint, used_positions, var_key
from .relations import MAX_MULTIPLE, multiple_angle, rational_gcd, reduce_poly_relations, substitute
from .witness import Witness

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


def _terms(c: Coef) -> int:
    return len(c.num) + (len(c.den) if c.den is not None else 0)


def _per_part(c: Coef, fn) -> Coef:
    """fn (registry polynomial -> Coef) applied to numerator and denominator separately."""
    num, den = c.parts()
    out = fn(num)
    if den is None:
        return out
    d = fn(den)
    if d.is_zero():  # the denominator vanishes on the condition set: leave it as it was
        d = Coef(den)
    return out / d


def _families(p) -> dict:
    """{base u: set of q} for the trig generators cos(q u), sin(q u) used by p."""
    fams = {}
    for pos in used_positions(p):
        info = registry().info(pos)
        if info.kind in ("cos", "sin"):
            q, u = info.trig
            fams.setdefault(u, set()).add(q)
    return fams


def _radicals(p) -> set[int]:
    return {pos for pos in used_positions(p) if registry().info(pos).kind == "root"}


def _align(p, angles: dict, budget) -> Coef:
    """Rewrite the trig generators of p whose base u is in ``angles`` over the angle angles[u] u."""
    subs = {}
    for pos in used_positions(p):
        info = registry().info(pos)
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
        cm, sm = multiple_angle(c, s, int(m))
        subs[pos] = cm if info.kind == "cos" else sm
    if not subs:
        return Coef(registry().lift(p))
    return substitute(p, subs, budget)


def _relations(p, budget) -> Coef:
    return reduce_poly_relations(registry().lift(p), budget)


def _never_zero_over_reals(p) -> bool:
    """A positive constant plus even powers with positive coefficients: no real zero."""
    p = registry().lift(p)
    if p.is_zero():
        return False
    has_positive_constant = False
    for monom, coeff in zip(p.monoms(), p.coeffs()):
        if coeff <= 0 or any(e % 2 for e in monom):
            return False
        if not any(monom):
            has_positive_constant = True
    return has_positive_constant


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
    return registry().lift(c.num)


class ConditionSet:
    """The ideal of a tuple of side conditions; ``reduce`` is the hook gacalc.simplify calls."""

    @classmethod
    def of(cls, conditions) -> "ConditionSet":
        """The condition set of a tuple of conditions, cached in the current algebra context
        (its bases hold that context's generator positions)."""
        cache = current().store("gacalc.simplify condition sets", OrderedDict)
        # ranges (t > 0) are not equations: gacalc.simplify.ranges applies them
        key = tuple(c for c in conditions or () if not isinstance(c, sympy.core.relational.Relational))
        found = cache.get(key)
        if found is None:
            try:
                found = cls(key)
            except InconsistentConditionsError as exc:
                found = exc
            cache[key] = found
            if len(cache) > _CACHE_SIZE:
                cache.popitem(last=False)
        else:
            cache.move_to_end(key)
        if isinstance(found, InconsistentConditionsError):
            raise InconsistentConditionsError(str(found), found.conditions)
        return found

    def __init__(self, conditions=(), budget: Budget | None = None):
        self.conditions = tuple(conditions)
        polys = []
        for expr in self.conditions:
            num = _condition_numerator(expr)
            reduced = _relations(num, budget)
            p = registry().lift(reduced.num)
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
        self.angles = {u: rational_gcd(sorted(qs)) for u, qs in fams.items()}
        self._bases: "OrderedDict[tuple, Basis]" = OrderedDict()
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

    def _basis(self, angles: dict, roots: frozenset, budget, promote=None) -> Basis:
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
                refined[u] = rational_gcd(sorted(qs | ({angles[u]} if u in angles else set())))
            if refined == angles or attempt == 3:
                break  # polys are written over ``angles``
            angles = refined
        basis = Basis(polys, angles, budget, promote)
        self._bases[key] = basis
        if len(self._bases) > _CACHE_SIZE:
            self._bases.popitem(last=False)
        return basis

    def _ideal_polys(self, angles, roots, budget):
        """Generators of the ideal over the given base angles; also families left unaligned."""
        polys = []
        for p in self.polys:
            c = _per_part(_align(p, angles, budget), lambda q: _relations(q, budget))
            polys.append(registry().lift(c.num))
        pending = set(roots)
        for p in polys:
            pending |= _radicals(p)
        related = set()
        while pending:
            pos = pending.pop()
            if pos in related:
                continue
            related.add(pos)
            base, n = registry().info(pos).root
            base = _per_part(base, lambda q: _per_part(_align(q, angles, budget), lambda r: _relations(r, budget)))
            num, den = base.parts()
            r = registry().gen(pos)
            rel = r**n * (den if den is not None else registry().constant(1)) - num
            polys.append(registry().lift(rel))
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
            polys.append(registry().lift(c.num) ** 2 + registry().lift(s.num) ** 2 - 1)
        return polys, new_fams

    def _basis_for(self, p, budget, promote=None) -> Basis:
        """The basis to reduce p with: base angles fine enough for p, p's radicals related."""
        angles = dict(self.angles)
        for u, qs in _families(p).items():
            if u in angles:
                g = rational_gcd(sorted(qs | {angles[u]}))
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
    def _root_touches(pos, basis: Basis) -> bool:
        base, _ = registry().info(pos).root
        num, den = base.parts()
        used = set(used_positions(num)) | (set(used_positions(den)) if den is not None else set())
        if not basis.position_set.isdisjoint(used):
            return True
        return any(registry().info(q).kind in ("cos", "sin") and registry().info(q).trig[1] in basis.angles for q in used)

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
        p = registry().lift(p)
        if p.is_constant():
            return Coef(p)
        c = self._reduce_arguments(p, budget, depth)
        return _per_part(c, lambda q: _per_part(_relations(q, budget), lambda r: self._modulo_basis(r, budget)))

    def _modulo_basis(self, p, budget) -> Coef:
        p = registry().lift(p)
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
        symbols = [pos for pos in self.basis.positions if registry().info(pos).kind == "symbol"]
        return symbols[1 : 1 + MAX_ALTERNATIVE_ORDERS]

    def _may_touch(self, p) -> bool:
        """Cheap test: p uses a generator of the conditions, one of their trig families, or a radical."""
        used = used_positions(p)
        if not self.basis.position_set.isdisjoint(used):
            return True
        for pos in used:
            info = registry().info(pos)
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
        info = registry().info(pos)
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
        for pos in used_positions(p):
            if registry().info(pos).kind == "symbol":
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
        num, den = c.parts()
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
        num = registry().lift(c.num)
        witness = Witness(self, budget)
        verdict = witness.decide(num)
        if verdict is not None:
            return verdict
        try:
            return True if self._in_radical(num, budget) else None
        except (sympy.PolynomialError, sympy.polys.polyerrors.CoercionFailed):
            return None

    def _in_radical(self, p, budget) -> bool:
        basis = self._basis_for(p, budget)
        p = registry().lift(basis.normal_form(p, budget))
        if p.is_zero():
            return True
        names = tuple(registry().info(pos).name for pos in sorted(set(used_positions(p)) | basis.position_set, key=var_key))
        y_name = "_rabinowitsch_y"
        ctx = flint.fmpq_mpoly_ctx.get(names + (y_name,), FLINT_ORDER)
        y = ctx.gens()[-1]
        polys = [g.project_to_context(ctx) for g in basis.registry_polys()]
        polys.append(1 - y * p.project_to_context(ctx))
        out = groebner_flint(polys, ctx, budget)
        return any(g.is_constant() and not g.is_zero() for g in out)


__all__ = ["ConditionSet", "ConditionError", "InconsistentConditionsError", "ORDER", "groebner_flint"]

"""Reduced Gröbner bases of registry polynomials, and reduction modulo them.

Monomial order: graded reverse lexicographic (grevlex), the usual choice for degree-bounded
results.  The variables run, highest first: radicals, real symbols (in order of first use,
so n1 > n2 > n3), sines, cosines, other atoms (pi, exp(x), ...); ``promote`` puts one symbol
ahead of the others (the alternative orders gacalc.simplify.conditions tries).  The normal
form modulo a Gröbner basis is unique, so "reduces to zero" decides ideal membership.

Speed: the basis is computed by sympy once; reduction itself is flint's multivariate
division (divrem by each basis element until nothing changes) in a context with the same
grevlex order, with the basis projected into contexts that hold a polynomial's extra
generators (kept in a small cache per basis).
"""

from __future__ import annotations

from collections import OrderedDict
from functools import lru_cache

import flint
from gacalc.lazy import sympy

from gacalc.algebra.coefficients import Coef, registry

ORDER = "grevlex"  # sympy's name; flint's is 'degrevlex' (the same order, checked in the tests)
FLINT_ORDER = "degrevlex"
_KIND_RANK = {"root": 0, "symbol": 1, "sin": 2, "cos": 3, "other": 4}
_CACHE_SIZE = 64


def used_positions(p) -> list[int]:
    """Flint positions of the generators a registry polynomial uses (the placeholder excluded)."""
    return [pos for pos, d in enumerate(registry().lift(p).degrees()) if d > 0 and pos > 0]


def var_key(pos, promote=None):
    """Sort key of a generator position in the basis order (highest first)."""
    return (_KIND_RANK.get(registry().info(pos).kind, 4), 0 if pos == promote else 1, pos)


class Basis:
    """A reduced grevlex Gröbner basis over some generators, and reduction modulo it."""

    def __init__(self, polys, angles: dict, budget, promote=None):
        self.angles = dict(angles)
        self.promote = promote
        positions = set()
        for p in polys:
            positions.update(used_positions(p))
        self.positions = sorted(positions, key=lambda pos: var_key(pos, promote))
        self.position_set = frozenset(self.positions)
        self.names = tuple(registry().info(pos).name for pos in self.positions)
        self.is_unit = False
        self.polys = []
        self._projected = OrderedDict()  # basis copies in contexts with a polynomial's extra generators
        if not self.positions:
            # only constants: consistent iff all are zero
            self.is_unit = any(not registry().lift(p).is_zero() for p in polys)
            return
        self.ctx = flint.fmpq_mpoly_ctx.get(self.names, FLINT_ORDER)
        local = [registry().lift(p).project_to_context(self.ctx) for p in polys]
        self.polys = groebner_flint(local, self.ctx, budget)
        self.is_unit = any(g.is_constant() and not g.is_zero() for g in self.polys)

    def exprs(self):
        """The basis as sympy Exprs (for messages and inspection)."""
        out = []
        for g in self.polys:
            out.append(Coef(g.project_to_context(registry().ctx)).to_expr())
        return out

    def registry_polys(self):
        return [g.project_to_context(registry().ctx) for g in self.polys]

    def touches(self, p) -> bool:
        return not self.position_set.isdisjoint(used_positions(p))

    def _context_for(self, p):
        extras = sorted(set(used_positions(p)) - self.position_set, key=var_key)  # placement is immaterial
        names = self.names + tuple(registry().info(pos).name for pos in extras)
        found = self._projected.get(names)
        if found is None:
            ctx = flint.fmpq_mpoly_ctx.get(names, FLINT_ORDER)
            found = (ctx, [g.project_to_context(ctx) for g in self.polys])
            self._projected[names] = found
            if len(self._projected) > _CACHE_SIZE:
                self._projected.popitem(last=False)
        return found

    def normal_form(self, p, budget=None):
        """The remainder of p (a registry polynomial) modulo the basis, as a registry polynomial."""
        p = registry().lift(p)
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
        return q.project_to_context(registry().ctx)


def groebner_flint(polys, ctx, budget=None):
    """Reduced grevlex Gröbner basis (sympy) of flint polynomials, returned in the same context."""
    polys = [p for p in polys if not p.is_zero()]
    if not polys:
        return []
    if budget is not None:
        budget.check()
    key = tuple(tuple((tuple(m), (int(c.p), int(c.q))) for m, c in zip(p.monoms(), p.coeffs()))
                for p in polys)
    basis = _groebner_terms(ctx.nvars(), key)
    return [ctx.from_dict({m: flint.fmpq(n, d) for m, (n, d) in g}) for g in basis]


@lru_cache(maxsize=256)
def _groebner_terms(nvars: int, polys: tuple) -> tuple:
    """The basis of polynomials given as (exponents, (num, den)) terms, in the same form.

    A pure function of its arguments, so its cache holds no session's state: a fresh
    session meets the basis of "n is a unit vector" without computing it again."""
    gens = sympy.symbols(f"x0:{nvars}", cls=sympy.Dummy)
    sympy_polys = [
        sympy.Poly.from_dict({m: sympy.Rational(n, d) for m, (n, d) in terms}, *gens,
                             domain=sympy.QQ)
        for terms in polys
    ]
    basis = sympy.groebner(sympy_polys, *gens, order=ORDER, domain=sympy.QQ)
    return tuple(tuple((tuple(m), (int(c.numerator), int(c.denominator))) for m, c in g.terms())
                 for g in basis.polys)

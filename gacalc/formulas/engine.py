"""Recognition: the exact linear solve that writes a value in the candidate basis.

Steps (each exact; nothing is printed that was not proved):

1. Bring the value over one denominator L (a polynomial) and reduce numerators modulo the
   unit conditions (n . n = 1: n1^2 -> 1 - n2^2 - n3^2, a normal form that is unique
   because a single quadric monic in n1 is a Gröbner basis by itself).
2. Split every term into its monomial in the variables' components and its monomial in
   the other generators (scalar symbols, cos(t), sqrt(...), ...).  Group the terms by
   grade and by degree in each variable (its parity for a unit variable): the rotation
   group preserves both, so each group is matched on its own.
3. For a group, the candidates of basis.py expand to polynomials with rational
   coefficients in the components only.  Their coefficients form a rational matrix A
   (rows: blade and component monomial; columns: candidates, simplest first); the target's
   coefficients form B (columns: monomials of the other generators).  One reduced row
   echelon form of [A | B] (python-flint fmpq_mat) decides everything: a pivot in B means
   no combination exists (the value is not equivariant, e.g. a1 e1); otherwise the pivot
   columns of A give the solution, whose entries, recombined with the other generators'
   monomials, are the coefficients.
4. A denominator that involves the variables is recognised the same way (a scalar).
5. Expand the formula back and prove value - formula = 0 through the simplifier, under
   the session's conditions.  Only then is the formula returned.

Every step checks a Budget (2 s by default); running out gives the one-line fallback.
"""

from __future__ import annotations

import time
from dataclasses import dataclass

import flint

from gacalc.algebra.basis import BASIS_GRADES
from gacalc.algebra.coefficients import Coef
from gacalc.algebra.context import registry
from gacalc.algebra.multivector import Multivector
from gacalc.simplify.budget import Budget, BudgetExceeded

from .basis import TooManyCandidates, candidates
from .terms import Candidate, Formula, Term

RECOGNITION_SECONDS = 2.0
MAX_DEGREE = 8            # in one variable: beyond this the basis grows too fast


@dataclass
class Outcome:
    """formula (proved equal) or None with the one-line reason; seconds spent."""

    formula: Formula | None
    message: str = ""
    seconds: float = 0.0

    @property
    def found(self) -> bool:
        return self.formula is not None


class NoFormula(Exception):
    """The search ended without a formula; the message says why in one line."""


def recognize(value: Multivector, variables, conditions=(), budget: Budget | None = None,
              others=(), display: bool = True) -> Outcome:
    """A proved coordinate-free formula for ``value`` over ``variables`` (formulas.Variable),
    or the reason there is none.  ``others``: (name, symbols) of declared values formulas
    cannot use (rotors, general multivectors); ``conditions``: sympy Exprs equal to zero
    (the session's side conditions) used in the final proof."""
    start = time.perf_counter()
    budget = budget if budget is not None else Budget(RECOGNITION_SECONDS)
    try:
        formula = _recognize(value, list(variables), tuple(conditions), budget, others,
                             display)
    except NoFormula as reason:
        return Outcome(None, str(reason), time.perf_counter() - start)
    except BudgetExceeded:
        seconds = budget.seconds if budget.seconds is not None else RECOGNITION_SECONDS
        return Outcome(None, f"no formula: the search stopped at its {seconds:g} s budget",
                       time.perf_counter() - start)
    return Outcome(formula, "", time.perf_counter() - start)


# The search ------------------------------------------------------------------------------
def _recognize(value, variables, conditions, budget, others, display):
    if any(c is not None and c.expr is not None for c in value.coefs()):
        raise NoFormula("no formula: floating-point values have no exact formula")
    free = value.free_symbols
    for name, symbols in others:
        if free & set(symbols):
            raise NoFormula(f"no formula: the value depends on the components of {name}; "
                            "formulas use declared vectors and bivectors")
    used = [v for v in variables if free & set(v.symbols)]
    _refuse_functions_of_components(value, used)
    reg = registry()
    ctx = reg.ctx
    positions = _positions(used, reg)
    reducer = _SphereReducer(used, positions, ctx)

    numerators, denominator = _common_denominator(value)
    numerators = {k: reducer(p) for k, p in numerators.items()}
    den_has_vectors = denominator is not None and _touches(denominator, positions)
    solution = _solve(numerators, used, positions, reducer, ctx, budget)
    terms = [Term(_coefficient(poly, ctx, None if den_has_vectors else denominator, display),
                  candidate) for candidate, poly in solution]
    denominator_formula = None
    if den_has_vectors:
        den_solution = _solve({0: reducer(denominator)}, used, positions, reducer, ctx, budget)
        denominator_formula = Formula(
            [Term(_coefficient(p, ctx, None, display), c) for c, p in den_solution], used)
    formula = Formula(_arranged(terms), used, denominator_formula)
    _verify(value, formula, conditions, budget)
    return formula


def _refuse_functions_of_components(value, used):
    """A generator such as sqrt(a1^2 + a2^2 + a3^2) or cos(a1) hides components from the
    linear solve: the formula would still contain them, so there is none to give."""
    from gacalc.algebra.coefficients import generators_of

    components = {s for v in used for s in v.symbols}
    for c in value.coefs():
        if c is None:
            continue
        for info in generators_of(c):
            if info.kind != "symbol" and info.expr.free_symbols & components:
                raise NoFormula(f"no formula: {info.name} is a function of the components "
                                "(only polynomials and quotients of them are recognised)")


def _positions(used, reg) -> list[list[int]]:
    out = []
    for v in used:
        spots = []
        for symbol in v.symbols:
            pos = reg.position(symbol)
            if pos is not None:
                spots.append(pos)
        out.append(spots)
    return out


def _touches(poly, positions) -> bool:
    degrees = poly.degrees()
    return any(degrees[p] for spots in positions for p in spots)


def _common_denominator(value: Multivector):
    """({blade: numerator polynomial}, L or None) with value[k] = numerator / L."""
    parts = {}
    lcm = None
    for k, c in enumerate(value.coefs()):
        if c is None:
            continue
        num, den = c.parts()
        parts[k] = (num, den)
        if den is not None:
            lcm = den if lcm is None else lcm * den / lcm.gcd(den)
    if lcm is None:
        return {k: num for k, (num, _) in parts.items()}, None
    # parts() may have grown the context; lift everything into the last one
    ctx = registry().ctx
    lcm = lcm.project_to_context(ctx) if lcm.context() is not ctx else lcm
    out = {}
    for k, (num, den) in parts.items():
        num = num.project_to_context(ctx) if num.context() is not ctx else num
        if den is None:
            out[k] = num * lcm
        else:
            den = den.project_to_context(ctx) if den.context() is not ctx else den
            out[k] = num * (lcm / den)
    return out, lcm


class _SphereReducer:
    """Normal form modulo v . v = 1 for the unit variables: v1^2 -> 1 - v2^2 - v3^2."""

    def __init__(self, used, positions, ctx):
        self.ctx = ctx
        self.rules = []
        for v, spots in zip(used, positions):
            if v.unit and len(spots) == 3:
                first, *rest = spots
                gens = ctx.gens()
                square = ctx.constant(1) - sum((gens[p] ** 2 for p in rest), ctx.constant(0))
                self.rules.append((first, square))

    def __call__(self, poly):
        if not self.rules:
            return poly
        if poly.context() is not self.ctx:
            poly = poly.project_to_context(self.ctx)
        for first, square in self.rules:
            if poly.degrees()[first] < 2:
                continue
            keep, total = {}, self.ctx.constant(0)
            for exps, c in poly.to_dict().items():
                e = exps[first]
                if e < 2:
                    keep[exps] = c
                    continue
                lowered = list(exps)
                lowered[first] = e % 2
                total += self.ctx.from_dict({tuple(lowered): c}) * square ** (e // 2)
            poly = self.ctx.from_dict(keep) + total if keep else total
        return poly


def _split_terms(poly, positions, nvars):
    """Terms as (degrees per variable, component monomial, other monomial, coefficient)."""
    vec_spots = {p for spots in positions for p in spots}
    for exps, c in poly.to_dict().items():
        degrees = tuple(sum(exps[p] for p in spots) for spots in positions)
        component = tuple(exps[p] if p in vec_spots else 0 for p in range(nvars))
        other = tuple(0 if p in vec_spots else exps[p] for p in range(nvars))
        yield degrees, component, other, c


def _solve(numerators, used, positions, reducer, ctx, budget):
    """[(Candidate, polynomial in the other generators)] with sum = numerators."""
    units = tuple(v.unit for v in used)
    nvars = len(ctx.gens())
    groups: dict = {}
    for k, poly in numerators.items():
        grade = BASIS_GRADES[k]
        for degrees, component, other, c in _split_terms(poly, positions, nvars):
            if max(degrees, default=0) > MAX_DEGREE:
                raise NoFormula(f"no formula: degree {max(degrees)} in one vector is beyond "
                                f"the search (at most {MAX_DEGREE})")
            key = (grade, tuple(d % 2 if u else d for d, u in zip(degrees, units)))
            group = groups.setdefault(key, {"top": list(degrees), "rows": {}})
            group["top"] = [max(a, b) for a, b in zip(group["top"], degrees)]
            group["rows"].setdefault((k, component), {})[other] = c
    solution = []
    for (grade, _), group in sorted(groups.items()):
        budget.check()
        solution.extend(_solve_group(grade, tuple(group["top"]), units, group["rows"], used,
                                     positions, reducer, ctx, budget))
    return solution


def _solve_group(grade, top, units, target_rows, used, positions, reducer, ctx, budget):
    if not used and grade in (1, 2):
        raise NoFormula("no formula: the value has basis directions of its own (it is not "
                        "built from declared vectors)")
    try:
        basis = candidates(grade, top, units)
    except TooManyCandidates:
        raise NoFormula("no formula: too many candidate terms for this degree") from None
    nvars = len(ctx.gens())
    cache: dict = {}
    columns = []
    for candidate in basis:
        budget.check()
        expansion = candidate.value(used, cache)
        column = {}
        for k, c in enumerate(expansion.coefs()):
            if c is None:
                continue
            num, _ = c.parts()
            num = reducer(num.project_to_context(ctx) if num.context() is not ctx else num)
            for exps, q in num.to_dict().items():
                column[(k, tuple(exps[:nvars]))] = q
        columns.append(column)
    others = sorted({o for row in target_rows.values() for o in row})
    rows = sorted(set(target_rows) | {key for col in columns for key in col})
    row_index = {key: r for r, key in enumerate(rows)}
    width = len(columns) + len(others)
    matrix = flint.fmpq_mat(len(rows), width)
    for j, column in enumerate(columns):
        for key, q in column.items():
            matrix[row_index[key], j] = q
    other_index = {o: j for j, o in enumerate(others)}
    for key, row in target_rows.items():
        for o, q in row.items():
            matrix[row_index[key], len(columns) + other_index[o]] = q
    budget.check()
    reduced, rank = matrix.rref()
    out = []
    for r in range(rank):
        pivot = next(j for j in range(width) if reduced[r, j] != 0)
        if pivot >= len(columns):
            raise NoFormula("no formula: the value is not a rotation-covariant expression in "
                            "the declared vectors (it depends on the basis directions)")
        terms = {}
        for o, j in other_index.items():
            q = reduced[r, len(columns) + j]
            if q != 0:
                terms[o] = q
        if terms:
            out.append((basis[pivot], ctx.from_dict(terms)))
    return out


ANTISYMMETRIC = ("cross", "wedge", "triple", "wedge3")


def _arranged(terms: list) -> list:
    """Terms as a person writes them: an antisymmetric shape with a negative coefficient
    has its factors swapped instead (-sin(t) cross(a, n) -> sin(t) cross(n, a)), and a term
    with a positive sign goes first within its grade."""
    out = []
    for term in terms:
        candidate = term.candidate
        if candidate.shape in ANTISYMMETRIC and _negative(term.coef):
            i, j, *rest = candidate.indices
            candidate = Candidate(candidate.dots, candidate.shape, (j, i, *rest))
            term = Term(-term.coef, candidate)
        out.append(term)
    by_grade: dict = {}
    for term in out:
        by_grade.setdefault(term.candidate.grade, []).append(term)
    arranged = []
    for grade in sorted(by_grade):
        group = by_grade[grade]
        first = next((t for t in group if not _negative(t.coef)), None)
        if first is not None:
            group.remove(first)
            group.insert(0, first)
        arranged.extend(group)
    return arranged


def _negative(coef: Coef) -> bool:
    from gacalc.printing.text import split_sign

    return split_sign(coef.text())[0] < 0


def _coefficient(poly, ctx, denominator, display) -> Coef:
    coef = Coef(poly)
    if denominator is not None:
        coef = coef / Coef(denominator)
    if display:
        from gacalc.simplify import display_coef

        coef = display_coef(coef)
    return coef


def _verify(value, formula, conditions, budget):
    from gacalc.simplify import is_zero

    budget.check()
    verdict = is_zero(value - formula.value(), conditions, budget.within(None))
    if verdict is not True:
        raise NoFormula("no formula: the candidate found could not be proved equal")

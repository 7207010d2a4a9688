"""The relations every generator carries with it, applied by rewriting polynomial terms.

Trigonometric families: all cos(q u), sin(q u) of one base u are rewritten over the base
angle g u (g the rational gcd of the q's, multiple angles by the Chebyshev recurrences),
then sin^2 -> 1 - cos^2.  The result P(c) + s Q(c) is unique, so zero there is zero.
Radicals r = b^(1/n): r^n -> b.  Both relation sets have pure-power leading terms in
distinct generators, so term rewriting is reduction modulo a Gröbner basis.
"""

from __future__ import annotations

from functools import reduce as _fold
from math import gcd

from gacalc.lazy import sympy

from gacalc.algebra.coefficients import Coef, registry, trig

from .angles import ANGLE_SECONDS, collapse_angles, expand_angle_sums

MAX_MULTIPLE = 64  # cos(m x) with larger m is left alone rather than expanded
MAX_PASSES = 12


def _used_positions(p):
    return [pos for pos, d in enumerate(p.degrees()) if d > 0]


def _families(p):
    """{base u: {q: (kind, position)}} for the trig generators used by p."""
    fams = {}
    for pos in _used_positions(p):
        if pos == 0:
            continue
        info = registry().info(pos)
        if info.kind in ("cos", "sin"):
            q, u = info.trig
            fams.setdefault(u, {}).setdefault(q, {})[info.kind] = pos
    return fams


def _group_terms(p, positions):
    """{exponents at positions: polynomial of the remaining factors}."""
    groups = {}
    ctx = p.context()
    for monom, coeff in zip(p.monoms(), p.coeffs()):
        key = tuple(monom[i] for i in positions)
        rest = list(monom)
        for i in positions:
            rest[i] = 0
        groups.setdefault(key, {})[tuple(rest)] = coeff
    return {key: ctx.from_dict(d) for key, d in groups.items()}


def _rewrite(p, positions, image, budget=None) -> Coef:
    """Sum over term groups of image(exponents) * rest, image returning a Coef."""
    total = Coef.constant(0)
    for key, rest in _group_terms(p, positions).items():
        if budget is not None:
            budget.check()
        total = total + image(key) * Coef(rest)
    return total


def substitute(p, images: dict, budget=None) -> Coef:
    """p with the generator at each flint position replaced by a Coef: {position: image}."""
    p = registry().lift(p)
    positions = list(images)
    values = [images[pos] for pos in positions]

    def image(key):
        out = Coef.constant(1)
        for img, e in zip(values, key):
            if e:
                out = out * img**e
        return out

    return _rewrite(p, positions, image, budget)


def rational_gcd(qs):
    """The largest rational g with every q an integer multiple of g."""
    nums = [int(q.p) for q in qs]
    dens = [int(q.q) for q in qs]
    lcm = _fold(lambda a, b: a * b // gcd(a, b), dens, 1)
    return sympy.Rational(_fold(gcd, nums), lcm)


def multiple_angle(c: Coef, s: Coef, m: int):
    """(cos(m x), sin(m x)) from c = cos x, s = sin x by the Chebyshev recurrences."""
    cos_prev, cos_cur = Coef.constant(1), c
    sin_prev, sin_cur = Coef.constant(0), s
    two_c = c * Coef.constant(2)
    for _ in range(m - 1):
        cos_prev, cos_cur = cos_cur, two_c * cos_cur - cos_prev
        sin_prev, sin_cur = sin_cur, two_c * sin_cur - sin_prev
    return cos_cur, sin_cur


def _to_base_angles(p, budget, companions=()):
    """Rewrite every trig family of p over its base angle.  Returns a Coef.

    ``companions`` are polynomials whose angles count too (the other half of a fraction),
    so that numerator and denominator share a base angle and can cancel."""
    fams = _families(p)
    for other in companions:
        for u, by_q in _families(registry().lift(other)).items():
            if u in fams:
                for q, kinds in by_q.items():
                    fams[u].setdefault(q, {})
    substitutions = {}
    for u, by_q in fams.items():
        if len(by_q) == 1:
            continue
        g = rational_gcd(list(by_q))
        if max(q / g for q in by_q) > MAX_MULTIPLE:
            continue
        c, s = trig("cos", g * u), trig("sin", g * u)
        for q, kinds in by_q.items():
            m = int(q / g)
            if m == 1:
                continue
            cm, sm = multiple_angle(c, s, m)
            for kind, pos in kinds.items():
                substitutions[registry().info(pos).expr] = cm if kind == "cos" else sm
    if not substitutions:
        return Coef(p)
    return substitute(p, {registry().position(e): img for e, img in substitutions.items()}, budget)


def _power_rules(p):
    """{position: (n, Coef of gen^n)}: sin^2 -> 1 - cos^2 and radical^n -> base."""
    rules = {}
    for pos in _used_positions(p):
        if pos == 0:
            continue
        info = registry().info(pos)
        if info.kind == "sin":
            cos_coef = trig("cos", info.trig[0] * info.trig[1])
            rules[info.expr] = (2, Coef.constant(1) - cos_coef * cos_coef)
        elif info.kind == "root":
            base, n = info.root
            rules[info.expr] = (n, base)
    return rules


def _reduce_powers(p, budget) -> Coef:
    current = Coef(p)
    for _ in range(MAX_PASSES):
        num = registry().lift(current.num)
        rules = _power_rules(num)
        if not rules:
            break
        positions = [registry().position(e) for e in rules]
        degs = num.degrees()
        if all(degs[pos] < rules[e][0] for pos, e in zip(positions, rules)):
            break
        gen = registry().gen
        plist = [(pos, rules[e]) for pos, e in zip(positions, rules)]

        def image(key):
            out = Coef.constant(1)
            for (pos, (n, repl)), e in zip(plist, key):
                if e:
                    q, r = divmod(e, n)
                    if r:
                        out = out * Coef(gen(pos) ** r)
                    if q:
                        out = out * repl**q
            return out

        reduced = _rewrite(num, positions, image, budget)
        if current.den is not None:
            reduced = reduced / Coef(registry().lift(current.den))
        current = reduced
        if current.den is not None:
            # a radical with a rational base can bring a denominator; reduce the numerator
            return _reduce_powers(registry().lift(current.num), budget) / Coef(registry().lift(current.den))
    return current


def reduce_poly_relations(p, budget=None, companions=()) -> Coef:
    """Canonical form of a polynomial modulo the generator relations."""
    p = registry().lift(p)
    if p.is_constant():
        return Coef(p)
    expanded = expand_angle_sums(p)   # a display form's cos(p/2 + t/2): back to single angles
    if expanded is not None:
        return reduce_poly_relations(expanded.num, budget, companions)
    c = _to_base_angles(p, budget, companions)
    out = _reduce_powers(registry().lift(c.num), budget)
    if c.den is not None:
        out = out / Coef(registry().lift(c.den))
    return out


def merge_half_angles(p, budget=None):
    """For display: products of half angles become full angles.  Returns (Coef, merged).

    Input is in reduced form (each family over one angle, sin at most linear).  The term
    c^a s^b becomes, with C = cos 2x, S = sin 2x: c^2 -> (1 + C)/2, c s -> S/2, keeping one
    c or s for odd total degree.  Accepted when the half angle disappears and it was a
    half angle (q with an even denominator: the rotor sandwich's theta/2), or when the
    result is strictly shorter.  ``merged`` tells whether a half angle was merged away.
    """
    current = Coef(registry().lift(p))
    merged_half = False
    for _ in range(MAX_PASSES):
        num = registry().lift(current.num)
        fams = _families(num)
        changed = False
        for u, by_q in fams.items():
            if len(by_q) != 1:
                continue
            (q, kinds), = by_q.items()
            c_pos = kinds.get("cos")
            s_pos = kinds.get("sin")
            C, S = trig("cos", 2 * q * u), trig("sin", 2 * q * u)
            num = registry().lift(num)
            gen = registry().gen
            positions = [pos for pos in (c_pos, s_pos) if pos is not None]
            half = (Coef.constant(1) + C) * Coef.constant(sympy.Rational(1, 2))

            def image(key, c_pos=c_pos, s_pos=s_pos, half=half, S=S, gen=gen):
                exps = dict(zip([x for x in (c_pos, s_pos) if x is not None], key))
                a, b = exps.get(c_pos, 0), exps.get(s_pos, 0)
                out = Coef.constant(1)
                if b >= 2:  # not reduced; leave this group alone
                    out = out * Coef(gen(s_pos) ** b)
                    b = 0
                if b == 1 and a >= 1:
                    out = out * S * Coef.constant(sympy.Rational(1, 2))
                    a -= 1
                elif b == 1:
                    out = out * Coef(gen(s_pos))
                if a % 2:
                    out = out * Coef(gen(c_pos))
                if a // 2:
                    out = out * half ** (a // 2)
                return out

            candidate = _rewrite(num, positions, image, budget)
            if candidate.den is not None:
                # the full angle had a closed form with a denominator (sympy writes
                # cos(atan(x)) as 1/sqrt(1 + x^2)); keeping only the numerator would be wrong
                continue
            cand_num = registry().lift(candidate.num)
            gone = not any(cand_num.degrees()[pos] > 0 for pos in positions)
            is_half = q.q % 2 == 0
            if len(cand_num) < len(num) or (gone and is_half):
                num = cand_num
                changed = True
                merged_half = merged_half or (gone and is_half)
        current = Coef(num)
        if not changed:
            break
    return current, merged_half


def has_opaque_generators(c: Coef) -> bool:
    """Generators whose relations we do not model (abs, exp, several radicals, ...)."""
    from gacalc.algebra.coefficients import generators_of

    infos = generators_of(c)
    roots = [i for i in infos if i.kind == "root"]
    if any(i.kind == "other" and not i.expr.is_Atom for i in infos):
        return True
    if any(i.kind == "other" and i.expr.is_number for i in infos):
        return True  # pi, E: transcendental, but cos(pi/5) and friends relate to them
    if len(roots) > 1 or any(r.root[0].is_constant() for r in roots):
        return True
    families = {}
    for i in infos:
        if i.kind in ("cos", "sin"):
            families.setdefault(i.trig[1], set()).add(i.trig[0])
    # a family left over several angles (multiple too large to expand) is not canonical
    return any(len(qs) > 1 for qs in families.values())


def sine_form(p, budget=None) -> Coef:
    """The reduced form written the other way round: cos^2 -> 1 - sin^2 in every family."""
    current = Coef(registry().lift(p))
    num = registry().lift(current.num)
    for u, by_q in _families(num).items():
        for q, kinds in by_q.items():
            c_pos = kinds.get("cos")
            if c_pos is None or num.degrees()[c_pos] < 2:
                continue
            s = trig("sin", q * u)
            num = registry().lift(num)
            gen = registry().gen
            one_minus_s2 = Coef.constant(1) - s * s

            def image(key, c_pos=c_pos, gen=gen, one_minus_s2=one_minus_s2):
                (a,) = key
                out = one_minus_s2 ** (a // 2)
                return out * Coef(gen(c_pos)) if a % 2 else out

            rewritten = _rewrite(num, [c_pos], image, budget)
            if rewritten.den is not None:
                continue  # sin(q u) has a closed form with a denominator: keep the cosine
            num = registry().lift(rewritten.num)
    return Coef(num)


def shortest_display(p, budget=None, angle_budget=None) -> Coef:
    """Half angles merged into full ones (the rotor sandwich's form); otherwise the shorter
    of the cosine form and the sine form, ties going to the cosine form.  Then multiple
    angles and sums of angles where they are shorter (gacalc.simplify.angles, under
    ``angle_budget``, a share of ``budget``).  A long result over numeric angles is also
    tried as a sum of single cosines and sines."""
    merged, merged_half = merge_half_angles(p, budget)
    if merged_half or not _families(registry().lift(p)):
        best = merged
    else:
        alt = sine_form(merged.num, budget)
        best = alt if len(registry().lift(alt.num)) < len(registry().lift(merged.num)) else merged
    if angle_budget is None:
        angle_budget = _angle_share(budget)
    best = collapse_angles(p, best, angle_budget)
    return _shorter_linear_form(p, best, budget)


def _angle_share(budget):
    """The angle rewrite's budget: ANGLE_SECONDS, never past ``budget``."""
    from .budget import Budget

    if budget is None:
        return Budget(ANGLE_SECONDS)
    return budget.within(ANGLE_SECONDS)


LONG_DISPLAY_CHARS = 300  # shorter displays are left exactly as they were


def _shorter_linear_form(p, best: Coef, budget) -> Coef:
    """``best``, or the product-to-sum form of p when p's text is long and that is shorter:
    cos(1/6) cos(7/32) written over cos(1/96) has degree 53; as cos(37/96)/2 + cos(5/96)/2
    it reads again.  Only numeric angles (a symbolic angle's products read well as they are)."""
    numeric = [u for u, by_q in _families(registry().lift(p)).items()
               if u.is_number and len(by_q) == 1]
    if not numeric:
        return best  # decided before printing anything: most values have no numeric angle
    text = best.text()
    if len(text) <= LONG_DISPLAY_CHARS:
        return best
    current = Coef(registry().lift(p))
    for u in numeric:
        candidate = _linearise_family(registry().lift(current.num), u, budget)
        if candidate is not None:
            current = candidate
    if current.den is None and len(current.text()) < len(text):
        return current
    return best


def _linearise_family(p, u, budget):
    """p with the products c^a s^b (c = cos x, s = sin x, b <= 1, x = q u) of one family
    replaced by sums of cos(k x), sin(k x); None when the family is not in reduced form.
    c^a = 2^-a sum_j C(a, j) cos((a - 2j) x) and
    s c^a = 2^-a sum_{j <= a/2} (C(a, j) - C(a, j - 1)) sin((a - 2j + 1) x)."""
    from math import comb

    (q, kinds), = _families(p)[u].items()
    c_pos, s_pos = kinds.get("cos"), kinds.get("sin")
    positions = [pos for pos in (c_pos, s_pos) if pos is not None]
    degs = p.degrees()
    if s_pos is not None and degs[s_pos] > 1:
        return None
    x = q * u

    def image(key):
        exps = dict(zip(positions, key))
        a, b = exps.get(c_pos, 0), exps.get(s_pos, 0)
        scale = Coef.constant(sympy.Rational(1, 2**a))
        out = Coef.constant(0)
        if b == 0:
            for j in range(a + 1):
                out = out + Coef.constant(comb(a, j)) * trig("cos", (a - 2 * j) * x)
        else:
            for j in range(a // 2 + 1):
                weight = comb(a, j) - (comb(a, j - 1) if j else 0)
                if weight:
                    out = out + Coef.constant(weight) * trig("sin", (a - 2 * j + 1) * x)
        return out * scale

    return _rewrite(p, positions, image, budget)


def over_half_angles(c: Coef):
    """The coefficient rewritten over the half of each single-angle trig family (cos u ->
    1 - 2 sin(u/2)^2 ...), reduced; None when it has no trig family.  Lets a square root
    see that 1/2 - cos(u)/2 is the square sin(u/2)^2."""
    if c.expr is not None:
        return None
    num, den = c.parts()
    companions = []
    for p in (num, den):
        if p is None:
            continue
        for u, by_q in _families(p).items():
            if len(by_q) == 1:
                (q,) = by_q
                companions.append(trig("cos", q * u / 2).num)
    if not companions:
        return None
    parts = []
    for p in (num, den):
        if p is not None:
            parts.append(reduce_poly_relations(p, None, companions=companions))
    return parts[0] if len(parts) == 1 else parts[0] / parts[1]

"""Code through the formula: dot and cross products of the vector arguments computed once,
the result put together from them (gacalc.formulas found and proved the formula).

``cheaper_plan`` builds that plan beside the expanded one (plan.build_plan) and keeps the
one with fewer operations (sympy.count_ops of everything evaluated); a tie keeps the
expanded components.  The formula is duck-typed: ``terms`` (coef with ``to_expr()``,
candidate with ``dots``, ``shape``, ``indices``), ``variables`` (with ``vector``, a
multivector whose components are the argument symbols) and ``denominator``.
"""

from __future__ import annotations

import sympy

from .plan import Plan, _temporaries, count_operations
from .common import layout_arguments

_SCALAR_SHAPES = {"one": 0, "triple": 0}
_VECTOR_SHAPES = {"vec": 1, "cross": 1}
_BIVECTOR_SHAPES = {"dualvec": 4, "wedge": 4}
_PSEUDO_SHAPES = {"pseudo": 7, "wedge3": 7}


def _total(counts) -> int:
    return sum(counts.values())


def cheaper_plan(expanded: Plan, formula, value, declared, reserved):
    """(plan, note): the formula's plan with a note saying so when it is cheaper, else
    the expanded plan and no note."""
    try:
        through = formula_plan(formula, value, declared, reserved)
    except (ValueError, TypeError, KeyError):
        return expanded, None
    if through is None:
        return expanded, None
    mine, theirs = _total(count_operations(through)), _total(count_operations(expanded))
    if mine < theirs:
        return through, (f"Computed through dot and cross products ({mine} operations; "
                         f"the expanded components take {theirs}).")
    return expanded, None


def formula_plan(formula, value, declared, reserved) -> Plan | None:
    """The plan of the formula for a read Value, or None when its slots differ."""
    arguments = layout_arguments(value.free_symbols, declared, reserved)
    taken = set(reserved) | {a.code_name for a in arguments} | {s.name for s in value.free_symbols}
    temporaries = _temporaries(taken)
    vectors = [[v.vector[k] for k in (1, 2, 3)] for v in formula.variables]
    assignments = []
    memo = {}

    def temp(key, expr):
        if key not in memo:
            symbol = next(temporaries)
            assignments.append((symbol, expr))
            memo[key] = symbol
        return memo[key]

    def dot(i, j):
        return temp(("dot", i, j), sum(x * y for x, y in zip(vectors[i], vectors[j])))

    def cross(i, j):
        a, b = vectors[i], vectors[j]
        parts = (a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0])
        return [temp(("cross", i, j, k), parts[k]) for k in range(3)]

    def slots_of(f):
        slots = [sympy.Integer(0)] * 8
        for term in f.terms:
            c = term.candidate
            factor = term.coef.to_expr()
            for i, j in c.dots:
                factor = factor * dot(i, j)
            shape, ix = c.shape, c.indices
            if shape in ("one", "pseudo"):
                parts = [sympy.Integer(1)]
            elif shape in ("triple", "wedge3"):
                x = cross(ix[1], ix[2])
                parts = [temp(("triple",) + tuple(ix), sum(p * q for p, q in zip(vectors[ix[0]], x)))]
            elif shape in ("vec", "dualvec"):
                parts = vectors[ix[0]]
            else:
                parts = cross(ix[0], ix[1])
            start = {**_SCALAR_SHAPES, **_VECTOR_SHAPES, **_BIVECTOR_SHAPES, **_PSEUDO_SHAPES}[shape]
            for offset, part in enumerate(parts):
                slots[start + offset] += factor * part
        return slots

    slots = slots_of(formula)
    if formula.denominator is not None:
        den = slots_of(formula.denominator)[0]
        inverse = temp(("inverse",), 1 / den)
        slots = [s * inverse for s in slots]
    wanted = [index for index, _ in value.components]
    if [k for k, s in enumerate(slots) if s != 0] != wanted:
        return None
    outputs = [slots[k] for k in wanted]
    replacements, reduced = sympy.cse(outputs, symbols=temporaries, order="canonical")
    assignments.extend(replacements)
    return Plan(arguments, assignments, [(expr,) for expr in reduced])

"""The computation a code emitter writes out: arguments, temporaries, outputs.

Shared by the Python, NumPy and C emitters so that all three compute the same thing the
same way: rotor sandwiches of declared rotors and vectors go through the cheap kernel
(rotor_kernel), everything else through sympy.cse with temporaries tmp0, tmp1, ...
numbered in order of use.
"""

from dataclasses import dataclass, field

import sympy

from .common import layout_arguments
from . import rotor_kernel

TEMPORARY_PREFIX = 'tmp'


@dataclass
class Plan:
    arguments: list
    assignments: list          # [(Symbol, Expr)] in evaluation order
    outputs: list              # [tuple of Expr terms], one per output slot: the sum
    #                            of the terms, kept apart so a kernel's x + w + w stays so
    sandwiches: list = field(default_factory=list)
    remarks: list = field(default_factory=list)   # how it computes (formula_plan's note)

    def notes(self):
        """Assumptions the generated code makes, one sentence each."""
        return [f'{s.describe()} is computed as a rotation: it assumes the unit rotor '
                f'condition {s.rotor_name} {s.rotor_name}~ = 1.' for s in self.sandwiches] \
            + list(self.remarks)

    def rewrite(self, transform):
        """The same plan with transform applied to every expression."""
        return Plan(self.arguments,
                    [(symbol, transform(expr)) for symbol, expr in self.assignments],
                    [tuple(transform(term) for term in terms) for terms in self.outputs],
                    self.sandwiches, self.remarks)


def _temporaries(taken):
    number = 0
    while True:
        name = f'{TEMPORARY_PREFIX}{number}'
        number += 1
        if name not in taken:
            yield sympy.Symbol(name, real=True)


def build_plan(expressions, free_symbols, declared, reserved, vector_slots=None):
    """Plan the evaluation of expressions (a list, in output order).

    vector_slots: the positions of the e1, e2, e3 outputs (None where a component is
    zero) when the value is a multivector, so that rotor sandwiches can be found.
    """
    arguments = layout_arguments(free_symbols, declared, reserved)
    taken = set(reserved) | {a.code_name for a in arguments} | {s.name for s in free_symbols}
    temporaries = _temporaries(taken)
    expressions = list(expressions)
    assignments, kernel_terms, sandwiches = [], {}, []
    if vector_slots is not None and None not in vector_slots:
        vector_part = [expressions[slot] for slot in vector_slots]
        sandwiches, rest = rotor_kernel.find_sandwiches(vector_part, arguments)
        for sandwich in sandwiches:
            kernel_assignments, kernel_outputs = rotor_kernel.kernel(
                sandwich, lambda: next(temporaries))
            assignments.extend(kernel_assignments)
            for slot, terms in zip(vector_slots, kernel_outputs):
                kernel_terms[slot] = kernel_terms.get(slot, ()) + terms
        if sandwiches:
            for slot, remainder in zip(vector_slots, rest):
                expressions[slot] = remainder

    # cse over everything but the kernels' sums, which are joined to the outputs after.
    expressions = cheapest_grouping(expressions, arguments)
    replacements, reduced = sympy.cse(expressions, symbols=temporaries, order='canonical')
    assignments.extend(replacements)
    outputs = []
    for slot, expr in enumerate(reduced):
        terms = kernel_terms.get(slot, ())
        outputs.append(terms + (expr,) if expr != 0 or not terms else terms)
    return Plan(arguments, assignments, outputs, sandwiches)


def _cse_cost(expressions):
    replacements, reduced = sympy.cse(expressions, order='canonical')
    return (sum(sympy.count_ops(expr) for _, expr in replacements)
            + sum(sympy.count_ops(expr) for expr in reduced))


def cheapest_grouping(expressions, arguments):
    """The expressions as given, or collected by the components of one sequence argument
    (x1' = m11 x1 + m12 x2 + m13 x3 instead of many monomials), whichever costs fewest
    operations after cse. Only polynomial dependence on those components is collected."""
    best, best_cost = expressions, None
    for argument in arguments:
        if not argument.is_sequence or argument.kind == 'rotor':
            continue
        components = list(argument.symbols)
        grouped = [sympy.collect(sympy.expand(expr), components)
                   if expr.free_symbols & set(components) and expr.is_polynomial(*components)
                   else expr for expr in expressions]
        if grouped == expressions:
            continue
        if best_cost is None:
            best_cost = _cse_cost(expressions)
        cost = _cse_cost(grouped)
        if cost < best_cost:
            best, best_cost = grouped, cost
    return best


def count_operations(plan):
    """sympy.count_ops of everything the plan evaluates, as {'MUL': n, 'ADD': n, ...}."""
    total = sympy.Integer(0)
    for _, expr in plan.assignments:
        total += sympy.count_ops(expr, visual=True)
    for terms in plan.outputs:
        for term in terms:
            total += sympy.count_ops(term, visual=True)
        total += (len(terms) - 1) * sympy.Symbol('ADD')
    counts = {}
    for term, coefficient in total.as_coefficients_dict().items():
        if term.is_Symbol:
            counts[term.name] = int(coefficient)
    return dict(sorted(counts.items()))


def join_terms(terms, text_of):
    """Code text of the sum of terms, each printed by text_of (kernel sums x + w + w)."""
    text = text_of(terms[0])
    for term in terms[1:]:
        piece = text_of(term)
        if term.is_Add or term.is_Mul or term.is_Atom:
            # A sum printed at the top level of a sum needs no parentheses.
            text += ' - ' + piece[1:].lstrip() if piece.startswith('-') else ' + ' + piece
        else:
            text += ' + (' + piece + ')'
    return text

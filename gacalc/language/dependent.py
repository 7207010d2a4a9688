"""Values of declared functions of a scalar (vector r(t)) as inputs of emitted code.

Generated Python and C take numbers, not functions: r1(t) becomes the input r1 (so the
declared r is passed as the sequence r, as for 'vector r'), and its derivatives become
inputs of their own, r_dt1 for diff(r1(t), t) and r_dt2_1 for the second, grouped as the
sequence r_dt (r_dt2) of the same layout.  The derivative of a rotor is not a unit rotor,
so it is declared 'even'."""

from __future__ import annotations

import sympy
from sympy.core.function import AppliedUndef

from gacalc.algebra.symbolic import KIND_COMPONENTS


def _owners(state) -> dict:
    """component name -> (declared name, kind, suffix) for declared functions of a scalar."""
    out = {}
    for name, kind in state.declarations.items():
        if name not in state.dependence:
            continue
        suffixes = KIND_COMPONENTS[kind][1]
        for suffix in suffixes:
            out[name + suffix] = (name, kind, suffix)
    return out


def inputs_for_emit(payload, state, declared: dict):
    """(payload with functions of a scalar replaced by input symbols, declared kinds).
    Derivatives at a shifted point (subs(...)) are left as they are: the emitter refuses
    them in words."""
    atoms = set()
    expressions = list(payload) if isinstance(payload, sympy.MatrixBase) else \
        [e for _, e in payload.items()] if hasattr(payload, "items") else [payload]
    for expr in expressions:
        if isinstance(expr, sympy.Basic):
            atoms |= expr.atoms(AppliedUndef, sympy.Derivative)
    if not atoms:
        return payload, declared
    owners = _owners(state)
    declared = dict(declared)
    mapping = {}
    for atom in sorted(atoms, key=str):
        if isinstance(atom, sympy.Derivative):
            function, counts = atom.expr, atom.variable_count
            if not isinstance(function, AppliedUndef) or len(counts) != 1:
                continue
            order = int(counts[0][1])
        else:
            function, order = atom, 0
        component = function.func.__name__
        if function.args != tuple(sympy.Symbol(p, real=True)
                                  for p in state.dependence.get(component, ())):
            continue
        owner = owners.get(component)
        if owner is None:
            continue
        name, kind, suffix = owner
        if order:
            name = f"{name}_dt" + ("" if order == 1 else str(order))
            if kind == "rotor":
                kind = "even"
            if kind != "scalar":
                declared[name] = kind
        if kind == "scalar":
            mapping[atom] = sympy.Symbol(name, real=True)
        else:
            declared.setdefault(name, kind)
            mapping[atom] = sympy.Symbol(name + suffix, real=True)
    if isinstance(payload, sympy.MatrixBase):
        return payload.xreplace(mapping), declared
    if isinstance(payload, sympy.Basic):
        return payload.xreplace(mapping), declared
    from gacalc.algebra import Multivector

    return Multivector({k: e.xreplace(mapping) for k, e in payload.items()}), declared

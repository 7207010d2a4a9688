"""A fresh algebra context for a long session: only the generators its values still use.

A registry only grows: every symbol, cos(u), sqrt(p) met once stays a variable of every
later flint context, so a session that declares and drops many symbols would make each
new polynomial (and each lift into a new context) pay for all of them.  ``renewed`` builds
a new context and rewrites every coefficient reachable from the given roots over it (the
way a coefficient of another session is adopted: through its own registry, so values are
unchanged).  Values made before stay readable: their polynomials still name the old
registry.
"""

from __future__ import annotations

import types

import sympy

from .coefficients import Coef
from .context import AlgebraContext
from .multivector import Multivector

# objects that hold no coefficients (and must not be walked into)
_LEAVES = (str, bytes, int, float, complex, bool, type(None), sympy.Basic, type,
           types.ModuleType, types.FunctionType, types.BuiltinFunctionType, types.MethodType)


def renewed(old: AlgebraContext, roots) -> AlgebraContext:
    """A new context with ``old``'s hooks holding exactly the generators that the
    coefficients reachable from ``roots`` use; those coefficients are rewritten over it."""
    fresh = AlgebraContext(old.hooks)
    with fresh.active():
        for coef in _coefficients(roots):
            if coef.expr is None:
                coef.parts()           # adopts it into the current (fresh) registry
    return fresh


def _coefficients(roots):
    """Every Coef reachable from ``roots`` through containers and object attributes."""
    seen: set[int] = set()
    stack = list(roots)
    while stack:
        item = stack.pop()
        if isinstance(item, _LEAVES) or id(item) in seen:
            continue
        seen.add(id(item))
        if isinstance(item, Coef):
            yield item
        elif isinstance(item, Multivector):
            stack.extend(c for c in item.coefs() if c is not None)
        elif isinstance(item, dict):
            stack.extend(item.values())
        elif isinstance(item, (list, tuple, set, frozenset)):
            stack.extend(item)
        else:
            stack.extend(_attributes(item))


def _attributes(item):
    values = list(getattr(item, "__dict__", {}).values())
    for cls in type(item).__mro__:
        for name in getattr(cls, "__slots__", ()):
            if name != "__weakref__" and hasattr(item, name):
                values.append(getattr(item, name))
    return values

"""Heavy libraries imported on first use, so that a rational statement starts fast.

Importing sympy (or anything under it) costs more than the rest of gacalc together, and
`gacalc -e 'e1 e2'` never needs it: coefficients are flint polynomials and print from
them.  Modules write ``from gacalc.lazy import sympy`` and use ``sympy.X`` as before; the
first attribute read imports the real module.  Type checks on a path that must stay light
ask ``loaded("sympy")`` first: no sympy object can exist before sympy is imported.
"""

from __future__ import annotations

import importlib
import sys


class LazyModule:
    """Stands for a module (or one object in it, ``attribute``); every attribute read or
    write is passed on, the module imported on the first one.  Nothing is cached here, so
    monkeypatching the real module still takes."""

    __slots__ = ("_lazy_name", "_lazy_attribute")

    def __init__(self, name: str, attribute: str | None = None):
        object.__setattr__(self, "_lazy_name", name)
        object.__setattr__(self, "_lazy_attribute", attribute)

    def _lazy_target(self):
        name = object.__getattribute__(self, "_lazy_name")
        module = sys.modules.get(name) or importlib.import_module(name)
        attribute = object.__getattribute__(self, "_lazy_attribute")
        return module if attribute is None else getattr(module, attribute)

    def __getattr__(self, attr):
        return getattr(self._lazy_target(), attr)

    def __setattr__(self, attr, value):
        setattr(self._lazy_target(), attr, value)

    def __repr__(self):
        name = object.__getattribute__(self, "_lazy_name")
        attribute = object.__getattribute__(self, "_lazy_attribute")
        state = "imported" if loaded(name) else "not yet imported"
        return f"<lazy {name}{'.' + attribute if attribute else ''} ({state})>"


def loaded(name: str) -> bool:
    """Whether the module has been imported (objects of its types can exist)."""
    return sys.modules.get(name) is not None


sympy = LazyModule("sympy")
mpmath = LazyModule("mpmath")

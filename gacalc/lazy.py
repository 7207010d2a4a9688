"""Heavy libraries imported on first use, so that a rational statement starts fast.

Importing sympy (or anything under it) costs more than the rest of gacalc together, and
`gacalc -e 'e1 e2'` never needs it: coefficients are flint polynomials and print from
them.  Modules write ``from gacalc.lazy import sympy`` and use ``sympy.X`` as before; the
first attribute read imports the real module.  Type checks on a path that must stay light
ask ``loaded("sympy")`` first: no sympy object can exist before sympy is imported.
"""

from __future__ import annotations

import gc
import importlib
import sys

# the stand-ins handed out by ``from gacalc.lazy import NAME`` while NAME is not imported
_MODULES = ("sympy", "mpmath")


class LazyModule:
    """Stands for a module (or one object in it, ``attribute``); every attribute read or
    write is passed on, the module imported on the first one.

    When the module is first imported, every global of a gacalc module that holds this
    stand-in is pointed at the real object: a read through the stand-in costs about a
    microsecond, one of a module global nothing.  Nothing is cached in the stand-in, so
    monkeypatching the real module still takes."""

    __slots__ = ("_lazy_name", "_lazy_attribute", "_lazy_rebound")

    def __init__(self, name: str, attribute: str | None = None):
        object.__setattr__(self, "_lazy_name", name)
        object.__setattr__(self, "_lazy_attribute", attribute)
        object.__setattr__(self, "_lazy_rebound", False)

    def _lazy_target(self):
        name = object.__getattribute__(self, "_lazy_name")
        module = sys.modules.get(name) or importlib.import_module(name)
        attribute = object.__getattribute__(self, "_lazy_attribute")
        target = module if attribute is None else getattr(module, attribute)
        if not object.__getattribute__(self, "_lazy_rebound"):
            object.__setattr__(self, "_lazy_rebound", True)
            _rebind(self, target)
        return target

    def __getattr__(self, attr):
        return getattr(self._lazy_target(), attr)

    def __setattr__(self, attr, value):
        setattr(self._lazy_target(), attr, value)

    def __repr__(self):
        name = object.__getattribute__(self, "_lazy_name")
        attribute = object.__getattribute__(self, "_lazy_attribute")
        state = "imported" if loaded(name) else "not yet imported"
        return f"<lazy {name}{'.' + attribute if attribute else ''} ({state})>"


def _rebind(stand_in: LazyModule, target):
    """Point the gacalc module globals that hold ``stand_in`` at ``target``."""
    for module_name, module in list(sys.modules.items()):
        if module is None or not (module_name == "gacalc" or module_name.startswith("gacalc.")):
            continue
        namespace = getattr(module, "__dict__", {})
        for key, value in list(namespace.items()):
            if value is stand_in:
                namespace[key] = target


def loaded(name: str) -> bool:
    """Whether the module has been imported (objects of its types can exist)."""
    return sys.modules.get(name) is not None


_STAND_INS = {name: LazyModule(name) for name in _MODULES}


def __getattr__(name):
    # ``from gacalc.lazy import sympy``: the real module once it is imported, else the stand-in
    if name in _STAND_INS:
        return sys.modules.get(name) or _STAND_INS[name]
    raise AttributeError(f"module 'gacalc.lazy' has no attribute {name!r}")


_frozen: set = set()


def freeze_imported():
    """Once sympy is imported, move every object alive now out of the cyclic collector's
    sight (``gc.freeze``).  A library's objects live as long as the process, yet each full
    collection walks all of them: with sympy loaded that is 20-35 ms, once every few
    hundred statements of a script.  Frozen objects are still freed by reference
    counting; only cyclic garbage among them is kept.  Cheap to call after every
    statement: it acts once per library."""
    for name in _MODULES:
        if name not in _frozen and loaded(name):
            _frozen.add(name)
            gc.freeze()

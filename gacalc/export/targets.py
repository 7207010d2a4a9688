"""The export targets: one table read by the token table, the parser, the session
(file suffixes of emit) and help.  A new target is one emitter module plus one
``register`` call here.

Importing this module is cheap (no sympy): an emitter is named as "module:function"
and imported when first used.  The function is called as
``function(value, name=..., declared=..., options=...)`` with a
gacalc.export.common.Value and returns the text.
"""

from __future__ import annotations

import importlib
from dataclasses import dataclass


@dataclass(frozen=True)
class ExportTarget:
    name: str               # the word after emit
    suffix: str             # file suffix of an emit without 'to' (with --emit-dir)
    emitter: object         # "module:function" under gacalc.export, or a callable
    help: str | None = None # its line in `help emit`; None for a variant listed by name only

    def emitter_function(self):
        if callable(self.emitter):
            return self.emitter
        module, _, function = self.emitter.partition(":")
        return getattr(importlib.import_module(module, __package__), function)

    def __call__(self, value, **fields):
        return self.emitter_function()(value, **fields)


TARGETS: dict[str, ExportTarget] = {}


def register(target: ExportTarget) -> ExportTarget:
    TARGETS[target.name] = target
    return target


def unregister(name: str):
    TARGETS.pop(name, None)


def target(name: str) -> ExportTarget | None:
    return TARGETS.get(name)


def described() -> list[ExportTarget]:
    """The targets with a help line (variants such as numpy are left out)."""
    return [t for t in TARGETS.values() if t.help is not None]


register(ExportTarget("latex", ".tex", ".latex:emit", "emit latex EXPR          LaTeX"))
register(ExportTarget("python", ".py", ".python:emit",
                      "emit python EXPR as f    a Python function f"))
register(ExportTarget("numpy", ".py", ".python:emit_numpy",
                      "emit numpy EXPR as f     the Python function, element-wise on numpy arrays"))
register(ExportTarget("c", ".c", ".c:emit", 'emit c EXPR to "out.c"   C code written to a file'))

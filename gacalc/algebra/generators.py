"""The generators of one coefficient domain: what each stands for, and their flint context.

A registry lists the generators met so far, in order of first appearance; a polynomial's
variable at position k + 1 is generator k (position 0 is a placeholder that keeps the
context non-empty).  Each registry names that placeholder after itself, so the flint
contexts of two registries never coincide and ``owner_of`` finds the registry a
polynomial belongs to: a value keeps its meaning when it is printed outside the session
that made it.
"""

from __future__ import annotations

import itertools
import re

import flint

ORDER = "deglex"  # higher degree first, then generators in order of first use

# ctx -> the registry that made it: an index for owner_of, holding no data of its own
_OWNERS: dict = {}  # flint keeps every context alive anyway; so does this index
_SERIALS = itertools.count()


class GeneratorInfo:
    """What a generator stands for; the simplifier reads ``kind`` and the fields."""

    __slots__ = ("expr", "name", "kind", "trig", "root")

    def __init__(self, expr, name, kind, trig=None, root=None):
        self.expr = expr  # the sympy Expr the generator stands for
        self.name = name  # ASCII text, valid gacalc input; also the flint variable name
        self.kind = kind  # 'symbol', 'cos', 'sin', 'root', 'other'
        self.trig = trig  # (q, u) for cos(q u) / sin(q u): q > 0 rational, u the base
        self.root = root  # (base Coef, n) for base^(1/n)


class GeneratorRegistry:
    """The generators seen so far, in order of first appearance, and their flint context.

    Public attributes: ``ctx`` (the current flint context), ``infos`` (GeneratorInfo in
    order; position k + 1 is infos[k]), ``placeholder`` (the name of position 0)."""

    def __init__(self):
        self.placeholder = f"_one{next(_SERIALS)}"
        self.infos: list[GeneratorInfo] = []
        self._by_expr: dict = {}
        self._names: set[str] = set()
        self._fallbacks = itertools.count()
        self._contexts: set = set()
        self._use_context(flint.fmpq_mpoly_ctx.get((self.placeholder,), ORDER))
        self._display_key = None
        self._display_ctx = None

    def _use_context(self, ctx):
        self.ctx, self._gens = ctx, ctx.gens()
        self._contexts.add(ctx)
        _OWNERS[ctx] = self

    # -- public interface ----------------------------------------------------------------

    def position(self, expr) -> int | None:
        """The flint variable position of the generator for a sympy Expr, or None if unknown."""
        idx = self._by_expr.get(expr)
        return None if idx is None else idx + 1

    def add(self, expr, name: str, kind: str, trig=None, root=None) -> int:
        """Register a new generator under ``name`` (a fresh one if taken); its position."""
        if name in self._names or not name.isascii():
            name = self._fallback_name()
        info = GeneratorInfo(expr, name, kind, trig, root)
        # Build the new context first so an interrupt cannot leave the registry torn.
        ctx = flint.fmpq_mpoly_ctx.get((self.placeholder,) + tuple(i.name for i in self.infos) + (name,), ORDER)
        self.infos.append(info)
        self._by_expr[expr] = len(self.infos) - 1
        self._names.add(name)
        self._use_context(ctx)
        return len(self.infos)

    def _fallback_name(self) -> str:
        # deterministic: the same input makes the same names in every run
        while True:
            name = f"_g{next(self._fallbacks)}"
            if name not in self._names:
                return name

    def info(self, position: int) -> GeneratorInfo:
        """Info of the generator at a flint variable position (position 0 is the placeholder)."""
        return self.infos[position - 1]

    def gen(self, position: int):
        """The polynomial of the generator at a flint variable position, in the current context."""
        return self._gens[position]

    def constant(self, value):
        """A constant polynomial in the current context."""
        return self.ctx.constant(value)

    def owns(self, p) -> bool:
        """Whether the polynomial is written in one of this registry's contexts."""
        return p.context() in self._contexts

    def lift(self, p):
        """A polynomial of this registry in its current context (the value is unchanged)."""
        if p.context() is self.ctx:
            return p
        return p.project_to_context(self.ctx)

    def display(self, p):
        """p in a context whose variables are sorted by name, so that printed term order
        depends on the symbols alone, not on the order a process first met them."""
        key = len(self.infos)
        if self._display_key != key:
            names = sorted((i.name for i in self.infos), key=_display_order)
            self._display_ctx = flint.fmpq_mpoly_ctx.get((self.placeholder,) + tuple(names), ORDER)
            self._display_key = key
        return self.lift(p).project_to_context(self._display_ctx)

    def __len__(self):
        return len(self.infos)


def owner_of(p) -> GeneratorRegistry | None:
    """The registry whose context a polynomial is written in (None for a foreign context)."""
    return _OWNERS.get(p.context())


def _display_order(name: str):
    """Plain symbols first, then functions and radicals; digits compare as numbers (a2 < a10)."""
    compound = not name.replace("_", "").isalnum()
    parts = re.split(r"(\d+)", name)
    return (compound, [int(x) if x.isdigit() else x for x in parts])

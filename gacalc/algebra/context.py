"""The per-session state of the algebra, and the hooks it takes from outside.

An ``AlgebraContext`` holds everything that grows while values are computed: the generator
registry of the coefficient domain, and a store where the layers above keep caches that
depend on it (gacalc.simplify keeps its condition sets there).  The current context is
found through a ContextVar; a default context serves library use, a Session owns one and
activates it while it runs statements.

The algebra applies no relations between generators itself.  The zero test, the
coefficient reduction and the simplification it needs come from an installed
``Simplifier``: gacalc.simplify installs the standard one when it is imported.  Without
it the exact defaults of the base class hold (zero means structurally zero).  Display in
notebooks works the same way: gacalc.export installs the LaTeX printer.
"""

from __future__ import annotations

import contextvars
from contextlib import contextmanager

from .generators import GeneratorRegistry


class Simplifier:
    """The simplification the algebra calls; these defaults apply no relations at all."""

    def reduce(self, coef):
        """A coefficient in canonical form modulo the generator relations."""
        return coef

    def decide_zero(self, coef):
        """True / False / None (undecided) for 'this coefficient is zero'."""
        if coef is None or coef.is_zero():
            return True
        return False if coef.is_constant() else None

    def is_zero(self, mv, conditions=()):
        """True / False / None for 'this multivector vanishes' (given scalar conditions)."""
        verdicts = [self.decide_zero(c) for c in mv.coefs() if c is not None]
        if all(v is True for v in verdicts):
            return True
        return False if any(v is False for v in verdicts) else None

    def simplify(self, mv, conditions=()):
        """The multivector with each coefficient in its display form."""
        return mv

    def exact_square_root(self, base):
        """sqrt(base) as an exact coefficient when the base is a known square, else None."""
        return None

    def exact_atan2(self, y, x):
        """atan2(y, x) of numbers as an exact coefficient when the angle is known, else None."""
        return None


class Hooks:
    """What the algebra takes from outside: a simplifier and a LaTeX printer for display."""

    def __init__(self, simplifier: Simplifier | None = None, latex=None):
        self.simplifier = simplifier or Simplifier()
        self.latex = latex  # value -> LaTeX math text, or None: no rich display


# the implementations installed by gacalc.simplify / gacalc.export (code, not session data)
INSTALLED = Hooks()


def install_simplifier(simplifier: Simplifier) -> None:
    """Make ``simplifier`` the one every context without its own hooks uses."""
    INSTALLED.simplifier = simplifier


def install_latex(printer) -> None:
    """Make ``printer`` (value -> LaTeX) the rich display of multivectors in notebooks."""
    INSTALLED.latex = printer


class AlgebraContext:
    """One session's generator registry and caches, and the hooks it uses."""

    def __init__(self, hooks: Hooks | None = None):
        self.registry = GeneratorRegistry()
        self.hooks = hooks if hooks is not None else INSTALLED
        self._stores: dict = {}

    @property
    def simplifier(self) -> Simplifier:
        """The simplifier in use for this context."""
        return self.hooks.simplifier

    def store(self, name: str, factory):
        """A mutable object kept for the layer that named it (made by ``factory`` on first use)."""
        found = self._stores.get(name)
        if found is None:
            found = self._stores[name] = factory()
        return found

    @contextmanager
    def active(self):
        """Make this the current context for the duration of a with block."""
        token = _CURRENT.set(self)
        try:
            yield self
        finally:
            _CURRENT.reset(token)


DEFAULT_CONTEXT = AlgebraContext()
_CURRENT: contextvars.ContextVar[AlgebraContext] = contextvars.ContextVar("gacalc_algebra", default=DEFAULT_CONTEXT)


def current() -> AlgebraContext:
    """The algebra context in effect (the default one unless a Session activated its own)."""
    return _CURRENT.get()


def registry() -> GeneratorRegistry:
    """The generator registry of the current context."""
    return _CURRENT.get().registry

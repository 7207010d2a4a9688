"""Kinds of gacalc values: one module per kind, one registry.

A kind says everything the language needs to know about one type of value: its name in
messages, its arithmetic, its text, how ``check`` compares two of them, what ``show``
reports, what ``emit`` receives and how the size limits measure it.  The evaluator,
the session, the printers and the report ask ``kind_of(value)`` and never test types
themselves, so a new kind of value is one new module plus one ``register`` call.

    from gacalc.values import kind_of, register
    kind_of(value).text(value, unicode=False, width=78)
"""

from __future__ import annotations

from .kind import ValueKind

_KINDS: list[ValueKind] = []


def register(kind: ValueKind) -> ValueKind:
    """Add a kind; later registrations are asked first (a subtype before its base)."""
    _KINDS.insert(0, kind)
    return kind


def unregister(kind: ValueKind):
    _KINDS.remove(kind)


def kind_of(value) -> ValueKind | None:
    """The kind of a value, or None for anything that is not a gacalc value."""
    for kind in _KINDS:
        if kind.matches(value):
            return kind
    return None


def describe(value) -> str:
    """A short description of a value's kind, for error messages."""
    if isinstance(value, str):          # a word in quotes, as built-ins with words see it
        return f'the word "{value}"'
    kind = kind_of(value)
    return kind.describe(value) if kind is not None else "a value"


def symbols(value) -> frozenset:
    """The scalar symbols a value depends on, as far as side conditions are concerned."""
    kind = kind_of(value)
    return kind.symbols(value) if kind is not None else frozenset()


def size(value):
    """The size the limits measure (gacalc.language.limits.Size), or None: small."""
    kind = kind_of(value)
    return kind.size(value) if kind is not None else None


from . import sequence, quaternion, matrix, multivector, linmap  # noqa: E402  (register the built-in kinds)

__all__ = ["ValueKind", "register", "unregister", "kind_of", "describe", "symbols", "size"]

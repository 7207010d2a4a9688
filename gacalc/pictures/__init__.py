"""Pictures of numeric values: the ``draw`` statement and its Python call.

    import gacalc
    picture = gacalc.draw("e1 + e2", "rotor(e12, pi/3)", to="turn.svg")
    picture.figure          # the matplotlib Figure; picture.scene holds the numbers

matplotlib is an optional extra (``pip install 'gacalc[draw]'``); nothing here imports it
(or numpy) until a picture is drawn.
"""

from __future__ import annotations

MISSING = "draw needs matplotlib, which is not installed: pip install 'gacalc[draw]'"

__all__ = ["draw", "MISSING"]


def draw(*values, to: str | None = None, size=None, session=None):
    """Draw gacalc values as ``draw X, ... [to "file"]`` would; the DrawResult.

    Each value is a Multivector or a string of gacalc text (names of ``session`` allowed,
    and ``rotate(R, x)`` / ``reflect(x, n)`` drawn with their reference vectors).  ``to``
    writes a .svg or .png file; ``size`` is (width, height) in pixels.  A GacalcError
    when a value is not numeric (it names the symbols still without a number)."""
    from gacalc.language.errors import GacalcError

    if session is None:
        from gacalc.api import session as shared

        session = shared()
    if not values:
        raise TypeError("draw needs at least one value")
    parts = [value if isinstance(value, str) else _input_text(session, value)
             for value in values]
    text = "draw " + ", ".join(parts)
    if to is not None:
        to = str(to)
        if '"' in to or "\n" in to:
            raise ValueError("a picture's file name cannot contain '\"' or a line break")
        text += f' to "{to}"'
    previous = session.picture_size
    if size is not None:
        session.picture_size = (int(size[0]), int(size[1]))
    try:
        results = session.run(text)
    finally:
        session.picture_size = previous
    if results and isinstance(results[-1], GacalcError):
        raise results[-1]
    return results[-1]


def _input_text(session, value) -> str:
    from gacalc.values import kind_of

    if kind_of(value) is None:
        from gacalc.algebra import as_multivector

        value = as_multivector(value, "draw")
    return " ".join(session.format(value, unicode=False).split())

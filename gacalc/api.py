"""The public Python API: a Session that evaluates text and trades values with Python.

    from gacalc import Session, parse_value
    s = Session()
    s.evaluate("vector n unit")
    R = s.evaluate("rotor(e12, pi/3)")        # a Multivector
    s["x"] = R * parse_value("e1") * ~R    # back into the session as the name x

Everything here is reached through ``gacalc`` (loaded lazily, see gacalc/__init__.py).
"""

from __future__ import annotations

from gacalc.language.errors import GacalcError, GacalcNameError
from gacalc.language.session import Session as _LanguageSession
from gacalc.language.results import ValueResult

__all__ = ["Session", "parse_value", "session", "draw"]


class Session(_LanguageSession):
    """A gacalc session for Python code: names persist from one ``evaluate`` to the next.

    ``evaluate(text)`` runs statements and returns the value of the last expression or
    assignment (None when there was none); a mistake raises the GacalcError with its
    position (``caret_text()`` shows it).  ``session["x"]`` reads a name, and
    ``session["x"] = value`` assigns one (a Multivector, or a Python/sympy scalar).
    ``run`` (the language's) gives every result instead."""

    def evaluate(self, text: str):
        """The value of the last expression or assignment in ``text`` (None if none)."""
        results = self.run(text)
        if results and isinstance(results[-1], GacalcError):
            raise results[-1]
        values = [r for r in results if isinstance(r, ValueResult)]
        return values[-1].value if values else None

    def __getitem__(self, name: str):
        value = self.get(name)
        if value is None:
            raise KeyError(name)
        return value

    def __contains__(self, name: str) -> bool:
        return self.get(name) is not None

    def __setitem__(self, name: str, value):
        """Assign a name as the statement ``name = value`` would: the value's text (valid
        input) is run as that statement, so it is checked, uses this session's real scalar
        symbols and is kept for ``save``."""
        from gacalc.algebra.multivector import as_multivector
        from gacalc.values import kind_of

        _check_name(name)
        if kind_of(value) is None:
            try:
                value = as_multivector(value, f"the value of {name}")
            except ArithmeticError as error:
                raise TypeError(str(error)) from None
        # the value's input text, spelled in the context it was made in; the statement
        # reads it back with this session's (real) symbols
        text = self.format(value, unicode=False)
        results = self.run(f"{name} = {_input_text(text)};")
        if results and isinstance(results[-1], GacalcError):
            raise results[-1]

    def draw(self, *values, to: str | None = None, size=None):
        """A picture of numeric values (see gacalc.pictures.draw); names of this session are
        accepted as strings of gacalc text, e.g. ``s.draw("rotate(R, x)", "x")``."""
        from gacalc.pictures import draw as draw_values

        return draw_values(*values, to=to, size=size, session=self)


def _input_text(text: str) -> str:
    # the printed text is input text; a multi-line matrix printout joins into one line
    return " ".join(text.split())


def _check_name(name: str):
    from gacalc.language.scanner import tokenize
    from gacalc.language import tokens as T

    tokens = [t for t in tokenize(name) if t.kind != T.EOF] if isinstance(name, str) else []
    if len(tokens) != 1 or tokens[0].kind != T.NAME or tokens[0].text != name:
        raise GacalcNameError(f"{name!r} is not a name that can be assigned "
                              "(a letter, then letters, digits and inner underscores; "
                              "not a keyword, constant or basis blade)")


def parse_value(text: str, session: Session | None = None):
    """The value of one gacalc expression, e.g. ``parse_value("rotor(e12, pi/2)")``;
    in a fresh session unless one is given.  A GacalcError (with its position) when the
    text is not a valid expression."""
    return (session or Session()).evaluate(text)


_DEFAULT: list[Session] = []


def session() -> Session:
    """The shared session of this Python process (the one ``%gac`` cells use)."""
    if not _DEFAULT:
        _DEFAULT.append(Session())
    return _DEFAULT[0]


def draw(*values, to: str | None = None, size=None):
    """A picture of numeric values in the shared session (see gacalc.pictures.draw)."""
    return session().draw(*values, to=to, size=size)

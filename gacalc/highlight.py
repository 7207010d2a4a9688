"""Pygments lexer for gacalc, generated from the language's one token table.

Every rule comes from ``gacalc.language.tokens.token_patterns()`` in the same priority
order the scanner uses, with the token type from ``PYGMENTS_TOKEN_TYPES``: no regular
expression is written here, so highlighting cannot disagree with parsing.  The lexer is
registered under the ``pygments.lexers`` entry point (alias ``gacalc``, files ``*.gac``).
"""

from __future__ import annotations

from pygments.lexer import RegexLexer
from pygments.token import string_to_tokentype

from gacalc.language.tokens import PYGMENTS_TOKEN_TYPES, token_patterns


def _rules() -> list[tuple[str, object]]:
    return [(regex, string_to_tokentype(PYGMENTS_TOKEN_TYPES[kind]))
            for kind, regex in token_patterns()]


class GacalcLexer(RegexLexer):
    """Lexer for gacalc scripts (``.gac``) and REPL input."""

    name = "gacalc"
    aliases = ["gacalc", "gac"]
    filenames = ["*.gac"]
    mimetypes = ["text/x-gacalc"]
    # The token table's patterns use neither ^ nor $, so no flags are needed; the
    # default MULTILINE is harmless.
    tokens = {"root": _rules()}

    def __init__(self, **options):
        # Keep leading and trailing blank lines: the REPL highlights exactly what is typed.
        options.setdefault("stripnl", False)
        super().__init__(**options)


def highlight_text(text: str, formatter=None) -> str:
    """``text`` highlighted for a terminal (or with the given pygments formatter)."""
    from pygments import highlight
    from pygments.formatters import TerminalFormatter

    return highlight(text, GacalcLexer(), formatter or TerminalFormatter())

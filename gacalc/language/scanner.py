"""Scanner: program text -> tokens with spans, built from the one token table.

Whitespace and comments are dropped.  A NEWLINE token is produced only where a line
break ends a statement: not inside open brackets ``( )`` and ``< >``, and not after an
operator or comma that needs a right-hand side (so long printed results broken after
``+`` still read back).  Bad characters and unterminated strings come out as ERROR /
UNTERMINATED_STRING tokens: the parser reports them when it reaches them, so
statements before a mistake still run.
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from functools import lru_cache
from typing import Iterator

from . import tokens as T
from .errors import GacalcSyntaxError, Source, Span


@dataclass(frozen=True)
class Token:
    kind: str
    text: str          # the characters as written
    value: str         # normalised: Greek letters spelled out, superscripts as "-1"
    span: Span

    @property
    def is_name(self) -> bool:
        return self.kind in T.NAME_KINDS

    def __repr__(self) -> str:
        return f"Token({self.kind}, {self.value!r})"


@lru_cache(maxsize=1)
def master_pattern() -> re.Pattern:
    alternatives = "|".join(f"(?P<{kind}>{regex})" for kind, regex in T.token_patterns())
    return re.compile(alternatives)


_SUPERSCRIPT_TO_ASCII = str.maketrans(T.SUPERSCRIPT_DIGITS + T.SUPERSCRIPT_MINUS,
                                      "0123456789-")


def _normalise(kind: str, text: str) -> str:
    if kind in T.NAME_KINDS:
        if text.isascii():
            return text
        return "".join(T.GREEK_INPUT.get(char, char) for char in text)
    if kind == T.SUPERSCRIPT:
        return text.translate(_SUPERSCRIPT_TO_ASCII)
    if kind == T.STRING:
        return text[1:-1]
    for ascii_kind, spellings in T.OPERATOR_SPELLINGS.items():
        if kind == ascii_kind:
            return spellings[0]
    return text


_OPENERS = {T.LPAREN: T.RPAREN, T.LANGLE: T.RANGLE, T.LBRACKET: T.RBRACKET}
_CLOSERS = {T.RPAREN, T.RANGLE, T.RBRACKET}


def raw_tokens(source: Source) -> Iterator[Token]:
    """Every token including whitespace and comments (for tools and tests)."""
    pattern = master_pattern()
    text = source.text
    position = 0
    while position < len(text):
        match = pattern.match(text, position)
        kind = match.lastgroup
        end = match.end()
        piece = match.group()
        yield Token(kind, piece, _normalise(kind, piece), Span(source, position, end))
        position = end


def scan(source: Source | str, filename: str | None = None) -> Iterator[Token]:
    """Significant tokens of a program, ending with one EOF token."""
    if isinstance(source, str):
        source = Source(source, filename)
    depth = 0
    brackets = 0          # open '[' (a ';' inside separates matrix rows)
    previous_kind = None
    comparing = False     # after assume/given, '<' and '>' compare: they open nothing
    for token in raw_tokens(source):
        kind = token.kind
        if kind in T.TRIVIA_KINDS:
            continue
        if kind == T.NEWLINE:
            if depth > 0 or previous_kind in T.CONTINUATION_KINDS:
                continue
            if previous_kind == T.NEWLINE:
                continue      # blank lines are one separator
            comparing = False
        elif kind == T.KEYWORD and token.value in T.COMPARISON_KEYWORDS:
            comparing = True
        elif kind in _OPENERS and not (comparing and kind == T.LANGLE):
            depth += 1
            brackets += kind == T.LBRACKET
        elif kind in _CLOSERS and not (comparing and kind == T.RANGLE):
            depth = max(0, depth - 1)
            brackets = max(0, brackets - (kind == T.RBRACKET))
        elif kind == T.SEMICOLON and brackets > 0:
            token = Token(T.ROWSEP, token.text, token.value, token.span)
            kind = T.ROWSEP
        elif kind == T.SEMICOLON:
            depth = 0         # a ';' ends a statement (unclosed brackets error)
            comparing = False
        previous_kind = kind
        yield token
    end = len(source.text)
    yield Token(T.EOF, "", "", Span(source, end, end))


def tokenize(text: str, filename: str | None = None) -> list[Token]:
    return list(scan(Source(text, filename)))


def needs_more_input(text: str) -> bool:
    """True when typed text cannot be complete yet: open brackets, or the last line ends
    with an operator or comma.  For REPLs that accept multi-line input."""
    depth = 0
    brackets = 0
    last = None
    comparing = False
    for token in raw_tokens(Source(text)):
        if token.kind in T.TRIVIA_KINDS or token.kind == T.NEWLINE:
            continue
        if token.kind == T.KEYWORD and token.value in T.COMPARISON_KEYWORDS:
            comparing = True
        elif token.kind in _OPENERS and not (comparing and token.kind == T.LANGLE):
            depth += 1
            brackets += token.kind == T.LBRACKET
        elif token.kind in _CLOSERS and not (comparing and token.kind == T.RANGLE):
            depth = max(0, depth - 1)
            brackets = max(0, brackets - (token.kind == T.RBRACKET))
        elif token.kind == T.SEMICOLON and brackets > 0:
            continue          # a row separator: the matrix is still open
        elif token.kind == T.SEMICOLON:
            depth = 0
            comparing = False
        last = token.kind
    return depth > 0 or last in T.CONTINUATION_KINDS


def token_error(token: Token) -> GacalcSyntaxError:
    """The error for an ERROR or UNTERMINATED_STRING token."""
    if token.kind == T.UNTERMINATED_STRING:
        return GacalcSyntaxError("string not closed: add '\"' before the end of the line",
                                 token.span)
    char = token.text
    if char == "\\":
        message = "stray '\\': the outer product is written /\\ or ∧"
    elif char == "|":
        message = "stray '|': contractions are written _| (left) and |_ (right)"
    elif char == "_":
        message = "stray '_': names cannot start or end with an underscore"
    elif char == "!":
        message = "unexpected '!'"
    elif char in "{}":
        message = f"unexpected '{char}': group with ( and ); matrices are written [a, b; c, d]"
    elif char == "'":
        message = "unexpected \"'\": strings are written in double quotes"
    elif char == "@" or char == "$" or char == "`" or char == "?" or char == "&" or char == "%":
        message = f"unexpected '{char}'"
    elif not char.isprintable():
        message = f"unexpected control character U+{ord(char):04X}"
    else:
        message = f"unexpected character '{char}' (U+{ord(char):04X})"
    return GacalcSyntaxError(message, token.span)

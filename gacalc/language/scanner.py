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
from functools import lru_cache
from typing import Iterator

from . import tokens as T
from .errors import GacalcSyntaxError, Source, Span


class Token:
    """One token: ``kind``, ``text`` (the characters as written), ``value`` (normalised:
    Greek letters spelled out, superscripts as "-1", operators in their ASCII spelling),
    its place ``source``, ``start``, ``end`` and the ``span`` made of them.  Immutable by
    convention; a slotted class because a script makes one per token, and the Span only
    on request (most tokens never need theirs).  Equality and hashing as a frozen
    dataclass of (kind, text, value, span)."""

    __slots__ = ("kind", "text", "value", "source", "start", "end")

    def __init__(self, kind: str, text: str, value: str, span: Span | Source,
                 start: int | None = None, end: int | None = None):
        self.kind = kind
        self.text = text
        self.value = value
        if start is None:                  # Token(kind, text, value, span)
            self.source, self.start, self.end = span.source, span.start, span.end
        else:                              # Token(kind, text, value, source, start, end)
            self.source, self.start, self.end = span, start, end

    @property
    def span(self) -> Span:
        return Span(self.source, self.start, self.end)

    @property
    def is_name(self) -> bool:
        return self.kind in T.NAME_KINDS

    def _fields(self):
        return (self.kind, self.text, self.value, self.start, self.end)

    def __eq__(self, other):
        if other.__class__ is not Token:
            return NotImplemented
        return self._fields() == other._fields()

    def __hash__(self):
        return hash(self._fields())

    def __repr__(self) -> str:
        return f"Token({self.kind}, {self.value!r})"


@lru_cache(maxsize=1)
def master_pattern() -> re.Pattern:
    """All token patterns in priority order; ``match.lastgroup`` names the kind.

    Each alternative is the pattern followed by an empty group named after its kind,
    rather than the pattern inside the group: an alternative that starts with a literal
    character or a character set lets the regex engine skip it at a glance when the text
    does not start so, where a leading group has to be entered first (a third of the
    scanner's regex time on a long script)."""
    patterns = T.token_patterns()
    for kind, regex in patterns:
        if re.compile(regex).groups:      # lastgroup must be the kind's own empty group
            raise ValueError(f"token pattern {kind} has a capturing group")
    return re.compile("|".join(f"(?:{regex})(?P<{kind}>)" for kind, regex in patterns))


@lru_cache(maxsize=1)
def lexeme_pattern() -> re.Pattern:
    """The same alternatives without groups: ``findall`` then returns the texts of the
    matches (which tile the text) as plain strings, with no match object per token."""
    return re.compile("|".join(f"(?:{regex})" for _, regex in T.token_patterns()))


_CHUNK = 1 << 15


def _chunks(text: str) -> Iterator[list[str]]:
    """The texts of the matches of lexeme_pattern, in order, a list per chunk: findall
    runs on chunks of some 32 KB ending just after a line break (no token crosses one,
    and no pattern looks past one), so a 2 MB input is neither one uninterruptible call
    nor one huge list."""
    findall = lexeme_pattern().findall
    position = 0
    while position < len(text):
        cut = text.find("\n", position + _CHUNK)
        cut = len(text) if cut < 0 else cut + 1
        yield findall(text, position, cut)
        position = cut


# text of a token -> its kind.  A token's kind depends on its text alone, except for the
# CONTEXTUAL_WORDS (classified where they stand); scripts repeat the same few texts.
_KIND_OF_TEXT: dict[str, str] = {}
_CONTEXTUAL = object()
_KIND_CACHE_LIMIT = 20_000


def _kind_of_text(text: str):
    """The kind of a token written ``text`` wherever it stands, or _CONTEXTUAL."""
    kind = _KIND_OF_TEXT.get(text)
    if kind is None:
        match = master_pattern().match(text)
        if text in T.CONTEXTUAL_WORDS or match.end() != len(text):
            kind = _CONTEXTUAL        # (a shorter match alone: a lookahead saw past it)
        else:
            kind = match.lastgroup
        if len(_KIND_OF_TEXT) >= _KIND_CACHE_LIMIT:
            _KIND_OF_TEXT.clear()     # a long session of ever new numbers and names
        _KIND_OF_TEXT[text] = kind
    return kind


_SUPERSCRIPT_TO_ASCII = str.maketrans(T.SUPERSCRIPT_DIGITS + T.SUPERSCRIPT_MINUS,
                                      "0123456789-")


# Operators and punctuation normalise to their ASCII spelling, whatever was written.
_ASCII_SPELLING = {kind: spellings[0] for kind, spellings in T.OPERATOR_SPELLINGS.items()}


def _normalise(kind: str, text: str) -> str:
    ascii_spelling = _ASCII_SPELLING.get(kind)
    if ascii_spelling is not None:
        return ascii_spelling
    if kind in T.NAME_KINDS:
        if text.isascii():
            return text
        return "".join(T.GREEK_INPUT.get(char, char) for char in text)
    if kind == T.SUPERSCRIPT:
        return text.translate(_SUPERSCRIPT_TO_ASCII)
    if kind == T.STRING:
        return text[1:-1]
    return text


_OPENERS = {T.LPAREN: T.RPAREN, T.LANGLE: T.RANGLE, T.LBRACKET: T.RBRACKET}
_CLOSERS = {T.RPAREN, T.RANGLE, T.RBRACKET}


def raw_tokens(source: Source) -> Iterator[Token]:
    """Every token including whitespace and comments (for tools and tests)."""
    # every character matches some pattern (the last one takes any single character), so
    # the matches of finditer tile the text
    for match in master_pattern().finditer(source.text):
        kind = match.lastgroup
        piece = match.group()
        start, end = match.span()
        yield Token(kind, piece, _normalise(kind, piece), source, start, end)


_FLAWED = frozenset({T.ERROR, T.UNTERMINATED_STRING})


def scan_statements(source: Source) -> Iterator[tuple[list[Token], Token, bool]]:
    """The significant tokens a statement at a time: ``(tokens, terminator, flawed)``
    for each NEWLINE, ';' or EOF that ends one (``tokens`` may be empty), the last
    ending with EOF.  ``flawed``: some token is an ERROR or UNTERMINATED_STRING, for the
    parser to report.  Handing the parser a statement's list at once, rather than a
    token at a time, saves a generator step and a kind test per token of a script."""
    depth = 0
    brackets = 0          # open '[' (a ';' inside separates matrix rows)
    previous_kind = None
    comparing = False     # after assume/given, '<' and '>' compare: they open nothing
    trivia, newline, keyword, semicolon = T.TRIVIA_KINDS, T.NEWLINE, T.KEYWORD, T.SEMICOLON
    continuation, ascii_spelling = T.CONTINUATION_KINDS, _ASCII_SPELLING
    number, name_kinds, flaws = T.NUMBER, T.NAME_KINDS, _FLAWED
    tokens: list[Token] = []
    append = tokens.append
    flawed = False
    text = source.text
    kinds = _KIND_OF_TEXT
    end = 0
    # The texts of all matches come from findall at once; each one's kind from the table
    # of texts seen before.  Trivia is skipped before any token object is made: most of
    # a script's matches are spaces.  (This loop runs once per token of a script.)
    for pieces in _chunks(text):
        for piece in pieces:
            start = end
            end = start + len(piece)
            kind = kinds.get(piece) or _kind_of_text(piece)
            if kind is _CONTEXTUAL:
                kind = master_pattern().match(text, start).lastgroup
            if kind in trivia:
                continue
            ends = False
            if kind == newline:
                if depth > 0 or previous_kind in continuation or previous_kind == newline:
                    continue      # inside brackets, after an operator; blank lines are one
                comparing = False
                ends = True
            elif kind in _OPENERS:
                if not (comparing and kind == T.LANGLE):
                    depth += 1
                    brackets += kind == T.LBRACKET
            elif kind in _CLOSERS:
                if not (comparing and kind == T.RANGLE):
                    depth = max(0, depth - 1)
                    brackets = max(0, brackets - (kind == T.RBRACKET))
            elif kind == semicolon:
                if brackets > 0:
                    kind = T.ROWSEP
                else:
                    depth = 0     # a ';' ends a statement (unclosed brackets error)
                    comparing = False
                    ends = True
            value = ascii_spelling.get(kind)
            if value is None:
                if kind == number or (kind in name_kinds and piece.isascii()):
                    value = piece         # _normalise's answer for most other tokens
                else:
                    value = _normalise(kind, piece)
                    if kind == keyword and value in T.COMPARISON_KEYWORDS:
                        comparing = True
                    elif kind in flaws:
                        flawed = True
            previous_kind = kind
            token = Token(kind, piece, value, source, start, end)
            if ends:
                yield tokens, token, flawed
                tokens = []
                append = tokens.append
                flawed = False
            else:
                append(token)
    end = len(text)
    yield tokens, Token(T.EOF, "", "", source, end, end), flawed


def scan(source: Source | str, filename: str | None = None) -> Iterator[Token]:
    """Significant tokens of a program, ending with one EOF token."""
    if isinstance(source, str):
        source = Source(source, filename)
    for tokens, terminator, _ in scan_statements(source):
        yield from tokens
        yield terminator


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

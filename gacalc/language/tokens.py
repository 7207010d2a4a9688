"""The one token table of the gacalc language.

The scanner (gacalc.language.scanner) and the syntax highlighter (gacalc.highlight)
are both built from this table, so highlighting never disagrees with parsing.

Public API
----------
- ``token_patterns()`` -> list of ``(kind, regex_source)`` in priority order: at any
  position the FIRST pattern that matches wins (that is how both the scanner's master
  regex and a pygments ``RegexLexer`` behave).  Every character of any text is matched
  by some pattern (the last one, ``ERROR``, takes a single character), no pattern
  matches the empty string, and no pattern uses ``^``/``$``, so the patterns can be
  used with or without ``re.MULTILINE``.
- ``PYGMENTS_TOKEN_TYPES`` -> ``{kind: "Operator" | "Name" | "Name.Builtin" | ...}``,
  the pygments token type (as a dotted name under ``pygments.token``) of each kind.
- ``OPERATOR_SPELLINGS`` -> ``{kind: (ascii, unicode, *other accepted spellings)}``.
- ``KEYWORDS`` (reserved words), ``DECLARATION_KINDS`` (reserved too, except that
  ``rotor`` followed by anything but a name is the built-in function), ``SOFT_KEYWORDS``
  (words with a meaning only inside one statement -- ``unit``, ``none``, ``force`` and
  the ``EMIT_TARGETS`` -- otherwise ordinary names, highlighted as names),
  ``GREEK_LETTERS`` (name -> letter), ``NAME_KINDS`` (kinds the parser reads as names).

Lexical rules
-------------
- Names: a letter (ASCII or Greek), then letters, digits and *inner* underscores: an
  underscore must be followed by a letter or digit, so ``a_|b`` is ``a _| b``.  A Greek
  letter in a name stands for its spelled-out name (``θ1`` is the name ``theta1``).
- Numbers: digits, optionally ``.`` and more digits; exact (``0.5`` is 1/2).  There is
  no scientific notation: ``2e1`` is the number 2 followed by the blade e1.
  A decimal needs digits on both sides of the point (``.`` alone is the inner product).
- Strings: ``"..."`` on one line.  There are no escapes: a backslash is an ordinary
  character (handy for Windows paths); a string cannot contain ``"``.
- ``#`` starts a comment to the end of the line.
- Unicode spellings are accepted everywhere: ``∧ ⌋ ⌊ · ⋅ † ˜ − ⟨ ⟩`` and the
  superscript exponents ``² ⁻¹``.
"""

from __future__ import annotations

from gacalc.export import targets as _export_targets

# Token kinds -------------------------------------------------------------------
NEWLINE = "NEWLINE"
WHITESPACE = "WHITESPACE"
COMMENT = "COMMENT"
STRING = "STRING"
UNTERMINATED_STRING = "UNTERMINATED_STRING"
NUMBER = "NUMBER"
SUPERSCRIPT = "SUPERSCRIPT"
KEYWORD = "KEYWORD"
DECLARATION = "DECLARATION"
BLADE = "BLADE"
CONSTANT = "CONSTANT"
BUILTIN = "BUILTIN"
NAME = "NAME"
WEDGE = "WEDGE"
LCONTRACT = "LCONTRACT"
RCONTRACT = "RCONTRACT"
EQEQ = "EQEQ"
EQUALS = "EQUALS"
INNER = "INNER"
PLUS = "PLUS"
MINUS = "MINUS"
STAR = "STAR"
SLASH = "SLASH"
CARET = "CARET"
REVERSE = "REVERSE"
LANGLE = "LANGLE"
LESSEQ = "LESSEQ"
GREATEREQ = "GREATEREQ"
RANGLE = "RANGLE"
LPAREN = "LPAREN"
RPAREN = "RPAREN"
LBRACKET = "LBRACKET"
RBRACKET = "RBRACKET"
COMMA = "COMMA"
SEMICOLON = "SEMICOLON"
ERROR = "ERROR"
EOF = "EOF"  # produced by the scanner only, never matched by a pattern
ROWSEP = "ROWSEP"  # produced by the scanner only: a ';' inside [ ] separates matrix rows

# Spellings of operators and punctuation: (ASCII, Unicode, other accepted spellings).
OPERATOR_SPELLINGS: dict[str, tuple[str, ...]] = {
    WEDGE: ("/\\", "\u2227"),             # ∧
    LCONTRACT: ("_|", "\u230b"),          # ⌋
    RCONTRACT: ("|_", "\u230a"),          # ⌊
    EQEQ: ("==", "=="),
    EQUALS: ("=", "="),
    INNER: (".", "\u00b7", "\u22c5"),     # · ⋅
    PLUS: ("+", "+"),
    MINUS: ("-", "\u2212"),               # −
    STAR: ("*", "*"),
    SLASH: ("/", "/"),
    CARET: ("^", "^"),
    REVERSE: ("~", "\u2020", "\u02dc"),   # † ˜
    LESSEQ: ("<=", "\u2264"),             # ≤ (ranges: assume 0 <= a)
    GREATEREQ: (">=", "\u2265"),          # ≥
    LANGLE: ("<", "\u27e8"),              # ⟨
    RANGLE: (">", "\u27e9"),              # ⟩
    LPAREN: ("(", "("),
    RPAREN: (")", ")"),
    LBRACKET: ("[", "["),
    RBRACKET: ("]", "]"),
    COMMA: (",", ","),
    SEMICOLON: (";", ";"),
}

# Words whose kind depends on the text after them (the one lookahead of the table that
# looks past a token's end): "rotor R" declares, "rotor(a, b)" calls.  The scanner
# classifies every other token by its text alone.
CONTEXTUAL_WORDS = frozenset({"rotor"})

# Reserved words: never names.
KEYWORDS = ("check", "given", "assume", "show", "against", "emit", "as", "to",
            "use", "save", "help", "formula", "draw", "budget")
# Declarations: reserved words, except that "rotor" followed by "(" is the function.
DECLARATION_KINDS = ("scalar", "vector", "bivector", "rotor", "multivector", "matrix3")
# The export targets of gacalc.export.targets (the parser reads that table itself, so a
# target registered later is accepted too).
EMIT_TARGETS = tuple(_export_targets.TARGETS)
# Words with a meaning inside one statement only; elsewhere they are ordinary names.
SOFT_KEYWORDS = ("unit", "none", "force", "in", "auto", "off", "components", *EMIT_TARGETS)
CONSTANTS = ("pi", "I")

GREEK_LETTERS = {
    "alpha": "α", "beta": "β", "gamma": "γ", "delta": "δ", "epsilon": "ε",
    "zeta": "ζ", "eta": "η", "theta": "θ", "iota": "ι", "kappa": "κ",
    "lambda": "λ", "mu": "μ", "nu": "ν", "xi": "ξ", "omicron": "ο", "pi": "π",
    "rho": "ρ", "sigma": "σ", "tau": "τ", "upsilon": "υ", "phi": "φ", "chi": "χ",
    "psi": "ψ", "omega": "ω",
    "Gamma": "Γ", "Delta": "Δ", "Theta": "Θ", "Lambda": "Λ", "Xi": "Ξ", "Pi": "Π",
    "Sigma": "Σ", "Upsilon": "Υ", "Phi": "Φ", "Psi": "Ψ", "Omega": "Ω",
}
# Greek letters read on input -> spelled-out name (variant forms included).


def greek(name: str) -> str:
    """The Unicode spelling of a name: theta -> θ, theta2 -> θ2; other names unchanged."""
    stem = name.rstrip("0123456789")
    letter = GREEK_LETTERS.get(stem)
    return letter + name[len(stem):] if letter else name


GREEK_INPUT = {letter: name for name, letter in GREEK_LETTERS.items()}
GREEK_INPUT.update({"ϑ": "theta", "ϕ": "phi", "ϵ": "epsilon", "ς": "sigma",
                    "Α": "Alpha", "Β": "Beta", "Ε": "Epsilon", "Ζ": "Zeta", "Η": "Eta",
                    "Ι": "Iota", "Κ": "Kappa", "Μ": "Mu", "Ν": "Nu", "Ο": "Omicron",
                    "Ρ": "Rho", "Τ": "Tau", "Χ": "Chi"})

SUPERSCRIPT_DIGITS = "⁰¹²³⁴⁵⁶⁷⁸⁹"
SUPERSCRIPT_MINUS = "⁻"

# Building blocks of the patterns ------------------------------------------------
_GREEK_CLASS = "".join(sorted(GREEK_INPUT))
_LETTER = f"[A-Za-z{_GREEK_CLASS}]"
_ALNUM = f"[A-Za-z0-9{_GREEK_CLASS}]"
_NAME_CONTINUE = f"(?:{_ALNUM}|_(?={_ALNUM}))"
_WORD_END = f"(?!{_NAME_CONTINUE})"   # a word is not followed by more of a name


def _words(words) -> str:
    ordered = sorted(set(words), key=lambda word: (-len(word), word))
    return "(?:" + "|".join(ordered) + ")" + _WORD_END


def _spellings(kind: str) -> str:
    import re

    ordered = sorted(set(OPERATOR_SPELLINGS[kind]), key=len, reverse=True)
    return "|".join(re.escape(spelling) for spelling in ordered)


def builtin_function_names() -> tuple[str, ...]:
    """Names of the built-in functions (from the builtins table; no sympy import)."""
    from .builtins import BUILTIN_NAMES

    return BUILTIN_NAMES


def token_patterns() -> list[tuple[str, str]]:
    """(kind, regex) pairs in priority order; see the module docstring."""
    superscripts = f"{SUPERSCRIPT_MINUS}?[{SUPERSCRIPT_DIGITS}]+"
    return [
        (NEWLINE, r"\r?\n"),
        (WHITESPACE, r"[ \t\f\v\r]+"),
        (COMMENT, r"#[^\n]*"),
        (STRING, r'"[^"\n]*"'),
        (UNTERMINATED_STRING, r'"[^"\n]*'),
        (NUMBER, r"[0-9]+(?:\.[0-9]+)?"),
        (SUPERSCRIPT, superscripts),
        (KEYWORD, _words(KEYWORDS)),
        # "rotor" is also a function: a declaration only when a name follows ("rotor R").
        (DECLARATION, _words(k for k in DECLARATION_KINDS if k not in CONTEXTUAL_WORDS)
         + "".join(f"|{word}(?=[ \\t]+{_LETTER})" for word in sorted(CONTEXTUAL_WORDS))),
        (BLADE, "e[1-3]+" + _WORD_END),
        (CONSTANT, _words(CONSTANTS)),
        (BUILTIN, _words(builtin_function_names())),
        (NAME, f"{_LETTER}{_NAME_CONTINUE}*"),
        # Operators: longer spellings before their prefixes (/\ before /, == before =).
        (WEDGE, _spellings(WEDGE)),
        (LCONTRACT, _spellings(LCONTRACT)),
        (RCONTRACT, _spellings(RCONTRACT)),
        (EQEQ, _spellings(EQEQ)),
        (EQUALS, _spellings(EQUALS)),
        (INNER, _spellings(INNER)),
        (PLUS, _spellings(PLUS)),
        (MINUS, _spellings(MINUS)),
        (STAR, _spellings(STAR)),
        (SLASH, _spellings(SLASH)),
        (CARET, _spellings(CARET)),
        (REVERSE, _spellings(REVERSE)),
        # '<=' and '>=' (ranges), but '>==' stays '>' '==' (check <A>== 1)
        (LESSEQ, "<=(?!=)|\u2264"),
        (GREATEREQ, ">=(?!=)|\u2265"),
        (LANGLE, _spellings(LANGLE)),
        (RANGLE, _spellings(RANGLE)),
        (LPAREN, _spellings(LPAREN)),
        (RPAREN, _spellings(RPAREN)),
        (LBRACKET, _spellings(LBRACKET)),
        (RBRACKET, _spellings(RBRACKET)),
        (COMMA, _spellings(COMMA)),
        (SEMICOLON, _spellings(SEMICOLON)),
        (ERROR, r"[\s\S]"),
    ]


# Pygments token type of each kind, as a dotted name under pygments.token.
PYGMENTS_TOKEN_TYPES: dict[str, str] = {
    NEWLINE: "Text.Whitespace",
    WHITESPACE: "Text.Whitespace",
    COMMENT: "Comment",
    STRING: "String",
    UNTERMINATED_STRING: "Error",
    NUMBER: "Number",
    SUPERSCRIPT: "Number",
    KEYWORD: "Keyword",
    DECLARATION: "Keyword.Declaration",
    BLADE: "Name.Constant",
    CONSTANT: "Name.Constant",
    BUILTIN: "Name.Builtin",
    NAME: "Name",
    WEDGE: "Operator",
    LCONTRACT: "Operator",
    RCONTRACT: "Operator",
    EQEQ: "Operator",
    EQUALS: "Operator",
    INNER: "Operator",
    PLUS: "Operator",
    MINUS: "Operator",
    STAR: "Operator",
    SLASH: "Operator",
    CARET: "Operator",
    REVERSE: "Operator",
    LESSEQ: "Operator",
    GREATEREQ: "Operator",
    LANGLE: "Punctuation",
    RANGLE: "Punctuation",
    LPAREN: "Punctuation",
    RPAREN: "Punctuation",
    LBRACKET: "Punctuation",
    RBRACKET: "Punctuation",
    COMMA: "Punctuation",
    SEMICOLON: "Punctuation",
    ERROR: "Error",
}

# Kinds the parser reads as names (the difference only matters to the highlighter
# and to the evaluator's resolution of the name).
NAME_KINDS = frozenset({NAME, BLADE, CONSTANT, BUILTIN})
# Keywords after which '<' and '>' compare (ranges) rather than open grade brackets.
COMPARISON_KEYWORDS = frozenset({"assume", "given"})
# Kinds the scanner drops before parsing.
TRIVIA_KINDS = frozenset({WHITESPACE, COMMENT})
# A line ending right after one of these continues on the next line.
CONTINUATION_KINDS = frozenset({WEDGE, LCONTRACT, RCONTRACT, EQEQ, EQUALS, INNER, PLUS,
                                LESSEQ, GREATEREQ,
                                MINUS, STAR, SLASH, CARET, COMMA})

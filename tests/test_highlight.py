"""The pygments lexer generated from the token table: exact tokens, no Error tokens on
the shipped scripts, a lossless round trip, and agreement with the parser's scanner."""

import importlib.metadata

import pytest
from pygments.token import Comment, Error, Keyword, Name, Number, Operator, Punctuation, \
    String, Text

from gacalc.examples import example_paths
from gacalc.highlight import GacalcLexer
from gacalc.language.errors import Source
from gacalc.language.scanner import raw_tokens
from gacalc.language.tokens import PYGMENTS_TOKEN_TYPES, token_patterns

WS = Text.Whitespace


def lex(text):
    """(type, text) pairs of the raw lexer, without pygments' newline post-processing."""
    return [(kind, value) for _, kind, value in GacalcLexer().get_tokens_unprocessed(text)]


def test_rules_are_the_token_table_in_order():
    # Generated, not restated: the same regexes in the same priority order.
    rules = GacalcLexer.tokens["root"]
    assert [regex for regex, *_ in rules] == [regex for _, regex in token_patterns()]


def test_declaration_and_wedge_tokens():
    assert lex("vector a, b\nx = a /\\ b") == [
        (Keyword.Declaration, "vector"), (WS, " "), (Name, "a"), (Punctuation, ","),
        (WS, " "), (Name, "b"), (WS, "\n"),
        (Name, "x"), (WS, " "), (Operator, "="), (WS, " "), (Name, "a"), (WS, " "),
        (Operator, "/\\"), (WS, " "), (Name, "b"),
    ]


def test_check_with_builtin_blade_number_comment():
    assert lex("check rotor(e12, 2 theta)~ == 1 # why") == [
        (Keyword, "check"), (WS, " "), (Name.Builtin, "rotor"), (Punctuation, "("),
        (Name.Constant, "e12"), (Punctuation, ","), (WS, " "), (Number, "2"), (WS, " "),
        (Name, "theta"), (Punctuation, ")"), (Operator, "~"), (WS, " "), (Operator, "=="),
        (WS, " "), (Number, "1"), (WS, " "), (Comment, "# why"),
    ]


def test_unicode_operators_grade_brackets_and_strings():
    assert lex("⟨a ∧ b⟩2 ⌋ θ² ; use \"m.gac\"") == [
        (Punctuation, "⟨"), (Name, "a"), (WS, " "), (Operator, "∧"), (WS, " "), (Name, "b"),
        (Punctuation, "⟩"), (Number, "2"), (WS, " "), (Operator, "⌋"), (WS, " "),
        (Name, "θ"), (Number, "²"), (WS, " "), (Punctuation, ";"), (WS, " "),
        (Keyword, "use"), (WS, " "), (String, '"m.gac"'),
    ]


def test_rotor_as_call_is_a_builtin_not_a_declaration():
    assert lex("rotor R")[0] == (Keyword.Declaration, "rotor")
    assert lex("rotor(e12, t)")[0] == (Name.Builtin, "rotor")


def test_underscore_rule_of_names():
    # DESIGN.md: no trailing underscore, so a_|b is a _| b.
    assert lex("a_|b") == [(Name, "a"), (Operator, "_|"), (Name, "b")]
    assert lex("n_top")[0] == (Name, "n_top")


def test_mistakes_are_error_tokens():
    assert lex('x = "open')[-1] == (Error, '"open')
    assert (Error, "$") in lex("a $ b")


@pytest.mark.parametrize("path", example_paths(), ids=lambda p: p.name)
def test_examples_have_no_error_tokens_and_round_trip(path):
    text = path.read_text(encoding="utf-8")
    tokens = lex(text)
    assert [value for kind, value in tokens if kind in Error] == []
    assert "".join(value for _, value in tokens) == text
    # the public get_tokens path keeps the text too (apart from the final newline
    # pygments guarantees)
    processed = "".join(value for _, value in GacalcLexer().get_tokens(text))
    assert processed == text if text.endswith("\n") else processed == text + "\n"


@pytest.mark.parametrize("path", example_paths(), ids=lambda p: p.name)
def test_lexer_agrees_with_the_scanner(path):
    text = path.read_text(encoding="utf-8")
    from pygments.token import string_to_tokentype

    expected = [(string_to_tokentype(PYGMENTS_TOKEN_TYPES[token.kind]), token.text)
                for token in raw_tokens(Source(text))]
    assert lex(text) == expected


def test_round_trip_of_awkward_text():
    text = "\n\n  x = (a + b\n)~^-1 <M>  ⟨B⟩ ·· e1e2 2e1 0.5\t# end\n\n"
    assert "".join(value for _, value in lex(text)) == text


def _installed() -> bool:
    try:
        entry_points = importlib.metadata.entry_points(group="pygments.lexers")
    except TypeError:       # Python < 3.10 API; not supported by gacalc anyway
        return False
    return any(entry.name == "gacalc" for entry in entry_points)


@pytest.mark.skipif(not _installed(), reason="gacalc is not installed (entry point missing)")
def test_registered_with_pygments():
    from pygments.lexers import get_lexer_by_name, get_lexer_for_filename

    assert isinstance(get_lexer_by_name("gacalc"), GacalcLexer)
    assert isinstance(get_lexer_for_filename("mirrors.gac"), GacalcLexer)

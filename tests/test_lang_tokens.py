"""The token table and the scanner: kinds, spellings, spans, continuation lines."""

import re

import pytest

from gacalc.language import tokens as T
from gacalc.language.errors import Source
from gacalc.language.scanner import needs_more_input, raw_tokens, tokenize


def kinds(text):
    return [(token.kind, token.value) for token in tokenize(text)[:-1]]


def test_patterns_cover_every_kind_and_compile():
    patterns = T.token_patterns()
    assert [kind for kind, _ in patterns][-1] == T.ERROR
    for kind, regex in patterns:
        compiled = re.compile(regex)
        assert compiled.match("") is None, kind         # never matches the empty string
        assert kind in T.PYGMENTS_TOKEN_TYPES
    assert {kind for kind, _ in patterns} == set(T.PYGMENTS_TOKEN_TYPES)


def test_pygments_type_names_exist():
    pygments_token = pytest.importorskip("pygments.token")
    for name in T.PYGMENTS_TOKEN_TYPES.values():
        token_type = pygments_token
        for part in name.split("."):
            token_type = getattr(token_type, part)
        assert token_type in pygments_token.Token


def test_raw_tokens_cover_the_text_exactly():
    text = 'vector a, b  # two\ncheck a /\\ b == -(b ∧ a)\nx = "p\\q" ⟨a⟩2 θ² @'
    pieces = list(raw_tokens(Source(text)))
    assert "".join(token.text for token in pieces) == text


def test_names_and_underscores():
    assert kinds("a_|b") == [(T.NAME, "a"), (T.LCONTRACT, "_|"), (T.NAME, "b")]
    assert kinds("a|_b") == [(T.NAME, "a"), (T.RCONTRACT, "|_"), (T.NAME, "b")]
    assert kinds("x_1 long_name2") == [(T.NAME, "x_1"), (T.NAME, "long_name2")]
    assert kinds("a__b")[0] == (T.NAME, "a")                # no double underscore
    assert kinds("a__b")[1][0] == T.ERROR


def test_numbers_are_exact_and_have_no_exponent():
    assert kinds("2e1") == [(T.NUMBER, "2"), (T.BLADE, "e1")]
    assert kinds("0.5") == [(T.NUMBER, "0.5")]
    assert kinds("1.") == [(T.NUMBER, "1"), (T.INNER, ".")]
    assert kinds("2a") == [(T.NUMBER, "2"), (T.NAME, "a")]


def test_blades_constants_builtins_keywords():
    assert kinds("e1 e123 e312 e4 e12x pi I pix") == [
        (T.BLADE, "e1"), (T.BLADE, "e123"), (T.BLADE, "e312"), (T.NAME, "e4"),
        (T.NAME, "e12x"), (T.CONSTANT, "pi"), (T.CONSTANT, "I"), (T.NAME, "pix")]
    assert kinds("norm normx norm_x") == [(T.BUILTIN, "norm"), (T.NAME, "normx"),
                                          (T.NAME, "norm_x")]
    assert kinds("check checks") == [(T.KEYWORD, "check"), (T.NAME, "checks")]


def test_declaration_words():
    assert kinds("vector a")[0] == (T.DECLARATION, "vector")
    assert kinds("rotor R")[0] == (T.DECLARATION, "rotor")
    assert kinds("rotor(e12, t)")[0] == (T.BUILTIN, "rotor")
    assert kinds("rotor")[0] == (T.BUILTIN, "rotor")
    assert kinds("vectors")[0] == (T.NAME, "vectors")


@pytest.mark.parametrize("ascii_text, unicode_text", [
    ("a /\\ b", "a ∧ b"), ("a _| b", "a ⌋ b"), ("a |_ b", "a ⌊ b"), ("a . b", "a · b"),
    ("a . b", "a ⋅ b"), ("a~", "a†"), ("a~", "a˜"), ("a - b", "a − b"), ("<a>", "⟨a⟩"),
])
def test_unicode_spellings_normalise_to_ascii(ascii_text, unicode_text):
    assert kinds(ascii_text) == kinds(unicode_text)


def test_greek_letters_are_spelled_out():
    assert kinds("θ θ1 φ π") == [(T.NAME, "theta"), (T.NAME, "theta1"), (T.NAME, "phi"),
                                 (T.NAME, "pi")]


def test_superscripts():
    assert kinds("x² y⁻¹ z¹²") == [(T.NAME, "x"), (T.SUPERSCRIPT, "2"), (T.NAME, "y"),
                                  (T.SUPERSCRIPT, "-1"), (T.NAME, "z"), (T.SUPERSCRIPT, "12")]


def test_strings_and_comments():
    assert kinds('use "a\\b.gac"  # comment') == [(T.KEYWORD, "use"), (T.STRING, "a\\b.gac")]
    assert kinds('use "open')[1][0] == T.UNTERMINATED_STRING


def test_spans_have_line_and_column():
    tokens = tokenize("a = 1\n  b~")
    b = [t for t in tokens if t.value == "b"][0]
    assert (b.span.line, b.span.column) == (2, 3)
    assert b.span.text == "b"


def test_newlines_inside_brackets_and_after_operators_continue():
    assert T.NEWLINE not in [k for k, _ in kinds("f(a,\n b)")]
    assert T.NEWLINE not in [k for k, _ in kinds("<a\n b>")]
    assert T.NEWLINE not in [k for k, _ in kinds("a +\n b")]
    assert T.NEWLINE not in [k for k, _ in kinds("a +  # note\n b")]
    assert T.NEWLINE in [k for k, _ in kinds("a\n+ b")]
    assert [k for k, _ in kinds("a\n\n\nb")].count(T.NEWLINE) == 1


def test_needs_more_input():
    assert needs_more_input("f(a,")
    assert needs_more_input("a +")
    assert needs_more_input("<a b")
    assert not needs_more_input("a + b")
    assert not needs_more_input("f(a))")      # too many closers: complete (and an error)
    assert not needs_more_input("")

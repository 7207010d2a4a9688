"""The fast paths of scripts give what the general paths give.

- literal sums (numbers times blades) evaluated in fractions (gacalc/language/literals.py)
  against the general evaluator (the literal path switched off) and against an exact
  reference built here on the product table of tests/ga_reference.py (an independent
  Cl(3,0); its entries are exactly 0 and +-1);
- errors inside literals keep their messages and positions;
- the scanner against the token-by-token reading of ``raw_tokens`` it replaced, and the
  parser's leaf shortcut against the full descent.
"""

from __future__ import annotations

import itertools
import random
from fractions import Fraction

import pytest

import ga_reference as ref
from gacalc.algebra import Multivector
from gacalc.language import GacalcError, Session
from gacalc.language import evaluator as evaluator_module
from gacalc.language import parser as parser_module
from gacalc.language import syntax as S
from gacalc.language import tokens as T
from gacalc.language.errors import Source
from gacalc.language.scanner import Token, raw_tokens, scan

# blade names as written, with their (sign, basis position) from the reference's rule
BLADE_NAMES = ["e1", "e2", "e3", "e23", "e31", "e12", "e123", "e21", "e13", "e32", "e312",
               "e11", "e1212", "e321", "I"]


def _reference_blade(name):
    """The exact components of a blade name, by ga_reference's sign rule."""
    out = [Fraction(0)] * 8
    if name == "I":
        out[7] = Fraction(1)
        return out
    sign, sorted_word = ref._canonical(tuple(int(ch) for ch in name[1:]))
    orientation, k = ref._SORTED[sorted_word]
    out[k] = Fraction(sign * orientation)
    return out


def _reference_product(a, b):
    out = [Fraction(0)] * 8
    for i, j, k in itertools.product(range(8), range(8), range(8)):
        entry = int(ref.TABLE[i, j, k])        # exactly -1, 0 or 1
        if entry and a[i] and b[j]:
            out[k] += entry * a[i] * b[j]
    return out


def _number(rng):
    """Number text and value: integers, decimals, written fractions."""
    choice = rng.randrange(4)
    if choice == 0:
        n = rng.randint(0, 40)
        return str(n), Fraction(n)
    if choice == 1:
        whole, frac = rng.randint(0, 9), rng.randint(0, 99)
        return f"{whole}.{frac:02d}", Fraction(f"{whole}.{frac:02d}")
    p, q = rng.randint(1, 30), rng.randint(1, 12)
    return f"({p}/{q})", Fraction(p, q)


def random_literal(rng, depth=0):
    """(text, exact components) of a random literal expression."""
    choice = rng.randrange(7 if depth < 3 else 3)
    if choice == 0:
        text, value = _number(rng)
        return text, [value] + [Fraction(0)] * 7
    if choice == 1:
        name = rng.choice(BLADE_NAMES)
        return name, _reference_blade(name)
    if choice == 2:                               # number times blade, as scripts write it
        text, value = _number(rng)
        name = rng.choice(BLADE_NAMES)
        op = rng.choice(["*", " ", ""]) if not text[-1].isdigit() else rng.choice(["*", " "])
        return f"{text}{op}{name}", [value * c for c in _reference_blade(name)]
    if choice == 3:                               # a sum
        count = rng.randint(2, 8)
        parts = [random_literal(rng, depth + 1) for _ in range(count)]
        text, total = parts[0][0], list(parts[0][1])
        for part_text, part in parts[1:]:
            sign = rng.choice(["+", "-"])
            text += f" {sign} {part_text}"
            total = [a + b if sign == "+" else a - b for a, b in zip(total, part)]
        return f"({text})", total
    if choice == 4:                               # a negation
        text, value = random_literal(rng, depth + 1)
        return f"-{text}" if not text.startswith("-") else f"-({text})", [-c for c in value]
    if choice == 5:                               # a product
        (ta, a), (tb, b) = random_literal(rng, depth + 1), random_literal(rng, depth + 1)
        return f"({ta}) ({tb})", _reference_product(a, b)
    text, value = random_literal(rng, depth + 1)  # division by a nonzero number
    n = rng.randint(1, 9)
    return f"({text})/{n}", [c / n for c in value]


def _evaluate(text, literal_path, monkeypatch):
    with monkeypatch.context() as patch:
        if not literal_path:
            patch.setattr(evaluator_module.Evaluator, "_literal", lambda self, node, frame: None)
        session = Session()
        results = session.run(f"x = {text};")
        assert not any(isinstance(r, GacalcError) for r in results), results
        return session.values["x"]


@pytest.mark.parametrize("seed", range(25))
def test_random_literals_match_the_general_path_and_the_reference(seed, monkeypatch):
    rng = random.Random(seed)
    for _ in range(8):
        text, expected = random_literal(rng)
        fast = _evaluate(text, True, monkeypatch)
        general = _evaluate(text, False, monkeypatch)
        assert fast.identical(general), text
        # component by component, exactly, against the reference product table
        assert [fast[k] for k in range(8)] == [general[k] for k in range(8)]
        assert [Fraction(int(fast[k].p), int(fast[k].q)) for k in range(8)] == expected, text


def test_the_literal_path_is_taken(monkeypatch):
    # the script shape: a parenthesised sum of (p/q)*blade terms is one literal
    calls = []
    original = evaluator_module.evaluate_literal

    def spy(node, *args):
        value = original(node, *args)
        calls.append(value is not None)
        return value

    monkeypatch.setattr(evaluator_module, "evaluate_literal", spy)
    session = Session()
    session.run("x = ((3/2) + (-7/4)*e1 + (5/3)*e23 + (1/2)*e123);")
    assert calls == [True]
    assert session.values["x"].identical(Multivector({0: Fraction(3, 2), 1: Fraction(-7, 4),
                                               4: Fraction(5, 3), 7: Fraction(1, 2)}))


def _outcome(text, literal_path, monkeypatch):
    """('error', type, caret text) or ('value', value) of running ``x = ...``."""
    with monkeypatch.context() as patch:
        if not literal_path:
            patch.setattr(evaluator_module.Evaluator, "_literal", lambda self, node, frame: None)
        session = Session()
        results = session.run(text)
        last = results[-1]
        if isinstance(last, GacalcError):
            return ("error", type(last), last.caret_text())
        return ("value", session.values["x"])


_INNER = "(1 + 2*(1 + 2*(1 + 2*(1 + 2*e1))))"      # a literal nine levels high


@pytest.mark.parametrize("text", [
    "x = (1/2)*e1 + 3/0",                      # division by zero, at the divisor
    "x = (1/2)*e1 + (2 - 2*1)^-1",             # a zero inverse inside a sum
    "x = 2*e1 + e4",                           # not a blade of Cl(3,0)
    "x = 2*e1 + e1e2",                         # blades run together
    "x = (1 + e1)/(e1 - e1)",                  # division by a zero multivector
    "x = " + " * ".join(["(" + "9" * 999 + ")*e1"] * 20),            # numbers too large
    "x = [1 + I, 2]",                          # I inside a matrix
    "x = [1 + 2 i, 3; 4, 5]",                  # i inside a matrix
    "x = (" * 60 + "e1" + " + 1)" * 60,        # deep, within the limit
    # grade brackets (general path) around a literal, just within and past the depth limit
    "x = " + "<1 + 2*" * 79 + _INNER + ">" * 79,
    "x = " + "<1 + 2*" * 80 + _INNER + ">" * 80,
    "x = " + "<1 + 2*" * 81 + _INNER + ">" * 81,
    "x = (" + "9" * 999 + ")*e1 * (" + "9" * 999 + ")*e2",    # large numbers within the limits
    "x = (1 + e1)/(1 - e1 + e2)",              # division by a multivector: the general path
])
def test_errors_and_limits_in_literals_are_unchanged(text, monkeypatch):
    fast = _outcome(text, True, monkeypatch)
    general = _outcome(text, False, monkeypatch)
    assert fast[0] == general[0], (fast, general)
    if fast[0] == "error":
        assert fast == general
    elif isinstance(fast[1], Multivector):
        assert fast[1].identical(general[1])
    else:
        assert fast[1] == general[1]


@pytest.mark.parametrize("text", [
    # a function body holds literals next to its parameter; it is evaluated again at other
    # depths and with other arguments, and the memo of one evaluation must not leak
    "g(x) = (1/2)*e1 x + (3/4) + x (1/3)*e2; x = g(g(g(e3))) + g(2)",
    "h(s, t) = ((1/2) + (2/3)*e12) s ((1/2) - (2/3)*e12) + t (5/7)*e3; x = h(h(e1, 1), e2)",
    # the same literal beside symbols, several times in one statement
    "vector a; x = ((1/2) + (1/3)*e1) a + ((1/2) + (1/3)*e1) - a ((1/2) + (1/3)*e1)",
])
def test_literals_inside_functions_and_beside_symbols_match_the_general_path(text, monkeypatch):
    fast = _outcome(text, True, monkeypatch)
    general = _outcome(text, False, monkeypatch)
    assert fast[0] == general[0] == "value", (fast, general)
    assert fast[1].identical(general[1])


def test_a_bound_name_is_not_read_as_a_blade(monkeypatch):
    # a function parameter or session value never shadows a blade in the language (the
    # names are refused), but the literal path still leaves bound names to the lookup
    session = Session()
    session.run("f(t) = (1/2)*t + 3*e1")
    session.run("y = f(4)")
    assert session.values["y"].identical(Multivector({0: 2, 1: 3}))


# ------------------------------------------------------------------ scanner and parser


def _reference_scan(source):
    """The scanner as it read tokens before (one raw token at a time, trivia dropped)."""
    depth = brackets = 0
    previous_kind = None
    comparing = False
    out = []
    for token in raw_tokens(source):
        kind = token.kind
        if kind in T.TRIVIA_KINDS:
            continue
        if kind == T.NEWLINE:
            if depth > 0 or previous_kind in T.CONTINUATION_KINDS:
                continue
            if previous_kind == T.NEWLINE:
                continue
            comparing = False
        elif kind == T.KEYWORD and token.value in T.COMPARISON_KEYWORDS:
            comparing = True
        elif kind in (T.LPAREN, T.LANGLE, T.LBRACKET) and not (comparing and kind == T.LANGLE):
            depth += 1
            brackets += kind == T.LBRACKET
        elif kind in (T.RPAREN, T.RANGLE, T.RBRACKET) and not (comparing and kind == T.RANGLE):
            depth = max(0, depth - 1)
            brackets = max(0, brackets - (kind == T.RBRACKET))
        elif kind == T.SEMICOLON and brackets > 0:
            token = Token(T.ROWSEP, token.text, token.value, token.span)
            kind = T.ROWSEP
        elif kind == T.SEMICOLON:
            depth = 0
            comparing = False
        previous_kind = kind
        out.append(token)
    end = len(source.text)
    out.append(Token(T.EOF, "", "", source.span(end, end)))
    return out


_PIECES = ["a", "b1", "θ", "e12", "e4", "I", "pi", "norm", "rotor", "rotor R", "check", "given",
           "assume", "0 < a", "2", "0.5", "²", "⁻¹", "+", "-", "−", "*", "/", "^", "~", "†",
           "/\\", "∧", "_|", "|_", ".", "·", "<", ">", "⟨", "⟩", "<=", ">=", "==", "=", "(",
           ")", "[", "]", ",", ";", "\n", "\r\n", "  ", "\t", "# note\n", '"f.gac"', '"open',
           "@", "\\", "_", "x_1", "a_|b", "rotor\tR", "rotor(", "rotorR", "e1x", "check_",
           "a_", "<==", ">==", "\r", "\r \n"]


@pytest.mark.parametrize("seed", range(80))
def test_scanner_matches_the_token_by_token_reading(seed):
    rng = random.Random(seed)
    text = "".join(rng.choice(_PIECES) + rng.choice(["", " "]) for _ in range(60))
    source = Source(text)
    fast = list(scan(source))
    slow = _reference_scan(source)
    assert [(t.kind, t.text, t.value, t.span.start, t.span.end) for t in fast] == \
        [(t.kind, t.text, t.value, t.span.start, t.span.end) for t in slow]


def test_scanner_matches_the_token_by_token_reading_across_chunks():
    # the scanner runs findall on chunks of about 32 KB cut after a line break: a long
    # script reads as the token-by-token reading does, across every cut
    rng = random.Random(99)
    lines = []
    while sum(map(len, lines)) < 100_000:
        lines.append("".join(rng.choice(_PIECES) + rng.choice(["", " "]) for _ in range(12)))
    source = Source("\n".join(lines))
    assert [(t.kind, t.text, t.value, t.start, t.end) for t in scan(source)] == \
        [(t.kind, t.text, t.value, t.start, t.end) for t in _reference_scan(source)]


def test_the_table_of_token_kinds_refills_after_it_is_cleared(monkeypatch):
    # the scanner keeps the kind of each token text in a bounded table, cleared when
    # full: a long session reads every text as a fresh one does, across the clearing
    from gacalc.language import scanner as scanner_module

    monkeypatch.setattr(scanner_module, "_KIND_CACHE_LIMIT", 5)
    scanner_module._KIND_OF_TEXT.clear()
    rng = random.Random(3)
    for _ in range(20):
        text = "".join(rng.choice(_PIECES) + rng.choice(["", " "]) for _ in range(30))
        source = Source(text)
        assert [(t.kind, t.text, t.value, t.start, t.end) for t in scan(source)] == \
            [(t.kind, t.text, t.value, t.start, t.end) for t in _reference_scan(source)]
        assert len(scanner_module._KIND_OF_TEXT) <= 5


def test_source_line_starts():
    # lines found by the regex engine, as the character loop found them
    text = "a\nb\r\n\nccc\n"
    source = Source(text)
    assert source._line_starts == [0] + [i + 1 for i, ch in enumerate(text) if ch == "\n"]
    assert source.line_column(text.index("ccc") + 1) == (4, 2)


def _spans(node):
    """Every node of a tree with its span, in a fixed order."""
    if isinstance(node, tuple):                # a syntax error: compared as it is
        return node
    out = []
    for item in S.walk(node):
        out.append((type(item).__name__, item.span.start, item.span.end))
    return out


@pytest.mark.parametrize("seed", range(15))
def test_parser_leaf_shortcut_builds_the_same_trees(seed, monkeypatch):
    rng = random.Random(1000 + seed)
    texts = [random_literal(rng)[0] for _ in range(6)]
    texts += ["a b~ c", "2^3 e1", "a . b c", "x[1] y", "f(x) g", "-2^2", "a /\\ b /\\ c",
              "<a>2 b", "norm(a) b", "a² b⁻¹", "x [1]", "2 3", "-2 e1", "-2~ a", "-2^2 b",
              "a - -3", "-3(a)", "--3", "-3 . a", "(-7/4)*e1", "(3) e2", "(-2)", "(1/2)~",
              "(1/2)^2", "(1/2) . a", "(1/2/3)", "(-1/2)(3/4)", "(1/-2)", "(1/2", "(-)",
              "(" * 99 + "-1/2" + ")" * 99, "(" * 100 + "-1/2" + ")" * 100,
              "(" * 98 + "-1/2" + ")" * 98 + " e1"]
    for text in texts:
        fast = [_spans(s) for s in _parse_all(text)]
        with monkeypatch.context() as patch:
            patch.setattr(parser_module, "_LEAF_KINDS", frozenset())
            patch.setattr(parser_module, "_NEGATION_KINDS", frozenset())
            patch.setattr(parser_module, "_PAREN_KINDS", frozenset())
            slow = [_spans(s) for s in _parse_all(text)]
            slow_trees = _parse_all(text)
        assert fast == slow, text
        assert _parse_all(text) == slow_trees, text


def _parse_all(text):
    try:
        return parser_module.parse(text)
    except GacalcError as error:
        return [("error", error.message, error.span.start, error.span.end)]


# ------------------------------------------------------------------ polynomial products


@pytest.mark.parametrize("seed", range(6))
def test_polynomial_products_match_the_reference_table(seed):
    # the core's product of polynomial coefficients (numerators in one flint context,
    # no Coef per term) against ga_reference's tables, component by component in sympy
    import sympy

    rng = random.Random(500 + seed)
    x, y, z = sympy.symbols("x y z", real=True)

    def random_polynomial():
        terms = [rng.randint(-4, 4) * x ** rng.randint(0, 2) * y ** rng.randint(0, 1)
                 * z ** rng.randint(0, 2) for _ in range(rng.randint(1, 3))]
        return sympy.Add(*terms) + sympy.Rational(rng.randint(-3, 3), rng.randint(1, 4))

    a = [random_polynomial() if rng.random() < 0.7 else sympy.Integer(0) for _ in range(8)]
    b = [random_polynomial() if rng.random() < 0.7 else sympy.Integer(0) for _ in range(8)]
    A, B = Multivector(dict(enumerate(a))), Multivector(dict(enumerate(b)))
    for table, product in ((ref.TABLE, A * B), (ref.OUTER, A.outer(B)),
                           (ref.LEFT, A.lc(B)), (ref.INNER, A.inner(B))):
        for k in range(8):
            expected = sum(int(table[i, j, k]) * a[i] * b[j]
                           for i in range(8) for j in range(8) if table[i, j, k])
            assert sympy.expand(product[k] - expected) == 0, (seed, k)

"""The parser: one test per construct, and every error message with its position."""

import pytest

from gacalc.language import syntax as S
from gacalc.language import tokens as T
from gacalc.language.errors import GacalcError, GacalcLimitError, GacalcSyntaxError
from gacalc.language.parser import MAX_DEPTH, MAX_STATEMENT_CHARS, parse, read_expression


def read(text):
    """How an expression was read, fully parenthesised."""
    return S.unparse(read_expression(text), parenthesize=True)


def one(text):
    statements = parse(text)
    assert len(statements) == 1
    return statements[0]


# Expressions ----------------------------------------------------------------------
@pytest.mark.parametrize("text, reading", [
    ("2 a b", "2 a b"),
    ("a (b + c)", "a (b + c)"),
    ("(a + b)(a - b)", "(a + b) (a - b)"),
    ("2e1", "2 e1"),
    ("a * b / c", "(a * b) / c"),
    ("a / b c", "(a / b) c"),
    ("a . b c", "(a . b) c"),
    ("a b . c", "a (b . c)"),
    ("a /\\ b /\\ c", "(a /\\ b) /\\ c"),
    ("a _| b _| c", "a _| (b _| c)"),
    ("a |_ b |_ c", "(a |_ b) |_ c"),
    ("-a /\\ b", "(-a) /\\ b"),
    ("-a b", "(-a) b"),
    ("-a^2", "-(a^2)"),
    ("a~^2", "(a~)^2"),
    ("a^2~", "(a^2)~"),
    ("a^-1", "a^-1"),
    ("a^2^3", "a^(2^3)"),
    ("a^(1/2)", "a^(1 / 2)"),
    ("a -b", "a - b"),
    ("a + -b", "a + (-b)"),
    ("<a b>2", "<a b>2"),
    ("<a b> 2", "<a b> 2"),
    ("<a>", "<a>"),
    ("f(x, y)", "f(x, y)"),
    ("k (a + b)", "k (a + b)"),
    ("x²", "x^2"),
    ("x⁻¹", "x^-1"),
    ("a ∧ b", "a /\\ b"),
    ("θ · φ", "theta . phi"),
    ("a†", "a~"),
    ("+a", "a"),
    ("2 (3)", "2 3"),
])
def test_expression_readings(text, reading):
    assert read(text) == reading


def test_nodes_carry_spans():
    expr = read_expression("1 + norm(a /\\ b)")
    call = expr.terms[1]
    assert isinstance(call, S.Call)
    assert call.span.text == "norm(a /\\ b)"
    assert call.args[0].span.text == "a /\\ b"
    assert (call.span.line, call.span.column) == (1, 5)


def test_numbers_are_exact_fractions():
    from fractions import Fraction

    assert read_expression("0.25").value == Fraction(1, 4)
    assert read_expression("12").value == 12


def test_call_records_spacing():
    assert read_expression("k(a)").spaced is False
    assert read_expression("k (a)").spaced is True


def test_sums_are_flat():
    expr = read_expression(" + ".join(["a"] * 5000))
    assert isinstance(expr, S.Sum) and len(expr.terms) == 5000


# Statements -----------------------------------------------------------------------
def test_assignment_and_definition():
    statement = one("x = a b")
    assert isinstance(statement, S.Assign) and statement.name == "x"
    definition = one("f(x, n) = x^n + 1")
    assert isinstance(definition, S.FunctionDef)
    assert [p.name for p in definition.params] == ["x", "n"]
    assert isinstance(one("f(x, n)"), S.ExpressionStatement)


def test_declarations():
    statement = one("vector a, b")
    assert isinstance(statement, S.Declare) and statement.kind == "vector"
    assert [p.name for p in statement.names] == ["a", "b"] and not statement.unit
    assert one("vector n unit").unit
    assert one("bivector B unit").unit
    for kind in T.DECLARATION_KINDS:
        assert one(f"{kind} X").kind == kind


def test_check_with_given():
    statement = one("check a b == a . b + a /\\ b given a . b = 0, c = 1")
    assert isinstance(statement, S.Check)
    assert len(statement.given) == 2
    assert statement.given[0].span.text == "a . b = 0"


def test_assume_forms():
    assert one("assume none").clear
    listing = one("assume")
    assert not listing.clear and listing.conditions == []
    assert len(one("assume a . b = 0, t = 1").conditions) == 2


def test_show_forms():
    assert not one("show a").latex
    assert one("show latex a b").latex
    assert one("show a against e12").against is not None
    assert isinstance(one("show latex").expr, S.Name)     # the value named latex


def test_emit_forms():
    statement = one('emit c a b as product to "out.c"')
    assert (statement.target, statement.as_name, statement.path) == ("c", "product", "out.c")
    assert one("emit latex x").target == "latex"
    assert one("emit python x").path is None


def test_use_save_help():
    assert one('use "lib.gac"').path == "lib.gac"
    assert not one('save "s.gac"').force
    assert one('save "s.gac" force').force
    assert one("help").topic is None
    assert one("help norm").topic == "norm"
    assert one("help /\\").topic == "/\\"


def test_separators_and_silence():
    statements = parse("a; b\nc;\n\n# comment\nd")
    assert [s.silent for s in statements] == [True, False, True, False]
    assert len(parse("f(a,\n  b)\n")) == 1
    assert len(parse("x = 1 +\n  2")) == 1


# Errors: every message, with its position ---------------------------------------------
def error_of(text):
    with pytest.raises(GacalcError) as info:
        parse(text)
    return info.value


@pytest.mark.parametrize("text, message, column", [
    # scanner
    ('use "open', "string not closed", 5),
    ("a \\ b", "stray '\\'", 3),
    ("a | b", "stray '|'", 3),
    ("a _ b", "stray '_'", 3),
    ("a ! b", "unexpected '!'", 3),
    ("a [b]", "unexpected '['", 3),
    ("a 'b'", "strings are written in double quotes", 3),
    ("a @ b", "unexpected '@'", 3),
    ("a \x01 b", "control character U+0001", 3),
    ("a € b", "unexpected character '€'", 3),
    # expressions
    ("3 2", "two numbers in a row", 3),
    ("a /\\ b _| c", "'/\\' and '_|' cannot be mixed without parentheses: write "
     "(a /\\ b) _| c or a /\\ (b _| c)", 8),
    ("a . b /\\ c /\\ d", "'.' and '/\\' cannot be mixed", 7),
    ("a /\\ b /\\ c . d", "write (a /\\ b /\\ c) . d or a /\\ b /\\ (c . d)", 13),
    ("a^", "expected an exponent after '^'", 3),
    ("a^-", "expected an exponent after '^-'", 4),
    ("()", "empty parentheses", 2),
    ("²", "a superscript exponent needs something before it", 1),
    ("a + given", "'given' is a reserved word", 5),
    ("x = vector", "'vector' declares names and must start a statement", 5),
    ("*a", "expected an expression, found '*'", 1),
    ("a + * b", "expected an operand after '+', found '*'", 5),
    ("a +", "expected an operand after '+', found the end of the input", 4),
    ("(a + b", "'(' is never closed: add ')'", 1),
    ("f(a b", "'(' is never closed", 2),
    ("(a + b \"x\")", "expected ')' to close the '(' at 1:1, found a string", 8),
    ("<>", "empty grade brackets", 2),
    ("<a>5", "a grade in Cl(3,0) is 0, 1, 2 or 3", 4),
    ("<a", "'<' is never closed: add '>'", 1),
    ("f(, a)", "missing argument before ','", 3),
    ("f(a, )", "missing argument after ','", 6),
    # statements
    ("against a", "'against' cannot start a statement", 1),
    ("as a", "'as' cannot start a statement", 1),
    ("to a", "'to' cannot start a statement", 1),
    ("a)", "unmatched ')'", 2),
    ("a>", "unmatched '>'", 2),
    ("a + b = c", "only a name or a function head f(x, ...) can be assigned", 7),
    ("a == b", "'==' belongs in a check statement", 3),
    ("a, b", "unexpected ','", 2),
    ("a given", "unexpected 'given' here", 3),
    ('a "x"', "unexpected string", 3),
    ("norm = 1", "'norm' is a built-in function; choose another name for the value", 1),
    ("e12 = 1", "'e12' is a basis blade", 1),
    ("pi = 3", "'pi' is a constant", 1),
    ("vector check", "'check' is a reserved word", 8),
    ("vector 1", "expected a name for the vector, found the number 1", 8),
    ("ans = 1", "'ans' is set by gacalc", 1),
    ("x =", "expected a value after 'x ='", 4),
    ("f(x + 1) = x", "the parameters of f(...) must be plain names", 3),
    ("f(x, x) = x", "parameter 'x' appears twice", 6),
    ("f(x,) = x", "missing parameter after ','", 5),
    ("f(x) =", "expected the body of f(...) after '='", 7),
    ("vector", "expected a name after 'vector'", 7),
    ("vector a b", "separate the names with commas: vector a, b", 10),
    ("vector a, a", "a name is declared twice", 1),
    ("vector a = 1", "only a name or a function head", 10),
    ("check a == b given", "expected a condition L = R after 'given'", 19),
    ("check a == b given c == d", "a condition is written with a single '='", 22),
    ("check a == b given c", "a condition after 'given' is written L = R", 21),
    ("check a == b given c =", "expected the right-hand side of the condition after '='",
     23),
    ("check", "check needs an equation: check L == R", 6),
    ("check a", "check needs an equation: check L == R", 8),
    ("check a = b", "check compares with '=='", 9),
    ("check a ==", "expected the right-hand side after '=='", 11),
    ("given a = b", "'given' belongs after a check", 1),
    ("show", "show needs a value", 5),
    ("show a against", "expected a value after 'against'", 15),
    ("emit a", "emit needs a target: emit latex EXPR", 6),
    ("emit c", "emit c needs a value", 7),
    ("emit c a as 1", "expected a plain name after 'as'", 13),
    ("emit c a to out", "expected a file name in quotes after 'to'", 13),
    ("use lib", 'use needs a file name in double quotes: use "file.gac"', 5),
    ('use ""', "the file name is empty", 5),
    ("save", 'save needs a file name in double quotes', 5),
])
def test_error_messages(text, message, column):
    error = error_of(text)
    assert isinstance(error, GacalcSyntaxError)
    assert message in error.full_message()
    assert error.line == 1 and error.column == column


def test_assignment_hint_mentions_check():
    assert "check L == R" in error_of("a + b = c").full_message()


def test_caret_text_shows_the_line_and_carets():
    error = error_of("x = 1\ny = (a + b\n")
    assert error.line == 2
    lines = error.caret_text().splitlines()
    assert lines[0].startswith("<input>:2:5: '(' is never closed")
    assert lines[1] == "  y = (a + b"
    assert lines[2] == "      ^"
    wide = error_of("x = 1; norm = 2").caret_text().splitlines()
    assert wide[1:] == ["  x = 1; norm = 2", "         ^^^^"]


def test_an_error_at_the_end_points_after_the_last_token():
    error = error_of("x = 1\ny = (a +\n\n")
    assert (error.line, error.column) == (2, 9)
    assert error.caret_text().splitlines()[2] == "          ^"


def test_caret_text_uses_the_filename():
    with pytest.raises(GacalcError) as info:
        parse("a +* b", filename="demo.gac")
    assert info.value.caret_text().startswith("demo.gac:1:4:")


def test_statements_before_an_error_are_parsed_first():
    from gacalc.language.errors import Source
    from gacalc.language.parser import iter_statements

    statements = iter_statements(Source("a = 1\nb = 2\nc = (\n"))
    assert isinstance(next(statements), S.Assign)
    assert isinstance(next(statements), S.Assign)
    with pytest.raises(GacalcSyntaxError):
        next(statements)


# Limits -----------------------------------------------------------------------------
def test_nesting_depth_limit_is_an_error_not_a_recursion_error():
    deep = "(" * (MAX_DEPTH + 5) + "a" + ")" * (MAX_DEPTH + 5)
    with pytest.raises(GacalcLimitError, match="nested too deeply"):
        parse(deep)
    with pytest.raises(GacalcLimitError):
        parse("-" * 5000 + "a")
    with pytest.raises(GacalcLimitError):
        parse("a" + "^a" * 5000)
    with pytest.raises(GacalcLimitError):
        parse("f(" * 5000)
    shallow = "(" * (MAX_DEPTH - 5) + "a" + ")" * (MAX_DEPTH - 5)
    assert isinstance(read_expression(shallow), S.Name)


def test_statement_length_limit():
    with pytest.raises(GacalcLimitError, match="statement too long"):
        parse("x = " + "1 + " * (MAX_STATEMENT_CHARS // 4) + "1")


def test_reading_echoes_the_grouping():
    from gacalc.language.parser import reading

    assert reading("a / b c; x = a . b c") == ["(a / b) c", "x = (a . b) c"]
    assert reading("a _| b _| c", unicode=True) == ["a ⌋ (b ⌋ c)"]
    assert reading("vector a") == ["vector a"]


# Tree walk and positions ------------------------------------------------------------------
def test_walk_visits_every_node_of_a_wide_tree():
    tree = read_expression("f(a + b) c /\\ d - <e1>2 " + " + ".join(f"x{i}" for i in range(500)))
    names = {node.name for node in S.walk(tree) if isinstance(node, S.Name)}
    assert {"a", "b", "c", "d", "e1"} | {f"x{i}" for i in range(500)} <= names
    assert [node.name for node in S.walk(tree) if isinstance(node, S.Call)] == ["f"]
    assert next(S.walk(tree)) is tree


def test_a_span_names_its_place_as_file_line_column():
    statements = parse("x = 1\n  y = e1 /\\ e2\n", "demo.gac")
    assert statements[1].span.location == "demo.gac:2:3"
    assert parse("e1")[0].span.location == "<input>:1:1"

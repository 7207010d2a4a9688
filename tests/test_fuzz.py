"""Fuzzing the language end to end: every input ends in results or a GacalcError.

Grammar-aware statements (deep nesting, huge exponents, long sums, every operator, every
built-in with right and wrong arities, declarations, checks, Unicode, control characters,
unterminated brackets and strings) and token / character soup all go through
``Session.run``; each result and error is also rendered, since printing is part of what
reaches the user.  A GacalcInternalError (our bug), any Python exception escaping the
session, RecursionError or MemoryError fails the test.  One property also times each
statement under a 2 s statement budget: none may take longer than the budget plus a wide
margin (the budget is honoured, by a result, an error or the budget's own message).

The default run is about 2,500 examples, reproducible (derandomize=True) so CI sees the
same inputs every time.  For a longer local hunt set GACALC_FUZZ_EXAMPLES (examples per
test; there are six tests), e.g. ``GACALC_FUZZ_EXAMPLES=20000 pytest tests/test_fuzz.py``.
"""

from __future__ import annotations

import os
import time

import pytest
from hypothesis import HealthCheck, example, given, settings
from hypothesis import strategies as st

from gacalc.language import Session
from gacalc.language.builtins import BUILTINS
from gacalc.language.errors import GacalcError, GacalcInternalError

_SCALE = int(os.environ.get("GACALC_FUZZ_EXAMPLES", "0") or 0)


def fuzz_settings(default: int):
    return settings(max_examples=_SCALE or default, derandomize=True, deadline=None,
                    database=None, print_blob=True,
                    suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large,
                                           HealthCheck.filter_too_much])


# Running one input ----------------------------------------------------------------------
def run_and_render(text: str, workdir) -> list:
    """Run text in a fresh, short-budget session; render everything; return the results."""
    session = Session(budget=0.5, statement_budget=3.0, base_dir=str(workdir))
    results = session.run(text)
    for result in results:
        if isinstance(result, GacalcError):
            assert not isinstance(result, GacalcInternalError), (
                f"internal error for {text!r}:\n{result.caret_text()}\n"
                f"{result.traceback_text}")
            rendered = result.caret_text()
            assert "Traceback" not in rendered
            assert result is results[-1], "an error must end the results"
        else:
            rendered = result.text
            assert not rendered.startswith("internal error"), (text, rendered)
            result.render(unicode=True)          # raises if a printer has a bug
        assert isinstance(rendered, str)
    return results


@pytest.fixture(scope="module")
def workdir(tmp_path_factory):
    directory = tmp_path_factory.mktemp("fuzz")
    (directory / "lib.gac").write_text("vector u\nw = u /\\ e3\n", encoding="utf-8")
    (directory / "loop.gac").write_text('use "loop.gac"\n', encoding="utf-8")
    (directory / "other.txt").write_text("not a script\n", encoding="utf-8")
    return directory


# Grammar ------------------------------------------------------------------------------
_NAMES = ["a", "b", "x", "t", "theta", "θ", "phi", "φ", "n", "R", "B", "M", "f", "g",
          "a1", "ab_c", "nrom", "sinn", "ans", "pi", "I", "e1", "e2", "e3", "e12", "e21",
          "e123", "e312", "e11", "e0", "e4", "e1e2", "e1111111", "unit", "force", "none",
          "latex", "c", "x_", "_x", "Ω", "λ1", "ä", "名"]
_NUMBERS = ["0", "1", "2", "3", "0.5", "1.25", "10", "007", "12345678901234567890",
            "9" * 1200, "0.000000000000000000001", "1." , ".5", "2e1", "1000", "1001",
            "999999"]
_BINARY = ["+", "-", "*", "/", " ", "/\\", "_|", "|_", ".", "∧", "⌋", "⌊", "·", "⋅",
           "−", "==", "=", "|", "\\", "^", ","]
_POSTFIX = ["~", "†", "˜", "^-1", "^2", "^0", "^1000", "^1001", "^-1000", "^(1/2)",
            "^(-1/3)", "^t", "^0.5", "^(2^10)", "^(10^10)", "^99999999999999999999", "²",
            "⁻¹", "³", "^", "^-", "~~"]
_GRADES = ["", "0", "1", "2", "3", "4", "9"]
_FUNCTION_NAMES = sorted(BUILTINS) + ["f", "g", "undefined_fn", "sinn"]
_EXTRAS = ["", " ", "  ", "\t", "(", ")", "<", ">", "\"", "\"x", "#", "\x00", "\x07",
           "\u200b", "\ufeff", "\r", ";", ",", "?", "$", "@", "[", "]", "{", "}", "'",
           "`", "!", "&", "%", "\u00a0", "\U0001F600", "\\n"]


def _expressions():
    atoms = st.one_of(
        st.sampled_from(_NAMES),
        st.sampled_from(_NUMBERS),
        st.integers(min_value=0, max_value=10**6).map(str),
        st.sampled_from(['"file.gac"', '"', '"unterminated', "()", "<>", "(", "<"]),
    )

    def extend(inner):
        return st.one_of(
            st.tuples(inner, st.sampled_from(_BINARY), inner).map(
                lambda t: f"{t[0]} {t[1]} {t[2]}" if t[1] != " " else f"{t[0]} {t[2]}"),
            st.tuples(inner, st.sampled_from(_POSTFIX)).map(lambda t: t[0] + t[1]),
            inner.map(lambda x: f"({x})"),
            inner.map(lambda x: f"-{x}"),
            st.tuples(inner, st.sampled_from(_GRADES)).map(lambda t: f"<{t[0]}>{t[1]}"),
            st.tuples(st.sampled_from(_FUNCTION_NAMES),
                      st.lists(inner, min_size=0, max_size=10)).map(
                lambda t: f"{t[0]}({', '.join(t[1])})"),
            st.lists(inner, min_size=2, max_size=6).map(" + ".join),
        )

    return st.recursive(atoms, extend, max_leaves=12)


EXPRESSIONS = _expressions()


@st.composite
def deep_nesting(draw):
    depth = draw(st.integers(min_value=20, max_value=3000))
    kind = draw(st.sampled_from(["paren", "grade", "minus", "call", "power", "reverse",
                                 "unclosed", "exponent"]))
    core = draw(st.sampled_from(["x", "e1", "1", "a + b"]))
    if kind == "paren":
        return "(" * depth + core + ")" * depth
    if kind == "grade":
        return "<" * depth + core + ">" * depth
    if kind == "minus":
        return "-" * depth + core
    if kind == "call":
        name = draw(st.sampled_from(["rev", "sin", "norm", "exp", "f"]))
        return f"{name}(" * depth + core + ")" * depth
    if kind == "power":
        return core + "^2" * depth
    if kind == "reverse":
        return core + "~" * depth
    if kind == "exponent":
        return "x" + "^x" * depth
    return "(" * depth + core


@st.composite
def long_sums(draw):
    count = draw(st.integers(min_value=50, max_value=20000))
    term = draw(st.sampled_from(["x", "e1", "a b", "1", "t^2 e12", "(x + 1)"]))
    return " + ".join([term] * count)


@st.composite
def huge_computations(draw):
    base = draw(st.sampled_from(["(a + b + c + d + e + f + g + h)", "(x + 1)", "(x + 2^999)",
                                 "(1 + e1 + e12)", "M", "(sin(x) + cos(y) + 1)", "2",
                                 "(2^1000)", "10", "(a b + e1)", "(x + y)^900",
                                 "(x/(x + 1) + y/(y + 2))", "exp(M)"]))
    exponent = draw(st.sampled_from(["2", "12", "50", "100", "500", "999", "1000", "-1",
                                     "-20", "1/2", "(2^10)"]))
    prefix = draw(st.sampled_from(["", "multivector M; ", "vector a; ", "rotor M; "]))
    return f"{prefix}{base}^{exponent}"


@st.composite
def statements(draw):
    expr = draw(EXPRESSIONS)
    other = draw(EXPRESSIONS)
    name = draw(st.sampled_from(_NAMES))
    kind = draw(st.sampled_from(["scalar", "vector", "bivector", "rotor", "multivector",
                                 "tensor"]))
    form = draw(st.sampled_from(["expr", "assign", "def", "declare", "check", "given",
                                 "assume", "show", "emit", "help", "use", "save", "silent"]))
    if form == "expr":
        return expr
    if form == "silent":
        return expr + ";"
    if form == "assign":
        return f"{name} = {expr}"
    if form == "def":
        params = draw(st.lists(st.sampled_from(_NAMES), min_size=0, max_size=4))
        return f"{name}({', '.join(params)}) = {expr}"
    if form == "declare":
        names = draw(st.lists(st.sampled_from(_NAMES), min_size=0, max_size=3))
        unit = draw(st.sampled_from(["", " unit", " unit unit"]))
        return f"{kind} {', '.join(names)}{unit}"
    if form == "check":
        return f"check {expr} == {other}"
    if form == "given":
        return f"check {expr} == {other} given {draw(EXPRESSIONS)} = {draw(EXPRESSIONS)}"
    if form == "assume":
        return draw(st.sampled_from([f"assume {expr} = {other}", "assume", "assume none",
                                     f"assume {expr}"]))
    if form == "show":
        return draw(st.sampled_from([f"show {expr}", f"show latex {expr}",
                                     f"show {expr} against {other}"]))
    if form == "emit":
        target = draw(st.sampled_from(["latex", "python", "numpy", "c", "fortran", ""]))
        tail = draw(st.sampled_from(["", " as fn", " as 3", ' to "out.txt"', " to x"]))
        return f"emit {target} {expr}{tail}"
    if form == "help":
        return draw(st.sampled_from(["help", f"help {name}", "help help", "help +",
                                     f"help {draw(st.sampled_from(_FUNCTION_NAMES))}"]))
    path = draw(st.sampled_from(['"lib.gac"', '"loop.gac"', '"missing.gac"', '"other.txt"',
                                 '"."', '""', '"saved.gac"', "lib.gac", '"lib.gac']))
    if form == "use":
        return f"use {path}"
    force = draw(st.sampled_from(["", " force"]))
    return f"save {path}{force}"


@st.composite
def scripts(draw):
    lines = draw(st.lists(st.one_of(statements(), st.sampled_from(_EXTRAS)),
                          min_size=1, max_size=8))
    separator = draw(st.sampled_from(["\n", "; ", "\r\n", "\n\n"]))
    return separator.join(lines)


_TOKENS = (_NAMES + _NUMBERS[:9] + _BINARY + _POSTFIX + _EXTRAS +
           ["check", "given", "assume", "show", "against", "emit", "as", "to", "help",
            "use", "scalar", "vector", "rotor", "multivector", "bivector", "\n", "<", ">",
            "(", ")", "⟨", "⟩", "1", "e", "_"] + _FUNCTION_NAMES)


# The properties -----------------------------------------------------------------------
@fuzz_settings(900)
@given(text=statements())
def test_grammar_statements(text, workdir):
    run_and_render(text, workdir)


@fuzz_settings(450)
@given(text=scripts())
def test_grammar_scripts(text, workdir):
    run_and_render(text, workdir)


@fuzz_settings(450)
@given(text=st.lists(st.sampled_from(_TOKENS), max_size=40).map(" ".join))
def test_token_soup(text, workdir):
    run_and_render(text, workdir)


@fuzz_settings(450)
@given(text=st.one_of(
    st.text(max_size=80),
    st.text(alphabet=st.characters(max_codepoint=0x7f), max_size=120),
    st.binary(max_size=80).map(lambda b: b.decode("utf-8", errors="replace")),
    st.binary(max_size=80).map(lambda b: b.decode("latin-1")),
))
def test_character_soup(text, workdir):
    run_and_render(text, workdir)


@fuzz_settings(250)
@given(text=st.one_of(deep_nesting(), long_sums(), huge_computations()))
def test_limits_give_errors_not_crashes(text, workdir):
    run_and_render(text, workdir)


# The statement budget is honoured ----------------------------------------------------------
FUZZ_STATEMENT_BUDGET = 2.0   # seconds per statement in these runs
# Wide on purpose: the check is that the budget ends a statement at all (a statement that
# ignored it would run to the 30 s default or hang), not how precisely; a loaded CI
# machine must not fail it.
BUDGET_MARGIN = 5.0


def _longest_statement(text: str, workdir) -> float:
    """Run text statement by statement under a small budget; the longest wait (seconds)
    between one statement's results and the next's (each wait covers one statement)."""
    session = Session(budget=0.5, statement_budget=FUZZ_STATEMENT_BUDGET,
                      base_dir=str(workdir))
    longest = 0.0
    start = time.monotonic()
    for result in session.iter_run(text):
        now = time.monotonic()
        longest = max(longest, now - start)
        start = now
        if isinstance(result, GacalcError):
            assert not isinstance(result, GacalcInternalError), (text, result.caret_text())
        else:
            result.text
    return longest


@fuzz_settings(120)
@given(text=st.one_of(statements(), huge_computations()))
# the slow reports of issue 15: each returns a report, or the budget's own message
@example(text="multivector A, B; show A B")
@example(text="vector a, b; show (a+b)^6")
@example(text="rotor R; show R")
@example(text="multivector R; show R^3")
def test_no_statement_outlasts_its_budget(text, workdir):
    seconds = _longest_statement(text, workdir)
    assert seconds <= FUZZ_STATEMENT_BUDGET + BUDGET_MARGIN, (text, seconds)

"""The ``budget`` statement: the per-statement time budget as a session setting."""

from __future__ import annotations

import math

import pytest

from gacalc.algebra import Multivector
from gacalc.highlight import GacalcLexer
from gacalc.language import Session
from gacalc.language import tokens as T
from gacalc.language.errors import GacalcError, GacalcLimitError, GacalcSyntaxError
from gacalc.language.session import REPL_STATEMENT_BUDGET

from conftest import ok, patch_builtin


def _spin(*args, **kwargs):
    """Pure-Python work that never ends by itself (stands in for a slow computation)."""
    n = 0
    while True:
        n += 1


def _note(session, text) -> str:
    results = ok(session, text)
    assert results[-1].kind == "note"
    return results[-1].text


def test_budget_alone_prints_the_budget_in_force():
    assert "may run 30 s" in _note(Session(), "budget")
    assert f"may run {REPL_STATEMENT_BUDGET:g} s" in _note(
        Session(statement_budget=REPL_STATEMENT_BUDGET), "budget")
    assert "without a time limit" in _note(Session(statement_budget=math.inf), "budget")


def test_budget_sets_the_budget_of_later_statements():
    session = Session()
    assert "may run 2.5 s" in _note(session, "budget 2.5")
    assert session.statement_budget == 2.5
    assert "may run 2.5 s" in _note(session, "x = e1\nbudget")
    assert "without a time limit" in _note(session, "budget none")
    assert session.statement_budget == math.inf
    assert session.get("x").identical(Multivector({1: 1}))


def test_a_later_statement_is_abandoned_under_the_new_budget(monkeypatch):
    patch_builtin(monkeypatch, "norm", _spin)
    session = Session()
    results = session.run("x = e1\nbudget 0.3\nx = norm(e1)")
    error = results[-1]
    assert isinstance(error, GacalcLimitError)
    assert "time budget (0.3 s)" in error.message and "budget SECONDS" in error.hint
    assert session.get("x").identical(Multivector({1: 1}))     # the session is unchanged


def test_a_budget_in_a_used_file_holds_for_the_rest_of_that_file(monkeypatch, tmp_path):
    patch_builtin(monkeypatch, "norm", _spin)
    (tmp_path / "gimbal.gac").write_text("budget 0.3\ny = norm(e1)\n", encoding="utf-8")
    session = Session(base_dir=str(tmp_path))
    error = session.run('use "gimbal.gac"')[-1]
    assert isinstance(error, GacalcLimitError) and "0.3 s" in error.message
    # the use failed as a whole: the session, its budget too, is as it was
    assert session.statement_budget == 30.0
    assert "may run 30 s" in _note(session, "budget")


@pytest.mark.parametrize("text, column", [
    ("budget 0", 8), ("budget -1", 8), ("budget x", 8), ("budget 1 2", 10),
    ("budget 100000", 8), ("budget 1/2", 9), ("budget " + "9" * 1200, 8),
    ("budget (1)", 8),
])
def test_bad_budgets_are_one_line_errors_with_their_position(text, column):
    session = Session()
    error = session.run(text)[-1]
    assert isinstance(error, GacalcSyntaxError)
    assert (error.line, error.column) == (1, column)
    assert "\n" not in error.message and "budget" in error.message
    assert session.statement_budget == 30.0


def test_budget_is_a_keyword_of_the_one_token_table():
    assert "budget" in T.KEYWORDS
    kinds = [str(kind) for kind, text in GacalcLexer().get_tokens("budget 5") if text == "budget"]
    assert kinds == ["Token.Keyword"]
    error = Session().run("budget = 3")[-1]
    assert isinstance(error, GacalcError)

"""help answers every word of the token table and every built-in, lists every export
target the overview names, and wraps long lines at word boundaries for the width."""

from __future__ import annotations

import pytest

from conftest import ok
from gacalc.export import targets
from gacalc.language import Session
from gacalc.language.builtins import BUILTIN_NAMES
from gacalc.language.tokens import CONSTANTS, DECLARATION_KINDS, KEYWORDS, SOFT_KEYWORDS

_EVERY_NAME = sorted(set(KEYWORDS + DECLARATION_KINDS + CONSTANTS + SOFT_KEYWORDS
                         + BUILTIN_NAMES + ("quit", "exit", "ans", "i", "e1", "e123")))


@pytest.mark.parametrize("name", _EVERY_NAME)
def test_every_name_of_the_token_table_has_help(name):
    text = ok(Session(), f"help {name}")[-1].help
    assert text.strip(), name


def test_help_emit_lists_every_target_the_overview_names():
    session = Session()
    overview = ok(session, "help")[-1].help
    helped = ok(session, "help emit")[-1].help
    assert f"emit {'|'.join(targets.TARGETS)} EXPR" in overview
    for name in targets.TARGETS:
        assert any(line.startswith(f"emit {name} ") for line in helped.splitlines()), name


def test_help_on_the_pseudoscalar_and_on_leaving():
    session = Session()
    assert "I is e123" in ok(session, "help I")[-1].help
    assert ok(session, "help quit")[-1].help == ok(session, "help exit")[-1].help
    assert "Ctrl-D" in ok(session, "help quit")[-1].help


@pytest.mark.parametrize("width", [40, 60, 78])
def test_long_help_lines_wrap_at_word_boundaries(width):
    session = Session(width=width)
    for topic in ("", " subs", " diff", " operators", " calculus", " rotor"):
        wide = ok(Session(width=10**4), f"help{topic}")[-1].help
        narrow = ok(session, f"help{topic}")[-1].help
        # the same words in the same order: only line breaks and indentation differ
        assert narrow.split() == wide.split(), topic
        for line in narrow.splitlines():
            # a line is longer only when a single word does not fit
            assert len(line) <= width or " " not in line.strip(), (topic, line)

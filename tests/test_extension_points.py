"""Each way of extending gacalc is one registration: a value kind (gacalc.values), a
built-in function (gacalc.language.builtins) and an export target
(gacalc.export.targets).  Every test registers a toy inside the test, uses it through a
Session and removes it again.
"""

from dataclasses import dataclass

import pytest
import sympy

from gacalc import values
from gacalc.algebra import Multivector
from gacalc.export import targets
from gacalc.language import Session
from gacalc.language.builtins import BUILTINS, builtin
from gacalc.language.errors import GacalcLimitError, GacalcTypeError
from gacalc.language.results import CheckResult, EmitResult, HelpResult, ValueResult

from conftest import ok


# A toy value kind: pairs of scalars with componentwise arithmetic (the direct product
# of two copies of the scalars; common practice).
@dataclass(frozen=True)
class Pair:
    first: object
    second: object


class PairKind(values.ValueKind):
    name = "pair"

    def matches(self, value):
        return isinstance(value, Pair)

    def text(self, value, unicode=False, width=78, indent=0):
        from gacalc.printing.text import scalar_text

        return f"pair({scalar_text(value.first, unicode)}, {scalar_text(value.second, unicode)})"

    def add(self, left, right, sign, span):
        return Pair(sympy.expand(left.first + sign * right.first),
                    sympy.expand(left.second + sign * right.second))

    def multiply(self, left, right, span):
        return Pair(sympy.expand(left.first * right.first),
                    sympy.expand(left.second * right.second))

    def scale(self, value, factor):
        return Pair(sympy.expand(value.first * factor), sympy.expand(value.second * factor))

    def differences(self, left, right):
        if not self.matches(right):
            return None
        return [Multivector.scalar(left.first - right.first),
                Multivector.scalar(left.second - right.second)]

    def reassemble(self, like, differences):
        return Pair(*(d.scalar_part() for d in differences))


@pytest.fixture
def registered():
    """Registers toys through the public registration calls; removes them afterwards."""
    added_kinds, added_builtins, added_targets = [], [], []

    def add_kind(kind):
        added_kinds.append(values.register(kind))
        return kind

    def add_builtin(signature, *args, **options):
        def register(function):
            builtin(signature, *args, **options)(function)
            added_builtins.append(signature.partition("(")[0])
            return function
        return register

    def add_target(target):
        added_targets.append(targets.register(target).name)
        return target

    yield add_kind, add_builtin, add_target
    for kind in added_kinds:
        values.unregister(kind)
    for name in added_builtins:
        BUILTINS.pop(name)
    for name in added_targets:
        targets.unregister(name)


def _pair_session(registered):
    add_kind, add_builtin, _ = registered
    add_kind(PairKind())

    @add_builtin("pair(x, y)", "a pair of scalars", "pair(1, 2)", "symbols")
    def _pair(ctx, x, y):
        return Pair(ctx.scalar(0), ctx.scalar(1))

    return Session()


def test_a_toy_value_kind_prints_adds_multiplies_and_checks(registered):
    session = _pair_session(registered)
    shown = ok(session, "p = pair(1, 2) + pair(3, 4); p")[-1]
    assert isinstance(shown, ValueResult) and shown.text == "pair(4, 6)"
    # componentwise product and scaling by a scalar on either side (common practice)
    assert ok(session, "pair(x, 2) * pair(x, 3)")[-1].text == "pair(x^2, 6)"
    assert ok(session, "2 p - p 3")[-1].text == "pair(-4, -6)"
    assert ok(session, "-p")[-1].text == "pair(-4, -6)"
    # (x + 1)(x - 1) = x^2 - 1 in each component (the difference of two squares)
    held = ok(session, "check pair(x + 1, x) * pair(x - 1, 1) == pair(x^2 - 1, x)")[-1]
    assert isinstance(held, CheckResult) and held.outcome == "holds"
    failed = ok(session, "check pair(1, 2) == pair(1, 3)")[-1]
    assert failed.outcome == "fails" and failed.difference == Pair(0, -1)
    assert "pair(0, -1)" in failed.text
    # the printed text reads back as the same value
    again = ok(session, shown.text)[-1]
    assert again.value == shown.value
    # show reports it with its kind's text
    report = ok(session, "show pair(1, 2)")[-1]
    assert report.report.kind == "pair"
    assert report.text.splitlines()[-1].split() == ["#", "pair(1,", "2)", "#", "value"]


def test_a_toy_value_kind_meets_other_kinds_with_clear_errors(registered):
    session = _pair_session(registered)
    for text, message in (("pair(1, 2) + e1", "cannot add a vector to a pair"),
                          ("pair(1, 2) e1", "cannot multiply a pair by a vector"),
                          ("pair(1, 2) / pair(1, 1)", "cannot divide by a pair"),
                          ("pair(1, 2)^(1/2)", "a pair takes integer powers only"),
                          ("check pair(1, 2) == e1", "cannot compare a pair with a vector"),
                          ("e1 /\\ pair(1, 2)", "the outer product needs multivectors, "
                                                "not a pair")):
        error = session.run(text)[-1]
        assert isinstance(error, GacalcTypeError), (text, error)
        assert error.message == message, text
    # a whole power is repeated multiplication: (1, 2)^3 = (1, 8)
    assert ok(session, "pair(1, 2)^3")[-1].text == "pair(1, 8)"


def test_a_toy_builtin_is_one_registration_with_help_and_size_check(registered):
    _, add_builtin, _ = registered
    calls = []

    @add_builtin("toysquare(A)", "A times A", "toysquare(e1 + e2)", "products",
                 chain=(0, 0))
    def _toysquare(ctx, a):
        calls.append(a)
        value = ctx.multivector(0)
        return value * value

    session = Session()
    # (e1 + e2)^2 = e1^2 + e2^2 = 2 (e1 e2 + e2 e1 = 0; DESIGN.md conventions)
    assert ok(session, "toysquare(e1 + e2)")[-1].text == "2"
    helped = ok(session, "help toysquare")[-1]
    assert isinstance(helped, HelpResult)
    assert helped.help == "toysquare(A)  A times A\n  example: toysquare(e1 + e2)"
    assert "toysquare" in ok(session, "help")[-1].help
    assert ("toysquare", "A times A") in session.completion_words()
    # its declared chain is checked before the call: a large general multivector squared
    # could exceed the term limit, and the function never runs
    calls.clear()
    big = "s = (" + " + ".join(f"t{i}" for i in range(25)) + ")^2;" \
        " M = s + s e1 + s e2 + s e3 + s e23 + s e31 + s e12 + s e123;"
    error = session.run(big + " toysquare(M)")[-1]
    assert isinstance(error, GacalcLimitError), error
    assert error.message.startswith("toysquare(...) here could have")
    assert calls == []


def test_a_builtin_without_a_chain_is_linear_by_default():
    # the explicit default of the registration: no estimate before the call
    assert BUILTINS["grade"].chain == ()
    assert BUILTINS["rotate"].chain == (0, 1, 0)     # R x R~
    assert BUILTINS["subs"].estimate is not None


def test_a_toy_export_target_is_one_registration(registered, tmp_path):
    _, _, add_target = registered

    def emit_toy(value, name=None, declared=None, options=None):
        parts = " ".join(f"{index}:{expr}" for index, expr in value.components)
        return f"toy {name or 'value'} {parts}"

    add_target(targets.ExportTarget("toy", ".toy", emit_toy, 'emit toy EXPR            toy text'))
    session = Session(base_dir=str(tmp_path))
    emitted = ok(session, "emit toy 2 e1 + e3 as v")[-1]
    assert isinstance(emitted, EmitResult) and emitted.code == "toy v 1:2 3:1"
    ok(session, 'emit toy e12 as b to "bivector.toy"')
    assert (tmp_path / "bivector.toy").read_text() == "toy b 6:1\n"
    # with an emit folder, an emit without 'to' is written as NAME + the target's suffix
    folder = tmp_path / "out"
    folder.mkdir()
    ok(Session(emit_dir=str(folder)), "emit toy e2 as w")
    assert (folder / "w.toy").read_text() == "toy w 2:1\n"
    helped = ok(session, "help emit")[-1].help
    assert "emit toy EXPR            toy text" in helped
    assert helped.splitlines()[0] == "emit latex EXPR          LaTeX"
    assert "emit latex|python|numpy|c|toy EXPR" in ok(session, "help")[-1].help
    error = session.run("emit nothing e1")[-1]
    assert error.message == ("emit needs a target: emit latex EXPR, emit python EXPR, "
                             "emit numpy EXPR, emit c EXPR or emit toy EXPR")

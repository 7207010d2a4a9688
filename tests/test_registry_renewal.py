"""A long session's generator registry does not grow without bound, and the session still
gives what a fresh one gives (gacalc.algebra.compaction, Session._renew_algebra)."""

from __future__ import annotations

from gacalc.language import Session
from gacalc.language import session as session_module

from conftest import ok

# A spin in a magnetic field: the precession rotor about e3 at angle w t, and a vector it
# turns (values made before the churn, used after it)
SETUP = "scalar w, t\nvector s\nR = rotor(e12, w t)\nP = rotate(R, s)"
AFTER = ["rotate(R, s)", "P", "P . e3", "check rotate(R~, P) == s", "R R~",
         "(s + e1)^3", "show R"]


def _churn(session, count):
    # declare a symbol, use it with a function of it, then drop it by reassigning the name
    for k in range(count):
        ok(session, f"scalar u{k}\nx = (u{k} + cos(u{k}) + sqrt(u{k}^2 + 1)) e1\nu{k} = 0")


def _texts(session, lines):
    return [ok(session, line)[-1].text for line in lines]


def test_dropped_symbols_do_not_pile_up_in_the_registry(monkeypatch):
    monkeypatch.setattr(session_module, "RENEW_REGISTRY_ABOVE", 16)
    session = Session()
    ok(session, SETUP)
    _churn(session, 60)            # about 4 generators each: 240 without renewal
    assert len(session.algebra.registry) <= 2 * 16 + 8
    # what is still live kept its generators: w, t, s1, s2, s3 and those of R and P
    ok(session, "y = x")


def test_a_renewed_session_gives_what_a_fresh_session_gives(monkeypatch):
    monkeypatch.setattr(session_module, "RENEW_REGISTRY_ABOVE", 16)
    fresh = Session()
    ok(fresh, SETUP)
    expected = _texts(fresh, AFTER)
    long = Session()
    ok(long, SETUP)
    before = ok(long, "P")[-1]            # a result handed out before any renewal
    _churn(long, 60)
    assert _texts(long, AFTER) == expected
    assert before.text == ok(fresh, "P")[-1].text
    assert before.value.identical(long.get("P"))

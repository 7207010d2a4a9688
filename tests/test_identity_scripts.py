"""The identity scripts in tests/identities/, run end to end through Session.run.

Each script names its sources in comments.  Every check in a script must hold, and
every check line must have produced a check result (none silently skipped).  Wrong
variants of the same identities must fail, so the scripts can catch mistakes.
"""

import pathlib
import re

import pytest

from gacalc.language import GacalcError, Session
from gacalc.language.session import CheckResult

SCRIPTS = sorted((pathlib.Path(__file__).parent / "identities").glob("*.gac"))


def test_there_are_identity_scripts():
    assert len(SCRIPTS) >= 4


@pytest.mark.parametrize("script", SCRIPTS, ids=lambda path: path.name)
def test_identity_script_holds(script):
    results = Session().run_file(str(script))
    errors = [r for r in results if isinstance(r, GacalcError)]
    assert not errors, errors[0].caret_text()
    checks = [r for r in results if isinstance(r, CheckResult)]
    written = len(re.findall(r"^check ", script.read_text(), flags=re.MULTILINE))
    assert len(checks) == written
    failed = [c.text for c in checks if not c.passed]
    assert not failed, "\n".join(failed)


@pytest.mark.parametrize("setup, wrong", [
    # sign slips in the NRL vector identities
    ("vector a, b, c", "check cross(a, cross(b, c)) == b (a . c) + c (a . b)"),
    ("vector a, b, c", "check cross(a, cross(b, c)) == cross(cross(a, b), c)"),
    ("vector a, b", "check norm2(cross(a, b)) == norm2(a) norm2(b) + (a . b)^2"),
    # the geometric product does not commute
    ("multivector M, N", "check (M N)~ == M~ N~"),
    ("vector a, b", "check a b == a . b - a /\\ b"),
    # Pythagoras without orthogonality
    ("vector a, b", "check (a + b)^2 == a^2 + b^2"),
    # Rodrigues with the wrong sign of the sine term
    ("vector n unit; vector x; scalar theta",
     "check rotate(rotor(n, theta), x) == x cos(theta) - cross(n, x) sin(theta) + "
     "n (n . x)(1 - cos(theta))"),
    # two reflections turn by twice the angle between the normals, not once
    ("vector x; scalar alpha", "check reflect(reflect(x, e1), cos(alpha) e1 + sin(alpha) e2) "
     "== rotate(rotor(e12, alpha), x)"),
    ("", "check (-e23)(-e31)(-e12) == 1"),
    ("", "check pauli(e1) pauli(e2) == pauli(e3)"),
])
def test_wrong_identities_fail(setup, wrong):
    session = Session()
    assert not [r for r in session.run(setup) if isinstance(r, GacalcError)]
    result = session.run(wrong)[-1]
    assert isinstance(result, CheckResult), result
    assert result.outcome == "fails"
    assert result.difference is not None

"""End to end in a pseudo-terminal: the installed program's REPL declares a vector,
computes a product, has a long computation interrupted by Ctrl-C, and still knows the
vector afterwards."""

import os
import sys
import time
from pathlib import Path

import pytest

pexpect = pytest.importorskip("pexpect")

ROOT = Path(__file__).resolve().parents[1]
TIMEOUT = 60


def _program():
    """The installed console script when there is one, else the same code via -m."""
    installed = Path(sys.executable).with_name("gacalc")
    if installed.exists():
        return str(installed), []
    return sys.executable, ["-m", "gacalc"]


@pytest.mark.skipif(sys.platform == "win32", reason="pseudo-terminals are POSIX")
def test_interrupt_keeps_the_session(tmp_path):
    program, args = _program()
    long_script = tmp_path / "long.gac"
    long_script.write_text("multivector P\n" + "big = P^7;\n" * 4000, encoding="utf-8")
    env = dict(os.environ, XDG_DATA_HOME=str(tmp_path / "data"),
               XDG_STATE_HOME=str(tmp_path / "state"), TERM="xterm",
               PROMPT_TOOLKIT_NO_CPR="1",   # the pty does not answer cursor queries
               PYTHONPATH=str(ROOT) + os.pathsep + os.environ.get("PYTHONPATH", ""))
    env.pop("NO_COLOR", None)
    child = pexpect.spawn(program, args + ["--ascii", "--no-color"], env=env,
                          encoding="utf-8", timeout=TIMEOUT, dimensions=(30, 100))
    try:
        child.expect("cl3:")
        child.send("vector a\r")
        child.expect(r"vector a = a1\*e1 \+ a2\*e2 \+ a3\*e3")
        child.expect("cl3:")
        # a a = a . a = |a|^2 (the square of a vector is its squared length)
        child.send("a a\r")
        child.expect(r"a1\^2 \+ a2\^2 \+ a3\^2")
        child.expect("cl3:")
        child.send("multivector M\r")
        child.expect("M123")
        child.expect("cl3:")
        # One statement that runs for many seconds within every size limit: a script of
        # thousands of powers of a general multivector, read by `use`.
        child.send(f'use "{long_script}"\r')
        # the prompt hands the line over (it switches bracketed paste off as it leaves)
        child.expect_exact(["\x1b[?2004l", pexpect.TIMEOUT], timeout=10)
        time.sleep(1.0)
        child.sendcontrol("c")
        child.expect("interrupted")
        child.expect("cl3:")
        child.send("a\r")
        child.expect(r"a1\*e1 \+ a2\*e2 \+ a3\*e3")
        child.expect("cl3:")
        child.send("big\r")                 # never assigned: a fresh scalar symbol
        child.expect("note: big is a new scalar symbol")
        child.expect("cl3:")
        child.sendcontrol("d")
        child.expect(pexpect.EOF)
    finally:
        child.close(force=True)
    assert child.exitstatus == 0
    history = tmp_path / "data" / "gacalc" / "history"
    assert f'use "{long_script}"' in history.read_text(encoding="utf-8")

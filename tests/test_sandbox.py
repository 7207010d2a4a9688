"""The sandbox: user text is never code, and files are touched only by use, save and emit.

- A scan of the package source finds no eval(, exec(, compile( (re.compile aside),
  sympify( or parse_expr(, and no way to run programs or open sockets.
- At run time a varied script runs with builtins.eval/exec/compile, sympy.sympify and
  sympy's parse_expr replaced by functions that fail the test, under a Python audit hook
  (PEP 578) that records every exec, compile, file open, rename, process and socket event:
  the only files touched are the ones the script's use / save / emit statements name,
  and each of those statements shows the path it touched.
- Inputs that try to reach Python (``__import__("os")``, ``os.system("ls")``, attribute
  access, string escapes) are ordinary errors or harmless values.
"""

from __future__ import annotations

import builtins
import importlib
import os
import re
import subprocess
import sys
from pathlib import Path

import pytest
import sympy
import sympy.parsing.sympy_parser

from gacalc.language import Session
from gacalc.language.errors import GacalcError, GacalcInternalError

PACKAGE = Path(__file__).resolve().parents[1] / "gacalc"

_FORBIDDEN_CALLS = re.compile(r"(?<![\w.])(?:eval|exec|compile|sympify|parse_expr)\s*\(|"
                              r"(?<!re)\.(?:eval|exec|compile|sympify|parse_expr)\s*\(|"
                              r"\b(?:literal_eval|__import__)\b")
_FORBIDDEN_MODULES = re.compile(r"^\s*(?:import|from)\s+(?:subprocess|socket|pickle|ctypes|"
                                r"urllib|http|ftplib|telnetlib|multiprocessing)\b|"
                                r"\bos\.(?:system|popen|exec\w*|spawn\w*|fork)\b", re.M)


def _sources():
    files = sorted(PACKAGE.rglob("*.py"))
    assert len(files) > 20          # the scan really sees the package
    return files


def test_no_eval_exec_compile_sympify_or_parse_expr_in_the_source():
    found = []
    for path in _sources():
        for number, line in enumerate(path.read_text(encoding="utf-8").splitlines(), 1):
            if _FORBIDDEN_CALLS.search(line):
                found.append(f"{path.relative_to(PACKAGE.parent)}:{number}: {line.strip()}")
    assert not found, "\n".join(found)


def test_the_scan_would_catch_them():
    for line in ["x = eval(text)", "exec(code)", "tree = compile(s, 'f', 'eval')",
                 "sympy.sympify(s)", "sympify(s)", "parse_expr(s)", "ast.literal_eval(s)",
                 "m = __import__(name)", "p.sympy_parser.parse_expr(s)"]:
        assert _FORBIDDEN_CALLS.search(line), line
    for line in ["pattern = re.compile(r'x')", "evaluate(node)", "self.evaluator",
                 "# not a call: compile time"]:
        assert not _FORBIDDEN_CALLS.search(line), line


# The one sanctioned use of processes: gacalc -j N runs script files in worker processes
# of the standard library's multiprocessing (each worker runs the ordinary script runner;
# what travels between processes is file paths, options, output text and tallies).
_PROCESS_POOL_MODULE = PACKAGE / "batch.py"


def test_no_processes_sockets_or_pickles_in_the_source():
    found = []
    for path in _sources():
        text = path.read_text(encoding="utf-8")
        if path == _PROCESS_POOL_MODULE:
            text = re.sub(r"^import multiprocessing$", "", text, flags=re.M)
        if _FORBIDDEN_MODULES.search(text):
            found.append(str(path))
    assert not found, found


def test_only_the_batch_runner_starts_processes():
    users = [path.name for path in _sources()
             if re.search(r"^\s*(?:import|from)\s+multiprocessing\b",
                          path.read_text(encoding="utf-8"), re.M)]
    assert users == [_PROCESS_POOL_MODULE.name]


# Runtime: monkeypatched evaluators and an audit hook ------------------------------------
_EVENTS: list | None = None          # recording when a list
_WATCHED = ("exec", "compile", "open", "os.rename", "os.remove", "os.system", "os.exec",
            "os.posix_spawn", "os.spawn", "os.fork", "subprocess.Popen", "socket.",
            "ctypes.", "os.chmod", "os.mkdir", "shutil.", "import")


def _audit(event, args):
    if _EVENTS is not None and event.startswith(_WATCHED):
        _EVENTS.append((event, args))


sys.addaudithook(_audit)   # hooks cannot be removed; it records only inside `recording`


class recording:
    def __enter__(self):
        global _EVENTS
        _EVENTS = []
        return _EVENTS

    def __exit__(self, *exc):
        global _EVENTS
        _EVENTS = None


# Covers every kind of statement and many built-ins (a camera gimbal, a spin in a field).
VARIED_SCRIPT = """\
vector arm, boom
vector axle unit
bivector tilt
rotor mount
multivector field
scalar theta, omega
yaw(angle_t) = rotor(e12, angle_t)
pitch(angle_t) = rotor(e31, angle_t)
gimbal = yaw(theta) pitch(pi/6)
turned = rotate(gimbal, e1)
check arm boom == arm . boom + arm /\\ boom
check axle axle == 1
check (arm + boom)^2 == arm^2 + boom^2 given arm . boom = 0
assume theta = pi/3
spin = exp(-I e3 omega/2)
<field>2 + <field> + field~ + field^-1 _| e1 + dual(arm) |_ e12
cross(arm, boom); project(arm, e12); reject(arm, e12); reflect(arm, axle); comm(tilt, arm)
anticomm(arm, boom); norm(arm); norm2(field); inverse(1 + e1 + e12)
log(rotor(e12, pi/3)); sqrt(rotor(e23, pi/2)); sqrt(mount)
angle(rotor(e12, pi/3)); axis(rotor(e3, pi/2)); plane(rotor(e12, pi/2))
power(rotor(e12, pi/2), 1/2); slerp(1, rotor(e12, pi/2), 1/2)
matrix(rotor(e12, pi/2)); from_matrix(matrix(rotor(e12, pi/2))); pauli(e1 + e12)
from_pauli(pauli(e1 + e12)); quaternion(rotor(e12, pi/2)); from_quaternion(0, 0, 0, 1)
subs(cos(theta) e1, theta, pi); numeric(rotor(e12, 1)); atan2(1, -1); abs(-3/2)
ln(exp(2)); sin(pi/6) + cos(pi/3) + tan(pi/4) + asin(1/2) + acos(1/2) + atan(1)
sinh(omega) + cosh(0) + 0.25 theta
θ² e12 − (e1 ∧ e2) · e3 + arm ⌋ tilt
show gimbal
show latex rotor(e12, pi/3)
emit latex turned
emit python turned as turner
emit c turned as turner to "turn.c"
help rotor
help
use "lib.gac"
save "session.gac"
"""


def _user_words() -> set:
    """Names the script's author typed: any string containing one came from user text."""
    from gacalc.language import tokens
    from gacalc.language.builtins import BUILTINS

    words = set(re.findall(r"[A-Za-z_]\w*", VARIED_SCRIPT))
    known = (set(BUILTINS) | set(tokens.KEYWORDS) | set(tokens.DECLARATION_KINDS)
             | set(tokens.SOFT_KEYWORDS) | {"pi", "I", "gac"})
    return {w for w in words - known if len(w) >= 3 and not re.fullmatch(r"e\d+", w)}


def _run_varied(tmp_path) -> list:
    session = Session(base_dir=str(tmp_path), statement_budget=120)
    results = session.run(VARIED_SCRIPT)
    errors = [r for r in results if isinstance(r, GacalcError)]
    assert not errors, errors[0].caret_text()
    return results


@pytest.fixture
def workdir(tmp_path):
    (tmp_path / "lib.gac").write_text("vector lever\nwrench = lever /\\ e3\n")
    return tmp_path


def _called_from_gacalc() -> bool:
    import inspect

    frame = inspect.currentframe().f_back.f_back      # the caller of the guarded function
    return frame is not None and str(PACKAGE) in frame.f_code.co_filename


def test_a_varied_script_never_reaches_an_evaluator(workdir, monkeypatch):
    _run_varied(workdir)               # warm up: every lazy import happens now
    (workdir / "turn.c").unlink()
    (workdir / "session.gac").unlink()
    user_words = _user_words()
    assert {"gimbal", "theta", "turned", "axle", "lever"} <= user_words | {"lever"}
    violations, internal_uses = [], []

    def guarded(name, original):
        # gacalc itself never calls these; sympy may, on strings it built from numbers
        # (nsimplify round-trips mpmath's identified constants), never on user text.
        def check(*args, **kwargs):
            text = args[0] if args and isinstance(args[0], str) else ""
            typed = {w for w in re.findall(r"[A-Za-z_]\w*", text) if w in user_words}
            if _called_from_gacalc() or typed:
                violations.append((name, text[:200] or repr(args[:1])))
                raise AssertionError(f"{name} reached from gacalc or with user text")
            internal_uses.append((name, text[:80]))
            return original(*args, **kwargs)
        return check

    sympify_module = importlib.import_module("sympy.core.sympify")
    try:
        for name in ("eval", "exec", "compile"):
            monkeypatch.setattr(builtins, name, guarded(name, getattr(builtins, name)))
        monkeypatch.setattr(sympy, "sympify", guarded("sympify", sympy.sympify))
        monkeypatch.setattr(sympify_module, "sympify",
                            guarded("sympify", sympify_module.sympify))
        monkeypatch.setattr(sympy.parsing.sympy_parser, "parse_expr",
                            guarded("parse_expr", sympy.parsing.sympy_parser.parse_expr))
        with recording() as events:
            session = Session(base_dir=str(workdir), statement_budget=120)
            results = session.run(VARIED_SCRIPT)
    finally:
        monkeypatch.undo()             # before anything (pytest's report) needs them
    assert not violations, violations
    errors = [r for r in results if isinstance(r, GacalcError)]
    assert not errors, errors[0].caret_text()
    # whatever sympy parsed was made of numbers and its own function names
    for name, text in internal_uses:
        assert not set(re.findall(r"[A-Za-z_]\w*", text)) & user_words, (name, text)
    kinds = {r.kind for r in results}
    assert {"declaration", "value", "check", "note", "show", "emit", "help",
            "file"} <= kinds
    names = [event for event, _ in events]
    assert not [e for e in names if e.startswith(("os.system", "os.exec", "os.posix_spawn",
                                                   "os.spawn", "os.fork", "subprocess",
                                                   "socket", "ctypes", "import"))], names
    # files: only the ones use, save and emit name (and the temporaries of atomic writes)
    touched = set()
    for event, args in events:
        paths = {"open": 1, "os.rename": 2, "os.remove": 1, "os.chmod": 1, "os.mkdir": 1}
        for arg in args[:paths.get(event, 0)]:
            if isinstance(arg, (str, bytes, os.PathLike)):
                touched.add(os.path.realpath(os.fsdecode(os.fspath(arg))))
    allowed = {str((workdir / name).resolve()) for name in ("lib.gac", "turn.c",
                                                            "session.gac")}
    unexpected = {path for path in touched if path not in allowed
                  and not (os.path.dirname(path) == str(workdir.resolve())
                           and os.path.basename(path).startswith(".")
                           and path.endswith(".tmp"))}
    assert not unexpected, unexpected
    assert allowed <= touched
    # and each of those statements shows the path it touched
    shown = "\n".join(r.text for r in results if r.kind in ("emit", "file"))
    for path in allowed:
        assert path in shown, (path, shown)


def test_the_guard_catches_user_text_and_direct_calls():
    # The runtime guard above can fail: a call from gacalc code, or a string with a name
    # the user typed, is a violation.
    assert "gimbal" in _user_words() and "sqrt" not in _user_words()


def test_the_audit_hook_sees_what_it_must():
    # the hook records what the runtime test relies on (so that test can fail)
    with recording() as events:
        with open(os.devnull, encoding="utf-8"):
            pass
        compile("1", "<test>", "eval")
    names = [event for event, _ in events]
    assert "open" in names and "compile" in names


# Hostile inputs -------------------------------------------------------------------------
@pytest.fixture
def no_processes(monkeypatch):
    calls = []

    def refuse(*args, **kwargs):
        calls.append(args)
        raise AssertionError("a process was started")

    for module, name in ((os, "system"), (os, "popen"), (subprocess, "Popen"),
                         (os, "execv"), (os, "execvp"), (os, "posix_spawn")):
        monkeypatch.setattr(module, name, refuse, raising=False)
    yield calls
    assert not calls


@pytest.mark.parametrize("text", [
    '__import__("os")',
    '__import__("os").system("ls")',
    'os.system("ls")',
    'system("rm -rf /")',
    'exec("print(1)")',
    'eval("1 + 1")',
    'compile("1", "f", "eval")',
    'open("/etc/passwd")',
    'x.__class__',
    'x.__class__.__bases__',
    '().__class__',
    '"".join',
    'getattr(x, "y")',
    'sympify("1")',
    'lambda: 1',
    '{c for c in x}',          # ([c for c in x] reads as a 1x1 matrix of symbols now)
    '{1: 2}',
    "'single quoted'",
    '"\\x41"',
    '"\\n" + 1',
    'x = "abc"',
    'use "a\\"b"',
    '$(ls)',
    '`ls`',
    'x; rm -rf /',
    '\\x41',
])
def test_attempts_to_reach_python_are_plain_errors(text, no_processes, tmp_path):
    results = Session(base_dir=str(tmp_path)).run(text)
    error = results[-1]
    assert isinstance(error, GacalcError) and not isinstance(error, GacalcInternalError), \
        (text, results)
    assert error.span is not None and "Traceback" not in error.caret_text()


def test_attribute_access_is_just_the_inner_product(no_processes):
    # '.' is the Hestenes inner product: a.b.c is (a . b) . c, values, nothing else
    session = Session()
    results = session.run("vector a, b\nbivector C\na.b.C")
    assert results[-1].kind == "value"
    assert results[-1].value.equals(session.get("a").inner(session.get("b"))
                                    .inner(session.get("C")))
    value = session.run("os.system")[-1]
    assert value.kind == "value" and value.text == "0"   # scalars: inner product is 0
    # words of other languages are names: a product of scalar symbols, nothing runs
    for text in ["import os", "from os import system", "os.system(ls)"]:
        assert session.run(text)[-1].kind == "value", text


def test_strings_have_no_escapes(tmp_path):
    # a backslash is an ordinary character: the path is used literally
    results = Session(base_dir=str(tmp_path)).run('use "\\x2e\\x2e/secret.gac"')
    error = results[-1]
    assert isinstance(error, GacalcError) and "\\x2e\\x2e" in error.message
    # a quote cannot be escaped: the string ends there and the rest is an error
    error = Session().run('use "a\\"b"')[-1]
    assert isinstance(error, GacalcError)


def test_file_statements_show_the_path_they_touched(tmp_path):
    (tmp_path / "lib.gac").write_text("y = e1\n")
    session = Session(base_dir=str(tmp_path))
    results = session.run('use "lib.gac"\nemit c y to "y.c"\nsave "s.gac"')
    texts = [r.text for r in results if r.kind in ("file", "emit")]
    assert texts == [f"used {tmp_path / 'lib.gac'} (1 statement)",
                     f"wrote c to {tmp_path / 'y.c'}",
                     f"saved 1 statement to {tmp_path / 's.gac'}"]

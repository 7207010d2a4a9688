"""The ``gacalc`` command: REPL, scripts, statements from the command line or stdin.

Startup stays fast: this module imports only the standard library; the language is
imported when there is something to run and prompt_toolkit / pygments only when the
REPL starts.
"""

from __future__ import annotations

import argparse
import os
import shutil
import sys

from gacalc import __version__

DESCRIPTION = """\
gacalc: a symbolic calculator for the geometric algebra of 3-D Euclidean space, Cl(3,0).
With no arguments it starts the interactive calculator; given files it runs them as
scripts of results and identity checks."""

EXAMPLES = """\
examples:
  gacalc                                  start the interactive calculator
  gacalc --demo                           run the shipped demo scripts
  gacalc --demo gimbal                    run one demo (periscope, retroreflector, gimbal, spin)
  gacalc mirrors.gac                      run a script; exit 0 when every check held
  gacalc -j 4 checks/*.gac                run many scripts in 4 processes; the output
                                          is printed in file order, as one by one
  gacalc -e 'vector a, b; a b'            run statements given here
  gacalc -e 'check e1 e2 == -e2 e1'       check an identity
  echo 'rotate(rotor(e12, pi/2), e1)' | gacalc
                                          statements on standard input run as a script
  gacalc --ascii derive.gac > out.txt     results as plain ASCII (valid gacalc input)

exit status: 0 every check held, 1 a check failed or was undecided, 2 an error,
130 interrupted.  Inside the calculator, type help for the language."""


def build_parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(
        prog="gacalc", description=DESCRIPTION, epilog=EXAMPLES,
        formatter_class=argparse.RawDescriptionHelpFormatter)
    parser.add_argument("files", nargs="*", metavar="FILE.gac",
                        help="scripts to run, each in a fresh session ('-' reads standard "
                             "input); with --demo, names of demos")
    parser.add_argument("-e", "--statements", action="append", default=[],
                        metavar="STATEMENTS",
                        help="run these statements (separated by ';' or newlines); may be "
                             "repeated, all run in one session")
    parser.add_argument("-j", "--jobs", type=int, metavar="N", default=1,
                        help="run the script files in N processes at once (default 1: one "
                             "after the other); the output stays in file order")
    parser.add_argument("--demo", action="store_true",
                        help="run the demo scripts shipped with gacalc (all, or the ones "
                             "named)")
    parser.add_argument("--echo", action="store_true",
                        help="print each script line before its results (on for --demo)")
    mode = parser.add_mutually_exclusive_group()
    mode.add_argument("--ascii", dest="unicode", action="store_false", default=None,
                      help="print results in plain ASCII (the default when output is not "
                           "a UTF-8 terminal)")
    mode.add_argument("--unicode", dest="unicode", action="store_true",
                      help="print results with Unicode symbols (∧, θ, superscripts)")
    parser.add_argument("--no-color", action="store_true",
                        help="no colours or syntax highlighting (also when NO_COLOR is set)")
    parser.add_argument("--budget", type=float, metavar="SECONDS", default=None,
                        help="time allowed for simplifying one result (default 10)")
    parser.add_argument("--statement-budget", type=float, metavar="SECONDS", default=None,
                        help="wall-clock time allowed for one statement (default 10 in the "
                             "REPL, where a person waits; 30 for scripts and -e)")
    parser.add_argument("--emit-dir", metavar="DIR", default=None,
                        help="write every emit of the scripts to a file in DIR (NAME.tex, "
                             "NAME.py, NAME.c; 'to \"file\"' paths resolve under DIR)")
    parser.add_argument("--version", action="version", version=f"gacalc {__version__}")
    return parser


def _default_unicode(stream) -> bool:
    from gacalc.runner import stream_accepts_unicode

    isatty = getattr(stream, "isatty", None)
    return bool(isatty and isatty()) and stream_accepts_unicode(stream)


def _protect_streams(unicode: bool):
    """With Unicode output on a stream that cannot encode it, replace instead of crash."""
    from gacalc.runner import stream_accepts_unicode

    for stream in (sys.stdout, sys.stderr):
        if not stream_accepts_unicode(stream) and hasattr(stream, "reconfigure"):
            try:
                stream.reconfigure(errors="replace" if unicode else "backslashreplace")
            except (ValueError, OSError):
                pass


def _terminal_width(stream) -> int:
    isatty = getattr(stream, "isatty", None)
    if isatty and isatty():
        return max(40, min(shutil.get_terminal_size((80, 24)).columns - 2, 160))
    return 78


def _demo_paths(parser, names: list[str]) -> tuple[list[str], dict]:
    """Paths of the named demos (all when none is named) and a heading for each."""
    from gacalc.examples import demo_path, example_paths

    if not names:
        found = example_paths()
    else:
        found = []
        for name in names:
            path = demo_path(name)
            if path is None:
                known = ", ".join(path.stem for path in example_paths())
                parser.error(f"no demo called {name!r} (the demos are {known})")
            found.append(path)
    paths = [str(path) for path in found]
    titles = {str(path): f"demo {path.name}" for path in found}
    return paths, titles


def _run_scripts(args, options) -> int:
    from gacalc.runner import ScriptRunner, Tally

    files = list(args.files)
    if "-" in files and len(files) > 1:
        print("gacalc: '-' (standard input) must be the only file", file=sys.stderr)
        return 2
    runner = ScriptRunner(options)
    total = Tally()
    if args.statements:
        text = "\n".join(args.statements)
        total.add(runner.run_text(text, "<command line>"))
    if files == ["-"]:
        text = sys.stdin.read() if sys.stdin is not None else ""
        total.add(runner.run_text(text, "<stdin>"))
    elif files and not total.interrupted:
        total.add(runner.run_files(files, headings=len(files) > 1 or args.demo,
                                   titles=args.titles, jobs=args.jobs))
    return total.exit_status()


def main(argv: list[str] | None = None) -> int:
    parser = build_parser()
    args = parser.parse_args(argv)
    if args.jobs < 1:
        parser.error("-j/--jobs must be a whole number of processes, at least 1")
    if args.budget is not None and not args.budget > 0:
        parser.error("--budget must be a positive number of seconds")
    if args.statement_budget is not None and not args.statement_budget > 0:
        parser.error("--statement-budget must be a positive number of seconds")
    if args.emit_dir is not None:
        try:
            os.makedirs(args.emit_dir, exist_ok=True)
        except OSError as error:
            parser.error(f"--emit-dir: cannot create {args.emit_dir}: {error.strerror}")

    # The REPL needs a terminal on both sides; otherwise typed or piped text is a script.
    terminal = all(stream is not None and stream.isatty() for stream in (sys.stdin, sys.stdout))
    interactive = not (args.files or args.statements or args.demo) and terminal
    unicode = args.unicode if args.unicode is not None else _default_unicode(sys.stdout)
    _protect_streams(unicode)

    if interactive:
        from gacalc.repl import run_repl

        return run_repl(unicode=unicode, color=not args.no_color and not os.environ.get(
            "NO_COLOR"), budget=args.budget, statement_budget=args.statement_budget)

    from gacalc.runner import RunOptions, wants_color

    args.titles = None
    if args.demo:
        args.files, args.titles = _demo_paths(parser, args.files)
    options = RunOptions(unicode=unicode, color=wants_color(sys.stdout, not args.no_color),
                         echo=args.echo or args.demo, width=_terminal_width(sys.stdout),
                         budget=args.budget, emit_dir=args.emit_dir,
                         statement_budget=args.statement_budget)
    if not (args.files or args.statements):
        args.files = ["-"]          # statements piped on standard input
    try:
        return _run_scripts(args, options)
    except BrokenPipeError:
        # Output piped into a program that stopped reading (head, less): not an error.
        # Point stdout at devnull so the interpreter's final flush does not complain.
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
        return 0
    except KeyboardInterrupt:
        print("interrupted", file=sys.stderr)
        return 130


if __name__ == "__main__":
    sys.exit(main())

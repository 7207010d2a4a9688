"""Internal errors (bugs in gacalc): keep the traceback in a file, show the user one line.

``write_internal_error(exc)`` appends an entry -- time, versions, the statement, the
traceback -- to the internal-error log in the user's state directory (gacalc.paths) and
returns the log's path, or None when it cannot be written (read-only home); reporting a
bug must never raise another error.
"""

from __future__ import annotations

import datetime
import sys
import traceback
from pathlib import Path

from gacalc.paths import ensure_parent, internal_error_log

MAX_STATEMENT_CHARS = 2_000     # a huge statement is cut in the log: the start identifies it


def traceback_text(exc: BaseException) -> str:
    return "".join(traceback.format_exception(type(exc), exc, exc.__traceback__))


def summary(exc: BaseException) -> str:
    """One line: the exception type and the first line of its message."""
    lines = str(exc).strip().splitlines()
    message = lines[0][:160] if lines else ""
    return f"{type(exc).__name__}: {message}" if message else type(exc).__name__


def write_internal_error(exc: BaseException, statement: str | None = None,
                         where: str | None = None, tb_text: str | None = None) -> Path | None:
    """Append the error's traceback to the state-directory log; the log's path or None."""
    try:
        from gacalc import __version__

        path = internal_error_log()
        if not ensure_parent(path):
            return None
        stamp = datetime.datetime.now().isoformat(timespec="seconds")
        text = tb_text if tb_text is not None else traceback_text(exc)
        statement = statement or ""
        if len(statement) > MAX_STATEMENT_CHARS:
            statement = statement[:MAX_STATEMENT_CHARS] + " ..."
        entry = (f"--- {stamp} gacalc {__version__} python {sys.version.split()[0]} "
                 f"on {sys.platform}\n"
                 f"{where or '(no position)'}: {summary(exc)}\n"
                 f"statement: {statement}\n{text.rstrip()}\n\n")
        with open(path, "a", encoding="utf-8", errors="backslashreplace") as handle:
            handle.write(entry)
        return path
    except Exception:      # noqa: BLE001 - the report of a bug must not become a second bug
        return None

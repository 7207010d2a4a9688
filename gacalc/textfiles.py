"""The one way gacalc reads a script or session file: UTF-8, and a byte-order mark that
an editor put at the start is not text."""

from __future__ import annotations

SCRIPT_ENCODING = "utf-8-sig"


def open_script(path):
    return open(path, encoding=SCRIPT_ENCODING)


def read_script(path) -> str:
    """The text of a script file; raises OSError or UnicodeDecodeError."""
    with open_script(path) as handle:
        return handle.read()

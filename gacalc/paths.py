"""Where gacalc keeps the user's files: REPL history (data) and internal-error logs (state).

Linux and other Unix: $XDG_DATA_HOME/gacalc (default ~/.local/share/gacalc) and
$XDG_STATE_HOME/gacalc (default ~/.local/state/gacalc), as the XDG base directory
specification says.  macOS: ~/Library/Application Support/gacalc and ~/Library/Logs/gacalc.
Windows: %APPDATA%\\gacalc and %LOCALAPPDATA%\\gacalc.  The XDG variables, when set,
win on every platform (handy for tests and for people who set them on purpose).
"""

from __future__ import annotations

import os
import sys
from pathlib import Path

APP_NAME = "gacalc"


def _xdg(variable: str) -> Path | None:
    # The specification says a relative path in these variables is invalid: ignore it.
    value = os.environ.get(variable, "")
    if value and os.path.isabs(value):
        return Path(value)
    return None


def _home() -> Path:
    return Path(os.path.expanduser("~"))


def data_dir() -> Path:
    """Directory for files the user keeps (the REPL history)."""
    explicit = _xdg("XDG_DATA_HOME")
    if explicit is not None:
        return explicit / APP_NAME
    if sys.platform == "win32":
        base = os.environ.get("APPDATA")
        return Path(base) / APP_NAME if base else _home() / "AppData" / "Roaming" / APP_NAME
    if sys.platform == "darwin":
        return _home() / "Library" / "Application Support" / APP_NAME
    return _home() / ".local" / "share" / APP_NAME


def state_dir() -> Path:
    """Directory for files gacalc writes about itself (logs of internal errors)."""
    explicit = _xdg("XDG_STATE_HOME")
    if explicit is not None:
        return explicit / APP_NAME
    if sys.platform == "win32":
        base = os.environ.get("LOCALAPPDATA")
        return Path(base) / APP_NAME if base else _home() / "AppData" / "Local" / APP_NAME
    if sys.platform == "darwin":
        return _home() / "Library" / "Logs" / APP_NAME
    return _home() / ".local" / "state" / APP_NAME


def history_file() -> Path:
    return data_dir() / "history"


def internal_error_log() -> Path:
    return state_dir() / "internal-errors.log"


def ensure_parent(path: Path) -> bool:
    """Create the directory of ``path``; False when that is not possible (read-only home)."""
    try:
        path.parent.mkdir(parents=True, exist_ok=True)
    except OSError:
        return False
    return True

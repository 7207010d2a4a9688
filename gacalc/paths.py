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


def _folder(xdg: str, windows: tuple[str, str], darwin: str, other: str) -> Path:
    """The platform's folder of one sort: $XDG_..., else Windows' environment variable
    (or its usual place), macOS' Library folder, or the XDG default under home."""
    explicit = _xdg(xdg)
    if explicit is not None:
        return explicit / APP_NAME
    if sys.platform == "win32":
        variable, fallback = windows
        base = os.environ.get(variable)
        return Path(base) / APP_NAME if base else _home() / "AppData" / fallback / APP_NAME
    if sys.platform == "darwin":
        return _home() / "Library" / darwin / APP_NAME
    return _home() / other / APP_NAME


def data_dir() -> Path:
    """Directory for files the user keeps (the REPL history)."""
    return _folder("XDG_DATA_HOME", ("APPDATA", "Roaming"), "Application Support",
                   ".local/share")


def state_dir() -> Path:
    """Directory for files gacalc writes about itself (logs of internal errors)."""
    return _folder("XDG_STATE_HOME", ("LOCALAPPDATA", "Local"), "Logs", ".local/state")


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

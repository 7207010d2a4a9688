"""Files a session reads and writes: ``use``, ``save`` and the files ``emit`` writes
(scripts are read by gacalc.textfiles, like everywhere else)."""

from __future__ import annotations

import os

from gacalc.export import targets as export_targets
from gacalc.textfiles import open_script, read_script

from .errors import GacalcFileError, GacalcLimitError, Source
from .parser import iter_statements
from .results import FileResult
from .watchdog import restart

MAX_INPUT_CHARS = 2_000_000
SAVE_HEADER = "# gacalc session"


class RunContext:
    """Per-run bookkeeping: which files are being read (for relative paths and cycles)."""

    def __init__(self, base_dir: str, stack: list[str]):
        self.base_dir = base_dir
        self.stack = stack


class FileStatements:
    """Mixed into Session: the statements that read and write files."""

    def _do_Use(self, statement, state, results, context):
        path = resolve(statement.path, statement, context)
        if path in context.stack:
            raise GacalcFileError(f"use of {path} would read it again while it is being read "
                                  "(a cycle)", statement.path_span)
        try:
            text = read_script(path)
        except (OSError, UnicodeDecodeError) as error:
            raise GacalcFileError(f"cannot read {path}: {os_reason(error)}",
                                  statement.path_span) from None
        if len(text) > MAX_INPUT_CHARS:
            raise GacalcLimitError(f"{path} is too long ({len(text)} characters)",
                                   statement.path_span)
        inner = RunContext(os.path.dirname(path), context.stack + [path])
        count = 0
        for inner_statement in iter_statements(Source(text, path)):
            restart(self._clock)       # each statement of the file has its own budget
            self._execute(inner_statement, state, results, inner)
            count += 1
        results.append(self._result(FileResult, statement, action="used", path=path,
                                    count=count))

    def _do_Save(self, statement, state, results, context):
        path = resolve(statement.path, statement, context)
        if os.path.exists(path) and not statement.force:
            if os.path.isdir(path):
                raise GacalcFileError(f"{path} is a directory", statement.path_span)
            if not _is_saved_session(path):
                raise GacalcFileError(
                    f"{path} exists and is not a saved gacalc session; write save "
                    f"\"{statement.path}\" force to overwrite it", statement.path_span)
        lines = [f"{SAVE_HEADER}: re-creates the names, functions, declarations and "
                 "conditions", *state.log]
        try:
            _write_atomically(path, "\n".join(lines) + "\n")
        except OSError as error:     # the message already names the path and the reason
            raise GacalcFileError(str(error), statement.path_span) from None
        results.append(self._result(FileResult, statement, action="saved", path=path,
                                    count=len(state.log)))

    def _write_emitted(self, statement, name, code: str, context) -> str | None:
        """Write emitted code where the statement (or the session's emit_dir) says; the
        path written, or None."""
        from gacalc import export

        path = None
        if self.emit_dir is not None:
            suffix = export_targets.TARGETS[statement.target].suffix
            relative = statement.path or f"{name or 'gacalc_value'}{suffix}"
            path = os.path.abspath(os.path.join(self.emit_dir, os.path.expanduser(relative)))
        elif statement.path is not None:
            path = resolve(statement.path, statement, context)
        if path is not None:
            try:
                export.write_atomically(path, code if code.endswith("\n") else code + "\n")
            except export.ExportError as error:
                raise GacalcFileError(str(error), statement.path_span or statement.span) from None
            except OSError as error:
                raise GacalcFileError(f"cannot write {path}: {os_reason(error)}",
                                      statement.path_span) from None
        return path


# Helpers ------------------------------------------------------------------------------
def os_reason(error: Exception) -> str:
    """Why a file operation failed, in a few words."""
    lines = str(error).strip().splitlines()
    return getattr(error, "strerror", None) or (lines[0][:160] if lines else "no message")


def resolve(path: str, statement, context: RunContext) -> str:
    expanded = os.path.expanduser(path)
    if not os.path.isabs(expanded):
        expanded = os.path.join(context.base_dir, expanded)
    return os.path.abspath(expanded)


def _is_saved_session(path: str) -> bool:
    try:
        with open_script(path) as handle:
            return handle.readline().startswith(SAVE_HEADER)
    except (OSError, UnicodeDecodeError):
        return False


def _write_atomically(path: str, text: str):
    """Write through a temporary file in the same directory and os.replace (gacalc.export's
    writer: a reader sees the old file or all of the new one, and an existing file keeps
    its permissions).  Raises OSError."""
    from gacalc.export import ExportError, write_atomically

    try:
        write_atomically(path, text)
    except ExportError as error:        # "cannot write PATH: REASON"
        raise OSError(str(error)) from None

"""The IPython extension: ``%load_ext gacalc`` gives ``%gac`` and ``%%gac``.

    %load_ext gacalc
    %%gac
    vector n unit
    show rotor(n, pi/3)

Every cell runs in the one shared session (``gacalc.session()``), so names persist from
cell to cell and Python reads and writes them with ``gacalc.session()["x"]``.  Results
are displayed as rich bundles (gacalc.display): LaTeX and HTML in a notebook, text in a
terminal.  A mistake prints its caret message (no Python traceback) and leaves the session
as it was.  In a notebook ``draw`` shows its picture inline; in a terminal it writes a file.
"""

from __future__ import annotations

import sys

__all__ = ["load_ipython_extension", "run_cell"]

USAGE = "usage: %gac STATEMENTS (one line) or a %%gac cell of gacalc statements"


def run_cell(text: str, session=None, display=None) -> bool:
    """Run gacalc text and display each result; False when a statement failed (its caret
    message went to stderr)."""
    from gacalc.api import session as shared
    from gacalc.display import bundle, error_text
    from gacalc.language.errors import GacalcError

    if display is None:
        from IPython.display import display
    session = session or shared()
    for result in session.iter_run(text):
        if isinstance(result, GacalcError):
            print(error_text(result), file=sys.stderr)
            return False
        data = bundle(result)
        if data is not None:
            display(data, raw=True)
    return True


def _gac(line: str, cell: str | None = None):
    text = line if cell is None else cell
    if not text.strip():
        print(USAGE, file=sys.stderr)
        return None
    run_cell(text)
    return None


def load_ipython_extension(ipython):
    """Register the magics; in a kernel with rich display (a notebook) pictures show inline."""
    from gacalc.api import session

    shared = session()
    shared.inline_pictures = type(ipython).__name__ != "TerminalInteractiveShell"
    ipython.register_magic_function(_gac, magic_kind="line_cell", magic_name="gac")

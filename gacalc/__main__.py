"""``python -m gacalc``: the same program as the ``gacalc`` command."""

import importlib.util
import sys

from gacalc.cli import main

# A missing dependency (gacalc run from a source tree without installing it) gets one
# clear line instead of a traceback from deep inside the first import.
_NEEDED = {"sympy": "sympy", "flint": "python-flint"}

if __name__ == "__main__":
    missing = [dist for module, dist in _NEEDED.items() if importlib.util.find_spec(module) is None]
    if missing:
        print(f"gacalc: missing {', '.join(missing)}; install gacalc with "
              f"'pip install -e .' (or 'pip install {' '.join(missing)}')", file=sys.stderr)
        sys.exit(2)
    sys.exit(main())

"""``python -m gacalc``: the same program as the ``gacalc`` command."""

import sys

from gacalc.cli import main

if __name__ == "__main__":
    sys.exit(main())

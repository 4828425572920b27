"""``python -m picker``: the same as the ``picker`` console script."""

from __future__ import annotations

import sys

from picker.cli import main

if __name__ == "__main__":
    sys.exit(main())

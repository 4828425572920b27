"""The physics core imports numpy and nothing heavier (house rule: no scipy at runtime)."""

from __future__ import annotations

import subprocess
import sys


def test_physics_imports_only_numpy() -> None:
    code = (
        "import sys, picker.physics\n"
        "banned = {'scipy', 'sympy', 'pandas', 'pint', 'textual', 'rich'}\n"
        "print(sorted(m for m in banned if m in sys.modules))\n"
    )
    completed = subprocess.run(
        [sys.executable, "-c", code], capture_output=True, text=True, check=True
    )
    assert completed.stdout.strip() == "[]"

"""The functional core imports neither textual nor rich (STYLE.md: functional core, thin
shell). Checked in a fresh interpreter, since this test process may have loaded them."""

from __future__ import annotations

import subprocess
import sys

import pytest

CORE = ("catalog", "picker.physics", "picker.rank", "picker.alternates", "picker.analysis")


@pytest.mark.parametrize("module", CORE)
def test_core_module_does_not_import_the_ui(module: str) -> None:
    code = (
        f"import sys, {module}\n"
        "bad = sorted(m for m in sys.modules if m.split('.')[0] in ('textual', 'rich'))\n"
        "print(','.join(bad))\n"
    )
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == ""


def test_the_check_can_fail() -> None:
    # The same probe must notice a UI import, or the tests above prove nothing.
    code = "import sys, picker.tui.app\nprint('textual' in sys.modules)\n"
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True)
    if out.returncode != 0:
        pytest.skip("terminal UI not importable here")
    assert out.stdout.strip() == "True"

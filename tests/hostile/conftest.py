"""Shared helpers for the hostile-input corpus: a time bound, in-process CLI runs, file guards.

Every corpus file is generated in tmp_path by the tests themselves; nothing binary is
committed. The catalogs hold invented parts only (no real brand or part number).
"""

from __future__ import annotations

import hashlib
import json
import os
import resource
import signal
import stat
import time
from collections.abc import Callable, Iterator
from contextlib import contextmanager
from dataclasses import dataclass
from pathlib import Path
from types import FrameType

import pytest

from picker.cli import main

#: Generous wall-clock bound for one hostile case [s]; the slowest case takes about 1 s.
CASE_SECONDS = 20.0
#: Largest growth of the process's peak resident memory one case may cause [bytes].
CASE_MEMORY_BYTES = 600 * 1024 * 1024
#: Files up to this size are hashed by ``snapshot``; larger ones are the sparse size cases.
_HASHED_BYTES = 100 * 1024 * 1024

#: Columns with our own field names (DESIGN.md §3), so no header mapping is involved.
HEADER = (
    "mpn,maker,frequency,load_capacitance,tolerance,stability,temp_min,temp_max,esr,"
    "package,c0,c1,drive_level,aging,price,stock,lifecycle"
)


def part_row(mpn: str, *, esr: str = "40 ohm", frequency: str = "16 MHz") -> str:
    """One invented 16 MHz AT-cut part that fits BRIEF_TEXT comfortably.

    C0/C1 = 2 pF / 5 fF = 400 is in the usual AT-cut range (common practice); the values
    are invented, not taken from any data sheet.
    """
    return (
        f"{mpn},Quillon,{frequency},8 pF,10 ppm,10 ppm,-40,85,{esr},3225,2 pF,5 fF,"
        "200 uW,2 ppm,0.30,5000,active"
    )


GOOD_ROWS = tuple(part_row(f"QN16-{letter}") for letter in "ABCD")

#: A brief the good rows fit: 16 MHz, 100 ppm, gm 20 mA/V, every other key given.
BRIEF_TEXT = """\
name: Hostile corpus bench clock
frequency: 16 MHz
budget: 100 ppm
temperature: [-40 degC, 85 degC]
lifetime: 10 year
amplifier:
  gm: 20 mA/V
  pin_capacitance: 1.5 pF
  swing: 1.0 V
board:
  stray_capacitance: 2 pF
  stray_uncertainty: 0.5 pF
  cap_series: E12
  cap_tolerance: 5 %
limits:
  min_margin: 5
"""


class CaseTimeout(BaseException):
    """A hostile case ran past its time bound (a hang turned into a failure).

    A BaseException, so the command line's catch-all handler cannot swallow it.
    """


@contextmanager
def bounded(seconds: float = CASE_SECONDS) -> Iterator[None]:
    """Fail with CaseTimeout after ``seconds`` of wall-clock time, and bound memory growth.

    SIGALRM interrupts a blocking system call (an open() of a FIFO with no writer, a read
    that never ends) in the main thread, where pytest runs tests, so a hang fails the test
    instead of hanging CI.
    """

    def expire(signum: int, frame: FrameType | None) -> None:
        raise CaseTimeout(f"case took longer than {seconds:.0f} s")

    before_rss = _peak_rss_bytes()
    previous = signal.signal(signal.SIGALRM, expire)
    signal.setitimer(signal.ITIMER_REAL, seconds)
    try:
        yield
    finally:
        signal.setitimer(signal.ITIMER_REAL, 0)
        signal.signal(signal.SIGALRM, previous)
    growth = _peak_rss_bytes() - before_rss
    assert growth < CASE_MEMORY_BYTES, f"peak memory grew by {growth / 1e6:.0f} MB"


def _peak_rss_bytes() -> int:
    # Linux reports ru_maxrss in KiB.
    return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss * 1024


def snapshot(folder: Path) -> dict[str, tuple[str, int] | str]:
    """Every entry under ``folder``: regular files by (sha256, mtime_ns), others by kind.

    Special files (FIFOs, links to devices) are not opened: reading them would block or
    never end.
    """
    entries: dict[str, tuple[str, int] | str] = {}
    for path in sorted(folder.rglob("*")):
        info = path.lstat()
        name = str(path.relative_to(folder))
        if stat.S_ISREG(info.st_mode) and info.st_size > _HASHED_BYTES:
            # A sparse giant: hashing gigabytes of holes proves nothing the size, the mtime
            # and the allocated blocks do not.
            entries[name] = (f"{info.st_size} bytes, {info.st_blocks} blocks", info.st_mtime_ns)
        elif stat.S_ISREG(info.st_mode):
            digest = hashlib.sha256(path.read_bytes()).hexdigest()
            entries[name] = (digest, info.st_mtime_ns)
        else:
            entries[name] = stat.filemode(info.st_mode)
    return entries


@dataclass(frozen=True)
class CliRun:
    """What one in-process run of the command line gave."""

    code: int
    out: str
    err: str
    seconds: float

    def json(self) -> object:
        return json.loads(self.out)


RunCli = Callable[..., CliRun]


@pytest.fixture
def corpus(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Path:
    """An empty folder for one case's files; the parsed-catalog cache lives elsewhere."""
    folder = tmp_path / "corpus"
    folder.mkdir()
    monkeypatch.setenv("PICKER_CACHE_DIR", str(tmp_path / "cache"))
    monkeypatch.delenv("PICKER_NO_CACHE", raising=False)
    return folder


@pytest.fixture
def run_cli(corpus: Path, capsys: pytest.CaptureFixture[str]) -> RunCli:
    """Run ``picker.cli.main(argv)`` in-process under the time bound and check the basics.

    Checked on every run: no traceback on stdout or stderr, stderr is short one-line
    messages, and no file under the corpus folder changed, vanished or appeared (the user's
    files are only read; the cache writes elsewhere).
    """

    def run(*argv: str, seconds: float = CASE_SECONDS) -> CliRun:
        before = snapshot(corpus)
        capsys.readouterr()
        start = time.perf_counter()
        with bounded(seconds):
            code = main(list(argv))
        elapsed = time.perf_counter() - start
        captured = capsys.readouterr()
        assert "Traceback" not in captured.out and "Traceback" not in captured.err
        for line in captured.err.splitlines():
            assert len(line) < 2000, f"stderr line of {len(line)} characters"
        assert snapshot(corpus) == before, "an input file changed or a file appeared"
        return CliRun(code, captured.out, captured.err, elapsed)

    return run


@pytest.fixture
def brief_file(corpus: Path) -> Path:
    path = corpus / "brief.yaml"
    path.write_text(BRIEF_TEXT, encoding="utf-8")
    return path


def write_catalog(folder: Path, name: str, lines: list[str] | tuple[str, ...]) -> Path:
    """A UTF-8 CSV catalog: the header then ``lines``."""
    path = folder / name
    path.write_text("\n".join([HEADER, *lines]) + "\n", encoding="utf-8")
    return path


def make_fifo(folder: Path, name: str) -> Path:
    path = folder / name
    os.mkfifo(path)
    return path

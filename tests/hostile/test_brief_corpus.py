"""Hostile and broken briefs, through load_brief and through the command line (in-process).

Expected messages follow picker/brief.py's contract: ``file:line: key.path: what is wrong``,
one line, BriefError only; the CLI exits 2 (DESIGN.md §6: bad usage or unreadable input).
"""

from __future__ import annotations

import random
from pathlib import Path

import pytest

from picker.brief import BriefError, load_brief
from tests.hostile.conftest import GOOD_ROWS, RunCli, bounded, make_fifo, write_catalog

#: The smallest usable brief: the three keys DESIGN.md §6 cannot default.
MINIMAL = "frequency: 16 MHz\nbudget: 100 ppm\namplifier:\n  gm: 20 mA/V\n"

# (case id, brief text or bytes, text the one-line error must hold, line it must name)
BAD_BRIEFS: list[tuple[str, str | bytes, str, int | None]] = [
    ("empty file", "", "the brief is empty", None),
    ("only a comment", "# nothing here\n", "the brief is empty", None),
    ("binary file", random.Random(7).randbytes(3000), "not UTF-8 text", None),
    (
        "control characters",
        bytes(range(32)) * 50,
        "not valid YAML",
        None,
    ),  # seeded random generator
    ("not a mapping: list", "- 16 MHz\n- 100 ppm\n", "must be a mapping", None),
    ("not a mapping: scalar", "just words\n", "must be a mapping", None),
    (
        "missing frequency",
        "budget: 100 ppm\namplifier:\n  gm: 20 mA/V\n",
        "frequency: missing",
        None,
    ),
    ("missing budget", "frequency: 16 MHz\namplifier:\n  gm: 20 mA/V\n", "budget: missing", None),
    ("missing amplifier", "frequency: 16 MHz\nbudget: 100 ppm\n", "amplifier: missing", None),
    ("unknown top key", MINIMAL + "budjet: 50 ppm\n", "did you mean 'budget'", 5),
    (
        "unknown nested key",
        "frequency: 16 MHz\nbudget: 100 ppm\namplifier:\n  gm: 20 mA/V\n  pin_capacitence: 2 pF\n",
        "amplifier.pin_capacitence: unknown key; did you mean 'pin_capacitance'",
        5,
    ),
    ("wrong unit: budget in pF", MINIMAL.replace("100 ppm", "100 pF"), "budget: expected", 2),
    ("wrong unit: frequency in ohm", MINIMAL.replace("16 MHz", "16 ohm"), "frequency: expected", 1),
    ("wrong unit: gm in volts", MINIMAL.replace("20 mA/V", "20 V"), "amplifier.gm: expected", 4),
    ("negative budget", MINIMAL.replace("100 ppm", "-5 ppm"), "budget: must be positive", 2),
    ("zero gm", MINIMAL.replace("20 mA/V", "0 mA/V"), "amplifier.gm: must be positive", 4),
    ("infinite budget", MINIMAL.replace("100 ppm", ".inf"), "budget: expected", 2),
    ("NaN gm", MINIMAL.replace("20 mA/V", ".nan mA/V"), "amplifier.gm", 4),
    (
        "reversed temperatures",
        MINIMAL + "temperature: [85 degC, -40 degC]\n",
        "the low end 85 degC is above the high end -40 degC",
        5,
    ),
    ("duplicate key", MINIMAL + "budget: 50 ppm\n", "duplicate key", 5),
    ("YAML alias", "a: &x 16 MHz\nfrequency: *x\nbudget: 1 ppm\n", "aliases are not supported", 2),
    (
        "alias bomb",
        'a: &a ["x","x","x","x","x","x","x","x","x"]\n'
        + "".join(
            f"{c}: &{c} [" + ",".join([f"*{chr(ord(c) - 1)}"] * 9) + "]\n" for c in "bcdefghi"
        ),
        "aliases are not supported",
        2,
    ),
    ("10k nested", "frequency: " + "[" * 10_000 + "]" * 10_000 + "\n", "nested more than", 1),
    ("not YAML", "frequency: [16 MHz\nbudget: {\n", "not valid YAML", None),
    ("over the size cap", "name: " + "x" * 300_000 + "\n", "larger than", None),
]


def _write(folder: Path, data: str | bytes) -> Path:
    path = folder / "bad_brief.yaml"
    path.write_bytes(data.encode("utf-8") if isinstance(data, str) else data)
    return path


@pytest.mark.parametrize(
    ("data", "words", "line"), [case[1:] for case in BAD_BRIEFS], ids=[c[0] for c in BAD_BRIEFS]
)
def test_load_brief_raises_one_placed_brief_error(
    corpus: Path, data: str | bytes, words: str, line: int | None
) -> None:
    path = _write(corpus, data)
    with bounded(), pytest.raises(BriefError) as caught:
        load_brief(path)
    message = str(caught.value)
    assert "\n" not in message and len(message) < 600
    assert message.startswith(str(path))  # names the file ...
    assert words in message
    if line is not None:  # ... and the line the problem is on
        assert caught.value.line == line
        assert message.startswith(f"{path}:{line}: ")


@pytest.mark.parametrize(
    ("data", "words", "line"), [case[1:] for case in BAD_BRIEFS], ids=[c[0] for c in BAD_BRIEFS]
)
def test_cli_exits_2_with_one_line(
    corpus: Path, run_cli: RunCli, data: str | bytes, words: str, line: int | None
) -> None:
    catalog = write_catalog(corpus, "parts.csv", GOOD_ROWS)
    path = _write(corpus, data)
    for command in (["rank"], ["analyze", "QN16-A"]):
        run = run_cli(*command, "--catalog", str(catalog), "--brief", str(path))
        assert run.code == 2
        assert run.out == ""
        (message,) = run.err.splitlines()
        assert message.startswith(f"picker: {path}") and words in message


def test_missing_optional_keys_take_stated_defaults(corpus: Path, run_cli: RunCli) -> None:
    path = _write(corpus, MINIMAL)
    brief = load_brief(path)
    # DESIGN.md §6 / picker.brief defaults: −40 … 85 °C and 10 years when not given.
    assert (brief.temp_min_c, brief.temp_max_c) == (-40.0, 85.0)
    assert brief.lifetime_s == pytest.approx(10 * 365.25 * 86400.0)
    for key in ("temperature", "lifetime", "board.stray_capacitance", "amplifier.pin_capacitance"):
        assert key in brief.defaulted
    assert "frequency" not in brief.defaulted and "budget" not in brief.defaulted
    catalog = write_catalog(corpus, "parts.csv", GOOD_ROWS)
    run = run_cli("analyze", "QN16-A", "--catalog", str(catalog), "--brief", str(path))
    assert run.code == 0
    # The part sheet says the stray and pin capacitance it used are defaults, not given.
    stray = next(line for line in run.out.splitlines() if "stray across the crystal" in line)
    pins = next(line for line in run.out.splitlines() if "pin capacitance (each)" in line)
    assert stray.split()[-1] == "default" and pins.split()[-1] == "default"
    given = _write(corpus, MINIMAL + "board:\n  stray_capacitance: 3 pF\n")
    run = run_cli("analyze", "QN16-A", "--catalog", str(catalog), "--brief", str(given))
    stray = next(line for line in run.out.splitlines() if "stray across the crystal" in line)
    assert stray.split()[-1] == "brief" and "3 pF" in stray


def test_language_tag_in_a_brief_runs_nothing(corpus: Path, run_cli: RunCli) -> None:
    marker = corpus.parent / "marker-from-brief"
    path = _write(corpus, MINIMAL + f"name: !!python/object/apply:os.system ['touch {marker}']\n")
    with bounded(), pytest.raises(BriefError):
        load_brief(path)
    catalog = write_catalog(corpus, "parts.csv", GOOD_ROWS)
    run = run_cli("rank", "--catalog", str(catalog), "--brief", str(path))
    assert run.code == 2
    assert not marker.exists()


def _endless(folder: Path) -> Path:
    path = folder / "endless.yaml"
    path.symlink_to("/dev/zero")
    return path


def test_brief_that_is_a_directory_missing_or_a_pipe(corpus: Path, run_cli: RunCli) -> None:
    catalog = write_catalog(corpus, "parts.csv", GOOD_ROWS)
    folder = corpus / "briefs"
    folder.mkdir()
    cases = [
        (folder, "is a directory"),
        (corpus / "nope.yaml", "No such file"),
        (make_fifo(corpus, "pipe.yaml"), "the brief is empty"),
        (_endless(corpus), "larger than"),
    ]
    for path, words in cases:
        with bounded(), pytest.raises(BriefError, match=words):
            load_brief(path)
        run = run_cli("rank", "--catalog", str(catalog), "--brief", str(path))
        assert run.code == 2 and str(path) in run.err and words in run.err


def test_minimal_brief_ranks(corpus: Path, run_cli: RunCli) -> None:
    """The control case: the corpus brief and catalog are fine, so failures above are real."""
    catalog = write_catalog(corpus, "parts.csv", GOOD_ROWS)
    run = run_cli("rank", "--catalog", str(catalog), "--brief", str(_write(corpus, MINIMAL)))
    assert run.code == 0 and "QN16-A" in run.out

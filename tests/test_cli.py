"""The command line, in-process: every command, formats, exit codes, messages.

Exit codes (DESIGN §6): 0 success, 1 a finding (nothing fits, lint problems), 2 bad usage or
unreadable input, one line on stderr and never a traceback.
"""

from __future__ import annotations

import csv
import io
import json
import sys
from pathlib import Path

import pytest

from picker import cli

CATALOG = """\
mpn,frequency,load_capacitance,tolerance,stability,temp_min,temp_max,esr,package,c0,c1,pinout
GOOD-1,16 MHz,8 pF,10 ppm,10 ppm,-40,85,60 ohm,3225,2 pF,5 fF,1-3
GOOD-2,16 MHz,8 pF,10 ppm,10 ppm,-40,85,40 ohm,3225,2 pF,5 fF,1-3
=EVIL,16 MHz,8 pF,10 ppm,10 ppm,-40,85,50 ohm,3225,2 pF,5 fF,1-3
HIGH-ESR,16 MHz,8 pF,10 ppm,10 ppm,-40,85,300 ohm,3225,2 pF,5 fF,1-3
NEW-CL,16 MHz,12 pF,10 ppm,10 ppm,-40,85,40 ohm,3225,2 pF,5 fF,1-3
"""

BRIEF = """\
name: CLI test circuit
frequency: 16 MHz
budget: 100 ppm
temperature: [-40 degC, 85 degC]
lifetime: 10 year
amplifier:
  gm: 10 mA/V
  pin_capacitance: 1 pF
  swing: 1 V
board:
  stray_capacitance: 2 pF
limits:
  min_margin: 5
"""


@pytest.fixture(autouse=True)
def _no_cache(monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setenv("PICKER_NO_CACHE", "1")
    monkeypatch.setenv("NO_COLOR", "1")


@pytest.fixture
def files(tmp_path: Path) -> dict[str, str]:
    catalog = tmp_path / "parts.csv"
    catalog.write_text(CATALOG, encoding="utf-8")
    brief = tmp_path / "brief.yaml"
    brief.write_text(BRIEF, encoding="utf-8")
    return {"catalog": str(catalog), "brief": str(brief), "dir": str(tmp_path)}


def run(capsys: pytest.CaptureFixture[str], *argv: str) -> tuple[int, str, str]:
    code = cli.main(list(argv))
    out, err = capsys.readouterr()
    assert "Traceback" not in err
    return code, out, err


def test_rank_table_on_the_demo_catalog(capsys: pytest.CaptureFixture[str]) -> None:
    code, out, _ = run(capsys, "rank")
    assert code == 0
    assert max(len(line) for line in out.splitlines()) <= 80
    assert " fit" in out
    assert "negative-resistance test" in out  # the caution


def test_rank_json_contract(capsys: pytest.CaptureFixture[str], files: dict[str, str]) -> None:
    code, out, _ = run(
        capsys, "rank", "--catalog", files["catalog"], "--brief", files["brief"], "--format", "json"
    )
    assert code == 0
    objects = json.loads(out)
    names = [o["mpn"] for o in objects]
    assert names.index("GOOD-2") < names.index("GOOD-1")  # same part, lower ESR
    assert all(o["status"] in ("fit", "marginal") for o in objects)
    assert "HIGH-ESR" not in {o["mpn"] for o in objects}  # ruled out: only with --all
    first = objects[0]
    assert (
        isinstance(first["negative_resistance_ohm"], float) and first["negative_resistance_ohm"] < 0
    )
    assert isinstance(first["error_ppm"], dict) and "total" in first["error_ppm"]
    assert isinstance(first["external_caps_f"], list) and len(first["external_caps_f"]) == 2
    assert first["amplifier_form"] == "gm" and first["drive_setting"] is None


def test_rank_top_and_all(capsys: pytest.CaptureFixture[str], files: dict[str, str]) -> None:
    base = ("rank", "--catalog", files["catalog"], "--brief", files["brief"], "--format", "json")
    _, out, _ = run(capsys, *base, "--top", "2")
    assert len(json.loads(out)) == 2
    _, out, _ = run(capsys, *base, "--all")
    objects = json.loads(out)
    assert len(objects) == 5
    high = next(o for o in objects if o["mpn"] == "HIGH-ESR")
    assert high["status"] == "ruled_out" and high["reasons"][0].startswith("margin ")
    assert objects[-1]["status"] == "ruled_out"


def test_rank_csv_is_formula_safe(
    capsys: pytest.CaptureFixture[str], files: dict[str, str]
) -> None:
    code, out, _ = run(
        capsys, "rank", "--catalog", files["catalog"], "--brief", files["brief"], "--format", "csv"
    )
    assert code == 0
    rows = list(csv.DictReader(io.StringIO(out)))
    evil = next(r for r in rows if "EVIL" in r["mpn"])
    assert evil["mpn"] == "'=EVIL"
    assert float(evil["negative_resistance_ohm"]) < 0


def test_nothing_fits_exits_1(capsys: pytest.CaptureFixture[str], files: dict[str, str]) -> None:
    tight = Path(files["dir"]) / "tight.yaml"
    tight.write_text(BRIEF.replace("budget: 100 ppm", "budget: 1 ppm"), encoding="utf-8")
    code, _, err = run(capsys, "rank", "--catalog", files["catalog"], "--brief", str(tight))
    assert code == 1
    assert "no part fits" in err


def test_analyze_json_and_table(capsys: pytest.CaptureFixture[str], files: dict[str, str]) -> None:
    base = ("--catalog", files["catalog"], "--brief", files["brief"])
    code, out, _ = run(capsys, "analyze", "GOOD-1", *base, "--format", "json")
    assert code == 0
    obj = json.loads(out)
    assert obj["mpn"] == "GOOD-1" and obj["status"] == "fit"
    code, out, _ = run(capsys, "analyze", "GOOD-1", *base)
    assert code == 0 and "Bench check" in out and "from" in out
    assert max(len(line) for line in out.splitlines()) <= 80


def test_analyze_fuzzy_match_is_said_on_stderr(
    capsys: pytest.CaptureFixture[str], files: dict[str, str]
) -> None:
    code, out, err = run(
        capsys,
        "analyze",
        "HIGH-ES",
        "--catalog",
        files["catalog"],
        "--brief",
        files["brief"],
        "--format",
        "json",
    )
    assert code == 0
    assert json.loads(out)["mpn"] == "HIGH-ESR"
    assert "using the closest match HIGH-ESR" in err


def test_analyze_unknown_part_exits_2_with_candidates(
    capsys: pytest.CaptureFixture[str], files: dict[str, str]
) -> None:
    code, out, err = run(capsys, "analyze", "GOOD", "--catalog", files["catalog"])
    assert code == 2 and out == ""
    assert err.count("\n") == 1
    assert "closest: GOOD-1, GOOD-2" in err or "closest: GOOD-2, GOOD-1" in err


def test_alternates_json_and_csv(capsys: pytest.CaptureFixture[str], files: dict[str, str]) -> None:
    code, out, _ = run(
        capsys, "alternates", "GOOD-1", "--catalog", files["catalog"], "--format", "json"
    )
    assert code == 0
    objects = json.loads(out)
    fits = {o["mpn"]: o["fit"] for o in objects}
    assert fits["NEW-CL"] == "drop_in_new_caps"
    assert all(isinstance(o["differences"], list) for o in objects)
    assert "status" not in objects[0]  # no brief: data-sheet comparison only
    code, out, _ = run(
        capsys,
        "alternates",
        "GOOD-1",
        "--catalog",
        files["catalog"],
        "--brief",
        files["brief"],
        "--format",
        "json",
    )
    with_brief = json.loads(out)
    assert "negative_resistance_margin" in with_brief[0] and "status" in with_brief[0]
    code, out, _ = run(
        capsys, "alternates", "GOOD-1", "--catalog", files["catalog"], "--format", "csv"
    )
    rows = list(csv.DictReader(io.StringIO(out)))
    assert any(r["mpn"] == "'=EVIL" for r in rows)


def test_lint_exit_codes_and_json(
    capsys: pytest.CaptureFixture[str], files: dict[str, str]
) -> None:
    code, _, _ = run(capsys, "lint", files["catalog"])
    assert code == 0
    bad = Path(files["dir"]) / "bad.csv"
    bad.write_text(
        CATALOG + "BROKEN,16 MHz,abc,10 ppm,10 ppm,-40,85,60 ohm,3225,2 pF,5 fF,1-3\n",
        encoding="utf-8",
    )
    code, out, _ = run(capsys, "lint", str(bad), "--format", "json")
    assert code == 1
    report = json.loads(out)
    assert report["rows_loaded"] == 5
    assert report["files"][0]["rows_read"] == 6
    problem = report["problems"][0]
    assert set(problem) == {"path", "line", "field", "raw", "message", "severity"}
    assert (problem["line"], problem["field"], problem["raw"], problem["severity"]) == (
        7,
        "load_capacitance",
        "abc",
        "error",
    )
    code, _, err = run(capsys, "lint", str(Path(files["dir"]) / "missing.csv"))
    assert code == 2 and err.count("\n") == 1


def test_presets(capsys: pytest.CaptureFixture[str]) -> None:
    code, out, _ = run(capsys, "presets")
    assert code == 0 and "usb" in out.lower()
    code, out, _ = run(capsys, "presets", "--format", "json")
    assert any("2500" in row["budget"] for row in json.loads(out))


def test_preset_option_sets_the_budget(
    capsys: pytest.CaptureFixture[str], files: dict[str, str]
) -> None:
    code, out, _ = run(
        capsys,
        "rank",
        "--catalog",
        files["catalog"],
        "--brief",
        files["brief"],
        "--preset",
        "usb_fs",
        "--format",
        "json",
    )
    assert code == 0
    assert json.loads(out)[0]["budget_ppm"] == pytest.approx(2500.0)
    code, _, err = run(capsys, "rank", "--preset", "no_such_thing")
    assert code == 2 and "no_such_thing" in err


@pytest.mark.parametrize(
    "argv",
    [
        ("rank", "--catalog", "/nonexistent/parts.csv"),
        ("rank", "--brief", "/nonexistent/brief.yaml"),
        ("analyze", "NOPE-XYZ-123"),
    ],
)
def test_bad_input_is_one_line_exit_2(
    capsys: pytest.CaptureFixture[str], argv: tuple[str, ...]
) -> None:
    code, _, err = run(capsys, *argv)
    assert code == 2
    assert err.startswith("picker: ") and err.count("\n") == 1


def test_bad_brief_names_the_key(capsys: pytest.CaptureFixture[str], files: dict[str, str]) -> None:
    broken = Path(files["dir"]) / "broken.yaml"
    broken.write_text(BRIEF.replace("gm: 10 mA/V", "gm: lots"), encoding="utf-8")
    code, _, err = run(capsys, "rank", "--catalog", files["catalog"], "--brief", str(broken))
    assert code == 2 and "amplifier.gm" in err and err.count("\n") == 1


def test_usage_errors_exit_2(capsys: pytest.CaptureFixture[str]) -> None:
    assert cli.main(["rank", "--top", "zero"]) == 2
    assert cli.main(["frobnicate"]) == 2
    assert cli.main(["rank", "--format", "xml"]) == 2
    capsys.readouterr()


def test_help_carries_the_caution(capsys: pytest.CaptureFixture[str]) -> None:
    assert cli.main(["--help"]) == 0
    out = capsys.readouterr().out
    assert "negative-resistance test" in out and "Safety-critical" in out


def test_unexpected_error_is_one_line_unless_debug(
    capsys: pytest.CaptureFixture[str], monkeypatch: pytest.MonkeyPatch, files: dict[str, str]
) -> None:
    import picker.rank

    def boom(*args: object, **kwargs: object) -> None:
        raise RuntimeError("something broke\ninside")

    monkeypatch.setattr(picker.rank, "rank_parts", boom)
    code = cli.main(["rank", "--catalog", files["catalog"]])
    err = capsys.readouterr().err
    assert code == 2 and "Traceback" not in err
    assert "rerun with --debug" in err and err.count("\n") == 1
    code = cli.main(["rank", "--catalog", files["catalog"], "--debug"])
    assert "Traceback" in capsys.readouterr().err


def test_no_command_without_the_ui_prints_a_summary(
    capsys: pytest.CaptureFixture[str], monkeypatch: pytest.MonkeyPatch, files: dict[str, str]
) -> None:
    monkeypatch.setitem(sys.modules, "picker.tui.app", None)  # import now fails
    code, out, err = run(capsys, "--catalog", files["catalog"])
    assert code == 0
    assert "5 parts" in out and "not available" in err


def test_python_dash_m_runs(files: dict[str, str]) -> None:
    import subprocess

    done = subprocess.run(
        [sys.executable, "-m", "picker", "presets"],
        capture_output=True,
        text=True,
        env={"PICKER_NO_CACHE": "1", "PATH": ""},
    )
    assert done.returncode == 0 and done.stdout


@pytest.mark.parametrize(
    "argv",
    [("presets",), ("--help",), ("rank", "--all", "--top", "30"), ("alternates", "OR00001A")],
)
def test_text_output_fits_80_columns(
    capsys: pytest.CaptureFixture[str], argv: tuple[str, ...]
) -> None:
    cli.main(list(argv))
    out = capsys.readouterr().out
    assert out
    assert max(len(line) for line in out.splitlines()) <= 80


def test_several_references_give_one_json_document_and_one_csv_header(
    capsys: pytest.CaptureFixture[str], files: dict[str, str]
) -> None:
    _, out, _ = run(
        capsys, "alternates", "GOOD-1", "GOOD-2", "--catalog", files["catalog"], "--format", "json"
    )
    assert set(json.loads(out)) == {"GOOD-1", "GOOD-2"}
    _, out, _ = run(
        capsys, "alternates", "GOOD-1", "GOOD-2", "--catalog", files["catalog"], "--format", "csv"
    )
    assert out.count("reference,rank,mpn") == 1
    rows = list(csv.DictReader(io.StringIO(out)))
    assert {r["reference"] for r in rows} == {"GOOD-1", "GOOD-2"}
    _, out, _ = run(
        capsys, "analyze", "GOOD-1", "GOOD-2", "--catalog", files["catalog"], "--format", "json"
    )
    assert [o["mpn"] for o in json.loads(out)] == ["GOOD-1", "GOOD-2"]

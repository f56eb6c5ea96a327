"""The sandwich pairs as the CLI prints them: the table, JSON rows and a clean error."""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

import pytest
from click.testing import CliRunner

from selector.cli import cli

HATCH = Path(__file__).parents[2] / "examples" / "walkway-hatch.toml"
MODES = {"stiffness", "face-yield", "face-wrinkling", "core-shear"}


def _rank(*args: str):
    return CliRunner().invoke(cli, ["rank", str(HATCH), *args], catch_exceptions=False)


def test_json_rows_are_pairs_with_both_thicknesses():
    result = _rank("--format", "json", "--top", "5")
    assert result.exit_code == 0, result.output
    data = json.loads(result.output)
    rows = data["pairs"]
    assert 1 <= len(rows) <= 5
    first = rows[0]
    assert {"face", "core", "dimensions", "mass", "cost", "co2", "utilisation", "governing"} <= set(first)
    assert set(first["dimensions"]) == {"t_face", "t_core"}
    assert first["dimensions"]["t_face"]["unit"] == "mm" and first["dimensions"]["t_face"]["value"] > 0
    assert set(first["utilisation"]) == MODES and first["governing"] in MODES
    assert first["mass"]["unit"] == "kg"
    assert [r["mass"]["value"] for r in rows] == sorted(r["mass"]["value"] for r in rows)
    assert data["solid"]["mass"]["value"] > first["mass"]["value"]
    assert "Preliminary selection only" in data["caution"]
    assert data["assumptions"]


def test_table_shows_pairs_solid_assumptions_and_caution():
    result = _rank("--top", "3", "--wide")
    assert result.exit_code == 0, result.output
    text = result.output
    header, units = next(
        (a, b) for a, b in zip(text.splitlines(), text.splitlines()[1:], strict=False) if a.startswith("rank")
    )
    assert "t_face" in header and "t_core" in header and "deflection_shear" in header
    assert units.split()[:3] == ["mm", "mm", "mm"] and "kg" in units.split()
    assert "best solid part for the same spec" in text
    assert "assumes: antiplane core" in text
    assert "CAUTION: Preliminary selection only" in text


def test_csv_has_one_column_per_mode():
    result = _rank("--format", "csv")
    header = result.output.splitlines()[0].split(",")
    assert {f"utilisation_{m}" for m in MODES} <= set(header)


def test_a_bad_sandwich_key_is_one_error_line(tmp_path):
    spec = tmp_path / "bad.toml"
    spec.write_text(HATCH.read_text(encoding="utf-8").replace('"metal", "composite"', '"metall"'))
    done = subprocess.run(
        [sys.executable, "-m", "selector", "rank", str(spec)], capture_output=True, text=True, check=False
    )
    assert done.returncode == 2
    assert "sandwich.faces[0]" in done.stderr and "Traceback" not in done.stderr
    assert [line for line in done.stderr.splitlines() if line.strip()] == [done.stderr.strip()]
    assert done.stderr.startswith("error: ")


@pytest.mark.parametrize("units", ["us"])
def test_us_units_give_inches(units):
    data = json.loads(_rank("--format", "json", "--units", units, "--top", "1").output)
    assert data["pairs"][0]["dimensions"]["t_core"]["unit"] == "in"

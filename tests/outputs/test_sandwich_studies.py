"""Studies and exports of a sandwich spec: trade-offs over the pairs, a clean --robust refusal,
and the pairs in every file format."""

from __future__ import annotations

import json
from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest
from click.testing import CliRunner

from selector.api import run_spec
from selector.cli import cli
from selector.mechanics.sandwich import MODES
from selector.outputs.export import write_selection
from selector.outputs.sandwich_tables import render_sandwich
from selector.pipeline.selection import CAUTION, studies

HATCH = Path(__file__).parents[2] / "examples" / "walkway-hatch.toml"


@pytest.fixture(scope="module")
def hatch():
    return run_spec(HATCH)


def _rank(*args: str):
    return CliRunner().invoke(cli, ["rank", str(HATCH), *args], catch_exceptions=False)


def _dominated(points: np.ndarray) -> np.ndarray:
    """Brute force: a point is dominated when another is no worse in both and better in one.

    The definition of Pareto optimality (common practice, no source), checked pair by pair.
    """
    worse_eq = (points[None, :, :] <= points[:, None, :]).all(axis=2)
    better = (points[None, :, :] < points[:, None, :]).any(axis=2)
    return (worse_eq & better).any(axis=1)


def test_tradeoff_front_is_over_the_pairs(hatch):
    study = studies(hatch, tradeoff="cost").tradeoff
    pairs = hatch.sandwich.feasible
    values = pairs[["mass", "cost"]].to_numpy(dtype=float)
    expected = set(pairs["face"][~_dominated(values)] + "+" + pairs["core"][~_dominated(values)])
    assert set(study.front["id"]) == expected and len(expected) >= 2
    assert all(" on " in name for name in study.front["name"])
    assert "minimise mass" in study.note and len(study.points) == len(pairs)


def test_exchange_constant_ranks_the_pairs_by_penalty(hatch):
    study = studies(hatch, tradeoff="cost", exchange="40 USD/kg").tradeoff
    pairs = hatch.sandwich.feasible
    # Z = cost + α·mass with α = 40 USD/kg, worked directly on the pairs table
    z = pairs["cost"] + 40.0 * pairs["mass"]
    best = pairs.loc[z.idxmin()]
    assert study.second.iloc[0]["id"] == f"{best['face']}+{best['core']}"
    assert study.second.iloc[0]["penalty"] == pytest.approx(z.min(), rel=1e-9)


def test_cli_tradeoff_prints_pairs_and_what_it_assumes():
    result = _rank("--tradeoff", "cost", "--wide")
    assert result.exit_code == 0, result.output
    assert "Pareto front (mass vs cost; all minimised)" in result.output
    assert "note: each pair keeps the thicknesses that minimise mass" in result.output
    assert "+aramid-honeycomb" in result.output or "+al-honeycomb" in result.output
    data = json.loads(_rank("--tradeoff", "cost", "--format", "json").output)
    assert data["tradeoff"]["note"].startswith("each pair keeps")
    assert all("+" in row["id"] for row in data["tradeoff"]["front"])
    assert data["caution"] == CAUTION


def test_robust_on_a_sandwich_is_one_clean_error():
    result = CliRunner().invoke(cli, ["rank", str(HATCH), "--robust", "50"])
    assert result.exit_code == 2
    lines = [line for line in result.output.splitlines() if line.strip()]
    assert len(lines) == 1 and lines[0].startswith("error: --robust: ")
    assert "sandwich pairs" in lines[0] and "--conservative" in lines[0]


def test_xlsx_export_holds_the_pairs_first(tmp_path, hatch):
    from openpyxl import load_workbook

    out = tmp_path / "pairs.xlsx"
    result = _rank("-o", str(out))
    assert result.exit_code == 0, result.output
    book = load_workbook(out)
    assert book.sheetnames[:2] == ["pairs", "left out"] and "shortlist" in book.sheetnames
    rows = list(book["pairs"].iter_rows(values_only=True))
    header, first = rows[0], dict(zip(rows[0], rows[1], strict=True))
    assert len(rows) - 1 == len(hatch.sandwich.feasible)
    assert {f"utilisation_{m}" for m in MODES} <= set(header)
    best = hatch.sandwich.feasible.iloc[0]
    assert first["face"] == best["face"] and first["core"] == best["core"]
    assert first["t_face [mm]"] == pytest.approx(best["t_face"] * 1e3, rel=1e-9)
    assert first["t_core [mm]"] == pytest.approx(best["t_core"] * 1e3, rel=1e-9)
    assert first["caution"] == CAUTION
    spec = [r[2] for r in book["spec"].iter_rows(values_only=True) if r[1] == "sandwich"]
    assert any("antiplane core" in a for a in spec)
    left_out = list(book["left out"].iter_rows(values_only=True))
    assert len(left_out) - 1 == len(hatch.sandwich.excluded)


@pytest.mark.parametrize("suffix", [".csv", ".json", ".md"])
def test_text_exports_of_the_api_write_the_pairs(tmp_path, hatch, suffix):
    out = write_selection(hatch, tmp_path / f"pairs{suffix}")
    text = out.read_text(encoding="utf-8")
    best = hatch.sandwich.feasible.iloc[0]
    assert best["core"] in text or best["core_name"] in text
    assert "t_face" in text
    assert "Preliminary selection only" in text


def test_pairs_csv_neutralises_formula_like_names(hatch):
    pairs = hatch.sandwich.pairs.copy()
    pairs.loc[pairs["rank"] == 1, "face_name"] = "=HYPERLINK(1)"
    hostile = replace(hatch, sandwich=replace(hatch.sandwich, pairs=pairs))
    text = render_sandwich(hostile, "csv", top=1)
    assert "'=HYPERLINK(1)" in text and "\n=HYPERLINK" not in text and ",=HYPERLINK" not in text
    assert text.splitlines()[0].split(",")[-1] == "caution"

"""--top, --format and -o reach every table the trade-off and robustness studies print.

The behaviour checked is our own design, stated in the README (common practice, no source).
"""

from __future__ import annotations

import io
import json
from pathlib import Path

import pandas as pd
from click.testing import CliRunner

from selector.cli import cli

BOOM = str(Path(__file__).parents[1] / "examples" / "camera-dolly-boom.toml")
ROBUST = ("rank", BOOM, "--robust", "200", "--seed", "7")
TRADEOFF = ("rank", BOOM, "--tradeoff", "cost")


def _run(*args: str):
    result = CliRunner().invoke(cli, list(args))
    assert result.exit_code == 0, result.output
    return result


def test_top_limits_the_robustness_odds():
    doc = json.loads(_run(*ROBUST, "--top", "3", "--format", "json").stdout)
    assert len(doc["robustness"]["candidates"]) == 3
    text = _run(*ROBUST, "--top", "3", "--wide").stdout
    table = text.split("\n\n")[1].splitlines()
    assert len(table) == 2 + 3  # header, rule, three candidates (no units line: the odds have none)


def test_top_limits_both_trade_off_tables():
    doc = json.loads(_run(*TRADEOFF, "--top", "2", "--format", "json").stdout)
    assert len(doc["tradeoff"]["front"]) == 2 and len(doc["tradeoff"]["ranges"]) == 2
    penalty = json.loads(_run(*TRADEOFF, "--exchange", "40 USD/kg", "--top", "1", "--format", "json").stdout)
    assert len(penalty["tradeoff"]["penalty"]) == 1


def test_csv_output_writes_one_file_per_table(tmp_path):
    out = tmp_path / "study.csv"
    result = _run(*ROBUST, *TRADEOFF[2:], "-o", str(out))
    names = ["study.csv", "study-ranges.csv", "study-robustness.csv", "study-sensitivity.csv"]
    assert sorted(p.name for p in tmp_path.iterdir()) == sorted(names)
    assert all(f"wrote {tmp_path / n}" in result.stderr for n in names)
    front = pd.read_csv(out)
    assert "mass [kg]" in front.columns and front["caution"].str.startswith("Preliminary").all()
    odds = pd.read_csv(tmp_path / "study-robustness.csv")
    assert {"id", "p_best"} <= set(odds.columns)


def test_csv_on_stdout_is_one_valid_table_and_names_the_others():
    result = _run(*ROBUST, "--format", "csv")
    odds = pd.read_csv(io.StringIO(result.stdout))
    assert "p_best" in odds.columns
    assert "also: sensitivity" in result.stderr


def test_a_workbook_gets_a_sheet_per_study_table(tmp_path):
    from openpyxl import load_workbook

    out = tmp_path / "study.xlsx"
    _run(*ROBUST, "--top", "4", "-o", str(out))
    book = load_workbook(out)
    assert {"shortlist", "robustness", "sensitivity", "spec"} <= set(book.sheetnames)
    assert book["robustness"].max_row == 1 + 4


def test_markdown_and_json_files_carry_every_table(tmp_path):
    md = tmp_path / "study.md"
    _run(*ROBUST, "-o", str(md))
    text = md.read_text(encoding="utf-8")
    assert "Sensitivity of the leader" in text and "| p_best" in text.replace("|p_best", "| p_best")
    js = tmp_path / "study.json"
    _run(*ROBUST, *TRADEOFF[2:], "-o", str(js))
    doc = json.loads(js.read_text(encoding="utf-8"))
    assert {"tradeoff", "robustness", "caution"} <= set(doc)
    assert "sensitivity" in doc["robustness"]

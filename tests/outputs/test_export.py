"""Exports of the shortlist: CSV, JSON, XLSX and Markdown read back, atomic writes, refused paths."""

from __future__ import annotations

import io
import json
import os
from pathlib import Path

import numpy as np
import pandas as pd
import pytest
from click.testing import CliRunner

from selector.api import run_spec
from selector.cli import cli
from selector.errors import OutputError
from selector.outputs import export

EXAMPLES = Path(__file__).parents[2] / "examples"
SPEC = EXAMPLES / "camera-dolly-boom.toml"
# The international pound and inch, exact by definition (1959 international yard and pound agreement;
# from memory).
POUND = 0.45359237  # kg per pound
INCH = 0.0254  # m per inch


@pytest.fixture(scope="module")
def selection():
    return run_spec(SPEC)


@pytest.fixture(scope="module")
def unsized():
    from selector.inputs.spec import spec_from_dict
    from selector.pipeline.selection import select

    spec = spec_from_dict(
        {
            "title": "Unsized beam",
            "part": {"function": "beam", "support": "cantilever", "load": "end"},
            "constraint": [{"type": "stiffness"}],
        }
    )
    return select(spec)


def _feasible(table: pd.DataFrame) -> pd.Series:
    return table["feasible"].fillna(False).astype(bool)


def _check_against_selection(frame: pd.DataFrame, selection, units: str = "si") -> None:
    """The exported shortlist matches the Selection's own values, converted to the units in the headers."""
    short = selection.shortlist
    mass_factor, length_factor = (1.0, 1e3) if units == "si" else (1 / POUND, 1 / INCH)
    mass_unit, length_unit = ("kg", "mm") if units == "si" else ("lb", "in")
    assert list(frame["id"]) == list(short["id"])
    assert list(frame["name"]) == list(short["name"])
    assert list(frame["rank"]) == [int(r) for r in short["rank"]]
    ok = _feasible(short).to_numpy()
    np.testing.assert_allclose(
        frame[f"mass [{mass_unit}]"].to_numpy(float)[ok],
        short["mass"].to_numpy(float)[ok] * mass_factor,
        rtol=1e-9,
    )
    np.testing.assert_allclose(
        frame["cost [USD]"].to_numpy(float)[ok], short["cost"].to_numpy(float)[ok], rtol=1e-9
    )
    for dim in ("d", "t"):
        expected = [d[dim] * length_factor for d in short["dimensions"][ok]]
        np.testing.assert_allclose(frame[f"{dim} [{length_unit}]"].to_numpy(float)[ok], expected, rtol=1e-9)
    unit = next(c for c in frame.columns if c.startswith("index ["))
    # the index in published chart units: density in Mg/m³ (SI) or lb/in³ (1 lb/in³ = 27679.90 kg/m³,
    # 1 Msi = 6.894757 GPa; NIST SP 811)
    expected_unit, factor = {
        "mm": ("index [GPa^(1/2)/(Mg/m³)]", 1e3),
        "in": ("index [Msi^(1/2)/(lb/in³)]", (1 / 6.894757) ** 0.5 * 27679.90),
    }[length_unit]
    assert unit == expected_unit
    np.testing.assert_allclose(
        frame[unit].to_numpy(float), short["index"].to_numpy(float) * factor, rtol=1e-6
    )
    assert list(frame["governing"]) == list(short["governing"])


def test_csv_read_back_equals_the_shortlist(selection, tmp_path):
    path = export.write_selection(selection, tmp_path / "shortlist.csv")
    frame = pd.read_csv(path)
    assert len(frame) == len(selection.shortlist)
    _check_against_selection(frame, selection)
    for column in ("mass [kg]", "co2 [kg CO2e]", "deflection [mm]", "stress [MPa]", "cost [USD]"):
        assert column in frame.columns


def test_csv_in_us_units_converts_and_says_so(selection, tmp_path):
    path = export.write_selection(selection, tmp_path / "shortlist.csv", units="us")
    frame = pd.read_csv(path)
    assert "mass [lb]" in frame.columns and "stress [ksi]" in frame.columns
    _check_against_selection(frame, selection, "us")


def test_json_read_back_every_number_carries_its_unit(selection, tmp_path):
    path = export.write_selection(selection, tmp_path / "shortlist.json")
    records = json.loads(path.read_text(encoding="utf-8"))
    frame = pd.read_json(io.StringIO(path.read_text(encoding="utf-8")), orient="records")
    assert len(records) == len(frame) == len(selection.shortlist)
    short = selection.shortlist
    for record, (_, row) in zip(records, short.iterrows(), strict=True):
        assert record["id"] == row["id"]
        assert record["mass"]["unit"] == "kg"
        assert record["mass"]["value"] == pytest.approx(row["mass"], rel=1e-12)
        assert record["dimensions"]["d"] == {
            "value": pytest.approx(row["dimensions"]["d"] * 1e3),
            "unit": "mm",
        }
        assert record["index"]["unit"] == "GPa^(1/2)/(Mg/m³)"
        assert record["index"]["value"] == pytest.approx(row["index"] * 1e3, rel=1e-12)
        # Apart from the rank (a count) and the utilisation ratios (demand / limit, no unit),
        # no bare number appears: each is a {"value", "unit"} pair.
        for key, value in record.items():
            if isinstance(value, int | float) and not isinstance(value, bool):
                assert key == "rank", key
            if isinstance(value, dict) and key not in ("dimensions", "utilisation"):
                assert set(value) == {"value", "unit"}, key
        assert record["utilisation"] == pytest.approx(row["utilisation"])


def test_markdown_table_has_units_and_every_candidate(selection, tmp_path):
    path = export.write_selection(selection, tmp_path / "shortlist.md")
    text = path.read_text(encoding="utf-8")
    table = [line for line in text.splitlines() if line.startswith("|")]
    header = [c.strip() for c in table[0].strip("|").split("|")]
    assert "mass [kg]" in header and "cost [USD]" in header
    assert table[1].startswith("|---")
    assert len(table) - 2 == len(selection.shortlist)
    assert selection.shortlist["name"].iat[0] in table[2]
    assert selection.caution in text


def test_xlsx_sheets_read_back(selection, tmp_path):
    path = export.write_xlsx(selection, tmp_path / "shortlist.xlsx", "si")
    sheets = pd.read_excel(path, sheet_name=None, engine="openpyxl")
    assert list(sheets) == ["shortlist", "rejected", "sized parts", "spec"]
    shortlist = sheets["shortlist"]
    _check_against_selection(shortlist, selection)
    util = [u["strength"] for u in selection.shortlist["utilisation"]]
    np.testing.assert_allclose(shortlist["utilisation_strength"], util, rtol=1e-12)
    rejected = sheets["rejected"]
    assert list(rejected["id"]) == list(selection.rejected["id"])
    assert list(rejected["reasons"]) == ["; ".join(r) for r in selection.rejected["reasons"]]
    parts = sheets["sized parts"]
    assert list(parts["id"]) == list(selection.shortlist["id"])
    assert {"d [mm]", "t [mm]", "mass [kg]", "utilisation_stiffness", "governing"} <= set(parts.columns)
    spec = sheets["spec"]
    values = dict(zip(spec["group"] + "." + spec["field"].fillna(""), spec["value"], strict=True))
    assert values["spec.title"] == "Camera dolly boom"
    assert values["part.force"] == "120 N"
    assert values["constraint[1].safety_factor"] == 1.5
    assert values["caution.preliminary selection"] == selection.caution
    assert any(g == "assumption" for g in spec["group"])


def test_xlsx_stores_numbers_as_numbers_with_a_frozen_header(selection, tmp_path):
    from openpyxl import load_workbook

    path = export.write_xlsx(selection, tmp_path / "shortlist.xlsx", "si")
    book = load_workbook(path)
    sheet = book["shortlist"]
    header = [c.value for c in sheet[1]]
    mass = header.index("mass [kg]") + 1
    rank = header.index("rank") + 1
    assert sheet.cell(2, mass).data_type == "n" and isinstance(sheet.cell(2, mass).value, float)
    assert sheet.cell(2, rank).value == 1
    for name in book.sheetnames:
        assert book[name].freeze_panes == "A2"
        assert book[name]["A1"].font.b
    name_width = sheet.column_dimensions["C"].width
    assert header[2] == "name" and 30 <= name_width <= 70
    assert book["spec"]["B1"].value == "field"


def test_xlsx_of_an_unsized_selection_says_why(unsized, tmp_path):
    path = export.write_xlsx(unsized, tmp_path / "u.xlsx", "si")
    sheets = pd.read_excel(path, sheet_name=None, engine="openpyxl")
    assert "mass [kg]" not in sheets["shortlist"].columns
    assert "needs" in sheets["sized parts"]["note"].iat[0]
    assert len(sheets["shortlist"]) == len(unsized.shortlist)


def test_rank_writes_xlsx_end_to_end(tmp_path):
    out = tmp_path / "shortlist.xlsx"
    result = CliRunner().invoke(cli, ["rank", str(SPEC), "-o", str(out)], catch_exceptions=False)
    assert result.exit_code == 0, result.output
    frame = pd.read_excel(out, sheet_name="shortlist", engine="openpyxl")
    _check_against_selection(frame, run_spec(SPEC))


def _leftovers(folder: Path, name: str) -> list[Path]:
    return [p for p in folder.iterdir() if p.name != name]


def test_interrupted_replace_leaves_the_old_file(selection, tmp_path, monkeypatch):
    path = tmp_path / "shortlist.xlsx"
    path.write_bytes(b"previous contents")

    def fail(*args, **kwargs):
        raise OSError(28, "No space left on device")

    monkeypatch.setattr(os, "replace", fail)
    with pytest.raises(OutputError, match="cannot be written"):
        export.write_xlsx(selection, path, "si")
    assert path.read_bytes() == b"previous contents"
    assert _leftovers(tmp_path, path.name) == []


def test_write_interrupted_mid_way_leaves_the_old_file(tmp_path, break_writes):
    path = tmp_path / "shortlist.csv"
    path.write_bytes(b"old,csv\n")
    break_writes(KeyboardInterrupt())  # half of the data written, then the user interrupts
    with pytest.raises(KeyboardInterrupt):
        export.write_text_atomic(path, "rank,id\n1,new\n" * 100)
    assert path.read_bytes() == b"old,csv\n"
    assert _leftovers(tmp_path, path.name) == []


def test_unwritable_folder_gives_one_clear_error(selection, tmp_path, monkeypatch):
    import tempfile

    def refuse(*args, **kwargs):
        raise PermissionError(13, "Permission denied")

    monkeypatch.setattr(tempfile, "mkstemp", refuse)
    with pytest.raises(OutputError, match=r"cannot write in .*Permission denied"):
        export.write_selection(selection, tmp_path / "s.csv")


def test_missing_folder_is_refused_before_writing(selection, tmp_path):
    with pytest.raises(OutputError, match="does not exist"):
        export.write_selection(selection, tmp_path / "missing" / "s.xlsx")
    assert not (tmp_path / "missing").exists()


def test_writing_over_an_input_is_refused(selection, tmp_path):
    spec = tmp_path / "spec.csv"
    spec.write_bytes(b"keep me")
    with pytest.raises(OutputError, match="refusing to write over an input file"):
        export.write_selection(selection, spec, protect=[spec])
    with pytest.raises(OutputError, match="refusing"):
        export.write_xlsx(selection, tmp_path / "in.xlsx", "si", protect=[tmp_path / "in.xlsx"])
    assert spec.read_bytes() == b"keep me"


def test_cli_refuses_to_write_over_the_spec(tmp_path):
    spec = tmp_path / "boom.toml"
    spec.write_text(SPEC.read_text(encoding="utf-8"), encoding="utf-8")
    before = spec.read_bytes()
    done = CliRunner().invoke(cli, ["rank", str(spec), "-o", str(spec)])
    assert isinstance(done.exception, SystemExit)
    assert done.exit_code == 2
    assert done.stderr.startswith("error:") and "refusing" in done.stderr
    assert "Traceback" not in done.stderr
    assert spec.read_bytes() == before


def test_cli_missing_folder_for_xlsx_is_one_line(tmp_path):
    done = CliRunner().invoke(cli, ["rank", str(SPEC), "-o", str(tmp_path / "no" / "s.xlsx")])
    assert isinstance(done.exception, SystemExit)
    assert done.exit_code == 2
    assert done.stderr.startswith("error:") and "does not exist" in done.stderr
    assert "Traceback" not in done.stderr
    assert len(done.stderr.strip().splitlines()) == 1

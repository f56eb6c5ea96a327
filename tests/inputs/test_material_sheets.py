"""Materials tables from .xlsx workbooks and .parquet files (selector.inputs.material_sheets).

Every file here is written for the test in tmp_path (openpyxl for workbooks, fastparquet
for Parquet) and read back through the public loaders. The reference for the values is
the same table read from CSV, whose unit conversions tests/inputs/test_materials.py
checks against the exact defining factors (NIST Special Publication 811).
"""

from __future__ import annotations

import csv
import subprocess
import sys
import zipfile
from pathlib import Path

import fastparquet
import numpy as np
import openpyxl
import pandas as pd
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from selector.errors import DataFileError
from selector.inputs.material_headers import column_letter
from selector.inputs.materials import check_materials_file, load_materials, read_materials_file
from selector.inputs.properties import FAMILIES

DATA = Path(__file__).parents[1] / "data"
GOOD_US = DATA / "good_us.csv"


def csv_rows(path: Path) -> list[list[str]]:
    with path.open(encoding="utf-8", newline="") as handle:
        return list(csv.reader(handle))


def typed(cell: str) -> object:
    """A CSV cell as a spreadsheet would hold it: a number where it reads as one."""
    try:
        return float(cell)
    except ValueError:
        return cell


def write_xlsx(path: Path, rows: list[list[object]], title: str = "Sheet1", extra: str | None = None) -> Path:
    book = openpyxl.Workbook()
    sheet = book.active
    sheet.title = title
    for row in rows:
        sheet.append(row)
    if extra:
        book.create_sheet(extra)
    book.save(path)
    return path


def messages(path: str | Path) -> list[str]:
    return [str(p) for p in check_materials_file(path)]


# A clean one-class table in stored units; tests change one thing. Approximate cast-aluminium
# values from memory of common handbook data, used only as reader input.
HEADER = ["id", "family", "name", "rho [kg/m^3]", "E_low [GPa]", "E_high [GPa]", "price [USD/kg]"]
ROW = ["al-cast", "metal", "Cast aluminium (fixture)", 2700, 70, 75, 2.5]


def test_column_letters_follow_the_spreadsheet_convention():
    # A..Z, then AA..AZ, BA, ...: the usual spreadsheet column naming (common practice, no source)
    assert [column_letter(k) for k in (0, 1, 25, 26, 27, 51, 52, 701, 702)] == [
        "A",
        "B",
        "Z",
        "AA",
        "AB",
        "AZ",
        "BA",
        "ZZ",
        "AAA",
    ]


def test_a_workbook_gives_the_same_table_as_the_csv(tmp_path):
    book = write_xlsx(tmp_path / "us.xlsx", [[typed(c) for c in row] for row in csv_rows(GOOD_US)])
    from_csv = read_materials_file(GOOD_US).drop(columns="origin")
    from_xlsx = read_materials_file(book)
    assert from_xlsx.loc[0, "origin"] == "us.xlsx"
    pd.testing.assert_frame_equal(from_xlsx.drop(columns="origin"), from_csv)


def test_numbers_stored_as_text_read_as_numbers(tmp_path):
    as_text = write_xlsx(tmp_path / "text.xlsx", [HEADER, [str(c) for c in ROW]])
    as_numbers = write_xlsx(tmp_path / "numbers.xlsx", [HEADER, ROW])
    pd.testing.assert_frame_equal(
        read_materials_file(as_text).drop(columns="origin"),
        read_materials_file(as_numbers).drop(columns="origin"),
    )
    assert read_materials_file(as_text).loc[0, "E_low"] == 70.0


def test_the_first_sheet_is_read_unless_one_is_named(tmp_path):
    book = openpyxl.Workbook()
    first = book.active
    first.title = "Prices"
    for row in (HEADER, ROW):
        first.append(row)
    second = book.create_sheet("Trial")
    for row in (HEADER, ["al-trial", "metal", "Trial", 2650, 68, 71, 3.0]):
        second.append(row)
    path = tmp_path / "book.xlsx"
    book.save(path)
    assert read_materials_file(path)["id"].tolist() == ["al-cast"]
    named = read_materials_file(f"{path}#Trial")
    assert named["id"].tolist() == ["al-trial"]
    assert named.loc[0, "origin"] == "book.xlsx#Trial"


def test_a_missing_sheet_suggests_the_nearest(tmp_path):
    path = write_xlsx(tmp_path / "book.xlsx", [HEADER, ROW], title="Prices", extra="Notes")
    assert messages(f"{path}#Prises") == [
        f"{path}#Prises: no sheet named 'Prises'; did you mean 'Prices'? (valid: Prices, Notes)"
    ]


def test_bad_cells_are_named_by_their_cell_in_one_pass(tmp_path):
    rows: list[list[object]] = [
        HEADER,
        ROW,
        ["al-two", "metal", "Second", 2700, "seventy", 75, 2.5],  # row 3: E_low in column E
        ["al-two", "metall", "Third", 2700, 70, 75, -1],  # row 4: id again, family, price
    ]
    path = write_xlsx(tmp_path / "bad.xlsx", rows)
    label = f"{path}#Sheet1"
    found = messages(path)
    assert found == [
        f"{label}: cell E3 (E_low): 'seventy' is not a number; expected a number in GPa; "
        "Young's modulus applies to every class",
        f"{label}: cell A4 (id): id 'al-two' is used again (first in row 3); expected each id once in a "
        "file; a later file may reuse an id to replace a class",
        f"{label}: cell B4 (family): unknown family 'metall'; did you mean 'metal'? "
        f"(valid: {', '.join(FAMILIES)})",
        f"{label}: cell G4 (price): -1 USD/kg is not positive; expected price above 0",
    ]
    with pytest.raises(DataFileError) as caught:
        load_materials([path])
    assert [str(p) for p in caught.value.problems] == found


def test_empty_rows_are_skipped_and_rows_keep_their_sheet_numbers(tmp_path):
    rows: list[list[object]] = [
        HEADER,
        [],
        ROW,
        [None] * len(HEADER),
        ["al-b", "metal", "B", 2700, 70, 60, 2],
    ]
    path = write_xlsx(tmp_path / "gaps.xlsx", rows)
    assert messages(path) == [
        f"{path}#Sheet1: cell E5 (E_low): low end 70 GPa is above high end 60 GPa; expected E_low <= E_high"
    ]
    rows[4][5] = 75
    assert read_materials_file(write_xlsx(tmp_path / "gaps.xlsx", rows))["id"].tolist() == ["al-cast", "al-b"]


def test_a_formula_without_a_saved_value_is_refused(tmp_path):
    # openpyxl writes a formula without its result, as a script-made workbook has it
    path = write_xlsx(tmp_path / "formula.xlsx", [HEADER, [*ROW[:5], "=E2+5", 2.5]])
    assert messages(path) == [
        f"{path}#Sheet1: cell F2 (E_high): formula '=E2+5' has no saved value; expected the workbook saved "
        "by a spreadsheet program (which stores each formula's result), or a plain value"
    ]


def test_a_formula_with_a_saved_value_gives_that_value(tmp_path):
    path = write_xlsx(tmp_path / "formula.xlsx", [HEADER, [*ROW[:5], "=E2+5", 2.5]])
    # store the result beside the formula, as a spreadsheet program does when it saves
    with zipfile.ZipFile(path) as source:
        parts = {name: source.read(name) for name in source.namelist()}
    sheet = parts["xl/worksheets/sheet1.xml"].decode()
    assert "<f>E2+5</f><v />" in sheet
    parts["xl/worksheets/sheet1.xml"] = sheet.replace("<f>E2+5</f><v />", "<f>E2+5</f><v>75</v>").encode()
    with zipfile.ZipFile(path, "w") as target:
        for name, data in parts.items():
            target.writestr(name, data)
    table = read_materials_file(path)
    assert table.loc[0, "E_high"] == 75.0


def test_an_error_value_in_a_cell_is_refused(tmp_path):
    path = write_xlsx(tmp_path / "error.xlsx", [HEADER, [*ROW[:6], "#DIV/0!"]])
    assert messages(path) == [
        f"{path}#Sheet1: cell G2 (price): the cell shows the error #DIV/0!; expected a value; "
        "correct the formula in the workbook"
    ]


def test_a_file_that_is_not_a_workbook_is_one_clear_problem(tmp_path):
    path = tmp_path / "fake.xlsx"
    path.write_bytes(b"id,family\nx,metal\n")
    before = path.read_bytes()
    (problem,) = check_materials_file(path)
    assert problem.where == str(path)
    assert problem.what.startswith("cannot read the file as an .xlsx workbook")
    assert path.read_bytes() == before


def write_parquet(path: Path, frame: pd.DataFrame, index: bool = False) -> Path:
    fastparquet.write(str(path), frame, write_index=index)
    return path


def csv_frame(path: Path) -> pd.DataFrame:
    rows = csv_rows(path)
    return pd.DataFrame([[typed(c) for c in row] for row in rows[1:]], columns=rows[0])


def test_a_parquet_file_gives_the_same_table_as_the_csv(tmp_path):
    path = write_parquet(tmp_path / "us.parquet", csv_frame(GOOD_US))
    from_parquet = read_materials_file(path)
    assert from_parquet.loc[0, "origin"] == "us.parquet"
    pd.testing.assert_frame_equal(
        from_parquet.drop(columns="origin"), read_materials_file(GOOD_US).drop(columns="origin")
    )


def test_parquet_ids_written_as_the_index_are_read(tmp_path):
    frame = pd.DataFrame([ROW], columns=HEADER).set_index("id")
    path = write_parquet(tmp_path / "indexed.parquet", frame, index=True)
    assert read_materials_file(path)["id"].tolist() == ["al-cast"]


def test_bad_parquet_cells_are_reported_with_their_rows(tmp_path):
    frame = pd.DataFrame([ROW, ["al-b", "metal", "B", np.nan, 70, 75, "cheap"]], columns=HEADER).astype(
        {"price [USD/kg]": str}
    )
    path = write_parquet(tmp_path / "bad.parquet", frame)
    assert messages(path) == [
        f"{path}: row 3, column rho: empty cell; expected a number in kg/m^3; density applies to every class",
        f"{path}: row 3, column price: 'cheap' is not a number; expected a number in USD/kg; "
        "price applies to every class",
    ]


def test_a_damaged_parquet_file_is_one_clear_problem(tmp_path):
    path = tmp_path / "damaged.parquet"
    path.write_bytes(b"PAR1 not really parquet PAR1")
    (problem,) = check_materials_file(path)
    assert problem.what.startswith("cannot read the file as Parquet")


def test_without_the_parquet_engine_the_error_names_the_package(tmp_path, monkeypatch):
    path = write_parquet(tmp_path / "ok.parquet", pd.DataFrame([ROW], columns=HEADER))
    monkeypatch.setitem(sys.modules, "fastparquet", None)  # makes `import fastparquet` raise ImportError
    (problem,) = check_materials_file(path)
    assert "needs the fastparquet package" in problem.what
    assert "pip install fastparquet" in problem.expected


def test_the_cli_checks_a_workbook_and_ranks_with_it(tmp_path):
    good = write_xlsx(tmp_path / "suppliers.xlsx", [HEADER, ROW])
    bad = write_xlsx(tmp_path / "bad.xlsx", [HEADER, [*ROW[:4], "x", 75, 2.5]])
    run = [sys.executable, "-m", "selector"]
    ok = subprocess.run([*run, "materials", "check", str(good)], capture_output=True, text=True)
    assert ok.returncode == 0 and "no problems found" in ok.stdout
    refused = subprocess.run([*run, "materials", "check", str(bad)], capture_output=True, text=True)
    assert refused.returncode == 2
    assert refused.stderr.startswith(f"error: {bad}#Sheet1: cell E2 (E_low): 'x' is not a number")
    assert "Traceback" not in refused.stderr
    listed = subprocess.run(
        [*run, "materials", "list", "--no-builtin", "--materials", str(good), "--format", "csv"],
        capture_output=True,
        text=True,
    )
    assert listed.returncode == 0, listed.stderr
    assert "al-cast" in listed.stdout


@settings(max_examples=15, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(
    # kept inside the plausible modulus band (1e-5 to 1200 GPa) so only the reader is tested
    low=st.floats(min_value=0.01, max_value=400, allow_nan=False),
    spread=st.floats(min_value=1.0, max_value=3.0),
    as_text=st.booleans(),
)
def test_any_modulus_reads_the_same_from_a_workbook_as_from_csv(tmp_path, low, spread, as_text):
    high = low * spread
    row = [*ROW[:4], low, high, ROW[6]]
    book = write_xlsx(tmp_path / "h.xlsx", [HEADER, [str(c) if as_text else c for c in row]])
    text = tmp_path / "h.csv"
    with text.open("w", encoding="utf-8", newline="") as handle:
        csv.writer(handle).writerows([HEADER, [repr(c) if isinstance(c, float) else c for c in row]])
    pd.testing.assert_frame_equal(
        read_materials_file(book).drop(columns="origin"), read_materials_file(text).drop(columns="origin")
    )

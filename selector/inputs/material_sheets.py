"""Reading materials tables from spreadsheets (.xlsx) and Parquet files.

Both are read into the same grid of cells as a CSV file (row 1 names each column and
its unit, one class per row below) and checked by
:func:`selector.inputs.material_headers.read_grid`, so the rules and the one-pass
report are those of CSV. A workbook's first sheet is read, or the sheet named after
``#`` (``suppliers.xlsx#Prices``); its cells are named like ``B7`` in messages.

Choices for spreadsheets: a formula cell gives the value the spreadsheet program saved
with it; a formula with no saved value (a workbook written by a script and never
opened) and a cell showing an error (``#DIV/0!``) are refused, each with its cell.
Numbers stored as text ("70") read as numbers, as they do in CSV; empty rows are
skipped.
"""

from __future__ import annotations

import datetime
import io
import math
import zipfile
from pathlib import Path
from typing import Any

import numpy as np
import pandas as pd

from selector.errors import Problem
from selector.inputs.material_headers import read_grid
from selector.suggest import did_you_mean

XLSX = ".xlsx"
PARQUET = ".parquet"
SHEET_MARK = "#"
"""Separates a workbook's path from a sheet name: ``book.xlsx#Sheet``."""
PARQUET_ENGINE = "fastparquet"


def split_sheet(path: Path) -> tuple[Path, str | None]:
    """``dir/book.xlsx#Prices`` → (``dir/book.xlsx``, "Prices"); any other path → (path, None)."""
    name = path.name
    at = name.lower().find(XLSX + SHEET_MARK)
    if at < 0:
        return path, None
    cut = at + len(XLSX)
    return path.with_name(name[:cut]), name[cut + len(SHEET_MARK) :]


def file_kind(path: Path) -> str:
    """The format of a materials file by its extension (lower case, e.g. ".xlsx")."""
    return split_sheet(path)[0].suffix.lower()


def _text(value: Any) -> str:
    """A typed cell value as the text a CSV cell would hold."""
    if value is None or (isinstance(value, float | np.floating) and math.isnan(value)):
        return ""
    if value is pd.NA or value is pd.NaT:
        return ""
    if isinstance(value, bool | np.bool_):
        return "TRUE" if value else "FALSE"
    if isinstance(value, int | np.integer):
        return str(int(value))
    if isinstance(value, float | np.floating):
        return repr(float(value))
    if isinstance(value, datetime.datetime | datetime.date | datetime.time | pd.Timestamp):
        return value.isoformat()
    if isinstance(value, bytes):
        return value.decode("utf-8", errors="replace")
    return str(value)


# ---------------------------------------------------------------------------- xlsx


def read_xlsx(path: Path, user: bool = True) -> tuple[pd.DataFrame, list[Problem]]:
    """A workbook sheet as a checked table; messages name the file, the sheet and the cell."""
    import openpyxl
    from openpyxl.utils.exceptions import InvalidFileException

    file, sheet = split_sheet(path)
    label = str(path)
    try:
        values = openpyxl.load_workbook(file, data_only=True)
        formulas = openpyxl.load_workbook(file, data_only=False)
    except FileNotFoundError:
        return pd.DataFrame(), [Problem(str(file), "file not found", "expected the path of a .xlsx workbook")]
    except (OSError, zipfile.BadZipFile, KeyError, ValueError, InvalidFileException) as exc:
        return pd.DataFrame(), [
            Problem(
                str(file),
                f"cannot read the file as an .xlsx workbook ({type(exc).__name__})",
                "expected a workbook saved in the .xlsx format",
            )
        ]
    if sheet is not None and sheet not in values.sheetnames:
        return pd.DataFrame(), [
            Problem(
                label,
                f"no sheet named {sheet!r}",
                did_you_mean(sheet, values.sheetnames, keep_order=True),
            )
        ]
    title = sheet if sheet is not None else values.sheetnames[0]
    label = f"{file}{SHEET_MARK}{title}"
    shown, written = values[title], formulas[title]
    width = max(shown.max_column, 1)
    records: list[list[str]] = []
    refused: dict[tuple[int, int], tuple[str, str]] = {}
    for n, (row, source) in enumerate(
        zip(
            shown.iter_rows(min_row=1, max_row=shown.max_row, max_col=width),
            written.iter_rows(min_row=1, max_row=shown.max_row, max_col=width),
            strict=True,
        ),
        start=1,
    ):
        cells = []
        for k, (cell, raw) in enumerate(zip(row, source, strict=True)):
            if raw.data_type == "f" and cell.value is None:
                refused[n, k] = (
                    f"formula {raw.value!r} has no saved value",
                    "expected the workbook saved by a spreadsheet program (which stores each "
                    "formula's result), or a plain value",
                )
                cells.append("")
            elif cell.data_type == "e":
                refused[n, k] = (
                    f"the cell shows the error {cell.value}",
                    "expected a value; correct the formula in the workbook",
                )
                cells.append("")
            else:
                cells.append(_text(cell.value))
        records.append(cells)
    return read_grid(records, label, user, sheet=True, refused=refused)


# ---------------------------------------------------------------------------- Parquet


def read_parquet(path: Path, user: bool = True) -> tuple[pd.DataFrame, list[Problem]]:
    """A Parquet file as a checked table; its column names are the header row (row 1)."""
    label = str(path)
    try:
        import fastparquet
    except ImportError:
        return pd.DataFrame(), [
            Problem(
                label,
                f"reading .parquet files needs the {PARQUET_ENGINE} package, which is not installed",
                f"expected it installed (pip install {PARQUET_ENGINE}), or the table saved as .csv or .xlsx",
            )
        ]
    if not path.is_file():
        return pd.DataFrame(), [Problem(label, "file not found", "expected the path of a .parquet file")]
    try:
        frame = fastparquet.ParquetFile(io.BytesIO(path.read_bytes())).to_pandas()
    except Exception as exc:  # a damaged file can fail in the reader's many layers; all mean unreadable
        return pd.DataFrame(), [
            Problem(
                label,
                f"cannot read the file as Parquet ({type(exc).__name__})",
                "expected a Parquet file with one column per header, one row per class",
            )
        ]
    if not isinstance(frame.index, pd.RangeIndex) or frame.index.name is not None:
        frame = frame.reset_index()  # an index written with the table (e.g. the ids) is a column too
    records = [[str(col) for col in frame.columns]]
    records += [[_text(v) for v in row] for row in frame.itertuples(index=False, name=None)]
    return read_grid(records, label, user)

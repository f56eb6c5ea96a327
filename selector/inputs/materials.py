"""Load, validate and merge materials tables: the built-in table plus user files.

A table has one row per material class and the columns of
:func:`selector.inputs.properties.data_columns`: text columns, a low and a high column per
property in its stored unit (NaN where the property does not apply or is unknown),
and the durability ratings as text ("" where unknown).

Every reader checks the whole file and reports every problem at once: CSV and TOML
files are read in :mod:`selector.inputs.material_files`, .xlsx workbooks and .parquet
files in :mod:`selector.inputs.material_sheets`, header rows with units in
:mod:`selector.inputs.material_headers`, and the table checks and the report live in
:mod:`selector.inputs.material_report`.
"""

from __future__ import annotations

import functools
from collections.abc import Sequence
from pathlib import Path

import pandas as pd

import materials_db
from selector.errors import DataFileError, InputError, Problem
from selector.inputs.material_files import read_csv, read_toml
from selector.inputs.material_report import ORDER, Report, Where, check_table, frame_columns
from selector.inputs.material_sheets import PARQUET, XLSX, file_kind, read_parquet, read_xlsx, split_sheet
from selector.inputs.properties import NOT_APPLICABLE, RATINGS, TEXT_COLUMNS, data_columns

BUILTIN = "built-in"
"""The ``origin`` of rows from the built-in table."""
_SUFFIXES = (".csv", ".toml", XLSX, PARQUET)


# ---------------------------------------------------------------------------- public API


def load_materials(files: Sequence[str | Path] = (), builtin: bool = True) -> pd.DataFrame:
    """The materials table: the built-in classes plus the classes of each user file, in order.

    A class whose id equals one already loaded replaces it, keeping its place in the
    table; so a user file can correct or extend the built-in data. The result has the
    columns of ``data_columns()`` and an ``origin`` column ("built-in" or the file name).

    Args:
        files: user materials files (.csv, .toml, .xlsx or ``book.xlsx#Sheet``, .parquet), applied in order.
        builtin: start from the built-in table; with False, the user files alone.

    Raises:
        InputError: no table to load, or a file of another type.
        DataFileError: listing every problem in every file.
    """
    paths = [Path(f) for f in ([files] if isinstance(files, str | Path) else files)]
    if not builtin and not paths:
        raise InputError("materials", "no table to load", "expected builtin=True or at least one file")
    for path in paths:
        _check_suffix(path)
    frames: list[pd.DataFrame] = []
    problems: list[Problem] = []
    if builtin:
        frames.append(_read_builtin(Path(materials_db.CLASSES_CSV)).copy())
    for path in paths:
        table, found = _read_user(path)
        problems += found
        if not found:
            frames.append(table.assign(origin=path.name))
    if problems:
        raise DataFileError(problems)
    return _merge(frames)


def read_materials_file(path: str | Path) -> pd.DataFrame:
    """One user materials file (CSV, TOML, .xlsx or .parquet, by extension), checked and in stored units.

    Raises:
        InputError: the extension is not one of .csv, .toml, .xlsx, .parquet.
        DataFileError: listing every problem found in the file.
    """
    path = Path(path)
    _check_suffix(path)
    table, problems = _read_user(path)
    if problems:
        raise DataFileError(problems)
    return table.assign(origin=path.name)


def check_materials_file(path: str | Path) -> list[Problem]:
    """Every problem in a user materials file; an empty list when it is clean.

    Raises:
        InputError: the extension is not one of .csv, .toml, .xlsx, .parquet.
    """
    path = Path(path)
    _check_suffix(path)
    return _read_user(path)[1]


def validate_table(df: pd.DataFrame, where: str) -> list[Problem]:
    """Every problem in a table already in stored units (as load_materials returns).

    Rows are numbered as in a spreadsheet of the table: the header is row 1.
    ``where`` names the table in the messages. An ``origin`` column is allowed.
    """
    df = df.reset_index(drop=True)
    report = Report(Where(where, tuple(f"row {i + 2}" for i in range(len(df))), {}, ORDER, "column"))
    table, skip = frame_columns(df, report)
    check_table(table, skip, report)
    return report.problems()


def _merge(frames: list[pd.DataFrame]) -> pd.DataFrame:
    """Stack tables; a later row with an existing id replaces the earlier one in its place."""
    both = pd.concat(frames, ignore_index=True)
    place = both.groupby("id", sort=False).ngroup()
    keep = ~both["id"].duplicated(keep="last")
    return (
        both[keep]
        .assign(_place=place[keep])
        .sort_values("_place", kind="stable")
        .drop(columns="_place")
        .reset_index(drop=True)
    )


# ---------------------------------------------------------------------------- files


def _check_suffix(path: Path) -> None:
    if file_kind(path) not in _SUFFIXES:
        raise InputError(
            str(path),
            f"unsupported file type {split_sheet(path)[0].suffix or '(none)'!r}",
            "expected a .csv, .toml, .xlsx (optionally file.xlsx#Sheet) or .parquet file",
        )


def _read_user(path: Path) -> tuple[pd.DataFrame, list[Problem]]:
    kind = file_kind(path)
    if kind == ".toml":
        return read_toml(path, str(path))
    if kind == XLSX:
        return read_xlsx(path)
    if kind == PARQUET:
        return read_parquet(path)
    return read_csv(path, str(path), user=True)


@functools.cache
def _read_builtin(path: Path) -> pd.DataFrame:
    """The built-in table, parsed once per process; raises DataFileError if it is broken.

    The shipped file is read by pandas directly when its header is exactly the expected
    one and every number cell parses (the tests check this gives the validated table);
    anything unexpected goes through the full, cell-by-cell validation.
    """
    trusted = _read_trusted(path)
    if trusted is not None:
        return trusted.assign(origin=BUILTIN)
    table, problems = read_csv(path, str(path), user=False)
    if problems:
        raise DataFileError(problems)
    return table.assign(origin=BUILTIN)


def _read_trusted(path: Path) -> pd.DataFrame | None:
    """A fast read of a table already in the stored layout, or None when it is not exactly that."""
    columns = data_columns()
    numbers = [c for c in columns if c not in (*TEXT_COLUMNS, *RATINGS)]
    try:
        table = pd.read_csv(
            path,
            dtype={c: str for c in (*TEXT_COLUMNS, *RATINGS)} | dict.fromkeys(numbers, float),
            keep_default_na=False,
            na_values={c: [NOT_APPLICABLE] for c in numbers},
            encoding="utf-8",
        )
    except (OSError, ValueError, UnicodeDecodeError, pd.errors.ParserError):
        return None
    if list(table.columns) != columns or table["id"].duplicated().any() or (table["id"] == "").any():
        return None
    return table

"""Reading materials files by format: CSV text and TOML ``[[class]]`` tables.

User TOML files hold ``[[class]]`` tables::

    [[class]]
    id = "al-cast"
    family = "metal"
    rho = "2.7 g/cm^3"
    E = ["68 GPa", "75 GPa"]
    ratings = { salt_water = "fair" }
"""

from __future__ import annotations

import csv
import difflib
import io
import math
import tomllib
from collections.abc import Mapping
from pathlib import Path
from typing import Any

import numpy as np
import pandas as pd

from selector.errors import InputError, Problem, UnitError
from selector.inputs import units
from selector.inputs.limits import check_toml_text, finite_float, shown
from selector.inputs.material_headers import read_grid
from selector.inputs.material_report import (
    COLUMNS,
    NUMBER,
    NUMERIC,
    ORDER,
    UNIT_OPTIONAL,
    Report,
    Where,
    check_table,
    finish,
)
from selector.inputs.properties import (
    MISSING_HINT,
    NOT_APPLICABLE,
    PROPERTIES,
    RATING_LEVELS,
    RATINGS,
    TEXT_COLUMNS,
    Property,
    misspelt_missing,
)
from selector.suggest import did_you_mean

FILE_EXPECTED = "expected the path of a materials file (.csv, .toml, .xlsx or .parquet)"


def read_text(path: Path, label: str) -> tuple[str, list[Problem]]:
    try:
        data = path.read_bytes()
    except FileNotFoundError:
        return "", [Problem(label, "file not found", FILE_EXPECTED)]
    except OSError as exc:
        return "", [
            Problem(label, f"cannot read the file ({exc.strerror or exc})", "expected a readable file")
        ]
    try:
        return data.decode("utf-8-sig"), []
    except UnicodeDecodeError as exc:
        return "", [
            Problem(
                label,
                f"not UTF-8 text (byte {data[exc.start]:#04x} at offset {exc.start})",
                "expected the file saved as UTF-8 text",
            )
        ]


def read_csv(path: Path, label: str, user: bool) -> tuple[pd.DataFrame, list[Problem]]:
    text, problems = read_text(path, label)
    if problems:
        return pd.DataFrame(), problems
    reader = csv.reader(io.StringIO(text, newline=""), strict=True)
    try:
        records = list(reader)
    except csv.Error as exc:
        where = f"{label}: line {reader.line_num}"
        return pd.DataFrame(), [
            Problem(where, f"malformed CSV: {exc}", "expected comma-separated cells, quotes in pairs")
        ]
    header = records[0] if records else []
    if len(header) == 1 and (";" in header[0] or "\t" in header[0]):
        sep = "semicolons" if ";" in header[0] else "tabs"
        return pd.DataFrame(), [
            Problem(f"{label}: row 1", f"the cells are separated by {sep}", "expected commas")
        ]
    return read_grid(records, label, user)


def read_toml(path: Path, label: str) -> tuple[pd.DataFrame, list[Problem]]:
    text, problems = read_text(path, label)
    if problems:
        return pd.DataFrame(), problems
    try:
        check_toml_text(text, label)
    except InputError as exc:
        return pd.DataFrame(), [exc.problem]
    try:
        doc = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        return pd.DataFrame(), [
            Problem(label, f"malformed TOML: {exc}", "expected [[class]] tables of key = value lines")
        ]
    classes = doc.get("class", [])
    if not isinstance(classes, list) or not all(isinstance(entry, dict) for entry in classes):
        return pd.DataFrame(), [
            Problem(f"{label}: class", "'class' is not a list of tables", "expected [[class]] tables")
        ]
    ids = [entry.get("id").strip() if isinstance(entry.get("id"), str) else "" for entry in classes]
    rows = tuple(f"class {i} ({ident})" if ident else f"class {i}" for i, ident in enumerate(ids, start=1))
    names = {col: prop.symbol for col, prop in NUMERIC.items()} | {r: f"ratings.{r}" for r in RATINGS}
    report = Report(Where(label, rows, names, ORDER, "field"))
    for k, key in enumerate(doc):
        if key != "class":
            report.at(
                -1, k, f"{label}: {key}", f"unknown top-level key {key!r}", "expected only [[class]] tables"
            )
    if not classes:
        report.at(-1, -1, label, "no material classes in the file", "expected one [[class]] table per class")
    n = len(classes)
    table: dict[str, Any] = {col: np.full(n, "", dtype=object) for col in COLUMNS if col not in NUMERIC}
    table |= {col: np.full(n, np.nan) for col in NUMERIC}
    skip = {col: np.zeros(n, dtype=bool) for col in COLUMNS}
    for pos, entry in enumerate(classes):
        _toml_class(pos, entry, table, skip, report)
    check_table(pd.DataFrame(table), pd.DataFrame(skip), report)
    return finish(pd.DataFrame(table)), report.problems()


def _toml_class(
    pos: int, entry: Mapping[str, Any], table: dict[str, Any], skip: dict[str, np.ndarray], report: Report
) -> None:
    """Fill one row from one [[class]] table."""

    def bad(field: str, what: str, expected: str) -> None:
        fallback = ORDER.get(PROPERTIES[field].low, len(COLUMNS)) if field in PROPERTIES else len(COLUMNS)
        order = ORDER.get(field, fallback)
        report.at(
            pos, order, f"{report.where.label}: {report.where.rows[pos]}, field {field}", what, expected
        )

    for key, value in entry.items():
        if key in TEXT_COLUMNS:
            if isinstance(value, str):
                table[key][pos] = value.strip()
            else:
                bad(key, f"{value!r} is not text", f'expected {key} = "..."')
                skip[key][pos] = True
        elif key == "ratings":
            _toml_ratings(value, pos, table, bad)
        elif key in PROPERTIES:
            prop = PROPERTIES[key]
            where = f"{report.where.label}: {report.where.rows[pos]}, field {key}"
            lo, hi, problem = _toml_range(value, prop, where)
            if problem is None:
                table[prop.low][pos], table[prop.high][pos] = lo, hi
            else:
                report.at(pos, ORDER[prop.low], problem.where, problem.what, problem.expected)
                skip[prop.low][pos] = skip[prop.high][pos] = True
        else:
            bad(key, f"unknown field {key!r}", _suggest_field(key))


def _toml_ratings(value: Any, pos: int, table: dict[str, Any], bad: Any) -> None:
    if not isinstance(value, dict):
        bad("ratings", f"{value!r} is not a table", 'expected ratings = { salt_water = "good", ... }')
        return
    for name, word in value.items():
        if name not in RATINGS:
            bad(
                f"ratings.{name}",
                f"unknown rating {name!r}",
                did_you_mean(name, list(RATINGS), keep_order=True),
            )
        elif not isinstance(word, str):
            bad(f"ratings.{name}", f"{word!r} is not text", f"expected one of: {', '.join(RATING_LEVELS)}")
        else:
            table[name][pos] = word.strip()


def _toml_range(value: Any, prop: Property, where: str) -> tuple[float, float, Problem | None]:
    """A property value, ``"70 GPa"`` or ``["68 GPa", "72 GPa"]``, as (low, high) in the stored unit."""
    if isinstance(value, list):
        if len(value) != 2:
            return (
                np.nan,
                np.nan,
                Problem(
                    where,
                    f"{value!r} has {len(value)} entries",
                    f'expected one value or a pair, e.g. {prop.symbol} = ["low", "high"]',
                ),
            )
        lo, first = _toml_quantity(value[0], prop, where)
        hi, second = _toml_quantity(value[1], prop, where)
        return lo, hi, first or second
    one, problem = _toml_quantity(value, prop, where)
    return one, one, problem


def _toml_quantity(value: Any, prop: Property, where: str) -> tuple[float, Problem | None]:
    example = f'expected a quantity with its unit, e.g. {prop.symbol} = "... {prop.stored}"'
    optional = prop.stored in UNIT_OPTIONAL
    if isinstance(value, str) and value.strip() == NOT_APPLICABLE:
        if prop.core:
            return np.nan, Problem(
                where, f"{NOT_APPLICABLE!r} given, but {prop.name} applies to every class", example
            )
        return np.nan, None
    if isinstance(value, str) and misspelt_missing(value):
        if prop.core:
            return np.nan, Problem(where, f"{shown(value)} is not a quantity", example)
        return np.nan, Problem(where, f"{shown(value)} is not how a missing value is written", MISSING_HINT)
    if isinstance(value, float) and not math.isfinite(value):
        return np.nan, Problem(where, f"{shown(value)} is not a finite number", example)
    if isinstance(value, bool) or not isinstance(value, str | int | float):
        return np.nan, Problem(where, f"{shown(value)} is not a quantity", example)
    if optional and (not isinstance(value, str) or NUMBER.fullmatch(value.strip())):
        number = finite_float(value)
        if number is None:
            return np.nan, Problem(where, f"{shown(value)} is not a finite number", example)
        return number, None
    if not isinstance(value, str):
        return np.nan, Problem(where, f"{shown(value)} has no unit", example)
    with np.errstate(all="ignore"):
        try:
            units.quantity(value, where)
        except UnitError as exc:
            return np.nan, Problem(where, exc.what, example)
        except Exception:  # pint's parser lets some syntax errors escape as other types; all mean unreadable
            return np.nan, Problem(where, f"cannot read {shown(value)}", example)
        try:
            return units.magnitude_in(value, prop.stored, where), None
        except UnitError:
            return np.nan, Problem(where, f"the unit of {shown(value)} does not measure {prop.name}", example)


def _suggest_field(key: str) -> str:
    stem, _, end = key.rpartition("_")
    if end in ("low", "high") and stem in PROPERTIES:
        return f'expected {stem} = ["low", "high"], e.g. {stem} = ["... {PROPERTIES[stem].stored}", "..."]'
    if key in RATINGS:
        return f'expected it inside ratings = {{ {key} = "..." }}'
    close = difflib.get_close_matches(key, [*TEXT_COLUMNS, "ratings", *PROPERTIES], n=1, cutoff=0.6)
    return (
        f"did you mean {close[0]!r}?"
        if close
        else f"expected {', '.join(TEXT_COLUMNS)}, ratings or a property symbol"
    )

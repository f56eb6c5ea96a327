"""Load, validate and merge materials tables: the built-in table plus user CSV or TOML files.

A table has one row per material class and the columns of
:func:`selector.inputs.properties.data_columns`: text columns, a low and a high column per
property in its stored unit (NaN where the property does not apply or is unknown),
and the durability ratings as text ("" where unknown).

User CSV files name each column ``<sym>_low [unit]``, ``<sym>_high [unit]`` or
``<sym> [unit]`` (one value giving both ends), in any unit pint reads. User TOML
files hold ``[[class]]`` tables::

    [[class]]
    id = "al-cast"
    family = "metal"
    rho = "2.7 g/cm^3"
    E = ["68 GPa", "75 GPa"]
    ratings = { salt_water = "fair" }

Every reader checks the whole file and reports every problem at once.
"""

from __future__ import annotations

import csv
import difflib
import functools
import io
import re
import tomllib
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import numpy as np
import pandas as pd

import materials_db
from selector.errors import DataFileError, InputError, Problem, UnitError
from selector.inputs import units
from selector.inputs.limits import check_toml_text, finite_float, shown
from selector.inputs.properties import (
    FAMILIES,
    NOT_APPLICABLE,
    PROPERTIES,
    RATING_LEVELS,
    RATINGS,
    TEXT_COLUMNS,
    Property,
    data_columns,
)
from selector.suggest import did_you_mean

BUILTIN = "built-in"
"""The ``origin`` of rows from the built-in table."""

_COLUMNS: tuple[str, ...] = tuple(data_columns())
_ORDER: dict[str, int] = {col: i for i, col in enumerate(_COLUMNS)}
_NUMERIC: dict[str, Property] = {col: prop for prop in PROPERTIES.values() for col in (prop.low, prop.high)}
_REQUIRED = ("rho", "E")
"""Properties every class must give, in every file."""
_UNIT_OPTIONAL = ("dimensionless", "percent", "kg/kg")
"""Stored units of ratio properties whose header may omit the unit (nu, elongation, co2)."""
_SUFFIXES = (".csv", ".toml")
_NUMBER = re.compile(r"[-+]?(?:[0-9]+\.?[0-9]*|\.[0-9]+)(?:[eE][-+]?[0-9]+)?")
"""A plain decimal number, as a cell of a number column must be written."""
_HEADER = re.compile(r"^\s*([^\[\]]*?)\s*(?:\[([^\[\]]*)\])?\s*$")


# ---------------------------------------------------------------------------- public API


def load_materials(files: Sequence[str | Path] = (), builtin: bool = True) -> pd.DataFrame:
    """The materials table: the built-in classes plus the classes of each user file, in order.

    A class whose id equals one already loaded replaces it, keeping its place in the
    table; so a user file can correct or extend the built-in data. The result has the
    columns of ``data_columns()`` and an ``origin`` column ("built-in" or the file name).

    Args:
        files: user CSV or TOML files, applied in order.
        builtin: start from the built-in table; with False, the user files alone.

    Raises:
        InputError: no table to load, or a file that is neither .csv nor .toml.
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
    """One user materials file (CSV or TOML, by extension), checked and in stored units.

    Raises:
        InputError: the extension is neither .csv nor .toml.
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
        InputError: the extension is neither .csv nor .toml.
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
    report = _Report(_Where(where, tuple(f"row {i + 2}" for i in range(len(df))), {}, _ORDER, "column"))
    table, skip = _frame_columns(df, report)
    _check_table(table, skip, report)
    return report.problems()


# ---------------------------------------------------------------------------- reporting


@dataclass(frozen=True)
class _Where:
    """How to name a place in one file: its label, its rows and its columns as written."""

    label: str
    rows: tuple[str, ...]
    names: Mapping[str, str]
    order: Mapping[str, int]
    noun: str

    def cell(self, pos: int, col: str) -> str:
        return f"{self.label}: {self.rows[pos]}, {self.noun} {self.names.get(col, col)}"


class _Report:
    """Collects problems and returns them sorted by row, then column, without repeats."""

    def __init__(self, where: _Where) -> None:
        self.where = where
        self._items: list[tuple[int, int, int, Problem]] = []

    def cell(self, pos: int, col: str, what: str, expected: str) -> None:
        self.at(pos, self.where.order.get(col, len(_COLUMNS)), self.where.cell(pos, col), what, expected)

    def at(self, pos: int, order: int, where: str, what: str, expected: str) -> None:
        self._items.append((pos, order, len(self._items), Problem(where, what, expected)))

    def problems(self) -> list[Problem]:
        return list(dict.fromkeys(item[3] for item in sorted(self._items, key=lambda i: i[:3])))


def _unit_label(prop: Property) -> str:
    return "" if prop.stored == "dimensionless" else prop.label


def _fmt(value: float, prop: Property) -> str:
    return f"{value:.6g} {_unit_label(prop)}".rstrip()


def _example(prop: Property) -> str:
    return f"'{prop.symbol} [{prop.stored}]'"


# ---------------------------------------------------------------------------- table checks


def _check_table(table: pd.DataFrame, skip: pd.DataFrame, report: _Report) -> None:
    """Check a table of data columns; the cells marked in ``skip`` were reported already."""
    _check_ids(table["id"], skip["id"].to_numpy(), report)
    _check_words(table, skip, report)
    values = {col: np.where(skip[col].to_numpy(), np.nan, table[col].to_numpy(float)) for col in _NUMERIC}
    given = {col: ~skip[col].to_numpy() for col in _NUMERIC}
    for prop in PROPERTIES.values():
        for col in (prop.low, prop.high):
            _check_values(values[col], given[col], col, prop, report)
        lo, hi = values[prop.low], values[prop.high]
        for pos in np.flatnonzero(np.isfinite(lo) & np.isfinite(hi) & (lo > hi)):
            report.cell(
                pos,
                prop.low,
                f"low end {_fmt(lo[pos], prop)} is above high end {_fmt(hi[pos], prop)}",
                f"expected {prop.low} <= {prop.high}",
            )
    _check_order(
        values,
        "sigma_y_low",
        "sigma_ts_high",
        "sigma_ts_high",
        report,
        "below",
        "tensile strength at least the yield strength",
    )
    _check_order(
        values,
        "T_min_low",
        "T_max_high",
        "T_min_low",
        report,
        "above",
        "minimum service temperature below the maximum",
    )


def _check_ids(ids: pd.Series, skip: np.ndarray, report: _Report) -> None:
    for pos in np.flatnonzero(ids.eq("").to_numpy() & ~skip):
        report.cell(
            pos, "id", "id is missing", "expected a short name unique in the file, e.g. 'steel-carbon'"
        )
    repeat = (ids.duplicated(keep="first") & ids.ne("")).to_numpy()
    if repeat.any():
        first = pd.Series(np.arange(len(ids))).groupby(ids.to_numpy()).transform("min").to_numpy()
        for pos in np.flatnonzero(repeat):
            report.cell(
                pos,
                "id",
                f"id {ids.iat[pos]!r} is used again (first in {report.where.rows[first[pos]]})",
                "expected each id once in a file; a later file may reuse an id to replace a class",
            )


def _check_words(table: pd.DataFrame, skip: pd.DataFrame, report: _Report) -> None:
    """Families and ratings: words from fixed lists."""
    family = table["family"]
    asked = ~skip["family"].to_numpy()
    for pos in np.flatnonzero(family.eq("").to_numpy() & asked):
        report.cell(pos, "family", "family is missing", f"expected one of: {', '.join(FAMILIES)}")
    for pos in np.flatnonzero((family.ne("") & ~family.isin(FAMILIES)).to_numpy() & asked):
        report.cell(
            pos,
            "family",
            f"unknown family {family.iat[pos]!r}",
            did_you_mean(family.iat[pos], FAMILIES, keep_order=True),
        )
    for rating in RATINGS:
        word = table[rating]
        asked = ~skip[rating].to_numpy()
        for pos in np.flatnonzero((word.ne("") & ~word.isin(RATING_LEVELS)).to_numpy() & asked):
            report.cell(
                pos,
                rating,
                f"unknown rating {word.iat[pos]!r}",
                did_you_mean(word.iat[pos], RATING_LEVELS, keep_order=True) + ", or empty if unknown",
            )


def _check_values(v: np.ndarray, given: np.ndarray, col: str, prop: Property, report: _Report) -> None:
    """One number column: required, finite, positive, within the sanity bounds."""
    nan = np.isnan(v)
    if prop.symbol in _REQUIRED:
        for pos in np.flatnonzero(nan & given):
            report.cell(
                pos, col, "no value", f"expected {prop.name} in {prop.stored}; it is required for every class"
            )
    infinite = np.isinf(v)
    for pos in np.flatnonzero(infinite):
        report.cell(
            pos, col, f"{float(v[pos])!r} is not a finite number", f"expected a number in {prop.stored}"
        )
    finite = ~nan & ~infinite
    bad_sign = finite & (v <= 0) if prop.positive else np.zeros_like(finite)
    for pos in np.flatnonzero(bad_sign):
        report.cell(pos, col, f"{_fmt(v[pos], prop)} is not positive", f"expected {prop.name} above 0")
    span = f"between {_fmt(prop.lower, prop)} and {_fmt(prop.upper, prop)}; check the value and its unit"
    for pos in np.flatnonzero(finite & ~bad_sign & (v < prop.lower)):
        report.cell(
            pos,
            col,
            f"{_fmt(v[pos], prop)} is below the plausible minimum {_fmt(prop.lower, prop)}",
            f"expected {prop.name} {span}",
        )
    for pos in np.flatnonzero(finite & (v > prop.upper)):
        report.cell(
            pos,
            col,
            f"{_fmt(v[pos], prop)} is above the plausible maximum {_fmt(prop.upper, prop)}",
            f"expected {prop.name} {span}",
        )


def _check_order(
    values: Mapping[str, np.ndarray], small: str, big: str, at: str, report: _Report, side: str, rule: str
) -> None:
    """Report rows where ``values[small] > values[big]``, at column ``at``."""
    a, b = values[small], values[big]
    prop = _NUMERIC[small]
    other = big if at == small else small
    for pos in np.flatnonzero(np.isfinite(a) & np.isfinite(b) & (a > b)):
        shown = {small: a[pos], big: b[pos]}
        report.cell(
            pos,
            at,
            f"{at} {_fmt(shown[at], prop)} is {side} {other} {_fmt(shown[other], prop)}",
            f"expected the {rule}",
        )


# ---------------------------------------------------------------------------- frames


def _frame_columns(df: pd.DataFrame, report: _Report) -> tuple[pd.DataFrame, pd.DataFrame]:
    """Bring a caller's DataFrame to clean data columns; report missing, extra and non-number columns."""
    n = len(df)
    label = report.where.label
    repeated = df.columns.duplicated()
    for k in np.flatnonzero(repeated):
        col = df.columns[k]
        report.at(
            -1, k, f"{label}: column {col}", f"column {col!r} appears again", "expected each column once"
        )
    df = df.loc[:, ~repeated]
    for k, col in enumerate(df.columns):
        if col not in _ORDER and col != "origin":
            close = difflib.get_close_matches(str(col), _COLUMNS, n=1, cutoff=0.6)
            expected = (
                f"did you mean {close[0]!r}?"
                if close
                else "expected the columns of data_columns() and 'origin'"
            )
            report.at(-1, k, f"{label}: column {col}", f"unknown column {col!r}", expected)
    table: dict[str, Any] = {}
    skip: dict[str, np.ndarray] = {}
    for col in _COLUMNS:
        present = col in df.columns
        required = col in ("id", "family") or (col in _NUMERIC and _NUMERIC[col].symbol in _REQUIRED)
        if not present and required:
            report.at(
                -1,
                _ORDER[col],
                f"{label}: column {col}",
                f"column {col!r} is missing",
                "expected it in every table",
            )
        if col in _NUMERIC:
            raw = df[col] if present else pd.Series(np.nan, index=range(n))
            number = pd.to_numeric(raw, errors="coerce").astype(float)
            wrong = (number.isna() & raw.notna()).to_numpy()
            for pos in np.flatnonzero(wrong):
                report.cell(
                    pos,
                    col,
                    f"{_plain(raw.iat[pos])!r} is not a number",
                    f"expected a number in {_NUMERIC[col].stored}",
                )
            table[col] = number.to_numpy()
            skip[col] = wrong | (not present)
        else:
            table[col] = _text(df[col]) if present else np.full(n, "", dtype=object)
            skip[col] = np.full(n, not present)
    return pd.DataFrame(table), pd.DataFrame(skip)


def _plain(value: Any) -> Any:
    """A numpy scalar as the Python value it holds (for messages)."""
    return value.item() if isinstance(value, np.generic) else value


def _text(series: pd.Series) -> np.ndarray:
    return series.map(
        lambda v: "" if v is None or (isinstance(v, float) and np.isnan(v)) else str(v).strip()
    ).to_numpy(dtype=object)


def _finish(table: pd.DataFrame) -> pd.DataFrame:
    """Column order and dtypes of a loaded table; an empty name takes the id."""
    out = table.loc[:, list(_COLUMNS)].copy()
    out["name"] = out["name"].where(out["name"].ne(""), out["id"])
    for col in _COLUMNS:
        out[col] = out[col].astype(float) if col in _NUMERIC else out[col].astype(str)
    return out.reset_index(drop=True)


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
    if path.suffix.lower() not in _SUFFIXES:
        raise InputError(
            str(path), f"unsupported file type {path.suffix or '(none)'!r}", "expected a .csv or .toml file"
        )


def _read_user(path: Path) -> tuple[pd.DataFrame, list[Problem]]:
    if path.suffix.lower() == ".toml":
        return _read_toml(path, str(path))
    return _read_csv(path, str(path), user=True)


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
    table, problems = _read_csv(path, str(path), user=False)
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


def _read_text(path: Path, label: str) -> tuple[str, list[Problem]]:
    try:
        data = path.read_bytes()
    except FileNotFoundError:
        return "", [Problem(label, "file not found", "expected the path of a .csv or .toml materials file")]
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


# ---------------------------------------------------------------------------- CSV


@dataclass(frozen=True)
class _Header:
    """One CSV column as the header names it."""

    index: int
    text: str
    stem: str
    unit: str | None
    targets: tuple[str, ...]
    meant: tuple[str, ...] = ()
    """For an unknown name: the columns it most likely stands for."""

    @property
    def prop(self) -> Property | None:
        return _NUMERIC.get(self.targets[0]) if self.targets else None


def _read_csv(path: Path, label: str, user: bool) -> tuple[pd.DataFrame, list[Problem]]:
    text, problems = _read_text(path, label)
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
    if not records or not any(cell.strip() for cell in records[0]):
        return pd.DataFrame(), [Problem(label, "no header row", "expected a first row naming the columns")]
    header = records[0]
    if len(header) == 1 and (";" in header[0] or "\t" in header[0]):
        sep = "semicolons" if ";" in header[0] else "tabs"
        return pd.DataFrame(), [
            Problem(f"{label}: row 1", f"the cells are separated by {sep}", "expected commas")
        ]
    body = [(n, row) for n, row in enumerate(records[1:], start=2) if any(cell.strip() for cell in row)]
    width = len(header)
    cells = pd.DataFrame(
        [[cell.strip() for cell in (row + [""] * width)[:width]] for _, row in body],
        columns=range(width),
        dtype=object,
    )
    lengths = np.array([len(row) for _, row in body], dtype=int)
    padded = np.arange(width)[None, :] >= lengths[:, None]
    heads = [_parse_header(k, h) for k, h in enumerate(header)]
    names = {col: h.stem for h in heads for col in h.targets}
    order = {col: h.index for h in heads for col in h.targets}
    report = _Report(_Where(label, tuple(f"row {n}" for n, _ in body), names, order, "column"))
    if not body:
        report.at(
            -1, -1, label, "no material classes in the file", "expected a header row and one row per class"
        )
    for pos, (n, row) in enumerate(body):
        extra = row[width:]
        if len(row) < width or any(cell.strip() for cell in extra):
            report.at(
                pos,
                -1,
                f"{label}: row {n}",
                f"row has {len(row)} cells, the header has {width}",
                "expected one cell per column",
            )
    table: dict[str, Any] = {
        col: np.full(len(body), "", dtype=object) for col in _COLUMNS if col not in _NUMERIC
    }
    table |= {col: np.full(len(body), np.nan) for col in _NUMERIC}
    skip = {col: np.zeros(len(body), dtype=bool) for col in _COLUMNS}
    claimed: dict[str, _Header] = {}
    for head in heads:
        again = [claimed[col].text for col in head.targets if col in claimed]
        if again:
            where = f"{label}: row 1, column {head.text}"
            report.at(
                -1,
                head.index,
                where,
                f"header {head.text!r} repeats {again[0]!r}",
                "expected each column once",
            )
            continue
        cover = head.targets or tuple(col for col in head.meant if col not in claimed)
        claimed |= {col: head for col in cover}
        column = cells[head.index] if len(body) else pd.Series([], dtype=object)
        if not _header_ok(head, column, report, label, user):
            for col in cover:
                skip[col][:] = True
            continue
        if head.prop is None:
            table[head.targets[0]] = column.to_numpy(dtype=object)
            skip[head.targets[0]] = padded[:, head.index]
            continue
        values, reported = _number_cells(column, padded[:, head.index], head, report, user)
        for col in head.targets:
            table[col], skip[col] = values, reported
    _check_columns(claimed, skip, report, label, user)
    _check_table(pd.DataFrame(table), pd.DataFrame(skip), report)
    return _finish(pd.DataFrame(table)), report.problems()


def _parse_header(index: int, text: str) -> _Header:
    match = _HEADER.match(text)
    if not match:
        return _Header(index, text.strip(), text.strip(), None, ())
    stem, unit = match.group(1), match.group(2)
    unit = unit.strip() if unit is not None and unit.strip() else None
    targets = _targets(stem)
    guess = None if targets else _guess(stem)
    return _Header(index, text.strip(), stem, unit, targets, _targets(guess[0]) if guess else ())


def _targets(name: str) -> tuple[str, ...]:
    """The data columns a header name fills."""
    if name in TEXT_COLUMNS or name in RATINGS or name in _NUMERIC:
        return (name,)
    if name in PROPERTIES:
        return (PROPERTIES[name].low, PROPERTIES[name].high)
    return ()


def _guess(stem: str) -> tuple[str, str] | None:
    """The known header name an unknown one most likely means, and how to say so."""
    choices = [*_COLUMNS, *PROPERTIES]
    folded = [c for c in choices if c.lower() == stem.lower()]
    if folded:
        return folded[0], f"did you mean {folded[0]!r}? (names are case-sensitive)"
    base = stem.split("(")[0].strip()
    if "(" in stem and _targets(base):
        return base, f"expected the unit in square brackets, e.g. '{base} [{_unit_hint(base)}]'"
    close = difflib.get_close_matches(stem, choices, n=1, cutoff=0.6)
    return (close[0], f"did you mean {close[0]!r}?") if close else None


def _unit_hint(name: str) -> str:
    targets = _targets(name)
    return _NUMERIC[targets[0]].stored if targets and targets[0] in _NUMERIC else "GPa"


def _header_ok(head: _Header, column: pd.Series, report: _Report, label: str, user: bool) -> bool:
    """Report what is wrong with a header; False when its column cannot be read."""
    where = f"{label}: row 1, column {head.text or head.index + 1}"

    def bad(what: str, expected: str) -> bool:
        report.at(-1, head.index, where, what, expected)
        return False

    if not head.text:
        if column.eq("").all():
            return False
        return bad(
            f"column {head.index + 1} has cells but no header", "expected a name such as 'E_low [GPa]'"
        )
    if not _HEADER.match(head.text):
        return bad(
            f"cannot read header {head.text!r}",
            "expected a name and an optional unit in brackets, e.g. 'E_low [GPa]'",
        )
    if not head.targets:
        return bad(f"unknown column {head.stem!r}", _suggest_column(head.stem))
    prop = head.prop
    if prop is None:
        if head.unit is not None:
            return bad(
                f"column {head.stem!r} takes no unit, got {head.unit!r}", f"expected the header '{head.stem}'"
            )
        return True
    if head.unit is None:
        if user and prop.stored not in _UNIT_OPTIONAL:
            return bad(f"no unit in header {head.text!r}", f"expected e.g. '{head.stem} [{prop.stored}]'")
        return True
    if _same_unit(head.unit, prop.stored):
        return True
    expected = f"expected a unit of {prop.name}, e.g. '{head.stem} [{prop.stored}]'"
    if not _unit_readable(head.unit):
        return bad(f"unknown unit {head.unit!r}", expected)
    try:
        units.convert(1.0, head.unit, prop.stored, where)
    except UnitError:
        return bad(f"unit {head.unit!r} does not measure {prop.name}", expected)
    return True


def _unit_readable(unit: str) -> bool:
    """Whether pint reads ``unit`` (converting it to itself)."""
    try:
        with np.errstate(all="ignore"):
            units.convert(1.0, unit, unit, "unit")
    except Exception:  # pint's parser lets some syntax errors escape as other types; all mean unreadable
        return False
    return True


def _same_unit(a: str, b: str) -> bool:
    return a.replace(" ", "") == b.replace(" ", "")


def _suggest_column(stem: str) -> str:
    guess = _guess(stem)
    if guess:
        return guess[1]
    if "(" in stem:
        return "expected the unit in square brackets, e.g. 'E_low [GPa]'"
    return (
        f"expected one of {', '.join(TEXT_COLUMNS)}, a rating ({', '.join(RATINGS)}) or a property "
        f"({', '.join(PROPERTIES)}) as '<sym> [unit]', '<sym>_low [unit]' or '<sym>_high [unit]'"
    )


def _number_cells(
    column: pd.Series, padded: np.ndarray, head: _Header, report: _Report, user: bool
) -> tuple[np.ndarray, np.ndarray]:
    """Numbers of one property column in the stored unit, and the cells reported as wrong."""
    prop = head.prop
    assert prop is not None
    col = head.targets[0]
    empty = column.eq("").to_numpy()
    na = column.eq(NOT_APPLICABLE).to_numpy()
    values = pd.to_numeric(column, errors="coerce").to_numpy(dtype=float, copy=True)
    number = np.isfinite(values)
    overflow = np.flatnonzero(np.isinf(values))  # "1e999" is a number too big; "inf" is not a number
    number[overflow] = [bool(_NUMBER.fullmatch(column.iat[pos])) for pos in overflow]
    values[~number] = np.nan
    text = ~(empty | na | number) & ~padded
    unit = head.unit or prop.stored
    unit_words = "" if unit == "dimensionless" else f" in {unit}"
    if prop.core:
        expected = f"expected a number{unit_words}; {prop.name} applies to every class"
    elif user:
        expected = (
            f"expected a number{unit_words}, '{NOT_APPLICABLE}' if it does not apply, or empty if unknown"
        )
    else:
        expected = f"expected a number{unit_words}, or '{NOT_APPLICABLE}' if it does not apply"
    for pos in np.flatnonzero(text):
        report.cell(pos, col, f"{column.iat[pos]!r} is not a number", expected)
    bad_na = na & prop.core
    for pos in np.flatnonzero(bad_na):
        report.cell(
            pos,
            col,
            f"{NOT_APPLICABLE!r} given, but {prop.name} applies to every class",
            f"expected a number{unit_words}",
        )
    bad_empty = empty & ~padded & (prop.core or not user)
    for pos in np.flatnonzero(bad_empty):
        report.cell(pos, col, "empty cell", expected)
    if head.unit is not None and not _same_unit(head.unit, prop.stored):
        with np.errstate(all="ignore"):
            values = units.convert(values, head.unit, prop.stored, col)
    return values, text | bad_na | bad_empty | padded


def _check_columns(
    filled: Mapping[str, _Header], skip: dict[str, np.ndarray], report: _Report, label: str, user: bool
) -> None:
    """Columns that must be there: id, family, rho and E (every column in the built-in table).

    The cells of a missing column are marked in ``skip``: one report covers them.
    """
    where = f"{label}: row 1"
    for col in ("id", "family"):
        if col not in filled:
            report.at(-1, 10_000 + _ORDER[col], where, f"no {col!r} column", f"expected a column {col!r}")
            skip[col][:] = True
    for prop in PROPERTIES.values():
        have = [col for col in (prop.low, prop.high) if col in filled]
        if user and len(have) == 1:
            other = prop.high if have[0] == prop.low else prop.low
            skip[other][:] = True
            if filled[have[0]].targets:  # a guessed column was reported as unknown already
                report.at(
                    -1,
                    10_000 + _ORDER[other],
                    where,
                    f"{have[0]} is given without {other}",
                    f"expected both ends, or one column {_example(prop)} giving both",
                )
        elif not have and (not user or prop.symbol in _REQUIRED):
            report.at(
                -1,
                10_000 + _ORDER[prop.low],
                where,
                f"no column for {prop.name} ({prop.symbol})",
                f"expected {_example(prop)} or the pair '{prop.low} [{prop.stored}]', "
                f"'{prop.high} [{prop.stored}]'",
            )
        if not have and prop.symbol in _REQUIRED:
            skip[prop.low][:] = skip[prop.high][:] = True
    if not user:
        for col in (*RATINGS, "name", "note", "source"):
            if col not in filled:
                report.at(
                    -1,
                    10_000 + _ORDER[col],
                    where,
                    f"no {col!r} column",
                    "expected every column of data_columns()",
                )


# ---------------------------------------------------------------------------- TOML


def _read_toml(path: Path, label: str) -> tuple[pd.DataFrame, list[Problem]]:
    text, problems = _read_text(path, label)
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
    names = {col: prop.symbol for col, prop in _NUMERIC.items()} | {r: f"ratings.{r}" for r in RATINGS}
    report = _Report(_Where(label, rows, names, _ORDER, "field"))
    for k, key in enumerate(doc):
        if key != "class":
            report.at(
                -1, k, f"{label}: {key}", f"unknown top-level key {key!r}", "expected only [[class]] tables"
            )
    if not classes:
        report.at(-1, -1, label, "no material classes in the file", "expected one [[class]] table per class")
    n = len(classes)
    table: dict[str, Any] = {col: np.full(n, "", dtype=object) for col in _COLUMNS if col not in _NUMERIC}
    table |= {col: np.full(n, np.nan) for col in _NUMERIC}
    skip = {col: np.zeros(n, dtype=bool) for col in _COLUMNS}
    for pos, entry in enumerate(classes):
        _toml_class(pos, entry, table, skip, report)
    _check_table(pd.DataFrame(table), pd.DataFrame(skip), report)
    return _finish(pd.DataFrame(table)), report.problems()


def _toml_class(
    pos: int, entry: Mapping[str, Any], table: dict[str, Any], skip: dict[str, np.ndarray], report: _Report
) -> None:
    """Fill one row from one [[class]] table."""

    def bad(field: str, what: str, expected: str) -> None:
        order = _ORDER.get(field, _ORDER.get(PROPERTIES[field].low) if field in PROPERTIES else len(_COLUMNS))
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
                report.at(pos, _ORDER[prop.low], problem.where, problem.what, problem.expected)
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
    optional = prop.stored in _UNIT_OPTIONAL
    if isinstance(value, str) and value.strip() == NOT_APPLICABLE:
        if prop.core:
            return np.nan, Problem(
                where, f"{NOT_APPLICABLE!r} given, but {prop.name} applies to every class", example
            )
        return np.nan, None
    if isinstance(value, bool) or not isinstance(value, str | int | float):
        return np.nan, Problem(where, f"{shown(value)} is not a quantity", example)
    if optional and (not isinstance(value, str) or _NUMBER.fullmatch(value.strip())):
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

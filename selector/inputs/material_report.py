"""Checking a materials table in stored units, and the one-pass report of its problems.

Every reader fills a table of the columns of :func:`selector.inputs.properties.data_columns`
plus a mask of cells already reported; :func:`check_table` then checks ids, words and
numbers (finite, positive, within each property's plausible bounds, low <= high) and
adds every problem to one :class:`Report`, sorted by row and column.
"""

from __future__ import annotations

import difflib
import re
from collections.abc import Mapping
from dataclasses import dataclass
from typing import Any

import numpy as np
import pandas as pd

from selector.errors import Problem
from selector.inputs.properties import (
    FAMILIES,
    PROPERTIES,
    RATING_LEVELS,
    RATINGS,
    Property,
    data_columns,
)
from selector.suggest import did_you_mean

COLUMNS: tuple[str, ...] = tuple(data_columns())
ORDER: dict[str, int] = {col: i for i, col in enumerate(COLUMNS)}
NUMERIC: dict[str, Property] = {col: prop for prop in PROPERTIES.values() for col in (prop.low, prop.high)}
"""Number column (``E_low``, ...) → its property."""
REQUIRED = ("rho", "E")
"""Properties every class must give, in every file."""
UNIT_OPTIONAL = ("dimensionless", "percent", "kg/kg")
"""Stored units of ratio properties whose header may omit the unit (nu, elongation, co2)."""
NUMBER = re.compile(r"[-+]?(?:[0-9]+\.?[0-9]*|\.[0-9]+)(?:[eE][-+]?[0-9]+)?")
"""A plain decimal number, as a cell of a number column must be written."""


@dataclass(frozen=True)
class Where:
    """How to name a place in one file: its label, its rows and its columns as written."""

    label: str
    rows: tuple[str, ...]
    names: Mapping[str, str]
    order: Mapping[str, int]
    noun: str
    letters: Mapping[str, str] | None = None
    """For a spreadsheet: each column's letter, so that a cell is named like ``B7``."""
    numbers: tuple[int, ...] = ()
    """For a spreadsheet: each row's number in the sheet."""

    def cell(self, pos: int, col: str) -> str:
        name = self.names.get(col, col)
        if self.letters is not None and col in self.letters:
            return f"{self.label}: cell {self.letters[col]}{self.numbers[pos]} ({name})"
        return f"{self.label}: {self.rows[pos]}, {self.noun} {name}"


class Report:
    """Collects problems and returns them sorted by row, then column, without repeats."""

    def __init__(self, where: Where) -> None:
        self.where = where
        self._items: list[tuple[int, int, int, Problem]] = []

    def cell(self, pos: int, col: str, what: str, expected: str) -> None:
        self.at(pos, self.where.order.get(col, len(COLUMNS)), self.where.cell(pos, col), what, expected)

    def at(self, pos: int, order: int, where: str, what: str, expected: str) -> None:
        self._items.append((pos, order, len(self._items), Problem(where, what, expected)))

    def problems(self) -> list[Problem]:
        return list(dict.fromkeys(item[3] for item in sorted(self._items, key=lambda i: i[:3])))


def _unit_label(prop: Property) -> str:
    return "" if prop.stored == "dimensionless" else prop.label


def _fmt(value: float, prop: Property) -> str:
    return f"{value:.6g} {_unit_label(prop)}".rstrip()


def example(prop: Property) -> str:
    return f"'{prop.symbol} [{prop.stored}]'"


def check_table(table: pd.DataFrame, skip: pd.DataFrame, report: Report) -> None:
    """Check a table of data columns; the cells marked in ``skip`` were reported already."""
    _check_ids(table["id"], skip["id"].to_numpy(), report)
    _check_words(table, skip, report)
    values = {col: np.where(skip[col].to_numpy(), np.nan, table[col].to_numpy(float)) for col in NUMERIC}
    given = {col: ~skip[col].to_numpy() for col in NUMERIC}
    for prop in PROPERTIES.values():
        for col in (prop.low, prop.high):
            _check_values(values[col], given[col], col, prop, report)
        lo, hi = values[prop.low], values[prop.high]
        for pos in np.flatnonzero(np.isfinite(lo) & np.isfinite(hi) & (lo > hi)).tolist():
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


def _check_ids(ids: pd.Series, skip: np.ndarray, report: Report) -> None:
    for pos in np.flatnonzero(ids.eq("").to_numpy() & ~skip).tolist():
        report.cell(
            pos, "id", "id is missing", "expected a short name unique in the file, e.g. 'steel-carbon'"
        )
    repeat = (ids.duplicated(keep="first") & ids.ne("")).to_numpy()
    if repeat.any():
        first = pd.Series(np.arange(len(ids))).groupby(ids.to_numpy()).transform("min").to_numpy()
        for pos in np.flatnonzero(repeat).tolist():
            report.cell(
                pos,
                "id",
                f"id {ids.iat[pos]!r} is used again (first in {report.where.rows[first[pos]]})",
                "expected each id once in a file; a later file may reuse an id to replace a class",
            )


def _check_words(table: pd.DataFrame, skip: pd.DataFrame, report: Report) -> None:
    """Families and ratings: words from fixed lists."""
    family = table["family"]
    asked = ~skip["family"].to_numpy()
    for pos in np.flatnonzero(family.eq("").to_numpy() & asked).tolist():
        report.cell(pos, "family", "family is missing", f"expected one of: {', '.join(FAMILIES)}")
    for pos in np.flatnonzero((family.ne("") & ~family.isin(FAMILIES)).to_numpy() & asked).tolist():
        report.cell(
            pos,
            "family",
            f"unknown family {family.iat[pos]!r}",
            did_you_mean(family.iat[pos], FAMILIES, keep_order=True),
        )
    for rating in RATINGS:
        word = table[rating]
        asked = ~skip[rating].to_numpy()
        for pos in np.flatnonzero((word.ne("") & ~word.isin(RATING_LEVELS)).to_numpy() & asked).tolist():
            report.cell(
                pos,
                rating,
                f"unknown rating {word.iat[pos]!r}",
                did_you_mean(word.iat[pos], RATING_LEVELS, keep_order=True) + ", or empty if unknown",
            )


def _check_values(v: np.ndarray, given: np.ndarray, col: str, prop: Property, report: Report) -> None:
    """One number column: required, finite, positive, within the sanity bounds."""
    nan = np.isnan(v)
    if prop.symbol in REQUIRED:
        for pos in np.flatnonzero(nan & given).tolist():
            report.cell(
                pos, col, "no value", f"expected {prop.name} in {prop.stored}; it is required for every class"
            )
    infinite = np.isinf(v)
    for pos in np.flatnonzero(infinite).tolist():
        report.cell(
            pos, col, f"{float(v[pos])!r} is not a finite number", f"expected a number in {prop.stored}"
        )
    finite = ~nan & ~infinite
    bad_sign = finite & (v <= 0) if prop.positive else np.zeros_like(finite)
    for pos in np.flatnonzero(bad_sign).tolist():
        report.cell(pos, col, f"{_fmt(v[pos], prop)} is not positive", f"expected {prop.name} above 0")
    span = f"between {_fmt(prop.lower, prop)} and {_fmt(prop.upper, prop)}; check the value and its unit"
    for pos in np.flatnonzero(finite & ~bad_sign & (v < prop.lower)).tolist():
        report.cell(
            pos,
            col,
            f"{_fmt(v[pos], prop)} is below the plausible minimum {_fmt(prop.lower, prop)}",
            f"expected {prop.name} {span}",
        )
    for pos in np.flatnonzero(finite & (v > prop.upper)).tolist():
        report.cell(
            pos,
            col,
            f"{_fmt(v[pos], prop)} is above the plausible maximum {_fmt(prop.upper, prop)}",
            f"expected {prop.name} {span}",
        )


def _check_order(
    values: Mapping[str, np.ndarray], small: str, big: str, at: str, report: Report, side: str, rule: str
) -> None:
    """Report rows where ``values[small] > values[big]``, at column ``at``."""
    a, b = values[small], values[big]
    prop = NUMERIC[small]
    other = big if at == small else small
    for pos in np.flatnonzero(np.isfinite(a) & np.isfinite(b) & (a > b)).tolist():
        shown = {small: a[pos], big: b[pos]}
        report.cell(
            pos,
            at,
            f"{at} {_fmt(shown[at], prop)} is {side} {other} {_fmt(shown[other], prop)}",
            f"expected the {rule}",
        )


def frame_columns(df: pd.DataFrame, report: Report) -> tuple[pd.DataFrame, pd.DataFrame]:
    """Bring a caller's DataFrame to clean data columns; report missing, extra and non-number columns."""
    n = len(df)
    label = report.where.label
    repeated = df.columns.duplicated()
    for k in np.flatnonzero(repeated).tolist():
        col = df.columns[k]
        report.at(
            -1, k, f"{label}: column {col}", f"column {col!r} appears again", "expected each column once"
        )
    df = df.loc[:, ~repeated]
    for k, col in enumerate(df.columns):
        if col not in ORDER and col != "origin":
            close = difflib.get_close_matches(str(col), COLUMNS, n=1, cutoff=0.6)
            expected = (
                f"did you mean {close[0]!r}?"
                if close
                else "expected the columns of data_columns() and 'origin'"
            )
            report.at(-1, k, f"{label}: column {col}", f"unknown column {col!r}", expected)
    table: dict[str, Any] = {}
    skip: dict[str, np.ndarray] = {}
    for col in COLUMNS:
        present = col in df.columns
        required = col in ("id", "family") or (col in NUMERIC and NUMERIC[col].symbol in REQUIRED)
        if not present and required:
            report.at(
                -1,
                ORDER[col],
                f"{label}: column {col}",
                f"column {col!r} is missing",
                "expected it in every table",
            )
        if col in NUMERIC:
            raw = df[col] if present else pd.Series(np.nan, index=range(n))
            number = pd.to_numeric(raw, errors="coerce").astype(float)
            wrong = (number.isna() & raw.notna()).to_numpy()
            for pos in np.flatnonzero(wrong).tolist():
                report.cell(
                    pos,
                    col,
                    f"{_plain(raw.iat[pos])!r} is not a number",
                    f"expected a number in {NUMERIC[col].stored}",
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


SHORT_NAME_LENGTH = 12
"""The longest short name, in characters; terminal tables show it when the full name does not fit."""


def short_name(name: str) -> str:
    """A short name for a class that has none: the name itself, or its first characters and "…"."""
    return name if len(name) <= SHORT_NAME_LENGTH else name[: SHORT_NAME_LENGTH - 1].rstrip() + "…"


def finish(table: pd.DataFrame) -> pd.DataFrame:
    """Column order and dtypes of a loaded table; an empty name takes the id."""
    out = table.loc[:, list(COLUMNS)].copy()
    out["name"] = out["name"].where(out["name"].ne(""), out["id"])
    out["short_name"] = out["short_name"].where(out["short_name"].ne(""), out["name"].map(short_name))
    for col in COLUMNS:
        out[col] = out[col].astype(float) if col in NUMERIC else out[col].astype(str)
    return out.reset_index(drop=True)

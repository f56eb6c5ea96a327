"""Reading a grid of cells whose header row names each column and its unit.

A header is ``<sym>_low [unit]``, ``<sym>_high [unit]`` or ``<sym> [unit]`` (one value
giving both ends), a text column (``id``, ``family``, ...) or a rating, in any unit pint
reads. CSV files and spreadsheets are read into such a grid and checked here cell by
cell, converting each number to its stored unit.
"""

from __future__ import annotations

import difflib
import re
from collections.abc import Mapping
from dataclasses import dataclass
from typing import Any

import numpy as np
import pandas as pd

from selector.errors import Problem, UnitError
from selector.inputs import units
from selector.inputs.material_report import (
    COLUMNS,
    NUMBER,
    NUMERIC,
    ORDER,
    REQUIRED,
    UNIT_OPTIONAL,
    Report,
    Where,
    check_table,
    example,
    finish,
)
from selector.inputs.properties import (
    MISSING_HINT,
    NOT_APPLICABLE,
    PROPERTIES,
    RATINGS,
    TEXT_COLUMNS,
    Property,
    misspelt_missing,
)

_HEADER = re.compile(r"^\s*([^\[\]]*?)\s*(?:\[([^\[\]]*)\])?\s*$")


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
        return NUMERIC.get(self.targets[0]) if self.targets else None


def read_grid(
    records: list[list[str]],
    label: str,
    user: bool,
    sheet: bool = False,
    refused: Mapping[tuple[int, int], tuple[str, str]] | None = None,
) -> tuple[pd.DataFrame, list[Problem]]:
    """A table and its problems from rows of cells; the first row is the header (row 1).

    With ``sheet`` the cells are named as in a spreadsheet (``B7``) rather than by row
    and column name. ``refused`` maps (row number, 0-based column) of cells the reader
    could not take to (what, expected); they are reported and not read.
    """
    refused = refused or {}
    if not records or not any(cell.strip() for cell in records[0]):
        return pd.DataFrame(), [Problem(label, "no header row", "expected a first row naming the columns")]
    header = records[0]
    refused_rows = {n for n, _ in refused}
    body = [
        (n, row)
        for n, row in enumerate(records[1:], start=2)
        if any(cell.strip() for cell in row) or n in refused_rows
    ]
    width = len(header)
    cells = pd.DataFrame(
        [[cell.strip() for cell in (row + [""] * width)[:width]] for _, row in body],
        columns=range(width),
        dtype=object,
    )
    lengths = np.array([len(row) for _, row in body], dtype=int)
    padded = np.arange(width)[None, :] >= lengths[:, None]
    """Cells not to read: missing from a short row, or refused by the reader (reported below)."""
    heads = [_parse_header(k, h) for k, h in enumerate(header)]
    names = {col: h.stem for h in heads for col in h.targets}
    order = {col: h.index for h in heads for col in h.targets}
    letters = {col: column_letter(h.index) for h in heads for col in h.targets} if sheet else None
    numbers = tuple(n for n, _ in body)
    report = Report(
        Where(label, tuple(f"row {n}" for n in numbers), names, order, "column", letters, numbers)
    )

    def header_at(head: _Header) -> str:
        if sheet:
            return f"{label}: cell {column_letter(head.index)}1" + (f" ({head.text})" if head.text else "")
        return f"{label}: row 1, column {head.text or head.index + 1}"

    if not body:
        report.at(
            -1, -1, label, "no material classes in the file", "expected a header row and one row per class"
        )
    for k in (k for (m, k) in refused if m == 1):
        report.at(-1, k, f"{label}: cell {column_letter(k)}1", *refused[1, k])
    for pos, (n, row) in enumerate(body):
        for k in (k for (m, k) in refused if m == n):
            padded[pos, k] = True
            stem = heads[k].stem
            at = f"{label}: cell {column_letter(k)}{n}" + (f" ({stem})" if stem else "")
            report.at(pos, k, at, *refused[n, k])
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
        col: np.full(len(body), "", dtype=object) for col in COLUMNS if col not in NUMERIC
    }
    table |= {col: np.full(len(body), np.nan) for col in NUMERIC}
    skip = {col: np.zeros(len(body), dtype=bool) for col in COLUMNS}
    claimed: dict[str, _Header] = {}
    for head in heads:
        again = [claimed[col].text for col in head.targets if col in claimed]
        if again:
            report.at(
                -1,
                head.index,
                header_at(head),
                f"header {head.text!r} repeats {again[0]!r}",
                "expected each column once",
            )
            continue
        cover = head.targets or tuple(col for col in head.meant if col not in claimed)
        claimed |= {col: head for col in cover}
        column = cells[head.index] if len(body) else pd.Series([], dtype=object)
        if (1, head.index) in refused or not _header_ok(head, column, report, header_at(head), user):
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
    check_table(pd.DataFrame(table), pd.DataFrame(skip), report)
    return finish(pd.DataFrame(table)), report.problems()


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
    if name in TEXT_COLUMNS or name in RATINGS or name in NUMERIC:
        return (name,)
    if name in PROPERTIES:
        return (PROPERTIES[name].low, PROPERTIES[name].high)
    return ()


def _guess(stem: str) -> tuple[str, str] | None:
    """The known header name an unknown one most likely means, and how to say so."""
    choices = [*COLUMNS, *PROPERTIES]
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
    return NUMERIC[targets[0]].stored if targets and targets[0] in NUMERIC else "GPa"


def column_letter(index: int) -> str:
    """A spreadsheet's name for the column at 0-based ``index``: A … Z, AA, AB, …"""
    letters = ""
    index += 1
    while index:
        index, rest = divmod(index - 1, 26)
        letters = chr(ord("A") + rest) + letters
    return letters


def _header_ok(head: _Header, column: pd.Series, report: Report, where: str, user: bool) -> bool:
    """Report what is wrong with a header (at ``where``); False when its column cannot be read."""

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
        if user and prop.stored not in UNIT_OPTIONAL:
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
    column: pd.Series, padded: np.ndarray, head: _Header, report: Report, user: bool
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
    number[overflow] = [bool(NUMBER.fullmatch(column.iat[pos])) for pos in overflow]
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
    for pos in np.flatnonzero(text).tolist():
        cell = column.iat[pos]
        if misspelt_missing(cell) and not prop.core:
            report.cell(pos, col, f"{cell!r} is not how a missing value is written", MISSING_HINT)
        else:
            report.cell(pos, col, f"{cell!r} is not a number", expected)
    bad_na = na & prop.core
    for pos in np.flatnonzero(bad_na).tolist():
        report.cell(
            pos,
            col,
            f"{NOT_APPLICABLE!r} given, but {prop.name} applies to every class",
            f"expected a number{unit_words}",
        )
    bad_empty = empty & ~padded & (prop.core or not user)
    for pos in np.flatnonzero(bad_empty).tolist():
        report.cell(pos, col, "empty cell", expected)
    if head.unit is not None and not _same_unit(head.unit, prop.stored):
        with np.errstate(all="ignore"):
            values = units.convert(values, head.unit, prop.stored, col)
    return values, text | bad_na | bad_empty | padded


def _check_columns(
    filled: Mapping[str, _Header], skip: dict[str, np.ndarray], report: Report, label: str, user: bool
) -> None:
    """Columns that must be there: id, family, rho and E (every column in the built-in table).

    The cells of a missing column are marked in ``skip``: one report covers them.
    """
    where = f"{label}: row 1"
    for col in ("id", "family"):
        if col not in filled:
            report.at(-1, 10_000 + ORDER[col], where, f"no {col!r} column", f"expected a column {col!r}")
            skip[col][:] = True
    for prop in PROPERTIES.values():
        have = [col for col in (prop.low, prop.high) if col in filled]
        if user and len(have) == 1:
            other = prop.high if have[0] == prop.low else prop.low
            skip[other][:] = True
            if filled[have[0]].targets:  # a guessed column was reported as unknown already
                report.at(
                    -1,
                    10_000 + ORDER[other],
                    where,
                    f"{have[0]} is given without {other}",
                    f"expected both ends, or one column {example(prop)} giving both",
                )
        elif not have and (not user or prop.symbol in REQUIRED):
            report.at(
                -1,
                10_000 + ORDER[prop.low],
                where,
                f"no column for {prop.name} ({prop.symbol})",
                f"expected {example(prop)} or the pair '{prop.low} [{prop.stored}]', "
                f"'{prop.high} [{prop.stored}]'",
            )
        if not have and prop.symbol in REQUIRED:
            skip[prop.low][:] = skip[prop.high][:] = True
    if not user:
        for col in (*RATINGS, "name", "short_name", "note", "source"):
            if col not in filled:
                report.at(
                    -1,
                    10_000 + ORDER[col],
                    where,
                    f"no {col!r} column",
                    "expected every column of data_columns()",
                )

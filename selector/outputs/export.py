"""Writing results to files, atomically (temporary file, then rename)."""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from pathlib import Path
from typing import Any

import numpy as np
import pandas as pd

from selector.outputs.cells import csv_text, neutral
from selector.outputs.files import check_output, ensure_folder, write_bytes_atomic, write_text_atomic
from selector.outputs.tables import flat_frame


def _plain(value: Any) -> Any:
    """A cell value for a spreadsheet: numbers stay numbers, NaN and ±inf blank, text never a formula."""
    if isinstance(value, bool | np.bool_):
        return bool(value)
    if isinstance(value, int | np.integer):
        return int(value)
    if isinstance(value, float | np.floating):
        return float(value) if math.isfinite(value) else None
    if isinstance(value, list | tuple):
        return neutral("; ".join(str(v) for v in value))
    if value is None or value is pd.NA:
        return None
    return neutral(value)


def spec_rows(selection: Any) -> list[tuple[str, str, Any]]:
    """The spec as (group, field, value) rows, then the assumptions the run made."""
    spec = selection.spec
    rows: list[tuple[str, str, Any]] = [("spec", "title", spec.title)]
    if spec.notes:
        rows.append(("spec", "notes", spec.notes))
    data = spec.model_dump(exclude={"title", "notes"})
    for group in ("part", "section", "objective"):
        for key, value in data[group].items():
            if value is not None:
                rows.append((group, key, value))
    for i, c in enumerate(data["constraint"]):
        for key, value in c.items():
            if value is not None:
                rows.append((f"constraint[{i}]", key, value))
    for key, value in data["screen"].items():
        rows.append(("screen", key, ", ".join(value) if isinstance(value, list) else value))
    rows.append(("materials", "builtin", data["materials"]["builtin"]))
    for f in data["materials"]["files"]:
        rows.append(("materials", "file", f))
    if spec.index is not None:
        rows.append(("spec", "index", spec.index))
    rows.append(("spec", "units", spec.units))
    rows.append(("result", "merit index (maximise)", f"M = {selection.index_text}"))
    rows.append(("result", "ranked by", selection.ranked_by if selection.sized else "merit index"))
    models: list[str] = []
    rows += [("assumption", "model", a) for a in selection.assumptions]
    for d in selection.derivations:
        if d.geometry.description not in models:
            models.append(d.geometry.description)
    rows += [("assumption", "section model", m) for m in models]
    for note in selection.notes:
        rows.append(("assumption", "note", note))
    rows.append(("caution", "preliminary selection", selection.caution))
    return rows


def _sheet(
    workbook: Any, title: str, header: list[str], rows: list[list[Any]], wrap: tuple[str, ...] = ()
) -> Any:
    """Add a sheet: bold frozen header, numbers as numbers, column widths from the content."""
    from openpyxl.styles import Alignment, Font
    from openpyxl.utils import get_column_letter

    sheet = workbook.create_sheet(title)
    sheet.append([neutral(name) for name in header])
    for row in rows:
        sheet.append([_plain(v) for v in row])
    for cell in sheet[1]:
        cell.font = Font(bold=True)
        cell.alignment = Alignment(vertical="top", wrap_text=True)
    sheet.freeze_panes = "A2"
    for i, name in enumerate(header, 1):
        letter = get_column_letter(i)
        cells = [sheet.cell(r, i).value for r in range(2, sheet.max_row + 1)]
        longest = max(
            [len(name) * 0.9, *(12 if isinstance(v, float) else len(str(v)) for v in cells if v is not None)],
            default=8,
        )
        sheet.column_dimensions[letter].width = max(8, min(longest + 2, 70 if name in wrap else 45))
        if name in wrap:
            for r in range(2, sheet.max_row + 1):
                sheet.cell(r, i).alignment = Alignment(vertical="top", wrap_text=True)
    if rows:
        sheet.auto_filter.ref = sheet.dimensions
    return sheet


def xlsx_bytes(selection: Any, units: str = "si", top: int | None = None) -> bytes:
    """The workbook: shortlist, rejected classes, sized parts, a sheet per study table, the spec.

    A sandwich's workbook starts with its pairs and the classes left out as face or core;
    the solid parts follow as the shortlist.
    """
    import io

    from openpyxl import Workbook

    workbook = Workbook()
    workbook.remove(workbook.active)
    if selection.sandwich is not None:
        _pairs_sheets(workbook, selection, units)
    short = flat_frame(selection, units)
    _sheet(workbook, "shortlist", list(short.columns), short.to_numpy(dtype=object).tolist(), ("reasons",))
    rejected = selection.rejected
    _sheet(
        workbook,
        "rejected",
        ["id", "name", "family", "status", "reasons"],
        [
            [r.id, r.name, r.family, r.status, "; ".join(r.reasons)]
            for r in rejected[["id", "name", "family", "status", "reasons"]].itertuples(index=False)
        ],
        ("reasons",),
    )
    if selection.has_sizes:
        after = list(short.columns[short.columns.get_loc("close_to_leader") + 1 :])
        keep = ["rank", "id", "name", *(c for c in after if c != "reasons")]
        parts = short[keep]
        _sheet(workbook, "sized parts", keep, parts.to_numpy(dtype=object).tolist(), ("warnings",))
    else:
        why = [n for n in selection.notes if "to size parts" in n] or [
            "the spec gives no loads to size parts"
        ]
        _sheet(workbook, "sized parts", ["note"], [[w] for w in why], ("note",))
    rows = [list(r) for r in spec_rows(selection)]
    if selection.sandwich is not None:
        at = next(i for i, r in enumerate(rows) if r[0] == "caution")
        rows[at:at] = [["assumption", "sandwich", a] for a in selection.sandwich.assumptions]
    from selector.outputs.studies import study_frames

    for name, frame in study_frames(selection, units, top).items():
        shown = _with_caution(frame, selection)
        _sheet(
            workbook, name, [str(c) for c in shown.columns], shown.to_numpy(dtype=object).tolist(), ("note",)
        )
    _sheet(workbook, "spec", ["group", "field", "value"], rows, ("value",))
    buffer = io.BytesIO()
    workbook.save(buffer)
    return buffer.getvalue()


def _pairs_sheets(workbook: Any, selection: Any, units: str) -> None:
    """A sandwich's sheets, first in the workbook: the ranked pairs, and the classes left out."""
    from selector.outputs.sandwich_tables import flat_pairs

    pairs = flat_pairs(selection, units)
    _sheet(workbook, "pairs", list(pairs.columns), pairs.to_numpy(dtype=object).tolist(), ("warnings",))
    excluded = selection.sandwich.excluded
    header = ["id", "name", "role", "reason"]
    _sheet(workbook, "left out", header, excluded[header].to_numpy(dtype=object).tolist(), ("reason",))


def write_xlsx(
    selection: Any,
    path: Path,
    units: str = "si",
    protect: Sequence[str | Path] = (),
    top: int | None = None,
) -> Path:
    """Write the workbook atomically; refuses to write over any path in ``protect``.

    The studies the Selection carries get a sheet per table (``top`` rows of each when given).
    """
    check_output(path, protect)
    ensure_folder(path)
    write_bytes_atomic(Path(path), xlsx_bytes(selection, units, top))
    return Path(path)


def _with_caution(frame: pd.DataFrame, selection: Any) -> pd.DataFrame:
    """A study table with the caution in every row when it shows sized parts."""
    return frame.assign(caution=selection.caution) if selection.has_sizes else frame


def csv_tables(frames: Mapping[str, pd.DataFrame], selection: Any) -> list[str]:
    """Each table as CSV text, in order."""
    return [csv_text(_with_caution(frame, selection)) for frame in frames.values()]


def write_csv_tables(
    frames: Mapping[str, pd.DataFrame], path: Path, selection: Any, protect: Sequence[str | Path] = ()
) -> list[Path]:
    """The first table to ``path`` and each further one to ``<stem>-<name>.csv`` beside it.

    Every path is checked before any is written; returns the paths written.
    """
    path = Path(path)
    paths = [path, *(path.with_name(f"{path.stem}-{name}{path.suffix}") for name in list(frames)[1:])]
    for target in paths:
        check_output(target, protect)
    ensure_folder(path)
    for target, text in zip(paths, csv_tables(frames, selection), strict=True):
        write_text_atomic(target, text + "\n")
    return paths


def write_selection(
    selection: Any,
    path: str | Path,
    units: str | None = None,
    fmt: str | None = None,
    protect: Sequence[str | Path] = (),
    top: int | None = None,
    show_all: bool = False,
) -> Path:
    """Write the shortlist as CSV, JSON, Markdown or XLSX (format from the extension by default)."""
    from selector.outputs import tables

    units = units or selection.spec.units
    fmt = fmt or tables.format_for(str(path))
    check_output(path, protect)
    ensure_folder(path)
    if fmt == "xlsx":
        return write_xlsx(selection, Path(path), units, protect)
    if selection.sandwich is not None:
        from selector.outputs.sandwich_tables import render_sandwich

        text = render_sandwich(selection, fmt, units, top)
    else:
        text = tables.render_selection(selection, fmt, units, top, show_all)
    write_text_atomic(Path(path), text + "\n")
    return Path(path)

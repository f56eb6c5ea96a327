"""Tables and prose fitted to a terminal width.

A table that is too wide is narrowed in steps, each kept only while it is still needed:
notes move to a numbered list under the table, then the layout's steps run in order
(a column left out, or a column given a narrower form: short names, a shorter header, a
unit moved to the lines above), and last names are elided with "…". The table says which
columns it left out. Without a width every column is printed in full.
"""

from __future__ import annotations

import textwrap
from collections.abc import Sequence
from dataclasses import dataclass

GAP = "  "
"""Space between two columns."""

MIN_ELIDED = 8
"""Narrowest an elided text column becomes, in characters."""

ELLIPSIS = "…"


@dataclass(frozen=True)
class Shorten:
    """A narrower form of one column (named by its header), used only while the table is too wide.

    Attributes:
        column: the column's header name.
        cells: narrower cells (None keeps the column's own).
        name: a shorter header name (None keeps it).
        unit: a shorter unit line ("" when the unit is stated above the table; None keeps it).
        always: use the narrower form whatever the width (to match a table printed beside it).
    """

    column: str
    cells: Sequence[str] | None = None
    name: str | None = None
    unit: str | None = None
    always: bool = False


Step = str | Shorten
"""One narrowing step: a column left out (its header name), or a narrower form of one."""


@dataclass(frozen=True)
class Layout:
    """How a table may be narrowed; every field names columns by their header.

    Attributes:
        notes: columns whose text moves to the numbered notes under the table.
        steps: what to do next while the table is still too wide, in order.
        elide: text columns that may be cut short with "…", the first named first.
    """

    notes: Sequence[str] = ()
    steps: Sequence[Step] = ()
    elide: Sequence[str] = ()
    leave_out: Sequence[str] = ()
    """Columns left out whatever the width (to match a table printed beside it)."""


@dataclass(frozen=True)
class Fitted:
    """A fitted table: its text, the columns given a narrower form and those left out."""

    text: str
    shortened: frozenset[str]
    left_out: tuple[str, ...] = ()


@dataclass
class _Column:
    key: str
    """The header name the layout knows the column by (kept when a step renames it)."""
    name: str
    unit: str
    cells: list[str]

    @property
    def width(self) -> int:
        return max(len(self.name), len(self.unit), *(len(c) for c in self.cells), 1)


def _split_header(header: str) -> tuple[str, str]:
    """``"mass [kg]"`` → ``("mass", "kg")``; a header without a unit keeps it empty."""
    if header.endswith("]") and " [" in header:
        name, unit = header[:-1].split(" [", 1)
        return name, unit
    return header, ""


def _total(columns: Sequence[_Column]) -> int:
    return sum(c.width for c in columns) + len(GAP) * max(len(columns) - 1, 0)


def _elided(text: str, width: int) -> str:
    return text if len(text) <= width else text[: max(width - 1, 0)] + ELLIPSIS


def _to_notes(columns: list[_Column], names: Sequence[str]) -> list[str]:
    """Replace the note columns by one column of note numbers; return the notes, numbered.

    Identical texts share a number.
    """
    chosen = [c for c in columns if c.key in names]
    if not any(any(c.cells) for c in chosen):
        for c in chosen:
            columns.remove(c)  # nothing to say: the empty column goes too
        return []
    numbers: dict[str, int] = {}
    marks = []
    for row in range(len(chosen[0].cells)):
        text = "; ".join(c.cells[row] for c in chosen if c.cells[row])
        if text:
            marks.append(str(numbers.setdefault(text, len(numbers) + 1)))
        else:
            marks.append("")
    at = columns.index(chosen[0])
    for c in chosen:
        columns.remove(c)
    columns.insert(at, _Column("note", "note", "", marks))
    return [f"[{n}] {text}" for text, n in numbers.items()]


def _leave_out(columns: list[_Column], name: str) -> bool:
    """Remove the named column; say whether it was there."""
    found = [c for c in columns if c.key == name]
    for c in found:
        columns.remove(c)
    return bool(found)


def _shorten(columns: list[_Column], step: Shorten) -> bool:
    """Give the named column its narrower form; say whether it was there."""
    found = [c for c in columns if c.key == step.column]
    for c in found:
        if step.cells is not None:
            c.cells = [str(x) for x in step.cells]
        c.name = step.name if step.name is not None else c.name
        c.unit = step.unit if step.unit is not None else c.unit
    return bool(found)


def _lines(columns: Sequence[_Column]) -> list[str]:
    widths = [c.width for c in columns]
    heads = [[c.name for c in columns]]
    if any(c.unit for c in columns):
        heads.append([c.unit for c in columns])
    rows = [[c.cells[i] for c in columns] for i in range(len(columns[0].cells))] if columns else []
    out = [GAP.join(t.ljust(w) for t, w in zip(h, widths, strict=True)).rstrip() for h in heads]
    out.append(GAP.join("-" * w for w in widths))
    out += [GAP.join(t.ljust(w) for t, w in zip(r, widths, strict=True)).rstrip() for r in rows]
    return out


def wrap(lines: Sequence[str], width: int | None, indent: str = "  ") -> list[str]:
    """Lines wrapped to ``width`` (unchanged when None); a wrapped line goes on with ``indent``.

    A line's own leading spaces are kept and added to the indent of its continuation;
    text holding several lines is split first, so a fitted table passes unchanged.
    """
    if width is None:
        return list(lines)
    out: list[str] = []
    for line in (part for text in lines for part in text.split("\n")):
        if len(line) <= width or not line.strip():
            out.append(line)
            continue
        lead = line[: len(line) - len(line.lstrip())]
        out += textwrap.wrap(
            line.strip(),
            width=width,
            initial_indent=lead,
            subsequent_indent=lead + indent,
            break_long_words=True,
            break_on_hyphens=False,
        )
    return out


def fit(
    headers: Sequence[str], rows: Sequence[Sequence[str]], width: int | None, layout: Layout | None = None
) -> Fitted:
    """A text table of string cells, narrowed as the module says to fit ``width`` characters.

    Headers written ``"name [unit]"`` print the unit on a second header line. ``width``
    None prints every column in full (and the notes in their column).
    """
    layout = layout or Layout()
    columns = []
    for i, header in enumerate(headers):
        name, unit = _split_header(header)
        columns.append(_Column(name, name, unit, [str(r[i]) for r in rows]))

    def too_wide() -> bool:
        return width is not None and _total(columns) > width

    shortened: set[str] = set()
    for step in layout.steps:
        if isinstance(step, Shorten) and step.always and _shorten(columns, step):
            shortened.add(step.column)
    left_out = [name for name in layout.leave_out if _leave_out(columns, name)]
    notes = _to_notes(columns, layout.notes) if too_wide() else []
    for step in layout.steps:
        if not too_wide():
            break
        if isinstance(step, str):
            left_out += [step] if _leave_out(columns, step) else []
        elif step.column not in shortened and _shorten(columns, step):
            shortened.add(step.column)
    for name in layout.elide:
        if not too_wide():
            break
        for c in [c for c in columns if c.key == name]:
            keep = max(MIN_ELIDED, len(c.name), c.width - (_total(columns) - (width or 0)))
            c.cells = [_elided(t, keep) for t in c.cells]
    lines = _lines(columns)
    if width is not None:
        lines = [_elided(line, width) for line in lines]
    tail = []
    if left_out:
        tail.append(f"not shown at {width} columns: {', '.join(left_out)} (--wide shows every column)")
    if notes:
        tail += ["", "notes:"] + [f"  {n}" for n in notes]
    return Fitted(
        "\n".join(lines + wrap(tail, width, indent="      ")), frozenset(shortened), tuple(left_out)
    )


def fit_table(
    headers: Sequence[str], rows: Sequence[Sequence[str]], width: int | None, layout: Layout | None = None
) -> str:
    """The text of ``fit``: a table of string cells fitted to ``width`` characters."""
    return fit(headers, rows, width, layout).text


__all__ = ["Fitted", "Layout", "Shorten", "Step", "fit", "fit_table", "wrap"]

"""Tables and prose fitted to a terminal width.

A table that is too wide is narrowed in steps, each kept only while it is still needed:
notes move to a numbered list under the table, the columns least needed are left
out (the table says which), long names give way to short names, more columns are
left out, and names are elided with "…". Without a width every column is printed in full.
"""

from __future__ import annotations

import textwrap
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field

GAP = "  "
"""Space between two columns."""

MIN_ELIDED = 8
"""Narrowest an elided text column becomes, in characters."""

ELLIPSIS = "…"


@dataclass(frozen=True)
class Layout:
    """How a table may be narrowed; every field names columns by their header.

    Attributes:
        short: narrower cells to use instead of a column's own (short class names).
        notes: columns whose text moves to the numbered notes under the table.
        spare: columns left out before names are shortened, the first named first.
        optional: columns that may be left out after that, the first named first.
        elide: text columns that may be cut short with "…", the first named first.
    """

    short: Mapping[str, Sequence[str]] = field(default_factory=dict)
    notes: Sequence[str] = ()
    spare: Sequence[str] = ()
    optional: Sequence[str] = ()
    elide: Sequence[str] = ()


@dataclass
class _Column:
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
    chosen = [c for c in columns if c.name in names]
    if not chosen or not any(any(c.cells) for c in chosen):
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
    columns.insert(at, _Column("note", "", marks))
    return [f"[{n}] {text}" for text, n in numbers.items()]


def _leave_out(columns: list[_Column], names: Sequence[str], width: int | None) -> list[str]:
    """Remove the named columns in turn while the table is wider than ``width``; return those removed."""
    removed: list[str] = []
    for name in names:
        if width is None or _total(columns) <= width:
            break
        for c in [c for c in columns if c.name == name]:
            columns.remove(c)
            removed.append(name)
    return removed


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


def fit_table(
    headers: Sequence[str], rows: Sequence[Sequence[str]], width: int | None, layout: Layout | None = None
) -> str:
    """A text table of string cells, narrowed as the module says to fit ``width`` characters.

    Headers written ``"name [unit]"`` print the unit on a second header line. ``width``
    None prints every column in full (and the notes in their column).
    """
    layout = layout or Layout()
    columns = [_Column(*_split_header(h), [str(r[i]) for r in rows]) for i, h in enumerate(headers)]
    notes: list[str] = []
    left_out: list[str] = []
    if width is not None and _total(columns) > width:
        notes = _to_notes(columns, layout.notes)
    left_out += _leave_out(columns, layout.spare, width)
    for name, short in layout.short.items():
        if width is None or _total(columns) <= width:
            break
        for c in columns:
            if c.name == name:
                c.cells = [str(s) for s in short]
    left_out += _leave_out(columns, layout.optional, width)
    for name in layout.elide:
        if width is None or _total(columns) <= width:
            break
        for c in [c for c in columns if c.name == name]:
            keep = max(MIN_ELIDED, len(c.name), c.width - (_total(columns) - width))
            c.cells = [_elided(t, keep) for t in c.cells]
    lines = _lines(columns)
    if width is not None:
        lines = [_elided(line, width) for line in lines]
    tail = []
    if left_out:
        tail.append(f"not shown at {width} columns: {', '.join(left_out)} (--wide shows every column)")
    if notes:
        tail += ["", "notes:"] + [f"  {n}" for n in notes]
    return "\n".join(lines + wrap(tail, width, indent="      "))


__all__ = ["Layout", "fit_table", "wrap"]

"""A Selection as Jupyter shows it: the top of the shortlist, what governs, and the caution.

The public API's Selection (``selector.interactive``) calls into this module from its
``_repr_html_`` and ``chart``. It reads the Selection and converts units for display; it
computes nothing.
"""

from __future__ import annotations

import html
from collections import Counter
from typing import Any

import pandas as pd

from selector.inputs.units import format_number
from selector.outputs.tables import LENGTH_UNIT, column_headers, selection_frame, sized_value_headers
from selector.pipeline import columns

NOTEBOOK_ROWS = 10
"""Shortlist rows shown inline; the full table is ``selection.shortlist``."""

_STYLE = (
    "<style>"
    ".selector-view table{border-collapse:collapse;font-size:0.9em}"
    ".selector-view th,.selector-view td{padding:2px 8px;text-align:left;border-bottom:1px solid #ddd}"
    ".selector-view td.num{text-align:right;font-variant-numeric:tabular-nums}"
    ".selector-view .caution{border-left:4px solid #d55e00;padding:4px 8px;margin-top:6px}"
    "</style>"
)


def _text(value: Any) -> str:
    """One cell as text: numbers to engineering significant figures, blanks for missing."""
    if value is None or value is pd.NA:
        return ""
    if isinstance(value, float):
        return "–" if value != value else format_number(value)
    return str(value)


def _table(frame: pd.DataFrame) -> str:
    """An escaped HTML table; numeric columns right-aligned."""
    numeric = {c for c in frame.columns if pd.api.types.is_float_dtype(frame[c])}
    head = "".join(f"<th>{html.escape(str(c))}</th>" for c in frame.columns)
    rows = []
    for record in frame.itertuples(index=False):
        cells = "".join(
            f'<td class="num">{html.escape(_text(v))}</td>'
            if c in numeric
            else f"<td>{html.escape(_text(v))}</td>"
            for c, v in zip(frame.columns, record, strict=True)
        )
        rows.append(f"<tr>{cells}</tr>")
    return f"<table><thead><tr>{head}</tr></thead><tbody>{''.join(rows)}</tbody></table>"


def _size_text(dims: Any, units: str) -> str:
    if not isinstance(dims, dict):
        return "–"
    return " ".join(f"{k}={format_number(v)}" for k, v in dims.items()) + f" {LENGTH_UNIT[units]}"


def _short_names(selection: Any, ids: pd.Series, names: pd.Series) -> list[str]:
    """Each class's short name from the table (its full name where it has none)."""
    table = selection.table
    if "short_name" not in table:
        return list(names)
    short = dict(zip(table["id"], table["short_name"], strict=True))
    return [short.get(i) or n for i, n in zip(ids, names, strict=True)]


def shortlist_view(selection: Any, units: str, rows: int = NOTEBOOK_ROWS) -> pd.DataFrame:
    """The first ``rows`` of the shortlist with the columns a notebook has room for."""
    frame = selection_frame(selection, units).head(rows)
    index_col = column_headers(selection, units)[columns.INDEX]
    out = pd.DataFrame(
        {
            "rank": [
                f"{int(r)}{'*' if c else ''}"
                for r, c in zip(frame["rank"], frame["close_to_leader"], strict=True)
            ],
            "class": _short_names(selection, frame["id"], frame["name"]),
            "family": frame["family"],
            index_col: frame[index_col].astype(float),
        }
    )
    if selection.has_sizes:
        out["size"] = [_size_text(d, units) for d in frame["dimensions"]]
        for col in sized_value_headers(selection, units):
            out[col] = frame[col].astype(float)
        out["governing"] = frame["governing"].fillna("–")
    return out


def _governing_line(selection: Any, shown: pd.DataFrame) -> str:
    """Which constraint sets the size of the parts shown (sized selections only)."""
    if not selection.has_sizes or shown.empty:
        return ""
    counts = Counter(g for g in shown["governing"] if g != "–")
    if not counts:
        return ""
    parts = ", ".join(f"{name} for {n}" for name, n in counts.most_common())
    return f"governing constraint of the {len(shown)} shown: {parts}"


def _pairs_view(selection: Any, units: str, rows: int) -> pd.DataFrame:
    from selector.outputs.sandwich_tables import pairs_frame

    frame = pairs_frame(selection, units, rows)
    numbers = [c for c in frame.columns if "[" in c]
    out = pd.DataFrame(
        {
            "rank": frame["rank"],
            "face": _short_names(selection, frame["face"], frame["face_name"]),
            "core": _short_names(selection, frame["core"], frame["core_name"]),
        }
    )
    return pd.concat([out, frame[numbers], frame[["governing"]]], axis=1)


def _sandwich_html(selection: Any, units: str, rows: int) -> list[str]:
    """The best pairs, the modes that govern them and the line for solid parts."""
    result = selection.sandwich
    pairs = _pairs_view(selection, units, rows)
    parts = [
        f"<p>{len(result.feasible)} face × core pairs ranked by {html.escape(result.loads.objective)}; "
        f"showing the first {len(pairs)}</p>",
        _table(pairs),
    ]
    governing = Counter(pairs["governing"])
    if governing:
        text = ", ".join(f"{k} for {n}" for k, n in governing.most_common())
        parts.append(f"<p>governing mode of the pairs shown: {html.escape(text)}</p>")
    parts.append("<p><strong>solid parts for the same spec</strong></p>")
    return parts


def selection_html(selection: Any, units: str | None = None, rows: int = NOTEBOOK_ROWS) -> str:
    """The Selection as one HTML fragment for a notebook cell (everything escaped)."""
    units = units or selection.spec.units
    parts = [_STYLE, '<div class="selector-view">', f"<h4>{html.escape(selection.spec.title)}</h4>"]
    if selection.sandwich is not None:
        parts += _sandwich_html(selection, units, rows)
    shown = shortlist_view(selection, units, rows)
    ranked = f"{selection.ranked_by} of the sized part" if selection.sized else "merit index"
    parts.append(
        f"<p>merit index (maximise): M = {html.escape(selection.index_text)}<br>"
        f"{len(selection.shortlist)} candidates ranked by {html.escape(ranked)}, "
        f"{len(selection.rejected)} rejected; showing the first {len(shown)}</p>"
    )
    parts.append(_table(shown))
    line = _governing_line(selection, shown)
    if line:
        parts.append(f"<p>{html.escape(line)}</p>")
    if any(shown["rank"].str.endswith("*")):
        parts.append("<p>* its range overlaps the leader's: too close to call</p>")
    if selection.notes:
        items = "".join(f"<li>{html.escape(n)}</li>" for n in selection.notes)
        parts.append(f"<details><summary>notes ({len(selection.notes)})</summary><ul>{items}</ul></details>")
    parts.append(f'<p class="caution"><strong>Caution:</strong> {html.escape(selection.caution)}</p>')
    parts.append("</div>")
    return "".join(parts)


def selection_chart(selection: Any, x: str | None = None, y: str | None = None, **options: Any) -> Any:
    """The Selection's chart as a plotly figure.

    With ``x`` and ``y`` (property symbols or expressions) the property chart of those axes;
    without them, the index's own axes, or the face × core chart for a sandwich.
    ``options`` go to ``charts.chart_for_selection`` (units, index, through, at, top, title).
    """
    if selection.sandwich is not None and x is None and y is None and not options:
        from selector.outputs.charts.sandwich import pairs_chart

        return pairs_chart(selection)
    from selector.outputs.charts import chart_for_selection

    return chart_for_selection(selection, x, y, **options)


__all__ = ["NOTEBOOK_ROWS", "selection_chart", "selection_html", "shortlist_view"]

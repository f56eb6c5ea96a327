"""The classes drawn on a chart: gathered in display units, with hover text; boxes and markers."""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np
import pandas as pd
import plotly.graph_objects as go

from selector.inputs.properties import FAMILIES
from selector.outputs.charts.markup import _esc
from selector.outputs.charts.style import (
    _STATUS_TEXT,
    FAMILY_COLOURS,
    FAMILY_SYMBOLS,
    MAX_REASONS,
    REJECTED_GREY,
)
from selector.pipeline.screen import PASSES, REJECTED


@dataclass(frozen=True)
class _Classes:
    """The drawable classes of one chart, in display units."""

    ids: list[str]
    names: list[str]
    families: list[str]
    status: list[str]
    hover: list[str]
    x_low: np.ndarray
    x_high: np.ndarray
    x_mid: np.ndarray
    y_low: np.ndarray
    y_high: np.ndarray
    y_mid: np.ndarray


def _hover(
    name: str, family: str, status: str, reasons: Sequence[str], rank: float | None, ranges: Sequence[str]
) -> str:
    lines = [f"<b>{_esc(name)}</b>", f"{_esc(family)} · {_STATUS_TEXT.get(status, _esc(status))}"]
    if rank is not None and np.isfinite(rank):
        lines[1] += f" · rank {int(rank)}"
    lines += list(ranges)
    shown = [_esc(r) for r in reasons[:MAX_REASONS]]
    if len(reasons) > MAX_REASONS:
        shown.append(f"… and {len(reasons) - MAX_REASONS} more")
    lines += shown
    return "<br>".join(lines)


def _column(table: pd.DataFrame, name: str, default: Any) -> list:
    return table[name].tolist() if name in table.columns else [default] * len(table)


def _reason_list(value: Any) -> list[str]:
    if isinstance(value, list | tuple):
        return [str(v) for v in value]
    if isinstance(value, str) and value:
        return [value]
    return []


def _gather(
    table: pd.DataFrame,
    x: tuple[np.ndarray, np.ndarray, np.ndarray],
    y: tuple[np.ndarray, np.ndarray, np.ndarray],
    x_log: bool,
    y_log: bool,
    x_hover: tuple[str, list[str]],
    y_hover: tuple[str, list[str]],
) -> tuple[_Classes, list[str]]:
    """The drawable classes and the ids of those that cannot be drawn (no data, or ≤ 0 on a log axis).

    ``x_hover`` and ``y_hover`` are each axis's label and every class's range as hover text.
    """
    ids = (
        [str(v) for v in _column(table, "id", "")] if "id" in table.columns else [str(i) for i in table.index]
    )
    names = [str(v) for v in _column(table, "name", "")]
    names = [n or i for n, i in zip(names, ids, strict=True)]
    families = [str(v) for v in _column(table, "family", "")]
    status = [str(v) for v in _column(table, "status", PASSES)]
    reasons = [_reason_list(v) for v in _column(table, "reasons", [])]
    ranks = [float(v) if v is not None and not pd.isna(v) else None for v in _column(table, "rank", None)]
    ok = np.ones(len(table), dtype=bool)
    for (low, high, mid), log in ((x, x_log), (y, y_log)):
        ok &= np.isfinite(low) & np.isfinite(high) & np.isfinite(mid)
        if log:
            with np.errstate(invalid="ignore"):
                ok &= low > 0
    keep = np.flatnonzero(ok)
    hover = [
        _hover(
            names[i],
            families[i],
            status[i],
            reasons[i],
            ranks[i],
            (
                f"{x_hover[0]}: {x_hover[1][i]}",
                f"{y_hover[0]}: {y_hover[1][i]}",
            ),
        )
        for i in keep
    ]
    classes = _Classes(
        [ids[i] for i in keep],
        [names[i] for i in keep],
        [families[i] for i in keep],
        [status[i] for i in keep],
        hover,
        x[0][keep],
        x[1][keep],
        x[2][keep],
        y[0][keep],
        y[1][keep],
        y[2][keep],
    )
    return classes, [ids[i] for i in np.flatnonzero(~ok)]


def _rgba(colour: str, alpha: float) -> str:
    r, g, b = (int(colour[i : i + 2], 16) for i in (1, 3, 5))
    return f"rgba({r}, {g}, {b}, {alpha})"


def _family_order(families: Sequence[str]) -> list[str]:
    known = [f for f in FAMILIES if f in families]
    return known + sorted(set(families) - set(FAMILIES))


def _box_path(x0: np.ndarray, x1: np.ndarray, y0: np.ndarray, y1: np.ndarray) -> tuple[list, list]:
    """Closed rectangles separated by None (one segment, hence one drawn path, per box)."""
    xs: list = []
    ys: list = []
    for a, b, c, d in zip(x0.tolist(), x1.tolist(), y0.tolist(), y1.tolist(), strict=True):
        xs += [a, b, b, a, a, None]
        ys += [c, c, d, d, c, None]
    return xs[:-1], ys[:-1]


def _draw_classes(fig: go.Figure, classes: _Classes) -> None:
    """Boxes (one filled trace per family and status colour) and markers (one trace per family)."""
    fams = np.asarray(classes.families, dtype=object)
    rejected = np.asarray(classes.status, dtype=object) == REJECTED
    order = _family_order(classes.families)
    for faded in (True, False):
        for family in order:
            picked = np.flatnonzero((fams == family) & (rejected == faded))
            if not len(picked):
                continue
            colour = REJECTED_GREY if faded else FAMILY_COLOURS.get(family, "#444444")
            xs, ys = _box_path(
                classes.x_low[picked], classes.x_high[picked], classes.y_low[picked], classes.y_high[picked]
            )
            fig.add_trace(
                go.Scatter(
                    x=xs,
                    y=ys,
                    mode="lines",
                    fill="toself",
                    fillcolor=_rgba(colour, 0.07 if faded else 0.22),
                    line={"color": _rgba(colour, 0.35 if faded else 0.85), "width": 0.8},
                    hoverinfo="skip",
                    showlegend=False,
                    legendgroup=_esc(family),
                    name=f"{_esc(family)} ranges",
                    uid=f"box-{'rejected' if faded else 'live'}-{len(fig.data)}",
                    meta={
                        "role": "boxes",
                        "family": _esc(family),
                        "rejected": faded,
                        "count": len(picked),
                        "ids": [_esc(classes.ids[i]) for i in picked],
                    },
                )
            )
    for family in order:
        members = np.flatnonzero(fams == family)
        members = members[np.argsort(rejected[members], kind="stable")]  # live first: the legend shows them
        colour = FAMILY_COLOURS.get(family, "#444444")
        faded = rejected[members]
        fig.add_trace(
            go.Scatter(
                x=classes.x_mid[members].tolist(),
                y=classes.y_mid[members].tolist(),
                mode="markers",
                marker={
                    "color": [REJECTED_GREY if f else colour for f in faded],
                    "size": [6 if f else 8 for f in faded],
                    "opacity": [0.6 if f else 1.0 for f in faded],
                    "symbol": FAMILY_SYMBOLS.get(family, "circle"),
                    "line": {"color": "#333333", "width": [0.3 if f else 0.7 for f in faded]},
                },
                text=[classes.hover[i] for i in members],
                hovertemplate="%{text}<extra></extra>",
                customdata=[_esc(classes.ids[i]) for i in members],
                name=f"{_esc(family)} ({len(members)})",
                legendgroup=_esc(family),
                uid=f"mark-{len(fig.data)}",
                meta={
                    "role": "markers",
                    "family": _esc(family),
                    "ids": [_esc(classes.ids[i]) for i in members],
                    "rejected": [bool(f) for f in faded],
                },
            )
        )

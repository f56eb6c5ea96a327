"""Shortlist labels: rings, names and leader lines placed where they overlap least."""

from __future__ import annotations

import math
from collections.abc import Sequence

import numpy as np
import plotly.graph_objects as go

from selector.outputs.charts.axes import _log_or_linear
from selector.outputs.charts.classes import _Classes
from selector.outputs.charts.markup import _esc, _plain, _short
from selector.outputs.charts.style import SHORTLIST_COLOUR

PLOT_PIXELS = (900.0, 600.0)
"""Typical plot-area size in pixels, used only to estimate how much room a label takes."""


def _label_box(centre: tuple[float, float], size: tuple[float, float]) -> tuple[float, float, float, float]:
    (cx, cy), (w, h) = centre, size
    return cx - w / 2, cx + w / 2, cy - h / 2, cy + h / 2


def _overlap(a: tuple[float, float, float, float], b: tuple[float, float, float, float]) -> bool:
    return a[0] < b[1] and b[0] < a[1] and a[2] < b[3] and b[2] < a[3]


def place_labels(
    anchors: Sequence[tuple[float, float]],
    chars: Sequence[int],
    crowd: np.ndarray,
    avoid: Sequence[tuple[float, float, float, float]] = (),
) -> list[tuple[float, float]]:
    """Centres for labels beside anchor points, all in plot fractions (0–1 on both axes).

    Greedy, in the order given: each label takes the nearby spot that overlaps no label
    placed before it, no other anchor and no ``avoid`` box (x0, x1, y0, y1), and covers the
    fewest crowd points (N×2 array).
    """
    directions = [(math.cos(t), math.sin(t)) for t in np.radians([30, 150, 330, 210, 90, 270, 0, 180])]
    placed: list[tuple[float, float, float, float]] = []
    centres: list[tuple[float, float]] = []
    height = 22.0 / PLOT_PIXELS[1]
    for n, ((ax, ay), count) in enumerate(zip(anchors, chars, strict=True)):
        size = ((7.0 * count + 14.0) / PLOT_PIXELS[0], height)
        others = [_label_box(p, (0.03, 0.045)) for k, p in enumerate(anchors) if k != n]
        best, best_cost = (ax, ay + 0.08), math.inf
        for distance in (0.06, 0.1, 0.15, 0.21):
            for dx, dy in directions:
                centre = (ax + dx * (distance + size[0] / 2), ay + dy * (distance + size[1] / 2))
                rect = _label_box(centre, size)
                if rect[0] < 0.005 or rect[1] > 0.995 or rect[2] < 0.005 or rect[3] > 0.995:
                    continue
                cost = 3.0 * distance
                cost += 100.0 * sum(_overlap(rect, r) for r in placed)
                cost += 20.0 * sum(_overlap(rect, r) for r in others)
                cost += 10.0 * sum(_overlap(rect, r) for r in avoid)
                if len(crowd):
                    inside = (crowd[:, 0] > rect[0]) & (crowd[:, 0] < rect[1])
                    inside &= (crowd[:, 1] > rect[2]) & (crowd[:, 1] < rect[3])
                    cost += 0.6 * float(inside.sum())
                if cost < best_cost:
                    best, best_cost = centre, cost
        placed.append(_label_box(best, size))
        centres.append(best)
    return centres


def _annotation_boxes(
    fig: go.Figure, box: tuple[float, float, float, float]
) -> list[tuple[float, float, float, float]]:
    """Estimated extents (plot fractions) of the text labels already on the plot."""
    u0, u1, v0, v1 = box
    out: list[tuple[float, float, float, float]] = []
    for note in fig.layout.annotations:
        if note.xref not in (None, "x") or note.yref not in (None, "y") or note.x is None or note.y is None:
            continue
        w = (7.0 * len(_plain(note.text or "")) + 10.0) / PLOT_PIXELS[0]
        h = 20.0 / PLOT_PIXELS[1]
        fx, fy = (note.x - u0) / (u1 - u0), (note.y - v0) / (v1 - v0)
        x0 = {"left": fx, "right": fx - w}.get(note.xanchor or "center", fx - w / 2)
        y0 = {"bottom": fy, "top": fy - h}.get(note.yanchor or "middle", fy - h / 2)
        out.append((x0, x0 + w, y0, y0 + h))
    return out


def _fraction(values: np.ndarray, lo: float, hi: float, log: bool) -> np.ndarray:
    return (_log_or_linear(np.asarray(values, dtype=float), log) - lo) / (hi - lo)


def _label_shortlist(
    fig: go.Figure,
    classes: _Classes,
    ids: Sequence[str],
    x_log: bool,
    y_log: bool,
    box: tuple[float, float, float, float],
) -> list[str]:
    """Ring and name the highlighted classes, in the order given; returns the ids labelled."""
    where = {cid: i for i, cid in enumerate(classes.ids)}
    picked = [where[c] for c in ids if c in where]
    if not picked:
        return []
    fig.add_trace(
        go.Scatter(
            x=[float(classes.x_mid[i]) for i in picked],
            y=[float(classes.y_mid[i]) for i in picked],
            mode="markers",
            marker={"symbol": "circle-open", "size": 17, "color": SHORTLIST_COLOUR, "line": {"width": 2.2}},
            hoverinfo="skip",
            name=f"shortlist, top {len(picked)}",
            legendgroup="shortlist",
            uid="shortlist",
            meta={"role": "shortlist", "ids": [_esc(classes.ids[i]) for i in picked]},
        )
    )
    u0, u1, v0, v1 = box
    fx = _fraction(classes.x_mid, u0, u1, x_log)
    fy = _fraction(classes.y_mid, v0, v1, y_log)
    texts = [_short(classes.names[i]) for i in picked]
    centres = place_labels(
        [(float(fx[i]), float(fy[i])) for i in picked],
        [len(t) + 2 for t in texts],
        np.column_stack([fx, fy]),
        _annotation_boxes(fig, box),
    )
    for n, (i, text, (cx, cy)) in enumerate(zip(picked, texts, centres, strict=True)):
        fig.add_annotation(
            x=float(_log_or_linear(classes.x_mid[i], x_log)),
            y=float(_log_or_linear(classes.y_mid[i], y_log)),
            ax=u0 + cx * (u1 - u0),
            ay=v0 + cy * (v1 - v0),
            axref="x",
            ayref="y",
            text=f"<b>{n + 1}</b> {_esc(text)}",
            showarrow=True,
            arrowhead=0,
            arrowwidth=1,
            arrowcolor="#222222",
            standoff=8,
            font={"size": 12, "color": "#111111"},
            bgcolor="rgba(255, 255, 255, 0.9)",
            bordercolor="#222222",
            borderwidth=0.6,
            borderpad=2,
            name=f"shortlist-{n + 1}",
        )
    return [classes.ids[i] for i in picked]


def _note_skipped(fig: go.Figure, skipped: Sequence[str], why: str) -> None:
    if not skipped:
        return
    shown = ", ".join(_esc(s) for s in skipped[:5]) + (" …" if len(skipped) > 5 else "")
    fig.add_annotation(
        xref="paper",
        yref="paper",
        x=0,
        y=-0.13,
        xanchor="left",
        yanchor="top",
        showarrow=False,
        text=f"Not shown ({why}): {len(skipped)} class{'es' if len(skipped) != 1 else ''} — {shown}",
        font={"size": 11, "color": "#555555"},
        name="not-shown",
    )

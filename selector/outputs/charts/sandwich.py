"""The sandwich pairs chart: face classes against core classes, each cell coloured by the objective."""

from __future__ import annotations

import textwrap
from typing import Any

import numpy as np
import plotly.graph_objects as go

from selector.outputs.charts.markup import _esc


def pairs_chart(selection: Any) -> go.Figure:
    """A face × core grid of the sized pairs, coloured by the objective (log scale), best pair marked.

    Pairs that cannot meet every mode are left blank. Reads ``selection.sandwich``; computes nothing.
    """
    result = selection.sandwich
    pairs = result.pairs
    faces = list(dict.fromkeys(pairs.sort_values("objective")["face_name"]))
    cores = list(dict.fromkeys(pairs.sort_values("objective")["core_name"]))
    grid = pairs.pivot_table(index="face_name", columns="core_name", values="objective", aggfunc="first")
    grid = grid.reindex(index=faces, columns=cores)
    values = grid.to_numpy(dtype=float)
    shown = np.where(np.isfinite(values), np.log10(values), np.nan)
    lookup = pairs.set_index(["face_name", "core_name"])
    text = [
        [_hover(lookup.loc[(f, c)], result.objective_unit) if (f, c) in lookup.index else "" for c in cores]
        for f in faces
    ]
    fig = go.Figure(
        go.Heatmap(
            z=shown,
            x=cores,
            y=faces,
            text=text,
            hoverinfo="text",
            colorscale="Viridis",
            colorbar={"title": f"log10 {result.loads.objective} [{result.objective_unit}]"},
        )
    )
    best = result.feasible.head(1)
    if len(best):
        fig.add_trace(
            go.Scatter(
                x=[best["core_name"].iloc[0]],
                y=[best["face_name"].iloc[0]],
                mode="markers",
                marker={"symbol": "circle-open", "size": 16, "color": "#ffffff", "line": {"width": 3}},
                name="best pair",
                hoverinfo="skip",
            )
        )
    fig.update_layout(
        title=_esc(f"{selection.spec.title}: face × core pairs by {result.loads.objective}"),
        xaxis_title="core",
        yaxis_title="face",
        yaxis={"autorange": "reversed"},
        template="plotly_white",
        annotations=[
            {
                "text": "<br>".join(_esc(line) for line in textwrap.wrap(selection.caution, 100)),
                "xref": "paper",
                "yref": "paper",
                "x": 0,
                "y": 1,
                "xanchor": "left",
                "yanchor": "bottom",
                "yshift": 6,
                "showarrow": False,
                "font": {"size": 10},
            }
        ],
        # the caution sits between the title and the grid, clear of the tilted core names
        margin={"t": 110},
    )
    return fig


def _hover(row: Any, unit: str) -> str:
    if not row["feasible"]:
        return _esc(f"{row.name[0]} on {row.name[1]}: cannot meet every mode")
    return "<br>".join(
        _esc(line)
        for line in (
            f"{row.name[0]} on {row.name[1]}",
            f"t_face {row['t_face'] * 1e3:.3g} mm, t_core {row['t_core'] * 1e3:.3g} mm",
            f"{row['objective']:.3g} {unit}; {row['governing']} governs",
        )
    )

"""The explorer's page: its controls and the views of a Selection (shortlist, derivation, class data)."""

from __future__ import annotations

import math
import re
from collections.abc import Mapping
from typing import Any

import numpy as np
import pandas as pd
from dash import dcc, html

from selector.inputs.properties import FAMILIES, PROPERTIES
from selector.inputs.spec import Spec
from selector.inputs.units import format_number
from selector.outputs.explore.state import (
    EDITABLE,
    SCREEN_ROWS,
    Controls,
    ScreenRow,
    Start,
    _case,
    _stiffness_field,
    sync_screen,
)
from selector.pipeline import columns

_FORMULA = re.compile(
    r"\^\((?P<group>[^()]{1,40})\)|\^(?P<number>-?[0-9]+(?:\.[0-9]+)?)|(?<=[A-Za-zα-ωΑ-Ω])_(?P<sub>[A-Za-z0-9]{1,6})"
)


def formula(text: str) -> list[Any]:
    """Formula text as page pieces: ``x^(1/2)`` and ``x^3`` raised, ``δ_max`` lowered."""
    out: list[Any] = []
    at = 0
    for match in _FORMULA.finditer(text):
        if match.start() > at:
            out.append(text[at : match.start()])
        if match.group("sub") is not None:
            out.append(html.Sub(match.group("sub")))
        else:
            out.append(html.Sup(match.group("group") or match.group("number")))
        at = match.end()
    if at < len(text):
        out.append(text[at:])
    return out


def _number(value: Any, digits: int = 3) -> str:
    try:
        v = float(value)
    except (TypeError, ValueError):
        return "" if value is None else str(value)
    return "–" if math.isnan(v) else format_number(v, digits)


def _pick_button(class_id: str, label: str) -> Any:
    return html.Button(label, id={"type": "pick", "id": class_id}, className="pick", n_clicks=0)


def shortlist_view(selection: Any, units: str) -> Any:
    """The shortlist as a table (sizes where the spec has loads), the rejected classes, the caution."""
    from selector.outputs.tables import (
        LENGTH_UNIT,
        column_headers,
        selection_frame,
        sized_value_headers,
        split_header,
    )

    frame = selection_frame(selection, units)
    index_col = column_headers(selection, units)[columns.INDEX]
    unit = split_header(index_col)[1]
    value_cols = sized_value_headers(selection, units)
    head = ["rank", "class", "family", "status", f"index ({unit})"]
    if selection.has_sizes:
        head += [f"size ({LENGTH_UNIT[units]})", *value_cols, "governing"]
    head.append("notes")
    rows = []
    for r in frame.to_dict(orient="records"):
        rank = f"{int(r['rank'])}{' *' if r['close_to_leader'] else ''}"
        cells: list[Any] = [rank, _pick_button(r["id"], r["name"]), r["family"], r["status"]]
        cells.append(_number(r[index_col]))
        notes = list(r["reasons"])
        if selection.has_sizes:
            dims = r["dimensions"] if isinstance(r["dimensions"], dict) else {}
            sizes = [html.Div(f"{k} = {_number(v)}", className="nowrap") for k, v in dims.items()]
            cells.append(sizes or "–")
            cells += [_number(r[col]) for col in value_cols]
            cells.append(r["governing"] if isinstance(r["governing"], str) else "–")
            notes += list(r["warnings"]) if isinstance(r["warnings"], list) else []
        tds = [html.Td(cell) for cell in cells]
        tds.append(html.Td("; ".join(notes), className="notes"))
        rows.append(html.Tr(tds, **{"data-id": r["id"]}))
    table = html.Table(
        [html.Thead(html.Tr([html.Th(h) for h in head])), html.Tbody(rows)],
        id="shortlist-table",
        className="grid",
    )
    rejected = selection.rejected
    rejected_items = [
        html.Li([_pick_button(r.id, r.name), f" ({r.family}): " + "; ".join(r.reasons)])
        for r in rejected[["id", "name", "family", "reasons"]].itertuples(index=False)
    ]
    return [
        html.Div(table, className="scroll"),
        html.P("* the index range overlaps the leader's: too close to call", className="small"),
        html.Details(
            [html.Summary(f"Rejected classes ({len(rejected)})"), html.Ul(rejected_items)],
            id="rejected",
        ),
        html.Ul([html.Li(n) for n in selection.notes], className="small") if selection.notes else None,
        html.P(["Caution: ", selection.caution], className="caution"),
    ]


def summary_view(selection: Any) -> Any:
    ranked = f"{selection.ranked_by} of the sized part" if selection.sized else "merit index"
    return [
        html.Strong(f"{len(selection.shortlist)} candidates"),
        f" ranked by {ranked}; {len(selection.rejected)} rejected. Merit index (maximise): M = ",
        *formula(selection.index_text),
    ]


def derivation_view(selection: Any) -> Any:
    """The merit index and the algebra that led to it, one block per constraint."""
    parts: list[Any] = []
    if selection.expression is not None:
        parts.append(html.P(["Ranked by the typed index M = ", *formula(selection.expression)]))
    for d in selection.derivations:
        parts.append(
            html.Div(
                [
                    html.H3(
                        [f"{d.constraint} constraint, minimise {d.objective}: M = ", *formula(d.index_text)]
                    ),
                    html.P(f"{d.case.title}; free variable: {d.geometry.free}", className="small"),
                    html.Ol([html.Li(formula(step)) for step in d.steps]),
                ],
                className="derivation",
            )
        )
    return parts


def class_view(start: Start, selection: Any, class_id: str | None, units: str) -> Any:
    """One class: its status in this run, every property's range and the sources of the data."""
    from selector.outputs.report import provenance
    from selector.outputs.tables import class_frame

    if not class_id:
        return html.P("Click a class on the chart or in the shortlist to see its data.", className="small")
    data = class_frame(start.table, class_id, units)
    row = start.table[start.table["id"] == class_id]
    head: list[Any] = [html.H3(str(row["name"].iat[0]), id="class-name"), html.P(str(row["family"].iat[0]))]
    if selection is not None:
        mine = selection.table[selection.table["id"] == class_id]
        if not mine.empty:
            status = str(mine["status"].iat[0])
            rank = mine["rank"].iat[0]
            line = status + (f", rank {int(rank)}" if pd.notna(rank) else "")
            head.append(html.P(line, id="class-status"))
            reasons = list(mine["reasons"].iat[0])
            if reasons:
                head.append(html.Ul([html.Li(r) for r in reasons], className="small"))
    properties = []
    texts = []
    for r in data.to_dict(orient="records"):
        name = str(r["property"])
        if name in ("name", "family"):
            continue
        if r["unit"] == "" and r["high"] == "":
            texts.append(html.Tr([html.Th(name), html.Td(str(r["low"]), colSpan=3)]))
            continue
        low, high = _number(r["low"]), _number(r["high"])
        shown = low if low == high else f"{low} – {high}"
        properties.append(html.Tr([html.Th(name), html.Td(shown), html.Td(r["unit"])]))
    known = provenance(row)
    sources = [html.Li([html.Code(k), f": {text}"]) for k, text in known.sources]
    sources += [html.Li(f"{file}: {text}") for file, _, text in known.user_sources]
    sources += [html.Li([html.Code(k), ": not described in the data notes"]) for k in known.unknown]
    return [
        *head,
        html.Table(
            [
                html.Thead(html.Tr([html.Th("property"), html.Th("range"), html.Th("unit")])),
                html.Tbody(properties + texts),
            ],
            id="class-table",
            className="grid small",
        ),
        html.H4("Sources"),
        html.Ul(sources, id="class-sources", className="small"),
    ]


# --------------------------------------------------------------------------- layout


def _message(key: str) -> Any:
    return html.Div(id=f"msg-{key}", className="msg", role="alert")


def _field(label: str, control: Any, key: str | None, hint: str | None = None) -> Any:
    parts = [html.Label(label, className="label"), control]
    if hint:
        parts.append(html.Div(hint, className="hint"))
    if key:
        parts.append(_message(key))
    return html.Div(parts, className="field")


MAX_MARKS = 6
"""At most this many (plus one) labelled marks under a slider."""


def _decade(k: int) -> str:
    """The label of 10^k under a log slider: 0.01, 1, 1000, 1e5."""
    return format_number(10.0**k) if -2 <= k <= 4 else f"1e{k}"


def slider_scale(table: pd.DataFrame, symbol: str) -> dict[str, Any]:
    """Slider bounds and marks spanning the table's values (decades of log10 on a log property)."""
    prop = PROPERTIES[symbol]
    low = table[prop.low].to_numpy(dtype=float)
    high = table[prop.high].to_numpy(dtype=float)
    lo, hi = float(np.nanmin(low)), float(np.nanmax(high))
    if prop.log:
        lo = math.floor(math.log10(max(lo, 1e-12)))
        hi = math.ceil(math.log10(max(hi, 1e-12)))
        every = max(1, math.ceil((hi - lo) / MAX_MARKS))
        marks = {k: _decade(k) for k in range(lo, hi + 1, every)}
        return {"min": lo, "max": hi, "step": 0.01, "marks": marks}
    lo, hi = 100 * math.floor(lo / 100), 100 * math.ceil(hi / 100)
    span = hi - lo
    every = next((s for s in (100, 250, 500, 1000, 2500) if span / s <= MAX_MARKS), 5000)
    first = every * math.ceil(lo / every)
    marks = {v: format_number(v) for v in range(int(first), int(hi) + 1, every)}
    return {"min": lo, "max": hi, "step": 1, "marks": marks}


def _slider_value(symbol: str, op: str, text: str, scale: Mapping[str, Any]) -> float:
    """Where a screen's slider starts: at its value, else at the end that rejects nothing."""
    value = sync_screen(symbol, "text", None, text, op)[1]
    if value is None:
        return scale["max"] if op == "<=" else scale["min"]
    return min(max(value, scale["min"]), scale["max"])


def _screen_row(start: Start, row: ScreenRow, op: str, text: str) -> Any:
    prop = PROPERTIES[row.symbol]
    scale = slider_scale(start.table, row.symbol)
    return html.Div(
        [
            html.Label(
                [f"{prop.name.capitalize()} ({row.symbol})", html.Span(f" {prop.label}", className="hint")],
                className="label",
            ),
            html.Div(
                [
                    dcc.RadioItems(
                        id=f"op-{row.symbol}",
                        options={">=": "≥", "<=": "≤"},
                        value=op,
                        inline=True,
                        className="op",
                    ),
                    dcc.Input(
                        id=f"screen-{row.symbol}",
                        value=text,
                        type="text",
                        debounce=True,
                        placeholder="no screen",
                        className="value",
                    ),
                ],
                className="inline",
            ),
            _message(row.key),
            dcc.Slider(
                id=f"slider-{row.symbol}",
                value=_slider_value(row.symbol, op, text, scale),
                updatemode="mouseup",
                allow_direct_input=False,
                **scale,
            ),
        ],
        className="field screen",
    )


def _part_text(spec: Spec) -> str:
    part = spec.part
    words = [part.function]
    words += [w for w in (part.support, f"{part.load} load" if part.load else None) if w]
    loads = [
        f"{name} {getattr(part, name)}"
        for name in ("length", "force", "torque", "pressure", "energy", "width", "radius")
        if getattr(part, name)
    ]
    dims = ", ".join(f"{k} {v}" for k, v in spec.section.dims.items())
    section = f"section: {spec.section.shape}" + (f" ({dims})" if dims else "")
    return "; ".join([", ".join(words), *([", ".join(loads)] if loads else []), section])


def layout(start: Start, c: Controls) -> Any:
    """The page: requirement and screens on the left; chart, shortlist, index and class data."""
    from selector.mechanics.objectives import OBJECTIVES

    spec = start.spec
    case = _case(start)
    kept = {k: v for k, v in spec.screen.items() if k not in EDITABLE}
    kept_text = [html.Li(f"{k} {', '.join(v) if isinstance(v, list) else v}") for k, v in kept.items()]
    stiff_label = "Max twist (stiffness)" if _stiffness_field(start) == "max_twist" else "Max deflection"
    requirement = html.Section(
        [
            html.H2("Requirement"),
            html.P(_part_text(spec), className="small"),
            _field(
                "Minimise",
                dcc.Dropdown(id="objective", options=list(OBJECTIVES), value=c.objective, clearable=False),
                "objective",
            ),
            _field(
                "Constraints",
                dcc.Checklist(
                    id="constraints", options=list(case.constraints), value=list(c.constraints), inline=True
                ),
                "constraints",
            ),
            _field(
                stiff_label,
                dcc.Input(id="stiffness-limit", value=c.stiffness_limit, debounce=True, type="text"),
                "stiffness_limit",
            ),
            _field(
                "Safety factor on strength",
                dcc.Input(id="safety-factor", value=c.safety_factor, debounce=True, type="text"),
                "safety_factor",
            ),
            _field(
                "Free variable",
                dcc.Dropdown(id="free", options=list(case.allowed_free), value=c.free, clearable=False),
                "free",
            ),
            _field(
                "Rank by a typed index",
                dcc.Input(
                    id="index", value=c.index, debounce=True, type="text", placeholder="the derived one"
                ),
                "index",
                "e.g. E^(1/3)/rho; empty ranks by the derived index",
            ),
            _field(
                "Units",
                dcc.RadioItems(
                    id="units", options={"si": "SI", "us": "US customary"}, value=c.units, inline=True
                ),
                "units",
            ),
        ]
    )
    screens = html.Section(
        [
            html.H2("Screens"),
            *[
                _screen_row(start, row, op, text)
                for row, (op, text) in zip(SCREEN_ROWS, c.screens, strict=True)
            ],
            _field(
                "Families",
                dcc.Checklist(id="families", options=list(FAMILIES), value=list(c.families), inline=True),
                "families",
            ),
            html.Div(
                [
                    html.Div("Other screens of the spec (kept as written):", className="label"),
                    html.Ul(kept_text, className="small"),
                ]
            )
            if kept_text
            else None,
        ]
    )
    symbols = html.Datalist(id="symbols", children=[html.Option(value=s) for s in PROPERTIES])
    chart_bar = html.Div(
        [
            _field(
                "x axis", dcc.Input(id="x-axis", value=c.x, list="symbols", debounce=True, type="text"), "x"
            ),
            _field(
                "y axis", dcc.Input(id="y-axis", value=c.y, list="symbols", debounce=True, type="text"), "y"
            ),
            _field(
                "Index line",
                dcc.RadioItems(
                    id="line-mode",
                    options={
                        "leader": "through the leader",
                        "class": "through the chosen class",
                        "value": "at the value",
                    },
                    value=c.line_mode,
                    inline=True,
                ),
                "line",
            ),
            _field(
                "Index value",
                dcc.Input(
                    id="line-value",
                    value=c.line_value,
                    debounce=True,
                    type="text",
                    placeholder="in the chart's units",
                ),
                None,
            ),
        ],
        className="chartbar",
    )
    classes = start.table.sort_values("name")
    class_picker = dcc.Dropdown(
        id="class",
        options=[{"label": n, "value": i} for i, n in zip(classes["id"], classes["name"], strict=True)],
        value=c.chosen,
        placeholder="choose a class",
    )
    downloads = html.Div(
        [
            html.Button("Shortlist CSV", id="get-csv", n_clicks=0),
            html.Button("Shortlist XLSX", id="get-xlsx", n_clicks=0),
            html.Button("Report (HTML)", id="get-report", n_clicks=0),
            dcc.Download(id="download"),
            dcc.Loading(html.Div(id="msg-download", className="msg"), type="dot"),
        ],
        className="downloads",
    )
    main = html.Main(
        [
            symbols,
            chart_bar,
            html.Div(id="msg-general", className="msg"),
            html.Div(
                [
                    dcc.Graph(id="chart", config={"displaylogo": False}, className="chart"),
                    html.Aside(
                        [html.H2("Class"), class_picker, _message("class"), html.Div(id="class-panel")],
                        className="classbox",
                    ),
                ],
                className="chartrow",
            ),
            html.Section(
                [html.H2("Shortlist"), html.P(id="summary"), downloads, html.Div(id="shortlist")],
            ),
            html.Section([html.H2("Merit index"), html.Div(id="derivation")]),
        ]
    )
    header = html.Header(
        [
            html.H1(spec.title),
            html.P(f"{start.name}" + (f" — {spec.notes}" if spec.notes else ""), className="small"),
        ]
    )
    return html.Div([header, html.Div([html.Nav([requirement, screens]), main], className="page")])

"""The explorer's page: its controls and the views of a Selection (shortlist, derivation, class data)."""

from __future__ import annotations

import math
from typing import Any

import pandas as pd
from dash import dcc, html

from selector.inputs.properties import PROPERTIES
from selector.inputs.units import format_number
from selector.outputs.display_units import text_in_units as in_units
from selector.outputs.explore.editor import class_options, editor, field_box, message
from selector.outputs.explore.state import Controls, Start
from selector.outputs.formula import Piece, headline_index_pieces, index_pieces, text_pieces
from selector.pipeline import columns
from selector.pipeline.selection import CAUTION


def formula(pieces: list[Piece] | str) -> list[Any]:
    """Formula pieces (or plain formula text) as page elements: powers raised, subscripts lowered."""
    if isinstance(pieces, str):
        pieces = text_pieces(pieces)
    tags = {"sup": html.Sup, "sub": html.Sub}
    return [run if kind == "text" else tags[kind](run) for kind, run in pieces]


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
        html.Li([_pick_button(r.id, r.name), f" ({r.family}): " + in_units("; ".join(r.reasons), units)])
        for r in rejected[["id", "name", "family", "reasons"]].itertuples(index=False)
    ]
    return [
        html.Div(table, className="scroll"),
        html.P("* the index range overlaps the leader's: too close to call", className="small"),
        html.Details(
            [html.Summary(f"Rejected classes ({len(rejected)})"), html.Ul(rejected_items)],
            id="rejected",
        ),
        html.Ul([html.Li(in_units(n, units)) for n in selection.notes], className="small")
        if selection.notes
        else None,
        html.P(["Caution: ", selection.caution], className="caution"),
    ]


SANDWICH_ROWS = 25
"""Face × core pairs listed on the page (the best first; the downloads hold them all)."""


def sandwich_view(selection: Any, units: str) -> Any:
    """The face × core pairs (best first), the best solid part beside them, and the model's assumptions."""
    from selector.outputs.sandwich_tables import pairs_frame, solid_line

    frame = pairs_frame(selection, units, top=SANDWICH_ROWS)
    lengths = [c for c in frame.columns if c.startswith(("t_face [", "t_core [", "depth ["))]
    values = [c for c in frame.columns if c.startswith(("mass [", "cost [", "co2 ["))]
    head = ["rank", "face", "core", *lengths, *values, "governing", "utilisation"]
    rows = []
    for r in frame.to_dict(orient="records"):
        cells: list[Any] = [str(r["rank"]), r["face_name"], r["core_name"]]
        cells += [_number(r[col]) for col in (*lengths, *values)]
        cells.append(r["governing"])
        cells.append(", ".join(f"{mode} {_number(u, 2)}" for mode, u in r["utilisation"].items()))
        tagged: dict[str, Any] = {"data-pair": f"{r['face']}/{r['core']}"}
        rows.append(html.Tr([html.Td(cell) for cell in cells], **tagged))
    feasible = len(selection.sandwich.feasible)
    return [
        html.H3(f"Sandwich pairs ({feasible} feasible; the best {min(feasible, SANDWICH_ROWS)} shown)"),
        html.Div(
            html.Table(
                [html.Thead(html.Tr([html.Th(h) for h in head])), html.Tbody(rows)],
                id="pairs-table",
                className="grid",
            ),
            className="scroll",
        ),
        html.P(solid_line(selection, units), id="best-solid"),
        html.Ul([html.Li(a) for a in selection.sandwich.assumptions], className="small"),
        html.H3("Solid parts for the same spec"),
    ]


def summary_view(selection: Any) -> Any:
    ranked = f"{selection.ranked_by} of the sized part" if selection.sized else "merit index"
    return [
        html.Strong(f"{len(selection.shortlist)} candidates"),
        f" ranked by {ranked}; {len(selection.rejected)} rejected. Merit index (maximise): M = ",
        *formula(headline_index_pieces(selection)),
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
                        [
                            f"{d.constraint} constraint, minimise {d.objective}: M = ",
                            *formula(index_pieces(d)),
                        ],
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
                head.append(html.Ul([html.Li(in_units(r, units)) for r in reasons], className="small"))
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
    sources = [
        html.Li([html.Code(k), f": {in_units(text, units, quoted=True)}"]) for k, text in known.sources
    ]
    sources += [
        html.Li(f"{file}: {in_units(text, units, quoted=True)}") for file, _, text in known.user_sources
    ]
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


def layout(start: Start, c: Controls) -> Any:
    """The page: the spec editor on the left; chart, shortlist, index and class data."""
    symbols = html.Datalist(id="symbols", children=[html.Option(value=s) for s in PROPERTIES])
    chart_bar = html.Div(
        [
            field_box(
                "x axis", dcc.Input(id="x-axis", value=c.x, list="symbols", debounce=True, type="text"), "x"
            ),
            field_box(
                "y axis", dcc.Input(id="y-axis", value=c.y, list="symbols", debounce=True, type="text"), "y"
            ),
            field_box(
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
            field_box(
                "Index value",
                dcc.Input(
                    id="line-value",
                    value=c.line_value,
                    debounce=True,
                    type="text",
                    placeholder="in the table's unit",
                ),
                None,
            ),
        ],
        className="chartbar",
    )
    class_picker = dcc.Dropdown(
        id="class",
        options=class_options(start),
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
                        [html.H2("Class"), class_picker, message("class"), html.Div(id="class-panel")],
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
    spec = start.spec
    header = html.Header(
        [
            html.H1(spec.title, id="title"),
            html.P(
                f"{start.name}" + (f" — {spec.notes}" if spec.notes else ""),
                id="spec-name",
                className="small",
            ),
            html.P(CAUTION, className="caution-banner"),
        ]
    )
    state = [
        dcc.Location(id="address", refresh=False),
        dcc.Store(id="base"),
        dcc.Store(id="address-state"),
        html.Div(id="address-echo", hidden=True),
    ]
    return html.Div([*state, header, html.Div([html.Nav(editor(start, c)), main], className="page")])

"""The explorer's callbacks as plain functions of (Start, Controls), and their wiring to the page."""

from __future__ import annotations

import json
import math
import re
from collections.abc import Mapping, Sequence
from typing import Any

import dash
from dash import ALL, Input, Output, State, ctx, dcc

from selector.errors import InputError, SelectorError
from selector.outputs.explore.layout import class_view, derivation_view, shortlist_view, summary_view
from selector.outputs.explore.state import (
    LINE_MODES,
    MESSAGE_KEYS,
    SCREEN_ROWS,
    TOP_NAMED,
    Controls,
    Start,
    View,
    _route,
    _run,
    _where,
    sync_screen,
)


def refresh(start: Start, c: Controls) -> View:
    """Run the pipeline for the controls; bad input gives a message beside its control.

    Bad screens, families or requirement keep the last good chart and shortlist on the
    page (those parts of the View are None); a bad axis keeps the chart only; a line
    that cannot be placed is drawn through the leader instead.
    """
    from selector.outputs.charts import axis_spec, chart_for_selection, default_axes
    from selector.pipeline.screen import parse_limit

    messages = dict.fromkeys(MESSAGE_KEYS, "")
    for row, (op, text) in zip(SCREEN_ROWS, c.screens, strict=True):
        if text.strip():
            try:
                parse_limit(row.symbol, f"{op} {text.strip()}")
            except SelectorError as exc:
                messages[row.key] = str(exc)
    if not c.families:
        messages["families"] = "screen.families: no family is chosen; tick at least one family"
    selection = None
    if not any(messages.values()):
        try:
            selection = _run(start, c)
        except SelectorError as exc:
            messages[_route(_where(exc))] = str(exc)
    if selection is None:
        messages["general"] = "Not updated: correct the input marked in red."
        panel = class_view(start, None, c.chosen, c.units) if c.chosen else None
        return View(None, None, None, None, panel, messages)

    exponents = selection.index_exponents
    axes = default_axes(exponents) if exponents else ("rho", "E")
    x, y = c.x.strip() or axes[0], c.y.strip() or axes[1]
    bad_axis = False
    for key, text in (("x", x), ("y", y)):
        try:
            axis_spec(text, c.units, f"{key} axis")
        except SelectorError as exc:
            messages[key] = str(exc)
            bad_axis = True
    figure = None
    if not bad_axis:
        through, at = None, None
        if c.line_mode == "class" and c.chosen:
            through = c.chosen
        elif c.line_mode == "value":
            at = _line_value(c.line_value, messages)
        try:
            figure = chart_for_selection(selection, x, y, c.units, through=through, at=at, top=TOP_NAMED)
        except SelectorError as exc:
            if through is None and at is None:
                messages["general"] = str(exc)
            else:
                messages["line"] = f"{exc}; the line is drawn through the leader instead"
                try:
                    figure = chart_for_selection(selection, x, y, c.units, top=TOP_NAMED)
                except SelectorError as again:
                    messages["general"] = str(again)
    try:
        panel = class_view(start, selection, c.chosen, c.units)
    except SelectorError as exc:
        messages["class"] = str(exc)
        panel = class_view(start, selection, None, c.units)
    return View(
        figure,
        shortlist_view(selection, c.units),
        summary_view(selection),
        derivation_view(selection),
        panel,
        messages,
        (axes[0], axes[1]),
    )


def _line_value(text: str, messages: dict[str, str]) -> float | None:
    """The typed index value, or None (with a message) when it is no positive number."""
    try:
        value = float(text)
    except (TypeError, ValueError):
        value = math.nan
    if not math.isfinite(value) or value <= 0:
        shown = (text or "").strip() or "nothing"
        messages["line"] = (
            f"index line: {shown!r} is not an index value; a positive number in the chart's units"
            f"; the line is drawn through the leader instead"
        )
        return None
    return value


def pick_class(
    trigger: Any, trigger_value: Any, click_data: Any, chosen: str | None, line_value: str | None, mode: str
) -> tuple[str | None, str]:
    """The class to show and where the index line goes, after a click or a typed value.

    Clicking a class (on the chart or in the shortlist) or choosing it from the list shows
    its data and puts the index line through it; typing an index value puts the line there.
    """
    if trigger == "chart":
        points = (click_data or {}).get("points") or []
        picked = points[0].get("customdata") if points else None
        if isinstance(picked, list):
            picked = picked[0] if picked else None
        return (str(picked), "class") if picked else (chosen, mode)
    if isinstance(trigger, Mapping) and trigger.get("type") == "pick":
        return (str(trigger["id"]), "class") if trigger_value else (chosen, mode)
    if trigger == "class":
        if chosen:
            return chosen, "class"
        return chosen, "leader" if mode == "class" else mode
    if trigger == "line-value":
        if line_value and line_value.strip():
            return chosen, "value"
        return chosen, "class" if chosen else "leader"
    return chosen, mode


def _slug(text: str) -> str:
    return re.sub(r"[^a-z0-9]+", "-", text.lower()).strip("-") or "selection"


def download(start: Start, c: Controls, kind: str) -> tuple[dict[str, Any] | None, str]:
    """The file for a download button ("csv", "xlsx" or "report") and a message.

    The CSV is the one ``selector rank -o shortlist.csv`` writes, the workbook the one
    ``-o shortlist.xlsx`` writes, the report that of ``selector report`` (showing the spec
    file as written, or as changed on the page in JSON).
    """
    try:
        selection = _run(start, c, for_report=kind == "report")
        name = _slug(selection.spec.title)
        if kind == "csv":
            from selector.outputs.tables import render_selection

            text = render_selection(selection, "csv", c.units) + "\n"
            return dcc.send_string(text, f"{name}-shortlist.csv", type="text/csv"), ""
        if kind == "xlsx":
            from selector.outputs.export import xlsx_bytes

            data = xlsx_bytes(selection, c.units)
            kind_xlsx = "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet"
            return dcc.send_bytes(data, f"{name}-shortlist.xlsx", type=kind_xlsx), ""
        if kind == "report":
            from selector.outputs.report import build_report

            if selection.spec == start.spec:
                spec_text, spec_name = start.text, start.name
            else:
                spec_text = selection.spec.model_dump_json(indent=2, exclude_none=True)
                spec_name = f"{start.name} as changed in the explorer (JSON)"
            page = build_report(selection, spec_text, spec_name, c.units)
            return dcc.send_string(page, f"{name}-report.html", type="text/html"), ""
    except SelectorError as exc:
        return None, f"Nothing downloaded: {exc}"
    raise InputError("download", f"{kind!r} is not a download", "csv, xlsx or report")


# --------------------------------------------------------------------------- wiring

_CONTROL_INPUTS: tuple[tuple[str, str], ...] = (
    ("objective", "value"),
    ("constraints", "value"),
    ("stiffness-limit", "value"),
    ("safety-factor", "value"),
    ("free", "value"),
    ("index", "value"),
    ("units", "value"),
    ("families", "value"),
    *((f"op-{row.symbol}", "value") for row in SCREEN_ROWS),
    *((f"screen-{row.symbol}", "value") for row in SCREEN_ROWS),
    ("x-axis", "value"),
    ("y-axis", "value"),
    ("line-mode", "value"),
    ("line-value", "value"),
    ("class", "value"),
)


def _text(value: Any) -> str:
    """A control's value as text: a request that sends a number, list or object where the page
    sends text gets that control's own error message, not a failure."""
    if value is None:
        return ""
    return value if isinstance(value, str) else json.dumps(value, default=str)


def _texts(value: Any) -> tuple[str, ...]:
    """A multiple-choice control's values as text (one odd value becomes one odd choice)."""
    if value is None:
        return ()
    return tuple(_text(v) for v in value) if isinstance(value, list | tuple) else (_text(value),)


def controls_from(values: Sequence[Any]) -> Controls:
    """Controls from the page's values, in the order of ``_CONTROL_INPUTS``; any value is accepted."""
    n = len(SCREEN_ROWS)
    (objective, constraints, limit, factor, free, index, units, families) = values[:8]
    ops, texts = values[8 : 8 + n], values[8 + n : 8 + 2 * n]
    x, y, mode, line_value, chosen = values[8 + 2 * n :]
    return Controls(
        objective=_text(objective),
        constraints=_texts(constraints),
        stiffness_limit=_text(limit),
        safety_factor=_text(factor),
        free=_text(free),
        index=_text(index),
        units=units if units in ("si", "us") else "si",
        families=_texts(families),
        screens=tuple(
            (_text(op) or row.op, _text(text)) for row, op, text in zip(SCREEN_ROWS, ops, texts, strict=True)
        ),
        x=_text(x),
        y=_text(y),
        line_mode=mode if mode in LINE_MODES else "leader",
        line_value=_text(line_value),
        chosen=_text(chosen) or None,
    )


def _keep(value: Any) -> Any:
    return dash.no_update if value is None else value


def wire(app: dash.Dash, start: Start) -> None:
    """Connect the page's controls to ``refresh``, ``sync_screen``, ``pick_class`` and ``download``."""
    inputs = [Input(cid, prop) for cid, prop in _CONTROL_INPUTS]
    states = [State(cid, prop) for cid, prop in _CONTROL_INPUTS]
    outputs = [
        Output("chart", "figure"),
        Output("shortlist", "children"),
        Output("summary", "children"),
        Output("derivation", "children"),
        Output("class-panel", "children"),
        Output("x-axis", "placeholder"),
        Output("y-axis", "placeholder"),
        *(Output(f"msg-{key}", "children") for key in MESSAGE_KEYS),
    ]

    @app.callback(*outputs, *inputs)
    def _refresh(*values: Any) -> tuple:
        view = refresh(start, controls_from(values))
        placeholders = (
            (f"as the index: {view.axes[0]}", f"as the index: {view.axes[1]}")
            if view.axes[0]
            else (dash.no_update, dash.no_update)
        )
        return (
            _keep(view.figure),
            _keep(view.shortlist),
            _keep(view.summary),
            _keep(view.derivation),
            _keep(view.class_panel),
            *placeholders,
            *(view.messages.get(key, "") for key in MESSAGE_KEYS),
        )

    for row in SCREEN_ROWS:
        _wire_screen(app, row.symbol)

    @app.callback(
        Output("class", "value"),
        Output("line-mode", "value"),
        Input("chart", "clickData"),
        Input({"type": "pick", "id": ALL}, "n_clicks"),
        Input("class", "value"),
        Input("line-value", "value"),
        State("line-mode", "value"),
        prevent_initial_call=True,
    )
    def _pick(click_data: Any, _rows: Any, chosen: Any, line_value: Any, mode: Any) -> tuple:
        trigger = ctx.triggered_id
        value = ctx.triggered[0].get("value") if ctx.triggered else None
        new_chosen, new_mode = pick_class(trigger, value, click_data, chosen, line_value, mode)
        if new_chosen == chosen and new_mode == mode:
            raise dash.exceptions.PreventUpdate
        return new_chosen, new_mode

    @app.callback(
        Output("download", "data"),
        Output("msg-download", "children"),
        Input("get-csv", "n_clicks"),
        Input("get-xlsx", "n_clicks"),
        Input("get-report", "n_clicks"),
        *states,
        prevent_initial_call=True,
    )
    def _download(_csv: Any, _xlsx: Any, _report: Any, *values: Any) -> tuple:
        kind = {"get-csv": "csv", "get-xlsx": "xlsx", "get-report": "report"}.get(str(ctx.triggered_id))
        if kind is None:
            raise dash.exceptions.PreventUpdate
        data, message = download(start, controls_from(values), kind)
        return _keep(data), message


def _wire_screen(app: dash.Dash, symbol: str) -> None:
    @app.callback(
        Output(f"screen-{symbol}", "value"),
        Output(f"slider-{symbol}", "value"),
        Input(f"slider-{symbol}", "value"),
        Input(f"screen-{symbol}", "value"),
        State(f"op-{symbol}", "value"),
        prevent_initial_call=True,
    )
    def _sync(slider: Any, text: Any, op: Any) -> tuple:
        trigger = {f"slider-{symbol}": "slider", f"screen-{symbol}": "text"}.get(str(ctx.triggered_id))
        new_text, new_slider = sync_screen(symbol, trigger, slider, text, op or ">=")
        if new_text is None and new_slider is None:
            raise dash.exceptions.PreventUpdate
        return _keep(new_text), _keep(new_slider)

"""Connecting the page's controls to the explorer's plain callbacks.

Every request's values are accepted whatever their type: a value of the wrong kind
becomes text and gets the control's own message from ``refresh``, never a failure.
The spec the page edits lives in the ``base`` store (None: the one the explorer was
started with); an upload, the solid/sandwich switch or a page address replace it.
"""

from __future__ import annotations

import json
from collections.abc import Mapping, Sequence
from typing import Any

import dash
from dash import ALL, Input, Output, State, ctx

from selector.errors import SelectorError
from selector.inputs.properties import RATINGS
from selector.mechanics.loadcases import CONSTRAINTS
from selector.outputs.explore.callbacks import download, pick_class, refresh, reload
from selector.outputs.explore.editor import HIDDEN, SHOWN, form_state
from selector.outputs.explore.fields import FIELDS, SANDWICH_SHAPE
from selector.outputs.explore.state import (
    LINE_MODES,
    MESSAGE_KEYS,
    SCREEN_ROWS,
    SLIDER_ROWS,
    Controls,
    Start,
    start_with,
    sync_screen,
)

CONTROLS: tuple[str, ...] = (
    "objective",
    "constraints",
    "stiffness-limit",
    "safety-factor",
    "free",
    "index",
    "units",
    "families",
    *(f"op-{row.symbol}" for row in SCREEN_ROWS),
    *(f"screen-{row.symbol}" for row in SCREEN_ROWS),
    *(f.key for f in FIELDS),
    *(f"rating-{r}" for r in RATINGS),
    "exclude",
    "allow-brittle",
    "faces",
    "cores",
    "x-axis",
    "y-axis",
    "line-mode",
    "line-value",
    "class",
)
"""The id of every control whose ``value`` makes the view, in the order the callbacks take them."""
CHOICE_OPTIONS = ("constraints", "free", *(f.key for f in FIELDS if f.kind == "choice"))
"""Controls whose options depend on the spec loaded."""
RELOAD_MESSAGES = ("upload", "construction")
"""Messages of the callback that loads a new spec; refresh writes every other one."""
REFRESH_MESSAGES = tuple(key for key in MESSAGE_KEYS if key not in RELOAD_MESSAGES)
ROWS = (*(f"row-{f.key}" for f in FIELDS), "row-construction", "sandwich-block", "row-kept")
"""Parts of the editor shown or hidden with the spec loaded."""


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
    """Controls from the page's values, in the order of ``CONTROLS``; any value is accepted."""
    v = dict(zip(CONTROLS, values, strict=True))
    units, mode = v["units"], v["line-mode"]
    return Controls(
        objective=_text(v["objective"]),
        constraints=_texts(v["constraints"]),
        stiffness_limit=_text(v["stiffness-limit"]),
        safety_factor=_text(v["safety-factor"]),
        free=_text(v["free"]),
        index=_text(v["index"]),
        units=units if units in ("si", "us") else "si",
        families=_texts(v["families"]),
        screens=tuple(
            (_text(v[f"op-{row.symbol}"]) or row.op, _text(v[f"screen-{row.symbol}"])) for row in SCREEN_ROWS
        ),
        x=_text(v["x-axis"]),
        y=_text(v["y-axis"]),
        line_mode=mode if mode in LINE_MODES else "leader",
        line_value=_text(v["line-value"]),
        chosen=_text(v["class"]) or None,
        fields=tuple((f.path, _text(v[f.key])) for f in FIELDS),
        ratings=tuple((r, _text(v[f"rating-{r}"])) for r in RATINGS),
        exclude=_texts(v["exclude"]),
        allow_brittle=bool(_texts(v["allow-brittle"])),
        faces=_texts(v["faces"]),
        cores=_texts(v["cores"]),
    )


def control_values(c: Controls) -> dict[str, Any]:
    """The value of every control in ``CONTROLS`` for a set of controls (the inverse of ``controls_from``)."""
    values: dict[str, Any] = {
        "objective": c.objective,
        "constraints": list(c.constraints),
        "stiffness-limit": c.stiffness_limit,
        "safety-factor": c.safety_factor,
        "free": c.free,
        "index": c.index,
        "units": c.units,
        "families": list(c.families),
        "exclude": list(c.exclude),
        "allow-brittle": ["allow"] if c.allow_brittle else [],
        "faces": list(c.faces),
        "cores": list(c.cores),
        "x-axis": c.x,
        "y-axis": c.y,
        "line-mode": c.line_mode,
        "line-value": c.line_value,
        "class": c.chosen,
    }
    for row, (op, text) in zip(SCREEN_ROWS, c.screens, strict=True):
        values[f"op-{row.symbol}"], values[f"screen-{row.symbol}"] = op, text
    fields = dict(c.fields)
    values |= {f.key: fields.get(f.path, "") for f in FIELDS}
    ratings = dict(c.ratings)
    values |= {f"rating-{r}": ratings.get(r, "") for r in RATINGS}
    return values


def _keep(value: Any) -> Any:
    return dash.no_update if value is None else value


def _current(start: Start, base: Any) -> Start:
    """The spec on the page: the one started with, or the one the ``base`` store holds."""
    if base is None:
        return start
    if not isinstance(base, Mapping):
        return start_with(start, base, "page state")
    return start_with(start, base.get("spec"), str(base.get("name") or "page state"))


def _base(new: Start) -> dict[str, Any]:
    return {"name": new.name, "spec": new.data}


def wire(app: dash.Dash, start: Start) -> None:
    """Connect the page's controls to the plain callbacks (refresh, reload, pick_class, download ...)."""
    inputs = [Input(cid, "value") for cid in CONTROLS]
    states = [State(cid, "value") for cid in CONTROLS]
    outputs = [
        Output("chart", "figure"),
        Output("shortlist", "children"),
        Output("summary", "children"),
        Output("derivation", "children"),
        Output("class-panel", "children"),
        Output("x-axis", "placeholder"),
        Output("y-axis", "placeholder"),
        Output("address-state", "data"),
        *(Output(f"msg-{key}", "children") for key in REFRESH_MESSAGES),
    ]

    @app.callback(*outputs, *inputs, Input("base", "data"))
    def _refresh(*values: Any) -> tuple:
        try:
            current = _current(start, values[-1])
        except SelectorError as exc:
            messages = dict.fromkeys(REFRESH_MESSAGES, "") | {"general": f"Not updated: {exc}"}
            return (*(dash.no_update,) * 8, *(messages[key] for key in REFRESH_MESSAGES))
        view = refresh(current, controls_from(values[:-1]))
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
            _keep(view.address),
            *(view.messages.get(key, "") for key in REFRESH_MESSAGES),
        )

    _wire_reload(app, start, states)
    _wire_constraint_blocks(app)
    for row in SLIDER_ROWS:
        _wire_screen(app, row.symbol)

    app.clientside_callback(
        """function (fragment) {
            if (fragment && window.location.hash !== fragment) {
                window.history.replaceState(null, "", fragment);
            }
            return fragment ? "" : window.dash_clientside.no_update;
        }""",
        Output("address-echo", "children"),
        Input("address-state", "data"),
    )

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

    kinds = {"get-spec": "spec", "get-csv": "csv", "get-xlsx": "xlsx", "get-report": "report"}

    @app.callback(
        Output("download", "data"),
        Output("msg-download", "children"),
        *(Input(button, "n_clicks") for button in kinds),
        *states,
        State("base", "data"),
        prevent_initial_call=True,
    )
    def _download(*values: Any) -> tuple:
        kind = kinds.get(str(ctx.triggered_id))
        if kind is None:
            raise dash.exceptions.PreventUpdate
        try:
            current = _current(start, values[-1])
        except SelectorError as exc:
            return dash.no_update, f"Nothing downloaded: {exc}"
        data, message = download(current, controls_from(values[len(kinds) : -1]), kind)
        return _keep(data), message


def _wire_reload(app: dash.Dash, start: Start, states: list[State]) -> None:
    """An upload, the solid/sandwich switch or a page address loads a new spec into every control."""
    outputs = [
        *(Output(cid, "value", allow_duplicate=True) for cid in CONTROLS),
        *(Output(cid, "options") for cid in CHOICE_OPTIONS),
        *(Output(row, "style") for row in ROWS),
        Output("construction", "value"),
        Output("kept-screens", "children"),
        Output("part-text", "children"),
        Output("title", "children"),
        Output("spec-name", "children"),
        Output("base", "data"),
        Output("msg-upload", "children"),
        Output("msg-construction", "children"),
    ]
    at_construction = len(CONTROLS) + len(CHOICE_OPTIONS) + len(ROWS)

    @app.callback(
        *outputs,
        Input("upload", "contents"),
        Input("construction", "value"),
        Input("address", "hash"),
        State("upload", "filename"),
        *states,
        State("base", "data"),
        prevent_initial_call="initial_duplicate",
    )
    def _reload(contents: Any, construction: Any, fragment: Any, filename: Any, *values: Any) -> tuple:
        trigger = {"upload": "upload", "construction": "construction"}.get(str(ctx.triggered_id), "address")
        try:
            current = _current(start, values[-1])
        except SelectorError:
            current = start
        new, controls, message = reload(
            start, current, controls_from(values[:-1]), trigger, contents, filename, construction, fragment
        )
        if new is None or controls is None:
            if not message:
                raise dash.exceptions.PreventUpdate
            out: list[Any] = [dash.no_update] * len(outputs)
            if trigger == "construction":  # the switch goes back to what the page shows
                out[at_construction] = (
                    SANDWICH_SHAPE if current.spec.section.shape == SANDWICH_SHAPE else "solid"
                )
                out[-2:] = ["", message]
            else:
                out[-2:] = [message, ""]
            return tuple(out)
        form = form_state(new)
        values_out = control_values(controls)
        options = [
            [{"label": v or "(not given)", "value": v} for v in form.choices.get(_path(cid), ("",))]
            if cid not in ("constraints", "free")
            else list(form.choices[cid])
            for cid in CHOICE_OPTIONS
        ]
        styles = [_row_style(row, form) for row in ROWS]
        spec = new.spec
        return (
            *(values_out[cid] for cid in CONTROLS),
            *options,
            *styles,
            SANDWICH_SHAPE if form.sandwich else "solid",
            [_li(k) for k in form.kept],
            form.part_text,
            spec.title,
            new.name + (f" — {spec.notes}" if spec.notes else ""),
            _base(new),
            "",
            "",
        )


def _path(key: str) -> str:
    return next(f.path for f in FIELDS if f.key == key)


def _li(text: str) -> Any:
    from dash import html

    return html.Li(text)


def _row_style(row: str, form: Any) -> dict[str, str]:
    if row == "row-construction":
        return SHOWN if form.sandwich_allowed else HIDDEN
    if row == "sandwich-block":
        return SHOWN if form.sandwich else HIDDEN
    if row == "row-kept":
        return SHOWN if form.kept else HIDDEN
    key = row.removeprefix("row-")
    return SHOWN if next(f.path for f in FIELDS if f.key == key) in form.shown else HIDDEN


def _wire_constraint_blocks(app: dash.Dash) -> None:
    """Each constraint's fields show while it is ticked (and applies to the part)."""

    @app.callback(
        *(Output(f"con-{kind}", "style") for kind in CONSTRAINTS),
        Input("constraints", "value"),
        Input("constraints", "options"),
    )
    def _blocks(ticked: Any, options: Any) -> tuple:
        on = set(_texts(ticked)) & set(_texts(options))
        return tuple(SHOWN if kind in on else HIDDEN for kind in CONSTRAINTS)


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

"""The explorer's callbacks as plain functions of (Start, Controls), and their wiring to the page."""

from __future__ import annotations

import math
import re
from collections.abc import Mapping
from dataclasses import replace
from typing import Any

from dash import dcc

from selector.errors import InputError, SelectorError
from selector.outputs.explore import address
from selector.outputs.explore.layout import (
    class_view,
    derivation_view,
    sandwich_view,
    shortlist_view,
    summary_view,
)
from selector.outputs.explore.spec_files import start_from_upload
from selector.outputs.explore.state import (
    LINE_MODES,
    MESSAGE_KEYS,
    SCREEN_ROWS,
    TOP_NAMED,
    Controls,
    Start,
    View,
    _run,
    constraint_order,
    error_messages,
    initial_controls,
    spec_data,
    start_with,
    with_construction,
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
    selection, data = None, None
    if not any(messages.values()):
        try:
            data = spec_data(start, c)
            selection = _run_data(start, data)
        except SelectorError as exc:
            order = {"constraint": [{"type": t} for t in constraint_order(start, c)]}
            messages |= error_messages(exc, data or order)
    if selection is None:
        said = messages["general"]
        said = said or "correct the input marked in red."
        messages["general"] = f"Not updated: {said}"
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
    shortlist = shortlist_view(selection, c.units)
    if selection.sandwich is not None:
        shortlist = [*sandwich_view(selection, c.units), *shortlist]
    return View(
        figure,
        shortlist,
        summary_view(selection),
        derivation_view(selection),
        panel,
        messages,
        (axes[0], axes[1]),
        address.encode(data or {}, c.view),
    )


def _run_data(start: Start, data: dict[str, Any]) -> Any:
    """The Selection for spec data (raises SelectorError on bad input)."""
    from selector.inputs.spec import spec_from_dict
    from selector.pipeline.selection import select

    return select(spec_from_dict(data, source=start.name), start.table)


def _line_value(text: str, messages: dict[str, str]) -> float | None:
    """The typed index value, or None (with a message) when it is no positive number."""
    try:
        value = float(text)
    except (TypeError, ValueError):
        value = math.nan
    if not math.isfinite(value) or value <= 0:
        shown = (text or "").strip() or "nothing"
        messages["line"] = (
            f"index line: {shown!r} is not an index value; a positive number in the unit of the"
            f" shortlist's index; the line is drawn through the leader instead"
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


def _spec_download(start: Start, c: Controls) -> dict[str, Any]:
    """The edited spec as a TOML file (checked as a spec first)."""
    from selector.inputs.spec import spec_from_dict
    from selector.outputs.explore.spec_files import spec_text

    data = spec_data(start, c)
    spec = spec_from_dict(data, source=start.name)
    text = spec_text(data, spec.title)
    return dcc.send_string(text, f"{_slug(spec.title)}.toml", type="application/toml")


def download(start: Start, c: Controls, kind: str) -> tuple[dict[str, Any] | None, str]:
    """The file for a download button ("spec", "csv", "xlsx" or "report") and a message.

    The spec is the edited spec as a TOML file that ``selector rank`` reads. The CSV is
    the one ``selector rank -o shortlist.csv`` writes, the workbook the one
    ``-o shortlist.xlsx`` writes, the report that of ``selector report`` (showing the spec
    file as written, or as changed on the page in JSON).
    """
    try:
        if kind == "spec":
            return _spec_download(start, c), ""
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
    raise InputError("download", f"{kind!r} is not a download", "spec, csv, xlsx or report")


def _view_controls(c: Controls, view: dict[str, str]) -> Controls:
    """Controls with the view read from a page address (axes, index line, chosen class)."""
    mode = view.get("line", c.line_mode)
    return replace(
        c,
        x=view.get("x", ""),
        y=view.get("y", ""),
        line_mode=mode if mode in LINE_MODES else "leader",
        line_value=view.get("value", ""),
        chosen=view.get("class") or None,
    )


def reload(
    start: Start,
    current: Start,
    c: Controls,
    trigger: str,
    contents: Any = None,
    filename: Any = None,
    construction: Any = None,
    fragment: Any = None,
) -> tuple[Start | None, Controls | None, str]:
    """A new spec for the editor: uploaded, switched between solid and sandwich, or read from the address.

    ``start`` is what the explorer was started with, ``current`` the spec on the page and
    ``c`` its controls. Returns the new Start and its controls, or (None, None, message)
    when nothing changes; the message is "" unless the input was bad.
    """
    try:
        if trigger == "upload":
            new = start_from_upload(start, contents, filename)
            controls = replace(initial_controls(new), chosen=c.chosen)
            return new, controls, ""
        if trigger == "construction":
            data = with_construction(start, spec_data(current, c), str(construction))
            new = start_with(start, data, current.name)
            return new, _view_controls(initial_controls(new), c.view), ""
        if trigger == "address":
            found = address.decode(fragment)
            if found is None:
                return None, None, ""
            data, view = found
            new = start_with(start, data, f"{start.name} (as in the page address)")
            return new, _view_controls(initial_controls(new), view), ""
    except SelectorError as exc:
        return None, None, f"Not loaded: {exc}"
    return None, None, ""

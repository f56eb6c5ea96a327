"""The explorer's page: controls that edit a spec, and the pipeline's answer drawn live.

The page computes no engineering of its own. Every change of a control builds a new
spec from the loaded one (``spec_from_dict`` on its dict with the change) and runs
``select`` over the same materials table, exactly as ``selector rank`` does; the chart,
the shortlist, the downloads and the class data are the library's own
(``charts.chart_for_selection``, ``tables.selection_frame``, ``tables.render_selection``,
``export.xlsx_bytes``, ``report.build_report``, ``tables.class_frame``).

The callbacks are plain functions (``refresh``, ``sync_screen``,
``pick_class``, ``download``) over frozen dataclasses, so they can be called without a
browser; ``make_app`` only wires them to the page. The server listens on 127.0.0.1 alone.
"""

from __future__ import annotations

import copy
import math
import re
import socket
import webbrowser
from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass, replace
from pathlib import Path
from typing import Any

import dash
import numpy as np
import pandas as pd
from dash import ALL, Input, Output, State, ctx, dcc, html

from selector.errors import InputError, SelectorError
from selector.inputs.properties import FAMILIES, PROPERTIES
from selector.inputs.spec import Spec
from selector.inputs.units import format_number

__all__ = [
    "DEFAULT_PORT",
    "HOST",
    "MESSAGE_KEYS",
    "SCREEN_ROWS",
    "Controls",
    "ScreenRow",
    "Start",
    "View",
    "bind",
    "download",
    "initial_controls",
    "load_start",
    "make_app",
    "pick_class",
    "refresh",
    "serve",
    "spec_data",
    "sync_screen",
]

HOST = "127.0.0.1"
"""The only address the explorer listens on."""
DEFAULT_PORT = 8050
TOP_NAMED = 5
"""Shortlisted classes named on the chart."""
LINE_MODES = ("leader", "class", "value")
OPERATORS = (">=", "<=")
_OPERATOR = re.compile(r"^\s*(>=|<=|>|<|≥|≤)\s*")


@dataclass(frozen=True)
class ScreenRow:
    """One screen with its own input and slider: the property and its usual comparison."""

    symbol: str
    op: str

    @property
    def key(self) -> str:
        return f"screen_{self.symbol}"


SCREEN_ROWS: tuple[ScreenRow, ...] = (
    ScreenRow("T_max", ">="),
    ScreenRow("price", "<="),
    ScreenRow("rho", "<="),
    ScreenRow("E", ">="),
    ScreenRow("sigma_y", ">="),
)
"""The screens shown as inputs with sliders; the spec's other screens are kept as written."""

EDITABLE = {row.symbol for row in SCREEN_ROWS} | {"families"}

MESSAGE_KEYS: tuple[str, ...] = (
    "objective",
    "constraints",
    "stiffness_limit",
    "safety_factor",
    "free",
    "index",
    "units",
    "families",
    *(row.key for row in SCREEN_ROWS),
    "x",
    "y",
    "line",
    "class",
    "general",
)
"""Every place a message can appear, one beside each control."""


# --------------------------------------------------------------------------- state


@dataclass(frozen=True, eq=False)
class Start:
    """What the explorer starts from.

    Attributes:
        spec: the spec as read.
        data: the same spec as nested dicts; each change of a control edits a copy.
        name: the spec file's name (in messages and download names).
        text: the spec file as written.
        table: the materials table (built-in classes plus the spec's own files).
    """

    spec: Spec
    data: dict[str, Any]
    name: str
    text: str
    table: pd.DataFrame


@dataclass(frozen=True)
class Controls:
    """The values of the page's controls.

    Attributes:
        objective: what to minimise (mass, cost, co2, volume).
        constraints: the constraint types in force.
        stiffness_limit: the stiffness limit with its unit (max deflection, or max twist of a shaft).
        safety_factor: the safety factor on the strength constraint, as typed.
        free: the free variable.
        index: a typed merit index to rank by; empty for the derived one.
        units: "si" or "us".
        families: the families allowed.
        screens: (comparison, value with unit) for each of SCREEN_ROWS; an empty value is no screen.
        x, y: chart axes (property symbols or expressions); empty follows the index.
        line_mode: where the index line goes: "leader", "class" (the chosen class) or "value".
        line_value: the index value typed for the line, in the chart's units.
        chosen: the id of the class whose data is shown.
    """

    objective: str
    constraints: tuple[str, ...]
    stiffness_limit: str
    safety_factor: str
    free: str
    index: str
    units: str
    families: tuple[str, ...]
    screens: tuple[tuple[str, str], ...]
    x: str = ""
    y: str = ""
    line_mode: str = "leader"
    line_value: str = ""
    chosen: str | None = None

    def with_screen(self, symbol: str, text: str, op: str | None = None) -> Controls:
        """A copy with one screen's value (and comparison) changed."""
        screens = tuple(
            ((op or old_op), text) if row.symbol == symbol else (old_op, old_text)
            for row, (old_op, old_text) in zip(SCREEN_ROWS, self.screens, strict=True)
        )
        return replace(self, screens=screens)


@dataclass(frozen=True)
class View:
    """What one refresh puts on the page; None keeps what is shown (after bad input).

    Attributes:
        figure: the property chart.
        shortlist: the shortlist table, the rejected classes, notes and the caution.
        summary: one line: how many ranked, by what, how many rejected.
        derivation: the merit index and its steps.
        class_panel: the chosen class's data and sources.
        messages: key of MESSAGE_KEYS → message ("" clears it).
        axes: the axes drawn (shown as the axis inputs' placeholders).
    """

    figure: Any
    shortlist: Any
    summary: Any
    derivation: Any
    class_panel: Any
    messages: Mapping[str, str]
    axes: tuple[str, str] = ("", "")


def load_start(spec_path: str | Path | None = None) -> Start:
    """Read a spec (the bundled camera-dolly example without one) and its materials table."""
    from selector.inputs.materials import load_materials
    from selector.inputs.spec import DEMO_SPEC, EXAMPLES, load_spec

    path = Path(spec_path) if spec_path else EXAMPLES / DEMO_SPEC
    spec = load_spec(path)
    files = [str(path.parent / f) for f in spec.materials.files]
    table = load_materials(files, builtin=spec.materials.builtin)
    text = path.read_text(encoding="utf-8")
    return Start(spec, spec.model_dump(exclude_none=True), path.name, text, table)


def _split_limit(text: str) -> tuple[str | None, str]:
    """``">= 60 degC"`` → (">=", "60 degC"); the comparison is None when there is none."""
    match = _OPERATOR.match(text)
    if not match:
        return None, text.strip()
    op = {">": ">=", "≥": ">=", "<": "<=", "≤": "<="}.get(match.group(1), match.group(1))
    return op, text[match.end() :].strip()


def _stiffness_field(start: Start) -> str:
    """``max_twist`` for a shaft (or where the spec gives one), else ``max_deflection``."""
    for c in start.spec.constraint:
        if c.type == "stiffness" and c.max_twist is not None:
            return "max_twist"
    return "max_twist" if start.spec.part.function == "shaft" else "max_deflection"


def _case(start: Start) -> Any:
    from selector.mechanics.loadcases import load_case

    part = start.spec.part
    return load_case(part.function, part.support, part.load)


def initial_controls(start: Start) -> Controls:
    """The controls as the spec sets them."""
    spec = start.spec
    by_type = {c.type: c for c in spec.constraint}
    stiff = by_type.get("stiffness")
    limit = getattr(stiff, _stiffness_field(start), None) if stiff else None
    strength = by_type.get("strength")
    screens = []
    for row in SCREEN_ROWS:
        written = spec.screen.get(row.symbol)
        if isinstance(written, str):
            op, value = _split_limit(written)
            screens.append((op or row.op, value))
        else:
            screens.append((row.op, ""))
    families = tuple(spec.screen.get("families") or FAMILIES)
    return Controls(
        objective=spec.objective.minimize,
        constraints=tuple(c.type for c in spec.constraint),
        stiffness_limit=limit or "",
        safety_factor=format_number(strength.safety_factor) if strength else "1",
        free=spec.section.free,
        index=spec.index or "",
        units=spec.units,
        families=families,
        screens=tuple(screens),
    )


def spec_data(start: Start, c: Controls) -> dict[str, Any]:
    """The loaded spec's dict with the controls' changes (to be validated by ``spec_from_dict``)."""
    data = copy.deepcopy(start.data)
    data["objective"] = {"minimize": c.objective}
    data.setdefault("section", {})["free"] = c.free
    data["units"] = c.units
    if c.index.strip():
        data["index"] = c.index.strip()
    else:
        data.pop("index", None)
    base = {item["type"]: item for item in start.data.get("constraint", [])}
    chosen = [t for t in base if t in c.constraints]
    chosen += [t for t in c.constraints if t not in base and t not in chosen]
    field = _stiffness_field(start)
    constraints = []
    for kind in chosen:
        item = dict(base.get(kind, {"type": kind}))
        if kind == "stiffness":
            item.pop(field, None)
            if c.stiffness_limit.strip():
                item[field] = c.stiffness_limit.strip()
        if kind == "strength":
            item.pop("safety_factor", None)
            if c.safety_factor.strip():
                item["safety_factor"] = c.safety_factor.strip()
        constraints.append(item)
    data["constraint"] = constraints
    screen = {k: v for k, v in data.get("screen", {}).items() if k not in EDITABLE}
    for row, (op, text) in zip(SCREEN_ROWS, c.screens, strict=True):
        if text.strip():
            screen[row.symbol] = f"{op} {text.strip()}"
    if set(c.families) != set(FAMILIES):
        screen["families"] = [f for f in FAMILIES if f in c.families]
    data["screen"] = screen
    return data


def _run(start: Start, c: Controls) -> Any:
    """The Selection for the controls (raises SelectorError on bad input)."""
    from selector.inputs.spec import spec_from_dict
    from selector.pipeline.selection import select

    spec = spec_from_dict(spec_data(start, c), source=start.name)
    return select(spec, start.table)


def _route(where: str) -> str:
    """The message key for an error's location (``"spec.toml: constraint[1].safety_factor"``)."""
    place = where.rsplit(": ", 1)[-1]
    for row in SCREEN_ROWS:
        if place == f"screen.{row.symbol}":
            return row.key
    if "max_deflection" in place or "max_twist" in place:
        return "stiffness_limit"
    if "safety_factor" in place:
        return "safety_factor"
    if place.startswith("constraint"):
        return "constraints"
    if place.startswith("objective"):
        return "objective"
    if place.startswith("section.free"):
        return "free"
    if place in ("index", "expression") or place.startswith(("index", "expression")):
        return "index"
    if place.startswith("screen"):
        return "families"
    if place == "units":
        return "units"
    return "general"


def _where(exc: SelectorError) -> str:
    return str(getattr(exc, "where", ""))


# --------------------------------------------------------------------------- pieces of the page

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
    from selector.outputs.tables import LENGTH_UNIT, selection_frame

    frame = selection_frame(selection, units)
    index_col = next(c for c in frame.columns if c.startswith("index ["))
    unit = index_col[len("index [") : -1]
    value_cols = [c for c in frame.columns if c.startswith(("mass [", "cost [", "co2 ["))]
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


# --------------------------------------------------------------------------- callbacks


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


def sync_screen(
    symbol: str, trigger: str | None, slider: float | None, text: str | None, op: str
) -> tuple[str | None, float | None]:
    """Keep a screen's input and slider in step; None leaves that one as it is.

    Moving the slider writes its value in the stored unit into the input; typing a value
    (in any unit that fits) moves the slider. A value that cannot be read moves nothing:
    ``refresh`` shows why beside the input.
    """
    from selector.pipeline.screen import parse_limit

    prop = PROPERTIES[symbol]
    if trigger == "slider":
        if slider is None:
            return None, None
        value = 10 ** float(slider) if prop.log else float(slider)
        return f"{format_number(value)} {prop.stored}", None
    if trigger == "text" and text and text.strip():
        try:
            limit = parse_limit(symbol, f"{op} {text.strip()}")
        except SelectorError:
            return None, None
        if prop.log:
            return None, math.log10(limit.value) if limit.value > 0 else None
        return None, limit.value
    return None, None


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
        selection = _run(start, c)
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


STYLE = """
body { font-family: system-ui, sans-serif; margin: 0; color: #1d1d1d; background: #fafafa; font-size: 14px; }
header { padding: 10px 18px; background: #1f3b4d; color: white; }
header h1 { margin: 0; font-size: 20px; }
header p, header .small { margin: 2px 0 0; color: #d8e2e8; }
.page { display: flex; align-items: flex-start; gap: 14px; padding: 12px; }
nav { flex: 0 0 280px; box-sizing: border-box; background: white; border: 1px solid #ddd; padding: 8px 12px; }
main { flex: 1 1 auto; min-width: 0; }
main section, .classbox { background: white; border: 1px solid #ddd; padding: 8px 12px; margin-bottom: 12px; }
h2 { font-size: 15px; margin: 6px 0 8px; border-bottom: 1px solid #e5e5e5; padding-bottom: 3px; }
h3 { font-size: 14px; margin: 8px 0 4px; }
h4 { font-size: 13px; margin: 8px 0 2px; }
.field { margin-bottom: 9px; }
.label { display: block; font-weight: 600; margin-bottom: 2px; }
.hint, .small { font-size: 12px; color: #555; }
.msg { color: #a4001d; font-family: ui-monospace, monospace; font-size: 12px; white-space: pre-wrap; }
.msg:empty { display: none; }
input[type=text] { width: 100%; box-sizing: border-box; padding: 4px 6px; border: 1px solid #aaa;
  border-radius: 3px; font-size: 14px; }
.inline { display: flex; gap: 6px; align-items: center; }
.inline .op { flex: 0 0 auto; white-space: nowrap; }
.inline .op label { margin-right: 6px; }
.inline .value { flex: 1 1 auto; }
.screen { border-top: 1px solid #eee; padding-top: 6px; }
.chartbar { display: grid; grid-template-columns: 1fr 1fr 2fr 1fr; gap: 10px; background: white;
  border: 1px solid #ddd; padding: 8px 12px; margin-bottom: 12px; }
.chartrow { display: flex; flex-wrap: wrap; gap: 0 12px; align-items: flex-start; }
.chart { flex: 3 1 700px; min-width: 0; height: 640px; background: white; border: 1px solid #ddd;
  margin-bottom: 12px; }
.classbox { flex: 1 1 290px; max-height: 640px; overflow-y: auto; box-sizing: border-box; }
.scroll { max-height: 460px; overflow: auto; }
table.grid { border-collapse: collapse; width: 100%; }
table.grid th, table.grid td { border-bottom: 1px solid #e6e6e6; padding: 3px 6px; text-align: left;
  vertical-align: top; }
table.grid thead th { position: sticky; top: 0; background: #f0f3f5; }
table.grid tbody tr:nth-child(even) { background: #f8f9fa; }
button { font-size: 13px; padding: 4px 10px; margin-right: 6px; cursor: pointer; }
button.pick { background: none; border: none; padding: 0; margin: 0; color: #0b5a8a; text-align: left;
  text-decoration: underline; font-size: inherit; }
.downloads { margin: 6px 0 10px; }
.nowrap { white-space: nowrap; }
td.notes { min-width: 220px; }
.caution { font-size: 12px; background: #fff6df; border: 1px solid #e8d7a5; padding: 6px 8px; }
.derivation ol { margin: 4px 0 10px; padding-left: 22px; }
.derivation li { margin-bottom: 3px; }
"""

INDEX = (
    """<!DOCTYPE html>
<html lang="en">
<head>
{%metas%}
<title>{%title%}</title>
{%favicon%}
{%css%}
<style>"""
    + STYLE
    + """</style>
</head>
<body>
{%app_entry%}
<footer>
{%config%}
{%scripts%}
{%renderer%}
</footer>
</body>
</html>
"""
)


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


def controls_from(values: Sequence[Any]) -> Controls:
    """Controls from the page's values, in the order of ``_CONTROL_INPUTS``."""
    n = len(SCREEN_ROWS)
    (objective, constraints, limit, factor, free, index, units, families) = values[:8]
    ops, texts = values[8 : 8 + n], values[8 + n : 8 + 2 * n]
    x, y, mode, line_value, chosen = values[8 + 2 * n :]
    return Controls(
        objective=objective or "",
        constraints=tuple(constraints or ()),
        stiffness_limit=limit or "",
        safety_factor="" if factor is None else str(factor),
        free=free or "",
        index=index or "",
        units=units or "si",
        families=tuple(families or ()),
        screens=tuple(
            (op or row.op, text or "") for row, op, text in zip(SCREEN_ROWS, ops, texts, strict=True)
        ),
        x=x or "",
        y=y or "",
        line_mode=mode if mode in LINE_MODES else "leader",
        line_value="" if line_value is None else str(line_value),
        chosen=chosen or None,
    )


def _keep(value: Any) -> Any:
    return dash.no_update if value is None else value


def make_app(spec_path: str | Path | None = None) -> dash.Dash:
    """The explorer for a spec file (the bundled camera-dolly example without one).

    Raises:
        InputError: the spec or its materials files cannot be read.
    """
    start = load_start(spec_path)
    controls = initial_controls(start)
    app = dash.Dash(
        __name__,
        title=f"{start.spec.title} · selector",
        update_title=None,
        serve_locally=True,
    )
    app.index_string = INDEX
    app.layout = layout(start, controls)
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

    return app


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


# --------------------------------------------------------------------------- serving


def _quiet_handler() -> type:
    from werkzeug.serving import WSGIRequestHandler

    class Quiet(WSGIRequestHandler):
        """Logs errors, not every request."""

        def log_request(self, code: int | str = "-", size: int | str = "-") -> None:
            return None

    return Quiet


def bind(app: dash.Dash, port: int = DEFAULT_PORT) -> Any:
    """A threaded HTTP server for the app, listening on 127.0.0.1:``port`` (0: any free port).

    The socket listens on return, so a browser pointed at it waits rather than fails.
    Call ``serve_forever()`` to answer and ``shutdown()`` from another thread to stop.

    Raises:
        InputError: the port is out of range or cannot be listened on.
    """
    from werkzeug.serving import make_server

    if isinstance(port, bool) or not isinstance(port, int) or not 0 <= port <= 65535:
        raise InputError(
            "--port", f"{port!r} is not a port", "a whole number from 1 to 65535 (0: any free port)"
        )
    sock = socket.socket(socket.AF_INET, socket.SOCK_STREAM)
    try:
        sock.bind((HOST, port))
        sock.listen(128)
    except OSError as exc:
        sock.close()
        raise InputError(
            "--port", f"cannot listen on {HOST}:{port} ({exc.strerror})", "a free port, e.g. --port 8051"
        ) from None
    try:
        server = make_server(
            HOST,
            sock.getsockname()[1],
            app.server,
            threaded=True,
            request_handler=_quiet_handler(),
            fd=sock.fileno(),
        )
    finally:
        sock.close()
    return server


def serve(
    spec_path: str | Path | None = None,
    port: int = DEFAULT_PORT,
    open_browser: bool = True,
    echo: Callable[[str], Any] = print,
) -> None:
    """Serve the explorer on 127.0.0.1 until interrupted, opening the default browser unless asked not to.

    Raises:
        InputError: the spec cannot be read, or the port cannot be listened on.
    """
    app = make_app(spec_path)
    server = bind(app, port)
    url = f"http://{HOST}:{server.port}/"
    echo(f"explorer at {url} (Ctrl+C stops it)")
    if open_browser:
        webbrowser.open(url)
    try:
        server.serve_forever()  # returns on Ctrl+C (werkzeug catches it) or on shutdown()
    except KeyboardInterrupt:
        pass
    finally:
        server.server_close()
    echo("stopped")

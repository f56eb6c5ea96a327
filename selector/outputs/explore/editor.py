"""The explorer's spec editor: the part, its section, the constraints, the screens and the spec file.

Every control has a fixed id whatever the spec, so one set of callbacks serves every
spec the page loads; what does not apply to the loaded part is hidden (``display: none``)
rather than removed, and ``form_state`` gives the values, options and visibility of
every control for a spec.
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np
import pandas as pd
from dash import dcc, html

from selector.inputs.limits import MAX_TOML_BYTES
from selector.inputs.properties import FAMILIES, PROPERTIES, RATING_LEVELS, RATINGS
from selector.inputs.units import format_number
from selector.mechanics.loadcases import CONSTRAINTS, VESSEL_LOADS_OF, LoadCase, load_case
from selector.outputs.explore.fields import (
    CONSTRAINT_FIELDS,
    PART_FIELDS,
    SANDWICH_DEFAULTS,
    SANDWICH_FIELDS,
    SANDWICH_FUNCTIONS,
    SANDWICH_SHAPE,
    SECTION_FIELDS,
    SpecField,
    choices,
    shown_fields,
)
from selector.outputs.explore.state import (
    SCREEN_ROWS,
    Controls,
    ScreenRow,
    Start,
    _case,
    _field_value,
    _stiffness_field,
    kept_screens,
    rating_key,
    sync_screen,
)

HIDDEN = {"display": "none"}
SHOWN: dict[str, str] = {}


def message(key: str) -> Any:
    return html.Div(id=f"msg-{key}", className="msg", role="alert")


def field_box(label: str, control: Any, key: str | None, hint: str | None = None, **kw: Any) -> Any:
    parts = [html.Label(label, className="label"), control]
    if hint:
        parts.append(html.Div(hint, className="hint"))
    if key:
        parts.append(message(key))
    return html.Div(parts, className="field", **kw)


def _options(values: tuple[str, ...], blank: str = "(not given)") -> list[dict[str, str]]:
    return [{"label": v or blank, "value": v} for v in values]


# --------------------------------------------------------------------------- what shows


@dataclass(frozen=True)
class FormState:
    """What the editor shows for one spec, besides the controls' values.

    Attributes:
        shown: the paths of the spec fields that show.
        choices: the options of each choice field and of the constraint and free-variable lists.
        sandwich_allowed: the part may be made a sandwich (a beam or a panel).
        sandwich: the section is a sandwich.
        kept: the spec's screens no control edits, as text.
        part_text: the function of the part, for the heading of its controls.
    """

    shown: frozenset[str]
    choices: Mapping[str, tuple[str, ...]]
    sandwich_allowed: bool
    sandwich: bool
    kept: tuple[str, ...]
    part_text: str


def form_state(start: Start) -> FormState:
    """Which fields show, the options of each choice, and the screens kept as written."""
    spec = start.spec
    function = spec.part.function
    case = _case(start)
    given = {
        f.path for f in (*PART_FIELDS, *SECTION_FIELDS, *SANDWICH_FIELDS) if _field_value(spec, f) is not None
    }
    shape = spec.section.shape
    options: dict[str, tuple[str, ...]] = {
        f.path: choices(f, function) for f in (*PART_FIELDS, *SECTION_FIELDS, *CONSTRAINT_FIELDS)
    }
    options = {k: v for k, v in options.items() if v}
    if shape not in options.get("section.shape", ()):
        options["section.shape"] = (*options.get("section.shape", ()), shape)
    options["constraints"] = _constraint_types(function, case)
    options["free"] = case.allowed_free if shape != SANDWICH_SHAPE else (spec.section.free,)
    kept = tuple(f"{k} {', '.join(v) if isinstance(v, list) else v}" for k, v in kept_screens(spec).items())
    return FormState(
        shown=frozenset(shown_fields(function, shape, given)),
        choices=options,
        sandwich_allowed=function in SANDWICH_FUNCTIONS,
        sandwich=shape == SANDWICH_SHAPE,
        kept=kept,
        part_text=f"Part: {function}",
    )


def _constraint_types(function: str, case: LoadCase) -> tuple[str, ...]:
    """The constraint types on offer: the case's, and for a cylinder those under either
    pressure, so buckling stays on offer when its load is switched to external."""
    cases = (case, *(load_case(function, load=load) for load in VESSEL_LOADS_OF.get(function, ())))
    return tuple(dict.fromkeys(t for c in cases for t in c.constraints))


# --------------------------------------------------------------------------- the part and its section


def _spec_control(f: SpecField, text: str, form: FormState) -> Any:
    if f.kind == "choice":
        return dcc.Dropdown(
            id=f.key, options=_options(form.choices.get(f.path, ("",))), value=text, clearable=False
        )
    return dcc.Input(id=f.key, value=text, type="text", debounce=True, placeholder=f.hint or "not given")


def spec_field(f: SpecField, text: str, form: FormState) -> Any:
    """One spec field with its label and message, hidden where it does not apply."""
    hint = f.hint if f.kind == "choice" else None
    style = SHOWN if f.path in form.shown else HIDDEN
    return field_box(f.label, _spec_control(f, text, form), f.key, hint, id=f"row-{f.key}", style=style)


def class_options(start: Start) -> list[dict[str, str]]:
    classes = start.table.sort_values("name")
    return [{"label": n, "value": i} for i, n in zip(classes["id"], classes["name"], strict=True)]


def _family_and_class_options(start: Start) -> list[dict[str, str]]:
    return [{"label": f"family: {f}", "value": f} for f in FAMILIES] + class_options(start)


def _pair_picker(label: str, key: str, options: list[dict[str, str]], chosen: Sequence[str]) -> Any:
    """The sandwich's faces or cores: families and classes, the defaults named when none is chosen."""
    return field_box(
        label,
        dcc.Dropdown(
            id=key,
            options=options,
            value=list(chosen),
            multi=True,
            placeholder=f"default: {', '.join(SANDWICH_DEFAULTS[key])}",
        ),
        key,
    )


def part_section(start: Start, c: Controls, form: FormState) -> Any:
    texts = dict(c.fields)
    fields = [spec_field(f, texts.get(f.path, ""), form) for f in PART_FIELDS]
    return html.Section([html.H2("Part"), html.P(form.part_text, id="part-text", className="small"), *fields])


def section_section(start: Start, c: Controls, form: FormState) -> Any:
    texts = dict(c.fields)
    construction = field_box(
        "Construction",
        dcc.RadioItems(
            id="construction",
            options={"solid": "solid", SANDWICH_SHAPE: "sandwich (faces on a core)"},
            value=SANDWICH_SHAPE if form.sandwich else "solid",
            inline=True,
        ),
        "construction",
        id="row-construction",
        style=SHOWN if form.sandwich_allowed else HIDDEN,
    )
    options = _family_and_class_options(start)
    sandwich = html.Div(
        [
            _pair_picker("Faces from", "faces", options, c.faces),
            _pair_picker("Cores from", "cores", options, c.cores),
        ],
        id="sandwich-block",
        style=SHOWN if form.sandwich else HIDDEN,
    )
    dims = [spec_field(f, texts.get(f.path, ""), form) for f in SECTION_FIELDS]
    dims += [spec_field(f, texts.get(f.path, ""), form) for f in SANDWICH_FIELDS]
    free = field_box(
        "Free variable",
        dcc.Dropdown(id="free", options=list(form.choices["free"]), value=c.free, clearable=False),
        "free",
    )
    return html.Section([html.H2("Section"), construction, sandwich, free, *dims])


# --------------------------------------------------------------------------- the requirement


def _constraint_block(kind: str, start: Start, c: Controls, form: FormState) -> Any:
    texts = dict(c.fields)
    parts: list[Any] = []
    if kind == "stiffness":
        label = "Max twist" if _stiffness_field(start) == "max_twist" else "Max deflection"
        parts.append(
            field_box(
                label,
                dcc.Input(id="stiffness-limit", value=c.stiffness_limit, debounce=True, type="text"),
                "stiffness_limit",
            )
        )
    if kind == "strength":
        parts.append(
            field_box(
                "Safety factor",
                dcc.Input(id="safety-factor", value=c.safety_factor, debounce=True, type="text"),
                "safety_factor",
            )
        )
    parts += [spec_field(f, texts.get(f.path, ""), form) for f in CONSTRAINT_FIELDS if f.constraint == kind]
    shown = kind in c.constraints and kind in form.choices["constraints"]
    return html.Div(
        [html.H3(f"{kind} constraint"), *parts],
        id=f"con-{kind}",
        className="constraint",
        style=SHOWN if shown else HIDDEN,
    )


def requirement_section(start: Start, c: Controls, form: FormState) -> Any:
    from selector.mechanics.objectives import OBJECTIVES

    return html.Section(
        [
            html.H2("Requirement"),
            field_box(
                "Minimise",
                dcc.Dropdown(id="objective", options=list(OBJECTIVES), value=c.objective, clearable=False),
                "objective",
            ),
            field_box(
                "Constraints",
                dcc.Checklist(
                    id="constraints",
                    options=list(form.choices["constraints"]),
                    value=list(c.constraints),
                    inline=True,
                ),
                "constraints",
                "tick to add a constraint, untick to remove it",
            ),
            *(_constraint_block(kind, start, c, form) for kind in CONSTRAINTS),
            field_box(
                "Rank by a typed index",
                dcc.Input(
                    id="index", value=c.index, debounce=True, type="text", placeholder="the derived one"
                ),
                "index",
                "e.g. E^(1/3)/rho; empty ranks by the derived index",
            ),
            field_box(
                "Units",
                dcc.RadioItems(
                    id="units", options={"si": "SI", "us": "US customary"}, value=c.units, inline=True
                ),
                "units",
            ),
        ]
    )


# --------------------------------------------------------------------------- the screens


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
    parts: list[Any] = [
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
        message(row.key),
    ]
    if row.slider:
        scale = slider_scale(start.table, row.symbol)
        slider = dcc.Slider(
            id=f"slider-{row.symbol}",
            value=_slider_value(row.symbol, op, text, scale),
            updatemode="mouseup",
            allow_direct_input=False,
            **scale,
        )
        parts.append(html.Div(slider, className="slider"))
    return html.Div(parts, className="field screen")


def _rating_row(rating: str, level: str) -> Any:
    return field_box(
        f"{RATINGS[rating].capitalize()} at least",
        dcc.Dropdown(
            id=f"rating-{rating}",
            options=_options(("", *RATING_LEVELS), "no screen"),
            value=level,
            clearable=False,
        ),
        rating_key(rating),
    )


def screens_section(start: Start, c: Controls, form: FormState) -> Any:
    rows = list(zip(SCREEN_ROWS, c.screens, strict=True))
    headline = [_screen_row(start, row, op, text) for row, (op, text) in rows if row.slider]
    others = [_screen_row(start, row, op, text) for row, (op, text) in rows if not row.slider]
    ratings = dict(c.ratings)
    given = sum(1 for row, (_, text) in rows if not row.slider and text.strip())
    return html.Section(
        [
            html.H2("Screens"),
            *headline,
            html.Details(
                [html.Summary(f"Other properties ({given} screened)"), *others],
                id="more-screens",
                open=bool(given),
            ),
            html.Details(
                [html.Summary("Durability ratings"), *(_rating_row(r, ratings.get(r, "")) for r in RATINGS)],
                id="rating-screens",
                open=any(ratings.values()),
            ),
            field_box(
                "Families",
                dcc.Checklist(id="families", options=list(FAMILIES), value=list(c.families), inline=True),
                "families",
            ),
            field_box(
                "Classes left out",
                dcc.Dropdown(
                    id="exclude",
                    options=class_options(start),
                    value=list(c.exclude),
                    multi=True,
                    placeholder="none",
                ),
                "exclude",
            ),
            field_box(
                "Brittle classes",
                dcc.Checklist(
                    id="allow-brittle",
                    options={"allow": "rank classes with K_IC below 15 MPa·m½ on strength"},
                    value=["allow"] if c.allow_brittle else [],
                ),
                None,
            ),
            html.Div(
                [
                    html.Div("Other screens of the spec (kept as written):", className="label"),
                    html.Ul([html.Li(k) for k in form.kept], id="kept-screens", className="small"),
                ],
                id="row-kept",
                style=SHOWN if form.kept else HIDDEN,
            ),
        ]
    )


def file_section() -> Any:
    return html.Section(
        [
            html.H2("Spec file"),
            html.Button("Download spec (TOML)", id="get-spec", n_clicks=0),
            dcc.Upload(
                html.Div(["Load a spec: drop a TOML file here or ", html.U("choose one")]),
                id="upload",
                accept=".toml,text/plain,application/toml",
                className="upload",
                max_size=MAX_TOML_BYTES,
            ),
            message("upload"),
        ]
    )


def editor(start: Start, c: Controls) -> list[Any]:
    """The editor's sections for a spec and the controls' values."""
    form = form_state(start)
    return [
        part_section(start, c, form),
        section_section(start, c, form),
        requirement_section(start, c, form),
        screens_section(start, c, form),
        file_section(),
    ]

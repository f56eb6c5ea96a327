"""The explorer's state: what it starts from, the controls' values, and the spec they make."""

from __future__ import annotations

import copy
import math
import re
from collections.abc import Mapping
from dataclasses import dataclass, replace
from pathlib import Path
from typing import Any

import pandas as pd

from selector.errors import InputError, SelectorError
from selector.inputs.properties import FAMILIES, PROPERTIES, RATING_LEVELS, RATINGS
from selector.inputs.spec import Spec
from selector.inputs.units import format_number
from selector.outputs.explore.fields import (
    CONSTRAINT_FIELDS,
    FIELD_BY_PATH,
    FIELDS,
    SANDWICH_SHAPE,
    SpecField,
)

TOP_NAMED = 5
"""Shortlisted classes named on the chart."""
LINE_MODES = ("leader", "class", "value")
OPERATORS = (">=", "<=")
_OPERATOR = re.compile(r"^\s*(>=|<=|>|<|≥|≤)\s*")


@dataclass(frozen=True)
class ScreenRow:
    """One screen: the property, its usual comparison, and whether it has a slider too."""

    symbol: str
    op: str
    slider: bool = False

    @property
    def key(self) -> str:
        return f"screen_{self.symbol}"


_SLIDER_ROWS: tuple[tuple[str, str], ...] = (
    ("T_max", ">="),
    ("T_min", "<="),
    ("price", "<="),
    ("rho", "<="),
    ("E", ">="),
    ("sigma_y", ">="),
    ("K_IC", ">="),
)
_LOWER_IS_BETTER = {"rho", "price", "co2", "energy", "alpha", "T_min"}
SCREEN_ROWS: tuple[ScreenRow, ...] = (
    *(ScreenRow(symbol, op, slider=True) for symbol, op in _SLIDER_ROWS),
    *(
        ScreenRow(symbol, "<=" if symbol in _LOWER_IS_BETTER else ">=")
        for symbol in PROPERTIES
        if symbol not in dict(_SLIDER_ROWS)
    ),
)
"""A screen for every property: the usual ones with sliders, the rest as inputs alone."""
SLIDER_ROWS = tuple(row for row in SCREEN_ROWS if row.slider)

SCREEN_LISTS = ("families", "exclude_families", "exclude", "allow_brittle")
"""Screen keys that are not limits: the families allowed or left out, classes left out, brittle classes."""


def rating_key(rating: str) -> str:
    return f"rating_{rating}"


MESSAGE_KEYS: tuple[str, ...] = (
    "objective",
    "constraints",
    "stiffness_limit",
    "safety_factor",
    "free",
    "index",
    "units",
    "families",
    "exclude",
    "construction",
    "faces",
    "cores",
    "upload",
    *(f.key for f in FIELDS),
    *(row.key for row in SCREEN_ROWS),
    *(rating_key(r) for r in RATINGS),
    "x",
    "y",
    "line",
    "class",
    "general",
)
"""Every place a message can appear, one beside each control."""


@dataclass(frozen=True, eq=False)
class Start:
    """What the explorer starts from.

    Attributes:
        spec: the spec as read.
        data: the same spec as nested dicts; each change of a control edits a copy.
        name: the spec file's name (in messages and download names).
        text: the spec file as written.
        table: the materials table (built-in classes plus the spec's own files).
        folder: the spec file's folder (where relative materials files are found).
    """

    spec: Spec
    data: dict[str, Any]
    name: str
    text: str
    table: pd.DataFrame
    folder: str = "."


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
        line_value: the index value typed for the line, in the unit of the shortlist's index column.
        chosen: the id of the class whose data is shown.
        fields: (path, text) of the spec fields of ``fields.FIELDS``; "" leaves the key out.
            A path not listed keeps the loaded spec's value.
        ratings: (rating, least level or "") for every durability rating.
        exclude: ids of classes left out.
        allow_brittle: whether brittle classes may be ranked on strength.
        faces, cores: the families or class ids a sandwich's faces and cores come from
            (empty: the defaults).
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
    fields: tuple[tuple[str, str], ...] = ()
    ratings: tuple[tuple[str, str], ...] = ()
    exclude: tuple[str, ...] = ()
    allow_brittle: bool = False
    faces: tuple[str, ...] = ()
    cores: tuple[str, ...] = ()

    def field(self, path: str) -> str | None:
        """The text of one spec field, or None when the controls leave it as loaded."""
        return dict(self.fields).get(path)

    def with_field(self, path: str, text: str) -> Controls:
        """A copy with one spec field's text changed (``part.force``, ``section.d`` ...)."""
        if path not in FIELD_BY_PATH:
            raise KeyError(path)
        kept = [(p, t) for p, t in self.fields if p != path]
        return replace(self, fields=(*kept, (path, text)))

    @property
    def view(self) -> dict[str, str]:
        """What the page shows beside the spec: axes, the index line and the chosen class."""
        return {"x": self.x, "y": self.y, "line": self.line_mode, "value": self.line_value} | (
            {"class": self.chosen} if self.chosen else {}
        )

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
        address: the page address fragment that brings this view back (None: keep the one shown).
    """

    figure: Any
    shortlist: Any
    summary: Any
    derivation: Any
    class_panel: Any
    messages: Mapping[str, str]
    axes: tuple[str, str] = ("", "")
    address: str | None = None


def load_start(spec_path: str | Path | None = None) -> Start:
    """Read a spec (the bundled camera-dolly example without one) and its materials table."""
    from selector.inputs.materials import load_materials
    from selector.inputs.spec import DEMO_SPEC, EXAMPLES, load_spec

    path = Path(spec_path) if spec_path else EXAMPLES / DEMO_SPEC
    spec = load_spec(path)
    files = [str(path.parent / f) for f in spec.materials.files]
    table = load_materials(files, builtin=spec.materials.builtin)
    text = path.read_text(encoding="utf-8")
    data = spec.model_dump(exclude_none=True, exclude_unset=True)
    return Start(spec, data, path.name, text, table, str(path.parent.resolve()))


def start_with(start: Start, data: Any, name: str, text: str = "") -> Start:
    """A Start for other spec data (an uploaded file, a bookmarked view) on the same materials.

    Relative materials files are found beside the spec the explorer was started with.

    Raises:
        SpecError: the data is not a valid spec.
        InputError: it names materials other than those the explorer has loaded.
    """
    from selector.inputs.spec import spec_from_dict

    if not isinstance(data, dict):
        raise InputError(name, f"holds {type(data).__name__}, not a spec", "a spec: tables such as [part]")
    spec = spec_from_dict(data, source=name)
    files = [str((Path(start.folder) / f).resolve()) for f in spec.materials.files]
    loaded = [str(Path(f).resolve()) for f in start.spec.materials.files]
    if files != loaded or spec.materials.builtin != start.spec.materials.builtin:
        raise InputError(
            f"{name}: materials",
            "names materials other than those the explorer has loaded",
            f"the materials of {start.name}, or start `selector explore` with this spec to use its own",
        )
    if files:
        spec = spec.model_copy(update={"materials": spec.materials.model_copy(update={"files": files})})
    data = spec.model_dump(exclude_none=True, exclude_unset=True)
    return Start(spec, data, name, text, start.table, start.folder)


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


def _field_text(value: Any) -> str:
    if value is None:
        return ""
    if isinstance(value, float | int) and not isinstance(value, bool):
        return format_number(float(value), 6)
    return str(value)


def _field_value(spec: Spec, f: SpecField) -> Any:
    """The value a spec gives for a field (None when it gives none)."""
    if f.constraint is not None:
        item = next((c for c in spec.constraint if c.type == f.constraint), None)
        if item is None or (f.name == "safety_factor" and "safety_factor" not in item.model_fields_set):
            return None
        return getattr(item, f.name)
    table = {"part": spec.part, "section": spec.section, "sandwich": spec.sandwich}[f.table]
    return None if table is None else getattr(table, f.name)


def _is_rating_minimum(value: Any) -> bool:
    return (
        isinstance(value, str) and _split_limit(value)[0] == ">=" and _split_limit(value)[1] in RATING_LEVELS
    )


def _editable_screen(key: str, value: Any) -> bool:
    """Whether the controls edit a screen of the spec (the rest is kept as written)."""
    if key in RATINGS:
        return _is_rating_minimum(value)
    return key in PROPERTIES or key in SCREEN_LISTS


def kept_screens(spec: Spec) -> dict[str, Any]:
    """The spec's screens no control edits (a rating with an upper limit), kept as written."""
    return {k: v for k, v in spec.screen.items() if not _editable_screen(k, v)}


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
    ratings = tuple(
        (r, _split_limit(str(spec.screen[r]))[1] if _is_rating_minimum(spec.screen.get(r)) else "")
        for r in RATINGS
    )
    left_out = set(spec.screen.get("exclude_families") or ())
    families = tuple(f for f in (spec.screen.get("families") or FAMILIES) if f not in left_out)
    sandwich = spec.sandwich
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
        fields=tuple((f.path, _field_text(_field_value(spec, f))) for f in FIELDS),
        ratings=ratings,
        exclude=tuple(spec.screen.get("exclude") or ()),
        allow_brittle=bool(spec.screen.get("allow_brittle", False)),
        faces=tuple(sandwich.faces or ()) if sandwich else (),
        cores=tuple(sandwich.cores or ()) if sandwich else (),
    )


def _set(table: dict[str, Any], key: str, text: str, value: Any = None) -> None:
    """Put a field's value in its table, or take the key out when its text is empty."""
    if text.strip():
        table[key] = text.strip() if value is None else value
    else:
        table.pop(key, None)


def constraint_order(start: Start, c: Controls) -> list[str]:
    """The ticked constraint types in the order the spec gets them: the loaded spec's first."""
    base = [item["type"] for item in start.data.get("constraint", [])]
    chosen = [t for t in base if t in c.constraints]
    return chosen + [t for t in dict.fromkeys(c.constraints) if t not in chosen]


def _constraint_items(start: Start, c: Controls, fields: dict[str, str]) -> list[dict[str, Any]]:
    """The spec's constraints as the controls set them: the ticked types with their fields."""
    base = {item["type"]: item for item in start.data.get("constraint", [])}
    stiffness_field = _stiffness_field(start)
    items: list[dict[str, Any]] = []
    for kind in constraint_order(start, c):
        item = dict(base.get(kind, {"type": kind}))
        at = len(items)
        if kind == "stiffness":
            _set(item, stiffness_field, c.stiffness_limit)
        if kind == "strength":
            text = c.safety_factor
            _set(
                item,
                "safety_factor",
                text,
                _number(text, start.name, at, "safety_factor") if text.strip() else None,
            )
        for f in CONSTRAINT_FIELDS:
            if f.constraint == kind and f.path in fields:
                text = fields[f.path]
                value = _number(text, start.name, at, f.name) if f.kind == "number" and text.strip() else None
                _set(item, f.name, text, value)
        items.append(item)
    return items


def _screen_data(start: Start, c: Controls) -> dict[str, Any]:
    screen = kept_screens(start.spec)
    screen |= {k: v for k, v in start.data.get("screen", {}).items() if k in RATINGS and not c.ratings}
    for row, (op, text) in zip(SCREEN_ROWS, c.screens, strict=False):
        if text.strip():
            screen[row.symbol] = f"{op} {text.strip()}"
    for rating, level in c.ratings:
        if level.strip():
            screen[rating] = f">= {level.strip()}"
    if set(c.families) != set(FAMILIES):
        screen["families"] = [f for f in FAMILIES if f in c.families] or list(c.families)
    if c.exclude:
        screen["exclude"] = list(c.exclude)
    if c.allow_brittle:
        screen["allow_brittle"] = True
    return screen


def spec_data(start: Start, c: Controls) -> dict[str, Any]:
    """The loaded spec's dict with the controls' changes (to be validated by ``spec_from_dict``)."""
    data = copy.deepcopy(start.data)
    data["objective"] = {"minimize": c.objective}
    data["units"] = c.units
    if c.index.strip():
        data["index"] = c.index.strip()
    else:
        data.pop("index", None)
    fields = dict(c.fields)
    for path, text in fields.items():
        f = FIELD_BY_PATH.get(path)
        if f is not None and f.table in ("part", "section", "sandwich"):
            _set(data.setdefault(f.table, {}), f.name, text)
    data.setdefault("section", {})["free"] = c.free
    if data["section"].get("shape") == SANDWICH_SHAPE:
        sandwich = data.setdefault("sandwich", {})
        for key, chosen in (("faces", c.faces), ("cores", c.cores)):
            if chosen:
                sandwich[key] = list(chosen)
            else:
                sandwich.pop(key, None)
        if not sandwich:
            data.pop("sandwich")
    else:
        data.pop("sandwich", None)
    data["constraint"] = _constraint_items(start, c, fields)
    data["screen"] = _screen_data(start, c)
    return data


def with_construction(start: Start, data: dict[str, Any], construction: str) -> dict[str, Any]:
    """Spec data with a beam's or panel's section made a sandwich, or made solid again.

    A sandwich finds both thicknesses (free = faces-and-core) and keeps only a beam's width;
    going back to solid restores the section the explorer was started with when that
    one is solid, else takes the solid the sandwich is compared with (a rectangle, depth
    or thickness free).
    """
    from selector.pipeline.sandwich import SANDWICH_FREE

    data = copy.deepcopy(data)
    section = data.get("section", {})
    function = data.get("part", {}).get("function")
    width = {"b": section["b"]} if "b" in section and function == "beam" else {}
    if construction == SANDWICH_SHAPE:
        if section.get("shape") != SANDWICH_SHAPE:
            data["section"] = {"shape": SANDWICH_SHAPE, "free": SANDWICH_FREE, **width}
        return data
    if section.get("shape") != SANDWICH_SHAPE:
        return data
    data.pop("sandwich", None)
    first = start.data.get("section", {})
    if first.get("shape") != SANDWICH_SHAPE and start.spec.part.function == function:
        data["section"] = copy.deepcopy(first)
    else:
        free = "thickness" if function == "panel" else "depth"
        data["section"] = {"shape": "rectangle", "free": free, **width}
    return data


def _number(text: str, source: str, index: int, name: str) -> float:
    """A number typed in a constraint's control (the spec takes no quoted text)."""
    try:
        value = float(text.strip())
    except ValueError:
        value = math.nan
    if not math.isfinite(value):
        where = f"{source}: constraint[{index}].{name}"
        what = f"{text.strip()!r} is not a number"
        raise InputError(where, what, "a plain number such as 1.5", ("constraint", index, name))
    return value


def _run(start: Start, c: Controls, for_report: bool = False) -> Any:
    """The Selection for the controls (raises SelectorError on bad input).

    ``for_report`` asks the pipeline for the studies the report shows (the usual trade-off
    and the Monte Carlo odds), as ``selector report`` does.
    """
    from selector.inputs.spec import spec_from_dict
    from selector.pipeline.selection import select

    spec = spec_from_dict(spec_data(start, c), source=start.name)
    if not for_report:
        return select(spec, start.table)
    from selector.outputs.report import DEFAULT_REPORT_DRAWS
    from selector.pipeline.tradeoff import SECOND_OBJECTIVE

    second = SECOND_OBJECTIVE.get(spec.objective.minimize)
    return select(spec, start.table, robust=DEFAULT_REPORT_DRAWS, tradeoff=second)


_CONSTRAINT_AT = re.compile(r"^constraint\[(\d+)\]\.?(\w*)")


def _route(where: str, data: Mapping[str, Any] | None = None) -> str:
    """The message key for an error's location (``"spec.toml: constraint[1].safety_factor"``).

    ``data`` is the spec data that was run, to find the type of a numbered constraint.
    """
    place = where.rsplit(": ", 1)[-1]
    for row in SCREEN_ROWS:
        if place == f"screen.{row.symbol}":
            return row.key
    for rating in RATINGS:
        if place == f"screen.{rating}":
            return rating_key(rating)
    if "max_deflection" in place or "max_twist" in place:
        return "stiffness_limit"
    match = _CONSTRAINT_AT.match(place)
    if match:
        items = (data or {}).get("constraint") or []
        at, name = int(match.group(1)), match.group(2)
        kind = items[at].get("type") if at < len(items) and isinstance(items[at], dict) else None
        key = f"constraint-{kind}-{name}"
        if key in MESSAGE_KEYS:
            return key
        return "safety_factor" if name == "safety_factor" and kind in (None, "strength") else "constraints"
    if "safety_factor" in place:
        return "safety_factor"
    if place.startswith("constraint"):
        return "constraints"
    if place.startswith("objective"):
        return "objective"
    if place.startswith("section.free"):
        return "free"
    head = place.split("[", 1)[0].replace(".", "-")
    if head in MESSAGE_KEYS:
        return head
    if place in ("index", "expression") or place.startswith(("index", "expression")):
        return "index"
    if place.startswith("sandwich.faces"):
        return "faces"
    if place.startswith("sandwich.cores"):
        return "cores"
    if place.startswith("screen.exclude") and not place.startswith("screen.exclude_families"):
        return "exclude"
    if place.startswith("screen"):
        return "families"
    if place == "units":
        return "units"
    return "general"


def _where(exc: SelectorError) -> str:
    return str(getattr(exc, "where", ""))


def error_messages(exc: SelectorError, data: Mapping[str, Any] | None = None) -> dict[str, str]:
    """Each problem of an error beside the control it concerns (a spec's problems one by one)."""
    problems = getattr(exc, "errors", None) or (exc,)
    messages: dict[str, str] = {}
    for problem in problems:
        key = _route(_where(problem), data)
        messages[key] = "\n".join(m for m in (messages.get(key), str(problem)) if m)
    return messages


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

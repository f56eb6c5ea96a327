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
from selector.inputs.properties import FAMILIES, PROPERTIES
from selector.inputs.spec import Spec
from selector.inputs.units import format_number

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
    constraints: list[dict[str, Any]] = []
    for kind in chosen:
        item = dict(base.get(kind, {"type": kind}))
        if kind == "stiffness":
            item.pop(field, None)
            if c.stiffness_limit.strip():
                item[field] = c.stiffness_limit.strip()
        if kind == "strength":
            item.pop("safety_factor", None)
            if c.safety_factor.strip():
                item["safety_factor"] = _number(c.safety_factor, start.name, len(constraints))
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


def _number(text: str, source: str, index: int) -> float:
    """The safety factor typed in its control as a number (the spec takes no quoted text)."""
    try:
        return float(text.strip())
    except ValueError:
        where = f"{source}: constraint[{index}].safety_factor"
        what = f"{text.strip()!r} is not a number"
        raise InputError(
            where, what, "a positive number such as 1.5", ("constraint", index, "safety_factor")
        ) from None


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

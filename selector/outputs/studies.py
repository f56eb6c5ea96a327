"""Tables of the trade-off and robustness studies: the frames the pipeline computed, as text.

Every table a study prints is also available as a frame by name (``study_frames``), so
each output format can carry all of them: one JSON object, one CSV file per table, one
workbook sheet per table.
"""

from __future__ import annotations

import json
from collections.abc import Mapping
from typing import Any

import pandas as pd

from selector.inputs.units import format_number
from selector.mechanics.objectives import OBJECTIVE_UNITS
from selector.outputs.display_units import BTU, INCH, POUND, text_in_units
from selector.outputs.tables import ENERGY_UNIT, fit_frame, render
from selector.outputs.terminal import Layout, Shorten, Step, wrap
from selector.pipeline.columns import is_index_column
from selector.pipeline.robust import RobustResult
from selector.pipeline.tradeoff import EXCHANGE_LABELS

CUBIC_INCH = INCH**3
"""m³ per cubic inch (exact)."""
KBTU_IN_MJ = BTU * 1e3 / 1e6
"""MJ per thousand British thermal units."""

_US = {"mass": ("lb", 1 / POUND), "volume": ("in³", 1 / CUBIC_INCH), "energy": ENERGY_UNIT["us"]}
"""Objectives shown in US units: (unit, factor from the SI value). Cost stays in USD and
embodied carbon in kg CO2e, units used the world over."""
_US_ALPHA = {
    "USD/kg": ("USD/lb", POUND),
    "USD/m³": ("USD/in³", CUBIC_INCH),
    "USD/MJ": ("USD/kBtu", KBTU_IN_MJ),
}
"""Exchange constants shown in US units: (unit, factor from the SI value)."""


def objective_unit(name: str, units: str = "si") -> tuple[str, float]:
    """(unit, factor from the SI value) an objective is shown in: mass in kg or lb, ..."""
    return _US[name] if units == "us" and name in _US else (OBJECTIVE_UNITS[name], 1.0)


def exchange_unit(unit: str, units: str = "si") -> tuple[str, float]:
    """(unit, factor from the SI value) an exchange constant of SI ``unit`` is shown in."""
    return _US_ALPHA[unit] if units == "us" and unit in _US_ALPHA else (unit, 1.0)


def exchange_text(alpha: float, priced: str, units: str = "si") -> str:
    """An exchange constant (USD per SI unit of ``priced``) as shown: "40 USD/kg", "18.1 USD/lb"."""
    unit, factor = exchange_unit(EXCHANGE_LABELS[priced], units)
    return f"{format_number(alpha * factor)} {unit}"


def _display(frame: pd.DataFrame, units: str = "si") -> pd.DataFrame:
    """Units into the headers, in the chosen system; α columns labelled with their unit."""
    out = frame.copy()
    labels = {"penalty": "penalty [USD]"}
    for name in OBJECTIVE_UNITS:
        unit, factor = objective_unit(name, units)
        if name in out and factor != 1.0:
            out[name] = out[name] * factor
        labels[name] = f"{name} [{unit}]"
    if "alpha_unit" in out:
        unit, factor = exchange_unit(str(out["alpha_unit"].iloc[0]) if len(out) else "", units)
        if factor != 1.0:
            out[["alpha_low", "alpha_high"]] = out[["alpha_low", "alpha_high"]] * factor
        out = out.drop(columns="alpha_unit").rename(
            columns={"alpha_low": f"alpha_low [{unit}]", "alpha_high": f"alpha_high [{unit}]"}
        )
    return out.rename(columns=labels)


def _short_of(class_id: str, name: str, short: Mapping[str, str]) -> str:
    """A class's short name; a face + core pair's is both short names joined by "+"."""
    if class_id in short:
        return short[class_id]
    parts = class_id.split("+")
    return " + ".join(short[p] for p in parts) if len(parts) > 1 and all(p in short for p in parts) else name


def _layout(
    frame: pd.DataFrame,
    short: Mapping[str, str] | None,
    optional: tuple[str, ...],
    short_always: bool = False,
    leave_out: tuple[str, ...] = (),
) -> Layout:
    """Study tables narrow by notes, standard errors, short names, then the named columns (id, family last).

    ``short_always`` names classes by their short names and ``leave_out`` leaves columns
    out whatever the width (to match a table printed beside it).
    """
    steps: list[Step] = [c for c in frame.columns if str(c).endswith("_se")]
    if short and "name" in frame:
        names = [_short_of(str(i), str(n), short) for i, n in zip(frame["id"], frame["name"], strict=True)]
        steps.append(Shorten("name", names, always=short_always))
    steps += [*optional, *(c for c in _NAMING if c not in leave_out)]
    return Layout(notes=("note",), steps=steps, elide=("name",), leave_out=leave_out)


_NAMING = ("family", "id")
"""The columns naming a class besides its name, left out last and alike in tables printed together."""


def _head(frame: pd.DataFrame, top: int | None) -> pd.DataFrame:
    return frame if top is None else frame.head(top)


def tradeoff_frames(
    front: pd.DataFrame, second: pd.DataFrame, units: str = "si", top: int | None = None
) -> dict[str, pd.DataFrame]:
    """The trade-off's tables as shown, by name: ``front`` and ``penalty`` or ``ranges``.

    ``top`` keeps the first N rows of each (the front by rank, the penalty ranking best first).
    """
    kind = "penalty" if "penalty" in second else "ranges"
    return {"front": _display(_head(front, top), units), kind: _display(_head(second, top), units)}


def _odds(result: RobustResult) -> pd.DataFrame:
    return result.table.rename(
        columns={"p_top_k": f"p_top_{result.top_k}", "p_top_k_se": f"p_top_{result.top_k}_se"}
    )


def robustness_frames(
    result: RobustResult, sensitivity: pd.DataFrame | None = None, top: int | None = None
) -> dict[str, pd.DataFrame]:
    """The robustness study's tables, by name: ``robustness`` (the odds) and ``sensitivity``.

    ``top`` keeps the odds of the first N candidates.
    """
    frames = {"robustness": _head(_odds(result), top)}
    if sensitivity is not None and not sensitivity.empty:
        frames["sensitivity"] = sensitivity
    return frames


def study_frames(selection: Any, units: str = "si", top: int | None = None) -> dict[str, pd.DataFrame]:
    """Every table of the studies a Selection carries, by name, in the order they print."""
    frames: dict[str, pd.DataFrame] = {}
    if selection.tradeoff is not None:
        frames |= tradeoff_frames(selection.tradeoff.front, selection.tradeoff.second, units, top)
    if selection.robust is not None:
        frames |= robustness_frames(selection.robust, selection.sensitivity, top)
    return frames


def render_tradeoff(
    front: pd.DataFrame,
    second: pd.DataFrame,
    fmt: str = "table",
    exchange: float | None = None,
    note: str = "",
    width: int | None = None,
    short: Mapping[str, str] | None = None,
    units: str = "si",
    top: int | None = None,
) -> str:
    """The two frames of ``tradeoff_report`` as text (table, md, csv or json).

    ``csv`` gives the second frame only (it carries the front members' values);
    ``json`` gives one object with both. ``exchange`` is the exchange constant in USD per
    SI unit of the objective it prices (``TradeoffStudy.alpha``), shown in ``units``.
    ``note`` is what the study assumes (shown above the tables, and as ``note`` in JSON).
    A terminal table fits ``width`` characters, naming classes by ``short`` (id → short
    name) when it must; ``top`` keeps N rows of each.
    """
    frames = tradeoff_frames(front, second, units, top)
    kind = "penalty" if "penalty" in second else "ranges"
    if fmt == "json":
        doc = {name: json.loads(render(f, "json")) for name, f in frames.items()}
        return json.dumps(doc | ({"note": text_in_units(note, units)} if note else {}), indent=2)
    if fmt == "csv":
        return render(frames[kind], "csv")
    body = "md" if fmt == "md" else "table"
    objectives = [c for c in front.columns if c in OBJECTIVE_UNITS or is_index_column(c)]
    shown = f", the first {top} shown" if top is not None and top < len(front) else ""
    tables = {name: render(frame, body) for name, frame in frames.items()}
    if body == "table":
        tables = _fitted_alike(frames, width, short, {"front": ("rank",), kind: ("on_hull", "rank")})
    lines = [
        f"Pareto front ({' vs '.join(objectives)}; all minimised): {len(front)} members{shown}",
        *([f"note: {text_in_units(note, units)}"] if note else []),
        "",
        tables["front"],
        "",
    ]
    if kind == "penalty":
        priced = [c for c in second.columns if c in EXCHANGE_LABELS]
        terms = " + ".join(f"α_{c}·{c}" for c in priced)
        given = f" = {exchange_text(exchange, priced[0], units)}" if exchange is not None and priced else ""
        lines.append(f"Ranked by penalty Z = cost + {terms} [USD] (α{given})")
    else:
        lines.append(
            "Exchange-constant range over which each front member is the best choice "
            "(Z = y + α·x; empty where never best)"
        )
    lines = wrap(lines, width)
    lines += ["", tables[kind]]
    return "\n".join(lines)


def _fitted_alike(
    frames: Mapping[str, pd.DataFrame],
    width: int | None,
    short: Mapping[str, str] | None,
    optional: Mapping[str, tuple[str, ...]],
) -> dict[str, str]:
    """Tables printed one above the other, fitted to ``width``; if one names classes by their
    short names, or leaves out their id or family, every one does."""
    fitted = {name: fit_frame(f, width, _layout(f, short, optional[name])) for name, f in frames.items()}
    shorts = {"name" in f.shortened for f in fitted.values()}
    gone = tuple(c for c in _NAMING if any(c in f.left_out for f in fitted.values()))
    if len(shorts) > 1 or any(set(gone) - set(f.left_out) for f in fitted.values()):
        fitted = {
            name: fit_frame(f, width, _layout(f, short, optional[name], any(shorts), gone))
            for name, f in frames.items()
        }
    return {name: f.text for name, f in fitted.items()}


def render_robustness(
    result: RobustResult,
    fmt: str = "table",
    sensitivity: pd.DataFrame | None = None,
    width: int | None = None,
    short: Mapping[str, str] | None = None,
    top: int | None = None,
) -> str:
    """The odds (and optionally the sensitivity) as text: table, md, csv or json.

    ``csv`` gives the odds only; ``json`` one object with the run's settings; ``top``
    keeps the odds of the first N candidates.
    """
    frames = robustness_frames(result, sensitivity, top)
    odds = frames["robustness"]
    if fmt == "json":
        doc = {
            "draws": result.draws,
            "seed": result.seed,
            "distribution": result.distribution,
            "clip": result.clip,
            "top_k": result.top_k,
            "ranked_by": result.ranked_by,
            "properties": list(result.properties),
            "candidates": json.loads(render(result.table if top is None else result.table.head(top), "json")),
        }
        if sensitivity is not None:
            doc["sensitivity"] = json.loads(render(sensitivity, "json"))
        return json.dumps(doc, indent=2)
    if fmt == "csv":
        return render(odds, "csv")
    body = "md" if fmt == "md" else "table"
    better = (
        "higher merit index is better"
        if result.ranked_by == "index"
        else f"lower {result.ranked_by} is better"
    )
    clipped = ", clipped to the range" if result.distribution == "log-normal" and result.clip else ""
    lines = [
        f"Monte Carlo over property ranges: {result.draws} draws, {result.distribution}{clipped}, "
        f"seed {result.seed}; {better}",
        f"properties drawn: {', '.join(result.properties) or 'none'}",
        "",
        render(odds, body, width, _layout(odds, short, _spare_odds(odds)))
        if not result.table.empty
        else "no ranked candidates",
        "",
        "p_best, p_top_k: odds of ranking first / in the top k; *_se: Monte Carlo standard error; "
        "rank_p05..p95: 5th, 50th and 95th percentile of the rank",
    ]
    if "sensitivity" in frames:
        leader = frames["sensitivity"]["leader"].iat[0]
        lines += [
            "",
            f"Sensitivity of the leader ({leader}) to each property's scatter:",
            "",
            render(frames["sensitivity"], body, width, _SENSITIVITY_LAYOUT),
        ]
    return "\n".join(wrap(lines, width))


_SENSITIVITY_LAYOUT = Layout(steps=("leader", "p_best_se", "name"), elide=("name",))
"""The leader is named above the sensitivity table and each property by its symbol too."""


def _spare_odds(shown: pd.DataFrame) -> tuple[str, ...]:
    """Odds columns a narrow terminal may leave out: standard errors, then the outer percentiles."""
    errors = tuple(c for c in shown.columns if c.endswith("_se"))
    return (*errors, "rank_p05", "rank_p95", "rank")


__all__ = ["render_robustness", "render_tradeoff", "robustness_frames", "study_frames", "tradeoff_frames"]

"""Tables of the trade-off and robustness studies: the frames the pipeline computed, as text."""

from __future__ import annotations

import json
from collections.abc import Mapping

import pandas as pd

from selector.mechanics.objectives import OBJECTIVE_UNITS
from selector.outputs.tables import render
from selector.outputs.terminal import Layout, wrap
from selector.pipeline.columns import is_index_column
from selector.pipeline.robust import RobustResult
from selector.pipeline.tradeoff import EXCHANGE_LABELS

_LABELS = {**{k: f"{k} [{u}]" for k, u in OBJECTIVE_UNITS.items()}, "penalty": "penalty [USD]"}


def _display(frame: pd.DataFrame) -> pd.DataFrame:
    """Units into the headers; α columns labelled with their unit."""
    out = frame.copy()
    if "alpha_unit" in out:
        unit = out["alpha_unit"].iloc[0] if len(out) else ""
        out = out.drop(columns="alpha_unit").rename(
            columns={"alpha_low": f"alpha_low [{unit}]", "alpha_high": f"alpha_high [{unit}]"}
        )
    return out.rename(columns=_LABELS)


def _short_of(class_id: str, name: str, short: Mapping[str, str]) -> str:
    """A class's short name; a face + core pair's is both short names joined by "+"."""
    if class_id in short:
        return short[class_id]
    parts = class_id.split("+")
    return " + ".join(short[p] for p in parts) if len(parts) > 1 and all(p in short for p in parts) else name


def _layout(frame: pd.DataFrame, short: Mapping[str, str] | None, optional: tuple[str, ...]) -> Layout:
    """Study tables narrow by notes, short names, then the named columns (id, family last)."""
    shorts = {}
    if short and "name" in frame:
        shorts = {
            "name": [
                _short_of(str(i), str(n), short) for i, n in zip(frame["id"], frame["name"], strict=True)
            ]
        }
    return Layout(
        short=shorts,
        notes=("note",),
        spare=tuple(c for c in frame.columns if str(c).endswith("_se")),
        optional=(*optional, "family", "id"),
        elide=("name",),
    )


def render_tradeoff(
    front: pd.DataFrame,
    second: pd.DataFrame,
    fmt: str = "table",
    exchange: float | str | None = None,
    note: str = "",
    width: int | None = None,
    short: Mapping[str, str] | None = None,
) -> str:
    """The two frames of ``tradeoff_report`` as text (table, md, csv or json).

    ``csv`` gives the second frame only (it carries the front members' values);
    ``json`` gives one object with both. ``note`` is what the study assumes (shown above
    the tables, and as ``note`` in JSON). A terminal table fits ``width`` characters, naming
    classes by ``short`` (id → short name) when it must.
    """
    kind = "penalty" if "penalty" in second else "ranges"
    if fmt == "json":
        doc = {
            "front": json.loads(render(_display(front), "json")),
            kind: json.loads(render(_display(second), "json")),
        }
        return json.dumps(doc | ({"note": note} if note else {}), indent=2)
    if fmt == "csv":
        return render(_display(second), "csv")
    body = "md" if fmt == "md" else "table"
    objectives = [c for c in front.columns if c in OBJECTIVE_UNITS or is_index_column(c)]
    lines = [
        f"Pareto front ({' vs '.join(objectives)}; all minimised): {len(front)} members",
        *([f"note: {note}"] if note else []),
        "",
        render(_display(front), body, width, _layout(front, short, ("rank",))),
        "",
    ]
    if kind == "penalty":
        priced = [c for c in second.columns if c in EXCHANGE_LABELS]
        terms = " + ".join(f"α_{c}·{c}" for c in priced)
        shown = f" = {exchange}" if exchange is not None else ""
        lines.append(f"Ranked by penalty Z = cost + {terms} [USD] (α{shown})")
    else:
        lines.append(
            "Exchange-constant range over which each front member is the best choice "
            "(Z = y + α·x; empty where never best)"
        )
    lines = wrap(lines, width)
    lines += ["", render(_display(second), body, width, _layout(second, short, ("on_hull", "rank")))]
    return "\n".join(lines)


def render_robustness(
    result: RobustResult,
    fmt: str = "table",
    sensitivity: pd.DataFrame | None = None,
    width: int | None = None,
    short: Mapping[str, str] | None = None,
) -> str:
    """The odds (and optionally the sensitivity) as text: table, md, csv or json.

    ``csv`` gives the odds only; ``json`` one object with the run's settings.
    """
    if fmt == "json":
        doc = {
            "draws": result.draws,
            "seed": result.seed,
            "distribution": result.distribution,
            "clip": result.clip,
            "top_k": result.top_k,
            "ranked_by": result.ranked_by,
            "properties": list(result.properties),
            "candidates": json.loads(render(result.table, "json")),
        }
        if sensitivity is not None:
            doc["sensitivity"] = json.loads(render(sensitivity, "json"))
        return json.dumps(doc, indent=2)
    shown = result.table.rename(
        columns={"p_top_k": f"p_top_{result.top_k}", "p_top_k_se": f"p_top_{result.top_k}_se"}
    )
    if fmt == "csv":
        return render(shown, "csv")
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
        render(shown, body, width, _layout(shown, short, _spare_odds(shown)))
        if not result.table.empty
        else "no ranked candidates",
        "",
        "p_best, p_top_k: odds of ranking first / in the top k; *_se: Monte Carlo standard error; "
        "rank_p05..p95: 5th, 50th and 95th percentile of the rank",
    ]
    if sensitivity is not None and not sensitivity.empty:
        lines += [
            "",
            f"Sensitivity of the leader ({sensitivity['leader'].iat[0]}) to each property's scatter:",
            "",
            render(sensitivity, body, width, Layout(elide=("property",))),
        ]
    return "\n".join(wrap(lines, width))


def _spare_odds(shown: pd.DataFrame) -> tuple[str, ...]:
    """Odds columns a narrow terminal may leave out: standard errors, then the outer percentiles."""
    errors = tuple(c for c in shown.columns if c.endswith("_se"))
    return (*errors, "rank_p05", "rank_p95", "rank")


__all__ = ["render_robustness", "render_tradeoff"]

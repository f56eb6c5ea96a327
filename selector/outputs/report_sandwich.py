"""The report's sandwich section: the ranked face × core pairs beside the best solid part.

Reads ``Selection.sandwich`` and converts units for display; computes nothing.
"""

from __future__ import annotations

from typing import Any

from selector.inputs.units import format_number
from selector.mechanics.sandwich import MODES, SOURCES
from selector.outputs.sandwich_tables import pairs_frame
from selector.outputs.tables import _LENGTH_FACTOR, _MASS_FACTOR, LENGTH_UNIT, MASS_UNIT

REPORT_PAIRS = 15
"""Pairs listed in the report; the pairs chart shows every one."""


def _num(value: Any) -> str:
    try:
        v = float(value)
    except (TypeError, ValueError):
        return "–"
    return format_number(v) if v == v else "–"


def _pair_rows(selection: Any, units: str) -> list[dict[str, Any]]:
    frame = pairs_frame(selection, units, REPORT_PAIRS)
    lu, mu = LENGTH_UNIT[units], MASS_UNIT[units]
    rows = []
    for r in frame.to_dict(orient="records"):
        util = r["utilisation"]
        rows.append(
            {
                "rank": int(r["rank"]),
                "face": r["face_name"],
                "core": r["core_name"],
                "t_face": _num(r[f"t_face [{lu}]"]),
                "t_core": _num(r[f"t_core [{lu}]"]),
                "depth": _num(r[f"depth [{lu}]"]),
                "mass": _num(r[f"mass [{mu}]"]),
                "cost": _num(r["cost [USD]"]),
                "co2": _num(r["co2 [kg CO2e]"]),
                "bending": _num(r[f"deflection_bending [{lu}]"]),
                "shear": _num(r[f"deflection_shear [{lu}]"]),
                "utilisation": [
                    {"mode": m, "value": f"{util[m]:.2f}", "governs": m == r["governing"]}
                    for m in MODES
                    if m in util
                ],
                "governing": r["governing"],
                "warnings": list(r["warnings"]),
            }
        )
    return rows


def _solid(selection: Any, units: str) -> dict[str, str] | None:
    solid = selection.sandwich.solid
    if solid is None:
        return None
    lf, mf = _LENGTH_FACTOR[units], _MASS_FACTOR[units]
    return {
        "name": str(solid["name"]),
        "thickness": _num(float(solid["thickness"]) * lf),
        "mass": _num(float(solid["mass"]) * mf),
        "cost": _num(solid["cost"]),
        "co2": _num(float(solid["co2"]) * mf),
        "governing": str(solid["governing"]),
    }


def sandwich_view(selection: Any, units: str) -> dict[str, Any] | None:
    """Everything the sandwich section shows (None when the Selection is not a sandwich).

    ``figure`` is the face × core chart as a plotly figure, for the report to embed.
    """
    result = selection.sandwich
    if result is None:
        return None
    from selector.outputs.charts.sandwich import pairs_chart

    loads = result.loads
    lu, mu = LENGTH_UNIT[units], MASS_UNIT[units]
    feasible = len(result.feasible)
    excluded = [
        {"name": r["name"], "role": r["role"], "reason": r["reason"]}
        for r in result.excluded.to_dict(orient="records")
    ]
    try:
        figure: Any = pairs_chart(selection)
    except ValueError as exc:  # plotly refuses a figure it cannot build
        figure = {"note": f"the pairs chart could not be drawn: {exc}"}
    rows = _pair_rows(selection, units)
    return {
        "function": loads.function,
        "support": loads.case.support,
        "load": loads.case.load,
        "objective": loads.objective,
        "length_unit": lu,
        "mass_unit": mu,
        "sized": feasible,
        "infeasible": len(result.pairs) - feasible,
        "shown": min(feasible, REPORT_PAIRS),
        "rows": rows,
        "warned": any(r["warnings"] for r in rows),
        "modes": list(MODES),
        "solid": _solid(selection, units),
        "equations": list(loads.case.equations),
        "assumptions": list(result.assumptions),
        "sources": list(SOURCES),
        "excluded": excluded,
        "figure": figure,
    }


__all__ = ["REPORT_PAIRS", "sandwich_view"]

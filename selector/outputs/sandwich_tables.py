"""The sandwich pairs as tables: terminal, Markdown, CSV, JSON and the flat frame of spreadsheets.

Reads ``Selection.sandwich`` and the solid parts beside it; converts units, computes nothing.
"""

from __future__ import annotations

import json
from typing import Any

import pandas as pd

from selector.mechanics.sandwich import MODES
from selector.outputs.cells import csv_text
from selector.outputs.display_units import text_in_units
from selector.outputs.tables import (
    _LENGTH_FACTOR,
    _MASS_FACTOR,
    ENERGY_UNIT,
    LENGTH_UNIT,
    MASS_UNIT,
    _json_value,
    assumptions_in,
    render,
    short_names,
)
from selector.outputs.terminal import Layout, Shorten, Step, wrap


def pairs_frame(selection: Any, units: str = "si", top: int | None = None) -> pd.DataFrame:
    """One row per feasible face × core pair, best first, with units in the headers."""
    result = selection.sandwich
    pairs = result.feasible if top is None else result.feasible.head(top)
    lf, mf = _LENGTH_FACTOR[units], _MASS_FACTOR[units]
    lu, mu = LENGTH_UNIT[units], MASS_UNIT[units]
    eu, ef = ENERGY_UNIT[units]
    return pd.DataFrame(
        {
            "rank": pairs["rank"].astype(int),
            "face": pairs["face"],
            "core": pairs["core"],
            "face_name": pairs["face_name"],
            "core_name": pairs["core_name"],
            f"t_face [{lu}]": pairs["t_face"] * lf,
            f"t_core [{lu}]": pairs["t_core"] * lf,
            f"depth [{lu}]": pairs["depth"] * lf,
            f"mass [{mu}]": pairs["mass"] * mf,
            "cost [USD]": pairs["cost"],
            "co2 [kg CO2e]": pairs["co2"],
            f"energy [{eu}]": pairs["energy"] * ef,
            f"deflection_bending [{lu}]": pairs["deflection_bending"] * lf,
            f"deflection_shear [{lu}]": pairs["deflection_shear"] * lf,
            "utilisation": pairs["utilisation"],
            "governing": pairs["governing"],
            "warnings": [[text_in_units(str(w), units) for w in ws] for ws in pairs["warnings"]],
        }
    )


def _utilisation_text(u: dict) -> str:
    return ", ".join(f"{mode} {value:.2f}" for mode, value in u.items())


def solid_line(selection: Any, units: str) -> str:
    """One line on the best solid part sized for the same spec (or that none fits the depth)."""
    solid = selection.sandwich.solid
    if solid is None:
        return "best solid part: none within the depth allowed"
    lf, mf = _LENGTH_FACTOR[units], _MASS_FACTOR[units]
    return (
        f"best solid part for the same spec: {solid['name']}, h = {solid['thickness'] * lf:.3g} "
        f"{LENGTH_UNIT[units]}, mass {solid['mass'] * mf:.3g} {MASS_UNIT[units]}, "
        f"cost {solid['cost']:.3g} USD ({solid['governing']} governs)"
    )


def _json(selection: Any, units: str, top: int | None) -> str:
    frame = pairs_frame(selection, units, top)
    lu, mu = LENGTH_UNIT[units], MASS_UNIT[units]
    eu = ENERGY_UNIT[units][0]
    rows = []
    for r in frame.to_dict(orient="records"):
        rows.append(
            {
                "rank": int(r["rank"]),
                "face": r["face"],
                "core": r["core"],
                "face_name": r["face_name"],
                "core_name": r["core_name"],
                "dimensions": {
                    "t_face": {"value": _json_value(r[f"t_face [{lu}]"]), "unit": lu},
                    "t_core": {"value": _json_value(r[f"t_core [{lu}]"]), "unit": lu},
                },
                "mass": {"value": _json_value(r[f"mass [{mu}]"]), "unit": mu},
                "cost": {"value": _json_value(r["cost [USD]"]), "unit": "USD"},
                "co2": {"value": _json_value(r["co2 [kg CO2e]"]), "unit": "kg CO2e"},
                "energy": {"value": _json_value(r[f"energy [{eu}]"]), "unit": eu},
                "deflection": {
                    "bending": {"value": _json_value(r[f"deflection_bending [{lu}]"]), "unit": lu},
                    "shear": {"value": _json_value(r[f"deflection_shear [{lu}]"]), "unit": lu},
                },
                "utilisation": {k: _json_value(v) for k, v in r["utilisation"].items()},
                "governing": r["governing"],
                "warnings": list(r["warnings"]),
                "caution": selection.caution,
            }
        )
    solid = selection.sandwich.solid
    lf, mf = _LENGTH_FACTOR[units], _MASS_FACTOR[units]
    solid_out = None
    if solid is not None:
        solid_out = {
            "id": solid["id"],
            "name": solid["name"],
            "dimensions": {"h": {"value": float(solid["thickness"]) * lf, "unit": lu}},
            "mass": {"value": float(solid["mass"]) * mf, "unit": mu},
            "cost": {"value": float(solid["cost"]), "unit": "USD"},
            "co2": {"value": float(solid["co2"]), "unit": "kg CO2e"},
            "governing": solid["governing"],
        }
    out = {
        "pairs": rows,
        "solid": solid_out,
        "assumptions": assumptions_in(selection, units),
        "caution": selection.caution,
    }
    return json.dumps(out, indent=2, allow_nan=False)


def flat_pairs(selection: Any, units: str = "si", top: int | None = None) -> pd.DataFrame:
    """The pairs with one ``utilisation_<mode>`` column per failure mode, warnings joined, the caution.

    For CSV and spreadsheets: one value per cell, units in the headers.
    """
    frame = pairs_frame(selection, units, top)
    flat = frame.drop(columns=["utilisation", "warnings"])
    at = flat.columns.get_loc("governing")
    for offset, mode in enumerate(MODES):
        values = [u.get(mode) for u in frame["utilisation"]]
        flat.insert(at + offset, f"utilisation_{mode}", pd.array(values, dtype="Float64").astype(float))
    flat["warnings"] = ["; ".join(w) for w in frame["warnings"]]
    flat["caution"] = selection.caution
    return flat


def render_sandwich(
    selection: Any, fmt: str, units: str = "si", top: int | None = None, width: int | None = None
) -> str:
    """The ranked pairs in the chosen format; the table form adds the solid part, assumptions and caution.

    A terminal table fits ``width`` characters (every column in full when None).
    """
    if fmt == "json":
        return _json(selection, units, top)
    if fmt == "csv":
        return csv_text(flat_pairs(selection, units, top))
    frame = pairs_frame(selection, units, top)
    result = selection.sandwich
    shown = (
        frame.drop(columns=["face", "core"])
        .rename(columns={"face_name": "face", "core_name": "core"})
        .assign(utilisation=[_utilisation_text(u) for u in frame["utilisation"]])
    )
    loads = result.loads
    head = [
        f"{selection.spec.title}: sandwich {loads.function}, {loads.case.support}, {loads.case.load} load; "
        f"minimise {loads.objective}",
        *(f"  {eq}" for eq in loads.case.equations),
        *(f"assumes: {a}" for a in assumptions_in(selection, units)),
    ]
    foot = [
        solid_line(selection, units),
        f"{len(result.feasible)} pairs sized; "
        f"{len(result.pairs) - len(result.feasible)} cannot meet every mode; "
        f"{len(result.excluded)} classes left out as face or core",
        "",
        f"CAUTION: {selection.caution}",
    ]
    body = render(shown, "md" if fmt == "md" else "table", width, _pairs_layout(selection, frame))
    return "\n".join([*wrap(head, width), "", body, "", *wrap(foot, width)])


def _pairs_layout(selection: Any, frame: pd.DataFrame) -> Layout:
    """How the pairs table narrows: warnings to notes, short names, utilisations and deflections
    out, then the totals not ranked on (energy and depth first), the objective kept."""
    names = short_names(selection.table)
    objective = selection.sandwich.loads.objective
    totals = [c for c in ("energy", "depth", "co2", "cost") if c != objective]
    steps: list[Step] = [
        Shorten("co2", name="CO2e", unit="kg"),
        Shorten("face", [names.get(str(i), str(i)) for i in frame["face"]]),
        Shorten("core", [names.get(str(i), str(i)) for i in frame["core"]]),
        "utilisation",
        "deflection_shear",
        "deflection_bending",
        *totals,
    ]
    return Layout(notes=("warnings",), steps=steps, elide=("face", "core"))

"""A cross-section's properties as a table: area, centroid, second moments, moduli, shape factors.

Lengths in mm-based units, or inch-based with ``--units us``.
"""

from __future__ import annotations

import json
import math
from typing import Any

import pandas as pd

from selector.inputs.units import format_number
from selector.outputs.cells import csv_text
from selector.outputs.display_units import INCH
from selector.outputs.tables import render
from selector.outputs.terminal import Layout, wrap

SECTION_ROWS = (
    # key, label, power of length
    ("area", "area A", 2),
    ("centroid", "centroid (cx, cy)", 1),
    ("Ixx", "second moment Ixx", 4),
    ("Iyy", "second moment Iyy", 4),
    ("Ixy", "product of area Ixy", 4),
    ("I11", "principal I11", 4),
    ("I22", "principal I22", 4),
    ("Zx_top", "section modulus Zx top", 3),
    ("Zx_bottom", "section modulus Zx bottom", 3),
    ("Zy_left", "section modulus Zy left", 3),
    ("Zy_right", "section modulus Zy right", 3),
    ("rx", "radius of gyration rx", 1),
    ("ry", "radius of gyration ry", 1),
    ("J", "torsion constant J", 4),
    ("Zt", "torsional modulus Zt", 3),
)


def section_values(section: Any, units: str = "si") -> dict[str, dict[str, Any]]:
    """Every reported section property as {"value": ..., "unit": ...} in mm- or inch-based units."""
    length, factor = ("mm", 1e3) if units == "si" else ("in", 1 / INCH)
    sup = {1: "", 2: "^2", 3: "^3", 4: "^4"}
    raw = {
        "area": section.A,
        "Ixx": section.Ixx,
        "Iyy": section.Iyy,
        "Ixy": section.Ixy,
        "I11": section.I11,
        "I22": section.I22,
        "Zx_top": section.Zx_top,
        "Zx_bottom": section.Zx_bottom,
        "Zy_left": section.Zy_left,
        "Zy_right": section.Zy_right,
        "rx": section.rx,
        "ry": section.ry,
        "J": section.J,
        "Zt": section.Zt,
    }
    out: dict[str, dict[str, Any]] = {}
    for key, _label, power in SECTION_ROWS:
        unit = f"{length}{sup[power]}"
        if key == "centroid":
            out[key] = {"value": [section.cx * factor, section.cy * factor], "unit": length}
        else:
            out[key] = {"value": raw[key] * factor**power, "unit": unit}
    out["principal_angle"] = {"value": math.degrees(section.phi), "unit": "deg"}
    out["shape_factor_bending"] = {"value": section.phi_bending_stiffness, "unit": "1"}
    out["shape_factor_bending_strength"] = {"value": section.phi_bending_strength, "unit": "1"}
    out["shape_factor_torsion"] = {"value": section.phi_torsion_stiffness, "unit": "1"}
    out["shape_factor_torsion_strength"] = {"value": section.phi_torsion_strength, "unit": "1"}
    return out


def render_section(section: Any, fmt: str, units: str = "si", width: int | None = None) -> str:
    """A section's properties in the chosen format."""
    values = section_values(section, units)
    if fmt == "json":
        return json.dumps(
            {"shape": section.shape, **values, "J_method": section.J_method, "Zt_method": section.Zt_method},
            indent=2,
        )
    labels = {key: label for key, label, _ in SECTION_ROWS} | {
        "principal_angle": "principal angle",
        "shape_factor_bending": "shape factor, bending stiffness",
        "shape_factor_bending_strength": "shape factor, bending strength",
        "shape_factor_torsion": "shape factor, torsion stiffness",
        "shape_factor_torsion_strength": "shape factor, torsion strength",
    }
    rows = []
    for key, item in values.items():
        v = item["value"]
        shown = ", ".join(format_number(x, 4) for x in v) if isinstance(v, list) else format_number(v, 4)
        rows.append({"property": labels[key], "value": shown, "unit": item["unit"]})
    frame = pd.DataFrame(rows)
    if fmt == "csv":
        return csv_text(frame)
    text = render(frame, "md" if fmt == "md" else "table", width, Layout(elide=("property",)))
    return "\n".join([text, "", *wrap([f"J: {section.J_method}", f"Zt: {section.Zt_method}"], width)])


__all__ = ["SECTION_ROWS", "render_section", "section_values"]

"""Reject classes whose data or product form do not fit the part.

A class whose data hold along one axis only (``directions = "axial"``:
unidirectional composites, woods along or across the grain) is not ranked for a
biaxial or shear stress state. A class made only as a sandwich core is not sized as
a solid part, a laminate not as a solid round bar, and a class made only as wire not
as a section, sheet or plate. Each reason says why.
"""

from __future__ import annotations

import pandas as pd

from selector.errors import InputError
from selector.mechanics.product_forms import (
    CORE_ONLY_CLASSES,
    CORE_ONLY_REASON,
    LAMINATE_CLASSES,
    LAMINATE_REASON,
    SOLID_BAR_SHAPES,
    WIRE_CLASSES,
    WIRE_REASON,
)
from selector.mechanics.stress_states import DIRECTIONS, UNIAXIAL, one_axis_reason
from selector.pipeline.screen import REJECTED


def one_axis_mask(table: pd.DataFrame) -> pd.Series:
    """True for classes whose data hold along one axis only; a blank cell means every direction."""
    if "directions" not in table:
        return pd.Series(False, index=table.index)
    values = table["directions"].fillna("").astype(str).str.strip()
    bad = ~values.isin(("", *DIRECTIONS))
    if bad.any():
        row = table[bad].iloc[0]
        raise InputError(
            f"materials: class {row['id']}, field directions",
            f"{row['directions']!r} is not a direction",
            f"one of: {', '.join(DIRECTIONS)}",
        )
    return values == "axial"


def reject_for_stress_state(table: pd.DataFrame, state: str) -> pd.DataFrame:
    """A copy of ``table`` with one-axis classes rejected when ``state`` is biaxial or shear."""
    if state == UNIAXIAL:
        return table
    return _reject(table, one_axis_mask(table), one_axis_reason(state))


SECTION_FUNCTIONS = ("tie", "beam", "column", "shaft")


def reject_for_product_form(table: pd.DataFrame, function: str, shape: str) -> pd.DataFrame:
    """A copy of ``table`` without the classes that are not made in this part's form:
    sandwich-core-only classes for any solid part, laminates for a solid round bar, wire for
    anything but a spring, a solid round bar or a tie of any section."""
    out = _reject(table, table["id"].isin(CORE_ONLY_CLASSES), CORE_ONLY_REASON)
    round_bar = function in SECTION_FUNCTIONS and shape in SOLID_BAR_SHAPES
    if round_bar:
        out = _reject(out, out["id"].isin(LAMINATE_CLASSES), LAMINATE_REASON)
    if not round_bar and function != "spring" and not (function == "tie" and shape == "generic"):
        out = _reject(out, out["id"].isin(WIRE_CLASSES), WIRE_REASON)
    return out


def _reject(table: pd.DataFrame, mask: pd.Series, reason: str) -> pd.DataFrame:
    """A copy with the classes of ``mask`` not yet rejected rejected for ``reason``."""
    hit = mask & (table["status"] != REJECTED)
    if not hit.any():
        return table
    out = table.copy()
    out.loc[hit, "status"] = REJECTED
    out["reasons"] = [[*r, reason] if h else r for r, h in zip(out["reasons"], hit, strict=True)]
    return out

"""Reject classes whose data do not hold for the part's stress state.

A class whose data hold along one axis only (``directions = "axial"``:
unidirectional composites, woods along or across the grain) is not ranked for a
biaxial or shear stress state; the reason says why.
"""

from __future__ import annotations

import pandas as pd

from selector.errors import InputError
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
    hit = one_axis_mask(table) & (table["status"] != REJECTED)
    if not hit.any():
        return table
    out = table.copy()
    out.loc[hit, "status"] = REJECTED
    reason = one_axis_reason(state)
    out["reasons"] = [[*r, reason] if h else r for r, h in zip(out["reasons"], hit, strict=True)]
    return out

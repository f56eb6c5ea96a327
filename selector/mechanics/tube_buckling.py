"""Where the elastic long-tube buckling pressure stops holding on its own.

Bresse's pressure p_cr = E/(4(1−ν²))·(t/r)³ assumes the wall stays elastic up to
buckling. Its hoop stress at buckling, σ_E = p_cr·r/t = E/(4(1−ν²))·(t/r)², falls
with the wall's slenderness. Where σ_E comes near the compressive strength the wall
yields as it buckles, and the collapse stress lies below both σ_E and σ_c. Columns
meet the same interaction and take the Johnson parabola above σ_E = σ_c/2
(``column_buckling``); here the parabola is taken by analogy (no source for shells)
only to flag a wall whose collapse stress it puts clearly below the lesser of σ_E and
σ_c. The wall is not resized on it: the design code's collapse curve decides.
"""

from __future__ import annotations

import math

from selector.mechanics import column_buckling as columns
from selector.mechanics.loadcases import TUBE_BUCKLING

INTERACTION_LOSS = 0.05
"""Fraction below min(σ_E, σ_c) from which the interaction is flagged (a threshold of ours)."""


def elastic_buckling_stress(E: float, t: float, r: float) -> float:
    """Hoop stress [Pa] at Bresse's buckling pressure: E [Pa], wall t [m], radius r [m]."""
    return TUBE_BUCKLING * E * (t / r) ** 2


def collapse_stress(E: float, sigma_c: float, t: float, r: float) -> float:
    """Hoop stress [Pa] at collapse on the Johnson-type parabola (σ_E itself while slender)."""
    return columns.buckling_stress(elastic_buckling_stress(E, t, r), sigma_c)


def yield_interaction_note(E: float, sigma_c: float, t: float, r: float, demand: float = 0.0) -> str | None:
    """Why this wall's collapse pressure is below both the buckling and crushing values, or None.

    Args:
        E: Young's modulus [Pa]; sigma_c: compressive strength [Pa]; t: wall [m]; r: radius [m].
        demand: the working hoop stress times the buckling safety factor [Pa]; a collapse
            estimate below it is said to leave the wall short of its safety factor.
    """
    if not (math.isfinite(E) and math.isfinite(sigma_c) and min(E, sigma_c, t, r) > 0):
        return None
    elastic = elastic_buckling_stress(E, t, r)
    collapse = collapse_stress(E, sigma_c, t, r)
    lesser = min(elastic, sigma_c)
    if collapse >= (1 - INTERACTION_LOSS) * lesser:
        return None
    return (
        f"the elastic buckling stress p_cr·r/t = {elastic / 1e6:.3g} MPa is above σ_c/2 "
        f"({sigma_c / 2e6:.3g} MPa): the wall yields as it buckles, and a Johnson-type parabola "
        f"(the column's, by analogy) puts collapse at {collapse / 1e6:.3g} MPa, "
        f"{1 - collapse / lesser:.0%} below the lesser of the two"
        + (
            f", under the working hoop stress × SF ({demand / 1e6:.3g} MPa): on this estimate the wall "
            "does not keep its safety factor"
            if collapse < demand
            else ""
        )
        + "; check the wall against the design code's collapse curve"
    )


__all__ = ["INTERACTION_LOSS", "collapse_stress", "elastic_buckling_stress", "yield_interaction_note"]

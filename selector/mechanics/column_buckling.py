"""Inelastic buckling of a stocky column: where Euler's load stops holding.

Euler's load n²·π²·E·I/L² assumes the column stays elastic up to the buckling
stress. A short or stocky column yields first: once the Euler stress σ_E passes
about half the compressive strength, the Johnson parabola

    σ_cr = σ_c − σ_c²/(4·σ_E)

is used instead. It meets Euler's curve tangentially at σ_E = σ_c/2 and rises to
σ_c for a column of no length. (J. B. Johnson's parabolic column formula, as given
in Shigley's Mechanical Engineering Design, chapter on columns; from memory.)
"""

from __future__ import annotations

JOHNSON_TRANSITION = 0.5
"""σ_E/σ_c above which the Johnson parabola replaces Euler's load (the tangent point)."""


def is_stocky(euler_stress: float, strength: float) -> bool:
    """True where the Euler stress [Pa] is above the Johnson transition of the strength [Pa]."""
    return euler_stress > JOHNSON_TRANSITION * strength


def buckling_stress(euler_stress: float, strength: float) -> float:
    """The critical stress [Pa]: Euler's while slender, the Johnson parabola's when stocky."""
    if not is_stocky(euler_stress, strength):
        return euler_stress
    return strength - strength**2 / (4.0 * euler_stress)


def euler_overestimate(euler_stress: float, strength: float) -> float:
    """How many times Euler's load exceeds the critical load (1 for a slender column)."""
    return euler_stress / buckling_stress(euler_stress, strength)


__all__ = ["JOHNSON_TRANSITION", "buckling_stress", "euler_overestimate", "is_stocky"]

"""Practical upper limits on the shape factor each material family can reach.

A thin-walled tube or I-beam is efficient until its walls buckle, wrinkle or cannot be made
thinner; so each material has a largest useful shape factor. The values are from
P. M. Weaver and M. F. Ashby, "Material limits for shape efficiency", Progress in Materials
Science 41 (1997) 61-128, as recalled from memory (not checked against the paper): they are
practical maxima seen in standard sections, not theoretical bounds.

The paper covers only some families. The others get a flagged default equal to the smallest
limit the paper gives (solid wood sections), so no uncovered family is credited with more
shape efficiency than the least efficient family that was studied.
"""

from __future__ import annotations

from dataclasses import dataclass

from selector.errors import InputError
from selector.inputs.properties import FAMILIES
from selector.suggest import did_you_mean

__all__ = ["FAMILY_LIMITS", "GROUP_LIMITS", "MODES", "ShapeLimit", "max_shape_factor"]

MODES: tuple[str, ...] = ("bending_stiffness", "bending_strength")
"""What a limit caps: φ_B^e (elastic bending) or φ_B^f (failure in bending)."""


@dataclass(frozen=True)
class ShapeLimit:
    """Largest practical shape factors of one family or material group.

    Attributes:
        bending_stiffness: maximum φ_B^e (dimensionless, solid square = 1).
        bending_strength: maximum φ_B^f (dimensionless, solid square = 1).
        basis: where the numbers come from.
        from_paper: False when the paper did not cover it and a default is used.
    """

    bending_stiffness: float
    bending_strength: float
    basis: str
    from_paper: bool = True


_PAPER = "Weaver & Ashby, Prog. Mater. Sci. 41 (1997), from memory"
_DEFAULT = ShapeLimit(
    5.0,
    3.0,
    "default, not covered by Weaver & Ashby (1997): the smallest limit they give (solid wood)",
    from_paper=False,
)

GROUP_LIMITS: dict[str, ShapeLimit] = {
    "steel": ShapeLimit(64.0, 13.0, f"{_PAPER}: structural steels"),
    "aluminium": ShapeLimit(44.0, 10.0, f"{_PAPER}: 6061 aluminium alloy"),
    "frp": ShapeLimit(39.0, 9.0, f"{_PAPER}: GFRP and CFRP"),
    "polymer": ShapeLimit(12.0, 5.0, f"{_PAPER}: unreinforced polymers (nylons)"),
    "wood": ShapeLimit(5.0, 3.0, f"{_PAPER}: woods, solid sections"),
}
"""Limits for the material groups the paper covered, finer than families."""

FAMILY_LIMITS: dict[str, ShapeLimit] = {
    "metal": ShapeLimit(
        44.0,
        10.0,
        f"{_PAPER}: the lower of its two metals, aluminium alloy (steel reaches 64 and 13), "
        "so no metal is over-credited; use group 'steel' for steels",
    ),
    "polymer": GROUP_LIMITS["polymer"],
    "composite": GROUP_LIMITS["frp"],
    "natural": GROUP_LIMITS["wood"],
    "ceramic": _DEFAULT,
    "glass": _DEFAULT,
    "foam": _DEFAULT,
    "elastomer": _DEFAULT,
    "mineral": _DEFAULT,
}
"""One limit per family of ``selector.inputs.properties.FAMILIES``; check ``from_paper`` before quoting."""

assert set(FAMILY_LIMITS) == set(FAMILIES), "every family needs a shape limit"


def max_shape_factor(family: str, mode: str, group: str | None = None) -> float:
    """Largest practical shape factor for a family (or a finer group) in a loading mode.

    Args:
        family: a family name from ``FAMILIES``, e.g. ``"metal"``.
        mode: ``"bending_stiffness"`` (φ_B^e) or ``"bending_strength"`` (φ_B^f).
        group: optionally a key of ``GROUP_LIMITS`` (e.g. ``"steel"``), which takes precedence.

    Raises:
        InputError: unknown family, group or mode.
    """
    if mode not in MODES:
        raise InputError("shape limit: mode", f"unknown mode {mode!r}", did_you_mean(str(mode), MODES))
    if family not in FAMILY_LIMITS:
        raise InputError(
            "shape limit: family", f"unknown family {family!r}", did_you_mean(str(family), FAMILY_LIMITS)
        )
    if group is not None:
        if group not in GROUP_LIMITS:
            raise InputError(
                "shape limit: group", f"unknown group {group!r}", did_you_mean(str(group), GROUP_LIMITS)
            )
        return getattr(GROUP_LIMITS[group], mode)
    return getattr(FAMILY_LIMITS[family], mode)

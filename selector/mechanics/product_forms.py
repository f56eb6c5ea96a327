"""The thinnest wall or plate each family (or class, where it differs) is made in.

A part whose required wall is thinner is sized at this minimum and reported as
over-designed (its utilisation below 1). Values are common practice for the usual
product form of each family, no source, unless a source is named:

* metals: sheet and drawn tube 0.5 mm; castings thicker (sand-cast iron 3 mm,
  aluminium and magnesium castings 2.5 mm and 2 mm, zinc die castings 1 mm);
* composites: a laminate of four plies of about 0.125 mm, 0.5 mm;
* polymers and elastomers: injection mouldings and extrusions, 1 mm;
* metals: hot-rolled structural sections and plate, 3 mm;
* aluminium/silicon carbide composite: cast or rolled plate, 1 mm;
* natural: timber sections, plywood and MDF, 3 mm; particle board 6 mm; paper and board 0.3 mm;
* foams: 10 mm blocks and cores;
* ceramics 1 mm and glasses 2 mm (pressed or drawn plate);
* minerals (stone, masonry, concrete): 20 mm.
"""

from __future__ import annotations

import pandas as pd

FAMILY_MIN_WALL: dict[str, float] = {
    "metal": 0.5e-3,
    "composite": 0.5e-3,
    "polymer": 1.0e-3,
    "elastomer": 1.0e-3,
    "natural": 3.0e-3,
    "foam": 10e-3,
    "ceramic": 1.0e-3,
    "glass": 2.0e-3,
    "mineral": 20e-3,
}
"""Family → practical minimum wall or plate thickness [m] (common practice, no source)."""

CLASS_MIN_WALL: dict[str, float] = {
    "cast-iron-grey": 3.0e-3,
    "cast-iron-ductile": 3.0e-3,
    "al-cast": 2.5e-3,
    "mg-cast": 2.0e-3,
    "zinc-die-cast": 1.0e-3,
    "al-sic-mmc": 1.0e-3,
    "structural-steel": 3.0e-3,
    "particle-board": 6.0e-3,
    "paper-board": 0.3e-3,
    "concrete-aerated": 50e-3,
}
"""Class id → minimum wall [m] where its product form differs from its family's."""


CORE_ONLY_CLASSES = frozenset({"al-honeycomb", "aramid-honeycomb"})
"""Classes made only as sandwich cores: never sized as a solid part (common practice, no source)."""
CORE_ONLY_REASON = "made only as a sandwich core (a honeycomb), not as a solid part"

WIRE_CLASSES = frozenset({"spring-steel-wire"})
"""Classes made only as drawn round wire: ranked as a spring or a solid round bar, never as a
section, sheet or plate (common practice, no source)."""
WIRE_REASON = "made only as round wire, not as a section, sheet or plate"
WIRE_MAX_DIAMETER = 10e-3
"""Largest wire diameter [m] the class's data cover (its data note: round wire 1 to 10 mm; the
strength of EN 10270-1 wire falls as the diameter grows)."""

LAMINATE_CLASSES = frozenset({"cfrp-qi", "gfrp-qi", "afrp-qi", "smc", "nfrp"})
"""Laminates and moulding compounds: made as plate, shell and tube from plies or sheet, not as a
solid round bar (common practice, no source; pultruded rods are unidirectional)."""
LAMINATE_REASON = "a laminate is made as plate, shell or tube, not as a solid round bar"
SOLID_BAR_SHAPES = ("round",)


def minimum_walls(table: pd.DataFrame) -> pd.Series:
    """The practical minimum wall [m] of every class of ``table`` (0 for an unknown family)."""
    by_family = table["family"].map(FAMILY_MIN_WALL).fillna(0.0)
    by_class = table["id"].map(CLASS_MIN_WALL)
    return by_class.fillna(by_family).astype(float)

"""Chart colours, marker symbols and sizes: the Okabe–Ito palette by family, grey for rejected."""

from __future__ import annotations

from selector.inputs.properties import FAMILIES
from selector.pipeline.screen import PARTLY, PASSES, REJECTED

OKABE_ITO: tuple[str, ...] = (
    "#E69F00",
    "#56B4E9",
    "#009E73",
    "#F0E442",
    "#0072B2",
    "#D55E00",
    "#CC79A7",
    "#000000",
)
"""The Okabe–Ito colour-blind-safe palette (Okabe and Ito, 2008), grey left out."""

REJECTED_GREY = "#999999"
"""Colour of rejected classes."""

FAMILY_COLOURS: dict[str, str] = {f: OKABE_ITO[i % len(OKABE_ITO)] for i, f in enumerate(FAMILIES)}
"""Family → colour, in FAMILIES order. The ninth family reuses the first colour; its marker differs."""

FAMILY_SYMBOLS: dict[str, str] = dict(
    zip(
        FAMILIES,
        (
            "circle",
            "square",
            "diamond",
            "triangle-up",
            "pentagon",
            "triangle-down",
            "hexagon",
            "star",
            "cross",
        ),
        strict=True,
    )
)
"""Family → marker symbol, a second cue beside colour."""

IMAGE_FORMATS = ("png", "svg", "pdf")
"""Static image formats written through kaleido."""

UNIT_SYSTEMS = ("si", "us")
SHORTLIST_COLOUR = "#000000"
INDEX_COLOUR = "#0B3C5D"
PASS_FILL = "rgba(0, 158, 115, 0.07)"
BOUND_COLOUR = "#3A3A3A"
MAX_LABEL = 34
MAX_REASONS = 4

_GREEK = {"rho": "ρ", "nu": "ν", "lambda": "λ", "alpha": "α", "sigma": "σ"}
_SPECIAL = {"co2": "CO<sub>2</sub>", "price": "C<sub>m</sub>"}
_STATUS_TEXT = {PASSES: "passes the screens", PARTLY: "passes the screens partly", REJECTED: "rejected"}

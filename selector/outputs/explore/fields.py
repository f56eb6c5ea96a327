"""The spec fields the explorer edits: where each lives in the spec, how it is typed, when it shows.

A field is one key of the spec file (``part.force``, ``section.d``,
``constraint.fatigue.load_ratio``, ``sandwich.max_depth``) with a text input or a
choice list on the page. Its ``key`` names both the control and its message.
Which fields show depends on the part's function and on whether the section is a
sandwich; fields the spec already gives always show, so nothing it says is hidden.
"""

from __future__ import annotations

from dataclasses import dataclass

from selector.inputs.spec_keys import PART_KEYS
from selector.mechanics.failure_modes import CRITERIA
from selector.mechanics.loadcases import BEAM_LOADS, BEAM_SUPPORTS, COLUMN_SUPPORTS, VESSEL_LOADS_OF
from selector.mechanics.plates import PLATE_EDGES
from selector.mechanics.sections import SHAPES
from selector.mechanics.springs import SPRING_FORMS
from selector.pipeline.sandwich import DEFAULT_CORE_FAMILIES, DEFAULT_FACE_FAMILIES
from selector.pipeline.selection import SIZABLE_SHAPES

SANDWICH_SHAPE = "sandwich"
SANDWICH_FUNCTIONS = ("beam", "panel")
"""Functions whose section may be a sandwich of two faces on a core."""
SECTION_FUNCTIONS = ("tie", "beam", "column", "shaft")
"""Functions sized through a cross-section shape and its dimensions."""


@dataclass(frozen=True)
class SpecField:
    """One editable key of the spec.

    Attributes:
        path: where it lives, dotted: ``part.force``, ``constraint.fatigue.load_ratio``.
        label: what the page calls it.
        kind: "quantity" (text with a unit), "number" (a plain number) or "choice".
        hint: an example or what an empty input means.
    """

    path: str
    label: str
    kind: str = "quantity"
    hint: str = ""

    @property
    def key(self) -> str:
        """The control's id and its message's key: ``part-force``."""
        return self.path.replace(".", "-")

    @property
    def table(self) -> str:
        """The spec table the field belongs to: part, section, sandwich or constraint."""
        return self.path.split(".", 1)[0]

    @property
    def name(self) -> str:
        """The key inside its table (or its constraint): ``force``, ``load_ratio``."""
        return self.path.rsplit(".", 1)[-1]

    @property
    def constraint(self) -> str | None:
        """The constraint type of a constraint field, else None."""
        parts = self.path.split(".")
        return parts[1] if parts[0] == "constraint" else None


PART_FIELDS: tuple[SpecField, ...] = (
    SpecField("part.support", "Support", "choice"),
    SpecField("part.load", "Load", "choice"),
    SpecField("part.edges", "Edges", "choice"),
    SpecField("part.form", "Spring form", "choice"),
    SpecField("part.length", "Length", hint="e.g. 1.2 m"),
    SpecField("part.width", "Width", hint="e.g. 400 mm"),
    SpecField("part.radius", "Radius", hint="mid-wall radius, e.g. 40 mm"),
    SpecField("part.force", "Force", hint="peak load, e.g. 2 kN"),
    SpecField("part.torque", "Torque", hint="e.g. 60 N*m"),
    SpecField("part.pressure", "Pressure", hint="e.g. 2 MPa"),
    SpecField("part.energy", "Energy stored", hint="e.g. 15 J"),
)
SECTION_FIELDS: tuple[SpecField, ...] = (
    SpecField("section.shape", "Shape", "choice"),
    SpecField("section.b", "b (width)"),
    SpecField("section.h", "h (depth)"),
    SpecField("section.d", "d (diameter)"),
    SpecField("section.t", "t (wall or thickness)"),
    SpecField("section.tf", "tf (flange)"),
    SpecField("section.tw", "tw (web)"),
    SpecField("section.min_wall", "Thinnest wall allowed", hint="empty: the product form's own"),
    SpecField("section.max_depth", "Deepest part allowed", hint="empty: no limit"),
    SpecField("section.max_width", "Widest part allowed", hint="empty: no limit"),
    SpecField("section.max_diameter", "Largest diameter allowed", hint="empty: no limit"),
)
SANDWICH_FIELDS: tuple[SpecField, ...] = (
    SpecField("sandwich.max_depth", "Deepest sandwich allowed", hint="empty: no limit"),
    SpecField("sandwich.min_face", "Thinnest face", hint="empty: by the face's family"),
    SpecField("sandwich.min_core", "Thinnest core", hint="empty: 5 mm"),
)
CONSTRAINT_FIELDS: tuple[SpecField, ...] = (
    SpecField("constraint.buckling.safety_factor", "Safety factor", "number"),
    SpecField("constraint.fracture.crack_length", "Crack length a", hint="edge crack depth, e.g. 2 mm"),
    SpecField("constraint.fracture.geometry_factor", "Geometry factor Y", "number", "empty: 1.12"),
    SpecField("constraint.fracture.criterion", "Vessel criterion", "choice", "pressure vessels only"),
    SpecField("constraint.fracture.safety_factor", "Safety factor", "number"),
    SpecField("constraint.fatigue.load_ratio", "Load ratio R", "number", "min/max load; empty: -1"),
    SpecField("constraint.fatigue.safety_factor", "Safety factor", "number"),
    SpecField("constraint.frequency.min_frequency", "Lowest natural frequency", hint="e.g. 25 Hz"),
)
"""The fields of each constraint beyond the stiffness limit and the strength safety factor,
which have controls of their own."""

FIELDS: tuple[SpecField, ...] = (*PART_FIELDS, *SECTION_FIELDS, *SANDWICH_FIELDS, *CONSTRAINT_FIELDS)
FIELD_BY_KEY = {f.key: f for f in FIELDS}
FIELD_BY_PATH = {f.path: f for f in FIELDS}

PART_FIELDS_OF: dict[str, tuple[str, ...]] = {
    # A beam's width is left to the section's own dimensions here (the spec reads it only
    # when the depth is free).
    function: tuple(k for k in keys if (function, k) != ("beam", "width"))
    for function, keys in PART_KEYS.items()
}
"""The part's keys each function reads."""

SHAPE_DIMS: dict[str, tuple[str, ...]] = {
    "generic": (),
    **{shape: dims for shape, dims in SHAPES.items() if shape != "sandwich"},
}
"""The reference dimensions of each shape the sizing takes."""


def choices(field: SpecField, function: str) -> tuple[str, ...]:
    """The values a choice field may take for a function ("" first: not given)."""
    if field.path == "part.support":
        return ("", *(COLUMN_SUPPORTS if function == "column" else BEAM_SUPPORTS))
    if field.path == "part.load":
        return ("", *VESSEL_LOADS_OF.get(function, BEAM_LOADS))
    if field.path == "part.edges":
        return ("", "free-sides") if function == "panel" else ("", *PLATE_EDGES)
    if field.path == "part.form":
        return ("", *SPRING_FORMS)
    if field.path == "constraint.fracture.criterion":
        return ("", *CRITERIA)
    if field.path == "section.shape":
        return (*SIZABLE_SHAPES, SANDWICH_SHAPE) if function in SANDWICH_FUNCTIONS else SIZABLE_SHAPES
    return ()


def shown_fields(function: str, shape: str, given: set[str]) -> set[str]:
    """The paths of the fields that show for a function and section shape.

    ``given`` holds the paths the spec sets; those always show.
    """
    shown = {f"part.{name}" for name in PART_FIELDS_OF.get(function, ())}
    sandwich = shape == SANDWICH_SHAPE
    if sandwich:
        shown |= {f.path for f in SANDWICH_FIELDS} | ({"section.b"} if function == "beam" else set())
    elif function in SECTION_FUNCTIONS:
        shown |= {"section.shape", "section.min_wall"}
        shown |= {f"section.{d}" for d in SHAPE_DIMS.get(shape, ())}
        round_shape = shape in ("round", "tube")
        shown |= {"section.max_diameter"} if round_shape else {"section.max_depth", "section.max_width"}
    else:
        shown |= {"section.t", "section.min_wall"}
        shown.add("section.max_diameter" if function in ("cylinder", "sphere") else "section.max_depth")
        if function == "spring":
            shown.discard("section.max_depth")
    if function in SANDWICH_FUNCTIONS and not sandwich:
        shown.add("section.shape")
    shown |= {f.path for f in CONSTRAINT_FIELDS}  # each shows inside its constraint's block
    if function not in ("cylinder", "sphere"):
        shown.discard("constraint.fracture.criterion")
    return shown | given


SANDWICH_DEFAULTS = {"faces": DEFAULT_FACE_FAMILIES, "cores": DEFAULT_CORE_FAMILIES}
"""The families faces and cores come from when the spec names none."""

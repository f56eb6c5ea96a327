"""The load case a spec describes, with its form or edge options, and the checks every part gets.

``load_case`` in ``mechanics.loadcases`` gives each function's base case; the spec's
``form`` (springs) and ``edges`` (plates, panels) turn it into the variant sized here.
"""

from __future__ import annotations

from selector.errors import InputError
from selector.inputs.spec import Spec
from selector.mechanics.loadcases import LoadCase, load_case, part_kind
from selector.mechanics.plates import PLATE_EDGES, plate_case
from selector.mechanics.springs import SPRING_FORMS, spring_case
from selector.suggest import did_you_mean

PANEL_EDGES = ("free-sides",)
"""A panel bends one way between its two supports; its other two sides are free."""


def _choice(value: str, choices: tuple[str, ...], where: str) -> str:
    if value not in choices:
        raise InputError(where, f"{value!r} is not supported here", did_you_mean(value, choices))
    return value


def case_for(spec: Spec) -> LoadCase:
    """The spec's load case, with its spring form or plate edges applied."""
    from selector.inputs.units import magnitude_in

    part = spec.part
    fn = part.function
    case = load_case(fn, part.support, part.load)
    if part.form is not None and fn != "spring":
        raise InputError("part.form", f"form applies to a spring, not a {fn}", "remove form")
    if part.edges is not None and not part_kind(fn).has_edges:
        raise InputError("part.edges", f"edges apply to a plate or panel, not a {fn}", "remove edges")
    if fn == "spring":
        return spring_case(case, _choice(part.form or "uniform", SPRING_FORMS, "part.form"))
    if fn == "panel":
        _choice(part.edges or "free-sides", PANEL_EDGES, "part.edges")
        return case
    if fn == "plate":
        edges = _choice(part.edges or "supported", PLATE_EDGES, "part.edges")
        length = magnitude_in(part.length, "m", "part.length") if part.length else None
        width = magnitude_in(part.width, "m", "part.width") if part.width else None
        return plate_case(case, edges, length, width)
    return case


IMPLICIT_CONSTRAINTS = {"spring": ("strain", "strength")}
"""Function → (constraint checked on every part, the constraint whose safety factor it takes)."""

"""The modelling assumptions behind a result, built from the spec: only those that apply.

Each result states, once, the formulas and constants of its load case, the edge,
form and section models, and what the model leaves out (stress concentrations,
local buckling beyond the shape limits, end caps, self-weight). Outputs print the
list the Selection carries; nothing else writes assumptions.
"""

from __future__ import annotations

from selector.inputs.spec import Spec
from selector.mechanics.loadcases import part_kind
from selector.pipeline.derive import Derivation
from selector.pipeline.sizing import THIN_WALL_RATIO, Design, build

THIN_WALLED = ("tube", "box", "i-section", "channel", "angle", "tee")
OPEN_SECTIONS = ("i-section", "channel", "angle", "tee")
STRESS_CHECKS = ("strength", "fatigue", "fracture")

FUNCTION_ASSUMPTIONS: dict[str, tuple[str, ...]] = {
    "tie": ("the load acts along the axis (no bending from an eccentric load); end fittings are not sized",),
    "beam": (
        "Euler–Bernoulli beam: plane sections stay plane and shear deflection is neglected, "
        "valid for a span above about 10 depths (common practice)",
        "the beam's own weight is left out of the load",
    ),
    "panel": (
        "the panel bends one way as a strip of its full width; plate action across the span "
        "is neglected, which is conservative",
        "Euler–Bernoulli bending (span above about 10 thicknesses); the panel's own weight is left out",
    ),
    "column": (
        "Euler buckling of a straight, centrally loaded column; where the Euler stress is above "
        "σ_c/2 (a stocky column) it is sized on the Johnson parabola σ_cr = σ_c − σ_c²/(4σ_E) "
        "instead. Initial crookedness and residual stresses are not modelled: check the chosen "
        "section against the column curve of the design code",
        "the column's own weight is left out of the load",
    ),
    "shaft": (
        "shear yield τ_y = σ_y/√3 (von Mises)",
        "pure torsion: bending from belt, gear or bearing loads is not included",
    ),
    "cylinder": (
        "thin wall (r/t above about 10): the hoop stress p·r/t governs; the axial stress p·r/(2t) "
        "is half of it",
        "no end caps: their mass, their stresses and the bending where they join the shell are not included",
    ),
    "sphere": (
        "thin wall (r/t above about 10): equal membrane stresses p·r/(2t) in every direction",
        "no openings or nozzles in the shell",
    ),
    "plate": (
        "elastic buckling of a flat plate loaded evenly along its loaded edges; "
        "any strength after buckling is not counted on",
    ),
    "spring": (
        "the spring works from no load to its full stored energy; coil buckling and "
        "the ends of a coil are not modelled",
    ),
}
"""Function → what its load case assumes beyond its equations."""

EXTERNAL_PRESSURE_ASSUMPTIONS: tuple[str, ...] = (
    "thin wall (r/t above about 10): the compressive hoop stress p·r/t governs; the axial "
    "stress p·r/(2t) is half of it",
    "long tube: neither the end closures nor stiffening rings support the shell (Bresse's "
    "long-tube pressure); a tube shorter than about 1.1·D·√(D/t) (D = 2r) between supports buckles at "
    "a higher pressure, so its wall is conservative",
    "perfectly round tube: out-of-roundness is not modelled, and real tubes buckle below the "
    "classical pressure; the safety factor must cover it (check the design code's collapse curve)",
    "buckling and crushing are checked apart: where the elastic buckling stress p_cr·r/t is "
    "near σ_c the two interact and the collapse pressure falls below both; a wall whose elastic "
    "buckling stress is above σ_c/2 is flagged with a Johnson-type estimate of its collapse "
    "stress (the column's parabola, by analogy)",
    "no end caps: their mass, their stresses and the bending where they join the shell are not included",
)
"""What a cylinder under external pressure assumes beyond its equations."""


def _section_assumptions(spec: Spec, design: Design | None) -> list[str]:
    fn, shape = spec.part.function, spec.section.shape
    kind = part_kind(fn)
    if not kind.takes_section or shape == "generic":
        return []
    out = []
    if shape in THIN_WALLED and kind.shape_capped and spec.section.free == "scale":
        out.append(
            "no local buckling of walls or flanges: the section is held within its family's "
            "practical shape-factor limits (Weaver & Ashby), not checked wall by wall"
        )
    elif shape in THIN_WALLED:
        out.append(
            f"no local buckling of walls or flanges is checked; a wall more slender than "
            f"{THIN_WALL_RATIO:g} times its thickness gets a warning"
        )
    if fn == "beam" and (shape in OPEN_SECTIONS or spec.section.free == "depth"):
        out.append("no lateral-torsional buckling: the compression flange or edge is braced")
    if fn == "shaft" and design is not None and design.dims:
        section = build(design.shape, design.dims)
        out.append(f"torsion constant J: {section.J_method}")
    return out


def _constraint_assumptions(spec: Spec) -> list[str]:
    types = {c.type for c in spec.constraint}
    out = []
    if types & set(STRESS_CHECKS):
        out.append(
            "no stress concentrations: the peak stress is the nominal one of the formulas "
            "(holes, notches, fillets and joints need their own factors)"
        )
    if "fatigue" in types:
        ratios = {c.load_ratio for c in spec.constraint if c.type == "fatigue"} - {None, -1.0}
        out.append(
            "fatigue: σ_e is the class's endurance at 10^7 cycles, with no surface, size or "
            "reliability factors"
            + ("; the mean stress is taken by the Goodman line through σ_ts" if ratios else "")
        )
    elif types & {"strength", "stiffness", "buckling"}:
        out.append("the load is static: fatigue is not checked (add a fatigue constraint for cycling)")
    if "fracture" in types:
        out.append(
            "fracture: linear elastic fracture mechanics, the crack at the peak stress and normal to it"
        )
    if "frequency" in types:
        out.append("natural frequency: the part's own mass only, no attached masses")
    return out


def assumptions_for(spec: Spec, derivations: list[Derivation], design: Design | None) -> tuple[str, ...]:
    """The assumptions behind a result for ``spec``: each constraint's equation with its
    constants, the case's edge or form model, the function's and section's assumptions,
    those of the constraint types, and how the property ranges are read."""
    if not derivations:
        return ()
    case = derivations[0].case
    out = [f"load case: {case.title}"]
    out += [f"{d.constraint}: {case.equations[d.constraint]}" for d in derivations]
    out += list(case.notes)
    out += [case.constraint_notes[d.constraint] for d in derivations if d.constraint in case.constraint_notes]
    outside = case.kind.vessel and case.kind.in_compression
    out += list(EXTERNAL_PRESSURE_ASSUMPTIONS if outside else FUNCTION_ASSUMPTIONS.get(case.function, ()))
    out += _section_assumptions(spec, design)
    out += _constraint_assumptions(spec)
    out.append("properties at room temperature; the service-temperature screens do not derate them")
    return tuple(dict.fromkeys(out))

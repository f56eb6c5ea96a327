"""The stress state of each load case, and which classes' data hold for it.

Class data for unidirectional composites and for woods along or across the grain
hold along one axis only (``directions = "axial"`` in the materials table). Such a
class is ranked only where the part is loaded along one axis: a tie, a beam, a
column, a leaf or uniform spring. A biaxial state (the hoop and axial stresses of a
cylinder, the equal membrane stresses of a sphere, a plate or panel bending and
buckling in two directions) or a shear state (a shaft, a torsion-bar or coil
spring) also loads it across the axis or in shear, for which the table gives no
values.
"""

from __future__ import annotations

UNIAXIAL, BIAXIAL, SHEAR = "uniaxial", "biaxial", "shear"

STRESS_STATES: dict[str, str] = {
    "tie": UNIAXIAL,
    "beam": UNIAXIAL,
    "column": UNIAXIAL,
    "cylinder": BIAXIAL,
    "sphere": BIAXIAL,
    "plate": BIAXIAL,
    "panel": BIAXIAL,
    "shaft": SHEAR,
}
"""Function → stress state (springs depend on their form: see ``spring_stress_state``)."""

SPRING_STRESS_STATES = {"uniform": UNIAXIAL, "leaf": UNIAXIAL, "coil": SHEAR, "torsion-bar": SHEAR}

DIRECTIONS = ("all", "axial")
"""Values of the ``directions`` column: data hold in every direction, or along one axis only."""

WHY = {
    BIAXIAL: "a biaxial stress state loads it across that axis too",
    SHEAR: "a shear stress state loads it in shear",
}


def stress_state(function: str, form: str | None = None) -> str:
    """The stress state of a load case (uniaxial, biaxial or shear)."""
    if function == "spring":
        return SPRING_STRESS_STATES[form or "uniform"]
    return STRESS_STATES[function]


def one_axis_reason(state: str) -> str:
    """Why a class whose data hold along one axis only is not ranked for ``state``."""
    return (
        f"its data hold along one axis only (fibres or grain) and {WHY[state]}, "
        "for which the table gives no transverse or shear values"
    )

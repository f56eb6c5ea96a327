"""Spring forms: the fraction of the material's energy capacity each form can store,
and the strain limit that keeps a spring elastic.

A uniformly stressed volume V at peak stress σ stores U = V·σ²/(2E). Real forms
stress their material unevenly and store U = η·V·s²/(2M), with s the peak normal
or shear stress and M = E or G:

* uniform tension or compression: η = 1;
* a leaf of rectangular section in uniform bending (σ linear through the depth): η = 1/3;
* a solid round bar in torsion (τ linear in the radius), with G and τ_y = σ_y/√3: η = 1/2;
* a coil of round wire, a bar in torsion whose peak stress is raised by the Wahl factor
  K_w = (4C−1)/(4C−4) + 0.615/C at spring index C = D/d: η = 1/(2·K_w²).

Sources: the fractions follow from integrating σ²/(2E) or τ²/(2G) over the section,
as in Roark's Formulas for Stress and Strain, 8th ed., ch. 8 and 10, and the Wahl
factor is the one in Shigley's Mechanical Engineering Design, 10th ed., §10-2 — from memory.
"""

from __future__ import annotations

import math
from dataclasses import replace

from selector.mechanics.loadcases import SHEAR_YIELD_RATIO, LoadCase
from selector.mechanics.monomial import Monomial as M

SPRING_FORMS = ("uniform", "leaf", "coil", "torsion-bar")
COIL_INDEX = 8.0
"""Spring index C = D/d assumed for a coil (usual range 4–12; common practice, no source)."""


def wahl_factor(c: float) -> float:
    """Wahl correction K_w = (4C−1)/(4C−4) + 0.615/C for a coil of spring index C."""
    return (4 * c - 1) / (4 * c - 4) + 0.615 / c


ENERGY_FRACTIONS: dict[str, float] = {
    "uniform": 1.0,
    "leaf": 1 / 3,
    "torsion-bar": 1 / 2,
    "coil": 1 / (2 * wahl_factor(COIL_INDEX) ** 2),
}
"""Stored-energy fraction η of each form."""

FORM_WORDS = {
    "uniform": "uniform tension (η = 1)",
    "leaf": "rectangular leaf in uniform bending (η = 1/3)",
    "torsion-bar": "solid round bar in torsion, τ_y = σ_y/√3 (η = 1/2)",
    "coil": (
        f"coil of round wire in torsion, τ_y = σ_y/√3, Wahl factor K_w = {wahl_factor(COIL_INDEX):.3f} "
        f"at spring index C = {COIL_INDEX:g} (η = 1/(2K_w²) = {ENERGY_FRACTIONS['coil']:.3f})"
    ),
}
TORSION_FORMS = ("coil", "torsion-bar")


def spring_case(base: LoadCase, form: str) -> LoadCase:
    """The spring load case for ``form``, built from the uniform-stress ``base`` case.

    Every stress monomial √(2·E·U/V) becomes √(2·M·U/(η·V)); torsion forms take G
    for E and σ_y/√3 for the allowed shear stress. A strain constraint is added:
    the peak working strain s/M stays below the elongation at break over the safety
    factor (which binds for elastomers; for other classes σ_y/E is the smaller limit).
    """
    eta = ENERGY_FRACTIONS[form]
    torsion = form in TORSION_FORMS

    def adapt(m: M) -> M:
        out = m * M.of(eta**-0.5)
        if torsion:
            out = out.substitute("E", M.of(1, G=1))
            out = out.substitute("sigma_y", M.of(SHEAR_YIELD_RATIO, sigma_y=1))
        return out

    modulus = "G" if torsion else "E"
    utilisation = {k: adapt(v) for k, v in base.utilisation.items()}
    utilisation["strain"] = M.of(math.sqrt(2 / eta), SF=1, U=0.5, V=-0.5, elongation=-1, **{modulus: -0.5})
    responses = {k: adapt(v) for k, v in base.responses.items()}
    stress = "τ" if torsion else "σ"
    allowed = "σ_y/(√3·SF)" if torsion else "σ_y/SF"
    equations = {
        "strength": f"energy U = η·V·{stress}²/(2·{modulus}), so {stress} = (2·{modulus}·U/(η·V))^(1/2) "
        f"≤ {allowed}, η = {eta:.3g}",
        "strain": f"working strain {stress}/{modulus} = (2·U/(η·{modulus}·V))^(1/2) ≤ elongation/SF",
    }
    return replace(
        base,
        title=f"spring storing elastic energy ({FORM_WORDS[form]})",
        utilisation=utilisation,
        responses=responses,
        equations=base.equations | equations,
        notes=(f"spring form: {FORM_WORDS[form]}",),
    )

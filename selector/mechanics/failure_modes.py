"""Fracture, fatigue and natural frequency as utilisation monomials.

Each builder takes what a load case already knows (its peak stress as a monomial,
its support) and returns the utilisation of one more way the part can fail
(1 at the limit, < 1 safe), so the derivation and the sizing treat these
constraints exactly like stiffness and strength.

Symbols (SI): a crack length [m] (depth of an edge crack, half-length of a through
crack), Y geometry factor [-], SF safety factor [-], f_min lowest allowed natural
frequency [Hz], L span [m], L_e effective span of a plate's first mode [m]
(1/L_e² = 1/L² + 1/b²), A area [m²], I second moment [m⁴], t thickness [m];
properties: K_IC [Pa·m½], sigma_e endurance limit at 10⁷ cycles [Pa], sigma_ts
tensile strength [Pa], sigma_R fatigue strength at load ratio R by the Goodman
line [Pa], sigma_y [Pa], E [Pa], rho [kg/m³].
"""

from __future__ import annotations

import math

import numpy as np

from selector.mechanics.monomial import Monomial as M

FAILURE_CONSTRAINTS = ("fracture", "fatigue", "frequency")
CRITERIA = ("leak-before-break", "yield-before-break")
"""Fracture criteria for pressure vessels (a crack as deep as the wall; yield before fast fracture)."""

DEFAULT_GEOMETRY_FACTOR = 1.12
"""Y for an edge crack in a wide plate (Tada, Paris & Irwin, *The Stress Analysis of Cracks
Handbook* — from memory)."""
FULLY_REVERSED = -1.0
"""Load ratio R = min/max of a fully reversed cycle (the default)."""
BRITTLE_K_IC = 15.0
"""K_IC [MPa·m½] below which a class is too brittle for design on strength alone
(common practice, no source)."""

# First bending eigenvalue (λ·L)₁ of a uniform Euler–Bernoulli beam for each support:
# f₁ = (λL)²/(2π·L²)·√(E·I/(ρ·A)). Blevins, *Formulas for Natural Frequency and Mode Shape*,
# Table 8-1 (from memory).
BEAM_EIGENVALUES: dict[str, float] = {
    "cantilever": 1.87510407,
    "simply-supported": math.pi,
    "fixed-fixed": 4.73004074,
}
PLATE_NU = 0.3
"""Poisson's ratio in the plate's flexural rigidity D = E·t³/(12(1−ν²)) (as in plate buckling)."""
FRACTURE_SYMBOLS = {"a": "crack_length", "Y": "geometry_factor", "f_min": "min_frequency"}
"""Per-constraint symbols the spec gives, with their field names."""


def fracture(stress: M, ratio: float = 1.0) -> M:
    """Utilisation SF·Y·σ·√(π·a)/K_IC for a peak stress σ (times ``ratio`` to a principal stress)."""
    return stress * M.of(ratio * math.sqrt(math.pi), SF=1, Y=1, a=0.5, K_IC=-1)


def fatigue(stress: M, ratio: float = 1.0) -> M:
    """Utilisation SF·σ_max/σ_e for a fully reversed peak stress σ_max (times ``ratio``).

    With another load ratio R the endurance limit gives way to ``sigma_R`` (see
    ``goodman_strength``); ``with_load_ratio`` makes that substitution.
    """
    return stress * M.of(ratio, SF=1, sigma_e=-1)


def with_load_ratio(utilisation: M, load_ratio: float) -> M:
    """The fatigue utilisation at load ratio R: σ_e replaced by the Goodman strength σ_R."""
    if load_ratio == FULLY_REVERSED:
        return utilisation
    return utilisation.substitute("sigma_e", M.sym("sigma_R"))


def goodman_strength(sigma_e: np.ndarray, sigma_ts: np.ndarray, load_ratio: float) -> np.ndarray:
    """Peak stress σ_R at which σa/σe + σm/σts = 1 for a cycle of load ratio R [units of the inputs].

    With σa = σmax·(1−R)/2 and σm = σmax·(1+R)/2: σ_R = 2/((1−R)/σe + (1+R)/σts).
    Increasing in both σe and σts, so the low end of a range comes from the low ends.
    """
    with np.errstate(divide="ignore", invalid="ignore"):
        return 2.0 / ((1 - load_ratio) / sigma_e + (1 + load_ratio) / sigma_ts)


def bending_frequency(support: str) -> M:
    """Utilisation f_min/f₁ of a beam's first bending mode with its own mass."""
    lam2 = BEAM_EIGENVALUES[support] ** 2
    return M.of(2 * math.pi / lam2, f_min=1, L=2, rho=0.5, A=0.5, E=-0.5, I=-0.5)


def axial_frequency() -> M:
    """Utilisation f_min/f₁ of a bar's first axial mode, both ends held: f₁ = √(E/ρ)/(2L)."""
    return M.of(2, f_min=1, L=1, rho=0.5, E=-0.5)


def plate_frequency() -> M:
    """Utilisation f_min/f₁₁ of a plate simply supported on all edges.

    f₁₁ = (π/2)·(1/L² + 1/b²)·√(D/(ρ·t)) = (π/2)·t/L_e²·√(E/(12(1−ν²)ρ)).
    """
    c = (2 / math.pi) * math.sqrt(12 * (1 - PLATE_NU**2))
    return M.of(c, f_min=1, L_e=2, t=-1, rho=0.5, E=-0.5)


def effective_span(length: float, width: float) -> float:
    """L_e [m] with 1/L_e² = 1/L² + 1/b² (the plate's first-mode span)."""
    return 1.0 / math.sqrt(1.0 / length**2 + 1.0 / width**2)


def leak_before_break(stress: M) -> M:
    """Utilisation of a crack as deep as the wall (a = t) at the working stress."""
    return stress * M.of(math.sqrt(math.pi), SF=1, Y=1, t=0.5, K_IC=-1)


def yield_before_break() -> M:
    """Utilisation SF·Y·σ_y·√(π·a)/K_IC: the crack of length a must not run before the wall yields."""
    return M.of(math.sqrt(math.pi), SF=1, Y=1, a=0.5, sigma_y=1, K_IC=-1)


FRACTURE_EQUATION = "crack tolerance Y·σ·√(π·a) ≤ K_IC/SF (a: crack length, Y: geometry factor)"
FATIGUE_EQUATION = (
    "stress amplitude σa ≤ σ_e/SF fully reversed; at load ratio R the Goodman line "
    "σa/σ_e + σm/σ_ts ≤ 1/SF, i.e. σ_max ≤ σ_R/SF with σ_R = 2/((1−R)/σ_e + (1+R)/σ_ts)"
)
CRITERION_EQUATIONS = {
    "leak-before-break": "leak before break: a crack as deep as the wall, Y·σ·√(π·t) ≤ K_IC/SF",
    "yield-before-break": "yield before break: Y·σ_y·√(π·a) ≤ K_IC/SF (the wall yields first)",
}

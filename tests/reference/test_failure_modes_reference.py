"""Fracture, fatigue and natural frequency against outside references.

Indices: M. F. Ashby, *Materials Selection in Mechanical Design*, 4th ed., chapter 5 and the
appendix of material indices (from memory), compared up to a positive power.
Frequencies: Blevins, *Formulas for Natural Frequency and Mode Shape*, Table 8-1 (from memory),
and an independent finite-element modal solution written here.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
import scipy.linalg

from selector.mechanics import failure_modes as fm
from selector.mechanics.loadcases import load_case
from selector.pipeline.derive import derive

FE_TOLERANCE = 0.005  # the brief's 0.5 % between closed form and finite elements
FE_ELEMENTS = 60

# (function, constraint, free, support, criterion, expected exponents)
PUBLISHED = [
    ("tie", "fracture", "scale", None, None, {"K_IC": 1, "rho": -1}),  # K_IC/ρ
    ("beam", "fracture", "scale", "simply-supported", None, {"K_IC": 2 / 3, "rho": -1}),  # K_IC^2/3/ρ
    ("beam", "fatigue", "scale", "cantilever", None, {"sigma_e": 2 / 3, "rho": -1}),  # σ_e^2/3/ρ
    ("beam", "frequency", "scale", "simply-supported", None, {"E": 1 / 2, "rho": -1}),  # E^1/2/ρ
    ("panel", "frequency", "thickness", "simply-supported", None, {"E": 1 / 3, "rho": -1}),  # E^1/3/ρ
    ("cylinder", "fracture", "wall", None, "leak-before-break", {"K_IC": 2, "sigma_y": -1}),  # K²/σ_y
    ("cylinder", "fracture", "wall", None, "yield-before-break", {"K_IC": 1, "sigma_y": -1}),  # K/σ_y
    ("sphere", "fracture", "wall", None, "leak-before-break", {"K_IC": 2, "sigma_y": -1}),  # K²/σ_y
]


def _same_up_to_positive_power(got: dict[str, float], want: dict[str, float]) -> bool:
    if set(got) != set(want):
        return False
    key = next(iter(want))
    factor = got[key] / want[key]
    return factor > 0 and all(abs(got[k] - factor * v) < 1e-9 for k, v in want.items())


@pytest.mark.parametrize(("function", "constraint", "free", "support", "criterion", "want"), PUBLISHED)
def test_failure_mode_indices_match_the_published_table(function, constraint, free, support, criterion, want):
    d = derive(function, constraint, "mass", free, support, criterion=criterion)
    assert _same_up_to_positive_power(d.exponents, want), (d.index_text, want)


def test_published_forms_are_shown():
    # The normalised text reads as the table prints it (Ashby, from memory).
    assert (
        derive("cylinder", "fracture", free="wall", criterion="leak-before-break").index_text == "K_IC^2/σ_y"
    )
    assert (
        derive("cylinder", "fracture", free="wall", criterion="yield-before-break").index_text == "K_IC/σ_y"
    )
    assert derive("beam", "fatigue").index_text == "σ_e^(2/3)/ρ"


def _fe_first_frequency(
    support: str, E: float, second_moment: float, rho: float, A: float, L: float
) -> float:
    """First natural frequency [Hz] of a uniform Euler–Bernoulli beam by finite elements.

    Hermite cubic elements with the consistent mass matrix (ρA·l/420 form), the generalised
    problem K·φ = ω²·M·φ solved with scipy.linalg.eigh (textbook element matrices, common
    practice, no source).
    """
    n = FE_ELEMENTS
    le = L / n
    k = (E * second_moment / le**3) * np.array(
        [[12, 6 * le, -12, 6 * le], [6 * le, 4 * le**2, -6 * le, 2 * le**2],
         [-12, -6 * le, 12, -6 * le], [6 * le, 2 * le**2, -6 * le, 4 * le**2]]
    )  # fmt: skip
    m = (rho * A * le / 420) * np.array(
        [[156, 22 * le, 54, -13 * le], [22 * le, 4 * le**2, 13 * le, -3 * le**2],
         [54, 13 * le, 156, -22 * le], [-13 * le, -3 * le**2, -22 * le, 4 * le**2]]
    )  # fmt: skip
    size = 2 * (n + 1)
    K, M = np.zeros((size, size)), np.zeros((size, size))
    for e in range(n):
        dofs = slice(2 * e, 2 * e + 4)
        K[dofs, dofs] += k
        M[dofs, dofs] += m
    held = {
        "cantilever": [0, 1],
        "simply-supported": [0, size - 2],
        "fixed-fixed": [0, 1, size - 2, size - 1],
    }[support]
    free = [i for i in range(size) if i not in held]
    omega2 = scipy.linalg.eigh(K[np.ix_(free, free)], M[np.ix_(free, free)], eigvals_only=True)
    return math.sqrt(omega2[0]) / (2 * math.pi)


@pytest.mark.parametrize("support", ["cantilever", "simply-supported", "fixed-fixed"])
def test_beam_frequency_against_blevins_and_finite_elements(support):
    E, rho, L, b, h = 70e9, 2700.0, 1.2, 0.03, 0.01  # an aluminium strip, illustrative
    A, inertia = b * h, b * h**3 / 12
    u = load_case("beam", support).utilisation["frequency"]
    ours = 1.0 / float(u.evaluate({"f_min": 1.0, "L": L, "rho": rho, "A": A, "E": E, "I": inertia}))
    # Blevins Table 8-1 (from memory): f = λ²/(2πL²)·√(EI/(ρA)), λL = 1.87510, π, 4.73004
    lam = {"cantilever": 1.87510407, "simply-supported": math.pi, "fixed-fixed": 4.73004074}[support]
    blevins = lam**2 / (2 * math.pi * L**2) * math.sqrt(E * inertia / (rho * A))
    assert ours == pytest.approx(blevins, rel=1e-9)
    assert ours == pytest.approx(_fe_first_frequency(support, E, inertia, rho, A, L), rel=FE_TOLERANCE)


def test_axial_and_plate_frequencies_by_hand():
    # Bar held at both ends: f1 = c/(2L), c = √(E/ρ) (Blevins, Table 8-16 — from memory).
    E, rho, L = 200e9, 7850.0, 2.0
    u = load_case("tie").utilisation["frequency"]
    assert 1 / float(u.evaluate({"f_min": 1.0, "L": L, "rho": rho, "E": E})) == pytest.approx(
        math.sqrt(E / rho) / (2 * L), rel=1e-12
    )
    # Simply supported rectangular plate, mode (1,1): f = (π/2)(1/a² + 1/b²)√(D/(ρt)) (Blevins
    # Table 11-4 — from memory); a 0.5 m × 0.3 m × 3 mm steel plate, worked by hand: D = 494.5 N·m,
    # √(D/(ρt)) = 4.580 m²/s, (1/0.25 + 1/0.09) = 15.11 m⁻², f = 108.7 Hz.
    t, a, b = 0.003, 0.5, 0.3
    d = E * t**3 / (12 * (1 - 0.3**2))
    by_hand = math.pi / 2 * (1 / a**2 + 1 / b**2) * math.sqrt(d / (rho * t))
    assert by_hand == pytest.approx(108.7, rel=1e-3)
    u = load_case("plate").utilisation["frequency"]
    values = {"f_min": 1.0, "L_e": fm.effective_span(a, b), "t": t, "rho": rho, "E": E}
    assert 1 / float(u.evaluate(values)) == pytest.approx(by_hand, rel=1e-12)


def test_fracture_of_a_cracked_tie_worked_by_hand():
    # A tie with a 2 mm edge crack, Y = 1.12, K_IC = 30 MPa·m½, SF = 1.5 (worked by hand):
    # allowed stress = K_IC/(SF·Y·√(π·a)) = 30/(1.5·1.12·√(π·0.002)) = 30/(1.68·0.079267)
    # = 225.3 MPa, so a 10 kN load needs A = 10 000/225.3e6 = 44.39 mm².
    d = derive("tie", "fracture")
    area = d.solution.evaluate({"F": 10e3, "SF": 1.5, "Y": 1.12, "a": 0.002, "K_IC": 30e6})
    assert area * 1e6 == pytest.approx(44.39, rel=1e-3)


def test_fracture_of_a_plate_with_a_central_crack_textbook_form():
    # Centre crack of length 2a in a wide plate, Y = 1: K = σ√(πa) (Anderson, *Fracture Mechanics*,
    # 3rd ed., §2.6 — from memory). σ = 100 MPa, a = 10 mm gives K = 17.72 MPa·m½; at
    # K_IC = 17.72 MPa·m½ the utilisation is exactly 1.
    u = load_case("tie").utilisation["fracture"]
    sigma, a = 100e6, 0.010
    k = sigma * math.sqrt(math.pi * a)
    assert k / 1e6 == pytest.approx(17.72, rel=1e-3)
    value = u.evaluate({"F": sigma * 1e-4, "A": 1e-4, "SF": 1.0, "Y": 1.0, "a": a, "K_IC": k})
    assert value == pytest.approx(1.0, rel=1e-12)


def test_goodman_line_worked_by_hand():
    # σ_e = 200 MPa, σ_ts = 500 MPa, repeated load R = 0: σa = σm = σmax/2 and
    # σmax/2·(1/200 + 1/500) = 1 gives σmax = 2/(0.005 + 0.002) = 285.7 MPa (worked by hand);
    # check: 142.86/200 + 142.86/500 = 0.714 + 0.286 = 1.
    sigma_r = fm.goodman_strength(np.array(200.0), np.array(500.0), 0.0)
    assert float(sigma_r) == pytest.approx(285.714, rel=1e-5)
    amplitude = mean = float(sigma_r) / 2
    assert amplitude / 200 + mean / 500 == pytest.approx(1.0, rel=1e-12)
    # Fully reversed: no mean stress, the endurance limit itself.
    assert float(fm.goodman_strength(np.array(200.0), np.array(500.0), -1.0)) == pytest.approx(200.0)
    # R = 0.5: σa = σmax/4, σm = 3σmax/4, σmax = 1/(0.25/200 + 0.75/500) = 363.6 MPa.
    assert float(fm.goodman_strength(np.array(200.0), np.array(500.0), 0.5)) == pytest.approx(
        363.64, rel=1e-4
    )

"""Robustness with failure-mode constraints: the Goodman strength recombined per draw, checks re-run."""

from __future__ import annotations

import math

import pytest

from selector.inputs.spec import spec_from_dict
from selector.pipeline.robust import robustness, sensitivity
from selector.pipeline.selection import select
from tests.conftest import make_table

DRAWS = 20_000
MC_SIGMAS = 4.0
"""Monte Carlo checks allow this many standard errors (common practice, no source)."""


def within_mc(p: float, expected: float, draws: int = DRAWS) -> bool:
    se = math.sqrt(max(expected * (1 - expected), 1e-12) / draws)
    return abs(p - expected) <= MC_SIGMAS * se


def p_best(result, class_id: str) -> float:
    return float(result.table.set_index("id").loc[class_id, "p_best"])


# Goodman at R = 0 (σa = σm = σmax/2), worked by hand: σ_R = 2/(1/σe + 1/σts).
# A: σe = 100 MPa exactly, σts log-uniform on [200, 800] MPa, so σ_R runs from 133.3 to 177.8 MPa.
# B: σe = 150, σts = 300 MPa exactly: σ_R = 2/(1/150 + 1/300) = 200 MPa, ρ = 1000 kg/m³.
# A beam in fatigue of given span, mass minimised, scale free: mass ∝ ρ/σ_R^(2/3). With
# ρ_A = 1000·0.8^(2/3) = 861.77 kg/m³, A is lighter exactly when σ_R,A > 200·0.8 = 160 MPa,
# i.e. 1/100 + 1/σts < 2/160 → σts > 400 MPa: P = ln(800/400)/ln(800/200) = 1/2.
# Drawing σ_R itself log-uniformly on [133.3, 177.8] would give
# ln(177.8/160)/ln(177.8/133.3) = 0.366 instead.
RHO_A = 1000 * 0.8 ** (2 / 3)
GOODMAN_PAIR = [
    {"id": "A", "sigma_e": (100, 100), "sigma_ts": (200, 800), "sigma_y": (150, 150), "rho": (RHO_A, RHO_A)},
    {"id": "B", "sigma_e": (150, 150), "sigma_ts": (300, 300), "sigma_y": (250, 250), "rho": (1000, 1000)},
]


def fatigue_beam(rows):
    spec = spec_from_dict(
        {
            "title": "lever in repeated bending",
            "part": {
                "function": "beam",
                "support": "cantilever",
                "load": "end",
                "length": "0.5 m",
                "force": "200 N",
            },
            "section": {"shape": "rectangle", "free": "scale", "b": "10 mm", "h": "30 mm"},
            "objective": {"minimize": "mass"},
            "constraint": [{"type": "fatigue", "load_ratio": 0, "safety_factor": 2}],
        }
    )
    return select(spec, make_table(rows))


def test_goodman_strength_is_recombined_from_sigma_e_and_sigma_ts_in_every_draw():
    selection = fatigue_beam(GOODMAN_PAIR)
    result = robustness(selection, draws=DRAWS, seed=5)
    assert set(result.properties) == {"rho", "sigma_e", "sigma_ts"}  # sigma_R is not drawn itself
    assert within_mc(p_best(result, "A"), 0.5)  # hand-worked above
    assert not within_mc(p_best(result, "A"), 0.366)


def test_sensitivity_names_the_stored_properties_behind_the_goodman_strength():
    selection = fatigue_beam(GOODMAN_PAIR)
    table = sensitivity(selection, draws=4_000, seed=5)
    assert set(table["property"]) == {"rho", "sigma_e", "sigma_ts"}
    # only σts of A scatters, so it alone can unsettle the leader (common practice, no source)
    moving = table[table["p_best_drop"] > 0]
    assert list(moving["property"]) == ["sigma_ts"]


def test_the_index_ranking_without_loads_recombines_too():
    spec = spec_from_dict(
        {
            "title": "lever index",
            "part": {"function": "beam", "support": "cantilever", "load": "end"},
            "constraint": [{"type": "fatigue", "load_ratio": 0}],
        }
    )
    selection = select(spec, make_table(GOODMAN_PAIR))
    assert not selection.sized
    result = robustness(selection, draws=DRAWS, seed=9)
    assert within_mc(p_best(result, "A"), 0.5)  # the same hand-worked odds, on the index σ_R^(2/3)/ρ


# A tie with a lowest axial frequency: f₁ = √(E/ρ)/(2L) does not involve the area, so it is a
# check on the class (first axial mode of a bar held at both ends — Blevins, Formulas for Natural
# Frequency and Mode Shape, from memory). L = 1 m, f_min = √(1.5e9/1000)/2 = 612.37 Hz, so a class
# of ρ = 1000 kg/m³ passes when E > 1.5 GPa. A: E log-uniform on [1, 4] GPa passes at its
# typical E = 2 GPa, and in a draw with probability ln(4/1.5)/ln(4) = 0.7075. Sized on strength
# (m = SF·F·L·ρ/σy) A is always lighter than B (ρ/σy = 10 against 32 kg/m³ per MPa), so A is
# best exactly when it passes the check.
F_MIN = math.sqrt(1.5e9 / 1000) / 2
TIE_PAIR = [
    {"id": "A", "E": (1, 4), "rho": (1000, 1000), "sigma_y": (100, 100)},
    {"id": "B", "E": (200, 200), "rho": (8000, 8000), "sigma_y": (250, 250)},
]


def test_a_size_free_frequency_check_is_re_run_in_every_draw():
    spec = spec_from_dict(
        {
            "title": "tie with an axial-mode limit",
            "part": {"function": "tie", "length": "1 m", "force": "5 kN"},
            "constraint": [
                {"type": "strength", "safety_factor": 1.5},
                {"type": "frequency", "min_frequency": f"{F_MIN:.6f} Hz"},
            ],
        }
    )
    selection = select(spec, make_table(TIE_PAIR))
    assert list(selection.shortlist["id"]) == ["A", "B"]  # both pass at typical values
    result = robustness(selection, draws=DRAWS, seed=11)
    expected = math.log(4 / 1.5) / math.log(4)
    assert within_mc(p_best(result, "A"), expected)
    assert p_best(result, "A") == pytest.approx(expected, abs=0.02)

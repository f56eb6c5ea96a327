"""A stocky column is sized and checked on the Johnson parabola, not on Euler's load alone."""

from __future__ import annotations

import math

import pytest

from selector.inputs.spec import spec_from_dict
from selector.mechanics.column_buckling import buckling_stress, euler_overestimate
from selector.pipeline.selection import select
from tests.conftest import make_table

# σ_c is the crushing strength the column's strength check and the Johnson parabola read.
STEEL = {
    "id": "steel",
    "family": "metal",
    "sigma_y": (250, 250),
    "sigma_c": (250, 250),
    "rho": (7850, 7850),
    "E": (200, 200),
}


def _column(length: str, force: str, section: dict) -> dict:
    return {
        "part": {"function": "column", "support": "pinned-pinned", "length": length, "force": force},
        "section": {"shape": "round", **section},
        "constraint": [{"type": "buckling", "safety_factor": 1.0}],
    }


def _part(spec: dict):
    return select(spec_from_dict(spec), make_table([STEEL])).shortlist.iloc[0]


def test_the_parabola_meets_euler_at_half_the_strength():
    # Johnson's σ_cr = σ_c − σ_c²/(4σ_E) is tangent to Euler's curve at σ_E = σ_c/2 and
    # reaches σ_c as σ_E grows without bound (Shigley, columns chapter; from memory).
    assert buckling_stress(125e6, 250e6) == pytest.approx(125e6)
    assert buckling_stress(100e6, 250e6) == 100e6  # slender: Euler's own
    assert buckling_stress(1e15, 250e6) == pytest.approx(250e6)
    # σ_E = 500, σ_c = 250 MPa: σ_cr = 250 − 250²/(4·500) = 218.75 MPa, 500/218.75 = 2.2857
    assert euler_overestimate(500e6, 250e6) == pytest.approx(2.2857, rel=1e-4)


def test_a_stocky_column_is_sized_on_the_johnson_parabola():
    # Worked by hand. Euler alone: I = F·L²/(π²·E) = 200e3·0.5²/(π²·200e9) = 2.533e-8 m⁴,
    # d = (64·I/π)^¼ = 26.8 mm, whose Euler stress F/A = 355 MPa is far above σ_c/2 (and
    # above σ_c itself). On the parabola, with σ_E = π²·E·d²/(16·L²) for a solid round bar,
    # F = A·(σ_c − σ_c²/(4σ_E)) gives d² = 4·(F + σ_c²·L²/(π·E))/(π·σ_c)
    #    = 4·(200e3 + 24 868)/(π·250e6), d = 33.84 mm.
    row = _part(_column("500 mm", "200 kN", {"free": "scale", "d": "10 mm"}))
    d = row["dimensions"]["d"]
    assert d == pytest.approx(33.84e-3, rel=1e-3)
    assert row["utilisation"]["buckling"] == pytest.approx(1.0, rel=1e-6)
    assert any("Johnson parabola" in w and "×1.26" in w for w in row["size_warnings"])
    hand = math.sqrt(4 * (200e3 + 250e6**2 * 0.5**2 / (math.pi * 200e9)) / (math.pi * 250e6))
    assert d == pytest.approx(hand, rel=1e-6)


def test_a_given_stocky_column_is_checked_on_the_parabola():
    # d = 40 mm, L = 0.5 m: σ_E = π²·200e9·0.040²/(16·0.5²) = 790 MPa, σ_cr = 250 − 250²/(4·790)
    # = 230.2 MPa, F_cr = 230.2e6·π·0.040²/4 = 289.3 kN, so 200 kN uses 0.691 of it (Euler's
    # load, 992 kN, would say 0.202). Worked by hand.
    row = _part(_column("500 mm", "200 kN", {"free": "none", "d": "40 mm"}))
    assert row["utilisation"]["buckling"] == pytest.approx(0.691, rel=2e-3)
    assert any("checked on the Johnson parabola" in w for w in row["size_warnings"])


def test_a_slender_column_keeps_euler():
    # L = 3 m, F = 10 kN: d = 31.0 mm from Euler, σ_E = F/A = 13 MPa, far below σ_c/2.
    row = _part(_column("3 m", "10 kN", {"free": "scale", "d": "10 mm"}))
    i = 10e3 * 3.0**2 / (math.pi**2 * 200e9)
    assert row["dimensions"]["d"] == pytest.approx((64 * i / math.pi) ** 0.25, rel=1e-6)
    assert not any("stocky" in w for w in row["size_warnings"])


def _tube_johnson_wall(d: float, length: float, force: float, e: float, sigma_c: float) -> float:
    """The wall [m] at which a pinned tube carries ``force`` on the Johnson parabola, found by
    bisection on the textbook relations (A, I of a tube; σ_E = π²·E·I/(A·L²))."""
    lo, hi = 1e-6, d / 2 * (1 - 1e-9)
    for _ in range(200):
        t = 0.5 * (lo + hi)
        inner = d - 2 * t
        area, inertia = math.pi * (d**2 - inner**2) / 4, math.pi * (d**4 - inner**4) / 64
        sigma_e = math.pi**2 * e * inertia / (area * length**2)
        sigma = sigma_e if sigma_e <= sigma_c / 2 else sigma_c - sigma_c**2 / (4 * sigma_e)
        lo, hi = (t, hi) if area * sigma < force else (lo, t)
    return hi


@pytest.mark.parametrize("force", ["150 kN", "40 kN"])
def test_a_stocky_tube_grows_its_wall_past_ten_times_the_euler_wall(force):
    # d = 30 mm, L = 300 mm. At 150 kN Euler alone asks t ≈ 8·I/(π·d³) = 0.65 mm, whose Euler
    # stress (≈ 2500 MPa) is far above σ_c/2: the parabola needs a wall near 9.6 mm, more than ten
    # times as thick and still inside the 15 mm radius. At 40 kN Euler asks 0.17 mm, the 0.5 mm
    # minimum wall of metal tube is set first, and the parabola then grows it past that minimum.
    row = _part(
        {
            "part": {"function": "column", "support": "pinned-pinned", "length": "300 mm", "force": force},
            "section": {"shape": "tube", "free": "wall", "d": "30 mm", "t": "2 mm"},
            "constraint": [{"type": "buckling", "safety_factor": 1.0}],
        }
    )
    newtons = float(force.split()[0]) * 1e3
    assert row["feasible"]
    assert row["dimensions"]["t"] == pytest.approx(
        _tube_johnson_wall(0.030, 0.3, newtons, 200e9, 250e6), rel=1e-4
    )
    assert row["utilisation"]["buckling"] == pytest.approx(1.0, rel=1e-6)
    assert not any("minimum wall" in w for w in row["size_warnings"])
    assert any("sized on the Johnson parabola" in w for w in row["size_warnings"])


def test_a_column_without_a_compressive_strength_says_the_parabola_is_not_checked():
    row = select(
        spec_from_dict(_column("500 mm", "200 kN", {"free": "scale", "d": "10 mm"})),
        make_table([{**STEEL, "sigma_c": (float("nan"), float("nan"))}]),
    ).table.iloc[0]
    assert any("σ_c unknown" in w for w in row["size_warnings"])

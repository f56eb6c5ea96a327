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
    assert euler_overestimate(500e6, 250e6) == pytest.approx(500 / (250 - 250**2 / 2000))


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

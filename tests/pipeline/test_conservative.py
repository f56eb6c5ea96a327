"""``--conservative`` sizes every part at the unfavourable end of each range, and ranks by that."""

from __future__ import annotations

import math

import pytest

from selector.inputs.spec import spec_from_dict
from selector.pipeline.selection import CONSERVATIVE_NOTE, select
from tests.conftest import make_table

# Invented classes (demo data): only the ranges matter here.
WIDE = {"id": "wide", "sigma_y": (250, 395), "rho": (7800, 7900), "price": (0.7, 1.1), "E": (200, 215)}
NARROW = {"id": "narrow", "sigma_y": (300, 310), "rho": (7800, 7900), "price": (0.7, 1.1), "E": (200, 215)}


def _vessel(minimize: str = "mass"):
    return spec_from_dict(
        {
            "part": {"function": "cylinder", "radius": "40 mm", "length": "200 mm", "pressure": "2 MPa"},
            "section": {"free": "wall"},
            "objective": {"minimize": minimize},
            "constraint": [{"type": "strength", "safety_factor": 2.0}],
        }
    )


def test_conservative_wall_is_sized_at_the_low_strength_worked_by_hand():
    # Thin cylinder, hoop stress σ = p·r/t ≤ σ_y/SF (Roark's Formulas, 8th ed., Table 13.1 case 1a
    # — from memory): t = p·r·SF/σ_y.
    # Typical: σ_y = √(250·395) = 314.2 MPa → t = 2e6·0.04·2/314.2e6 = 0.509 mm.
    # Conservative: σ_y = 250 MPa → t = 0.640 mm;
    # mass = 2π·r·L·t·ρ_high = 2π·0.04·0.2·0.00064·7900 = 0.2541 kg.
    table = make_table([WIDE])
    typical = select(_vessel(), table).shortlist.iloc[0]
    worst = select(_vessel(), table, conservative=True).shortlist.iloc[0]
    assert typical["dimensions"]["t"] == pytest.approx(2e6 * 0.04 * 2 / math.sqrt(250e6 * 395e6))
    assert worst["dimensions"]["t"] == pytest.approx(0.64e-3)
    assert worst["mass"] == pytest.approx(2 * math.pi * 0.04 * 0.2 * 0.64e-3 * 7900)
    assert worst["cost"] == pytest.approx(worst["mass"] * 1.1)


def test_conservative_ranks_by_the_conservative_sizes_and_says_so():
    # Typical σ_y: wide 314 MPa beats narrow 305 MPa; at the low end narrow (300) beats wide (250).
    table = make_table([WIDE, NARROW])
    assert list(select(_vessel(), table).shortlist["id"]) == ["wide", "narrow"]
    chosen = select(_vessel(), table, conservative=True)
    assert list(chosen.shortlist["id"]) == ["narrow", "wide"]
    assert CONSERVATIVE_NOTE in chosen.notes
    masses = chosen.shortlist["mass"].to_numpy()
    assert (masses[1:] >= masses[:-1]).all()


def test_conservative_cost_column_is_in_rank_order():
    # The cost of the conservative part uses the high price: narrow and wide differ only in σ_y.
    table = make_table([WIDE, {**NARROW, "price": (0.5, 3.0)}])
    chosen = select(_vessel("cost"), table, conservative=True).shortlist
    costs = chosen["cost"].to_numpy()
    assert (costs[1:] >= costs[:-1]).all()
    assert list(chosen["id"]) == ["wide", "narrow"]

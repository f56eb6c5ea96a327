"""A vessel's thin-wall sizing says when the wall is too thick for it to hold."""

from __future__ import annotations

import pytest

from selector.inputs.spec import spec_from_dict
from selector.pipeline.selection import select
from tests.conftest import make_table

STEEL = {"id": "steel", "family": "metal", "sigma_y": (250, 250), "rho": (7850, 7850), "E": (200, 200)}


def _vessel(pressure: str):
    return spec_from_dict(
        {
            "part": {"function": "cylinder", "radius": "10 mm", "length": "100 mm", "pressure": pressure},
            "section": {"free": "wall"},
            "constraint": [{"type": "strength"}],
        }
    )


def test_a_thick_wall_is_flagged():
    # Hoop stress p·r/t = σ_y (worked by hand): t = 100e6·0.010/250e6 = 4 mm, r/t = 2.5, well
    # inside the thick-wall range where the bore stress exceeds p·r/t (Lamé; thin-wall
    # formulas hold for r/t above about 10 — common practice, no source).
    row = select(_vessel("100 MPa"), make_table([STEEL])).shortlist.iloc[0]
    assert row["dimensions"]["t"] == pytest.approx(4e-3)
    assert any("thick wall (r/t = 2.5" in w for w in row["size_warnings"])


def test_a_thin_wall_is_not_flagged():
    # t = 5e6·0.010/250e6 = 0.2 mm, or the product-form minimum wall above it: r/t above 10.
    row = select(_vessel("5 MPa"), make_table([STEEL])).shortlist.iloc[0]
    assert 0.010 / row["dimensions"]["t"] > 10
    assert not any("thick wall" in w for w in row["size_warnings"])

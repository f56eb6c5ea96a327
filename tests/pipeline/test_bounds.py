"""Bounds on the sized part (``max_depth``, ``max_width``, ``max_diameter``) and shapes a function uses."""

from __future__ import annotations

import pytest

from selector.errors import InputError
from selector.inputs.spec import spec_from_dict
from selector.inputs.spec_keys import PART_KEYS
from selector.pipeline.selection import select
from tests.conftest import make_table

# Invented steel-like class (demo data).
STEELISH = {"id": "steelish", "family": "metal", "sigma_y": (250, 250), "rho": (7850, 7850), "E": (200, 200)}


def _tie(**section: str):
    return spec_from_dict(
        {
            "part": {"function": "tie", "length": "1 m", "force": "10 kN"},
            "section": {"shape": "round", **section},
            "constraint": [{"type": "strength"}],
        }
    )


def _beam(**section: str):
    return spec_from_dict(
        {
            "part": {"function": "beam", "support": "cantilever", "length": "0.5 m", "force": "1 kN"},
            "section": {"shape": "rectangle", "free": "depth", "b": "20 mm", **section},
            "constraint": [{"type": "strength"}],
        }
    )


def _vessel(**section: str):
    return spec_from_dict(
        {
            "part": {"function": "cylinder", "radius": "40 mm", "length": "200 mm", "pressure": "2 MPa"},
            "section": {"free": "wall", **section},
            "constraint": [{"type": "strength", "safety_factor": 2.0}],
        }
    )


def _only(spec):
    return select(spec, make_table([STEELISH])).table.iloc[0]


@pytest.mark.parametrize(
    ("spec_of", "bound", "too_small", "enough", "needed", "dimension", "size"),
    [
        # Tie: A = F/σ_y = 10e3/250e6 = 4e-5 m², d = √(4A/π) = 7.14 mm (worked by hand).
        (_tie, "max_diameter", "7 mm", "7.2 mm", "the diameter d = 7.14 mm", "d", 7.136e-3),
        # A round section's depth is its diameter.
        (_tie, "max_depth", "7 mm", "7.2 mm", "the diameter d = 7.14 mm", "d", 7.136e-3),
        # Beam: M = F·L = 500 N·m; h = √(6·M/(b·σ_y)) = √(6·500/(0.02·250e6)) = 24.5 mm (by hand).
        (_beam, "max_depth", "24 mm", "25 mm", "the depth h = 24.5 mm", "h", 24.49e-3),
    ],
)
def test_a_part_bigger_than_its_bound_is_rejected_with_the_size_needed(
    spec_of, bound, too_small, enough, needed, dimension, size
):
    row = _only(spec_of(**{bound: too_small}))
    assert row["status"] == "rejected"
    assert any(f"{needed}, above {bound} = {too_small}" in r for r in row["reasons"])
    row = _only(spec_of(**{bound: enough}))
    assert row["status"] == "passes"
    assert row["dimensions"][dimension] == pytest.approx(size, rel=1e-3)


def test_max_width_reads_the_width_of_a_beam():
    row = _only(_beam(max_width="15 mm"))
    assert any("the width b = 20 mm, above max_width = 15 mm" in r for r in row["reasons"])


def test_a_vessel_bound_reads_its_outer_diameter():
    # t = p·r·SF/σ_y = 2e6·0.04·2/250e6 = 0.64 mm; outer diameter 2r + t = 80.64 mm (by hand).
    row = _only(_vessel(max_diameter="80.5 mm"))
    assert row["status"] == "rejected"
    assert any("2·r + t = 80.6 mm, above max_diameter = 80.5 mm" in r for r in row["reasons"])
    assert _only(_vessel(max_diameter="81 mm"))["status"] == "passes"


def test_a_bound_the_part_does_not_have_is_an_error_naming_those_it_has():
    with pytest.raises(InputError, match=r"section.max_diameter.*one of: max_depth, max_width"):
        _only(_beam(max_diameter="30 mm"))
    with pytest.raises(InputError, match=r"section.max_depth.*one of: max_diameter"):
        _only(_vessel(max_depth="30 mm"))


def test_a_spring_takes_no_bound():
    spec = spec_from_dict(
        {
            "part": {"function": "spring", "energy": "5 J"},
            "section": {"max_depth": "30 mm"},
            "constraint": [{"type": "strength"}],
        }
    )
    with pytest.raises(InputError, match="no size bound"):
        _only(spec)


@pytest.mark.parametrize(
    ("function", "shape", "expected"),
    [
        ("plate", "tube", "no shape: a plate is sized by its thickness"),
        ("cylinder", "round", "no shape: a cylinder is sized by its wall"),
        ("spring", "rectangle", "no shape: a spring is sized by its volume"),
        ("panel", "round", "one of: rectangle, sandwich"),
    ],
)
def test_a_shape_the_function_does_not_use_is_an_error(function, shape, expected):
    part = {
        "function": function,
        "length": "1 m",
        "width": "0.3 m",
        "force": "1 kN",
        "radius": "40 mm",
        "pressure": "1 MPa",
        "energy": "5 J",
    }
    part = {k: v for k, v in part.items() if k == "function" or k in PART_KEYS[function]}
    free = {"plate": "thickness", "cylinder": "wall", "spring": "scale", "panel": "thickness"}[function]
    spec = spec_from_dict(
        {"part": part, "section": {"shape": shape, "free": free}, "constraint": [{"type": "strength"}]}
    )
    with pytest.raises(InputError, match=expected) as caught:
        _only(spec)
    assert caught.value.where == "section.shape"


def _hatch(section: dict, sandwich: dict):
    return spec_from_dict(
        {
            "part": {"function": "panel", "length": "0.9 m", "width": "0.6 m", "force": "1.5 kN"},
            "section": {"shape": "sandwich", "free": "faces-and-core", **section},
            "sandwich": sandwich,
            "constraint": [{"type": "stiffness", "max_deflection": "3 mm"}, {"type": "strength"}],
        }
    )


def test_a_sandwich_reads_max_depth_from_either_table_but_not_both():
    steel = {**STEELISH, "E": (200, 200), "sigma_c": (250, 250)}
    foam = {"id": "foamish", "family": "foam", "rho": (100, 100), "E": (0.1, 0.1), "G": (0.04, 0.04)}
    table = make_table([steel, foam])
    result = select(_hatch({"max_depth": "40 mm"}, {}), table).sandwich
    assert result.loads.max_depth == pytest.approx(0.040)
    with pytest.raises(InputError, match="both"):
        select(_hatch({"max_depth": "40 mm"}, {"max_depth": "40 mm"}), table)

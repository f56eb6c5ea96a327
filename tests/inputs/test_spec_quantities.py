"""Every quantity of a spec read into SI once, every problem listed in one pass."""

from __future__ import annotations

import math

import pytest

from selector.errors import SpecError
from selector.inputs.spec import spec_from_dict
from selector.inputs.spec_quantities import frequency_in_hz, si_values

BEAM = {
    "part": {
        "function": "beam",
        "support": "cantilever",
        "load": "end",
        "length": "2 ft",
        "force": "450 lbf",
    },
    "section": {"shape": "tube", "free": "wall", "d": "2 in", "t": "0.0625 in", "min_wall": "1 mm"},
    "constraint": [
        {"type": "stiffness", "max_deflection": "0.25 in"},
        {"type": "frequency", "min_frequency": "1200 rpm"},
        {"type": "fracture", "crack_length": "2 mm"},
    ],
}


def test_every_quantity_is_in_si_by_its_path():
    si = si_values(spec_from_dict(BEAM))
    # 1 ft = 0.3048 m, 1 in = 0.0254 m, 1 lbf = 4.4482216152605 N (NIST SP 811, from memory)
    assert si["part.length"] == pytest.approx(0.6096)
    assert si["part.force"] == pytest.approx(450 * 4.4482216152605)
    assert si["section.d"] == pytest.approx(0.0508)
    assert si["section.t"] == pytest.approx(0.0254 / 16)
    assert si["section.min_wall"] == pytest.approx(1e-3)
    assert si["constraint[0].max_deflection"] == pytest.approx(0.00635)
    assert si["constraint[1].min_frequency"] == pytest.approx(20.0)  # 1200 turns a minute is 20 Hz
    assert si["constraint[2].crack_length"] == pytest.approx(2e-3)


def test_rad_per_second_counts_turns():
    assert frequency_in_hz(f"{2 * math.pi} rad/s", "x") == pytest.approx(1.0)
    assert frequency_in_hz("25 Hz", "x") == pytest.approx(25.0)


def test_every_bad_quantity_is_listed_in_one_pass():
    bad = {
        **BEAM,
        "part": {**BEAM["part"], "length": "2 kN", "force": "nan N"},
        "section": {**BEAM["section"], "t": "-1 mm"},
        "constraint": [{"type": "stiffness", "max_deflection": "5 parsecs"}],
    }
    with pytest.raises(SpecError) as err:
        spec_from_dict(bad, source="boom.toml")
    where = [e.where for e in err.value.errors]
    assert where == [
        "boom.toml: part.length",
        "boom.toml: part.force",
        "boom.toml: section.t",
        "boom.toml: constraint[0].max_deflection",
    ]
    assert [e.location for e in err.value.errors][3] == ("constraint", 0, "max_deflection")
    assert "a force" in str(err.value.errors[0]) and "a length" in str(err.value.errors[0])

"""Every result states its modelling assumptions once: only those that apply to the spec."""

from __future__ import annotations

import json

import pytest
from markupsafe import escape

from selector.inputs.spec import spec_from_dict
from selector.outputs.report import build_report
from selector.outputs.tables import render_selection
from selector.pipeline.selection import select
from tests.conftest import make_table

# Invented metal-like class (demo data).
METALISH = make_table(
    [{"id": "metalish", "E": (70, 70), "G": (26, 26), "sigma_y": (200, 200), "rho": (2700, 2700)}]
)


def _assumptions(part: dict, constraints: list[dict], section: dict | None = None) -> tuple[str, ...]:
    spec = spec_from_dict({"part": part, "section": section or {}, "constraint": constraints})
    return select(spec, METALISH).assumptions


def _has(assumptions: tuple[str, ...], text: str) -> bool:
    return any(text in a for a in assumptions)


BEAM = {"function": "beam", "support": "simply-supported", "load": "centre", "length": "1 m", "force": "1 kN"}


def test_a_beam_states_its_constants_and_bending_model():
    stated = _assumptions(BEAM, [{"type": "stiffness", "max_deflection": "2 mm"}, {"type": "strength"}])
    # δ = F·L³/(48·E·I) and M_max = F·L/4 for a simply supported beam with a centre load
    # (Roark's Formulas for Stress and Strain, 8th ed., Table 8.1 case 1e — from memory)
    assert _has(stated, "C = 48") and _has(stated, "C_M = 4")
    assert _has(stated, "load case: beam, simply-supported, centre load")
    assert _has(stated, "Euler–Bernoulli")
    assert _has(stated, "no stress concentrations")
    assert _has(stated, "the load is static")
    assert not _has(stated, "end caps") and not _has(stated, "σ_y/√3") and not _has(stated, "Goodman")


def test_a_shaft_states_the_shear_yield_and_its_torsion_constant():
    stated = _assumptions(
        {"function": "shaft", "length": "0.4 m", "torque": "20 N*m"},
        [{"type": "strength"}],
        {"shape": "tube", "d": "20 mm", "t": "2 mm"},
    )
    assert _has(stated, "τ_y = σ_y/√3 (von Mises)")  # von Mises shear yield (common practice, no source)
    assert _has(stated, "torsion constant J: circular tube, exact")
    assert not _has(stated, "Euler–Bernoulli")


def test_a_vessel_states_thin_walls_and_no_end_caps():
    stated = _assumptions(
        {"function": "cylinder", "radius": "40 mm", "length": "0.2 m", "pressure": "2 MPa"},
        [{"type": "strength"}],
        {"free": "wall"},
    )
    assert _has(stated, "no end caps")
    assert _has(stated, "thin wall (r/t above about 10)")


def test_plate_edges_are_stated_once_with_their_coefficient():
    stated = _assumptions(
        {"function": "plate", "edges": "clamped", "length": "1 m", "width": "0.1 m", "force": "5 kN"},
        [{"type": "buckling"}],
        {"free": "thickness"},
    )
    # k = 6.97 for a long plate with its unloaded edges clamped (Timoshenko & Gere, Theory of
    # Elastic Stability, Table 9.4 — from memory)
    assert sum("k = 6.97" in a for a in stated) == 1
    assert len(stated) == len(set(stated))


def test_fatigue_at_a_load_ratio_states_the_goodman_line():
    part = BEAM
    stated = _assumptions(part, [{"type": "fatigue", "load_ratio": 0.0}])
    assert _has(stated, "the mean stress is taken by the Goodman line")
    assert not _has(stated, "the load is static")
    fully_reversed = _assumptions(part, [{"type": "fatigue"}])  # R = −1: no mean stress
    assert not _has(fully_reversed, "the mean stress is taken")


def test_a_spring_states_its_form():
    stated = _assumptions({"function": "spring", "energy": "5 J", "form": "leaf"}, [{"type": "strength"}])
    assert _has(stated, "η = 1/3")  # a rectangular leaf in uniform bending stores 1/3 (by integration)


@pytest.fixture
def beam_selection():
    spec = spec_from_dict({"title": "Invented bracket", "part": BEAM, "constraint": [{"type": "strength"}]})
    return select(spec, METALISH)


def test_the_terminal_footer_json_and_report_carry_the_assumptions(beam_selection):
    stated = list(beam_selection.assumptions)
    text = render_selection(beam_selection, "table")
    footer = text.split("too close to call", 1)[1]
    assert all(f"assumes: {a}" in footer for a in stated)
    records = json.loads(render_selection(beam_selection, "json"))
    assert records and all(r["assumptions"] == stated for r in records)
    page = build_report(beam_selection)
    assert all(str(escape(a)) in page for a in stated)  # autoescaped by the template


def test_a_sandwich_states_its_own_assumptions_then_the_solid_parts():
    from selector.inputs.spec import EXAMPLES, load_spec
    from selector.outputs.sandwich_tables import render_sandwich

    selection = select(load_spec(EXAMPLES / "walkway-hatch.toml"))
    own = selection.sandwich.assumptions
    assert selection.assumptions[: len(own)] == own
    assert any(a.startswith("solid part: load case: panel") for a in selection.assumptions)
    assert json.loads(render_sandwich(selection, "json"))["assumptions"] == list(selection.assumptions)

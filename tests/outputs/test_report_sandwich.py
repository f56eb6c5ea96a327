"""The report's sandwich section: pairs, both thicknesses, deflection parts, modes, the solid part."""

from __future__ import annotations

import math
from pathlib import Path

import pytest

from selector.api import run_spec
from selector.inputs.materials import load_materials
from selector.mechanics.sandwich import MODES, SOURCES
from selector.outputs import report
from selector.outputs.report_sandwich import REPORT_PAIRS
from selector.pipeline.selection import CAUTION, report_studies
from tests.outputs.test_report import parse

EXAMPLES = Path(__file__).parents[2] / "examples"
HATCH = EXAMPLES / "walkway-hatch.toml"


@pytest.fixture(scope="module")
def hatch():
    return run_spec(HATCH)


@pytest.fixture(scope="module")
def page(hatch):
    html = report.build_report(report_studies(hatch, 0), HATCH.read_text(encoding="utf-8"), HATCH.name)
    return parse(html)


def _typical(row, symbol: str, factor: float) -> float:
    return math.sqrt(row[f"{symbol}_low"] * row[f"{symbol}_high"]) * factor


def test_section_lists_the_best_pairs_with_every_column(page, hatch):
    rows = page.tables["sandwich-pairs"]
    header, body = rows[0], rows[1:]
    assert len(body) == min(REPORT_PAIRS, len(hatch.sandwich.feasible))
    for name in (
        "Face",
        "Core",
        "tface",
        "tcore",
        "Mass",
        "Cost",
        "CO₂",
        "δ bending",
        "δ shear",
        "Governing",
    ):
        assert any(h.startswith(name) for h in header), name
    best = hatch.sandwich.feasible.iloc[0]
    first = dict(zip(header, body[0], strict=True))
    assert first["Face"] == best["face_name"] and first["Core"] == best["core_name"]
    assert float(first["tface mm"]) == pytest.approx(best["t_face"] * 1e3, rel=5e-3)
    assert float(first["tcore mm"]) == pytest.approx(best["t_core"] * 1e3, rel=5e-3)
    assert float(first["Mass kg"]) == pytest.approx(best["mass"], rel=5e-3)
    util = first["Utilisation"]
    assert all(mode in util for mode in MODES) and first["Governing"] in MODES


def test_leader_deflection_parts_match_a_hand_calculation(page, hatch):
    """Bending and core-shear deflection of the leading pair, worked from its thicknesses.

    Allen (1969), ch. 2 (from memory): D = E_f·b·t_f·d²/2 + E_f·b·t_f³/6 with an antiplane core,
    S = G_c·b·d²/t_c, d = t_c + t_f. A simply supported span with a central load F:
    δ_b = F·L³/(48·D) (Roark, 8th ed., Table 8.1 case 1e, from memory), δ_s = F·L/(4·S)
    (Zenkert 1995, Table 4.1, from memory).
    """
    best = hatch.sandwich.feasible.iloc[0]
    table = load_materials().set_index("id")
    face, core = table.loc[best["face"]], table.loc[best["core"]]
    e_f = _typical(face, "E", 1e9)
    g_c = _typical(core, "G_core", 1e9)
    force, span, width = 1500.0, 0.9, 0.6  # examples/walkway-hatch.toml
    t_f, t_c = best["t_face"], best["t_core"]
    d = t_c + t_f
    rigidity = e_f * width * (t_f * d**2 / 2 + t_f**3 / 6)
    shear_stiffness = g_c * width * d**2 / t_c
    bending = force * span**3 / (48 * rigidity)
    shear = force * span / (4 * shear_stiffness)
    header, first = page.tables["sandwich-pairs"][0], page.tables["sandwich-pairs"][1]
    shown = dict(zip(header, first, strict=True))
    assert float(shown["δ bending mm"]) == pytest.approx(bending * 1e3, rel=5e-3)
    assert float(shown["δ shear mm"]) == pytest.approx(shear * 1e3, rel=5e-3)
    # the spec allows 3 mm; stiffness governs the leader, so the two parts use all of it
    assert (bending + shear) * 1e3 == pytest.approx(3.0 * best["utilisation"]["stiffness"], rel=1e-3)


def test_section_states_the_solid_part_model_sources_and_caution(page, hatch):
    text = page.text("sandwich")
    solid = hatch.sandwich.solid
    assert f"Best solid part for the same spec: {solid['name']}" in text
    assert f"mass {float(solid['mass']):.3g} kg" in text
    assert "δ = F·L³/(B₁·D) + F·L/(B₂·S), B₁ = 48, B₂ = 4" in text
    assert "face wrinkling σ_wr = 0.5·(E_f·E_c·G_c)^(1/3)" in text
    for source in SOURCES:
        assert source in text
    assert "antiplane core" in text and "panel spans one way" in text
    assert CAUTION in text
    assert text.startswith("5a. Sandwich face × core pairs")


def test_no_sandwich_section_for_a_solid_spec():
    html = report.build_report(report_studies(run_spec(EXAMPLES / "camera-dolly-boom.toml"), 0))
    page = parse(html)
    assert "sandwich" not in page.ids and "sandwich-pairs" not in page.tables
    assert "5a. Sandwich" not in html


def test_us_units_relabel_the_pairs(hatch):
    page = parse(report.build_report(report_studies(hatch, 0), units="us"))
    header, first = page.tables["sandwich-pairs"][0], page.tables["sandwich-pairs"][1]
    shown = dict(zip(header, first, strict=True))
    best = hatch.sandwich.feasible.iloc[0]
    assert float(shown["tcore in"]) == pytest.approx(best["t_core"] / 0.0254, rel=5e-3)
    assert float(shown["Mass lb"]) == pytest.approx(best["mass"] / 0.45359237, rel=5e-3)


def test_pairs_chart_is_embedded(page):
    assert page.text("figure-sandwich")
    assert "chart-sandwich" in page.ids


def test_report_studies_of_a_sandwich_cover_the_pairs(hatch):
    page = parse(report.build_report(report_studies(hatch, 100)))
    front = page.tables["keep"]
    assert any(" on " in cell for row in front for cell in row), "the trade-off lists face × core pairs"
    assert page.text("tradeoff-assumes").startswith("Assumed: each pair keeps the thicknesses")
    assert "not computed for a sandwich" in page.text("robustness")

"""Display units: indices and properties read as published charts state them, and --units us throughout.

Reference values are those of the published property charts (Ashby, Materials Selection in
Mechanical Design, 4th ed., the modulus–density chart and its E^(1/2)/ρ guide lines; from
memory) and exact unit definitions (NIST SP 811: 1 psi = 6894.757 Pa, 1 in = 25.4 mm,
1 lb = 0.45359237 kg).
"""

from __future__ import annotations

import json
import math
from pathlib import Path

import pytest
from click.testing import CliRunner

from selector.cli import cli
from selector.outputs import display_units as du

EXAMPLES = Path(__file__).parents[2] / "examples"
BOOM = str(EXAMPLES / "camera-dolly-boom.toml")


def _json(*args: str) -> list | dict:
    result = CliRunner().invoke(cli, [*args, "--format", "json"])
    assert result.exit_code == 0, result.output
    return json.loads(result.stdout)


def test_a_light_stiff_beam_index_reads_in_gpa_and_mg_per_m3():
    records = {r["id"]: r for r in _json("rank", BOOM)}
    unit = records["cfrp-qi"]["index"]["unit"]
    assert unit == "GPa^(1/2)/(Mg/m³)"
    # chart values (from memory): quasi-isotropic CFRP about 4–6, aluminium alloys about 3, steels about 1.8
    assert 4 <= records["cfrp-qi"]["index"]["value"] <= 7
    assert 2.5 <= records["al-6xxx-wrought"]["index"]["value"] <= 3.5
    assert 1.6 <= records["steel-low-carbon"]["index"]["value"] <= 2.0


def test_an_energy_index_reads_in_kj_per_kg():
    # σ_y²/(E·ρ) of a spring steel: (1500 MPa)² / (210 GPa · 7850 kg/m³) = 1.36 kJ/kg (hand-worked)
    stored = 1500.0**2 / (210.0 * 7850.0)
    shown = du.index_unit({"sigma_y": 2, "E": -1, "rho": -1}, "si", [stored])
    assert shown.label == "kJ/kg"
    assert stored * shown.factor == pytest.approx(1.3648, rel=1e-3)


def test_an_energy_per_volume_index_takes_the_prefix_that_keeps_it_readable():
    # σ_y²/E of the same steel: 10.7 MJ/m³ (hand-worked), not 10 700 kJ/m³
    stored = 1500.0**2 / 210.0
    shown = du.index_unit({"sigma_y": 2, "E": -1}, "si", [stored])
    assert shown.label == "MJ/m³"
    assert stored * shown.factor == pytest.approx(10.714, rel=1e-3)


def test_us_index_units_follow_the_exact_conversions():
    shown = du.index_unit({"E": 0.5, "rho": -1}, "us")
    assert shown.label == "Msi^(1/2)/(lb/in³)"
    # 1 GPa^½/(kg/m³) in Msi^½/(lb/in³): (1e9/6.894757e9)^½ · 27679.90 (NIST SP 811 factors)
    assert shown.factor == pytest.approx(math.sqrt(1 / 6.894757) * 27679.90, rel=1e-6)


def test_rubber_modulus_reads_in_mpa():
    shown = du.range_unit("E", 0.002)
    assert (shown.label, shown.factor) == ("MPa", 1e3)
    assert du.range_unit("E", 200.0).label == "GPa"
    assert du.range_unit("E", 0.002, "us").label == "ksi"


def test_materials_show_gives_a_rubber_modulus_in_mpa():
    rows = {r["property"]: r for r in _json("materials", "show", "rubber-natural")}
    modulus = rows["E (Young's modulus)"]
    assert modulus["unit"] == "MPa" and 0.1 <= modulus["high"] <= 100


def test_materials_list_marks_a_range_shown_in_another_unit():
    result = CliRunner().invoke(cli, ["materials", "list", "--family", "elastomer", "--wide"])
    assert " MPa" in result.stdout and "e-0" not in result.stdout


def test_quantities_in_reasons_convert_to_us_units():
    # 1 MPa·m½ = 0.9100 ksi·in½ (ASTM E399 conversion note, from memory)
    text = du.text_in_units("only part of K_IC 6–20 MPa·m½ reaches 15 MPa·m½", "us")
    assert text == "only part of K_IC 5.46–18.2 ksi·in½ reaches 13.7 ksi·in½"
    assert du.text_in_units("needs 25.4 mm", "us") == "needs 1 in"
    assert du.text_in_units("T_max 100 °C", "us") == "T_max 212 °F"
    assert du.text_in_units("6–20 MPa·m½", "si") == "6–20 MPa·m½"


SI_UNITS = (" MPa", " GPa", "kg/m³", "°C", " mm", "USD/kg", "Mg/m³")


@pytest.mark.parametrize(
    "args",
    [
        ("rank", BOOM, "--all"),
        ("rank", BOOM, "--tradeoff", "cost"),
        ("rank", BOOM, "--tradeoff", "cost", "--exchange", "40 USD/lb"),
        ("rank", BOOM, "--robust", "200"),
        ("materials", "list"),
        ("materials", "show", "cfrp-ud"),
    ],
)
def test_us_units_leave_no_si_unit_on_screen(args):
    result = CliRunner().invoke(cli, [*args, "--units", "us", "--wide"])
    assert result.exit_code == 0, result.output
    found = [u for u in SI_UNITS if u in result.stdout]
    assert not found, found

"""Index units: atoms cancelled, energy-type indices as energy per what buys it, and the band rule.

Index forms are those of Ashby's tables of material indices (Materials Selection in Mechanical
Design, 4th ed., ch. 5 and appendix B; from memory): E^(1/2)/ρ, E^(1/3)/(C_m·ρ), σ_y²/(E·ρ) for a
spring, K_IC²/σ_y for leak-before-break, K_IC²/E for the toughness G_c. Unit factors are exact by
definition (NIST SP 811: 1 psi = 6894.757 Pa, 1 in = 25.4 mm, 1 lb = 0.45359237 kg,
1 lbf = 4.4482216 N, so 1 ft·lbf = 1.3558179 J). Values are worked by hand in the comments.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest
from click.testing import CliRunner

from selector.api import run_spec
from selector.cli import cli
from selector.outputs import display_units as du
from selector.outputs.report import shortlist_rows
from selector.outputs.tables import index_shown
from selector.pipeline import columns

EXAMPLES = Path(__file__).parents[2] / "examples"
FT_LBF = 1.3558179483314004  # J (NIST SP 811)
KSI_IN = 6894.757293168361e3 * 0.0254  # Pa·m in one ksi·in
LOW, HIGH = 0.1, 1000.0


def _shown(exponents, stored, units="si", values=None):
    shown = du.index_unit(exponents, units, stored if values is None else values)
    return shown.label, np.asarray(stored) * shown.factor


# --- the simplifier -------------------------------------------------------------------------


def test_leak_before_break_index_reads_in_mpa_m():
    # Structural steel from the data's ranges: K_IC = √(50·120) = 77.46 MPa·m½, σ_y = √(275·355) =
    # 312.4 MPa, so K_IC²/σ_y = 6000/312.4 = 19.20 MPa·m (hand-worked), the (MPa·m½)²/MPa cancelled.
    stored = 6000 / np.sqrt(275 * 355)
    label, value = _shown({"K_IC": 2, "sigma_y": -1}, [stored])
    assert label == "MPa·m"
    assert value[0] == pytest.approx(19.20, rel=1e-3)
    # in US units the same cancels to ksi·in: 19.20e6 Pa·m / 175 126.8 Pa·m = 109.6 ksi·in
    label, value = _shown({"K_IC": 2, "sigma_y": -1}, [stored], "us")
    assert label == "ksi·in"
    assert value[0] == pytest.approx(stored * 1e6 / KSI_IN, rel=1e-9)
    assert value[0] == pytest.approx(109.6, rel=1e-3)


def test_toughness_over_strength_is_a_root_length():
    # K_IC/σ_y has the unit m½: the MPa cancels (common practice, no source: the plastic zone
    # size goes as (K_IC/σ_y)²); 77.46/312.4 = 0.248 m½
    label, value = _shown({"K_IC": 1, "sigma_y": -1}, [np.sqrt(6000) / np.sqrt(275 * 355)])
    assert (label, round(float(value[0]), 3)) == ("m½", 0.248)


def test_only_the_same_atom_cancels():
    # σ_y/E keeps MPa/GPa: a structural steel reads 312/205 = 1.52 (a yield strain of 0.15 %)
    label, value = _shown({"sigma_y": 1, "E": -1}, [312.4 / 205.0])
    assert (label, round(float(value[0]), 2)) == ("MPa/GPa", 1.52)
    # a ratio of two strengths has no unit left
    assert du.index_unit({"sigma_e": 1, "sigma_y": -1}, "si", [0.5]).label == "–"
    # quotients are kept whole as charts write them: K_IC/ρ of a steel, 77.5/7.85 = 9.87
    label, value = _shown({"K_IC": 1, "rho": -1}, [np.sqrt(6000) / 7850.0])
    assert label == "MPa·m½/(Mg/m³)"
    assert value[0] == pytest.approx(9.868, rel=1e-3)


def test_the_published_unit_is_kept_where_it_reads_in_the_band():
    # E^(1/2)/ρ of CFRP (√110 / 1.55 = 6.8), aluminium (√70 / 2.7 = 3.1), steel (√210 / 7.85 = 1.85)
    stored = [np.sqrt(110) / 1550, np.sqrt(70) / 2700, np.sqrt(210) / 7850]
    label, value = _shown({"E": 0.5, "rho": -1}, stored)
    assert label == "GPa^(1/2)/(Mg/m³)"
    assert value == pytest.approx([6.766, 3.099, 1.846], rel=1e-3)


def test_a_modulus_takes_a_smaller_prefix_when_the_median_would_read_below_the_band():
    # E^(1/3)/(C_m·ρ): aluminium plate 70^(1/3)/(3 USD/kg · 2.7 Mg/m³) = 0.5088, titanium
    # 110^(1/3)/(20 · 4.5) = 0.0532, a nickel alloy 200^(1/3)/(25 · 8.9) = 0.0263 in
    # GPa^(1/3)/((USD/kg)·(Mg/m³)): the median is below the band. In MPa^(1/3) each reads ten times
    # as much (1000^(1/3) = 10): 5.088, 0.532 and 0.263, the leader and the median in the band.
    stored = [70 ** (1 / 3) / (3 * 2700), 110 ** (1 / 3) / (20 * 4500), 200 ** (1 / 3) / (25 * 8900)]
    label, value = _shown({"E": 1 / 3, "price": -1, "rho": -1}, stored)
    assert label == "MPa^(1/3)/((USD/kg)·(Mg/m³))"
    assert value == pytest.approx([5.088, 0.532, 0.263], rel=1e-3)


# --- energy kinds ---------------------------------------------------------------------------


def test_spring_wire_stores_energy_per_dollar():
    # Patented drawn spring wire, typical values of the data's ranges: σ_y = √(1000·1900) = 1378 MPa,
    # G = √(78·82) = 79.97 GPa, C_m = √(1.5·3.5) = 2.291 USD/kg, ρ = √(7800·7900) = 7850 kg/m³:
    # σ_y²/(G·C_m·ρ) = 1.9e18 Pa² / (79.97e9 Pa · 2.291 USD/kg · 7850 kg/m³) = 1321 J/USD = 1.321 kJ/USD
    stored = 1000 * 1900 / (np.sqrt(78 * 82) * np.sqrt(1.5 * 3.5) * np.sqrt(7800 * 7900))
    label, value = _shown({"sigma_y": 2, "G": -1, "price": -1, "rho": -1}, [stored])
    assert label == "kJ/USD"
    assert value[0] == pytest.approx(1.321, rel=1e-3)
    # US units: 1321 J / 1.3558 J per ft·lbf = 974.2 ft·lbf/USD
    label, value = _shown({"sigma_y": 2, "G": -1, "price": -1, "rho": -1}, [stored], "us")
    assert label == "ft·lbf/USD"
    assert value[0] == pytest.approx(1320.9 / FT_LBF, rel=1e-3)


def test_the_gate_spring_leader_is_the_hand_worked_value():
    selection = run_spec(EXAMPLES / "gate-return-spring.toml")
    shown = index_shown(selection, "si")
    leader = selection.shortlist.iloc[0]
    assert leader[columns.ID] == "spring-steel-wire"
    assert shown.label == "kJ/USD"
    assert leader[columns.INDEX] * shown.factor == pytest.approx(1.321, rel=1e-3)  # worked above


def test_energy_per_carbon_and_per_embodied_energy():
    # σ_y²/(E·ρ) of a spring steel: (1500 MPa)²/(210 GPa · 7850 kg/m³) = 1364.8 J/kg; at 2 kg CO2e/kg
    # that is 682.4 J per kg CO2e = 0.682 kJ/kg CO2e; at 30 MJ/kg it is 45.5 J per MJ embodied
    per_kg = 1500.0**2 / (210.0 * 7850.0)
    label, value = _shown({"sigma_y": 2, "E": -1, "rho": -1, "co2": -1}, [per_kg / 2])
    assert (label, round(float(value[0]), 3)) == ("kJ/kg CO2e", 0.682)
    label, value = _shown({"sigma_y": 2, "E": -1, "rho": -1, "energy": -1}, [per_kg / 30])
    assert (label, round(float(value[0]), 1)) == ("J/MJ", 45.5)


def test_toughness_reads_as_energy_per_area():
    # K_IC²/E is the toughness G_c: a steel at 50 MPa·m½ and 210 GPa, 2500e12/210e9 = 11.9 kJ/m²
    # (Ashby's toughness chart puts steels between about 10 and 100 kJ/m²; from memory)
    label, value = _shown({"K_IC": 2, "E": -1}, [2500 / 210])
    assert (label, round(float(value[0]), 1)) == ("kJ/m²", 11.9)


def test_us_energy_units_follow_the_band():
    # per mass: 1364.8 J/kg · 0.45359 kg/lb / 1.35582 J per ft·lbf = 456.6 ft·lbf/lb
    per_kg = 1500.0**2 / (210.0 * 7850.0)
    label, value = _shown({"sigma_y": 2, "E": -1, "rho": -1}, [per_kg], "us")
    assert label == "ft·lbf/lb"
    assert value[0] == pytest.approx(1364.8 * 0.45359237 / FT_LBF, rel=1e-3)
    # per volume: 10.71 MJ/m³ = 1554 in·lbf/in³ (psi) is past 1000, so 1.554 kip·in/in³
    label, value = _shown({"sigma_y": 2, "E": -1}, [1500.0**2 / 210.0], "us")
    assert label == "kip·in/in³"
    assert value[0] == pytest.approx(1500.0**2 / 210.0 * 1e3 / 6894.757e3, rel=1e-4)


# --- the band rule --------------------------------------------------------------------------


def test_the_preferred_prefix_is_kept_when_leader_and_median_fit():
    # 5000 and 800 J/kg: 5 and 0.8 kJ/kg
    label, value = _shown({"sigma_y": 2, "E": -1, "rho": -1}, [5.0, 0.8])
    assert label == "kJ/kg" and value == pytest.approx([5.0, 0.8])


def test_the_leaders_keep_the_band_when_the_median_cannot_share_it():
    # leader 8000 kJ/kg, median 40 kJ/kg: kJ puts the leader past 1000 and MJ the median at 0.04,
    # so the leader decides: 8.0 MJ/kg
    label, value = _shown({"sigma_y": 2, "E": -1, "rho": -1}, [8000.0, 40.0, 40.0])
    assert label == "MJ/kg" and value[0] == pytest.approx(8.0)
    # leader 800 kJ/kg, median 0.5 kJ/kg: kJ holds both (800 and 0.5)
    label, value = _shown({"sigma_y": 2, "E": -1, "rho": -1}, [800.0, 0.5, 0.5])
    assert label == "kJ/kg" and value[0] == pytest.approx(800.0)


def test_the_leaders_decide_where_no_prefix_holds_both():
    # the gate spring's spread: leader 1321 J/USD, median 96.7 J/USD; J puts the leader past 1000,
    # kJ the median just below 0.1: the leaders win (1.321 kJ/USD)
    label, value = _shown({"sigma_y": 2, "G": -1, "price": -1, "rho": -1}, [1.321, 0.0967, 0.0967])
    assert label == "kJ/USD"
    assert value[0] == pytest.approx(1.321)


# --- every bundled example ------------------------------------------------------------------

SPECS = sorted(p.name for p in EXAMPLES.glob("*.toml"))
NO_PREFIX_HOLDS_BOTH = {("gate-return-spring.toml", "si")}
"""Leader 1321 J/USD and median 96.7 J/USD: 1000 J apart in one prefix, so J or kJ leaves one out."""


@pytest.mark.parametrize("units", ["si", "us"])
@pytest.mark.parametrize("name", SPECS)
def test_every_example_reads_its_leader_and_median_in_the_band(name, units):
    selection = run_spec(EXAMPLES / name)
    values = selection.shortlist[columns.INDEX].to_numpy(dtype=float)  # a sandwich's: the solid parts'
    shown = index_shown(selection, units)
    leader, median = values[0] * shown.factor, np.median(values) * shown.factor
    assert LOW <= leader < HIGH, (shown.label, leader)
    if (name, units) in NO_PREFIX_HOLDS_BOTH:
        # one prefix step smaller (J for kJ) would put the leader past the band, so none fits both
        assert leader * 1000 >= HIGH and 0.09 <= median < LOW, (shown.label, leader, median)
    else:
        assert LOW <= median < HIGH, (shown.label, median)


def test_the_terminal_and_the_report_print_the_simplified_unit():
    spec = str(EXAMPLES / "gate-return-spring.toml")
    out = CliRunner().invoke(cli, ["rank", spec, "--wide"])
    assert out.exit_code == 0, out.output
    assert "kJ/USD" in out.stdout and "MPa^2" not in out.stdout
    header, rows = shortlist_rows(run_spec(spec), "si")
    assert header["index"] == "kJ/USD" and rows[0]["index"] == "1.32"
    out = CliRunner().invoke(cli, ["rank", spec, "--wide", "--units", "us"])
    assert "ft·lbf/USD" in out.stdout


def test_thermal_properties_carry_their_us_factor():
    # NIST SP 811 appendix B.8 (International Table Btu): 1 Btu/(h·ft·°F) = 1.730735 W/(m·K),
    # 1 Btu/(lb·°F) = 4186.8 J/(kg·K); a kelvin is 1.8 degrees Fahrenheit (exact).
    assert du.property_unit("lambda", "us").factor == pytest.approx(1 / 1.730735, rel=1e-6)
    assert du.property_unit("c_p", "us").factor == pytest.approx(1 / 4186.8, rel=1e-6)
    assert du.property_unit("alpha", "us").factor == pytest.approx(1 / 1.8)
    # an offset unit has no one factor: its values are converted one by one
    assert np.isnan(du.property_unit("T_max", "us").factor)
    # so a thermal index reads in US units, here λ/α: (1/1.730735)/(1/1.8) = 1.04002 per SI unit
    assert du.index_unit({"lambda": 1.0, "alpha": -1.0}, "us").factor == pytest.approx(1.8 / 1.730735)


def test_an_energy_index_per_embodied_energy_reads_per_kbtu_in_us_units():
    # the embodied-energy column reads in kBtu under --units us, so the index does too:
    # 1 kBtu = 1.05505585262 MJ (International Table Btu, NIST SP 811)
    exponents = {"sigma_y": 2.0, "G": -1.0, "energy": -1.0, "rho": -1.0}
    si, us = du.index_unit(exponents, "si", [1e6]), du.index_unit(exponents, "us", [1e6])
    assert si.label.endswith("/MJ") and us.label.endswith("/kBtu")
    joules = {"J": 1.0, "kJ": 1e3, "MJ": 1e6, "GJ": 1e9, "in·lbf": FT_LBF / 12, "ft·lbf": FT_LBF}
    joules |= {"kip·in": 1e3 * FT_LBF / 12, "kip·ft": 1e3 * FT_LBF}
    per_mj = si.factor * joules[si.label.split("/")[0]]  # J per MJ for one stored unit
    per_kbtu = us.factor * joules[us.label.split("/")[0]]  # J per kBtu for one stored unit
    assert per_kbtu == pytest.approx(per_mj * 1.05505585262, rel=1e-9)

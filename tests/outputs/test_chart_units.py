"""Charts take their units from display_units: axes, hover ranges, index lines and their values."""

from __future__ import annotations

import math
import tomllib

import pytest

from selector.errors import InputError
from selector.inputs.materials import load_materials
from selector.inputs.spec import EXAMPLES, spec_from_dict
from selector.inputs.units import format_number
from selector.outputs.charts import chart_for_selection, property_chart
from selector.outputs.display_units import property_unit
from selector.outputs.tables import index_shown
from selector.pipeline.selection import select
from tests.conftest import make_table

# NIST Special Publication 811 (2008), Appendix B.8: kg/m³ per lb/in³, Pa per psi.
LB_PER_IN3 = 2.767_990e4
PSI = 6.894_757e3
# 1 ksi·in^(1/2) = 1.098843 MPa·m^(1/2): 6.894757 MPa × √0.0254 m (NIST SP 811 B.8, worked by hand).
KSI_SQRT_IN = 6.894_757 * math.sqrt(0.0254)


def role(fig, name: str) -> list:
    return [t for t in fig.data if t.meta and t.meta.get("role") == name]


def main_line(fig):
    return next(t for t in role(fig, "index-line") if t.meta["main"])


def index_labels(fig) -> list[str]:
    return [a.text for a in fig.layout.annotations if (a.name or "").startswith("index-label")]


@pytest.fixture(scope="module")
def boom():
    data = tomllib.loads((EXAMPLES / "camera-dolly-boom.toml").read_text(encoding="utf-8"))
    return select(spec_from_dict(data), load_materials())


def demo_classes():
    """Invented classes (demo data): one stiff alloy, one rubber-like class."""
    return make_table(
        [
            {"id": "alloy", "family": "metal", "E": (68, 72), "rho": (2600, 2800), "K_IC": (20, 30)},
            {"id": "soft", "family": "elastomer", "E": (0.0015, 0.0025), "rho": (920, 930)},
        ]
    )


# ----------------------------------------------------------------------------- property axes


@pytest.mark.parametrize("units", ["si", "us"])
@pytest.mark.parametrize("symbol", ["rho", "E", "sigma_y", "K_IC", "T_max"])
def test_a_property_axis_is_titled_in_its_display_unit(symbol, units):
    fig = property_chart(demo_classes(), "rho" if symbol != "rho" else "E", symbol, units=units)
    assert f"({property_unit(symbol, units).label})" in fig.layout.yaxis.title.text


def test_us_property_axes_scale_by_the_published_factors():
    fig = property_chart(demo_classes(), "rho", "K_IC", units="us")
    markers = {
        cid: (x, y) for t in role(fig, "markers") for cid, x, y in zip(t.meta["ids"], t.x, t.y, strict=True)
    }
    x, y = markers["alloy"]
    assert x == pytest.approx(math.sqrt(2600 * 2800) / LB_PER_IN3, rel=1e-6)
    assert y == pytest.approx(math.sqrt(20 * 30) / KSI_SQRT_IN, rel=1e-6)


def test_a_rubber_modulus_hovers_in_mpa_on_a_gpa_axis():
    fig = property_chart(demo_classes(), "rho", "E")
    hover = {cid: text for t in role(fig, "markers") for cid, text in zip(t.meta["ids"], t.text, strict=True)}
    # the class's own range, 0.0015–0.0025 GPa, read in MPa (1 GPa = 1000 MPa)
    assert "1.5–2.5 MPa" in hover["soft"]
    assert "68–72 GPa" in hover["alloy"]


# ----------------------------------------------------------------------------- index lines


@pytest.mark.parametrize("units", ["si", "us"])
def test_the_line_through_the_leader_reads_the_tables_index(boom, units):
    fig = chart_for_selection(boom, units=units)
    shown = index_shown(boom, units)
    leader = boom.shortlist.iloc[0]
    table_value = leader["index"] * shown.factor
    main = main_line(fig)
    assert main.meta["value"] == pytest.approx(table_value, rel=1e-12)
    label = next(t for t in index_labels(fig) if "through" in t)
    assert f"= {format_number(table_value)}," in label
    assert leader["name"][:20] in label
    # the unit printed beside the index is the table's (GPa^(1/2)/(Mg/m³) or Msi^(1/2)/(lb/in³))
    plain = shown.label.replace("^(1/2)", "<sup>1/2</sup>")
    assert f"(in {plain})" in fig.layout.title.subtitle.text


def test_the_leaders_index_by_hand_in_si(boom):
    # E^(1/2)/ρ at the leader's typical values, ρ in Mg/m³ (1 Mg/m³ = 1000 kg/m³, SI prefixes);
    # the geometric mean is the typical value of a log-scale range (common practice, no source)
    leader = boom.shortlist.iloc[0]
    e = math.sqrt(leader["E_low"] * leader["E_high"])
    rho = math.sqrt(leader["rho_low"] * leader["rho_high"]) / 1000
    assert main_line(chart_for_selection(boom)).meta["value"] == pytest.approx(math.sqrt(e) / rho)


def test_parallels_step_from_the_tables_value(boom):
    fig = chart_for_selection(boom)
    value = main_line(fig).meta["value"]
    for trace in role(fig, "index-line"):
        k = math.log10(trace.meta["value"] / value)
        assert k == pytest.approx(round(k), abs=1e-9)


def test_the_index_line_keeps_its_place_whatever_its_unit(boom):
    si = main_line(chart_for_selection(boom, units="si"))
    us = main_line(chart_for_selection(boom, units="us"))
    # every point of the US line, taken back to kg/m³ and GPa, lies on the SI line
    gpa_to_msi = 1e9 / (PSI * 1e6)
    for xu, yu in zip(us.x, us.y, strict=True):
        rho, e = xu * LB_PER_IN3 / 1000, yu / gpa_to_msi
        assert math.sqrt(e) / rho == pytest.approx(si.meta["value"], rel=1e-6)
    assert si.meta["slope"] == us.meta["slope"] == pytest.approx(2.0)


ENERGY_SPEC = """
title = "Energy store (invented)"
index = "sigma_y^2/(E*rho)"
[part]
function = "tie"
[screen]
families = ["metal", "polymer", "elastomer"]
"""


def test_an_energy_index_line_reads_in_the_tables_energy_unit():
    selection = select(spec_from_dict(tomllib.loads(ENERGY_SPEC)), load_materials())
    fig = chart_for_selection(selection)
    shown = index_shown(selection, "si")
    assert shown.label in ("J/kg", "kJ/kg", "MJ/kg")
    leader = selection.shortlist.iloc[0]
    assert main_line(fig).meta["value"] == pytest.approx(leader["index"] * shown.factor, rel=1e-12)
    # by hand: σ_y²/(E·ρ) in J/kg from MPa, GPa and kg/m³, then the unit's prefix
    s = math.sqrt(leader["sigma_y_low"] * leader["sigma_y_high"]) * 1e6
    e = math.sqrt(leader["E_low"] * leader["E_high"]) * 1e9
    rho = math.sqrt(leader["rho_low"] * leader["rho_high"])
    prefix = {"J/kg": 1.0, "kJ/kg": 1e3, "MJ/kg": 1e6}[shown.label]
    assert main_line(fig).meta["value"] == pytest.approx(s**2 / (e * rho) / prefix)
    assert shown.label.split("/")[0] in fig.layout.title.subtitle.text


def test_an_index_line_over_a_temperature_in_fahrenheit_is_a_clear_error():
    with pytest.raises(InputError, match="offset unit"):
        property_chart(demo_classes(), "T_max*rho", "E", units="us", index="E/(T_max*rho)")

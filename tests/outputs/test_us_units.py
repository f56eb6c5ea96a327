"""With ``--units us`` no number on screen is in an SI unit, except units read the world over.

Conversions are checked against exact definitions (NIST SP 811, appendix B: 1 in = 25.4 mm,
1 lb = 0.45359237 kg, 1 lbf = 4.4482216152605 N; the International Table Btu is
1055.05585262 J) and the Celsius–Fahrenheit relation.
"""

from __future__ import annotations

import json
import re
import tomllib
from pathlib import Path

import pytest
from click.testing import CliRunner

from selector.cli import cli
from selector.outputs.display_units import text_in_units
from selector.outputs.tables import TYPED_IN_STORED_UNITS

EXAMPLES = Path(__file__).parents[2] / "examples"

SI_UNIT = re.compile(
    r"(?<![\w/·])(?:MPa|GPa|kPa|Pa|kg/m³|Mg/m³|mm|cm|m|m²|m³|N|kN|N·m|J|kJ|MJ|GJ|°C|degC|K|"
    r"W/\(m·K\)|J/\(kg·K\)|µstrain/K|m½|kg)(?![\w²³½])"
)
"""SI unit tokens, as whole words."""

ALLOWED = [
    # embodied carbon stays in kg CO2e, the unit of every carbon inventory and declaration;
    # its intensity kg CO2e/kg is a ratio, the same number per lb
    re.compile(r"kg CO2e(?:/kg)?"),
    # J is also the torsion constant's symbol in formulas and section tables
    re.compile(r"\bJ(?= = | \(|:|\))|(?<=·)J\b|(?<=constant )J\b"),
    # a typed index that is no single power product has no one unit: the header says so
    re.compile(re.escape(TYPED_IN_STORED_UNITS)),
    # a standard quoted in the data keeps its SI figure when the US one follows in brackets
    re.compile(r"-?\d[\d.]*(?:(?:–| to | and )-?\d[\d.]*)? \S+ \[[^\]]+\]"),
]


def _si_left(text: str) -> list[str]:
    """Lines of ``text`` that still hold an SI unit once the allowed uses are taken out.

    A narrow table heads embodied carbon ``CO2e`` with ``kg`` on the unit line below it:
    that ``kg`` is kg CO2e too.
    """
    found = []
    lines = text.splitlines()
    for above, line in zip(["", *lines], lines, strict=False):
        carbon = [
            m.start() for m in re.finditer(r"\bkg\b", line) if above[m.start() : m.start() + 4] == "CO2e"
        ]
        rest = "".join("  " if any(at <= i < at + 2 for at in carbon) else ch for i, ch in enumerate(line))
        for allowed in ALLOWED:
            rest = allowed.sub(" ", rest)
        if SI_UNIT.search(rest):
            found.append(line)
    return found


def _us_runs() -> list[tuple[str, ...]]:
    runs: list[tuple[str, ...]] = []
    for spec in sorted(EXAMPLES.glob("*.toml")):
        data = tomllib.loads(spec.read_text(encoding="utf-8"))
        other = "mass" if data["objective"]["minimize"] == "cost" else "cost"
        base = ("rank", str(spec), "--units", "us", "--wide")
        runs += [(*base, "--all"), (*base, "--tradeoff", other, "--exchange", "40 USD/kg")]
        runs.append(("rank", str(spec), "--units", "us", "--top", "5"))  # fitted to 80 columns
        if data.get("section", {}).get("shape") != "sandwich":
            runs.append((*base, "--robust", "200", "--top", "5"))
        runs.append((*base, "--format", "json"))
    boom = str(EXAMPLES / "camera-dolly-boom.toml")
    runs += [
        ("rank", boom, "--units", "us", "--wide", "--index", "E^0.5/rho"),
        ("rank", boom, "--units", "us", "--wide", "--index", "E/rho + sigma_y/rho"),
        ("rank", boom, "--units", "us", "--conservative", "--top", "5"),
        ("materials", "list", "--units", "us", "--wide"),
        ("section", "i-section", "b=100mm", "h=200mm", "tf=10mm", "tw=6mm", "--units", "us"),
        ("section", "tube", "d=40mm", "t=2mm", "--units", "us"),
    ]
    return runs


US_RUNS = _us_runs()


def _out(args: tuple[str, ...]) -> str:
    result = CliRunner().invoke(cli, list(args))
    assert result.exit_code == 0, result.output
    return result.stdout


@pytest.mark.parametrize("args", US_RUNS, ids=[" ".join([Path(r[1]).stem, *r[4:]]) for r in US_RUNS])
def test_no_si_unit_is_left_on_screen(args):
    assert not _si_left(_out(args))


def test_the_scan_finds_the_si_units_of_the_same_runs_in_si():
    si = tuple("si" if a == "us" else a for a in US_RUNS[0])
    left = _si_left(_out(si))
    assert any("MPa·m½" in line for line in left) and any("mm" in line for line in left)


def test_no_class_shows_an_si_unit_in_us_units():
    from selector.inputs.materials import load_materials

    for class_id in load_materials([], builtin=True)["id"]:
        text = _out(("materials", "show", class_id, "--units", "us", "--wide"))
        assert not _si_left(text), class_id


def test_a_part_ranked_by_embodied_energy_shows_it_in_kbtu(tmp_path):
    spec = tmp_path / "boom-energy.toml"
    text = (EXAMPLES / "camera-dolly-boom.toml").read_text(encoding="utf-8")
    spec.write_text(re.sub(r'minimize = "\w+"', 'minimize = "energy"', text), encoding="utf-8")
    us = _out(("rank", str(spec), "--wide", "--top", "3", "--units", "us"))
    assert not _si_left(us) and "kBtu" in us
    si_rows = json.loads(_out(("rank", str(spec), "--top", "1", "--format", "json")))
    us_rows = json.loads(_out(("rank", str(spec), "--top", "1", "--format", "json", "--units", "us")))
    assert (si_rows[0]["energy"]["unit"], us_rows[0]["energy"]["unit"]) == ("MJ", "kBtu")
    # 1 MJ = 1e6 J / 1055.05585262 J/Btu = 0.947817 kBtu (International Table Btu)
    assert us_rows[0]["energy"]["value"] == pytest.approx(si_rows[0]["energy"]["value"] * 0.947817, rel=1e-6)
    trade = _out(("rank", str(spec), "--tradeoff", "cost", "--exchange", "0.05 USD/MJ", "--units", "us"))
    # 0.05 USD/MJ × 1.05505585 MJ/kBtu = 0.0528 USD/kBtu
    assert "α = 0.0528 USD/kBtu" in trade and not _si_left(trade)


@pytest.mark.parametrize(
    ("text", "expected"),
    [
        # 6 MPa·m½ / 1.098843 (1 ksi·in½ = 6.894757 MPa × 0.0254^½ m½) = 5.46 ksi·in½
        (
            "only part of K_IC 6–20 MPa·m½ reaches 15 MPa·m½",
            "only part of K_IC 5.46–18.2 ksi·in½ reaches 13.7 ksi·in½",
        ),
        # 0.5 mm / 25.4 mm/in = 0.0197 in
        ("faces at the minimum thickness 0.5 mm", "faces at the minimum thickness 0.0197 in"),
        # °F = °C × 9/5 + 32
        (
            "only part of T_min -20–0 °C meets T_min <= -10 °C",
            "only part of T_min -4–32 °F meets T_min <= 14 °F",
        ),
        # 2 kN / 4.4482216 N/lbf = 450 lbf; 1.2 m / 0.3048 m/ft = 3.94 ft
        ("length = 1.2 m, load 2 kN", "length = 3.94 ft, load 450 lbf"),
        # 40 USD/kg × 0.45359237 kg/lb = 18.1 USD/lb
        (
            "only part of price 40–120 USD/kg meets price <= 100 USD/kg",
            "only part of price 18.1–54.4 USD/lb meets price <= 45.4 USD/lb",
        ),
    ],
)
def test_quantities_in_messages_are_converted(text, expected):
    assert text_in_units(text, "us") == expected
    assert text_in_units(text, "si") == text


def test_a_quoted_standard_keeps_its_figure_with_the_us_one_beside_it():
    note = "minimum yield for t up to 16 mm; impact grades J0 and J2 (27 J at 0 and -20 degC)"
    # 16 mm = 0.630 in; 27 J / 1.3558179 J per ft·lbf (0.3048 m × 4.4482216 N) = 19.9 ft·lbf
    assert text_in_units(note, "us", quoted=True) == (
        "minimum yield for t up to 16 mm [0.63 in]; impact grades J0 and J2 "
        "(27 J [19.9 ft·lbf] at 0 and -20 degC [32 and -4 °F])"
    )
    assert (
        text_in_units("round wire 1 to 10 mm", "us", quoted=True)
        == "round wire 1 to 10 mm [0.0394 to 0.394 in]"
    )


def test_a_typed_power_product_is_shown_in_its_us_unit():
    text = _out(("rank", str(EXAMPLES / "camera-dolly-boom.toml"), "--units", "us", "--index", "E^0.5/rho"))
    assert "M = E^0.5/rho in Msi^(1/2)/(lb/in³)" in text


def test_embodied_carbon_stays_in_kg_co2e_while_mass_reads_in_pounds():
    boom = str(EXAMPLES / "camera-dolly-boom.toml")
    si = json.loads(_out(("rank", boom, "--top", "1", "--format", "json")))[0]
    us = json.loads(_out(("rank", boom, "--top", "1", "--format", "json", "--units", "us")))[0]
    assert us["co2"] == si["co2"] and us["co2"]["unit"] == "kg CO2e"
    # 1 lb = 0.45359237 kg exactly (NIST SP 811)
    assert us["mass"]["unit"] == "lb"
    assert us["mass"]["value"] == pytest.approx(si["mass"]["value"] / 0.45359237, rel=1e-12)


NUMBER_IN_SI = re.compile(r"\d(?:–-?\d[\d.e+-]*)? " + SI_UNIT.pattern)
"""A number followed by an SI unit (formulas name their symbols, m for mass, without numbers)."""


@pytest.mark.parametrize(
    "name", ["camera-dolly-boom", "walkway-hatch", "sensor-pressure-housing", "gate-return-spring"]
)
def test_the_report_in_us_units_shows_no_number_in_si(name, tmp_path):
    import html

    from selector.api import report_from_spec

    out = report_from_spec(EXAMPLES / f"{name}.toml", tmp_path / "r.html", units="us", robust_draws=40)
    page = out.read_text(encoding="utf-8")
    page = re.sub(r"<(script|style)\b.*?</\1>", "\n", page, flags=re.S)
    # the spec and its screens are shown as written, in the units the engineer typed
    page = re.sub(r'<pre class="spec">.*?</pre>|<code>.*?</code>', "\n", page, flags=re.S)
    lines = html.unescape(re.sub(r"<[^>]+>", "\n", page)).splitlines()
    left = []
    for line in lines:
        rest = line
        for allowed in ALLOWED:
            rest = allowed.sub(" ", rest)
        if NUMBER_IN_SI.search(rest):
            left.append(line.strip())
    assert left == []


@pytest.mark.parametrize(
    ("text", "shown"),
    [
        # °F = °C × 9/5 + 32: 55 °C = 131 °F, 60 °C = 140 °F; a hyphen between two numbers is a range
        ("(~55-60 degC)", "(~131-140 °F)"),
        ("service -40-80 degC", "service -40-176 °F"),
        ("K_IC 6–20 MPa·m½", "K_IC 5.46–18.2 ksi·in½"),  # 1 ksi·in½ = 1.0988 MPa·m½
    ],
)
def test_a_range_is_converted_at_both_ends(text, shown):
    assert text_in_units(text, "us") == shown

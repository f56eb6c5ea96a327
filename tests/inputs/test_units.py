"""Quantity parsing and conversion."""

from __future__ import annotations

import pytest
from hypothesis import given
from hypothesis import strategies as st

from selector.errors import UnitError
from selector.inputs import units


@pytest.mark.parametrize("unit", sorted(units._FAST))
def test_fast_units_agree_with_pint(unit):
    # pint's own definitions are the reference (pint, a general-purpose units library from PyPI).
    base = {
        "length": "m",
        "force": "N",
        "pressure": "Pa",
        "temperature": "K",
        "torque": "J",
        "angle": "radian",
        "price": "USD/kg",
        "density": "kg/m^3",
        "toughness": "Pa*m^0.5",
        "percent": "percent",
    }
    dimension = units._FAST[unit][0]
    text = f"37.5 {unit}"
    fast = units._fast_magnitude(text, base[dimension])
    slow = units._to(units.quantity(text, "t"), base[dimension], "t", text)
    assert fast == pytest.approx(slow, rel=1e-12)


@pytest.mark.parametrize(
    ("text", "unit", "expected"),
    [
        ("2 kN", "N", 2000.0),
        ("450 lbf", "N", 2001.6997),  # NIST SP 811: 1 lbf = 4.448222 N
        ("1.5 in", "mm", 38.1),  # exact by definition of the inch
        ("10 Msi", "GPa", 68.9476),  # 1 psi = 6894.757 Pa (NIST SP 811)
        ("80 degF", "degC", 26.6667),
        ("3 USD/lb", "USD/kg", 6.61387),  # 1 lb = 0.45359237 kg exactly
        ("0.1 lb/in^3", "kg/m^3", 2767.99),
        ("1 ksi*in^0.5", "MPa*m^0.5", 1.098843),  # common practice, no source
        ("1 BTU/(hour*foot*degF)", "W/(m*K)", 1.730735),  # NIST SP 811 (IT Btu)
        ("60 N*m", "N*m", 60.0),
        ("1.5 deg", "radian", 0.0261799),
    ],
)
def test_conversions(text, unit, expected):
    assert units.magnitude_in(text, unit) == pytest.approx(expected, rel=1e-5)


def test_scaled_units_convert():
    assert units.convert([1.0], "1e-6/degF", "1e-6/K")[0] == pytest.approx(1.8)
    assert units.convert(10.0, "Msi", "GPa") == pytest.approx(68.9476, rel=1e-5)


@pytest.mark.parametrize(
    ("text", "unit", "message"),
    [
        ("2 kN", "m", "v: got '2 kN', a force (N, kN, lbf …); expected a length (mm, in, ft …)"),
        ("2", "m", "v: '2' has no unit; a value with its unit"),
        ("2 furlongz", "m", "v: unknown unit 'furlongz'"),
        ("abc", "m", "v: cannot read 'abc'; a number followed by a unit"),
    ],
)
def test_bad_quantities(text, unit, message):
    with pytest.raises(UnitError) as err:
        units.magnitude_in(text, unit, "v")
    assert str(err.value).startswith(message)


@given(st.text(max_size=30))
def test_any_text_gives_a_value_or_a_unit_error(text):
    try:
        value = units.magnitude_in(text, "m", "fuzz")
    except UnitError:
        return
    assert isinstance(value, float)


@pytest.mark.parametrize(
    ("text", "unit", "got", "expected"),
    [
        # the dimension words are ours; each pair is a mix-up a user could make (common practice, no source)
        ("2 kN", "mm", "a force (N, kN, lbf …)", "a length (mm, in, ft …)"),
        ("4 kg", "m", "a mass (kg, lb …)", "a length (mm, in, ft …)"),
        ("60 ksi", "degC", "a pressure or stress (MPa, GPa, psi, ksi …)", "a temperature (degC, degF, K …)"),
        ("3 N*m", "N", "a torque or energy (N*m, lbf*ft, J …)", "a force (N, kN, lbf …)"),
        ("20 MPa*m^0.5", "MPa", "a fracture toughness (MPa*m^0.5, ksi*in^0.5 …)", "a pressure or stress"),
        ("3 kg*m/s", "N", "a quantity in kg·m/s", "a force (N, kN, lbf …)"),
    ],
)
def test_wrong_dimensions_are_named_in_plain_words(text, unit, got, expected):
    with pytest.raises(UnitError) as err:
        units.magnitude_in(text, unit, "v")
    message = str(err.value)
    assert message.startswith(f"v: got {text!r}, {got}; expected {expected}")
    assert "[" not in message and "**" not in message  # no pint dimension strings


def test_a_conversion_between_dimensions_names_both():
    with pytest.raises(UnitError) as err:
        units.convert(1.0, "lbf", "mm", "column d")
    assert str(err.value) == (
        "column d: unit 'lbf' measures a force (N, kN, lbf …); expected a length (mm, in, ft …)"
    )

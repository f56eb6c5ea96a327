"""Tests for loading, checking and merging materials tables (selector.inputs.materials)."""

from __future__ import annotations

import csv
import io
import math
import os
import subprocess
import sys
from pathlib import Path

import numpy as np
import pandas as pd
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

import materials_db
from selector.errors import DataFileError, InputError, Problem
from selector.inputs.materials import (
    check_materials_file,
    load_materials,
    read_materials_file,
    validate_table,
)
from selector.inputs.properties import FAMILIES, PROPERTIES, RATING_LEVELS, RATINGS, data_columns

DATA = Path(__file__).parents[1] / "data"
ROOT = Path(__file__).resolve().parents[2]
TINY = DATA / "builtin_tiny.csv"
COLUMNS = [*data_columns(), "origin"]

# Exact conversion factors from the defining values: 1 lb = 0.45359237 kg and 1 in = 0.0254 m
# (international yard and pound agreement, 1959), standard gravity 9.80665 m/s^2 (3rd CGPM, 1901).
# NIST Special Publication 811 (2008), Appendix B.9, rounds them to 6.894757 E+03 Pa per psi and
# 2.767990 E+04 kg/m^3 per lb/in^3 (from memory); both are checked below.
LB = 0.45359237  # kg per lb
INCH = 0.0254  # m per in
PSI = LB * 9.80665 / INCH**2  # Pa per lbf/in^2
LB_PER_IN3 = LB / INCH**3  # kg/m^3 per lb/in^3
KSI_SQRT_IN = 1e3 * PSI * INCH**0.5 / 1e6  # MPa*m^0.5 per ksi*in^0.5; 1.0988 in ASTM E399 (from memory)


@pytest.fixture
def tiny_builtin(monkeypatch: pytest.MonkeyPatch, tmp_path: Path) -> Path:
    """The three-class fixture table standing in for the built-in one (a fresh path per test)."""
    path = tmp_path / "classes.csv"
    path.write_bytes(TINY.read_bytes())
    monkeypatch.setattr(materials_db, "CLASSES_CSV", path)
    return path


def write_csv(path: Path, header: list[str], *rows: list[str]) -> Path:
    buffer = io.StringIO()
    csv.writer(buffer, lineterminator="\n").writerows([header, *rows])
    path.write_text(buffer.getvalue(), encoding="utf-8")
    return path


# A clean one-class user file in stored units; each test below changes one thing. The values are
# approximate cast-aluminium ranges from memory of common handbook data, used only as parser input.
BASE = {
    "id": "al-cast",
    "name": "Aluminium alloy, cast (fixture)",
    "family": "metal",
    "rho [kg/m^3]": "2700",
    "E_low [GPa]": "70",
    "E_high [GPa]": "75",
    "sigma_y_low [MPa]": "50",
    "sigma_y_high [MPa]": "330",
    "sigma_ts [MPa]": "350",
    "T_min [degC]": "-273",
    "T_max [degC]": "130",
    "alpha [1e-6/K]": "21",
    "nu": "0.33",
    "elongation": "4",
    "salt_water": "fair",
}


def one_class(
    tmp_path: Path, change: dict[str, str | None] | None = None, rename: dict[str, str] | None = None
) -> Path:
    """BASE with cells changed (None drops the column) and headers renamed, written as CSV."""
    cells = dict(BASE)
    for key, value in (change or {}).items():
        if value is None:
            cells.pop(key)
        else:
            cells[key] = value
    header = [(rename or {}).get(h, h) for h in cells]
    return write_csv(tmp_path / "one.csv", header, list(cells.values()))


def messages(path: Path) -> list[str]:
    return [str(p) for p in check_materials_file(path)]


# ---------------------------------------------------------------------------- the built-in table


def test_real_builtin_table_loads() -> None:
    """The shipped classes.csv exists, passes every check and has the promised shape."""
    assert Path(materials_db.CLASSES_CSV).is_file(), f"missing built-in table {materials_db.CLASSES_CSV}"
    table = load_materials()
    assert list(table.columns) == COLUMNS
    assert len(table) > 0
    assert table["id"].is_unique
    assert set(table["origin"]) == {"built-in"}
    assert set(table["family"]) <= set(FAMILIES)
    for prop in PROPERTIES.values():
        assert table[prop.low].dtype == np.float64
        if prop.core:
            assert table[prop.low].notna().all() and table[prop.high].notna().all(), prop.symbol
    for rating in RATINGS:
        assert set(table[rating]) <= {*RATING_LEVELS, ""}
    assert validate_table(table, "built-in") == []


def _no_pint(csv_path: Path | None) -> subprocess.CompletedProcess[str]:
    code = "import sys; "
    if csv_path is not None:
        code += "import materials_db; from pathlib import Path; "
        code += f"materials_db.CLASSES_CSV = Path({str(csv_path)!r}); "
    code += (
        "from selector.inputs.materials import load_materials; t = load_materials(); "
        "assert 'pint' not in sys.modules, 'pint was imported'; print(len(t))"
    )
    env = {
        **os.environ,
        "PYTHONPATH": os.pathsep.join(filter(None, [str(ROOT), os.environ.get("PYTHONPATH")])),
    }
    return subprocess.run(
        [sys.executable, "-c", code], cwd=ROOT, env=env, capture_output=True, text=True, timeout=60
    )


def test_loading_real_builtin_does_not_import_pint() -> None:
    done = _no_pint(None)
    assert done.returncode == 0, done.stderr
    assert int(done.stdout) > 0


def test_loading_tiny_builtin_does_not_import_pint() -> None:
    """The fixture has plain headers and one 'E_low [GPa]' (the stored unit): no conversion, no pint."""
    done = _no_pint(TINY)
    assert done.returncode == 0, done.stderr
    assert done.stdout.strip() == "3"


def test_tiny_builtin_values(tiny_builtin: Path) -> None:
    table = load_materials()
    assert list(table.columns) == COLUMNS
    assert list(table["id"]) == ["al-wrought", "pp", "glass-soda"]
    assert table.loc[1, "E_low"] == 0.9 and table.loc[1, "E_high"] == 1.6
    assert table.loc[0, "E_low"] == 68.0  # from the 'E_low [GPa]' header
    assert math.isnan(table.loc[2, "elongation_low"])  # written "n/a"
    assert table.loc[1, "uv"] == "poor"
    assert table.loc[1, "note"] == "homopolymer" and table.loc[0, "note"] == ""


def test_builtin_is_parsed_once_and_returned_as_copy(tiny_builtin: Path) -> None:
    first = load_materials()
    first.loc[0, "E_low"] = -1.0
    tiny_builtin.write_text("not a table any more", encoding="utf-8")
    second = load_materials()  # still the cached parse of the original file
    assert second.loc[0, "E_low"] == 68.0
    assert second is not first


def test_builtin_rules_are_stricter(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    """In the built-in table an empty property cell is an error and every column must be there."""
    rows = list(csv.reader(TINY.read_text(encoding="utf-8").splitlines()))
    col = rows[0].index("G_low")
    rows[2][col] = ""
    header = [h for h in rows[0] if h != "note"]
    keep = [rows[0].index(h) for h in header]
    path = write_csv(tmp_path / "classes.csv", header, *[[r[k] for k in keep] for r in rows[1:]])
    monkeypatch.setattr(materials_db, "CLASSES_CSV", path)
    with pytest.raises(DataFileError) as info:
        load_materials()
    assert [str(p) for p in info.value.problems] == [
        f"{path}: row 1: no 'note' column; expected every column of data_columns()",
        f"{path}: row 3, column G_low: empty cell; expected a number in GPa, or 'n/a' if it does not apply",
    ]


# ---------------------------------------------------------------------------- units in headers


def test_exact_factors_agree_with_nist_rounding() -> None:
    assert round(PSI, 3) == pytest.approx(6894.757)  # NIST SP 811 B.9 (from memory)
    assert round(LB_PER_IN3, 1) == pytest.approx(27679.9)  # NIST SP 811 B.9 (from memory)
    assert round(KSI_SQRT_IN, 4) == pytest.approx(1.0988)  # ASTM E399 unit note (from memory)


def test_us_unit_headers_are_converted() -> None:
    table = read_materials_file(DATA / "good_us.csv")
    row = table.iloc[0]
    assert row["rho_low"] == pytest.approx(0.283 * LB_PER_IN3, rel=1e-6)
    assert row["rho_high"] == pytest.approx(0.284 * LB_PER_IN3, rel=1e-6)
    assert row["E_low"] == row["E_high"] == pytest.approx(29e6 * PSI / 1e9, rel=1e-6)
    assert row["sigma_y_low"] == pytest.approx(36e3 * PSI / 1e6, rel=1e-6)
    assert row["sigma_ts_high"] == pytest.approx(58e3 * PSI / 1e6, rel=1e-6)
    # degC = (degF - 32) / 1.8, NIST SP 811 Appendix B.9 (from memory): -40 F = -40 C, 752 F = 400 C
    assert row["T_min_low"] == pytest.approx(-40.0, abs=1e-9)
    assert row["T_max_high"] == pytest.approx(400.0, abs=1e-9)
    # a temperature interval of 1 F is 5/9 K, so 6.5e-6/F = 11.7e-6/K (same source)
    assert row["alpha_low"] == pytest.approx(11.7, rel=1e-9)
    assert row["K_IC_low"] == pytest.approx(50 * KSI_SQRT_IN, rel=1e-5)
    assert row["price_low"] == pytest.approx(0.4 / LB, rel=1e-9)
    assert row["nu_low"] == 0.29 and row["elongation_high"] == 23.0  # no unit needed for ratios
    assert row["origin"] == "good_us.csv"
    assert math.isnan(row["G_low"]) and math.isnan(row["lambda_high"])  # not given: unknown


def test_stored_unit_headers_keep_values(tmp_path: Path) -> None:
    table = read_materials_file(one_class(tmp_path))
    assert table.loc[0, "E_low"] == 70.0 and table.loc[0, "rho_high"] == 2700.0
    assert table.loc[0, "T_min_low"] == -273.0 and table.loc[0, "alpha_high"] == 21.0


def test_other_metric_units(tmp_path: Path) -> None:
    path = one_class(
        tmp_path,
        rename={"rho [kg/m^3]": "rho [g/cm^3]", "E_low [GPa]": "E_low [MPa]"},
        change={"rho [kg/m^3]": "2.7", "E_low [GPa]": "70000"},
    )
    table = read_materials_file(path)
    assert table.loc[0, "rho_low"] == pytest.approx(2700.0)  # 1 g/cm^3 = 1000 kg/m^3 (SI definition)
    assert table.loc[0, "E_low"] == pytest.approx(70.0)


# ---------------------------------------------------------------------------- TOML


def test_toml_matches_csv() -> None:
    from_csv = read_materials_file(DATA / "good_us.csv").drop(columns="origin")
    from_toml = read_materials_file(DATA / "good_us.toml")
    assert from_toml.loc[0, "origin"] == "good_us.toml"
    pd.testing.assert_frame_equal(from_toml.drop(columns="origin"), from_csv, rtol=1e-12)


def test_toml_problems(tmp_path: Path) -> None:
    path = tmp_path / "bad.toml"
    path.write_text(
        "\n".join(
            [
                "[[class]]",
                'id = "x"',
                'family = "metl"',
                'rho = "n/a"',
                "E = 70",
                'E_low = "3 GPa"',
                'sigma_y = ["1 MPa", "2 MPa", "3 MPa"]',
                'sigma_ts = "300 kg/m^3"',
                'price = "3 EUR/kg"',
                'uv = "good"',
                'ratings = { uvv = "good", salt_water = "ok" }',
                "",
                "[[class]]",
                'family = "metal"',
                'rho = "2700 kg/m^3"',
                'E = ["75 GPa", "70 GPa"]',
            ]
        ),
        encoding="utf-8",
    )
    loc = f"{path}: class 1 (x), field"
    assert messages(path) == [
        f"{loc} family: unknown family 'metl'; did you mean 'metal'? (valid: {', '.join(FAMILIES)})",
        f"{loc} rho: 'n/a' given, but density applies to every class; "
        'expected a quantity with its unit, e.g. rho = "... kg/m^3"',
        f'{loc} E: 70 has no unit; expected a quantity with its unit, e.g. E = "... GPa"',
        f'{loc} E_low: unknown field \'E_low\'; expected E = ["low", "high"], e.g. E = ["... GPa", "..."]',
        f"{loc} sigma_y: ['1 MPa', '2 MPa', '3 MPa'] has 3 entries; "
        'expected one value or a pair, e.g. sigma_y = ["low", "high"]',
        f"{loc} sigma_ts: the unit of '300 kg/m^3' does not measure tensile strength; "
        'expected a quantity with its unit, e.g. sigma_ts = "... MPa"',
        f"{loc} price: unknown unit 'EUR/kg'; expected a quantity with its unit, e.g. price = \"... USD/kg\"",
        f"{loc} ratings.salt_water: unknown rating 'ok'; "
        f"expected one of: {', '.join(RATING_LEVELS)}, or empty if unknown",
        f"{loc} uv: unknown field 'uv'; expected it inside ratings = {{ uv = \"...\" }}",
        f"{loc} ratings.uvv: unknown rating 'uvv'; did you mean 'uv'? (valid: {', '.join(RATINGS)})",
        f"{path}: class 2, field id: id is missing; expected a short name unique in the file, "
        "e.g. 'steel-carbon'",
        f"{path}: class 2, field E: low end 75 GPa is above high end 70 GPa; expected E_low <= E_high",
    ]


def test_toml_missing_required_property(tmp_path: Path) -> None:
    path = tmp_path / "short.toml"
    path.write_text('[[class]]\nid = "x"\nfamily = "foam"\nrho = "30 kg/m^3"\n', encoding="utf-8")
    assert messages(path) == [
        f"{path}: class 1 (x), field E: no value; expected Young's modulus in GPa; it is "
        "required for every class"
    ]


def test_toml_structure_problems(tmp_path: Path) -> None:
    path = tmp_path / "odd.toml"
    path.write_text('title = "x"\nclass = 3\n', encoding="utf-8")
    assert messages(path) == [f"{path}: class: 'class' is not a list of tables; expected [[class]] tables"]
    path.write_text('title = "x"\n', encoding="utf-8")
    assert messages(path) == [
        f"{path}: no material classes in the file; expected one [[class]] table per class",
        f"{path}: title: unknown top-level key 'title'; expected only [[class]] tables",
    ]


# ---------------------------------------------------------------------------- many problems at once


CORRUPT = DATA / "corrupt_dozen.csv"


def test_every_corruption_in_one_file_is_reported() -> None:
    problems = check_materials_file(CORRUPT)
    where = [p.where.removeprefix(f"{CORRUPT}: ") for p in problems]
    assert where == [
        "row 1, column K_IC_low",
        "row 1, column price [EUR/lb]",
        "row 1, column lambda [GPa]",
        "row 1, column sigma_c_lo [MPa]",
        "row 3, column id",
        "row 4, column family",
        "row 5, column id",
        "row 6, column salt_water",
        "row 7, column E_low",
        "row 8, column rho_high",
        "row 9, column sigma_y_low",
        "row 10, column E_low",
        "row 11, column rho_low",
        "row 12, column sigma_ts",
        "row 13, column T_min",
        "row 14, column family",
        "row 15, column sigma_ts",
        "row 16, column E_high",
    ]
    text = [str(p) for p in problems]
    assert (
        f"{CORRUPT}: row 1, column K_IC_low: no unit in header 'K_IC_low'; expected e.g. "
        "'K_IC_low [MPa*m^0.5]'" in text
    )
    assert (
        f"{CORRUPT}: row 1, column lambda [GPa]: unit 'GPa' does not measure thermal conductivity; "
        "expected a unit of thermal conductivity, e.g. 'lambda [W/(m*K)]'"
    ) in text
    assert (
        f"{CORRUPT}: row 1, column sigma_c_lo [MPa]: unknown column 'sigma_c_lo'; did you mean 'sigma_c_low'?"
        in text
    )
    assert (
        f"{CORRUPT}: row 5, column id: id 'al-1' is used again (first in row 2); "
        "expected each id once in a file; a later file may reuse an id to replace a class"
    ) in text
    # 11 Msi > 10.5 Msi, shown in the stored unit (NIST SP 811 factor above)
    assert (
        f"{CORRUPT}: row 7, column E_low: low end {11e6 * PSI / 1e9:.6g} GPa is above high end "
        f"{10.5e6 * PSI / 1e9:.6g} GPa; expected E_low <= E_high"
    ) in text
    assert (
        f"{CORRUPT}: row 8, column rho_high: 'heavy' is not a number; "
        "expected a number in lb/in^3; density applies to every class"
    ) in text
    assert (
        f"{CORRUPT}: row 12, column sigma_ts: sigma_ts_high {30e3 * PSI / 1e6:.6g} MPa is below sigma_y_low "
        f"{50e3 * PSI / 1e6:.6g} MPa; expected the tensile strength at least the yield strength"
    ) in text
    assert (
        f"{CORRUPT}: row 13, column T_min: T_min_low 204.444 °C is above T_max_high 148.889 °C; "
        "expected the minimum service temperature below the maximum"
    ) in text  # 400 F and 300 F by (F - 32) / 1.8
    assert f"{CORRUPT}: row 16, column E_high: 'NaN' is not a number; expected a number in Msi; " in text[-1]


def test_read_raises_with_the_same_problems() -> None:
    with pytest.raises(DataFileError) as info:
        read_materials_file(CORRUPT)
    assert info.value.problems == check_materials_file(CORRUPT)
    assert str(info.value).endswith("(and 17 more problems)")


# ---------------------------------------------------------------------------- one corruption at a time

FAMILY_LIST = ", ".join(FAMILIES)
CASES = [
    (
        {"id": ""},
        {},
        "row 2, column id: id is missing; expected a short name unique in the file, e.g. 'steel-carbon'",
    ),
    ({"family": ""}, {}, f"row 2, column family: family is missing; expected one of: {FAMILY_LIST}"),
    (
        {"family": "ceramics"},
        {},
        f"row 2, column family: unknown family 'ceramics'; did you mean 'ceramic'? (valid: {FAMILY_LIST})",
    ),
    (
        {"salt_water": "great"},
        {},
        "row 2, column salt_water: unknown rating 'great'; expected one of: poor, fair, good, excellent, "
        "or empty if unknown",
    ),
    (
        {"E_low [GPa]": "80"},
        {},
        "row 2, column E_low: low end 80 GPa is above high end 75 GPa; expected E_low <= E_high",
    ),
    (
        {"E_low [GPa]": "seventy"},
        {},
        "row 2, column E_low: 'seventy' is not a number; expected a number in GPa; Young's "
        "modulus applies to every class",
    ),
    (
        {"alpha [1e-6/K]": "nan"},
        {},
        "row 2, column alpha: 'nan' is not how a missing value is written; write 'n/a' for a "
        "value that is unknown or does not apply",
    ),
    (
        {"E_low [GPa]": ""},
        {},
        "row 2, column E_low: empty cell; expected a number in GPa; Young's modulus applies to every class",
    ),
    (
        {"sigma_ts [MPa]": "n/a"},
        {},
        "row 2, column sigma_ts: 'n/a' given, but tensile strength applies to every class; "
        "expected a number in MPa",
    ),
    (
        {},
        {"E_low [GPa]": "E_low [Gpaa]"},
        "row 1, column E_low [Gpaa]: unknown unit 'Gpaa'; expected a unit of Young's modulus, "
        "e.g. 'E_low [GPa]'",
    ),
    (
        {},
        {"rho [kg/m^3]": "rho [MPa]"},
        "row 1, column rho [MPa]: unit 'MPa' does not measure density; expected a unit of "
        "density, e.g. 'rho [kg/m^3]'",
    ),
    (
        {},
        {"E_low [GPa]": "E_low"},
        "row 1, column E_low: no unit in header 'E_low'; expected e.g. 'E_low [GPa]'",
    ),
    ({"rho [kg/m^3]": "0"}, {}, "row 2, column rho: 0 kg/m³ is not positive; expected density above 0"),
    (
        {"E_low [GPa]": "-1"},
        {},
        "row 2, column E_low: -1 GPa is not positive; expected Young's modulus above 0",
    ),
    (
        {"rho [kg/m^3]": "30000"},
        {},
        "row 2, column rho: 30000 kg/m³ is above the plausible maximum 25000 kg/m³; "
        "expected density between 1 kg/m³ and 25000 kg/m³; check the value and its unit",
    ),
    (
        {"nu": "0.7"},
        {},
        "row 2, column nu: 0.7 is above the plausible maximum 0.5; "
        "expected Poisson's ratio between -1 and 0.5; check the value and its unit",
    ),
    (
        {"T_min [degC]": "-300"},
        {},
        "row 2, column T_min: -300 °C is below the plausible minimum -273.15 °C; "
        "expected minimum service temperature between -273.15 °C and 4000 °C; check the value and its unit",
    ),
    (
        {"sigma_ts [MPa]": "40"},
        {},
        "row 2, column sigma_ts: sigma_ts_high 40 MPa is below sigma_y_low 50 MPa; "
        "expected the tensile strength at least the yield strength",
    ),
    (
        {"T_min [degC]": "140"},
        {},
        "row 2, column T_min: T_min_low 140 °C is above T_max_high 130 °C; "
        "expected the minimum service temperature below the maximum",
    ),
    (
        {},
        {"nu": "Nu"},
        "row 1, column Nu: unknown column 'Nu'; did you mean 'nu'? (names are case-sensitive)",
    ),
    (
        {},
        {"nu": "poisson"},
        "row 1, column poisson: unknown column 'poisson'; "
        "expected one of id, name, short_name, family, directions, note, source, "
        "a rating (fresh_water, salt_water, uv, flammability) or a property ("
        + ", ".join(PROPERTIES)
        + ") as '<sym> [unit]', '<sym>_low [unit]' or '<sym>_high [unit]'",
    ),
    (
        {},
        {"E_low [GPa]": "E_low (GPa)"},
        "row 1, column E_low (GPa): unknown column 'E_low (GPa)'; expected the unit in square "
        "brackets, e.g. 'E_low [GPa]'",
    ),
    (
        {},
        {"family": "family [GPa]"},
        "row 1, column family [GPa]: column 'family' takes no unit, got 'GPa'; expected the header 'family'",
    ),
    (
        {},
        {"E_low [GPa]": "E [GPa]"},
        "row 1, column E_high [GPa]: header 'E_high [GPa]' repeats 'E [GPa]'; expected each column once",
    ),
    (
        {"E_high [GPa]": None},
        {},
        "row 1: E_low is given without E_high; expected both ends, or one column 'E [GPa]' giving both",
    ),
    (
        {"rho [kg/m^3]": None},
        {},
        "row 1: no column for density (rho); expected 'rho [kg/m^3]' or the pair 'rho_low "
        "[kg/m^3]', 'rho_high [kg/m^3]'",
    ),
    ({"id": None}, {}, "row 1: no 'id' column; expected a column 'id'"),
    (
        {"alpha [1e-6/K]": "1e999"},
        {},
        "row 2, column alpha: inf is not a finite number; expected a number in 1e-6/K",
    ),
]


@pytest.mark.parametrize(("change", "rename", "expected"), CASES)
def test_each_corruption_alone(tmp_path: Path, change: dict, rename: dict, expected: str) -> None:
    path = one_class(tmp_path, change, rename)
    assert messages(path) == [f"{path}: {expected}"]


@pytest.mark.parametrize(
    ("change", "column", "value"),
    [
        ({"alpha [1e-6/K]": ""}, "alpha_low", math.nan),  # unknown
        ({"alpha [1e-6/K]": "n/a"}, "alpha_high", math.nan),  # does not apply
        ({"salt_water": ""}, "salt_water", ""),  # rating unknown
        ({"name": ""}, "name", "al-cast"),  # name defaults to the id
        ({"sigma_ts [MPa]": None}, "sigma_ts_low", math.nan),  # a core column left out: unknown
        ({"T_max [degC]": "1e3"}, "T_max_high", 1000.0),
    ],
)
def test_allowed_gaps(tmp_path: Path, change: dict, column: str, value: object) -> None:
    path = one_class(tmp_path, change)
    assert check_materials_file(path) == []
    got = read_materials_file(path).loc[0, column]
    if isinstance(value, float) and math.isnan(value):
        assert math.isnan(got)
    else:
        assert got == value


def test_row_level_problems(tmp_path: Path) -> None:
    header = [*BASE, ""]
    good = [*BASE.values(), ""]
    path = write_csv(
        tmp_path / "rows.csv",
        header,
        good,
        [""] * 16,  # a blank row is ignored, but still counts in the numbering
        ["al-2", *good[1:4]],
        ["al-3", *good[1:-1], "stray"],
        good,
        ["al-4", *good[1:], "extra"],
    )
    assert messages(path) == [
        f"{path}: row 1, column 16: column 16 has cells but no header; expected a name such as 'E_low [GPa]'",
        f"{path}: row 4: row has 4 cells, the header has 16; expected one cell per column",
        f"{path}: row 6, column id: id 'al-cast' is used again (first in row 2); "
        "expected each id once in a file; a later file may reuse an id to replace a class",
        f"{path}: row 7: row has 17 cells, the header has 16; expected one cell per column",
    ]


@pytest.mark.parametrize(
    ("name", "content", "expected"),
    [
        (
            "gone.csv",
            None,
            "file not found; expected the path of a materials file (.csv, .toml, .xlsx or .parquet)",
        ),
        ("empty.csv", b"", "no header row; expected a first row naming the columns"),
        (
            "head.csv",
            b"id,family,rho [kg/m^3],E [GPa]\n",
            "no material classes in the file; expected a header row and one row per class",
        ),
        (
            "latin.csv",
            (DATA / "not_utf8.csv").read_bytes(),
            "not UTF-8 text (byte 0xe9 at offset 45); expected the file saved as UTF-8 text",
        ),
        (
            "semi.csv",
            b"id;family;rho [kg/m^3];E [GPa]\nal;metal;2700;70\n",
            "row 1: the cells are separated by semicolons; expected commas",
        ),
        ("quotes.csv", (DATA / "malformed.csv").read_bytes(), None),
        ("broken.toml", (DATA / "malformed.toml").read_bytes(), None),
    ],
)
def test_unreadable_files(tmp_path: Path, name: str, content: bytes | None, expected: str | None) -> None:
    path = tmp_path / name
    if content is not None:
        path.write_bytes(content)
    problems = check_materials_file(path)
    assert len(problems) == 1
    assert problems[0].where.startswith(str(path))
    if expected is not None:
        assert str(problems[0]) == f"{path}: {expected}"
    with pytest.raises(DataFileError):
        read_materials_file(path)


def test_malformed_messages() -> None:
    assert messages(DATA / "malformed.csv") == [
        f"{DATA / 'malformed.csv'}: line 2: malformed CSV: ',' expected after '\"'; "
        "expected comma-separated cells, quotes in pairs"
    ]
    [problem] = check_materials_file(DATA / "malformed.toml")
    assert problem.where == str(DATA / "malformed.toml")
    assert problem.what.startswith("malformed TOML: ") and "line 3" in problem.what


def test_utf8_bom_is_accepted(tmp_path: Path) -> None:
    path = one_class(tmp_path)
    path.write_bytes(b"\xef\xbb\xbf" + path.read_bytes())
    assert read_materials_file(path).loc[0, "id"] == "al-cast"


# ---------------------------------------------------------------------------- merging


def test_user_rows_replace_and_extend(tiny_builtin: Path, tmp_path: Path) -> None:
    first = write_csv(
        tmp_path / "mine.csv",
        ["id", "name", "family", "rho [kg/m^3]", "E [GPa]"],
        ["pp", "Polypropylene, talc filled", "polymer", "1050", "2.5"],
        ["pom", "Acetal (POM)", "polymer", "1410", "2.8"],
    )
    second = tmp_path / "more.toml"
    second.write_text(
        '[[class]]\nid = "pom"\nfamily = "polymer"\nrho = "1.42 g/cm^3"\nE = "3 GPa"\n', encoding="utf-8"
    )
    table = load_materials([first, second])
    assert list(table.columns) == COLUMNS
    assert list(table["id"]) == ["al-wrought", "pp", "glass-soda", "pom"]  # replaced in place, new at the end
    assert list(table["origin"]) == ["built-in", "mine.csv", "built-in", "more.toml"]
    assert table.loc[1, "E_low"] == 2.5 and table.loc[1, "name"] == "Polypropylene, talc filled"
    assert math.isnan(table.loc[1, "sigma_y_low"])  # the replacing row gives no yield strength: unknown
    assert table.loc[3, "E_high"] == 3.0 and table.loc[3, "rho_low"] == pytest.approx(1420.0)
    assert table.loc[3, "name"] == "pom"  # name defaults to the id

    alone = load_materials([first], builtin=False)
    assert list(alone["id"]) == ["pp", "pom"] and set(alone["origin"]) == {"mine.csv"}
    assert load_materials(str(first), builtin=False).equals(alone)  # one path alone is accepted too


def test_load_reports_problems_of_every_file(tiny_builtin: Path, tmp_path: Path) -> None:
    bad = one_class(tmp_path, {"family": "rock"})
    other = tmp_path / "other.toml"
    other.write_text(
        '[[class]]\nid = "x"\nfamily = "glass"\nrho = "2500 kg/m^3"\nE = "70 psi GPa"\n', encoding="utf-8"
    )
    with pytest.raises(DataFileError) as info:
        load_materials([bad, other])
    assert [p.where for p in info.value.problems] == [
        f"{bad}: row 2, column family",
        f"{other}: class 1 (x), field E",
    ]


def test_nothing_to_load_and_wrong_types(tmp_path: Path) -> None:
    with pytest.raises(InputError) as info:
        load_materials([], builtin=False)
    assert str(info.value) == "materials: no table to load; expected builtin=True or at least one file"
    sheet = tmp_path / "table.ods"
    for call in (load_materials, read_materials_file, check_materials_file):
        with pytest.raises(InputError) as info:
            call([sheet] if call is load_materials else sheet)
        assert str(info.value) == (
            f"{sheet}: unsupported file type '.ods'; expected a .csv, .toml, .xlsx "
            "(optionally file.xlsx#Sheet) or .parquet file"
        )


# ---------------------------------------------------------------------------- validate_table


def test_validate_table_on_a_frame(tiny_builtin: Path) -> None:
    table = load_materials()
    assert validate_table(table, "t") == []
    broken = pd.concat([table.drop(columns="family").assign(extra=1.0), table[["nu_low"]]], axis=1)
    broken["E_low"] = broken["E_low"].astype(object)
    broken.loc[0, "E_low"] = "stiff"
    broken.loc[1, "rho_high"] = np.inf
    broken.loc[2, "rho_low"] = np.nan
    broken.loc[2, "id"] = "pp"
    assert [str(p) for p in validate_table(broken, "t")] == [
        "t: column family: column 'family' is missing; expected it in every table",
        "t: column extra: unknown column 'extra'; expected the columns of data_columns() and 'origin'",
        "t: column nu_low: column 'nu_low' appears again; expected each column once",
        "t: row 2, column E_low: 'stiff' is not a number; expected a number in GPa",
        "t: row 3, column rho_high: inf is not a finite number; expected a number in kg/m^3",
        "t: row 4, column id: id 'pp' is used again (first in row 3); "
        "expected each id once in a file; a later file may reuse an id to replace a class",
        "t: row 4, column rho_low: no value; expected density in kg/m^3; it is required for every class",
    ]


# ---------------------------------------------------------------------------- fuzzing

HEADER_NAMES = [*data_columns(), *PROPERTIES, "", "E_lo", "Rho", "id ", "origin"]
UNITS = [
    "GPa",
    "Msi",
    "kg/m^3",
    "lb/in^3",
    "degF",
    "degC",
    "1e-6/degF",
    "USD/lb",
    "%",
    "",
    "K**(1/0)",
    "((",
    "1/0",
]
CELL = st.one_of(
    st.floats(allow_nan=True, allow_infinity=True).map(repr),
    st.integers(-(10**30), 10**30).map(str),
    st.sampled_from(["n/a", "", "nan", "NaN", "inf", "1e999", "-0", "metal", "good", "1,5", '"', "\x00"]),
    st.text(max_size=8),
)
HEADER = st.one_of(
    st.sampled_from(HEADER_NAMES),
    st.text(max_size=10),
    st.tuples(st.sampled_from(HEADER_NAMES), st.one_of(st.sampled_from(UNITS), st.text(max_size=8))).map(
        lambda pair: f"{pair[0]} [{pair[1]}]"
    ),
)


def _assert_only_our_errors(path: Path) -> None:
    problems = check_materials_file(path)
    assert isinstance(problems, list) and all(isinstance(p, Problem) for p in problems)
    try:
        table = read_materials_file(path)
    except DataFileError as exc:
        assert exc.problems == problems and problems
    else:
        assert problems == []
        assert list(table.columns) == COLUMNS


@settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(
    header=st.lists(HEADER, min_size=1, max_size=8),
    rows=st.lists(st.lists(CELL, max_size=9), max_size=4),
    quoted=st.booleans(),
)
def test_fuzzed_csv_never_escapes(tmp_path_factory: pytest.TempPathFactory, header, rows, quoted) -> None:
    path = tmp_path_factory.getbasetemp() / "fuzz.csv"
    if quoted:
        buffer = io.StringIO()
        csv.writer(buffer, lineterminator="\n").writerows([header, *rows])
        text = buffer.getvalue()
    else:
        text = "\n".join(",".join(row) for row in [header, *rows])
    path.write_text(text, encoding="utf-8", errors="surrogatepass")
    _assert_only_our_errors(path)


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(
    value=st.one_of(
        st.text(max_size=12),
        st.tuples(st.floats(allow_nan=False, allow_infinity=False), st.sampled_from(UNITS)).map(
            lambda pair: f"{pair[0]!r} {pair[1]}"
        ),
    ),
    symbol=st.sampled_from(list(PROPERTIES)),
)
def test_fuzzed_toml_values_never_escape(
    tmp_path_factory: pytest.TempPathFactory, value: str, symbol: str
) -> None:
    path = tmp_path_factory.getbasetemp() / "fuzz.toml"
    quoted = value.replace("\\", "\\\\").replace('"', '\\"')
    path.write_text(
        f'[[class]]\nid = "x"\nfamily = "metal"\n{symbol} = "{quoted}"\n', encoding="utf-8", errors="replace"
    )
    _assert_only_our_errors(path)


def test_the_fast_read_of_the_builtin_table_equals_the_validated_read():
    import materials_db
    from selector.inputs import materials
    from selector.inputs.material_files import read_csv

    path = Path(materials_db.CLASSES_CSV)
    fast = materials._read_trusted(path)
    slow, problems = read_csv(path, str(path), user=False)
    assert problems == []
    assert fast is not None
    pd.testing.assert_frame_equal(fast.reset_index(drop=True), slow.reset_index(drop=True), check_dtype=False)


def test_the_fast_read_declines_a_table_in_another_layout(tmp_path):
    from selector.inputs import materials

    odd = tmp_path / "odd.csv"
    odd.write_text("id,family,E_low [Msi]\nx,metal,10\n", encoding="utf-8")
    assert materials._read_trusted(odd) is None

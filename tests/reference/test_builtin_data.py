"""The built-in materials table against published values and physical sanity.

The table is read with pandas directly, so these checks hold whatever loader
sits on top of it. Each reference value names its source beside the check;
handbook values are quoted from memory, as the data themselves were.
"""

from __future__ import annotations

import re

import numpy as np
import pandas as pd
import periodictable
import pytest

import materials_db
from selector.inputs.properties import (
    FAMILIES,
    NOT_APPLICABLE,
    PROPERTIES,
    RATING_LEVELS,
    RATINGS,
    data_columns,
)

CORE = [s for s, p in PROPERTIES.items() if p.core]
ISOTROPIC_FAMILIES = ("metal", "ceramic", "glass")
SOURCES_MD = materials_db.CLASSES_CSV.with_name("SOURCES.md")


@pytest.fixture(scope="module")
def raw() -> pd.DataFrame:
    """The table exactly as written: every cell a string."""
    return pd.read_csv(materials_db.CLASSES_CSV, dtype=str, keep_default_na=False)


@pytest.fixture(scope="module")
def table() -> pd.DataFrame:
    """The table with numeric columns as floats and ``n/a`` as NaN, indexed by id."""
    df = pd.read_csv(materials_db.CLASSES_CSV, na_values=[NOT_APPLICABLE], keep_default_na=False)
    return df.set_index("id")


def _range(table: pd.DataFrame, class_id: str, symbol: str) -> tuple[float, float]:
    row = table.loc[class_id]
    return float(row[f"{symbol}_low"]), float(row[f"{symbol}_high"])


def _contains(table: pd.DataFrame, class_id: str, symbol: str, value: float) -> bool:
    low, high = _range(table, class_id, symbol)
    return low <= value <= high


def _overlaps(table: pd.DataFrame, class_id: str, symbol: str, low: float, high: float) -> bool:
    lo, hi = _range(table, class_id, symbol)
    return lo <= high and low <= hi


# ------------------------------------------------------------ element densities

# (class id, element, allowed relative gap, why). periodictable gives g/cm^3.
ELEMENT_DENSITY = [
    ("copper-cp", "Cu", 0.0, "commercially pure"),  # periodictable: Cu 8.96 g/cm^3
    ("lead", "Pb", 0.0, "commercially pure; antimonial grades are lighter"),  # periodictable: Pb 11.35
    ("tungsten", "W", 0.0, "commercially pure"),  # periodictable: W 19.3
    ("nickel-cp", "Ni", 0.0, "commercially pure"),  # periodictable: Ni 8.902
    ("al-1xxx-wrought", "Al", 0.0, "commercially pure"),  # periodictable: Al 2.6989
    # periodictable gives Ti 4.54; CP titanium is 4.51 (ASM Desk Edition, from memory): allow 1 %.
    ("ti-cp", "Ti", 0.01, "commercially pure"),
    # Carbon steel is iron with < 1 % C and Mn: within 1 % of Fe 7.874 (periodictable).
    ("steel-low-carbon", "Fe", 0.01, "alloy: iron with a little carbon"),
]


@pytest.mark.parametrize(("class_id", "element", "gap", "why"), ELEMENT_DENSITY)
def test_pure_metal_density_matches_element(table, class_id, element, gap, why):
    expected = periodictable.elements.symbol(element).density * 1000.0  # g/cm^3 -> kg/m^3
    low, high = _range(table, class_id, "rho")
    assert low * (1 - gap) <= expected <= high * (1 + gap), f"{class_id} ({why}): {low}-{high} vs {expected}"


def test_zinc_die_casting_alloy_is_a_little_lighter_than_zinc(table):
    # Alloy: Zamak carries ~4 % Al, which is lighter than Zn, so the alloy lies below
    # periodictable's Zn 7.133 g/cm^3 but within 15 % of it (Zamak 3 is 6.6, ASM Desk Edition, from memory).
    zn = periodictable.elements.symbol("Zn").density * 1000.0
    low, high = _range(table, "zinc-die-cast", "rho")
    assert high < zn
    assert low > 0.85 * zn


@pytest.mark.parametrize("class_id", ["mg-wrought", "mg-cast"])
def test_magnesium_alloys_are_a_little_denser_than_magnesium(table, class_id):
    # Alloy: Al and Zn are denser than Mg, so AZ/AM/ZK alloys lie just above
    # periodictable's Mg 1.738 g/cm^3, within 8 % (AZ91 is 1.81, ASM Desk Edition, from memory).
    mg = periodictable.elements.symbol("Mg").density * 1000.0
    low, high = _range(table, class_id, "rho")
    assert low >= mg * 0.995
    assert high <= mg * 1.08


# ------------------------------------------------------------ elastic constants

# (class id, E GPa, G GPa or None, nu or None); Callister & Rethwisch Table 6.1 (from memory).
CALLISTER_TABLE_6_1 = [
    ("steel-low-carbon", 207, 83, 0.30),  # Callister Table 6.1: steel 207 / 83 / 0.30
    ("al-1xxx-wrought", 69, 25, 0.33),  # Callister Table 6.1: aluminium 69 / 25 / 0.33
    ("copper-cp", 110, 46, 0.34),  # Callister Table 6.1: copper 110 / 46 / 0.34
    ("brass", 97, 37, 0.34),  # Callister Table 6.1: brass 97 / 37 / 0.34
    ("mg-wrought", 45, 17, 0.29),  # Callister Table 6.1: magnesium 45 / 17 / 0.29
    ("nickel-cp", 207, 76, 0.31),  # Callister Table 6.1: nickel 207 / 76 / 0.31
    ("ti-cp", 107, 45, 0.34),  # Callister Table 6.1: titanium 107 / 45 / 0.34
    ("tungsten", 407, 160, 0.28),  # Callister Table 6.1: tungsten 407 / 160 / 0.28
]


@pytest.mark.parametrize(("class_id", "E", "G", "nu"), CALLISTER_TABLE_6_1)
def test_metal_elastic_constants_match_callister_table_6_1(table, class_id, E, G, nu):
    assert _contains(table, class_id, "E", E)
    assert _contains(table, class_id, "G", G)
    assert _contains(table, class_id, "nu", nu)


# (class id, E GPa); Callister & Rethwisch Appendix B, Table B.2 (from memory).
CALLISTER_APPENDIX_B_E = [
    ("steel-medium-carbon", 207),  # Callister App. B: plain carbon 1040, 207 GPa
    ("steel-low-alloy", 205),  # Callister App. B: alloy steel 4140 / 4340, 205-207 GPa
    ("stainless-austenitic", 193),  # Callister App. B: stainless 304 / 316, 193 GPa
    ("cast-iron-ductile", 169),  # Callister App. B: ductile iron 80-55-06, 169 GPa
    ("al-2xxx-wrought", 72.4),  # Callister App. B: aluminium alloy 2024, 72.4 GPa
    ("al-6xxx-wrought", 69.0),  # Callister App. B: aluminium alloy 6061, 69.0 GPa
    ("al-7xxx-wrought", 71.0),  # Callister App. B: aluminium alloy 7075, 71.0 GPa
    ("al-cast", 72.4),  # Callister App. B: aluminium alloy 356, 72.4 GPa
    ("ti-alloy", 114),  # Callister App. B: Ti-6Al-4V, 114 GPa
    ("alumina", 380),  # Callister App. B: aluminium oxide 99.9 %, 380 GPa
    ("silicon-nitride", 304),  # Callister App. B: silicon nitride, 304 GPa
    ("zirconia", 205),  # Callister App. B: zirconia 3 mol% Y2O3, 205 GPa
    ("glass-soda-lime", 69),  # Callister App. B: soda-lime glass, 69 GPa
    ("glass-borosilicate", 70),  # Callister App. B: borosilicate (Pyrex) glass, 70 GPa
    ("glass-silica", 73),  # Callister App. B: fused silica, 73 GPa
    ("glass-ceramic", 120),  # Callister App. B: glass-ceramic (Pyroceram), 120 GPa
    ("pc", 2.38),  # Callister App. B: polycarbonate, 2.38 GPa
    ("pe-hd", 1.08),  # Callister App. B: polyethylene high density, 1.08 GPa
]


@pytest.mark.parametrize(("class_id", "E"), CALLISTER_APPENDIX_B_E)
def test_modulus_contains_callister_appendix_b(table, class_id, E):
    assert _contains(table, class_id, "E", E)


# (class id, low, high GPa); ranges quoted in Callister Appendix B (from memory): must overlap.
CALLISTER_APPENDIX_B_E_RANGES = [
    ("pe-ld", 0.17, 0.28),  # Callister App. B: PE-LD 0.17-0.28 GPa
    ("pp", 1.14, 1.55),  # Callister App. B: polypropylene 1.14-1.55 GPa
    ("ps", 2.28, 3.28),  # Callister App. B: polystyrene 2.28-3.28 GPa
    ("pmma", 2.24, 3.24),  # Callister App. B: PMMA 2.24-3.24 GPa
    ("pet", 2.76, 4.14),  # Callister App. B: PET 2.76-4.14 GPa
    ("ptfe", 0.40, 0.55),  # Callister App. B: PTFE 0.40-0.55 GPa
    ("pvc-u", 2.41, 4.14),  # Callister App. B: PVC 2.41-4.14 GPa
    ("phenolic", 2.76, 4.83),  # Callister App. B: phenol-formaldehyde 2.76-4.83 GPa
    ("concrete", 25.4, 36.6),  # Callister App. B: concrete 25.4-36.6 GPa
]


@pytest.mark.parametrize(("class_id", "low", "high"), CALLISTER_APPENDIX_B_E_RANGES)
def test_modulus_overlaps_callister_appendix_b_range(table, class_id, low, high):
    assert _overlaps(table, class_id, "E", low, high)


@pytest.mark.parametrize("class_id", ["steel-low-carbon", "steel-medium-carbon", "steel-high-carbon"])
def test_carbon_steel_modulus_is_200_to_210(table, class_id):
    # Carbon steels: E = 200-210 GPa whatever the carbon content (Callister App. B;
    # Ashby MMSD data tables, from memory). The class range must contain that band.
    low, high = _range(table, class_id, "E")
    assert low <= 200 and high >= 210
    assert low >= 195 and high <= 220


@pytest.mark.parametrize(
    "class_id",
    ["al-1xxx-wrought", "al-2xxx-wrought", "al-5xxx-wrought", "al-6xxx-wrought", "al-7xxx-wrought"],
)
def test_wrought_aluminium_modulus_is_about_70(table, class_id):
    # Wrought Al alloys without Li: E = 68-74 GPa (Callister App. B; ASM Desk Edition, from memory).
    low, high = _range(table, class_id, "E")
    assert _contains(table, class_id, "E", 70.0)
    assert low >= 67 and high <= 77


def test_aluminium_lithium_is_stiffer_than_other_wrought_aluminium(table):
    # Al-Li alloys (2090, 2195, 8090): E about 76-80 GPa, ~8-10 % above 2024 (ASM Desk Edition, from memory).
    low, high = _range(table, "al-li-wrought", "E")
    assert 74 <= low and high <= 82
    assert low > _range(table, "al-6xxx-wrought", "E")[1]


@pytest.mark.parametrize("class_id", ["ti-alloy"])
def test_titanium_alloy_modulus_is_105_to_120(table, class_id):
    # Titanium alloys: E = 105-120 GPa (Callister App. B; Ashby MMSD data tables, from memory).
    low, high = _range(table, class_id, "E")
    assert 100 <= low <= 110 and 114 <= high <= 125


def test_soda_lime_glass_matches_en_572(table):
    # EN 572-1 (from memory): rho 2500 kg/m^3, E 70 GPa, nu 0.2, alpha 9e-6/K,
    # c 720 J/(kg K), lambda 1.0 W/(m K).
    assert _contains(table, "glass-soda-lime", "rho", 2500)
    assert _contains(table, "glass-soda-lime", "E", 70)
    assert _contains(table, "glass-soda-lime", "nu", 0.2)
    assert _contains(table, "glass-soda-lime", "alpha", 9.0)
    assert _contains(table, "glass-soda-lime", "c_p", 720)
    assert _contains(table, "glass-soda-lime", "lambda", 1.0)


def test_soda_lime_glass_modulus_is_68_to_74(table):
    # Soda-lime glass: E = 68-74 GPa (Callister App. B 69 GPa; Ashby MMSD, from memory).
    low, high = _range(table, "glass-soda-lime", "E")
    assert 66 <= low <= 69 and 72 <= high <= 76


def test_alumina_modulus_is_340_to_400(table):
    # Alumina: E = 340-400 GPa for 96-99.9 % grades, 380 for 99.9 % (Callister App. B, from memory);
    # the class reaches down to ~300 for lower-purity grades (Ashby MMSD, from memory).
    low, high = _range(table, "alumina", "E")
    assert low <= 340 and 390 <= high <= 410


def test_concrete_matches_eurocode_2_table_3_1(table):
    # EN 1992-1-1 Table 3.1 (from memory), classes C20/25 to C50/60:
    # f_ck 20-50 MPa, f_ctm 2.2-4.1 MPa, E_cm 30-37 GPa.
    assert _contains(table, "concrete", "sigma_c", 20) and _contains(table, "concrete", "sigma_c", 50)
    assert _contains(table, "concrete", "sigma_ts", 2.2) and _contains(table, "concrete", "sigma_ts", 4.1)
    assert _contains(table, "concrete", "E", 30) and _contains(table, "concrete", "E", 37)


def test_structural_steel_matches_en_10025_2_and_eurocode_3(table):
    # EN 10025-2 (from memory): minimum yield ReH 275 MPa (S275) and 355 MPa (S355) for
    # thicknesses up to 16 mm; tensile strength 410-560 MPa (S275) and 470-630 MPa (S355).
    assert _range(table, "structural-steel", "sigma_y") == (275, 355)
    assert _range(table, "structural-steel", "sigma_ts") == (410, 630)
    # EN 1993-1-1 §3.2.6 (from memory): E = 210 GPa, G ≈ 81 GPa, nu = 0.3, alpha = 12e-6/K.
    for symbol, value in (("E", 210), ("G", 81), ("nu", 0.3), ("alpha", 12)):
        assert _contains(table, "structural-steel", symbol, value), symbol


def test_spring_wire_matches_en_10270_1_and_en_13906_1(table):
    # EN 10270-1 (from memory): patented drawn wire, about 2400 MPa at 1 mm (grade DH)
    # down to about 1300 MPa at 10 mm (grade SL).
    assert _contains(table, "spring-steel-wire", "sigma_ts", 2400)
    assert _contains(table, "spring-steel-wire", "sigma_ts", 1300)
    # EN 13906-1 (from memory): E = 206 GPa and G = 81.5 GPa for patented drawn wire.
    assert _contains(table, "spring-steel-wire", "E", 206)
    assert _contains(table, "spring-steel-wire", "G", 81.5)


@pytest.mark.parametrize(
    ("class_id", "least_mor", "least_moe"),
    [
        # EN 622-5 (from memory): MDF for general use in dry conditions, 12-19 mm: MOR >= 20 MPa,
        # MOE >= 2200 MPa.
        ("mdf", 20, 2.2),
        # EN 312 (from memory): type P2 (general, dry), 13-20 mm: MOR >= 11 MPa, MOE >= 1600 MPa.
        ("particle-board", 11, 1.6),
    ],
)
def test_wood_panels_start_at_their_standards_least_values(table, class_id, least_mor, least_moe):
    # the bending strength is stored as sigma_ts, the end of the linear response below it
    assert _range(table, class_id, "sigma_ts")[0] <= least_mor * 1.1
    assert _range(table, class_id, "E")[0] == least_moe
    assert _range(table, class_id, "sigma_y")[1] < _range(table, class_id, "sigma_ts")[1]


def test_mdf_density_is_that_of_en_316(table):
    # EN 316 (from memory): MDF 650-800 kg/m^3 (lighter boards are light MDF, denser ones HDF).
    assert _range(table, "mdf", "rho") == (650, 800)


# ------------------------------------------------------------ densities of polymers

# (class id, rho kg/m^3); Callister & Rethwisch Appendix B, Table B.1 (from memory).
CALLISTER_POLYMER_DENSITY = [
    ("pe-ld", 925),  # Callister App. B: PE-LD 0.925 g/cm^3
    ("pe-hd", 959),  # Callister App. B: PE-HD 0.959 g/cm^3
    ("pp", 905),  # Callister App. B: polypropylene 0.905 g/cm^3
    ("ps", 1050),  # Callister App. B: polystyrene 1.05 g/cm^3
    ("pmma", 1190),  # Callister App. B: PMMA 1.19 g/cm^3
    ("pc", 1200),  # Callister App. B: polycarbonate 1.20 g/cm^3
    ("pet", 1350),  # Callister App. B: PET 1.35 g/cm^3
    ("ptfe", 2170),  # Callister App. B: PTFE 2.17 g/cm^3
    ("pa", 1140),  # Callister App. B: nylon 6,6 1.14 g/cm^3
]


@pytest.mark.parametrize(("class_id", "rho"), CALLISTER_POLYMER_DENSITY)
def test_polymer_density_contains_callister_appendix_b(table, class_id, rho):
    assert _contains(table, class_id, "rho", rho)


# ------------------------------------------------------------ thermal properties

# (class id, lambda W/(m K), alpha 1e-6/K, c_p J/(kg K)); Callister Table 19.1 (from memory).
CALLISTER_TABLE_19_1 = [
    ("copper-cp", 398, 17.0, 386),  # Callister Table 19.1: copper
    ("tungsten", 178, 4.5, 138),  # Callister Table 19.1: tungsten
    ("steel-low-carbon", 51.9, 12.5, 486),  # Callister Table 19.1: 1025 steel
    ("stainless-austenitic", 15.9, 16.0, 502),  # Callister Table 19.1: 316 stainless steel
    ("brass", 120, 20.0, 375),  # Callister Table 19.1: brass (70Cu-30Zn)
    ("alumina", 39, 7.6, 775),  # Callister Table 19.1: alumina
    ("glass-silica", 1.4, 0.4, 740),  # Callister Table 19.1: fused silica
    ("glass-soda-lime", 1.7, 9.0, 840),  # Callister Table 19.1: soda-lime glass
    ("glass-borosilicate", 1.4, 3.3, 850),  # Callister Table 19.1: borosilicate (Pyrex) glass
    ("pp", 0.12, 145, 1925),  # Callister Table 19.1: polypropylene (alpha 145-180)
    ("ptfe", 0.25, 126, 1050),  # Callister Table 19.1: PTFE (alpha 126-216)
]


@pytest.mark.parametrize(("class_id", "lam", "alpha", "c_p"), CALLISTER_TABLE_19_1)
def test_thermal_properties_match_callister_table_19_1(table, class_id, lam, alpha, c_p):
    assert _contains(table, class_id, "lambda", lam)
    assert _contains(table, class_id, "alpha", alpha)
    assert _contains(table, class_id, "c_p", c_p)


# ------------------------------------------------------------ wood


def test_softwood_along_grain_matches_wood_handbook(table):
    # Wood Handbook FPL-GTR-190 Table 5-3a, 12 % MC (from memory): MOE Douglas-fir (coast) 13.4 GPa,
    # Sitka spruce 10.8 GPa, eastern white pine 8.5 GPa, longleaf pine 13.7 GPa.
    for modulus in (13.4, 10.8, 8.5, 13.7):
        assert _contains(table, "softwood-along-grain", "E", modulus)
    # Same table: specific gravity Douglas-fir 0.48, Sitka spruce 0.40 (oven-dry mass, volume at 12 % MC);
    # density at 12 % MC is SG x 1000 x 1.12 kg/m^3.
    for sg in (0.48, 0.40):
        assert _contains(table, "softwood-along-grain", "rho", sg * 1000 * 1.12)
    # Same table: compression parallel to grain (max crushing) Douglas-fir 49.9 MPa, Sitka spruce 38.2 MPa.
    for crush in (49.9, 38.2):
        assert _contains(table, "softwood-along-grain", "sigma_c", crush)


def test_hardwood_along_grain_matches_wood_handbook(table):
    # Wood Handbook FPL-GTR-190 Table 5-3a, 12 % MC (from memory): MOE northern red oak 12.5 GPa,
    # white oak 12.3, sugar maple 12.6, white ash 12.0, American beech 11.9.
    for modulus in (12.5, 12.3, 12.6, 12.0, 11.9):
        assert _contains(table, "hardwood-along-grain", "E", modulus)
    # Same table: SG red oak 0.63, white oak 0.68 -> density at 12 % MC = SG x 1000 x 1.12.
    for sg in (0.63, 0.68):
        assert _contains(table, "hardwood-along-grain", "rho", sg * 1000 * 1.12)


@pytest.mark.parametrize("kind", ["softwood", "hardwood"])
def test_wood_across_grain_is_much_less_stiff(table, kind):
    # Wood Handbook FPL-GTR-190 Table 5-1 (from memory): E_T/E_L about 0.03-0.07 and
    # E_R/E_L about 0.05-0.11, so across the grain E is 2-12 % of E along it.
    along_low, along_high = _range(table, f"{kind}-along-grain", "E")
    across_low, across_high = _range(table, f"{kind}-across-grain", "E")
    assert across_low >= 0.02 * along_low
    assert across_high <= 0.12 * along_high


def test_wood_expands_little_along_the_grain(table):
    # Wood Handbook FPL-GTR-190 chapter 4 (from memory): longitudinal expansion 3.1-4.5e-6/K,
    # radial and tangential 5-10 times larger.
    assert _overlaps(table, "softwood-along-grain", "alpha", 3.1, 4.5)
    assert _range(table, "softwood-along-grain", "alpha")[1] <= 6
    assert _range(table, "softwood-across-grain", "alpha")[0] >= 5 * 3.1


# ------------------------------------------------------------ sanity of the whole table


def test_columns_are_exactly_the_registry_columns(raw):
    assert list(raw.columns) == data_columns()


def test_at_least_80_classes_with_unique_slug_ids(raw):
    assert len(raw) >= 80  # task requirement, no source
    assert raw["id"].is_unique
    assert all(re.fullmatch(r"[a-z0-9]+(-[a-z0-9]+)*", i) for i in raw["id"])


def test_every_class_has_a_unique_short_name_for_narrow_tables(raw):
    # the terminal shows short names when full names do not fit (common practice, no source)
    names = raw["short_name"].str.strip()
    assert (names != "").all(), list(raw["id"][names == ""])
    assert names.is_unique, list(names[names.duplicated(keep=False)])
    too_long = [n for n in names if len(n) > 12]
    assert too_long == []
    assert names.str.casefold().is_unique  # no two differ only by case


def test_all_nine_families_present(raw):
    assert set(raw["family"]) == set(FAMILIES)


def test_no_empty_cell(raw):
    empty = [(r, c) for c in raw.columns for r, v in zip(raw["id"], raw[c], strict=True) if not v.strip()]
    assert empty == []


def test_core_properties_are_always_numbers(raw):
    for symbol in CORE:
        for col in (PROPERTIES[symbol].low, PROPERTIES[symbol].high):
            values = pd.to_numeric(raw[col], errors="coerce")
            assert values.notna().all(), f"{col}: {list(raw['id'][values.isna()])}"


def test_every_non_number_is_not_applicable_in_both_columns(raw):
    for symbol, prop in PROPERTIES.items():
        low = raw[prop.low]
        high = raw[prop.high]
        low_num = pd.to_numeric(low, errors="coerce")
        high_num = pd.to_numeric(high, errors="coerce")
        assert set(low[low_num.isna()]) <= {NOT_APPLICABLE}, symbol
        assert set(high[high_num.isna()]) <= {NOT_APPLICABLE}, symbol
        assert ((low == NOT_APPLICABLE) == (high == NOT_APPLICABLE)).all(), symbol


CORE_COLUMNS = ("E_core", "G_core", "tau_core")
HONEYCOMB_NOT_APPLICABLE = ("nu", "elongation", "K_IC", "sigma_e")


def test_every_not_applicable_cell_has_the_reason_sources_md_gives(raw):
    """SOURCES.md says where n/a is written and why; every n/a in the table is one of those cases."""
    text = " ".join(SOURCES_MD.read_text(encoding="utf-8").split())
    # The two reasons, as SOURCES.md states them:
    assert "for every other class they are `n/a` (the class is not made as a core)" in text
    assert "Poisson's ratio, elongation, toughness and fatigue are `n/a` for honeycombs" in text
    honeycomb = raw["id"].str.contains("honeycomb") & raw["name"].str.contains("honeycomb", case=False)
    for symbol, prop in PROPERTIES.items():
        na = raw[prop.low] == NOT_APPLICABLE
        if symbol in CORE_COLUMNS:
            # not a core: all three core columns n/a together, and a honeycomb is always a core
            together = np.logical_and.reduce([raw[PROPERTIES[c].low] == NOT_APPLICABLE for c in CORE_COLUMNS])
            assert (na == together).all(), symbol
            assert not (na & honeycomb).any(), symbol
        else:
            unexplained = na & ~(honeycomb & (symbol in HONEYCOMB_NOT_APPLICABLE))
            assert not unexplained.any(), (symbol, list(raw["id"][unexplained]))
    for symbol in HONEYCOMB_NOT_APPLICABLE:  # and for a honeycomb they are n/a, as stated
        assert (raw[PROPERTIES[symbol].low][honeycomb] == NOT_APPLICABLE).all(), symbol


def test_low_never_exceeds_high(table):
    for prop in PROPERTIES.values():
        low, high = table[prop.low], table[prop.high]
        bad = table.index[(low > high).to_numpy()]
        assert list(bad) == [], prop.symbol


def test_values_inside_registry_bounds(table):
    for prop in PROPERTIES.values():
        for col in (prop.low, prop.high):
            values = table[col].dropna()
            bad = values[(values < prop.lower) | (values > prop.upper)]
            assert bad.empty, f"{col}: {bad.to_dict()}"
            if prop.positive:
                assert (values > 0).all(), col


def test_tensile_strength_not_below_yield(table):
    # Tensile strength >= yield strength (elastic limit) by definition: common practice, no source.
    bad_low = table.index[table["sigma_ts_low"] < table["sigma_y_low"]]
    bad_high = table.index[table["sigma_ts_high"] < table["sigma_y_high"]]
    assert list(bad_low) == [] and list(bad_high) == []


def test_minimum_service_temperature_below_maximum(table):
    # T_min < T_max over the whole ranges: common practice, no source.
    bad = table.index[table["T_min_high"] >= table["T_max_low"]]
    assert list(bad) == []


def test_poisson_ratio_between_zero_and_half(table):
    # 0 <= nu <= 0.5 for stable isotropic solids; cork is near zero, rubber near 0.5: common practice.
    # Honeycombs hold n/a: their in-plane ratio is near 1, outside the isotropic bounds (Gibson & Ashby).
    nu = table[["nu_low", "nu_high"]].dropna()
    assert (nu["nu_low"] >= 0).all() and (nu["nu_high"] <= 0.5).all()


def test_shear_modulus_consistent_with_isotropy(table):
    # Isotropic elasticity: G = E/(2(1+nu)) (any elasticity text, e.g. Callister eq. 6.9).
    # The interval it gives from the E and nu ranges must overlap the stored G range.
    iso = table[table["family"].isin(ISOTROPIC_FAMILIES)]
    g_low = iso["E_low"] / (2 * (1 + iso["nu_high"]))
    g_high = iso["E_high"] / (2 * (1 + iso["nu_low"]))
    bad = iso.index[(g_low > iso["G_high"]) | (g_high < iso["G_low"])]
    assert list(bad) == []


def test_ratings_use_the_allowed_levels(raw):
    for rating in RATINGS:
        assert set(raw[rating]) <= set(RATING_LEVELS), rating


def test_ceramics_and_glasses_do_not_burn_and_metals_mostly_not(raw):
    # Oxide, carbide and nitride ceramics and glasses are non-combustible (common practice, no source).
    brittle = raw[raw["family"].isin(["ceramic", "glass"])]
    assert set(brittle["flammability"]) == {"excellent"}
    # Among metals only magnesium alloys burn readily enough to rate below excellent (common practice).
    metals = raw[raw["family"] == "metal"]
    assert set(metals["id"][metals["flammability"] != "excellent"]) == {"mg-wrought", "mg-cast"}


def test_every_source_key_is_defined_in_sources_md(raw):
    text = SOURCES_MD.read_text(encoding="utf-8")
    defined = set(re.findall(r"^\| `([A-Za-z0-9-]+)` \|", text, flags=re.M))
    used = {key.strip() for cell in raw["source"] for key in cell.split(";")}
    assert used, "no source keys in the table"
    assert used <= defined, sorted(used - defined)


def test_every_row_names_a_source_and_a_note(raw):
    """Every class names its source and carries a short note of its own (grades, condition)."""
    source, note = raw["source"].str.strip(), raw["note"].str.strip()
    assert (source != "").all(), list(raw["id"][source == ""])
    assert (note != "").all(), list(raw["id"][note == ""])
    assert (note.str.len() <= 120).all(), list(raw["id"][note.str.len() > 120])
    # a note says something the name does not: it is neither the name nor one of its words alone
    names = raw["name"].str.strip().str.lower()
    assert not (note.str.lower() == names).any(), list(raw["id"][note.str.lower() == names])
    assert (note.str.split().str.len() >= 2).all(), list(raw["id"][note.str.split().str.len() < 2])


def test_numeric_columns_read_as_numbers(table):
    # With n/a read as NaN every property column is numeric, so the checks above compare numbers.
    numeric = [c for c in data_columns() if c.endswith(("_low", "_high"))]
    assert all(
        np.issubdtype(table[c].dtype, np.floating) or np.issubdtype(table[c].dtype, np.integer)
        for c in numeric
    )

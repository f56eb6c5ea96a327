"""The headline index is the governing constraint's, whatever the order of the [[constraint]] blocks."""

from __future__ import annotations

import pytest

from selector.inputs.spec import spec_from_dict
from selector.outputs.tables import render_selection
from selector.pipeline.selection import select
from tests.conftest import make_table

# Invented classes (demo data). For a tie of length L = 1 m carrying F = 10 kN with δ_max = 1 mm
# the stiffness needs A = F·L/(E·δ) and the strength A = F/σ_y (worked by hand):
TIE_CLASSES = make_table(
    [
        # A_stiffness = 1e4/(200e9·1e-3) = 5e-5 m², A_strength = 1e4/1000e6 = 1e-5 m²: stiffness governs
        {"id": "stiff-strong", "E": (200, 200), "sigma_y": (1000, 1000), "rho": (7850, 7850)},
        # A_stiffness = 5e-5 m², A_strength = 1e4/100e6 = 1e-4 m²: strength governs
        {"id": "stiff-weak", "E": (200, 200), "sigma_y": (100, 100), "rho": (7850, 7850)},
        # A_stiffness = 1e4/(100e9·1e-3) = 1e-4 m², A_strength = 1e4/50e6 = 2e-4 m²: strength governs
        {"id": "light-weak", "E": (100, 100), "sigma_y": (50, 50), "rho": (2700, 2700)},
    ]
)
STIFFNESS = {"type": "stiffness", "max_deflection": "1 mm"}
STRENGTH = {"type": "strength"}


def _tie(constraints: list[dict], loads: bool = True):
    part = {"function": "tie", "length": "1 m"} | ({"force": "10 kN"} if loads else {})
    return spec_from_dict({"part": part, "section": {"shape": "round"}, "constraint": constraints})


def _header(selection) -> list[str]:
    return render_selection(selection, "table").split("\n\n")[0].splitlines()


def test_the_constraint_governing_most_parts_leads_in_either_order():
    first = select(_tie([STIFFNESS, STRENGTH]), TIE_CLASSES)
    swapped = select(_tie([STRENGTH, STIFFNESS]), TIE_CLASSES)
    for selection in (first, swapped):
        assert selection.derivations[0].constraint == "strength"
        assert selection.governing_counts == {"strength": 2, "stiffness": 1}
        index = dict(zip(selection.table["id"], selection.table["index"], strict=True))
        # σ_y/ρ in stored units: 1000/7850, 100/7850, 50/2700 (by hand).
        assert index["stiff-strong"] == pytest.approx(1000 / 7850)
        assert index["light-weak"] == pytest.approx(50 / 2700)
        # the other constraint's index, E/ρ, keeps its own column
        assert dict(zip(selection.table["id"], selection.table["index_stiffness"], strict=True))[
            "light-weak"
        ] == pytest.approx(100 / 2700)
    assert _header(first) == _header(swapped)
    assert "M = σ_y/ρ in " in _header(first)[1]  # then the index unit
    assert _header(first)[1].endswith(" (governs 2 of 3 sized parts)")
    assert "stiffness index M = E/ρ (governs 1 of 3 sized parts)" in _header(first)[2]


def test_each_candidate_carries_the_index_of_its_own_governing_constraint():
    table = select(_tie([STIFFNESS, STRENGTH]), TIE_CLASSES).table.set_index("id")
    assert table.at["stiff-strong", "governing"] == "stiffness"
    assert table.at["stiff-strong", "governing_index"] == "E/ρ"
    assert table.at["stiff-weak", "governing_index"] == "σ_y/ρ"
    shown = render_selection(select(_tie([STIFFNESS, STRENGTH]), TIE_CLASSES), "table")
    assert "stiffness (E/ρ)" in shown and "strength (σ_y/ρ)" in shown


def test_without_loads_the_order_of_the_blocks_changes_neither_header_nor_ranking():
    first = select(_tie([STIFFNESS, STRENGTH], loads=False), TIE_CLASSES)
    swapped = select(_tie([STRENGTH, STIFFNESS], loads=False), TIE_CLASSES)
    assert _header(first) == _header(swapped)
    assert list(first.shortlist["id"]) == list(swapped.shortlist["id"])
    assert first.derivations[0].constraint == "stiffness"  # the first in the fixed order


def test_a_conservative_ranking_by_index_shows_the_low_end_that_ranks():
    # Two invented classes: the typical index favours "wide", the low end favours "narrow".
    table = make_table(
        [
            {"id": "wide", "E": (50, 450), "rho": (1000, 1000)},  # E/ρ typical 0.15, low 0.05
            {"id": "narrow", "E": (100, 100), "rho": (1000, 1000)},  # E/ρ 0.1 throughout
        ]
    )
    selection = select(_tie([STIFFNESS], loads=False), table, conservative=True)
    assert list(selection.shortlist["id"]) == ["narrow", "wide"]
    lines = render_selection(selection, "table").splitlines()
    at = next(i for i, line in enumerate(lines) if line.startswith("rank"))
    header, rows = lines[at], lines[at + 3 : at + 5]  # the units line and the rule come between
    assert "index_low " in header and "GPa" in lines[at + 1]
    start = header.index("index_low ")
    shown = [float(line[start:].split()[0]) for line in rows]
    # E/ρ shown in GPa/(Mg/m³): 0.1 GPa/(kg/m³) reads 100
    assert shown == sorted(shown, reverse=True) == [pytest.approx(100), pytest.approx(50)]

"""Each load case says what kind of part it sizes, and that agrees with its own equations."""

from __future__ import annotations

import pytest

from selector.errors import InputError
from selector.mechanics.loadcases import FUNCTIONS, PART_KINDS, SECTION_QUANTITIES, load_case, part_kind


def test_every_function_has_a_kind():
    assert set(PART_KINDS) == set(FUNCTIONS)


@pytest.mark.parametrize("function", FUNCTIONS)
def test_a_part_sized_through_a_section_reads_section_quantities(function):
    case = load_case(function)
    kind = case.kind
    # the kind is declared beside the equations; these checks tie the two together
    if kind.takes_section or function == "panel":
        assert case.section_symbols, f"a {function} is sized through a section but reads none"
        assert kind.own_dimension is None
    else:
        assert not case.section_symbols & SECTION_QUANTITIES
        assert kind.own_dimension is not None
        used = frozenset().union(*(m.symbols for m in case.utilisation.values()))
        assert kind.own_dimension in used
        assert set(kind.fixed_geometry) <= used


def test_the_trade_reading_of_each_kind():
    # common practice, no source: a column and a plate under edge load carry compression; a
    # tie, a beam's tension face, a twisted shaft, a pressurised vessel and a spring carry tension
    assert {f for f, k in PART_KINDS.items() if k.in_compression} == {"column", "plate"}
    # a tie, beam, column and shaft are prismatic members sized through a cross-section
    assert {f for f, k in PART_KINDS.items() if k.takes_section} == {"tie", "beam", "column", "shaft"}
    # Weaver & Ashby's shape-factor limits are for bending (and buckling) of a section
    assert {f for f, k in PART_KINDS.items() if k.shape_capped} == {"beam", "column"}
    assert {f for f, k in PART_KINDS.items() if k.vessel} == {"cylinder", "sphere"}
    assert {f for f, k in PART_KINDS.items() if k.bends} == {"beam", "panel"}
    assert {f for f, k in PART_KINDS.items() if k.has_edges} == {"panel", "plate"}


def test_a_tie_reads_its_area_alone():
    # common practice, no source: axial stress F/A and extension F·L/(A·E) need only the area
    assert load_case("tie").section_symbols == {"A"}
    assert "I" in load_case("beam").section_symbols


def test_an_unknown_function_is_refused_with_a_suggestion():
    with pytest.raises(InputError, match=r"part\.function") as err:
        part_kind("bean")
    assert "beam" in str(err.value)

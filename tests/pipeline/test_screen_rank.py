"""Screening semantics on ranges and ranking by merit index, worked by hand."""

from __future__ import annotations

import math

import pytest

from selector.errors import InputError, UnitError
from selector.pipeline.rank import monomial_index, rank_by_index
from selector.pipeline.screen import PARTLY, PASSES, REJECTED, apply_screens, parse_limit, parse_screens
from tests.conftest import make_table


def test_ranking_five_classes_by_hand(five_classes):
    # Index E^1/2/ρ (E in GPa, ρ in kg/m³), worked by hand:
    #   a: √100/1000 = 0.0100       b: √64/500 = 0.0160
    #   c: low √36/700 = 0.008571, high √64/600 = 0.013333, typical √√(36·64)/√(600·700) = 0.010690
    #   d: √4/100 = 0.0200          e: √1/2000 = 0.0005
    # Order: d, b, c, a, e. c's range (0.00857–0.01333) reaches a's 0.0100 but not the leader d's 0.02.
    screened = apply_screens(five_classes, parse_screens({}))
    low, high, typ = monomial_index(screened, {"E": 0.5, "rho": -1})
    ranked = rank_by_index(screened, low, high, typ)
    assert list(ranked["id"]) == ["d", "b", "c", "a", "e"]
    c = ranked.set_index("id").loc["c"]
    assert c["index_low"] == pytest.approx(6 / 700)
    assert c["index_high"] == pytest.approx(8 / 600)
    assert c["index"] == pytest.approx(math.sqrt(math.sqrt(36 * 64)) / math.sqrt(600 * 700))
    assert not ranked["close_to_leader"].any()


def test_overlapping_ranges_are_too_close_to_call():
    table = make_table(
        [
            {"id": "x", "E": (90, 110), "rho": (1000, 1000)},
            {"id": "y", "E": (80, 100), "rho": (1000, 1000)},
            {"id": "z", "E": (10, 20), "rho": (1000, 1000)},
        ]
    )
    screened = apply_screens(table, parse_screens({}))
    ranked = rank_by_index(screened, *monomial_index(screened, {"E": 1, "rho": -1}))
    flags = dict(zip(ranked["id"], ranked["close_to_leader"], strict=True))
    assert flags == {"x": False, "y": True, "z": False}


def test_conservative_ranking_uses_the_unfavourable_end():
    table = make_table(
        [
            {"id": "wide", "E": (10, 400), "rho": (1000, 1000)},
            {"id": "narrow", "E": (50, 60), "rho": (1000, 1000)},
        ]
    )
    screened = apply_screens(table, parse_screens({}))
    idx = monomial_index(screened, {"E": 1, "rho": -1})
    assert list(rank_by_index(screened, *idx)["id"]) == ["wide", "narrow"]
    assert list(rank_by_index(screened, *idx, conservative=True)["id"]) == ["narrow", "wide"]


@pytest.mark.parametrize(
    ("limit", "expected"),
    [
        (">= 50 degC", [PASSES, PASSES, PASSES]),
        (">= 100 degC", [REJECTED, PARTLY, PASSES]),
        (">= 212 degF", [REJECTED, PARTLY, PASSES]),  # 212 °F = 100 °C
        (">= 130 degC", [REJECTED, PARTLY, REJECTED]),
        ("<= 100 degC", [PASSES, PARTLY, PASSES]),
    ],
)
def test_screen_semantics_on_ranges(limit, expected):
    table = make_table(
        [
            {"id": "low", "T_max": (60, 80)},
            {"id": "wide", "T_max": (70, 150)},
            {"id": "at", "T_max": (100, 100)},
        ]
    )
    out = apply_screens(table, parse_screens({"T_max": limit}))
    assert list(out["status"]) == expected


def test_every_reason_is_kept():
    table = make_table([{"id": "p", "family": "polymer", "T_max": (60, 80), "salt_water": "fair"}])
    out = apply_screens(
        table,
        parse_screens(
            {
                "T_max": ">= 100 degC",
                "salt_water": ">= good",
                "families": ["metal"],
            }
        ),
    )
    reasons = out["reasons"].iat[0]
    assert out["status"].iat[0] == REJECTED
    assert len(reasons) == 3
    assert "family polymer is not among metal" in reasons
    assert any(r.startswith("T_max 60–80 °C fails T_max >= 100 °C") for r in reasons)
    assert any("salt_water fair fails salt_water >= good" in r for r in reasons)


def test_missing_data_rejects_with_reason():
    table = make_table([{"id": "q", "K_IC": (float("nan"), float("nan"))}])
    out = apply_screens(table, parse_screens({"K_IC": ">= 10 MPa*m^0.5"}))
    assert out["status"].iat[0] == REJECTED
    assert out["reasons"].iat[0] == ["no data for K_IC"]


def test_limits_convert_units():
    assert parse_limit("price", "<= 10 USD/lb").value == pytest.approx(22.046226, rel=1e-6)
    assert parse_limit("E", ">= 10 Msi").value == pytest.approx(68.9476, rel=1e-5)
    assert parse_limit("salt_water", ">= good").value == 2


@pytest.mark.parametrize(
    ("symbol", "text", "error", "message"),
    [
        ("T_max", "60 degC", InputError, "screen.T_max: cannot read limit '60 degC'"),
        ("T_max", ">= 60", UnitError, "screen.T_max: '60' has no unit"),
        (
            "T_max",
            ">= 60 MPa",
            UnitError,
            "screen.T_max: got '60 MPa', a pressure or stress (MPa, GPa, psi, ksi …); "
            "expected a temperature (degC, degF, K …)",
        ),
        (
            "uv",
            ">= great",
            InputError,
            "screen.uv: 'great' is not a rating; one of: poor, fair, good, excellent",
        ),
    ],
)
def test_bad_limits_are_clear(symbol, text, error, message):
    with pytest.raises(error) as err:
        parse_limit(symbol, text)
    assert str(err.value).startswith(message)


def test_partly_passing_classes_keep_only_the_qualifying_range():
    from selector.pipeline.screen import qualifying_ranges

    table = make_table(
        [
            {"id": "wide", "sigma_y": (140, 305), "sigma_ts": (200, 400)},
            {"id": "cheap", "price": (1, 10)},
            {"id": "out", "sigma_y": (100, 200), "sigma_ts": (150, 250)},
        ]
    )
    screens = parse_screens({"sigma_y": ">= 300 MPa", "price": "<= 4 USD/kg"})
    out = qualifying_ranges(apply_screens(table, screens), screens).set_index("id")
    assert (out.loc["wide", "sigma_y_low"], out.loc["wide", "sigma_y_high"]) == (300, 305)
    assert out.loc["out", "sigma_y_low"] == 100  # rejected classes are left as they are
    assert out.loc["out", "status"] == REJECTED

"""Trade-offs: Pareto fronts, penalties with exchange constants, exchange-constant ranges."""

from __future__ import annotations

import io
import json
import math

import numpy as np
import pandas as pd
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from hypothesis.extra.numpy import arrays

from selector.errors import InputError, UnitError
from selector.inputs.spec import spec_from_dict
from selector.outputs.studies import render_tradeoff
from selector.pipeline.selection import select
from selector.pipeline.tradeoff import (
    _front_any,
    exchange_ranges,
    pareto_front,
    pareto_table,
    penalty,
    tradeoff_report,
)
from tests.conftest import make_table

POUND = 0.45359237  # kg per lb, exact by definition (international yard and pound, 1959)


def brute_front(values: np.ndarray) -> np.ndarray:
    """O(n²) reference: row i is on the front unless some row is ≤ everywhere and < somewhere."""
    n = len(values)
    usable = ~np.isnan(values).any(axis=1)
    out = np.zeros(n, dtype=bool)
    for i in range(n):
        if not usable[i]:
            continue
        out[i] = not any(
            usable[j] and np.all(values[j] <= values[i]) and np.any(values[j] < values[i]) for j in range(n)
        )
    return out


small_ints = st.integers(min_value=0, max_value=4).map(float)  # few values: many ties and duplicates
specials = st.sampled_from([0.0, 1.0, 2.0, math.inf, -math.inf, math.nan])


@settings(max_examples=300, deadline=None)
@given(
    st.integers(1, 4).flatmap(
        lambda k: arrays(float, st.tuples(st.integers(0, 40), st.just(k)), elements=small_ints)
    )
)
def test_front_matches_brute_force_with_ties_and_duplicates(values):
    assert np.array_equal(pareto_front(values), brute_front(values))


@settings(max_examples=150, deadline=None)
@given(
    st.integers(2, 3).flatmap(
        lambda k: arrays(float, st.tuples(st.integers(0, 25), st.just(k)), elements=specials)
    )
)
def test_front_with_infinities_and_nan_matches_brute_force(values):
    # NaN rows are left off the front and dominate nothing; ±inf compare as numbers.
    assert np.array_equal(pareto_front(values), brute_front(values))


@settings(max_examples=100, deadline=None)
@given(
    arrays(
        float,
        st.tuples(st.integers(1, 300), st.just(2)),
        elements=st.floats(-1e6, 1e6, allow_nan=False, allow_subnormal=False),
    )
)
def test_two_objective_fast_path_agrees_with_the_general_method(values):
    assert np.array_equal(pareto_front(values), _front_any(values))


def test_front_of_a_hand_drawn_set():
    # (mass, cost): (1, 9) and (3, 2) are best in one objective each; (2, 5) sits between;
    # (2, 6) is beaten by (2, 5); (4, 2) by (3, 2); the duplicate (3, 2) stays.
    values = np.array([[1, 9], [2, 5], [2, 6], [3, 2], [4, 2], [3, 2]], dtype=float)
    assert pareto_front(values).tolist() == [True, True, False, True, False, True]


def test_front_rejects_a_flat_array():
    with pytest.raises(ValueError, match="shape"):
        pareto_front(np.array([1.0, 2.0]))


def _sized_table(rows: list[tuple[str, float, float, float]]) -> pd.DataFrame:
    """A ranked table of sized parts from (id, mass [kg], cost [USD], co2 [kg CO2e]) rows."""
    return pd.DataFrame(
        {
            "id": [r[0] for r in rows],
            "name": [r[0] for r in rows],
            "family": "metal",
            "rank": pd.array(range(1, len(rows) + 1), dtype="Int64"),
            "mass": [r[1] for r in rows],
            "cost": [r[2] for r in rows],
            "co2": [r[3] for r in rows],
            "volume": [r[1] / 1000 for r in rows],
        }
    )


def test_penalty_ranking_worked_by_hand():
    # Exchange constants α_mass = 8 USD/kg and α_co2 = 0.5 USD/kg CO2e:
    #   A: Z = 10 + 8·2 + 0.5·8  = 30
    #   B: Z = 30 + 8·1 + 0.5·4  = 40
    #   C: Z =  5 + 8·4 + 0.5·20 = 47
    table = _sized_table([("A", 2.0, 10.0, 8.0), ("B", 1.0, 30.0, 4.0), ("C", 4.0, 5.0, 20.0)])
    out = penalty(table, {"mass": 8.0, "co2": 0.5})
    assert out["id"].tolist() == ["A", "B", "C"]
    assert out["penalty"].tolist() == pytest.approx([30.0, 40.0, 47.0])
    assert out["penalty_rank"].tolist() == [1, 2, 3]


def test_penalty_without_constants_is_cost_and_ties_share_a_rank():
    table = _sized_table([("A", 2.0, 10.0, 8.0), ("B", 1.0, 30.0, 4.0), ("C", 4.0, 5.0, 20.0)])
    # α = 0: Z = cost → C (5), A (10), B (30).
    assert penalty(table, {})["id"].tolist() == ["C", "A", "B"]
    # α_mass = 20 USD/kg: A = 10 + 40 = 50, B = 30 + 20 = 50 (tied), C = 5 + 80 = 85.
    out = penalty(table, {"mass": 20.0}).set_index("id")
    assert out.loc["A", "penalty"] == pytest.approx(50.0)
    assert out.loc["B", "penalty"] == pytest.approx(50.0)
    assert (out.loc["A", "penalty_rank"], out.loc["B", "penalty_rank"], out.loc["C", "penalty_rank"]) == (
        1,
        1,
        3,
    )


def test_penalty_reads_constants_with_units():
    table = _sized_table([("A", 2.0, 10.0, 8.0), ("B", 1.0, 30.0, 4.0)])
    # 4 USD/lb = 4 / 0.45359237 USD/kg = 8.8185 USD/kg.
    out = penalty(table, {"mass": "4 USD/lb"}).set_index("id")
    assert out.loc["A", "penalty"] == pytest.approx(10 + 2 * 4 / POUND)
    wrong = r"exchange\.mass: got '4 USD', a cost \(USD …\); expected a price per mass"
    with pytest.raises(UnitError, match=wrong):
        penalty(table, {"mass": "4 USD"})


@pytest.mark.parametrize(
    ("exchange", "message"),
    [
        ({"weight": 3.0}, r"exchange.weight: 'weight' cannot be priced"),
        ({"cost": 1.0}, r"exchange.cost: 'cost' cannot be priced"),
        (
            {"mass": -1.0},
            r"exchange.mass: -1.0 is not a usable exchange constant; a finite value of zero or more",
        ),
        ({"mass": math.inf}, r"not a usable exchange constant"),
        ({"mass": None}, r"None is not an exchange constant"),
    ],
)
def test_penalty_rejects_bad_constants(exchange, message):
    table = _sized_table([("A", 2.0, 10.0, 8.0)])
    with pytest.raises(InputError, match=message):
        penalty(table, exchange)


def test_exchange_ranges_worked_by_hand():
    # Front points (mass [kg], cost [USD]): A (1, 10), B (2, 5), C (3, 4), D (4, 1); E (3, 7) is
    # beaten by B. Slopes between neighbours: A→B −5, B→C −1, C→D −3, so C lies above the
    # lower convex hull A–B–D. Z = cost + α·mass changes leader at
    #   α(A,B) = (10 − 5)/(2 − 1) = 5 USD/kg and α(B,D) = (5 − 1)/(4 − 2) = 2 USD/kg.
    # A is best for α ≥ 5, B for 2 ≤ α ≤ 5, D for 0 ≤ α ≤ 2, C never
    # (e.g. α = 3: A 13, B 11, C 13, D 13).
    table = _sized_table([("A", 1, 10, 0), ("B", 2, 5, 0), ("C", 3, 4, 0), ("D", 4, 1, 0), ("E", 3, 7, 0)])
    out = exchange_ranges(table, x="mass", y="cost").set_index("id")
    assert list(out.index) == ["A", "B", "C", "D"]
    assert out.loc["A", "alpha_low"] == pytest.approx(5.0)
    assert out.loc["A", "alpha_high"] == math.inf
    assert (out.loc["B", "alpha_low"], out.loc["B", "alpha_high"]) == pytest.approx((2.0, 5.0))
    assert (out.loc["D", "alpha_low"], out.loc["D", "alpha_high"]) == pytest.approx((0.0, 2.0))
    assert math.isnan(out.loc["C", "alpha_low"]) and math.isnan(out.loc["C", "alpha_high"])
    assert not out.loc["C", "on_hull"]
    assert "never best" in out.loc["C", "note"]
    assert set(out["alpha_unit"]) == {"USD/kg"}


def test_exchange_ranges_collinear_and_duplicate_members():
    # B (2, 5) and D (4, 1) with F (3, 3) halfway on the segment between them: F ties with both
    # at α = (5 − 1)/(4 − 2) = 2 USD/kg and is best nowhere else. G duplicates D and shares its range.
    table = _sized_table([("B", 2, 5, 0), ("F", 3, 3, 0), ("D", 4, 1, 0), ("G", 4, 1, 0)])
    out = exchange_ranges(table).set_index("id")
    assert (out.loc["F", "alpha_low"], out.loc["F", "alpha_high"]) == pytest.approx((2.0, 2.0))
    assert out.loc["F", "on_hull"]
    assert (out.loc["B", "alpha_low"], out.loc["B", "alpha_high"]) == (pytest.approx(2.0), math.inf)
    for member in ("D", "G"):
        assert (out.loc[member, "alpha_low"], out.loc[member, "alpha_high"]) == pytest.approx((0.0, 2.0))


@settings(max_examples=150, deadline=None)
@given(
    st.lists(st.tuples(st.integers(1, 30), st.integers(1, 30)), min_size=1, max_size=25),
    st.floats(0, 40, allow_nan=False),
)
def test_the_penalty_leader_lies_in_its_exchange_range(points, alpha):
    # Whatever α is chosen, the candidate with the lowest Z = cost + α·mass is a front member
    # whose range holds α (checked on integer data, so ties are frequent).
    table = _sized_table([(f"c{i}", float(m), float(c), 0.0) for i, (m, c) in enumerate(points)])
    z = table["cost"] + alpha * table["mass"]
    best = set(table.loc[np.isclose(z, z.min(), rtol=1e-12, atol=1e-12), "id"])
    ranges = exchange_ranges(table).set_index("id")
    holding = {i for i, r in ranges.iterrows() if r["alpha_low"] - 1e-9 <= alpha <= r["alpha_high"] + 1e-9}
    assert holding, "some front member must be best at every α ≥ 0"
    assert holding <= best


def test_pareto_table_with_an_index_maximised():
    # Lower mass and higher index are better: P (1 kg, index 5) and Q (3 kg, index 9) trade off;
    # R (3 kg, index 4) is beaten by both.
    table = _sized_table([("P", 1, 0, 0), ("Q", 3, 0, 0), ("R", 3, 0, 0)])
    table["index"] = [5.0, 9.0, 4.0]
    out = pareto_table(table, ("mass", "index")).set_index("id")
    assert out["on_front"].to_dict() == {"P": True, "Q": True, "R": False}


def test_three_objectives_and_objective_errors():
    table = _sized_table([("A", 1, 3, 2), ("B", 2, 1, 3), ("C", 3, 2, 1), ("D", 3, 3, 3)])
    out = pareto_table(table, ("mass", "cost", "co2")).set_index("id")
    assert out["on_front"].to_dict() == {"A": True, "B": True, "C": True, "D": False}
    with pytest.raises(InputError, match="two or three objectives"):
        pareto_table(table, ("mass",))
    with pytest.raises(InputError, match="given twice"):
        pareto_table(table, ("mass", "mass"))
    with pytest.raises(InputError, match=r"'mas' is not an objective; did you mean 'mass'\?"):
        pareto_table(table, ("mas", "cost"))


BEAM = {"function": "beam", "support": "cantilever", "load": "end"}
CLASSES = [
    # Invented demo classes (not real materials).
    {"id": "light", "E": (70, 70), "rho": (1500, 1500), "price": (30, 30)},
    {"id": "cheap", "E": (200, 200), "rho": (7800, 7800), "price": (0.8, 0.8)},
    {"id": "middle", "E": (70, 70), "rho": (2700, 2700), "price": (3, 3)},
    {"id": "poor", "E": (3, 3), "rho": (1200, 1200), "price": (40, 40)},
]


def _sized_selection(objective: str = "mass"):
    spec = spec_from_dict(
        {
            "title": "tradeoff test beam",
            "part": {**BEAM, "length": "1 m", "force": "100 N"},
            "section": {"shape": "rectangle", "free": "scale", "b": "20 mm", "h": "40 mm"},
            "objective": {"minimize": objective},
            "constraint": [{"type": "stiffness", "max_deflection": "5 mm"}],
        }
    )
    return select(spec, make_table(CLASSES))


def test_tradeoff_report_on_a_real_selection():
    sel = _sized_selection()
    front, ranges = tradeoff_report(sel, "cost")
    table = sel.shortlist
    values = table[["mass", "cost"]].to_numpy(dtype=float)
    expected = set(table.loc[brute_front(values), "id"])
    assert set(front["id"]) == expected == set(ranges["id"])
    assert "poor" not in expected
    # With α = 40 USD/kg, the penalty equals cost + 40·mass of each sized part.
    front2, ranked = tradeoff_report(sel, "cost", "40 USD/kg")
    assert front2.equals(front)
    by_id = table.set_index("id")
    for _, row in ranked.iterrows():
        assert row["penalty"] == pytest.approx(
            by_id.loc[row["id"], "cost"] + 40 * by_id.loc[row["id"], "mass"]
        )
    assert ranked["on_front"].sum() == len(front)
    # The best by penalty is the front member whose range holds 40 USD/kg.
    best = ranked["id"].iat[0]
    r = ranges.set_index("id").loc[best]
    assert r["alpha_low"] <= 40 <= r["alpha_high"]


def test_tradeoff_report_when_ranked_by_cost():
    front, ranges = tradeoff_report(_sized_selection("cost"), "mass")
    assert set(ranges["alpha_unit"]) == {"USD/kg"}  # mass is still priced in USD
    assert len(front) == len(ranges)


def test_tradeoff_report_errors():
    sel = _sized_selection()
    with pytest.raises(InputError, match="already ranked by mass"):
        tradeoff_report(sel, "mass")
    with pytest.raises(InputError, match=r"'cots' is not an objective; did you mean 'cost'\?"):
        tradeoff_report(sel, "cots")
    with pytest.raises(
        UnitError,
        match=r"--exchange: got '40 USD', a cost \(USD …\); expected a price per mass \(USD/kg, USD/lb …\)",
    ):
        tradeoff_report(sel, "cost", "40 USD")
    with pytest.raises(InputError, match="--exchange: '-3 USD/kg' is not a usable exchange constant"):
        tradeoff_report(sel, "cost", "-3 USD/kg")
    with pytest.raises(InputError, match="neither mass nor co2 is cost"):
        tradeoff_report(sel, "co2", "40 USD/kg")
    unsized = select(
        spec_from_dict({"title": "t", "part": BEAM, "constraint": [{"type": "stiffness"}]}),
        make_table(CLASSES),
    )
    with pytest.raises(InputError, match="parts are not sized"):
        tradeoff_report(unsized, "cost")
    with pytest.raises(InputError, match="'mass' needs sized parts"):
        pareto_table(unsized, ("mass", "index"))


def test_render_tradeoff_formats():
    sel = _sized_selection()
    front, ranges = tradeoff_report(sel, "cost")
    text = render_tradeoff(front, ranges, "table")
    assert "Pareto front (mass vs cost" in text and "alpha_low" in text and "USD/kg" in text
    doc = json.loads(render_tradeoff(front, ranges, "json"))
    assert {r["id"] for r in doc["front"]} == set(front["id"])
    assert doc["ranges"][0]["mass"]["unit"] == "kg"
    parsed = pd.read_csv(io.StringIO(render_tradeoff(front, ranges, "csv")))
    assert list(parsed["id"]) == list(ranges["id"])
    _, ranked = tradeoff_report(sel, "cost", "40 USD/kg")
    md = render_tradeoff(front, ranked, "md", exchange=40.0)
    assert "penalty [USD]" in md and "α = 40 USD/kg" in md
    # 40 USD/kg × 0.45359237 kg/lb = 18.14 USD/lb (NIST SP 811: 1 lb = 0.45359237 kg exactly)
    us = render_tradeoff(front, ranked, "table", exchange=40.0, units="us")
    assert "α = 18.1 USD/lb" in us and "USD/kg" not in us

"""Robustness: Monte Carlo odds over property ranges, sampling, sensitivity."""

from __future__ import annotations

import io
import json
import math

import numpy as np
import pandas as pd
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy import integrate, stats

from selector.errors import InputError
from selector.inputs.spec import spec_from_dict
from selector.outputs.studies import render_robustness
from selector.pipeline.robust import (
    DEFAULT_SEED,
    DISTRIBUTIONS,
    robustness,
    sample,
    sensitivity,
)
from selector.pipeline.screen import apply_screens, parse_screens, screen_mask
from selector.pipeline.selection import design_of, select
from selector.pipeline.sizing import objective_samples
from tests.conftest import make_table

MC_SIGMAS = 4.0
"""Monte Carlo checks allow this many standard errors (common practice, no source)."""


def within_mc(p: float, expected: float, draws: int) -> bool:
    se = math.sqrt(max(expected * (1 - expected), 1e-12) / draws)
    return abs(p - expected) <= MC_SIGMAS * se


def _index_selection(rows):
    """Rank by the tie's stiffness index E/ρ (no loads given, so nothing is sized)."""
    spec = spec_from_dict(
        {"title": "robust tie", "part": {"function": "tie"}, "constraint": [{"type": "stiffness"}]}
    )
    return select(spec, make_table(rows))


def _beam_selection(rows, constraints=None, section=None, objective="mass"):
    spec = spec_from_dict(
        {
            "title": "robust beam",
            "part": {
                "function": "beam",
                "support": "cantilever",
                "load": "end",
                "length": "1 m",
                "force": "100 N",
            },
            "section": section or {"shape": "rectangle", "free": "scale", "b": "20 mm", "h": "40 mm"},
            "objective": {"minimize": objective},
            "constraint": constraints or [{"type": "stiffness", "max_deflection": "5 mm"}],
        }
    )
    return select(spec, make_table(rows))


def _p(result, class_id: str, column: str = "p_best") -> float:
    return float(result.table.set_index("id").loc[class_id, column])


# Two classes whose index E/ρ differs only through E: E_A in [1, 4] GPa, E_B in [2, 8] GPa.
PAIR = [{"id": "A", "E": (1, 4), "rho": (1000, 1000)}, {"id": "B", "E": (2, 8), "rho": (1000, 1000)}]


def _p_a_beats_b(dist_a, dist_b, lo, hi) -> float:
    """P(X_A > X_B) = ∫ f_A(x) F_B(x) dx, by scipy quadrature."""
    value, _ = integrate.quad(lambda x: dist_a.pdf(x) * dist_b.cdf(x), lo, hi)
    return value


@pytest.mark.parametrize(
    ("distribution", "expected"),
    [
        # In units of ln 2, ln E_A ~ U(0, 2) and ln E_B ~ U(1, 3):
        # P(A > B) = ∫₁² (a − 1)/2 · ½ da = 1/8 (worked here).
        ("log-uniform", _p_a_beats_b(stats.loguniform(1, 4), stats.loguniform(2, 8), 1, 4)),
        # Symmetric triangles: ln E_A = 1 + S, ln E_B = 2 + T, S − T is the sum of four U(−½, ½),
        # an Irwin–Hall(4) shifted by −2; P(S − T > 1) = P(IH₄ < 1) = 1/4! = 1/24 (worked here).
        (
            "triangular",
            _p_a_beats_b(
                stats.triang(0.5, loc=0, scale=math.log(4)),
                stats.triang(0.5, loc=math.log(2), scale=math.log(4)),
                0,
                math.log(4),
            ),
        ),
    ],
)
def test_odds_of_two_overlapping_classes_match_the_closed_form(distribution, expected):
    exact = {"log-uniform": 1 / 8, "triangular": 1 / 24}[distribution]
    assert expected == pytest.approx(exact, rel=1e-6)  # scipy quadrature agrees with the hand result
    draws = 20_000
    result = robustness(_index_selection(PAIR), draws=draws, distribution=distribution)
    assert within_mc(_p(result, "A"), exact, draws)
    assert within_mc(_p(result, "B"), 1 - exact, draws)
    assert _p(result, "A") + _p(result, "B") == pytest.approx(1.0)
    assert _p(result, "A", "p_best_se") == pytest.approx(
        math.sqrt(_p(result, "A") * (1 - _p(result, "A")) / draws)
    )


def test_log_normal_odds_unclipped():
    # ln E_A ~ N(ln 2, (ln 2 / 2)²), ln E_B ~ N(ln 4, (ln 2 / 2)²): the ranges are ±2σ.
    # ln E_A − ln E_B ~ N(−ln 2, ln²2 / 2) → P(A > B) = Φ(−√2) ≈ 0.0786 (scipy's normal CDF).
    expected = stats.norm.cdf(-math.sqrt(2))
    draws = 20_000
    result = robustness(_index_selection(PAIR), draws=draws, distribution="log-normal", clip=False)
    assert within_mc(_p(result, "A"), expected, draws)


def test_rank_percentiles_of_the_pair():
    # P(A first) = 1/8: A's rank is 1 in 12.5 % of draws, so its 5th percentile is 1 and its median
    # and 95th percentile are 2; B is first 87.5 % of the time: 1, 1 and 2.
    result = robustness(_index_selection(PAIR), draws=20_000).table.set_index("id")
    assert result.loc["A", ["rank_p05", "rank_p50", "rank_p95"]].tolist() == [1, 2, 2]
    assert result.loc["B", ["rank_p05", "rank_p50", "rank_p95"]].tolist() == [1, 1, 2]
    assert result.loc["A", "p_top_k"] == 1.0  # two candidates are always in the top 3


DOMINANT_AND_TWINS = [
    # Invented demo classes. "lead" beats every other class at every point of its ranges.
    {"id": "lead", "E": (200, 220), "rho": (1000, 1100)},
    {"id": "twin1", "E": (40, 80), "rho": (2000, 2600)},
    {"id": "twin2", "E": (40, 80), "rho": (2000, 2600)},
    {"id": "far", "E": (1, 2), "rho": (5000, 6000)},
]


@pytest.mark.parametrize("distribution", DISTRIBUTIONS)
def test_dominant_candidate_and_identical_twins_by_index(distribution):
    draws = 10_000
    result = robustness(_index_selection(DOMINANT_AND_TWINS), draws=draws, distribution=distribution)
    assert _p(result, "lead") == 1.0
    assert _p(result, "lead", "rank_p95") == 1
    # The twins share rank 2 and 3 evenly: P(twin1 is 2nd) ≈ 0.5, shown by its median rank
    # and by its chance of being in the top 2.
    top2 = robustness(_index_selection(DOMINANT_AND_TWINS), draws=draws, distribution=distribution, top_k=2)
    assert within_mc(_p(top2, "twin1", "p_top_k"), 0.5, draws)
    assert within_mc(_p(top2, "twin2", "p_top_k"), 0.5, draws)
    assert result.leader == "lead"


def test_identical_twins_share_the_lead_evenly():
    draws = 10_000
    twins = [row for row in DOMINANT_AND_TWINS if row["id"] != "lead"]
    result = robustness(_index_selection(twins), draws=draws)
    assert within_mc(_p(result, "twin1"), 0.5, draws)
    assert within_mc(_p(result, "twin2"), 0.5, draws)
    assert _p(result, "far") == 0.0


def test_exact_ties_are_broken_at_random():
    # Point-valued identical classes tie in every draw; each should be first half of the time.
    draws = 10_000
    rows = [{"id": "p", "E": (50, 50), "rho": (1000, 1000)}, {"id": "q", "E": (50, 50), "rho": (1000, 1000)}]
    result = robustness(_index_selection(rows), draws=draws)
    assert within_mc(_p(result, "p"), 0.5, draws)
    assert _p(result, "p") + _p(result, "q") == pytest.approx(1.0)


def test_dominant_candidate_and_twins_by_sized_mass():
    draws = 10_000
    result = robustness(_beam_selection(DOMINANT_AND_TWINS), draws=draws)
    assert result.ranked_by == "mass"
    assert result.properties == ("E", "rho")
    assert _p(result, "lead") == 1.0
    top2 = robustness(_beam_selection(DOMINANT_AND_TWINS), draws=draws, top_k=2)
    assert within_mc(_p(top2, "twin1", "p_top_k"), 0.5, draws)


def test_same_seed_same_result_and_two_seeds_agree_within_error():
    # The twins share the lead and A or B takes third place: every odd is uncertain.
    sel = _index_selection([row for row in DOMINANT_AND_TWINS if row["id"] != "lead"] + PAIR)
    a = robustness(sel, draws=5_000, seed=11)
    b = robustness(sel, draws=5_000, seed=11)
    pd.testing.assert_frame_equal(a.table, b.table)
    c = robustness(sel, draws=5_000, seed=12).table.set_index("id")
    first = a.table.set_index("id")
    assert not first["p_best"].equals(c.loc[first.index, "p_best"])  # the seed does change the draws
    assert 0.3 < first.loc["twin1", "p_best"] < 0.7 and 0.05 < first.loc["A", "p_top_k"] < 0.95
    for cid in first.index:
        for col in ("p_best", "p_top_k"):
            p1, p2 = first.loc[cid, col], c.loc[cid, col]
            se = math.sqrt(first.loc[cid, f"{col}_se"] ** 2 + c.loc[cid, f"{col}_se"] ** 2)
            assert abs(p1 - p2) <= MC_SIGMAS * se + 1e-12
    assert robustness(sel, draws=200).seed == DEFAULT_SEED


def test_point_ranges_reproduce_the_sized_ranking_even_for_thin_wall_models():
    # With every range a point, each draw is the typical case, so the Monte Carlo ranks must be
    # the shortlist's ranks, including where the closed form is only approximate (free wall).
    rows = [
        {"id": f"m{i}", "E": (e, e), "rho": (r, r), "sigma_y": (s, s), "sigma_ts": (s, s)}
        for i, (e, r, s) in enumerate([(70, 2700, 250), (200, 7800, 350), (3, 1200, 60), (45, 1800, 200)])
    ]
    section = {"shape": "tube", "free": "wall", "d": "40 mm", "t": "2 mm"}
    constraints = [
        {"type": "stiffness", "max_deflection": "5 mm"},
        {"type": "strength", "safety_factor": 1.5},
    ]
    sel = _beam_selection(rows, constraints, section)
    result = robustness(sel, draws=50).table.set_index("id")
    expected = sel.shortlist.set_index("id")["rank"]
    assert (result.loc[expected.index, "rank_p05"] == expected.astype(int)).all()
    assert (result.loc[expected.index, "rank_p95"] == expected.astype(int)).all()


def test_objective_samples_is_the_governing_closed_form_objective():
    # Rectangle at fixed proportions: the closed form is exact, so at typical properties it equals
    # the sized mass, and the governing constraint (stiffness or strength, whichever needs more
    # material) is the larger of the two closed-form values.
    rows = [
        {"id": "stiff", "E": (200, 200), "rho": (7800, 7800), "sigma_y": (20, 20), "sigma_ts": (30, 30)},
        {"id": "strong", "E": (5, 5), "rho": (1500, 1500), "sigma_y": (900, 900), "sigma_ts": (1000, 1000)},
    ]
    constraints = [
        {"type": "stiffness", "max_deflection": "5 mm"},
        {"type": "strength", "safety_factor": 1.5},
    ]
    sel = _beam_selection(rows, constraints)
    table = sel.shortlist
    design = design_of(sel.spec, sel.spec.section.shape)
    props = {
        s: table[f"{s}_low"].to_numpy(float) * f for s, f in (("E", 1e9), ("rho", 1.0), ("sigma_y", 1e6))
    }
    got = objective_samples(list(sel.derivations), design, props)
    assert got == pytest.approx(table["mass"].to_numpy(float), rel=1e-9)
    assert set(table["governing"]) == {"stiffness", "strength"}
    # Broadcasting over a draws axis gives the same numbers in every draw.
    stacked = objective_samples(
        list(sel.derivations), design, {k: np.tile(v, (3, 1)) for k, v in props.items()}
    )
    assert stacked.shape == (3, 2) and np.allclose(stacked, got, rtol=1e-12)


def test_only_ranked_candidates_take_part():
    spec = spec_from_dict(
        {
            "title": "t",
            "part": {"function": "tie"},
            "constraint": [{"type": "stiffness"}],
            "screen": {"E": ">= 10 GPa"},
        }
    )
    result = robustness(select(spec, make_table(DOMINANT_AND_TWINS)), draws=500)
    assert "far" not in set(result.table["id"])
    assert result.table["p_best"].sum() == pytest.approx(1.0)


def test_sensitivity_names_the_property_that_unsettles_the_leader():
    # Only E overlaps between the leader and the runner-up; the third class's density range is
    # wide but far from the lead, so scattering ρ alone never changes who is first.
    rows = [
        {"id": "L", "E": (90, 110), "rho": (1000, 1000)},
        {"id": "R", "E": (80, 105), "rho": (1000, 1000)},
        {"id": "S", "E": (10, 10), "rho": (500, 2000)},
    ]
    out = sensitivity(_index_selection(rows), draws=4_000)
    assert out["property"].tolist() == ["E", "rho"]
    assert set(out["leader"]) == {"L"}
    by = out.set_index("property")
    assert by.loc["E", "p_best_drop"] > 0.1
    assert by.loc["rho", "p_best_drop"] == 0.0
    assert by.loc["rho", "leader_rank_sd"] == 0.0
    assert len(sensitivity(_index_selection(rows), draws=500, top=1)) == 1


@pytest.mark.parametrize(
    ("kwargs", "message"),
    [
        ({"draws": 0}, "--robust: 0 draws; a whole number of draws of 1 or more"),
        ({"draws": 2.5}, "--robust: 2.5 draws"),
        ({"seed": -1}, "--seed: -1 is not a seed"),
        ({"distribution": "lognormal"}, r"'lognormal' is not a distribution; did you mean 'log-normal'\?"),
        ({"top_k": 0}, "top_k: 0"),
    ],
)
def test_bad_options_are_clear(kwargs, message):
    with pytest.raises(InputError, match=message):
        robustness(_index_selection(PAIR), **kwargs)


def test_a_range_that_cannot_be_sampled_names_the_class():
    table = make_table(PAIR)
    table.loc[0, "E_low"] = 9.0  # low above high
    spec = spec_from_dict({"title": "t", "part": {"function": "tie"}, "constraint": [{"type": "stiffness"}]})
    sel = select(spec, table)
    with pytest.raises(InputError, match=r"class A: E_low, E_high: range 9.0–4.0 cannot be sampled"):
        robustness(sel, draws=10)


def test_render_robustness_formats():
    sel = _index_selection(DOMINANT_AND_TWINS)
    result = robustness(sel, draws=1_000)
    text = render_robustness(result, "table", sensitivity(sel, draws=500))
    assert "1000 draws, log-uniform, seed 20261202; higher merit index is better" in text
    assert "p_top_3" in text and "Sensitivity of the leader (lead)" in text
    doc = json.loads(render_robustness(result, "json"))
    assert doc["seed"] == DEFAULT_SEED and doc["candidates"][0]["id"] == "lead"
    parsed = pd.read_csv(io.StringIO(render_robustness(result, "csv")))
    assert parsed["id"].tolist() == result.table["id"].tolist()


def test_no_ranked_candidates_gives_an_empty_result():
    spec = spec_from_dict(
        {
            "title": "t",
            "part": {"function": "tie"},
            "constraint": [{"type": "stiffness"}],
            "screen": {"E": ">= 5000 GPa"},
        }
    )
    sel = select(spec, make_table(PAIR))
    result = robustness(sel, draws=100)
    assert result.table.empty and result.leader is None
    assert "no ranked candidates" in render_robustness(result, "table")
    assert sensitivity(sel, draws=100).empty


# --- sampling -----------------------------------------------------------------------------------

positive_ranges = st.lists(st.tuples(st.floats(1e-3, 1e3), st.floats(1.0, 1e3)), min_size=1, max_size=5).map(
    lambda pairs: (np.array([lo for lo, _ in pairs]), np.array([lo * r for lo, r in pairs]))
)
linear_ranges = st.lists(st.tuples(st.floats(-100, 100), st.floats(0.0, 100)), min_size=1, max_size=5).map(
    lambda pairs: (np.array([lo for lo, _ in pairs]), np.array([lo + w for lo, w in pairs]))
)


@settings(max_examples=60, deadline=None)
@given(positive_ranges, st.sampled_from(DISTRIBUTIONS), st.integers(0, 2**32 - 1))
def test_log_scale_draws_stay_in_range(ranges, distribution, seed):
    low, high = ranges
    x = sample(low, high, 300, np.random.default_rng(seed), distribution, log=True, clip=True)
    assert x.shape == (300, len(low))
    assert np.all(x >= low) and np.all(x <= high)


@settings(max_examples=60, deadline=None)
@given(linear_ranges, st.sampled_from(DISTRIBUTIONS), st.integers(0, 2**32 - 1))
def test_linear_scale_draws_stay_in_range(ranges, distribution, seed):
    low, high = ranges
    x = sample(low, high, 300, np.random.default_rng(seed), distribution, log=False, clip=True)
    assert np.all(x >= low) and np.all(x <= high)


def test_clipped_log_normal_piles_the_tails_on_the_ends():
    # ±2σ covers Φ(2) − Φ(−2) ≈ 95.45 %; each tail, Φ(−2) ≈ 2.275 %, is set to the end (scipy normal CDF).
    draws = 40_000
    x = sample(np.array([2.0]), np.array([50.0]), draws, np.random.default_rng(5), "log-normal", clip=True)[
        :, 0
    ]
    tail = stats.norm.cdf(-2)
    assert within_mc(float(np.mean(x == 2.0)), tail, draws)
    assert within_mc(float(np.mean(x == 50.0)), tail, draws)


def test_unclipped_log_normal_has_the_stated_quantiles():
    draws = 40_000
    low, high = np.array([2.0, 0.5]), np.array([50.0, 0.5 * 1e4])
    x = sample(low, high, draws, np.random.default_rng(6), "log-normal", clip=False)
    inside = stats.norm.cdf(2) - stats.norm.cdf(-2)
    for j in range(2):
        assert within_mc(float(np.mean((x[:, j] >= low[j]) & (x[:, j] <= high[j]))), inside, draws)
        assert within_mc(
            float(np.mean(x[:, j] < math.sqrt(low[j] * high[j]))), 0.5, draws
        )  # median = geometric mean
    assert x.min() < low.min()  # unclipped draws do leave the range


LOG_REFERENCES = {
    # The distribution of ln x for a range [3, 300], as scipy distributions.
    "log-uniform": stats.uniform(loc=math.log(3), scale=math.log(100)),
    "triangular": stats.triang(0.5, loc=math.log(3), scale=math.log(100)),
    "log-normal": stats.norm(loc=math.log(30), scale=math.log(100) / 4),
}


@pytest.mark.parametrize("distribution", DISTRIBUTIONS)
def test_draws_follow_the_stated_distribution(distribution):
    # Kolmogorov–Smirnov test of ln x against scipy's distribution at a fixed seed (p > 0.001).
    x = sample(np.array([3.0]), np.array([300.0]), 5_000, np.random.default_rng(7), distribution, clip=False)
    assert stats.kstest(np.log(x[:, 0]), LOG_REFERENCES[distribution].cdf).pvalue > 1e-3


# --- vectorised screening used by the benchmarks ------------------------------------------------


@settings(max_examples=60, deadline=None)
@given(
    st.lists(
        st.tuples(
            st.floats(0.5, 300),
            st.floats(1.0, 3.0),
            st.sampled_from(["metal", "polymer", "foam"]),
            st.sampled_from(["poor", "fair", "good", "excellent"]),
            st.booleans(),
        ),
        min_size=1,
        max_size=12,
    ),
    st.floats(1.0, 400.0),
)
def test_screen_mask_matches_apply_screens(rows, limit):
    table = make_table(
        [
            {"id": f"c{i}", "E": (e, e * r), "family": fam, "uv": uv, "sigma_y": (5.0, 5.0 * r)}
            for i, (e, r, fam, uv, _) in enumerate(rows)
        ]
    )
    for i, (*_, missing) in enumerate(rows):
        if missing:
            table.loc[i, "sigma_y_low"] = np.nan
    screens = parse_screens(
        {
            "E": f">= {limit} GPa",
            "sigma_y": "<= 12 MPa",
            "uv": ">= good",
            "exclude_families": ["foam"],
            "exclude": ["c0"],
        }
    )
    assert screen_mask(table, screens).tolist() == apply_screens(table, screens)["status"].tolist()

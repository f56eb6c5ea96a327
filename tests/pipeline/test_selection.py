"""The pipeline end to end on edge cases a user can reach."""

from __future__ import annotations

import pytest

from selector.errors import InputError
from selector.inputs.spec import spec_from_dict
from selector.pipeline.robust import robustness
from selector.pipeline.selection import select
from tests.conftest import make_table

TABLE = make_table(
    [
        {"id": "stiff", "E": (200, 210), "rho": (7800, 7900)},
        {"id": "light", "E": (10, 12), "rho": (400, 500), "family": "natural"},
        {"id": "hot", "E": (70, 72), "rho": (2700, 2800), "T_max": (300, 400)},
    ]
)


def test_typed_index_without_constraints_ranks_and_is_robust():
    spec = spec_from_dict({"title": "typed", "part": {"function": "beam"}, "index": "E/rho"})
    selection = select(spec, TABLE)
    # E/ρ by hand: stiff ≈ 205/7850 = 0.0261, light ≈ 11/450 = 0.0244, hot ≈ 71/2750 = 0.0258
    assert selection.shortlist["id"].tolist() == ["stiff", "hot", "light"]
    result = robustness(selection, draws=400, seed=1)
    assert set(result.table["id"]) == {"stiff", "hot", "light"}
    assert result.table["p_best"].sum() == pytest.approx(1.0)


def test_screens_that_reject_everything_give_an_empty_shortlist():
    spec = spec_from_dict(
        {
            "part": {"function": "beam", "support": "cantilever", "length": "1 m", "force": "100 N"},
            "constraint": [{"type": "stiffness", "max_deflection": "1 mm"}],
            "screen": {"T_max": ">= 5000 degC"},
        }
    )
    selection = select(spec, TABLE)
    assert selection.sized
    assert selection.shortlist.empty
    assert len(selection.rejected) == 3
    assert all(r for r in selection.rejected["reasons"])


def test_missing_loads_fall_back_to_index_ranking_with_a_note():
    spec = spec_from_dict(
        {
            "part": {"function": "beam", "support": "cantilever", "length": "1 m"},
            "constraint": [{"type": "stiffness", "max_deflection": "1 mm"}],
        }
    )
    selection = select(spec, TABLE)
    assert not selection.sized
    assert any("force" in n for n in selection.notes)


def test_free_none_checks_the_given_part():
    # Cantilever 1 m, 100 N, rectangle 20 × 40 mm: I = 20·40³/12 = 106 667 mm⁴ (worked by hand).
    # δ = F L³/(3 E I): "stiff" (E ≈ 205 GPa) 1.52 mm passes 2 mm; "hot" (E ≈ 71 GPa) 4.4 mm fails.
    spec = spec_from_dict(
        {
            "part": {"function": "beam", "support": "cantilever", "length": "1 m", "force": "100 N"},
            "section": {"shape": "rectangle", "free": "none", "b": "20 mm", "h": "40 mm"},
            "constraint": [{"type": "stiffness", "max_deflection": "2 mm"}],
        }
    )
    selection = select(spec, TABLE)
    table = selection.table.set_index("id")
    i = 0.02 * 0.04**3 / 12
    assert table.loc["stiff", "deflection"] == pytest.approx(100 / (3 * (200 * 210) ** 0.5 * 1e9 * i))
    assert table.loc["stiff", "status"] == "passes"
    assert table.loc["hot", "status"] == "rejected"
    assert any("fails stiffness" in r for r in table.loc["hot", "reasons"])


def test_free_none_needs_dimensions():
    spec = spec_from_dict(
        {
            "part": {"function": "beam", "length": "1 m", "force": "100 N"},
            "section": {"shape": "tube", "free": "none"},
            "constraint": [{"type": "stiffness", "max_deflection": "2 mm"}],
        }
    )
    with pytest.raises(InputError, match="'none' checks a given part, but no dimensions are given"):
        select(spec, TABLE)


@pytest.mark.parametrize(
    ("part", "section", "constraint", "message"),
    [
        (
            {},
            {},
            {"type": "stiffness", "max_deflection": "0 mm"},
            "constraint[0].max_deflection: '0 mm' must be a finite value above zero",
        ),
        (
            {"force": "-100 N"},
            {},
            {"type": "strength"},
            "part.force: '-100 N' must be a finite value above zero",
        ),
        (
            {},
            {"shape": "tube", "free": "depth"},
            {"type": "strength"},
            "section.free: free = 'depth' is sized for a rectangle, not a tube",
        ),
        (
            {},
            {"shape": "box", "free": "wall"},
            {"type": "strength"},
            "section.free: free = 'wall' is sized for a tube, not a box",
        ),
        (
            {},
            {"shape": "angle"},
            {"type": "strength"},
            "section.shape: an angle bends about inclined principal axes",
        ),
        (
            {},
            {"shape": "sandwich"},
            {"type": "strength"},
            "section.free: a sandwich is sized by both its thicknesses, not with free = 'scale'",
        ),
        (
            {},
            {"shape": "tube", "free": "none", "d": "40 mm"},
            {"type": "strength"},
            "section tube: t: no value given",
        ),
    ],
)
def test_specs_that_cannot_be_sized_are_refused_clearly(part, section, constraint, message):
    # A quantity out of range is refused as the spec loads ("spec: " names the source);
    # what only sizing can see, when the pipeline runs.
    with pytest.raises(InputError) as err:
        spec = spec_from_dict(
            {
                "part": {"function": "beam", "length": "1 m", "force": "100 N", **part},
                "section": section,
                "constraint": [constraint],
            }
        )
        select(spec, TABLE)
    assert str(err.value).removeprefix("spec: ").startswith(message)


def test_index_with_shape_multiplies_by_the_shape_limit():
    # Light stiff beam: (φ_max·E)^½/ρ = √φ_max · E^½/ρ; metal φ_max = 44 and natural 5 (Weaver & Ashby
    # 1997, from memory, as in shape_limits.py).
    spec = spec_from_dict(
        {
            "part": {"function": "beam", "support": "cantilever", "length": "1 m"},
            "constraint": [{"type": "stiffness", "max_deflection": "1 mm"}],
        }
    )
    table = select(spec, TABLE).table.set_index("id")
    assert table.loc["stiff", "index_with_shape"] == pytest.approx(44**0.5 * table.loc["stiff", "index"])
    assert table.loc["light", "index_with_shape"] == pytest.approx(5**0.5 * table.loc["light", "index"])

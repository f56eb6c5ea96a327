"""The report of a spec with fracture, fatigue and frequency constraints shows each one."""

from __future__ import annotations

from pathlib import Path

import pytest

from selector.api import run_spec
from selector.outputs import report
from tests.outputs.test_report import parse

EXAMPLES = Path(__file__).parents[2] / "examples"
LEVER = EXAMPLES / "bench-shear-lever.toml"  # strength, fracture, fatigue at R = 0, stiffness
ARM = EXAMPLES / "anemometer-arm.toml"  # stiffness, frequency, fatigue at R = -1


@pytest.fixture(scope="module")
def lever():
    selection = run_spec(LEVER)
    return selection, parse(report.build_report(selection, LEVER.read_text(encoding="utf-8"), LEVER.name))


@pytest.fixture(scope="module")
def arm():
    selection = run_spec(ARM)
    return selection, parse(report.build_report(selection, ARM.read_text(encoding="utf-8"), ARM.name))


def facts(page) -> dict[str, str]:
    return {row[0]: row[1] for row in page.tables["facts keep"]}


def test_summary_states_what_each_failure_mode_constraint_asks(lever, arm):
    on_lever, on_arm = facts(lever[1]), facts(arm[1])
    assert (
        on_lever["fracture constraint"] == "crack length a = 1 mm, geometry factor Y = 1.12, safety factor 2"
    )
    assert on_lever["fatigue constraint"] == "load ratio R = 0, Goodman line, safety factor 2"
    assert on_arm["fatigue constraint"] == "load ratio R = -1 (fully reversed), safety factor 2"
    # a frequency limit takes no safety factor, so none is printed beside it
    assert on_arm["frequency constraint"] == "lowest natural frequency 12 Hz"


@pytest.mark.parametrize(
    ("which", "constraint", "equation", "index"),
    [
        ("lever", "Fracture", "Y·σ·√(π·a) ≤ KIC/SF", "M = KIC2/3/(Cm·ρ)"),
        ("lever", "Fatigue", "σR = 2/((1−R)/σe + (1+R)/σts); R = 0", "M = σR2/3/(Cm·ρ)"),
        ("arm", "Frequency", "f", "M = E1/2/ρ"),
        ("arm", "Fatigue", "σa ≤ σe/SF fully reversed", "M = σe2/3/ρ"),
    ],
)
def test_derivation_shows_the_equation_and_index_of_each_new_constraint(
    lever, arm, which, constraint, equation, index
):
    selection, page = {"lever": lever, "arm": arm}[which]
    text = page.text("derivation")
    head = f"{constraint} constraint: minimise {selection.spec.objective.minimize}"
    assert head in text
    block = text[text.index(head) :]
    nxt = block.find(" constraint: minimise ", len(head))
    block = block if nxt < 0 else block[:nxt]
    assert "Governing equation:" in block and equation in block
    assert "At the limit the utilisation is 1" in block
    assert index in block  # powers raised with <sup>, so the text runs together


def test_shortlist_shows_every_new_constraints_utilisation_and_governing(lever, arm):
    for selection, page in (lever, arm):
        header, *rows = page.tables["shortlist"]
        kinds = [d.constraint for d in selection.derivations]
        for row, (_, cand) in zip(rows, selection.shortlist.iterrows(), strict=True):
            cell = row[header.index("Utilisation")]
            for kind in kinds:
                assert f"{kind} {cand['utilisation'][kind]:.2f}" in cell
            assert row[header.index("Governing")] == cand["governing"]
    governing = set(lever[0].shortlist["governing"]) | set(arm[0].shortlist["governing"])
    assert {"fatigue", "frequency"} & governing  # a new constraint governs some part

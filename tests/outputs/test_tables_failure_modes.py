"""Tables of a tie whose axial-frequency limit is a check on the class, not a size."""

from __future__ import annotations

import json
import tomllib

import pytest

from selector.inputs.spec import spec_from_dict
from selector.outputs.tables import flat_frame, render_selection
from selector.pipeline.selection import select
from tests.conftest import make_table

# f₁ = √(E/ρ)/(2L) for a bar held at both ends (Blevins, Formulas for Natural Frequency and Mode
# Shape — from memory). With L = 1 m and f_min = 1 kHz a class needs E/ρ ≥ 4e6 m²/s²:
# A (E = 200 GPa, ρ = 8000 kg/m³: 25e6) passes; B (E = 2 GPa, ρ = 1000: 2e6) fails, utilisation
# 1000/(√(2e6)/2) = 1.414.
TIE = """
title = "Tie with an axial-mode limit"
[part]
function = "tie"
length = "1 m"
force = "2 kN"
[[constraint]]
type = "strength"
safety_factor = 2
[[constraint]]
type = "frequency"
min_frequency = "1 kHz"
"""


@pytest.fixture(scope="module")
def selection():
    rows = [
        {"id": "A", "E": (200, 200), "rho": (8000, 8000), "sigma_y": (250, 250)},
        {"id": "B", "E": (2, 2), "rho": (1000, 1000), "sigma_y": (50, 50)},
    ]
    return select(spec_from_dict(tomllib.loads(TIE)), make_table(rows))


def test_the_check_is_a_note_and_its_utilisation_is_in_every_format(selection):
    assert any(
        n.startswith("frequency sets no size: it checks each class; the part passes") for n in selection.notes
    )
    flat = flat_frame(selection, show_all=True).set_index("id")
    assert flat.loc["A", "utilisation_frequency"] == pytest.approx(1000 / (25e6**0.5 / 2))
    assert flat.loc["B", "utilisation_frequency"] == pytest.approx(1000 / (2e6**0.5 / 2))
    records = json.loads(render_selection(selection, "json", show_all=True))
    rows = records if isinstance(records, list) else records["shortlist"]
    by_id = {r["id"]: r for r in rows}
    assert by_id["A"]["utilisation"]["frequency"] == pytest.approx(0.4)
    assert by_id["B"]["status"] == "rejected"


def test_a_rejected_class_names_the_failed_check_once(selection):
    text = render_selection(selection, "table", show_all=True)
    line = next(x for x in text.splitlines() if x.lstrip().startswith("B "))
    assert line.count("fails frequency (utilisation 1.41)") == 1

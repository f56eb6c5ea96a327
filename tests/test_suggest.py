"""Nearest-name suggestions: ids, full names and short names of classes (common practice, no source)."""

from __future__ import annotations

import pytest

from selector.inputs.materials import load_materials
from selector.suggest import class_aliases, did_you_mean, nearest


@pytest.fixture(scope="module")
def builtin():
    return load_materials([])


@pytest.mark.parametrize(
    ("word", "first"),
    [
        ("natural-rubber", "rubber-natural"),  # words in the other order
        ("CFRP UD", "cfrp-ud"),  # a short name
        ("balsawood", "balsa"),
        ("steel-lowcarbon", "steel-low-carbon"),
        ("cfrp", "cfrp-qi"),  # the start of an id
    ],
)
def test_a_class_is_found_by_a_near_id_or_name(builtin, word, first):
    assert nearest(word, builtin["id"], class_aliases(builtin))[0] == first


def test_nothing_close_suggests_nothing(builtin):
    assert nearest("zzzz", builtin["id"], class_aliases(builtin)) == []
    assert did_you_mean("zzzz", builtin["id"], fallback="see the list") == "see the list"


def test_a_short_list_is_spelled_out():
    assert did_you_mean("mas", ["mass", "cost"]) == "did you mean 'mass'? (valid: cost, mass)"
    assert did_you_mean("xyz", ["mass", "cost"]) == "expected one of: cost, mass"

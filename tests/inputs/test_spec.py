"""The spec model: good specs load, bad ones give one clear line naming the field."""

from __future__ import annotations

from pathlib import Path

import pytest

from selector.errors import InputError
from selector.inputs.spec import load_spec, spec_from_dict

EXAMPLES = sorted((Path(__file__).parents[2] / "examples").glob("*.toml"))


def test_there_are_examples_for_every_function_family():
    functions = {load_spec(p).part.function for p in EXAMPLES}
    assert len(EXAMPLES) >= 6
    assert {"beam", "tie", "panel", "shaft", "cylinder", "spring", "column"} <= functions


@pytest.mark.parametrize("path", EXAMPLES, ids=lambda p: p.name)
def test_examples_load(path):
    spec = load_spec(path)
    assert spec.title and spec.constraint


@pytest.mark.parametrize(
    ("data", "message"),
    [
        (
            {"part": {"function": "beam", "lenght": "1 m"}},
            "x.toml: part.lenght: unknown key 'lenght'; did you mean 'length'?",
        ),
        (
            {"part": {"function": "bem"}},
            "x.toml: part.function: 'bem' is not a function; did you mean 'beam'?",
        ),
        (
            {"part": {"function": "beam"}, "constraint": [{"type": "stifness"}]},
            "x.toml: constraint[0].type: 'stifness' is not a constraint type; did you mean 'stiffness'?",
        ),
        (
            {"part": {"function": "beam"}, "screen": {"Tmax": ">= 3 degC"}},
            "x.toml: screen: unknown screen 'Tmax'; did you mean 'T_max'?",
        ),
        (
            {"part": {"function": "beam"}, "objectiv": {}},
            "x.toml: objectiv: unknown key 'objectiv'; did you mean 'objective'?",
        ),
        (
            {"part": {"function": "beam"}, "section": {"free": "depht"}},
            "x.toml: section.free: 'depht' is not a free variable; did you mean 'depth'?",
        ),
        (
            {"part": {"function": "beam"}, "screen": {"families": ["metals"]}},
            "x.toml: screen: families = ['metals']; expected a list of: metal,",
        ),
        ({}, "x.toml: part: required field is missing"),
    ],
)
def test_bad_specs_name_the_field(data, message):
    with pytest.raises(InputError) as err:
        spec_from_dict(data, "x.toml")
    assert str(err.value).startswith(message)


def test_unreadable_files_are_clear(tmp_path):
    bad = tmp_path / "bad.toml"
    bad.write_text("title = [unclosed", encoding="utf-8")
    with pytest.raises(InputError, match="is not valid TOML"):
        load_spec(bad)
    with pytest.raises(InputError, match="no such file"):
        load_spec(tmp_path / "missing.toml")

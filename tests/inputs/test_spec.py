"""The spec model: good specs load, bad ones give one clear line naming the field."""

from __future__ import annotations

from pathlib import Path

import pytest

from selector.errors import InputError, SpecError
from selector.inputs.materials import load_materials
from selector.inputs.spec import load_spec, spec_from_dict
from selector.pipeline.selection import select

EXAMPLES_DIR = Path(__file__).parents[2] / "examples"
EXAMPLES = sorted(EXAMPLES_DIR.glob("*.toml"))
DATA = Path(__file__).parents[1] / "data"


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
            "x.toml: screen: families: 'metals' is not a family; did you mean 'metal'?",
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


def test_every_problem_is_listed_with_its_location():
    data = {
        "part": {"function": "bem", "lenght": "1 m"},
        "constraint": [{"type": "stiffness", "max_deflexion": "4 mm"}],
    }
    with pytest.raises(SpecError) as err:
        spec_from_dict(data, "x.toml")
    assert [e.location for e in err.value.errors] == [
        ("part", "function"),
        ("part", "lenght"),
        ("constraint", 0, "max_deflexion"),
    ]
    lines = str(err.value).splitlines()
    assert len(lines) == 3
    assert lines[0].startswith("x.toml: part.function: 'bem' is not a function; did you mean 'beam'?")
    assert lines[1].startswith("x.toml: part.lenght: unknown key 'lenght'; did you mean 'length'?")
    assert lines[2].startswith(
        "x.toml: constraint[0].max_deflexion: unknown key 'max_deflexion'; did you mean 'max_deflection'?"
    )
    assert err.value.location == ("part", "function")  # the first problem's


def test_materials_files_are_found_beside_the_spec_from_any_folder(tmp_path, monkeypatch):
    folder = tmp_path / "project"
    folder.mkdir()
    (folder / "supplier.csv").write_bytes((DATA / "good_us.csv").read_bytes())
    spec_text = (EXAMPLES_DIR / "greenhouse-tie-rod.toml").read_text(encoding="utf-8")
    (folder / "rod.toml").write_text(
        spec_text + '\n[materials]\nfiles = ["supplier.csv"]\nbuiltin = false\n', encoding="utf-8"
    )
    elsewhere = tmp_path / "elsewhere"
    elsewhere.mkdir()
    monkeypatch.chdir(elsewhere)
    spec = load_spec(Path("..") / "project" / "rod.toml")
    assert spec.materials.files == [str(folder / "supplier.csv")]
    table = select(spec).table
    expected = set(load_materials([DATA / "good_us.csv"], builtin=False)["id"])
    assert set(table["id"]) == expected


@pytest.mark.parametrize(("value", "shown"), [(True, "True"), ("1.5", "'1.5'")])
def test_a_safety_factor_must_be_a_number(value, shown):
    data = {
        "part": {"function": "tie", "length": "1 m", "force": "1 kN"},
        "constraint": [{"type": "strength", "safety_factor": value}],
    }
    with pytest.raises(SpecError) as err:
        spec_from_dict(data, "x.toml")
    assert str(err.value) == (
        f"x.toml: constraint[0].safety_factor: {shown} is not a number; a plain number such as 1.5, unquoted"
    )
    assert err.value.location == ("constraint", 0, "safety_factor")
    data["constraint"][0]["safety_factor"] = 2  # an integer is a number
    assert spec_from_dict(data).constraint[0].safety_factor == 2.0

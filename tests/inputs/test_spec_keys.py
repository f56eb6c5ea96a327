"""Strict spec semantics: keys that do not apply, numbers that are not numbers, NaN, and
the one spelling of a missing value in materials files."""

from __future__ import annotations

import copy
import re
import tomllib
from pathlib import Path

import openpyxl
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from selector.errors import InputError, SpecError
from selector.inputs.materials import check_materials_file, load_materials
from selector.inputs.spec import spec_from_dict
from selector.inputs.spec_keys import PART_KEYS
from selector.inputs.spec_quantities import QUANTITY_FIELDS
from selector.mechanics.loadcases import FUNCTIONS, load_case
from selector.pipeline.screen import parse_limit
from selector.pipeline.selection import SYMBOL_OF_FIELD

README = Path(__file__).parents[2] / "README.md"

# A valid part for every function (illustrative numbers, demo data).
PARTS = {
    "tie": {"length": "1 m", "force": "1 kN"},
    "beam": {"support": "cantilever", "load": "end", "length": "1 m", "force": "100 N"},
    "column": {"support": "pinned-pinned", "length": "1 m", "force": "1 kN"},
    "shaft": {"length": "0.5 m", "torque": "20 N*m"},
    "panel": {
        "support": "simply-supported",
        "load": "centre",
        "length": "1 m",
        "force": "1 kN",
        "width": "0.4 m",
    },
    "plate": {"length": "0.3 m", "force": "10 kN", "width": "0.1 m", "edges": "supported"},
    "cylinder": {"length": "0.2 m", "pressure": "1 MPa", "radius": "40 mm"},
    "sphere": {"pressure": "1 MPa", "radius": "40 mm"},
    "spring": {"energy": "5 J", "form": "coil"},
}
FREE = {"panel": "thickness", "plate": "thickness", "cylinder": "wall", "sphere": "wall"}


def _spec(function: str, **tables) -> dict:
    data = {
        "part": {"function": function, **PARTS[function]},
        "section": {"free": FREE.get(function, "scale")},
        "constraint": [{"type": "strength", "safety_factor": 1.5}],
    }
    for name, table in tables.items():
        if isinstance(table, dict) and isinstance(data.get(name), dict):
            data[name] = {**data[name], **table}
        else:
            data[name] = table
    return data


def _messages(data: dict) -> list[str]:
    with pytest.raises(SpecError) as err:
        spec_from_dict(data, "x.toml")
    return str(err.value).splitlines()


@pytest.mark.parametrize("function", FUNCTIONS)
def test_every_function_accepts_its_own_keys(function):
    spec = spec_from_dict(_spec(function))
    assert spec.part.function == function


@pytest.mark.parametrize("function", FUNCTIONS)
def test_the_part_keys_are_the_quantities_of_the_load_case(function):
    # The [part] quantities a function takes are exactly the loads and geometry its equations hold
    # (a panel's width is its section's b; a beam's width its fixed width when the depth is free).
    case = load_case(function)
    monomials = [case.volume, *case.utilisation.values(), *case.responses.values()]
    used = {SYMBOL_OF_FIELD[f] for f in QUANTITY_FIELDS} & set().union(*(m.symbols for m in monomials))
    taken = {SYMBOL_OF_FIELD[k] for k in PART_KEYS[function] if k in QUANTITY_FIELDS}
    assert taken - used == ({"b"} if function in ("beam", "panel") else set())
    assert used <= taken


@pytest.mark.parametrize(
    ("function", "key", "value"),
    [
        ("tie", "support", "cantilever"),
        ("tie", "load", "end"),
        ("column", "load", "end"),
        ("shaft", "support", "cantilever"),
        ("plate", "support", "simply-supported"),
        ("cylinder", "edges", "clamped"),
        ("sphere", "support", "cantilever"),
        ("spring", "load", "end"),
        ("beam", "edges", "clamped"),
        ("tie", "form", "coil"),
        ("plate", "form", "leaf"),
        ("column", "edges", "supported"),
        ("sphere", "length", "1 m"),
        ("spring", "force", "10 N"),
        ("shaft", "force", "10 N"),
        ("tie", "width", "10 mm"),
    ],
)
def test_a_part_key_the_function_does_not_read_names_the_keys_that_do(function, key, value):
    lines = _messages(_spec(function, part={key: value}))
    assert lines == [
        f"x.toml: part.{key}: {key} does not apply to a {function}; "
        f"a {function} takes: function, {', '.join(PART_KEYS[function])}"
    ]


def test_the_error_carries_its_location():
    with pytest.raises(SpecError) as err:
        spec_from_dict(_spec("tie", part={"support": "cantilever"}))
    assert err.value.location == ("part", "support")


@pytest.mark.parametrize(
    ("function", "part", "field", "suggestion"),
    [
        ("beam", {"support": "cantileverr"}, "support", "did you mean 'cantilever'?"),
        ("beam", {"load": "uniformm"}, "load", "did you mean 'uniform'?"),
        ("column", {"support": "pinned"}, "support", "valid: "),
        ("panel", {"support": "simply-supported", "load": "end"}, "load", "centre, uniform"),
    ],
)
def test_a_support_or_load_the_case_does_not_take_is_a_spec_error_in_the_file(
    function, part, field, suggestion
):
    # found as the spec loads, with the file's name, not later by the pipeline
    lines = _messages(_spec(function, part=part))
    assert len(lines) == 1
    assert lines[0].startswith(f"x.toml: part.{field}: ")
    assert suggestion in lines[0]


def test_a_beam_reads_width_only_with_its_depth_free():
    lines = _messages(
        _spec("beam", part={"width": "20 mm"}, section={"shape": "tube", "d": "30 mm", "t": "2 mm"})
    )
    assert lines == [
        "x.toml: part.width: a beam reads width only when its depth is free (free = 'scale'); "
        'free = "depth" for a rectangle of fixed width, or the section\'s b'
    ]
    depth_free = _spec("beam", part={"width": "20 mm"}, section={"shape": "rectangle", "free": "depth"})
    assert spec_from_dict(depth_free).part.width == "20 mm"
    twice = _spec(
        "beam", part={"width": "20 mm"}, section={"shape": "rectangle", "free": "depth", "b": "20 mm"}
    )
    assert _messages(twice) == [
        "x.toml: part.width: the width is given twice, as part.width and section.b; one of them"
    ]


def test_a_panel_width_given_twice_is_an_error():
    assert _messages(_spec("panel", section={"b": "0.3 m"})) == [
        "x.toml: part.width: the width is given twice, as part.width and section.b; one of them"
    ]
    without = _spec("panel", section={"b": "0.4 m"})
    del without["part"]["width"]
    assert spec_from_dict(without).section.b == "0.4 m"


@pytest.mark.parametrize(
    ("function", "section", "key", "expected"),
    [
        ("beam", {"shape": "round", "d": "20 mm", "h": "30 mm"}, "h", "keys that apply: d"),
        ("column", {"shape": "tube", "d": "20 mm", "t": "2 mm", "tf": "3 mm"}, "tf", "keys that apply: d, t"),
        ("tie", {"shape": "generic", "d": "20 mm"}, "d", "keys that apply: b, h"),
        ("cylinder", {"b": "20 mm"}, "b", "keys that apply: t"),
        ("spring", {"t": "2 mm"}, "t", "a spring takes no dimensions"),
        ("panel", {"d": "20 mm"}, "d", "keys that apply: b, t"),
    ],
)
def test_a_section_key_the_shape_does_not_use_is_an_error(function, section, key, expected):
    lines = _messages(_spec(function, section=section))
    assert len(lines) == 1
    assert lines[0].startswith(f"x.toml: section.{key}: {key} is not a dimension of ")
    assert lines[0].endswith(expected)


def test_min_wall_applies_only_where_a_wall_or_thickness_is_sized():
    lines = _messages(_spec("tie", section={"shape": "round", "d": "10 mm", "min_wall": "1 mm"}))
    assert lines == [
        "x.toml: section.min_wall: min_wall applies to a part whose wall or thickness is sized, not "
        'free = \'scale\'; free = "wall" (a tube) or "thickness" (a panel); a plate or vessel wall'
    ]
    assert spec_from_dict(_spec("cylinder", section={"min_wall": "1 mm"})).section.min_wall == "1 mm"


def test_the_size_bounds_are_section_keys():
    data = _spec("beam", section={"shape": "rectangle", "b": "20 mm", "h": "40 mm", "max_depth": "60 mm"})
    assert spec_from_dict(data).section.max_depth == "60 mm"


@pytest.mark.parametrize(
    ("function", "constraint", "key", "applies"),
    [
        (
            "tie",
            {"type": "fatigue", "crack_length": "1 mm"},
            "crack_length",
            "type, safety_factor, load_ratio",
        ),
        ("tie", {"type": "strength", "load_ratio": 0.0}, "load_ratio", "type, safety_factor"),
        (
            "beam",
            {"type": "stiffness", "max_deflection": "4 mm", "min_frequency": "5 Hz"},
            "min_frequency",
            "type, safety_factor, max_deflection",
        ),
        (
            "beam",
            {"type": "stiffness", "max_twist": "1 deg"},
            "max_twist",
            "type, safety_factor, max_deflection",
        ),
        (
            "shaft",
            {"type": "stiffness", "max_deflection": "1 mm"},
            "max_deflection",
            "type, safety_factor, max_twist",
        ),
        (
            "beam",
            {"type": "fatigue", "geometry_factor": 1.2},
            "geometry_factor",
            "type, safety_factor, load_ratio",
        ),
        (
            "tie",
            {"type": "stiffness", "max_deflection": "1 mm", "criterion": "leak-before-break"},
            "criterion",
            "type, safety_factor, max_deflection",
        ),
    ],
)
def test_a_constraint_key_of_another_type_names_the_keys_that_apply(function, constraint, key, applies):
    lines = _messages(_spec(function, constraint=[constraint]))
    assert len(lines) == 1
    assert lines[0].startswith(
        f"x.toml: constraint[0].{key}: {key} does not apply to a {constraint['type']} "
    )
    assert lines[0].endswith(f"keys that apply: {applies}")


def test_criterion_is_for_the_fracture_constraint_of_a_vessel():
    fracture = {"type": "fracture", "criterion": "leak-before-break"}
    assert _messages(_spec("tie", constraint=[fracture])) == [
        "x.toml: constraint[0].criterion: criterion does not apply to a fracture constraint of a tie; "
        "criterion applies to the fracture constraint of a cylinder or sphere; "
        "keys that apply: type, safety_factor, crack_length, geometry_factor"
    ]
    assert (
        spec_from_dict(_spec("cylinder", constraint=[fracture])).constraint[0].criterion
        == "leak-before-break"
    )


def test_unknown_top_level_keys_name_the_key():
    lines = _messages(_spec("tie", materail={"files": []}))
    assert len(lines) == 1
    assert lines[0].startswith("x.toml: materail: unknown key 'materail'; did you mean 'materials'?")
    assert _messages(_spec("tie", colour="red"))[0].startswith("x.toml: colour: unknown key 'colour'")
    lines = _messages(_spec("tie", section={"shape": "round", "d": "10 mm", "dia": "1 mm"}))
    assert lines[0].startswith("x.toml: section.dia: unknown key 'dia'")


def test_every_problem_is_listed_in_one_pass_with_the_models_own():
    data = _spec(
        "tie",
        part={"support": "cantilever", "lenght": "1 m"},
        constraint=[{"type": "fatigue", "crack_length": "1 mm", "load_ratio": "0"}],
    )
    with pytest.raises(SpecError) as err:
        spec_from_dict(data, "x.toml")
    assert [e.location for e in err.value.errors] == [
        ("part", "lenght"),
        ("constraint", 0, "load_ratio"),
        ("part", "support"),
        ("constraint", 0, "crack_length"),
    ]


@pytest.mark.parametrize(
    ("field", "value", "shown"),
    [
        ("safety_factor", True, "True"),
        ("safety_factor", "2", "'2'"),
        ("geometry_factor", True, "True"),
        ("geometry_factor", "1.12", "'1.12'"),
        ("load_ratio", False, "False"),
        ("load_ratio", "0", "'0'"),
    ],
)
def test_booleans_and_strings_are_not_numbers(field, value, shown):
    kind = {"safety_factor": "strength", "geometry_factor": "fracture", "load_ratio": "fatigue"}[field]
    constraint = {"type": kind, field: value} | ({"crack_length": "1 mm"} if kind == "fracture" else {})
    assert _messages(_spec("tie", constraint=[constraint])) == [
        f"x.toml: constraint[0].{field}: {shown} is not a number; a plain number such as 1.5, unquoted"
    ]


def test_integers_are_numbers():
    constraint = [{"type": "fatigue", "load_ratio": 0, "safety_factor": 2}]
    assert spec_from_dict(_spec("tie", constraint=constraint)).constraint[0].load_ratio == 0.0


@pytest.mark.parametrize("value", ["yes", 1, "true"])
def test_a_flag_is_true_or_false(value):
    assert _messages(_spec("tie", materials={"builtin": value})) == [
        f"x.toml: materials.builtin: {value!r} is not true or false; true or false, unquoted"
    ]


@pytest.mark.parametrize("value", [2, 2.5, True])
def test_a_quantity_is_text_with_a_unit(value):
    assert _messages(_spec("tie", part={"length": value})) == [
        f'x.toml: part.length: {value!r} is not a quantity; a number and its unit in quotes, e.g. "1.2 m"'
    ]


@pytest.mark.parametrize("number", [float("nan"), float("inf"), float("-inf")])
@pytest.mark.parametrize("field", ["safety_factor", "geometry_factor", "load_ratio"])
def test_nan_and_inf_plain_numbers_are_refused(field, number):
    kind = {"safety_factor": "strength", "geometry_factor": "fracture", "load_ratio": "fatigue"}[field]
    constraint = {"type": kind, field: number} | ({"crack_length": "1 mm"} if kind == "fracture" else {})
    lines = _messages(_spec("tie", constraint=[constraint]))
    assert len(lines) == 1
    assert lines[0].startswith(f"x.toml: constraint[0].{field}: {number!r} is not")


@pytest.mark.parametrize("text", ["nan mm", "NaN m", "inf mm", "-inf m", "1e999 m"])
def test_nan_and_inf_quantities_are_refused(text):
    # Refused when the spec loads, before any material is read.
    with pytest.raises(InputError) as err:
        spec_from_dict(_spec("tie", part={"length": text}))
    assert err.value.where == "spec: part.length"
    assert err.value.location == ("part", "length")
    assert repr(text) in str(err.value) or "1e999" in str(err.value)


@pytest.mark.parametrize(
    ("symbol", "text"),
    [
        ("elongation", ">= nan%"),
        ("elongation", ">= NaN"),
        ("elongation", ">= inf %"),
        ("elongation", ">= 1e999%"),
        ("nu", "<= nan"),
        ("E", ">= nan GPa"),
        ("E", ">= 1e999 GPa"),
        ("T_max", ">= inf degC"),
    ],
)
def test_nan_and_inf_screens_are_refused(symbol, text):
    # A NaN limit would pass every class (every comparison with NaN is false).
    with pytest.raises(InputError) as err:
        parse_limit(symbol, text)
    assert err.value.where == f"screen.{symbol}"


def test_a_finite_percent_screen_still_reads():
    assert parse_limit("elongation", ">= 10%").value == 10.0
    assert parse_limit("elongation", ">= 10 %").value == 10.0
    assert parse_limit("nu", "<= 0.3").value == 0.3


# ------------------------------------------------------------------ the one spelling of a missing value

CSV_HEAD = "id,name,family,rho [kg/m^3],E [GPa],sigma_y [MPa],K_IC [MPa*m^0.5]\n"
MISSPELT = ["N/A", "NA", "nan", "NaN", "none", "null", "unknown", "-", "?", "#N/A"]


def _csv(tmp_path: Path, cell: str) -> Path:
    path = tmp_path / "m.csv"
    path.write_text(CSV_HEAD + f'x1,Test class,metal,7800,200,250,"{cell}"\n', encoding="utf-8")
    return path


def _toml(tmp_path: Path, value: str) -> Path:
    path = tmp_path / "m.toml"
    path.write_text(
        '[[class]]\nid = "x1"\nname = "Test class"\nfamily = "metal"\nrho = "7800 kg/m^3"\n'
        f'E = "200 GPa"\nsigma_y = "250 MPa"\nK_IC = {value}\n',
        encoding="utf-8",
    )
    return path


def _xlsx(tmp_path: Path, cell: object) -> Path:
    book = openpyxl.Workbook()
    book.active.append([c.strip() for c in CSV_HEAD.split(",")])
    book.active.append(["x1", "Test class", "metal", 7800, 200, 250, cell])
    path = tmp_path / "m.xlsx"
    book.save(path)
    return path


MISSING_MESSAGE = (
    "is not how a missing value is written; write 'n/a' for a value that is unknown or does not apply"
)


@pytest.mark.parametrize("cell", MISSPELT)
def test_other_spellings_of_missing_are_refused_alike_in_csv_toml_and_xlsx(tmp_path, cell):
    csv_problems = check_materials_file(_csv(tmp_path, cell))
    toml_problems = check_materials_file(_toml(tmp_path, f'"{cell}"'))
    xlsx_problems = check_materials_file(_xlsx(tmp_path, cell))
    assert [str(p) for p in csv_problems] == [
        f"{tmp_path / 'm.csv'}: row 2, column K_IC: {cell!r} {MISSING_MESSAGE}"
    ]
    assert [str(p) for p in toml_problems] == [
        f"{tmp_path / 'm.toml'}: class 1 (x1), field K_IC: {cell!r} {MISSING_MESSAGE}"
    ]
    if cell == "#N/A":  # a spreadsheet reads this text as its own error value
        assert [p.what for p in xlsx_problems] == ["the cell shows the error #N/A"]
    else:
        assert [str(p) for p in xlsx_problems] == [
            f"{tmp_path / 'm.xlsx'}#Sheet: cell G2 (K_IC): {cell!r} {MISSING_MESSAGE}"
        ]


def test_an_empty_toml_string_is_not_a_missing_value(tmp_path):
    problems = check_materials_file(_toml(tmp_path, '""'))
    assert [p.what for p in problems] == [f"'' {MISSING_MESSAGE.split(';')[0]}"]


@pytest.mark.parametrize("value", ["nan", "inf", "-inf"])
def test_a_bare_nan_in_toml_is_refused(tmp_path, value):
    problems = check_materials_file(_toml(tmp_path, value))
    assert [p.what for p in problems] == [f"{value} is not a finite number"]


def test_n_a_and_an_empty_cell_mean_no_value_in_every_format(tmp_path):
    tables = [
        load_materials([_csv(tmp_path, "n/a")], builtin=False),
        load_materials([_csv(tmp_path, "")], builtin=False),
        load_materials([_toml(tmp_path, '"n/a"')], builtin=False),
        load_materials([_xlsx(tmp_path, "n/a")], builtin=False),
        load_materials([_xlsx(tmp_path, None)], builtin=False),
    ]
    for table in tables:
        assert table["K_IC_low"].isna().all() and table["K_IC_high"].isna().all()
    toml_without = tmp_path / "without.toml"
    toml_without.write_text(
        re.sub(r"K_IC = .*\n", "", _toml(tmp_path, '"n/a"').read_text(encoding="utf-8")), encoding="utf-8"
    )
    assert load_materials([toml_without], builtin=False)["K_IC_low"].isna().all()


def test_a_core_property_takes_no_missing_value(tmp_path):
    path = tmp_path / "core.csv"
    path.write_text(CSV_HEAD + "x1,Test class,metal,N/A,200,250,10\n", encoding="utf-8")
    [problem] = check_materials_file(path)
    assert problem.what == "'N/A' is not a number"
    assert problem.expected.endswith("density applies to every class")


# ------------------------------------------------------------------ the examples still load


def _readme_toml_blocks() -> list[str]:
    text = README.read_text(encoding="utf-8")
    return re.findall(r"```toml\n(.*?)```", text, flags=re.S)


def test_the_readme_spec_snippets_load():
    first, *rest = _readme_toml_blocks()
    spec = spec_from_dict(tomllib.loads(first), "README")
    assert spec.part.function == "beam"
    for block in rest:
        data = copy.deepcopy(tomllib.loads(first))
        data["constraint"] = data["constraint"] + tomllib.loads(block)["constraint"]
        assert spec_from_dict(data, "README").constraint


# ------------------------------------------------------------------ odd values never break the rules

_LEAVES = st.one_of(
    st.none(),
    st.booleans(),
    st.integers(),
    st.floats(),
    st.text(max_size=12),
    st.sampled_from(["beam", "tie"]),
)
_VALUES = st.recursive(
    _LEAVES,
    lambda inner: st.lists(inner, max_size=3) | st.dictionaries(st.text(max_size=6), inner, max_size=3),
    max_leaves=8,
)


@settings(max_examples=200, deadline=None, derandomize=True)
@given(
    part=st.dictionaries(st.sampled_from(["function", "support", "width", "form", "x"]), _VALUES, max_size=4),
    section=st.dictionaries(st.sampled_from(["shape", "free", "b", "h", "min_wall"]), _VALUES, max_size=4),
    constraint=st.lists(
        st.dictionaries(st.sampled_from(["type", "criterion", "max_twist"]), _VALUES), max_size=3
    )
    | _VALUES,
)
def test_odd_values_give_spec_errors_only(part, section, constraint):
    # A constraint "type" that is a list once raised TypeError (unhashable) in the key rules.
    data = {"part": part, "section": section, "constraint": constraint}
    try:
        spec_from_dict(data, "x.toml")
    except SpecError as err:
        assert all(e.where.startswith("x.toml") for e in err.errors)

"""Fuzzing the input boundary: whatever a spec or materials file holds, no traceback.

Each example starts from a valid spec or materials file (the bundled examples and a
small table of our own), changes one or a few values to something generated
(extreme or odd numbers, wrong types, deep nesting, huge integers, odd text, odd
units), writes the file, and runs the real command in-process through click's
CliRunner. The command must either succeed (exit 0) or refuse the input with one
``error:`` line (exit 2); any other exception is a bug.

Profiles: ``ci`` (the default, a bounded number of examples so the suite stays fast)
and ``long`` for a search by hand::

    SELECTOR_FUZZ=long python -m pytest -q -p no:cacheprovider tests/test_fuzz.py
"""

from __future__ import annotations

import copy
import json
import math
import os
import tempfile
import tomllib
from pathlib import Path
from typing import Any

import pytest
from click.testing import CliRunner
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from selector.cli import cli
from selector.errors import SelectorError
from selector.inputs.spec import EXAMPLES

settings.register_profile(
    "ci", max_examples=25, deadline=None, suppress_health_check=[HealthCheck.too_slow], derandomize=True
)
settings.register_profile("long", max_examples=2000, deadline=None, suppress_health_check=list(HealthCheck))
PROFILE = os.environ.get("SELECTOR_FUZZ", "ci")

EXAMPLE_SPECS = sorted(EXAMPLES.glob("*.toml"))
DATA = Path(__file__).parent / "data"
VALID_CSV = (DATA / "good_us.csv").read_text(encoding="utf-8")
VALID_TOML = (DATA / "good_us.toml").read_text(encoding="utf-8")


# ------------------------------------------------------------------ a small TOML writer


def _toml_value(value: Any) -> str:
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, int):
        return str(value)
    if isinstance(value, float):
        if math.isnan(value):
            return "nan"
        if math.isinf(value):
            return "inf" if value > 0 else "-inf"
        return repr(value)
    if isinstance(value, str):
        return json.dumps(value, ensure_ascii=True)
    if isinstance(value, list):
        return "[" + ", ".join(_toml_value(v) for v in value) + "]"
    if isinstance(value, dict):
        return "{" + ", ".join(f"{json.dumps(k)} = {_toml_value(v)}" for k, v in value.items()) + "}"
    raise TypeError(type(value))


def to_toml(data: dict[str, Any]) -> str:
    """TOML text for a spec-like dict: scalars first, then tables, then arrays of tables."""
    lines = [f"{json.dumps(k)} = {_toml_value(v)}" for k, v in data.items() if not isinstance(v, dict | list)]
    lines += [f"{json.dumps(k)} = {_toml_value(v)}" for k, v in data.items() if isinstance(v, list)]
    for key, table in data.items():
        if isinstance(table, dict):
            lines.append(f"[{json.dumps(key)}]")
            lines += [f"{json.dumps(k)} = {_toml_value(v)}" for k, v in table.items()]
    return "\n".join(lines) + "\n"


# ------------------------------------------------------------------ generated values

UNITS = ["N", "kN", "lbf", "m", "mm", "in", "MPa", "GPa", "psi", "N*m", "J", "degC", "rad", "kg", "", "%"]
numbers = st.one_of(
    st.floats(allow_nan=True, allow_infinity=True),
    st.sampled_from([0.0, -0.0, 1e-300, 1e-320, 5e-324, 1e300, 1.7e308, -1.0, 1e23, 12345678901234567890123]),
    st.integers(min_value=-(10**400), max_value=10**400),
)
quantity_text = st.builds(
    lambda n, u, sep: f"{n}{sep}{u}",
    st.one_of(numbers, st.sampled_from(["nan", "inf", "-inf", "1e999", "0x10", "", "1,5"])),
    st.sampled_from(UNITS),
    st.sampled_from([" ", "", "  "]),
)
odd_text = st.text(alphabet=st.characters(blacklist_categories=("Cs",)), max_size=30)
leaves = st.one_of(numbers, st.booleans(), quantity_text, odd_text)
values = st.recursive(
    leaves,
    lambda inner: st.one_of(
        st.lists(inner, max_size=3), st.dictionaries(st.text(max_size=5), inner, max_size=3)
    ),
    max_leaves=6,
)
deep = st.integers(min_value=10, max_value=3000).map(lambda n: "[" * n + "1" + "]" * n)


def _paths(data: Any, prefix: tuple = ()) -> list[tuple]:
    """Every path to a value inside nested dicts and lists."""
    out = [prefix] if prefix else []
    if isinstance(data, dict):
        for k, v in data.items():
            out += _paths(v, (*prefix, k))
    elif isinstance(data, list):
        for i, v in enumerate(data):
            out += _paths(v, (*prefix, i))
    return out


def _set(data: Any, path: tuple, value: Any) -> None:
    for key in path[:-1]:
        data = data[key]
    if value is _DELETE:
        del data[path[-1]]
    else:
        data[path[-1]] = value


_DELETE = object()


@st.composite
def mutated_specs(draw: st.DrawFn) -> str:
    """A bundled example with one to three values replaced, deleted or added."""
    base = tomllib.loads(draw(st.sampled_from(EXAMPLE_SPECS)).read_text(encoding="utf-8"))
    data = copy.deepcopy(base)
    for _ in range(draw(st.integers(1, 3))):
        paths = _paths(data)
        if not paths:
            break
        path = draw(st.sampled_from(paths))
        action = draw(st.sampled_from(["replace", "replace", "replace", "delete", "add"]))
        if action == "delete":
            _set(data, path, _DELETE)
        elif action == "add" and isinstance(data.get(path[0]), dict):
            data[path[0]][draw(st.sampled_from(["length", "width", "t", "d", "zzz", "radius"]))] = draw(
                st.one_of(quantity_text, values)
            )
        else:
            _set(data, path, draw(st.one_of(quantity_text, values)))
    text = to_toml(data)
    if draw(st.integers(0, 9)) == 0:  # now and then a deeply nested value
        text += f"notes = {draw(deep)}\n"
    return text


# ------------------------------------------------------------------ the check


def run_clean(args: list[str]) -> None:
    """Run the CLI in-process; exit 0, or exit 2 with one ``error:`` line — never a traceback."""
    result = CliRunner().invoke(cli, args, catch_exceptions=True)
    error = result.exception
    if isinstance(error, SelectorError):  # main() prints it as one line and exits 2
        assert "\n" not in str(error).split("\n  ")[0], str(error)
        return
    if isinstance(error, SystemExit) or error is None:
        assert result.exit_code in (0, 2), result.output
        if result.exit_code == 2:
            errors = [line for line in result.output.splitlines() if line.startswith("error:")]
            assert len(errors) >= 1, result.output
            assert "Traceback" not in result.output
        return
    raise AssertionError(f"{type(error).__name__}: {error} for {args}") from error


def _write(folder: str, name: str, text: str) -> str:
    path = Path(folder) / name
    path.write_text(text, encoding="utf-8", errors="surrogatepass")
    return str(path)


@settings(settings.get_profile(PROFILE), max_examples=settings.get_profile(PROFILE).max_examples * 2)
@given(mutated_specs())
def test_mutated_specs_never_raise(text: str) -> None:
    with tempfile.TemporaryDirectory() as folder:
        run_clean(["rank", _write(folder, "spec.toml", text)])


@settings(settings.get_profile(PROFILE))
@given(st.text(max_size=200).filter(lambda t: "\ud800" not in t))
def test_arbitrary_text_as_spec_never_raises(text: str) -> None:
    with tempfile.TemporaryDirectory() as folder:
        run_clean(["rank", _write(folder, "spec.toml", text)])


@st.composite
def mutated_csv(draw: st.DrawFn) -> str:
    """The valid US-unit CSV with some cells (headers included) replaced by generated text."""
    rows = [line.split(",") for line in VALID_CSV.strip().splitlines()]
    for _ in range(draw(st.integers(1, 4))):
        r = draw(st.integers(0, len(rows) - 1))
        c = draw(st.integers(0, len(rows[r]) - 1))
        rows[r][c] = draw(st.one_of(quantity_text, st.builds(str, numbers), odd_text, st.just("n/a")))
    return "\n".join(",".join(row) for row in rows) + "\n"


@st.composite
def mutated_materials_toml(draw: st.DrawFn) -> str:
    """The valid materials TOML with one or two fields of the class replaced or added."""
    entry = tomllib.loads(VALID_TOML)["class"][0]
    for _ in range(draw(st.integers(1, 2))):
        key = draw(st.sampled_from([*entry, "nu", "co2", "E", "rho", "ratings", "sigma_y", "zz"]))
        entry[key] = draw(st.one_of(quantity_text, values, st.lists(quantity_text, max_size=3)))
    body = "\n".join(f"{json.dumps(k)} = {_toml_value(v)}" for k, v in entry.items())
    return "[[class]]\n" + body + "\n"


@pytest.mark.parametrize("kind", ["csv", "toml"])
@settings(settings.get_profile(PROFILE))
@given(data=st.data())
def test_mutated_materials_files_never_raise(kind: str, data: st.DataObject) -> None:
    text = data.draw(mutated_csv() if kind == "csv" else mutated_materials_toml())
    spec = str(EXAMPLES / "camera-dolly-boom.toml")
    with tempfile.TemporaryDirectory() as folder:
        path = _write(folder, f"mine.{kind}", text)
        run_clean(["rank", spec, "--materials", path, "--no-builtin"])
        run_clean(["materials", "check", path])


# ------------------------------------------------------------------ the named failures, one by one


def _example_with(name: str, section: str, key: str, value: Any, delete: bool = False) -> str:
    data = tomllib.loads((EXAMPLES / name).read_text(encoding="utf-8"))
    target = data[section] if section != "constraint" else data["constraint"][-1]
    if delete:
        del target[key]
    else:
        target[key] = value
    return to_toml(data)


NAMED = [
    ("shelf-plate.toml", "part", "length", None, True, "part.length: a plate is sized from its loads"),
    ("sensor-pressure-housing.toml", "part", "length", None, True, "part.length: a cylinder is sized"),
    ("camera-dolly-boom.toml", "part", "force", "1e-300 N", False, "part.force: '1e-300 N' is out of range"),
    ("camera-dolly-boom.toml", "constraint", "safety_factor", 1e300, False, "safety_factor: 1e+300 is out"),
    ("camera-dolly-boom.toml", "section", "t", "1e-320 m", False, "section.t: '1e-320 m' is out of range"),
    ("shelf-plate.toml", "part", "width", "12345678901234567890123 mm", False, "part.width: '1234"),
    # accepted before, now refused: keys that do not apply, non-numbers, NaN limits
    (
        "greenhouse-tie-rod.toml",
        "part",
        "support",
        "cantilever",
        False,
        "part.support: support does not apply",
    ),
    ("greenhouse-tie-rod.toml", "part", "load", "end", False, "part.load: load does not apply to a tie"),
    ("greenhouse-tie-rod.toml", "constraint", "safety_factor", True, False, "True is not a number"),
    ("greenhouse-tie-rod.toml", "constraint", "safety_factor", "1.5", False, "'1.5' is not a number"),
    ("camera-dolly-boom.toml", "screen", "elongation", ">= nan%", False, "screen.elongation: cannot read"),
    ("camera-dolly-boom.toml", "screen", "E", ">= 1e999 GPa", False, "screen.E: the limit in"),
    ("shelf-plate.toml", "section", "shape", "tube", False, "section.shape: a plate does not use"),
]


@pytest.mark.parametrize(("example", "section", "key", "value", "delete", "message"), NAMED)
def test_named_failures_give_one_clean_line(tmp_path, example, section, key, value, delete, message) -> None:
    spec = tmp_path / "spec.toml"
    spec.write_text(_example_with(example, section, key, value, delete), encoding="utf-8")
    result = CliRunner().invoke(cli, ["rank", str(spec)])
    assert isinstance(result.exception, SelectorError) or result.exit_code == 2
    text = str(result.exception) if isinstance(result.exception, SelectorError) else result.output
    assert message in text


def test_deep_nesting_is_refused_before_parsing(tmp_path) -> None:
    from selector.inputs.spec import load_spec

    spec = tmp_path / "deep.toml"
    spec.write_text("title = " + "[" * 5000 + "]" * 5000 + "\n", encoding="utf-8")
    with pytest.raises(SelectorError, match="nests arrays or tables 5000 deep; at most 16 levels"):
        load_spec(spec)


def test_brackets_inside_strings_and_comments_do_not_count() -> None:
    from selector.inputs.limits import toml_depth

    # TOML 1.0: brackets in strings and comments are text, table headers are one level
    assert toml_depth('title = "[[[[[[["  # [[[[\n[part]\nx = [[1], [2]]\n') == 2


def test_huge_integer_in_materials_toml_is_one_short_problem(tmp_path) -> None:
    from selector.inputs.materials import check_materials_file

    path = tmp_path / "big.toml"
    path.write_text(VALID_TOML.replace("nu = 0.29", "nu = " + "9" * 400), encoding="utf-8")
    assert "nu = " + "9" * 400 in path.read_text(encoding="utf-8")
    problems = check_materials_file(path)
    assert len(problems) == 1
    assert "is not a finite number" in problems[0].what and len(problems[0].what) < 120


def test_full_stdout_is_one_clean_error() -> None:
    import subprocess
    import sys

    if not Path("/dev/full").exists():
        pytest.skip("no /dev/full on this system")
    spec = str(EXAMPLES / "camera-dolly-boom.toml")
    with open("/dev/full", "w") as full:
        done = subprocess.run(
            [sys.executable, "-m", "selector", "rank", spec], stdout=full, stderr=subprocess.PIPE, text=True
        )
    assert done.returncode == 2
    assert done.stderr.strip().splitlines() == [
        "error: stdout: cannot be written (No space left on device); free some space or write elsewhere"
    ]

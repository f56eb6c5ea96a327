"""Lookups by id or name suggest the nearest ones; wrong dimensions are said in plain words.

The expected suggestions follow from the built-in ids (common practice, no source).
"""

from __future__ import annotations

from pathlib import Path

import pytest
from click.testing import CliRunner

from selector.cli import cli

EXAMPLES = Path(__file__).parents[1] / "examples"


def _error(*args: str, lines: int = 1) -> str:
    result = CliRunner().invoke(cli, list(args))
    assert result.exit_code == 2, result.output
    assert result.exception is None or isinstance(result.exception, SystemExit)
    assert result.stderr.count("\n") == lines, result.stderr
    return result.stderr


def _edited(tmp_path: Path, example: str, old: str, new: str) -> str:
    text = (EXAMPLES / example).read_text(encoding="utf-8")
    assert old in text
    path = tmp_path / example
    path.write_text(text.replace(old, new), encoding="utf-8")
    return str(path)


def test_materials_show_suggests_the_nearest_ids():
    assert _error("materials", "show", "natural-rubber") == (
        "error: materials show: no class with id 'natural-rubber'; "
        "did you mean 'rubber-natural', 'rubber-chloroprene', 'rubber-butyl'?\n"
    )


def test_materials_show_finds_a_class_by_its_short_name():
    assert "did you mean 'cfrp-ud'" in _error("materials", "show", "CFRP UD")


def test_materials_show_with_nothing_near_says_where_the_ids_are():
    assert _error("materials", "show", "qqqq").endswith("; `selector materials list` shows every class id\n")


def test_an_excluded_id_that_names_no_class_is_refused(tmp_path):
    spec = _edited(tmp_path, "camera-dolly-boom.toml", 'exclude = ["balsa"', 'exclude = ["balsawood"')
    assert _error("rank", spec) == (
        "error: screen.exclude[0]: no class with id 'balsawood'; did you mean 'balsa', 'plywood'?\n"
    )


def test_a_misspelt_family_is_suggested(tmp_path):
    spec = _edited(tmp_path, "camera-dolly-boom.toml", '"composite", "natural"]', '"composit"]')
    assert "families: 'composit' is not a family; did you mean 'composite'?" in _error("rank", spec)


def test_a_sandwich_face_is_suggested(tmp_path):
    spec = _edited(tmp_path, "walkway-hatch.toml", 'faces = ["metal", "composite"]', 'faces = ["cfrp_ud"]')
    assert _error("rank", spec).startswith(
        "error: sandwich.faces[0]: 'cfrp_ud' is neither a family nor a class id; did you mean 'cfrp-ud'"
    )


def test_a_chart_axis_and_an_index_line_class_are_suggested(tmp_path):
    out = str(tmp_path / "c.html")
    # an expression's error shows the text with a caret under the fault: three lines
    axis = _error("chart", "--x", "rhoo", "--y", "E", "-o", out, lines=3)
    assert "unknown property 'rhoo'; did you mean 'rho'?" in axis
    message = _error("chart", "--x", "rho", "--y", "E", "--index", "E/rho", "--through", "cfrp", "-o", out)
    assert "no drawn class with id 'cfrp'; did you mean 'cfrp-qi', 'cfrp-ud'" in message


@pytest.mark.parametrize(
    ("old", "new", "message"),
    [
        (
            'length = "1.8 m"',
            'length = "2 kN"',
            "part.length: got '2 kN', a force (N, kN, lbf …); expected a length (mm, in, ft …)",
        ),
        (
            'max_deflection = "4 mm"',
            'max_deflection = "4 lbf"',
            "max_deflection: got '4 lbf', a force (N, kN, lbf …); expected a length (mm, in, ft …)",
        ),
    ],
)
def test_a_quantity_of_the_wrong_kind_is_named(tmp_path, old, new, message):
    text = _error("rank", _edited(tmp_path, "camera-dolly-boom.toml", old, new))
    assert message in text
    assert "[length]" not in text and "[mass]" not in text

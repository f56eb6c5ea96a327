"""Tables fitted to the terminal: unit tests of the fitter and every printed table at 80, 120, 200 columns.

How a table may narrow is our own design (common practice for terminal tools, no source).
"""

from __future__ import annotations

from pathlib import Path

import pytest
from click.testing import CliRunner

from selector.cli import cli
from selector.outputs.terminal import Layout, fit_table, wrap

EXAMPLES = Path(__file__).parents[2] / "examples"
BOOM = str(EXAMPLES / "camera-dolly-boom.toml")
HATCH = str(EXAMPLES / "walkway-hatch.toml")
CFRP_QI = "Carbon fibre/epoxy, quasi-isotropic laminate (CFRP)"

HEADERS = ["rank", "class", "mass [kg]", "governing", "notes"]
ROWS = [
    ["1", "A very long class name for the first row", "1.5", "stiffness", "a long note " * 6],
    ["2", "Another long class name, second row", "2.5", "strength", ""],
    ["3", "Third", "3.5", "stiffness", "a long note " * 6],
]
LAYOUT = Layout(
    short={"class": ["First", "Second", "Third"]},
    notes=("notes",),
    optional=("governing",),
    elide=("class",),
)


def _widest(text: str) -> int:
    return max(len(line) for line in text.splitlines())


def test_without_a_width_every_cell_is_in_full_with_units_on_a_second_header_line():
    lines = fit_table(HEADERS, ROWS, None, LAYOUT).splitlines()
    assert lines[0].split() == ["rank", "class", "mass", "governing", "notes"]
    assert lines[1].strip() == "kg"
    assert ROWS[0][1] in lines[3] and ROWS[0][4].strip() in lines[3]


def test_notes_move_to_a_numbered_list_and_identical_notes_share_a_number():
    text = fit_table(HEADERS, ROWS, 100, LAYOUT)
    assert _widest(text) <= 100
    body = text.splitlines()
    assert body[0].split()[-1] == "note"
    assert body[3].rstrip().endswith("1") and body[5].rstrip().endswith("1")
    assert text.count("[1] a long note") == 1 and "[2]" not in text
    assert ROWS[0][1] in text  # the full name still fits


def test_short_names_then_left_out_columns_then_elision():
    at_50 = fit_table(HEADERS, ROWS, 50, LAYOUT)
    assert _widest(at_50) <= 50
    assert "First" in at_50 and "Second" in at_50 and ROWS[1][1] not in at_50
    assert "governing" in at_50  # short names were enough
    at_30 = fit_table(HEADERS, ROWS, 30, LAYOUT)
    assert _widest(at_30) <= 30
    assert "not shown at 30 columns: governing" in " ".join(at_30.split())


def test_a_very_narrow_terminal_still_gets_lines_no_longer_than_it():
    text = fit_table(HEADERS, ROWS, 12, LAYOUT)
    assert _widest(text) <= 12


def test_wrap_keeps_short_lines_and_indents_continuations():
    lines = wrap(["short", "word " * 8, "  indented " + "x " * 10], 24)
    assert all(len(line) <= 24 for line in lines)
    assert lines[:3] == ["short", "word word word word word", "  word word word"]
    assert lines[3].startswith("  indented") and lines[4].startswith("    x")
    assert wrap(["a\nb"], None) == ["a\nb"]


COMMANDS = [
    ("rank", BOOM),
    ("rank", BOOM, "--all"),
    ("rank", BOOM, "--robust", "200"),
    ("rank", BOOM, "--tradeoff", "cost"),
    ("rank", BOOM, "--tradeoff", "cost", "--exchange", "40 USD/kg"),
    ("rank", HATCH),
    ("rank", HATCH, "--tradeoff", "cost"),
    ("rank", str(EXAMPLES / "gate-return-spring.toml"), "--all"),
    ("materials", "list"),
    ("materials", "show", "cfrp-ud"),
    ("derive", "beam"),
    ("section", "i-section", "b=100mm", "h=200mm", "tf=10mm", "tw=6mm"),
]


def _run(args, columns: int | None, wide: bool = False) -> str:
    env = {"COLUMNS": str(columns)} if columns else {}
    result = CliRunner(env=env).invoke(cli, [*args, *(["--wide"] if wide else [])])
    assert result.exit_code == 0, result.output
    return result.stdout


@pytest.mark.parametrize("columns", [80, 120, 200])
@pytest.mark.parametrize("args", COMMANDS, ids=[" ".join(a[:1] + a[2:3]) for a in COMMANDS])
def test_every_printed_line_fits_the_terminal(args, columns):
    text = _run(args, columns)
    too_long = [line for line in text.splitlines() if len(line) > columns]
    assert not too_long, too_long[:3]


@pytest.mark.parametrize(
    "args",
    [("rank", BOOM), ("rank", BOOM, "--all"), ("rank", BOOM, "--robust", "200"), ("materials", "list")],
)
def test_full_names_appear_at_200_columns_and_short_ones_at_80(args):
    assert CFRP_QI in _run(args, 200)
    narrow = _run(args, 80)
    assert CFRP_QI not in narrow and "CFRP QI" in narrow


def test_rank_at_80_columns_keeps_the_size_and_the_objective_and_says_what_it_left_out():
    text = _run(("rank", BOOM), 80)
    header = text.splitlines()[text.splitlines().index("") + 1]
    assert header.split()[:5] == ["rank", "class", "index", "size", "mass"]
    assert "not shown at 80 columns: utilisation" in " ".join(text.split())
    assert "[1] only part of" in text  # the notes, numbered under the table


def test_wide_prints_every_column_whatever_the_terminal():
    text = _run(("rank", BOOM), 80, wide=True)
    assert CFRP_QI in text and "utilisation" in text and "not shown" not in text
    assert max(len(line) for line in text.splitlines()) > 200


def test_a_file_gets_every_column(tmp_path):
    out = tmp_path / "shortlist.txt"
    CliRunner(env={"COLUMNS": "80"}).invoke(cli, ["rank", BOOM, "-o", str(out)])
    assert CFRP_QI in out.read_text(encoding="utf-8")

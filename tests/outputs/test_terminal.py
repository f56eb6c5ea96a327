"""Tables fitted to the terminal: unit tests of the fitter and every printed table at 80, 120, 200 columns.

How a table may narrow is our own design (common practice for terminal tools, no source).
"""

from __future__ import annotations

import tomllib
from pathlib import Path

import pytest
from click.testing import CliRunner

from selector.cli import cli
from selector.outputs.terminal import Layout, Shorten, fit, fit_table, wrap

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
    notes=("notes",),
    steps=(Shorten("class", ["First", "Second", "Third"]), "governing"),
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


def test_a_shorter_header_and_a_unit_moved_above_are_steps_like_the_others():
    layout = Layout(steps=(Shorten("mass", name="m", unit=""), "governing"))
    wide = fit(HEADERS[:4], [r[:4] for r in ROWS], 200, layout)
    assert wide.shortened == frozenset() and "mass" in wide.text and "kg" in wide.text
    narrow = fit(HEADERS[:4], [r[:4] for r in ROWS], 62, layout)
    head = narrow.text.splitlines()
    assert head[0].split() == ["rank", "class", "m", "governing"] and "kg" not in narrow.text
    assert narrow.shortened == {"mass"} and "not shown" not in narrow.text  # the rename was enough
    # a column renamed by a step is still left out by its own name
    at_54 = fit(HEADERS[:4], [r[:4] for r in ROWS], 54, layout)
    assert (
        "governing" not in at_54.text.splitlines()[0] and "not shown at 54 columns: governing" in at_54.text
    )


def test_a_step_marked_always_applies_at_any_width():
    layout = Layout(steps=(Shorten("class", ["First", "Second", "Third"], always=True),))
    fitted = fit(HEADERS, ROWS, None, layout)
    assert "First" in fitted.text and ROWS[0][1] not in fitted.text and fitted.shortened == {"class"}


def test_an_empty_notes_column_goes_when_the_table_is_too_wide():
    rows = [[*r[:4], ""] for r in ROWS]
    text = fit_table(HEADERS, rows, 69, LAYOUT)
    assert "note" not in text and "notes" not in text


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


def _header(text: str, first: str = "rank") -> list[str]:
    """The names on the first header line of the table whose first column is ``first``."""
    return next(line.split() for line in text.splitlines() if line.startswith(first + "  "))


def test_rank_at_80_columns_keeps_status_objective_governing_cost_and_co2():
    text = _run(("rank", BOOM), 80)
    head = _header(text)
    assert head == ["rank", "class", "status", "M", "d×t", "mass", "cost", "CO2e", "governing", "note"]
    assert "not shown at 80 columns: utilisation, family (--wide" in text
    rows = [line for line in text.splitlines() if line.startswith(("1 ", "2*"))]
    assert "90.1×3.6" in rows[0] and rows[0].split()[-2:] == ["stiffness", "1"]  # the name only
    assert "[1] only part of" in text  # the notes, numbered under the table


def test_the_merit_index_line_states_the_unit_the_column_no_longer_shows():
    from selector.api import run_spec
    from selector.outputs.tables import index_shown

    unit = index_shown(run_spec(BOOM)).label
    narrow = " ".join(_run(("rank", BOOM), 80).split())
    assert f"M = E^(1/2)/ρ in {unit} (governs" in narrow
    table = narrow[narrow.index("rank class") :]
    assert unit not in table.split(" not shown")[0]
    assert f"in {unit}" in _run(("rank", BOOM), 200)


def _example_runs() -> list[tuple[str, ...]]:
    """Each bundled example as it is ranked: plain, --all, --units us, with a trade-off and odds."""
    runs: list[tuple[str, ...]] = []
    for spec in sorted(EXAMPLES.glob("*.toml")):
        data = tomllib.loads(spec.read_text(encoding="utf-8"))
        other = "mass" if data["objective"]["minimize"] == "cost" else "cost"
        base = ("rank", str(spec), "--top", "5")
        runs += [base, (*base, "--all"), (*base, "--units", "us")]
        runs.append((*base, "--tradeoff", other, "--exchange", "40 USD/kg", "--units", "us"))
        if data.get("section", {}).get("shape") != "sandwich":
            runs.append((*base, "--robust", "200"))
    return runs


EXAMPLE_RUNS = _example_runs()


@pytest.mark.parametrize("columns", [80, 120, 200])
@pytest.mark.parametrize(
    "args", EXAMPLE_RUNS, ids=[" ".join([Path(a[1]).stem, *a[4:5], *a[5:6]]) for a in EXAMPLE_RUNS]
)
def test_every_example_fits_and_keeps_what_an_engineer_reads_first(args, columns):
    text = _run(args, columns)
    lines = text.splitlines()
    assert not [line for line in lines if len(line) > columns]
    # a line cut short at the edge means a table did not fit (cells are elided, not lines)
    assert not [line for line in lines if len(line) == columns and line.endswith("…")]
    assert "CAUTION: Preliminary selection only" in text
    spec = tomllib.loads(Path(args[1]).read_text(encoding="utf-8"))
    objective = spec["objective"]["minimize"]
    shown = {objective, "CO2e"} if objective == "co2" else {objective}
    if "--tradeoff" in args or "--robust" in args:
        return
    if spec.get("section", {}).get("shape") == "sandwich":
        head = _header(text)
        assert {"face", "core", "governing"} <= set(head) and shown & set(head)
        return
    head = _header(text)
    assert {"status", "governing"} <= set(head) and shown & set(head), head


@pytest.mark.parametrize("columns", [80, 120, 200])
def test_the_front_and_the_penalty_table_name_classes_alike(columns):
    text = _run(("rank", BOOM, "--tradeoff", "cost", "--exchange", "40 USD/kg"), columns)
    rows = [line for line in text.splitlines() if line.startswith("mg-wrought ")]
    assert len(rows) == 2  # once in the front, once in the penalty ranking
    short = ["Mg wrought" in r for r in rows]
    full = ["Magnesium alloy, wrought" in r for r in rows]
    assert all(short) or all(full), rows
    assert all(short) if columns == 80 else True
    assert all(full) if columns == 200 else True


@pytest.mark.parametrize("columns", [80, 120, 200])
@pytest.mark.parametrize("spec", [BOOM, HATCH], ids=["boom", "hatch"])
def test_the_front_and_the_penalty_table_keep_the_same_naming_columns(spec, columns):
    text = _run(("rank", spec, "--tradeoff", "cost", "--exchange", "40 USD/kg", "--top", "5"), columns)
    heads = [set(line.split()) for line in text.splitlines() if line.startswith(("id  ", "name  "))]
    assert len(heads) == 2
    assert heads[0] & {"id", "name", "family"} == heads[1] & {"id", "name", "family"}


def test_the_sensitivity_table_leaves_out_the_leader_named_above_it_at_80_columns():
    text = _run(("rank", BOOM, "--robust", "200"), 80)
    head = _header(text, "property")
    assert "leader" not in head and head[0] == "property" and "p_best_drop" in head
    assert "Sensitivity of the leader (cfrp-qi)" in text


def test_sandwich_pairs_at_80_columns_keep_the_objective_cost_and_both_thicknesses():
    text = _run(("rank", HATCH, "--top", "5"), 80)
    head = _header(text)
    assert head[:7] == ["rank", "face", "core", "t_face", "t_core", "mass", "cost"]
    assert "governing" in head and "face_name" not in text


def test_materials_show_heads_the_table_with_the_full_name():
    text = _run(("materials", "show", "structural-steel"), 80)
    assert text.splitlines()[0].startswith("structural-steel: Structural steel")
    assert "…" not in text


def test_wide_prints_every_column_whatever_the_terminal():
    text = _run(("rank", BOOM), 80, wide=True)
    assert CFRP_QI in text and "utilisation" in text and "not shown" not in text
    assert max(len(line) for line in text.splitlines()) > 200


def test_a_file_gets_every_column(tmp_path):
    out = tmp_path / "shortlist.txt"
    CliRunner(env={"COLUMNS": "80"}).invoke(cli, ["rank", BOOM, "-o", str(out)])
    assert CFRP_QI in out.read_text(encoding="utf-8")

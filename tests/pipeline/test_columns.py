"""The Selection table's column names have one home, and the outputs' headers are built from it."""

from __future__ import annotations

from pathlib import Path

import pytest

from selector.api import run_spec
from selector.outputs.report import shortlist_rows
from selector.outputs.tables import column_headers, selection_frame, sized_value_headers, split_header
from selector.pipeline import columns

EXAMPLES = Path(__file__).parents[2] / "examples"

NAMED = {
    value
    for name, value in vars(columns).items()
    if name.isupper() and not name.startswith("_") and isinstance(value, str)
}


@pytest.fixture(scope="module")
def sized():
    # a shaft, so the twist column is written too
    return run_spec(EXAMPLES / "winch-drive-shaft.toml")


def test_every_named_column_is_in_a_sized_table(sized):
    # project convention, no source: a name in selector.pipeline.columns that the pipeline no
    # longer writes would make every output that reads it fail
    assert sized.has_sizes
    missing = sorted(NAMED - set(sized.table.columns))
    assert not missing, missing


def test_index_columns_are_the_indices_not_their_range_ends():
    # project convention, no source: index_<constraint> holds a further constraint's index
    assert columns.is_index_column(columns.INDEX)
    assert columns.is_index_column(columns.constraint_index("strength"))
    assert columns.is_index_column(columns.INDEX_WITH_SHAPE)
    for name in (columns.INDEX_LOW, columns.INDEX_HIGH, columns.MASS, "indexed"):
        assert not columns.is_index_column(name), name


def test_headers_name_the_columns_of_the_shortlist_frame(sized):
    heads = column_headers(sized, "us")
    frame = selection_frame(sized, "us")
    for name in (columns.INDEX, columns.INDEX_LOW, columns.INDEX_HIGH, *columns.SIZED_VALUES):
        assert heads[name] in frame.columns
        assert split_header(heads[name])[0] == name
    # the international pound (1959 international yard and pound agreement; from memory)
    assert split_header(heads[columns.MASS]) == ("mass", "lb")
    assert sized_value_headers(sized, "us") == [heads[c] for c in columns.SIZED_VALUES]
    header, rows = shortlist_rows(sized, "us")
    assert header["index"] == split_header(heads[columns.INDEX])[1]
    assert [name for name, _ in header["values"]] == list(columns.SIZED_VALUES)
    assert len(rows) == len(sized.shortlist)


def test_split_header_leaves_a_plain_name_alone():
    assert split_header("governing") == ("governing", None)
    assert split_header("co2 [kg CO2e]") == ("co2", "kg CO2e")

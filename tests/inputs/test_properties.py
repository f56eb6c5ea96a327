"""The typical value of a range: one definition, read the same way by ranking, sizing and charts."""

from __future__ import annotations

import numpy as np
import pytest

from selector.inputs.properties import PROPERTIES, typical_value
from selector.outputs.charts.axes import axis_spec, axis_values
from selector.pipeline.rank import property_arrays
from tests.conftest import make_table


def test_geometric_mean_on_a_log_scale():
    # The geometric mean of 1 and 100 is 10 (definition: √(1·100)).
    assert typical_value(1.0, 100.0) == pytest.approx(10.0)
    # Element-wise on arrays; a point range is its own typical value.
    np.testing.assert_allclose(typical_value([2.0, 3.0], [8.0, 3.0]), [4.0, 3.0])


def test_midpoint_on_a_linear_scale():
    # A range of -50 to 150 °C has its midpoint at 50 °C (definition: (low + high)/2).
    assert typical_value(-50.0, 150.0, log=False) == pytest.approx(50.0)


def test_negative_product_on_a_log_scale_is_nan_without_a_warning():
    # The suite turns warnings into errors, so a RuntimeWarning here would fail the test.
    assert np.isnan(typical_value(-1.0, 4.0))


def test_each_property_averages_on_its_own_scale():
    """Log-scale properties take the geometric mean, linear ones (ν, temperatures) the midpoint."""
    for symbol, prop in PROPERTIES.items():
        expected = 50.0 if not prop.log else 40.0
        assert prop.typical(20.0, 80.0) == pytest.approx(expected), symbol


def test_ranking_and_chart_agree_on_the_typical_value():
    """The rank step's typical values and the chart's class markers are the same numbers."""
    table = make_table(
        [
            {"id": "a", "E": (10.0, 1000.0), "T_max": (-20.0, 180.0)},
            {"id": "b", "E": (4.0, 9.0), "T_max": (100.0, 100.0)},
        ]
    )
    _, _, mid = property_arrays(table, ["E", "T_max"])
    np.testing.assert_allclose(mid["E"], [100.0, 6.0])  # √(10·1000), √(4·9)
    np.testing.assert_allclose(mid["T_max"], [80.0, 100.0])  # (−20 + 180)/2
    for symbol in ("E", "T_max"):
        axis = axis_spec(symbol)
        _, _, centre = axis_values(table, axis)
        np.testing.assert_allclose(centre, mid[symbol])

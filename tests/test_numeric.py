"""The one bisection helper, on conditions whose change point is known in closed form."""

from __future__ import annotations

import math

import numpy as np
import pytest

from selector.numeric import bisect_log


def test_scalar_search_finds_the_square_root_of_two():
    # x² ≥ 2 first holds at √2 (arithmetic, no source)
    seen: list[type] = []

    def holds(x):
        seen.append(type(x))
        return x * x >= 2

    low, high = bisect_log(holds, 1.0, 4.0, 60)
    assert float(low) <= math.sqrt(2) <= float(high)
    assert float(high) == pytest.approx(math.sqrt(2), rel=1e-12)
    assert set(seen) == {float}, "a scalar search passes plain floats"


def test_each_step_halves_the_bracket_in_log_space():
    low, high = bisect_log(lambda x: x >= 10.0, 1.0, 1000.0, 10)
    # log range ln(1000) halved ten times (arithmetic, no source)
    assert math.log(float(high) / float(low)) == pytest.approx(math.log(1000.0) / 2**10)


def test_array_search_runs_many_at_once():
    # t³ ≥ c first holds at the cube root of c (arithmetic, no source)
    targets = np.array([1e-6, 0.5, 8.0, 2.7e4])
    calls = []

    def holds(t):
        calls.append(np.shape(t))
        return t**3 >= targets

    _, high = bisect_log(holds, np.full(4, 1e-4), np.full(4, 1e3), 70)
    np.testing.assert_allclose(high, np.cbrt(targets), rtol=1e-12)
    assert set(calls) == {(4,)}, "one call evaluates every search"


def test_a_condition_true_throughout_leaves_the_low_end_moving_down_to_it():
    low, high = bisect_log(lambda x: True, 1.0, 16.0, 40)
    assert float(high) == pytest.approx(1.0, rel=1e-9)
    assert float(low) == 1.0

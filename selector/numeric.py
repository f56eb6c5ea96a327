"""The one bisection: where a monotone condition starts to hold, searched on a log scale."""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

import numpy as np


def bisect_log(holds: Callable[[Any], Any], lo: Any, hi: Any, steps: int) -> tuple[np.ndarray, np.ndarray]:
    """Narrow ``[lo, hi]`` (both > 0) about the point where ``holds`` turns from false to true.

    ``holds`` is taken as false at ``lo`` and true at ``hi``; each step halves the bracket in
    log space (the trial point is the geometric mean), keeping ``holds`` false at the low end
    and true at the high end. Scalar ``lo`` and ``hi`` call ``holds`` with a float; arrays
    (any one broadcastable shape) call it with an array and take a boolean array back, so
    many searches run at once.

    Returns:
        (low end, high end) of the final bracket, as arrays (0-d for scalar input).
    """
    scalar = np.ndim(lo) == 0 and np.ndim(hi) == 0
    log_lo, log_hi = np.broadcast_arrays(np.log(np.asarray(lo, float)), np.log(np.asarray(hi, float)))
    for _ in range(steps):
        mid = 0.5 * (log_lo + log_hi)
        ok = bool(holds(float(np.exp(mid)))) if scalar else np.asarray(holds(np.exp(mid)), dtype=bool)
        log_lo, log_hi = np.where(ok, log_lo, mid), np.where(ok, mid, log_hi)
    return np.exp(log_lo), np.exp(log_hi)

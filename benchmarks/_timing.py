"""Shared timing helpers for the benchmark scripts (not part of the package)."""

from __future__ import annotations

import os
import platform
import sys
import time
from collections.abc import Callable
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
if str(ROOT) not in sys.path:
    sys.path.insert(0, str(ROOT))


def best_of(fn: Callable[[], object], repeat: int = 5) -> tuple[float, object]:
    """Shortest wall time of ``repeat`` runs [s], and the last result."""
    best, result = float("inf"), None
    for _ in range(repeat):
        start = time.perf_counter()
        result = fn()
        best = min(best, time.perf_counter() - start)
    return best, result


def machine() -> str:
    """One line about where the numbers were measured."""
    import numpy as np

    cores = os.cpu_count()
    return f"python {platform.python_version()}, numpy {np.__version__}, {cores} cores, {platform.machine()}"


def report(
    title: str, ours: float, baseline: float, target: str, met: bool, baseline_label: str = "numpy baseline"
) -> None:
    """Print the two timings, their ratio and whether the target was met."""
    print(title)
    print(f"  machine:        {machine()}")
    print(f"  selector:       {ours * 1e3:9.1f} ms")
    print(f"  {baseline_label + ':':<15} {baseline * 1e3:9.1f} ms")
    print(f"  ratio:          {ours / baseline:9.2f} x")
    print(f"  target:         {target}: {'target met' if met else 'target missed'}")

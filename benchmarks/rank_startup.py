"""Whole-process time of `selector rank` against `python -c "import pandas"`, in the same run.

Run: python benchmarks/rank_startup.py [--runs N]
Target: the rank command takes at most 1.6 times as long as importing pandas.
"""

from __future__ import annotations

import argparse
import statistics
import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
SPEC = ROOT / "examples" / "camera-dolly-boom.toml"
TARGET = 1.6


def _median_seconds(command: list[str], runs: int) -> float:
    times = []
    for _ in range(runs):
        start = time.perf_counter()
        subprocess.run(command, check=True, stdout=subprocess.DEVNULL, cwd=ROOT)
        times.append(time.perf_counter() - start)
    return statistics.median(times)


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--runs", type=int, default=7)
    runs = parser.parse_args().runs
    subprocess.run(
        [sys.executable, "-m", "selector", "rank", str(SPEC)], check=True, stdout=subprocess.DEVNULL
    )
    baseline = _median_seconds([sys.executable, "-c", "import pandas"], runs)
    ranked = _median_seconds([sys.executable, "-m", "selector", "rank", str(SPEC)], runs)
    ratio = ranked / baseline
    print(f"baseline  python -c 'import pandas'   {baseline:.3f} s (median of {runs})")
    print(f"measured  selector rank {SPEC.name}  {ranked:.3f} s (median of {runs})")
    verdict = "target met" if ratio <= TARGET else "target missed"
    print(f"ratio {ratio:.2f} (target <= {TARGET}): {verdict}")


if __name__ == "__main__":
    main()

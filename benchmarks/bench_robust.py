"""Robustness of a sized ranking: 100 classes × 10⁴ draws.

The library path is ``robustness`` on a sized selection (a cantilever with a
stiffness and a strength limit; E, ρ and σ_y drawn log-uniformly). The baseline
does the same arithmetic on bare numpy arrays: draw three properties, evaluate
both closed-form masses, keep the larger, rank every draw and count the ranks.
Target: under 0.5 s.
"""

from __future__ import annotations

import numpy as np
from _timing import ROOT, best_of, report

from selector.inputs.spec import spec_from_dict
from selector.pipeline.robust import robustness
from selector.pipeline.selection import select

CLASSES = 100
DRAWS = 10_000
TARGET_S = 0.5


def synthetic_selection():
    """Invented classes sized as a cantilever (benchmark data only)."""
    import sys

    sys.path.insert(0, str(ROOT))
    from tests.conftest import make_table

    rng = np.random.default_rng(4)
    rows = []
    for i in range(CLASSES):
        e, rho, sy = rng.uniform(50, 80), rng.uniform(2000, 3000), rng.uniform(100, 400)
        rows.append(
            {
                "id": f"m{i}",
                "E": (e, e * rng.uniform(1, 1.5)),
                "rho": (rho, rho * rng.uniform(1, 1.2)),
                "sigma_y": (sy, sy * 1.3),
                "sigma_ts": (sy * 1.2, sy * 1.5),
            }
        )
    spec = spec_from_dict(
        {
            "title": "benchmark cantilever",
            "part": {
                "function": "beam",
                "support": "cantilever",
                "load": "end",
                "length": "1 m",
                "force": "500 N",
            },
            "section": {"shape": "rectangle", "free": "scale", "b": "20 mm", "h": "40 mm"},
            "constraint": [
                {"type": "stiffness", "max_deflection": "5 mm"},
                {"type": "strength", "safety_factor": 1.5},
            ],
        }
    )
    return select(spec, make_table(rows))


# Cantilever, end load F = 500 N, L = 1 m, rectangle h = 2b (I = 2b⁴/3, Z = 2b³/3, A = 2b²):
#   stiffness, δ = 5 mm:  I = F L³/(3 E δ)   → m = 2 ρ L (1.5 I)^½
#   strength, SF = 1.5:   Z = SF F L/σ_y     → m = 2 ρ L (1.5 Z)^⅔
F, L, DELTA, SF = 500.0, 1.0, 0.005, 1.5


def baseline(lo: dict[str, np.ndarray], hi: dict[str, np.ndarray], seed: int) -> np.ndarray:
    """The same Monte Carlo written out by hand on bare arrays; returns p_best per class."""
    rng = np.random.default_rng(seed)
    n = len(lo["E"])
    x = {s: np.exp(np.log(lo[s]) + rng.random((DRAWS, n)) * (np.log(hi[s]) - np.log(lo[s]))) for s in lo}
    stiff = 2 * x["rho"] * L * (1.5 * F * L**3 / (3 * DELTA)) ** 0.5 * x["E"] ** -0.5
    strong = 2 * x["rho"] * L * (1.5 * SF * F * L) ** (2 / 3) * x["sigma_y"] ** (-2 / 3)
    mass = np.fmax(stiff, strong)
    order = np.argsort(mass, axis=1, kind="stable")
    ranks = np.empty_like(order)
    np.put_along_axis(ranks, order, np.arange(n)[None, :], axis=1)
    counts = np.bincount((np.arange(n)[None, :] * n + ranks).ravel(), minlength=n * n).reshape(n, n)
    return counts[:, 0] / DRAWS


def main() -> None:
    sel = synthetic_selection()
    cand = sel.shortlist
    assert len(cand) == CLASSES
    ours, result = best_of(lambda: robustness(sel, draws=DRAWS))
    factors = {"E": 1e9, "rho": 1.0, "sigma_y": 1e6}
    lo = {s: cand[f"{s}_low"].to_numpy(float) * f for s, f in factors.items()}
    hi = {s: cand[f"{s}_high"].to_numpy(float) * f for s, f in factors.items()}
    base, p_base = best_of(lambda: baseline(lo, hi, 1))
    report(
        f"robustness of {CLASSES} sized classes x {DRAWS:,} draws (leader {result.leader}, "
        f"p_best {result.table['p_best'].iat[0]:.3f})",
        ours,
        base,
        f"under {TARGET_S:g} s",
        ours < TARGET_S,
    )
    # Independent random streams: the odds must agree within Monte Carlo error (4 standard errors).
    p_ours = result.table.set_index("id").loc[cand["id"], "p_best"].to_numpy()
    se = np.sqrt((p_ours * (1 - p_ours) + p_base * (1 - p_base)) / DRAWS)
    agree = bool(np.all(np.abs(p_ours - p_base) <= 4 * se + 1e-12))
    print(f"  check:          odds agree with the hand-written baseline within 4 standard errors: {agree}")


if __name__ == "__main__":
    main()

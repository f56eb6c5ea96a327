"""100 face classes × 30 core classes: every pair sized by both thicknesses.

The library path is ``size_pairs`` (screened table in, ranked pairs table out, each
pair's face and core thicknesses optimised, utilisations, deflection parts and
warnings). The baseline is a bare-numpy brute force over a 64 × 64 log grid of both
thicknesses for the same 3000 pairs, in chunks; the library's answer must be no
heavier than the grid's on any pair. Target: under 1 s for the library.
"""

from __future__ import annotations

import math

import numpy as np
import pandas as pd
from _timing import best_of, report

from selector.inputs.properties import PROPERTIES
from selector.mechanics import sandwich as sw
from selector.pipeline.sandwich import SandwichLoads, size_pairs

FACES, CORES = 100, 30
GRID = 64
LOADS = {"F": 1500.0, "L": 0.9, "b": 0.6, "delta": 3e-3, "SF": 2.0}


def synthetic(seed: int = 1) -> pd.DataFrame:
    """Invented face and core classes with log-spread ranges (benchmark data only)."""
    rng = np.random.default_rng(seed)
    rows = []
    spans = {
        "metal": {"rho": (1500, 9000), "E": (40, 220), "sigma_y": (80, 1200), "price": (1, 40)},
        "foam": {"rho": (30, 300), "E": (0.01, 0.5), "sigma_y": (0.2, 6), "price": (3, 60)},
    }
    for family, count in (("metal", FACES), ("foam", CORES)):
        for i in range(count):
            row: dict[str, object] = {"id": f"{family}-{i}", "name": f"{family} {i}", "family": family}
            for symbol, (lo, hi) in spans[family].items():
                mid = math.exp(rng.uniform(math.log(lo), math.log(hi)))
                row[PROPERTIES[symbol].low], row[PROPERTIES[symbol].high] = mid / 1.2, mid * 1.2
            for symbol in ("sigma_c", "co2"):
                row[PROPERTIES[symbol].low] = row[PROPERTIES["sigma_y"].low] if symbol == "sigma_c" else 2.0
                row[PROPERTIES[symbol].high] = row[PROPERTIES["sigma_y"].high] if symbol == "sigma_c" else 4.0
            e_lo, e_hi = row["E_low"], row["E_high"]
            row["G_low"], row["G_high"] = e_lo * 0.38, e_hi * 0.38
            if family == "foam":
                row["E_core_low"], row["E_core_high"] = e_lo, e_hi
                row["G_core_low"], row["G_core_high"] = e_lo * 0.38, e_hi * 0.38
                row["tau_core_low"], row["tau_core_high"] = (
                    row["sigma_y_low"] * 0.7,
                    row["sigma_y_high"] * 0.7,
                )
            rows.append(row)
    table = pd.DataFrame(rows)
    for prop in PROPERTIES.values():
        for col in (prop.low, prop.high):
            if col not in table:
                table[col] = np.nan
    return table.assign(status="passes")


def grid_baseline(table: pd.DataFrame, case: sw.SandwichCase) -> np.ndarray:
    """The least mass per unit b·L of every pair over a GRID × GRID log grid, bare numpy."""
    faces, cores = table[table["family"] == "metal"], table[table["family"] == "foam"]

    def mid(rows: pd.DataFrame, symbol: str) -> np.ndarray:
        prop = PROPERTIES[symbol]
        return np.sqrt(rows[prop.low].to_numpy() * rows[prop.high].to_numpy()) * prop.si_factor

    ef, af, rf = mid(faces, "E"), np.fmin(mid(faces, "sigma_y"), mid(faces, "sigma_c")), mid(faces, "rho")
    ec, gc, tc_, rc = mid(cores, "E_core"), mid(cores, "G_core"), mid(cores, "tau_core"), mid(cores, "rho")
    t_f = np.geomspace(0.5e-3, LOADS["L"] / 8, GRID)[:, None]
    t_c = np.geomspace(5e-3, LOADS["L"] / 4, GRID)[None, :]
    best = np.empty((len(ef), len(ec)))
    for i in range(len(ef)):  # one face at a time: cores × grid × grid
        face = {"E": ef[i], "allow": af[i]}
        core = {"E": ec[:, None, None], "G": gc[:, None, None], "tau": tc_[:, None, None]}
        util = sw.utilisations(case, LOADS, face, core, t_f[None], t_c[None])
        ok = np.logical_and.reduce(np.broadcast_arrays(*[u <= 1 for u in util.values()]))
        mass = np.where(ok, 2 * rf[i] * t_f[None] + rc[:, None, None] * t_c[None], np.inf)
        best[i] = mass.reshape(len(ec), -1).min(axis=1)
    return best.ravel()


def main() -> None:
    table = synthetic()
    case = sw.sandwich_case("simply-supported", "centre")
    loads = SandwichLoads(
        case, "panel", **{k: LOADS[k] for k in ("F", "L", "b", "delta", "SF")}, objective="mass"
    )
    ours, result = best_of(lambda: size_pairs(table, loads, ["metal"], ["foam"]))
    base, grid = best_of(lambda: grid_baseline(table, case), repeat=1)
    pairs = result.pairs.set_index(["face", "core"])
    faces = [f"metal-{i}" for i in range(FACES)]
    cores = [f"foam-{j}" for j in range(CORES)]
    mass = pairs["mass"].reindex(pd.MultiIndex.from_product([faces, cores])).to_numpy() / (
        LOADS["b"] * LOADS["L"]
    )
    found = np.isfinite(grid)
    worse = int((mass[found] > grid[found] * (1 + 1e-6)).sum())
    assert worse == 0, f"{worse} pairs heavier than the brute-force grid"
    report(
        f"{FACES} faces × {CORES} cores = {FACES * CORES:,} pairs sized "
        f"({int(result.pairs['feasible'].sum()):,} feasible; none heavier than a {GRID}×{GRID} grid)",
        ours,
        base,
        "library under 1 s",
        ours < 1.0,
    )


if __name__ == "__main__":
    main()

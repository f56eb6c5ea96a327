"""Edge conditions of a plate under in-plane compression, and the buckling check they give.

A plate of length a (along the load), width b and thickness t buckles at
σ_cr = k·π²·E/(12(1−ν²))·(t/b)². Coefficients (Timoshenko & Gere, *Theory of
Elastic Stability*, 2nd ed., §9.2 and Table 9.4 — from memory):

* ``supported``: all four edges simply supported, k = (m·b/a + a/(m·b))² at the
  number of half-waves m that gives the least value (k = 4 when a/b is a whole number,
  larger for a short plate);
* ``clamped``: the long (unloaded) edges clamped, k = 6.97 for a long plate — the
  value is used for every length, which is conservative for short plates;
* ``free-sides``: the long edges free, so the strip buckles as an Euler column of
  length a with pinned loaded ends: σ_cr = π²·E·t²/(12·a²) (ν and the width drop out).
"""

from __future__ import annotations

import math
from dataclasses import replace

from selector.mechanics.loadcases import PLATE_NU, LoadCase
from selector.mechanics.monomial import Monomial as M

PLATE_EDGES = ("supported", "clamped", "free-sides")
CLAMPED_K = 6.97
"""Long plate, unloaded edges clamped (Timoshenko & Gere, Table 9.4 — from memory)."""


def supported_k(aspect: float) -> float:
    """k = min over m of (m/α + α/m)² for a plate of aspect α = a/b, all edges simply supported."""
    m_best = max(1, math.floor(aspect))
    return min((m / aspect + aspect / m) ** 2 for m in (m_best, m_best + 1))


def plate_case(base: LoadCase, edges: str, length: float | None, width: float | None) -> LoadCase:
    """The plate case for ``edges``; ``length`` a and ``width`` b [m] set k where it depends on a/b."""
    factor = math.pi**2 / (12 * (1 - PLATE_NU**2))
    if edges == "free-sides":
        buckling = M.of(12 / math.pi**2, F=1, SF=1, L=2, b=-1, E=-1, t=-3)
        text = "σ = F/(b·t) ≤ σ_cr/SF, σ_cr = π²·E·t²/(12·L²) (long edges free: an Euler strip, pinned ends)"
    else:
        if edges == "supported":
            if length and width:
                k = supported_k(length / width)
                how = f"all edges simply supported, k = {k:.3g} at a/b = {length / width:.3g}"
            else:
                k, how = 4.0, "all edges simply supported, k = 4 (long plate)"
        else:
            k = CLAMPED_K
            how = f"long edges clamped, k = {k:g} (long-plate value)"
        buckling = M.of(1 / (k * factor), F=1, SF=1, b=1, E=-1, t=-3)
        text = f"σ = F/(b·t) ≤ σ_cr/SF, σ_cr = k·π²·E/(12(1−ν²))·(t/b)², {how}, ν = {PLATE_NU}"
    return replace(
        base,
        title=f"plate under in-plane compression ({edges} edges)",
        utilisation=base.utilisation | {"buckling": buckling},
        equations=base.equations | {"buckling": text},
        notes=(),  # the buckling equation states the edges, k and ν
    )

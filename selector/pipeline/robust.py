"""Robustness of a ranking: Monte Carlo over the property ranges of each class.

Each property a ranking uses is drawn, for every candidate and every draw,
independently within the class's low–high range, and the candidates are ranked
again in each draw. The odds of being best, of being in the top k and the spread
of each candidate's rank follow.

Distributions (``t`` is the value's logarithm for log-scale properties and the
value itself for linear ones, between ``a = t(low)`` and ``b = t(high)``):

* ``log-uniform`` (default): t uniform on [a, b].
* ``triangular``: t on the symmetric triangle over [a, b], peaked at the centre
  (the geometric mean for log-scale properties).
* ``log-normal``: t normal with mean (a + b)/2 and standard deviation (b − a)/4,
  so the range spans ±2σ and holds about 95.4 % of the draws. With ``clip=True``
  (the default) draws beyond the range are set to its ends (about 2.3 % at each
  end); with ``clip=False`` they are kept.

Properties of one class are drawn independently of each other (correlations
within a class are not modelled). A derived property is not drawn: the Goodman
fatigue strength σ_R = 2/((1−R)/σe + (1+R)/σts) is recombined in every draw from
that draw's σe and σts. A sized part's checks that set no size (a tie's axial
frequency, yield before break) are re-run in every draw, and a class that fails
one ranks last in that draw. The brittle rule is not re-drawn: it is a screen on
the class's K_IC range (partly passing classes already keep only the part above
the threshold), and K_IC enters the ranking only with a fracture constraint, which
lifts the rule. The hot path is numpy over a draws × classes
array; draws are processed in blocks to bound memory, with no Python loop over
single draws or classes. Results are deterministic for a given seed: each
property has its own random stream derived from the seed, so runs that sample
fewer properties see the same draws of the ones they keep.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Mapping
from dataclasses import dataclass, field
from typing import TYPE_CHECKING

import numpy as np
import pandas as pd

from selector.errors import InputError
from selector.inputs.properties import DERIVED_PROPERTIES, PROPERTIES, property_of
from selector.suggest import did_you_mean

if TYPE_CHECKING:
    from selector.pipeline.selection import Selection

DEFAULT_SEED = 20261202
"""Seed used when none is given, so that repeated runs agree."""
DEFAULT_DRAWS = 10_000
DEFAULT_TOP_K = 3
DISTRIBUTIONS = ("log-uniform", "triangular", "log-normal")
BLOCK_ELEMENTS = 4_000_000
"""Draws are processed in blocks of about this many draw × class values."""
_PROPERTY_STREAM = {symbol: i for i, symbol in enumerate(PROPERTIES)}
_TIE_STREAM = len(PROPERTIES)
_PROPERTY_STREAM |= {symbol: _TIE_STREAM + 1 + i for i, symbol in enumerate(DERIVED_PROPERTIES)}
MATERIAL_SYMBOLS = frozenset(PROPERTIES) | frozenset(DERIVED_PROPERTIES)

KeyFunction = Callable[[Mapping[str, np.ndarray]], np.ndarray]


@dataclass(frozen=True)
class RobustResult:
    """Odds of each ranked candidate under the scatter of its properties.

    Attributes:
        table: id, name, family, rank (the ranking at typical values), p_best,
            p_best_se, p_top_k, p_top_k_se, rank_p05, rank_p50, rank_p95; most
            likely best first. ``*_se`` are Monte Carlo standard errors,
            √(p(1 − p)/draws).
        draws: number of Monte Carlo draws.
        seed: the seed used.
        distribution: how each property was drawn within its range.
        clip: whether log-normal draws were clipped to the range.
        top_k: k of ``p_top_k``.
        ranked_by: "index" (higher is better) or the sized objective (lower is better).
        properties: the property symbols drawn.
    """

    table: pd.DataFrame
    draws: int
    seed: int
    distribution: str
    clip: bool
    top_k: int
    ranked_by: str
    properties: tuple[str, ...] = field(default=())

    @property
    def leader(self) -> str | None:
        """Id of the candidate most likely to be best (None when nothing is ranked)."""
        return None if self.table.empty else str(self.table["id"].iat[0])


def sample(
    low: np.ndarray,
    high: np.ndarray,
    draws: int,
    rng: np.random.Generator,
    distribution: str = "log-uniform",
    log: bool = True,
    clip: bool = True,
) -> np.ndarray:
    """Draws within each class's range, as a (draws, classes) array.

    Args:
        low, high: the range of each class (any unit; for ``log=True`` both > 0).
        draws: number of draws per class.
        rng: the random generator.
        distribution: log-uniform, triangular or log-normal (see the module notes;
            for a linear property the same shapes apply to the value itself).
        log: sample on a log scale (True) or a linear one.
        clip: clip log-normal draws to [low, high]; other distributions always stay inside.
    """
    lo = np.asarray(low, dtype=float)
    hi = np.asarray(high, dtype=float)
    a, b = (np.log(lo), np.log(hi)) if log else (lo, hi)
    shape = (int(draws), lo.size)
    if distribution == "log-normal":
        t = (a + b) / 2 + rng.standard_normal(shape) * ((b - a) / 4)
    else:
        u = rng.random(shape)
        if distribution == "log-uniform":
            t = a + u * (b - a)
        elif distribution == "triangular":
            w = b - a
            t = np.where(u < 0.5, a + w * np.sqrt(u / 2), b - w * np.sqrt((1 - u) / 2))
        else:
            raise InputError(
                "distribution",
                f"{distribution!r} is not a distribution",
                did_you_mean(distribution, DISTRIBUTIONS),
            )
    x = np.exp(t) if log else t
    if distribution != "log-normal" or clip:
        # Also absorbs round-off of exp(log(x)) at the ends of the range.
        x = np.clip(x, lo, hi)
    return x


def _check_options(draws: object, seed: object, distribution: object, top_k: object) -> None:
    if isinstance(draws, bool) or not isinstance(draws, int | np.integer) or draws < 1:
        raise InputError("--robust", f"{draws!r} draws", "a whole number of draws of 1 or more, e.g. 10000")
    if isinstance(seed, bool) or not isinstance(seed, int | np.integer) or seed < 0:
        raise InputError("--seed", f"{seed!r} is not a seed", "a whole number of 0 or more")
    if distribution not in DISTRIBUTIONS:
        raise InputError(
            "distribution",
            f"{distribution!r} is not a distribution",
            did_you_mean(str(distribution), DISTRIBUTIONS),
        )
    if isinstance(top_k, bool) or not isinstance(top_k, int | np.integer) or top_k < 1:
        raise InputError("top_k", f"{top_k!r}", "a whole number of 1 or more")


def _ranges(
    cand: pd.DataFrame, symbols: tuple[str, ...]
) -> tuple[dict[str, np.ndarray], dict[str, np.ndarray]]:
    """Stored-unit low and high of each symbol; a range that cannot be sampled is an error."""
    low, high = {}, {}
    for s in symbols:
        prop = property_of(s)
        lo = cand[prop.low].to_numpy(dtype=float)
        hi = cand[prop.high].to_numpy(dtype=float)
        bad = ~(np.isfinite(lo) & np.isfinite(hi) & (lo <= hi)) | ((lo <= 0) if prop.log else False)
        if bad.any():
            i = int(np.flatnonzero(bad)[0])
            raise InputError(
                f"class {cand['id'].iat[i]}: {prop.low}, {prop.high}",
                f"range {float(lo[i])!r}–{float(hi[i])!r} cannot be sampled",
                "finite values with low ≤ high" + (", both above zero" if prop.log else ""),
            )
        low[s], high[s] = lo, hi
    return low, high


def _model(selection: Selection) -> tuple[pd.DataFrame, tuple[str, ...], KeyFunction]:
    """Ranked candidates, the stored properties drawn and a key (lower = better) of stored-unit values.

    A derived property (the Goodman strength sigma_R) is never drawn itself: its stored
    parts (sigma_e, sigma_ts) are, and it is recombined in every draw. A sized part's
    size-free checks (a tie's axial frequency, yield before break) are re-checked in
    every draw; a class that fails one in a draw ranks last in that draw.
    """
    from selector.pipeline import failure_limits as fl

    cand = selection.shortlist.reset_index(drop=True)
    if not selection.sized and selection.expression is not None:
        expr = selection.parsed_index
        assert expr is not None  # a Selection ranked by a typed index carries it parsed

        def expression_key(values: Mapping[str, np.ndarray]) -> np.ndarray:
            return -np.asarray(expr.evaluate(values))

        return cand, tuple(sorted(expr.symbols)), expression_key
    load_ratio = fl.requirement_of(list(selection.spec.constraint))[1]
    if not selection.sized:
        exponents = dict(selection.derivations[0].exponents)

        def index_key(values: Mapping[str, np.ndarray]) -> np.ndarray:
            full = fl.with_derived_values(values, load_ratio)
            result: np.ndarray | float = 1.0
            with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
                for s, p in exponents.items():
                    result = result * full[s] ** p
            return -np.asarray(result)

        return cand, fl.stored_symbols(exponents), index_key

    from selector.pipeline.sizing import objective_samples, screen_samples

    derivations = list(selection.derivations)
    design = selection.design
    assert design is not None  # a Selection with sized parts carries its design
    if design.free == "none":
        # A given part: only the material factor of the objective varies (feasibility is not re-drawn).
        from selector.mechanics.objectives import OBJECTIVE_FACTORS

        used = set(OBJECTIVE_FACTORS[selection.spec.objective.minimize].symbols)
    else:
        used = set().union(*(d.objective_value.symbols for d in derivations))
        used |= set().union(*(d.material_factor.symbols for d in derivations if d.screen))
        used &= MATERIAL_SYMBOLS
    symbols = fl.stored_symbols(used)
    factors = {s: property_of(s).si_factor for s in used | set(symbols)}

    def sized(values: Mapping[str, np.ndarray]) -> tuple[np.ndarray, np.ndarray | None]:
        full = fl.with_derived_values(values, load_ratio)
        si = {s: full[s] * factors[s] for s in factors}
        return objective_samples(derivations, design, si), screen_samples(derivations, design, si)

    # The closed-form objective can differ from the exactly sized part (thin-wall
    # section models); scale each class so both agree at the typical properties the
    # sizing used (for sigma_R the geometric mean of its own range).
    mid = {
        s: property_of(s).typical(cand[property_of(s).low], cand[property_of(s).high]) * factors[s]
        for s in factors
    }
    closed = np.broadcast_to(objective_samples(derivations, design, mid), len(cand))
    with np.errstate(divide="ignore", invalid="ignore"):
        scale = cand["objective"].to_numpy(dtype=float) / closed
    scale = np.where(np.isfinite(scale) & (scale > 0), scale, 1.0)

    def objective_key(values: Mapping[str, np.ndarray]) -> np.ndarray:
        objective, passes = sized(values)
        key = objective * scale
        return key if passes is None else np.where(passes, key, np.inf)

    return cand, symbols, objective_key


def _stream(seed: int, number: int) -> np.random.Generator:
    return np.random.default_rng(np.random.SeedSequence(seed, spawn_key=(number,)))


def _rank_histogram(
    cand: pd.DataFrame,
    symbols: tuple[str, ...],
    key: KeyFunction,
    draws: int,
    seed: int,
    distribution: str,
    clip: bool,
    sampled: frozenset[str] | None = None,
) -> np.ndarray:
    """counts[i, r]: in how many draws candidate i took rank r + 1."""
    n = len(cand)
    counts = np.zeros((n, n), dtype=np.int64)
    if n == 0:
        return counts
    low, high = _ranges(cand, symbols)
    drawn = set(symbols) if sampled is None else set(sampled) & set(symbols)
    streams = {s: _stream(seed, _PROPERTY_STREAM[s]) for s in drawn}
    ties = _stream(seed, _TIE_STREAM)
    fixed = {s: property_of(s).typical(low[s], high[s]) for s in symbols if s not in drawn}
    block = max(1, BLOCK_ELEMENTS // n)
    offsets = (np.arange(n) * n)[None, :]
    positions = np.arange(n)[None, :]
    for start in range(0, draws, block):
        m = min(block, draws - start)
        values = dict(fixed)
        for s in sorted(drawn):
            values[s] = sample(low[s], high[s], m, streams[s], distribution, property_of(s).log, clip)
        k = np.broadcast_to(key(values), (m, n))
        order = np.argsort(k, axis=1, kind="stable")
        ordered = np.take_along_axis(k, order, axis=1)
        if n > 1 and (ordered[:, 1:] == ordered[:, :-1]).any():
            # Exact ties (e.g. identical classes with point values): break them at random.
            order = np.lexsort((ties.random((m, n)), k), axis=1)
        ranks = np.empty_like(order)
        np.put_along_axis(ranks, order, positions, axis=1)
        counts += np.bincount((offsets + ranks).ravel(), minlength=n * n).reshape(n, n)
    return counts


def _rank_percentile(cumulative: np.ndarray, p: float) -> np.ndarray:
    """Smallest rank r with P(rank ≤ r) ≥ p, from cumulative fractions per class."""
    return 1 + (cumulative < p).sum(axis=1)


def _summary(cand: pd.DataFrame, counts: np.ndarray, draws: int, top_k: int) -> pd.DataFrame:
    keep = [c for c in ("id", "name", "family", "rank") if c in cand]
    out = cand[keep].copy()
    p_best = counts[:, 0] / draws if len(cand) else np.zeros(0)
    p_top = counts[:, :top_k].sum(axis=1) / draws if len(cand) else np.zeros(0)
    cumulative = np.cumsum(counts, axis=1) / draws
    out["p_best"] = p_best
    out["p_best_se"] = np.sqrt(p_best * (1 - p_best) / draws)
    out["p_top_k"] = p_top
    out["p_top_k_se"] = np.sqrt(p_top * (1 - p_top) / draws)
    for name, p in (("rank_p05", 0.05), ("rank_p50", 0.50), ("rank_p95", 0.95)):
        out[name] = _rank_percentile(cumulative, p).astype(int) if len(cand) else np.zeros(0, dtype=int)
    order = ["p_best", "p_top_k", "rank"] if "rank" in out else ["p_best", "p_top_k"]
    ascending = [False, False, True][: len(order)]
    return out.sort_values(order, ascending=ascending, kind="stable").reset_index(drop=True)


def robustness(
    selection: Selection,
    draws: int = DEFAULT_DRAWS,
    seed: int | None = None,
    distribution: str = "log-uniform",
    top_k: int = DEFAULT_TOP_K,
    clip: bool = True,
) -> RobustResult:
    """Monte Carlo odds for every ranked candidate of a Selection.

    Unsized selections rank by the merit index (higher is better), evaluated on
    sampled properties in stored units. Sized ones rank by the objective of the
    part (lower is better): each constraint's closed-form objective is evaluated
    on sampled SI properties with the spec's loads and the largest (governing)
    one kept, scaled per class to the exactly sized part at typical values.
    Rejected and unsizable classes take no part.

    Args:
        selection: the result of ``select``.
        draws: number of draws (≥ 1).
        seed: random seed (≥ 0); ``DEFAULT_SEED`` when None.
        distribution: log-uniform, triangular or log-normal.
        top_k: k of the top-k probability.
        clip: clip log-normal draws to the range.
    """
    seed = DEFAULT_SEED if seed is None else seed
    _check_options(draws, seed, distribution, top_k)
    cand, symbols, key = _model(selection)
    counts = _rank_histogram(cand, symbols, key, int(draws), int(seed), distribution, clip)
    return RobustResult(
        _summary(cand, counts, int(draws), int(top_k)),
        int(draws),
        int(seed),
        distribution,
        clip,
        int(top_k),
        selection.ranked_by,
        symbols,
    )


def sensitivity(
    selection: Selection,
    draws: int = 2_000,
    seed: int | None = None,
    distribution: str = "log-uniform",
    clip: bool = True,
    top: int | None = None,
) -> pd.DataFrame:
    """Which property's scatter unsettles the leader most.

    The leader is the candidate ranked first at typical values. For each property
    the ranking uses, only that property is drawn (the others held at their
    typical values: geometric mean, or the mid-range for linear properties) and
    the leader's odds of staying best are measured. ``p_best_drop`` is the fall
    from its odds with nothing drawn (1 unless it ties at typical values).

    Returns:
        property, name, leader, leader_p_best, p_best_se, p_best_drop,
        leader_rank_sd, leader_rank_p95; largest drop first (then largest rank
        spread); only the first ``top`` rows when given.
    """
    seed = DEFAULT_SEED if seed is None else seed
    _check_options(draws, seed, distribution, 1)
    cand, symbols, key = _model(selection)
    columns = [
        "property",
        "name",
        "leader",
        "leader_p_best",
        "p_best_se",
        "p_best_drop",
        "leader_rank_sd",
        "leader_rank_p95",
    ]
    if cand.empty:
        return pd.DataFrame(columns=columns)
    leader = int(np.argmin(cand["rank"].to_numpy(dtype=float)))
    base = _rank_histogram(cand, symbols, key, int(draws), int(seed), distribution, clip, frozenset())
    base_p = base[leader, 0] / draws
    rows = []
    ranks = np.arange(1, len(cand) + 1)
    for s in symbols:
        counts = _rank_histogram(
            cand, symbols, key, int(draws), int(seed), distribution, clip, frozenset({s})
        )
        share = counts[leader] / draws
        p = share[0]
        mean = float((share * ranks).sum())
        rows.append(
            {
                "property": s,
                "name": property_of(s).name,
                "leader": cand["id"].iat[leader],
                "leader_p_best": p,
                "p_best_se": math.sqrt(p * (1 - p) / draws),
                "p_best_drop": base_p - p,
                "leader_rank_sd": math.sqrt(max(float((share * (ranks - mean) ** 2).sum()), 0.0)),
                "leader_rank_p95": int(_rank_percentile(np.cumsum(share)[None, :], 0.95)[0]),
            }
        )
    out = pd.DataFrame(rows, columns=columns)
    out = out.sort_values(["p_best_drop", "leader_rank_sd"], ascending=[False, False], kind="stable")
    out = out.reset_index(drop=True)
    return out.head(top) if top else out


__all__ = [
    "DEFAULT_SEED",
    "DISTRIBUTIONS",
    "RobustResult",
    "robustness",
    "sample",
    "sensitivity",
]

"""Ranking by merit index over property ranges.

The low end of a class's index takes each property at its unfavourable end, the
high end at its favourable end; the typical value uses each property's geometric
mean. Candidates whose index range reaches the leader's are flagged as too
close to call.
"""

from __future__ import annotations

from collections.abc import Mapping

import numpy as np
import pandas as pd

from selector.inputs.properties import property_of
from selector.pipeline.columns import CLOSE_TO_LEADER, INDEX, INDEX_HIGH, INDEX_LOW, NAME, RANK, STATUS
from selector.pipeline.screen import REJECTED


def property_arrays(table: pd.DataFrame, symbols: list[str] | frozenset[str]) -> tuple[dict, dict, dict]:
    """low, high and typical (``Property.typical``) arrays, in stored units, for each symbol."""
    low, high, mid = {}, {}, {}
    for s in symbols:
        prop = property_of(s)
        lo = table[prop.low].to_numpy(dtype=float)
        hi = table[prop.high].to_numpy(dtype=float)
        low[s], high[s] = lo, hi
        mid[s] = prop.typical(lo, hi)
    return low, high, mid


def monomial_index(
    table: pd.DataFrame, exponents: Mapping[str, float]
) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """(low, high, typical) of ``Π property^exponent`` for every class, in stored units."""
    low_v, high_v, mid_v = property_arrays(table, list(exponents))
    n = len(table)
    low, high, typ = np.ones(n), np.ones(n), np.ones(n)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        for s, p in exponents.items():
            unfavourable, favourable = (low_v[s], high_v[s]) if p > 0 else (high_v[s], low_v[s])
            low = low * unfavourable**p
            high = high * favourable**p
            typ = typ * mid_v[s] ** p
    return low, high, typ


def rank_by_index(
    screened: pd.DataFrame,
    low: np.ndarray,
    high: np.ndarray,
    typical: np.ndarray,
    conservative: bool = False,
    needs: tuple[str, ...] = (),
) -> pd.DataFrame:
    """Add index columns, rank (1 = best) and a too-close-to-call flag.

    Classes with no index value (a property missing) are rejected with a reason.
    """
    out = screened.copy()
    out[INDEX_LOW], out[INDEX_HIGH], out[INDEX] = low, high, typical
    missing = ~np.isfinite(typical) | ~np.isfinite(low)
    if missing.any():
        reasons = out["reasons"].copy()
        for i in np.flatnonzero(missing):
            row = out.iloc[i]
            absent = [
                s for s in needs if np.isnan(row[property_of(s).low]) or np.isnan(row[property_of(s).high])
            ]
            reasons.iat[i] = [*reasons.iat[i], f"no data for {', '.join(absent) or 'the index'}"]
        out["reasons"] = reasons
        out.loc[missing, "status"] = REJECTED
    key = out[INDEX_LOW] if conservative else out[INDEX]
    return _rank(out, -key)


def rerank_by_index(table: pd.DataFrame, conservative: bool = False) -> pd.DataFrame:
    """Rank again by the index columns already in ``table`` (after more classes were rejected)."""
    return _rank(table.copy(), -(table[INDEX_LOW] if conservative else table[INDEX]))


def _rank(out: pd.DataFrame, key: pd.Series) -> pd.DataFrame:
    """Rank the non-rejected rows by ascending ``key``; flag overlaps with the leader."""
    alive = out[STATUS] != REJECTED
    order = key.where(alive).rank(method="first")
    out[RANK] = order.astype("Int64")
    out[CLOSE_TO_LEADER] = False
    if alive.any():
        leader = out.loc[order.idxmin()]
        out[CLOSE_TO_LEADER] = alive & (out[INDEX_HIGH] >= leader[INDEX_LOW]) & (out[RANK] != 1)
    return out.sort_values([RANK, NAME], na_position="last").reset_index(drop=True)


def rank_by_value(sized: pd.DataFrame, value: str, low: str, high: str) -> pd.DataFrame:
    """Rank sized parts by ascending objective ``value``; overlap flag on the value ranges."""
    out = sized.copy()
    alive = out[STATUS] != REJECTED
    order = out[value].where(alive & np.isfinite(out[value])).rank(method="first")
    out[RANK] = order.astype("Int64")
    out[CLOSE_TO_LEADER] = False
    if order.notna().any():
        leader = out.loc[order.idxmin()]
        out[CLOSE_TO_LEADER] = order.notna() & (out[low] <= leader[high]) & (out[RANK] != 1)
    return out.sort_values([RANK, NAME], na_position="last").reset_index(drop=True)

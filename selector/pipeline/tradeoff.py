"""Trade-offs between objectives: Pareto fronts, exchange constants and their ranges.

Every objective is minimised: the sized part's mass [kg], cost [USD], embodied
CO2 [kg CO2e] or volume [m³]. A merit index (``index`` or ``index_<constraint>``)
may also take part; it is maximised, so it enters the front with its sign turned.

An exchange constant α prices one objective in another, e.g. the value of a
kilogram saved in USD/kg. The penalty ``Z = cost + α_mass·mass + α_co2·co2 (+
α_volume·volume)`` [USD] turns several objectives into one to rank by. Without a
chosen α, ``exchange_ranges`` tells over which α each member of a two-objective
front is the best choice.
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field
from itertools import pairwise
from typing import Any

import numpy as np
import pandas as pd

from selector.errors import InputError
from selector.mechanics.objectives import OBJECTIVE_UNITS, exchange_unit
from selector.pipeline.columns import is_index_column
from selector.suggest import did_you_mean

SECOND_OBJECTIVE: dict[str, str] = {o: "cost" if o != "cost" else "mass" for o in OBJECTIVE_UNITS}
"""The usual objective to trade each ranked objective against (the report's trade-off)."""
EXCHANGE_UNITS: dict[str, str] = {o: exchange_unit(o, readable=True) for o in OBJECTIVE_UNITS if o != "cost"}
"""Unit an exchange constant is read in, per objective it prices (CO2 per kg CO2e)."""
EXCHANGE_LABELS: dict[str, str] = {o: exchange_unit(o) for o in OBJECTIVE_UNITS if o != "cost"}
COLLINEAR_TOLERANCE = 1e-9
"""Relative distance from a hull edge under which a front member counts as lying on it."""

_ID_COLUMNS = ("id", "name", "family", "rank")


def pareto_front(values: np.ndarray) -> np.ndarray:
    """Which rows are non-dominated when every column is minimised.

    Row ``i`` is dominated when some row ``j`` is no larger in every column and
    smaller in at least one. Identical rows do not dominate each other, so
    duplicates of a front member are all on the front. Rows holding a NaN are
    never on the front and dominate nothing; ±inf compare as numbers.

    Two columns take O(n log n) (sort, then a running minimum); more columns use a
    sort and a blockwise comparison against the front found so far, O(n·h) for a
    front of h members.

    Args:
        values: array of shape (n, k), k ≥ 1.

    Returns:
        Boolean array of length n, True on the front.
    """
    arr = np.asarray(values, dtype=float)
    if arr.ndim != 2 or arr.shape[1] < 1:
        raise ValueError(f"pareto_front needs an (n, k) array with k >= 1, got shape {arr.shape}")
    out = np.zeros(len(arr), dtype=bool)
    usable = ~np.isnan(arr).any(axis=1)
    rows = np.flatnonzero(usable)
    if rows.size == 0:
        return out
    sub = arr[rows]
    out[rows] = _front_2d(sub) if sub.shape[1] == 2 else _front_any(sub)
    return out


def _front_2d(v: np.ndarray) -> np.ndarray:
    """Non-dominated rows of an (n, 2) array without NaN."""
    n = len(v)
    order = np.lexsort((v[:, 1], v[:, 0]))
    xs, ys = v[order, 0], v[order, 1]
    # A dominating point of p comes strictly before p's group of duplicates in
    # (x, y) order and has y ≤ y_p; so p is dominated iff the smallest y before
    # its group is ≤ y_p.
    starts = np.ones(n, dtype=bool)
    starts[1:] = (xs[1:] != xs[:-1]) | (ys[1:] != ys[:-1])
    group_start = np.maximum.accumulate(np.where(starts, np.arange(n), 0))
    before = np.empty(n)
    before[0] = np.inf
    before[1:] = np.minimum.accumulate(ys)[:-1]
    dominated = (group_start > 0) & (before[group_start] <= ys)
    out = np.empty(n, dtype=bool)
    out[order] = ~dominated
    return out


def _dominates(front: np.ndarray, rows: np.ndarray) -> np.ndarray:
    """(len(rows), len(front)) booleans: front member j dominates row i."""
    le = np.ones((len(rows), len(front)), dtype=bool)
    lt = np.zeros_like(le)
    for c in range(rows.shape[1]):
        a, b = front[None, :, c], rows[:, None, c]
        le &= a <= b
        lt |= a < b
    return le & lt


def _front_any(v: np.ndarray, block: int = 128) -> np.ndarray:
    """Non-dominated rows of an (n, k) array without NaN, any k.

    In lexicographic order no row is dominated by a later one, so each block of
    rows is checked against the front members found before it and against the
    rows of the same block.
    """
    n, k = v.shape
    order = np.lexsort(v.T[::-1])
    s = v[order]
    keep = np.zeros(n, dtype=bool)
    front = np.empty((0, k))
    for start in range(0, n, block):
        chunk = s[start : start + block]
        dominated = _dominates(front, chunk).any(axis=1) | _dominates(chunk, chunk).any(axis=1)
        keep[start : start + len(chunk)] = ~dominated
        front = np.vstack([front, chunk[~dominated]])
    out = np.empty(n, dtype=bool)
    out[order] = keep
    return out


def _table_of(source: Any) -> pd.DataFrame:
    """The candidates of a Selection or a table: ranked rows only when ranks are known."""
    table = source.table if hasattr(source, "table") and hasattr(source, "ranked_by") else source
    if not isinstance(table, pd.DataFrame):
        raise TypeError(f"expected a Selection or a DataFrame, got {type(source).__name__}")
    if "rank" in table:
        table = table[table["rank"].notna()]
    return table.reset_index(drop=True)


def _check_objectives(table: pd.DataFrame, objectives: Sequence[str], where: str) -> tuple[str, ...]:
    names = tuple(objectives)
    if not 2 <= len(names) <= 3:
        raise InputError(
            where, f"{len(names)} objectives given ({', '.join(names)})", "two or three objectives"
        )
    if len(set(names)) != len(names):
        raise InputError(where, f"an objective is given twice ({', '.join(names)})", "different objectives")
    index_columns = [c for c in table.columns if is_index_column(c)]
    valid = [*OBJECTIVE_UNITS, *index_columns]
    for name in names:
        if name in OBJECTIVE_UNITS and name not in table:
            raise InputError(
                where,
                f"{name!r} needs sized parts, but the spec gives no loads to size them",
                "add the loads and limits the sizing needs, or trade off merit indices",
            )
        if name not in valid:
            raise InputError(where, f"{name!r} is not an objective", did_you_mean(name, valid))
    return names


def _signed(table: pd.DataFrame, names: Sequence[str]) -> np.ndarray:
    """Objective values to minimise: sized quantities as they are, indices negated."""
    cols = []
    for name in names:
        v = pd.to_numeric(table[name], errors="coerce").to_numpy(dtype=float)
        cols.append(v if name in OBJECTIVE_UNITS else -v)
    return np.column_stack(cols) if cols else np.empty((len(table), 0))


def pareto_table(source: Any, objectives: Sequence[str] = ("mass", "cost")) -> pd.DataFrame:
    """The ranked candidates with an ``on_front`` flag for two or three objectives.

    Args:
        source: a Selection or its table (rows without a rank take no part).
        objectives: names among mass, cost, co2, volume (minimised) and index,
            index_<constraint> (maximised).

    Returns:
        id, name, family, rank, the objectives and ``on_front``; front members
        first, each part ordered by the first objective (best first).
    """
    table = _table_of(source)
    names = _check_objectives(table, objectives, "trade-off objectives")
    values = _signed(table, names)
    finite = np.isfinite(values).all(axis=1)
    on = np.zeros(len(table), dtype=bool)
    if finite.any():
        on[finite] = pareto_front(values[finite])
    keep = [c for c in _ID_COLUMNS if c in table]
    out = table[keep + list(names)].copy()
    out["on_front"] = on
    out["_key"] = values[:, 0]
    out = out.sort_values(["on_front", "_key"], ascending=[False, True], kind="stable")
    return out.drop(columns="_key").reset_index(drop=True)


def _exchange_value(name: str, value: float | str, where: str) -> float:
    """An exchange constant as a float in USD per unit of ``name``."""
    if isinstance(value, str):
        from selector.inputs.units import magnitude_in

        number = magnitude_in(value, EXCHANGE_UNITS[name], where)
    elif isinstance(value, int | float) and not isinstance(value, bool):
        number = float(value)
    else:
        raise InputError(
            where, f"{value!r} is not an exchange constant", f'a value such as "40 {EXCHANGE_UNITS[name]}"'
        )
    if not math.isfinite(number) or number < 0:
        raise InputError(
            where, f"{value!r} is not a usable exchange constant", "a finite value of zero or more"
        )
    return number


def penalty(source: Any, exchange: Mapping[str, float | str]) -> pd.DataFrame:
    """Rank the ranked candidates by the penalty ``Z = cost + Σ α_k · k`` [USD].

    Args:
        source: a sized Selection or its table.
        exchange: objective → exchange constant: ``mass`` in USD/kg, ``co2`` in
            USD/kg CO2e, ``volume`` in USD/m³; numbers, or text with units
            ("40 USD/kg", "18 USD/lb").

    Returns:
        id, name, family, rank, cost, the priced objectives, ``penalty`` [USD]
        and ``penalty_rank`` (1 = lowest penalty; equal penalties share a rank),
        lowest penalty first.
    """
    table = _table_of(source)
    if "cost" not in table:
        raise InputError(
            "exchange",
            "a penalty needs sized parts, but the spec gives no loads to size them",
            "add the loads and limits the sizing needs",
        )
    alphas: dict[str, float] = {}
    for name, value in exchange.items():
        where = f"exchange.{name}"
        if name not in EXCHANGE_UNITS:
            raise InputError(where, f"{name!r} cannot be priced", did_you_mean(name, EXCHANGE_UNITS))
        alphas[name] = _exchange_value(name, value, where)
    z = table["cost"].to_numpy(dtype=float).copy()
    for name, alpha in alphas.items():
        z = z + alpha * table[name].to_numpy(dtype=float)
    keep = [c for c in _ID_COLUMNS if c in table]
    out = table[[*keep, "cost", *alphas]].copy()
    out["penalty"] = z
    out["penalty_rank"] = pd.Series(z).where(np.isfinite(z)).rank(method="min").astype("Int64")
    out = out.sort_values(["penalty", "name"] if "name" in out else ["penalty"], kind="stable")
    return out.reset_index(drop=True)


def _lower_hull(x: np.ndarray, y: np.ndarray) -> list[int]:
    """Vertices of the lower convex hull of points sorted by x (collinear points left out)."""
    hull: list[int] = []
    for i in range(len(x)):
        while len(hull) >= 2:
            o, a = hull[-2], hull[-1]
            cross = (x[a] - x[o]) * (y[i] - y[o]) - (y[a] - y[o]) * (x[i] - x[o])
            if cross > 0:
                break
            hull.pop()
        hull.append(i)
    return hull


def exchange_ranges(source: Any, x: str = "mass", y: str = "cost") -> pd.DataFrame:
    """For each member of the (x, y) front, the exchange constants that make it best.

    With ``Z = y + α·x`` (α in units of y per unit of x, e.g. USD/kg), the best
    member for a given α ≥ 0 is a vertex of the lower convex hull of the front.
    Between hull neighbours k and k+1 the choice changes at
    ``α_k = (y_k − y_{k+1}) / (x_{k+1} − x_k)``; vertex k is best for
    α ∈ [α_k, α_{k−1}] (the lightest vertex up to ∞, the cheapest from 0). A
    member on a hull edge between two vertices ties with them at that edge's α
    only; a member above the hull is never best, and its range is empty (NaN).

    Args:
        source: a sized Selection or its table.
        x, y: two of mass, cost, co2, volume.

    Returns:
        The front members ordered by x: id, name, family, rank, x, y,
        ``alpha_low``, ``alpha_high``, ``alpha_unit``, ``on_hull`` and ``note``.
    """
    table = _table_of(source)
    for name in (x, y):
        if name not in OBJECTIVE_UNITS:
            raise InputError(
                "exchange ranges", f"{name!r} is not a sized objective", did_you_mean(name, OBJECTIVE_UNITS)
            )
    names = _check_objectives(table, (x, y), "exchange ranges")
    front = pareto_table(table, names)
    front = front[front["on_front"]].sort_values([x, y], kind="stable").reset_index(drop=True)
    if front.empty:
        empty = front.drop(columns="on_front")
        for col in ("alpha_low", "alpha_high", "alpha_unit", "on_hull", "note"):
            empty[col] = pd.Series(dtype=object if col in ("alpha_unit", "note") else float)
        return empty
    xs, ys = front[x].to_numpy(dtype=float), front[y].to_numpy(dtype=float)
    points, member = np.unique(np.column_stack([xs, ys]), axis=0, return_inverse=True)
    member = np.asarray(member).ravel()
    px, py = points[:, 0], points[:, 1]
    hull = _lower_hull(px, py)
    slopes = [(py[a] - py[b]) / (px[b] - px[a]) for a, b in pairwise(hull)]
    low = np.full(len(points), np.nan)
    high = np.full(len(points), np.nan)
    notes = ["never best for any exchange constant: above the convex hull of the front"] * len(points)
    on_hull = np.zeros(len(points), dtype=bool)
    for k, v in enumerate(hull):
        high[v] = math.inf if k == 0 else slopes[k - 1]
        low[v] = 0.0 if k == len(hull) - 1 else slopes[k]
        on_hull[v] = True
        notes[v] = ""
    for k, (a, b) in enumerate(pairwise(hull)):
        for p in range(a + 1, b):
            line = py[a] + (px[p] - px[a]) * (py[b] - py[a]) / (px[b] - px[a])
            if abs(py[p] - line) <= COLLINEAR_TOLERANCE * max(abs(py[p]), abs(line), 1e-300):
                low[p] = high[p] = slopes[k]
                on_hull[p] = True
                notes[p] = "on a hull edge: ties with its neighbours at this value only"
    out = front.drop(columns="on_front")
    out["alpha_low"] = low[member]
    out["alpha_high"] = high[member]
    out["alpha_unit"] = f"{OBJECTIVE_UNITS[y]}/{OBJECTIVE_UNITS[x]}"
    out["on_hull"] = on_hull[member]
    out["note"] = [notes[m] for m in member]
    return out


@dataclass(frozen=True)
class TradeoffStudy:
    """A trade-off of the ranked objective against a second one (``tradeoff_report``'s result).

    Attributes:
        other: the second objective.
        exchange: the exchange constant given, or None.
        front: the Pareto-front members.
        second: the penalty ranking (with ``exchange``) or each front member's exchange-constant range.
    """

    other: str
    exchange: float | str | None
    front: pd.DataFrame = field(compare=False)
    second: pd.DataFrame = field(compare=False)
    points: pd.DataFrame | None = field(default=None, compare=False)
    """The candidates the front was taken from when they are not the shortlist (sandwich pairs)."""
    note: str = ""
    """What the study assumes, when it is worth saying (e.g. how sandwich pairs were sized)."""

    @property
    def priced(self) -> str | None:
        """The objective the exchange constant prices (None without one)."""
        if self.exchange is None:
            return None
        return next((c for c in self.second.columns if c in EXCHANGE_UNITS), None)

    @property
    def alpha(self) -> float | None:
        """The exchange constant in USD per SI unit of ``priced`` (USD/kg, USD/m³ ...); None without one."""
        priced = self.priced
        if priced is None or self.exchange is None:
            return None
        return _exchange_value(priced, self.exchange, "--exchange")


def tradeoff_report(
    selection: Any, other: str = "cost", exchange: float | str | None = None
) -> tuple[pd.DataFrame, pd.DataFrame]:
    """The front of the ranked objective against ``other``, and how to choose on it.

    Args:
        selection: a sized Selection; for a sandwich, its feasible face × core pairs
            (``sandwich.pair_candidates``) take the place of the shortlist.
        other: the second objective (mass, cost, co2 or volume).
        exchange: an exchange constant pricing the non-cost objective in USD
            ("40 USD/kg", or a number in USD per kg, kg CO2e or m³); needs cost
            to be one of the two objectives.

    Returns:
        (front, second): the front members; then, with an exchange constant, the
        penalty ranking of all ranked candidates (with ``on_front``), otherwise
        the exchange-constant range of each front member.
    """
    first = selection.spec.objective.minimize
    if not selection.has_sizes:
        raise InputError(
            "--tradeoff",
            "parts are not sized (the spec gives no loads), so they have no mass or cost",
            "add the loads and limits the sizing needs",
        )
    if other not in OBJECTIVE_UNITS:
        raise InputError("--tradeoff", f"{other!r} is not an objective", did_you_mean(other, OBJECTIVE_UNITS))
    if other == first:
        raise InputError(
            "--tradeoff",
            f"the shortlist is already ranked by {other}",
            f"a second objective other than {first}: one of "
            + ", ".join(o for o in OBJECTIVE_UNITS if o != first),
        )
    source = selection
    if getattr(selection, "sandwich", None) is not None:
        from selector.pipeline.sandwich import pair_candidates

        source = pair_candidates(selection.sandwich)
    table = pareto_table(source, (first, other))
    front = table[table["on_front"]].drop(columns="on_front").reset_index(drop=True)
    # Z = y + α·x: α prices x in units of y (USD when y is cost).
    x, y = (first, other) if "cost" not in (first, other) else (first if other == "cost" else other, "cost")
    if exchange is None:
        return front, exchange_ranges(source, x=x, y=y)
    if y != "cost":
        raise InputError(
            "--exchange",
            f"an exchange constant prices in USD, but neither {first} nor {other} is cost",
            "trade off against cost (--tradeoff cost)",
        )
    ranked = penalty(source, {x: _exchange_value(x, exchange, "--exchange")})
    on = table.set_index("id")["on_front"]
    ranked["on_front"] = ranked["id"].map(on).fillna(False).astype(bool)
    return front, ranked


__all__ = [
    "EXCHANGE_UNITS",
    "SECOND_OBJECTIVE",
    "TradeoffStudy",
    "exchange_ranges",
    "pareto_front",
    "pareto_table",
    "penalty",
    "tradeoff_report",
]

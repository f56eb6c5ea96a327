"""Screens: hard limits on properties, ratings and families.

Each class *passes* (its whole range qualifies), passes *partly* (only part of
its range does) or is *rejected*; every reason is kept.
"""

from __future__ import annotations

import math
import re
from collections.abc import Mapping
from dataclasses import dataclass
from typing import Any

import numpy as np
import pandas as pd

from selector.errors import InputError
from selector.inputs.limits import finite_float
from selector.inputs.material_report import NUMBER
from selector.inputs.properties import PROPERTIES, RATING_LEVELS, RATINGS
from selector.inputs.units import format_number
from selector.mechanics.loadcases import PartKind

PASSES, PARTLY, REJECTED = "passes", "partly", "rejected"
_LIMIT = re.compile(r"^\s*(>=|<=|>|<|≥|≤)\s*(.+?)\s*$")
_OPS = {">": ">=", "≥": ">=", "<": "<=", "≤": "<="}
TOLERANCE = 1e-9
"""Relative slack on a limit, so unit round-off (212 °F → 100.00000000000006 °C) rejects nothing."""


@dataclass(frozen=True)
class Limit:
    """One screen: ``symbol op value`` with the value in the stored unit (or a rating level)."""

    symbol: str
    op: str  # ">=" or "<="
    value: float
    text: str

    @property
    def is_rating(self) -> bool:
        return self.symbol in RATINGS

    def describe(self) -> str:
        if self.is_rating:
            return f"{self.symbol} {self.op} {RATING_LEVELS[int(self.value)]}"
        return f"{self.symbol} {self.op} {format_number(self.value)} {PROPERTIES[self.symbol].label}"


@dataclass(frozen=True)
class Screens:
    """All screens of a spec."""

    limits: tuple[Limit, ...] = ()
    families: tuple[str, ...] = ()
    exclude_families: tuple[str, ...] = ()
    exclude: tuple[str, ...] = ()
    allow_brittle: bool = False


def parse_limit(symbol: str, text: str, where: str = "screen") -> Limit:
    """Parse ``">= 60 degC"`` (or ``">= good"`` for a rating) for property ``symbol``."""
    loc = f"{where}.{symbol}"
    match = _LIMIT.match(text) if isinstance(text, str) else None
    if not match:
        raise InputError(loc, f"cannot read limit {text!r}", 'a comparison and a value, e.g. ">= 60 degC"')
    op = _OPS.get(match.group(1), match.group(1))
    raw = match.group(2)
    if symbol in RATINGS:
        if raw not in RATING_LEVELS:
            raise InputError(loc, f"{raw!r} is not a rating", f"one of: {', '.join(RATING_LEVELS)}")
        return Limit(symbol, op, float(RATING_LEVELS.index(raw)), text)
    prop = PROPERTIES[symbol]
    number = raw.rstrip("%").strip()
    if prop.stored in ("dimensionless", "percent") and NUMBER.fullmatch(number):
        value = finite_float(number)
    else:
        from selector.inputs.units import magnitude_in

        value = magnitude_in(raw, prop.stored, loc)
    if value is None or not math.isfinite(value):
        raise InputError(loc, f"the limit in {text!r} is not a finite number", 'e.g. ">= 60 degC"')
    return Limit(symbol, op, value, text)


def parse_screens(screen: Mapping[str, Any], where: str = "screen") -> Screens:
    """Turn a spec's ``[screen]`` table into Screens."""
    limits = [parse_limit(k, v, where) for k, v in screen.items() if k in PROPERTIES or k in RATINGS]
    return Screens(
        limits=tuple(limits),
        families=tuple(screen.get("families", ())),
        exclude_families=tuple(screen.get("exclude_families", ())),
        exclude=tuple(screen.get("exclude", ())),
        allow_brittle=bool(screen.get("allow_brittle", False)),
    )


def _range_of(table: pd.DataFrame, limit: Limit) -> tuple[np.ndarray, np.ndarray]:
    """(low, high) of the screened property (rating levels as numbers) for every class."""
    if limit.is_rating:
        levels = table[limit.symbol].map({v: k for k, v in enumerate(RATING_LEVELS)}).to_numpy(dtype=float)
        return levels, levels
    prop = PROPERTIES[limit.symbol]
    return table[prop.low].to_numpy(dtype=float), table[prop.high].to_numpy(dtype=float)


def _outcome(low: np.ndarray, high: np.ndarray, limit: Limit) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """(missing, fails, partly) masks of one limit over property ranges."""
    missing = np.isnan(low) | np.isnan(high)
    slack = TOLERANCE * max(abs(limit.value), 1.0)
    if limit.op == ">=":
        v = limit.value - slack
        fail, part = high < v, (low < v) & (high >= v)
    else:
        v = limit.value + slack
        fail, part = low > v, (high > v) & (low <= v)
    return missing, fail & ~missing, part & ~missing


def _family_masks(table: pd.DataFrame, screens: Screens) -> list[tuple[np.ndarray, str]]:
    """(rejected mask, reason template) of the family and id screens."""
    family = table["family"].to_numpy()
    masks = []
    if screens.families:
        among = ", ".join(screens.families)
        masks.append((~np.isin(family, screens.families), f"family {{family}} is not among {among}"))
    if screens.exclude_families:
        masks.append((np.isin(family, screens.exclude_families), "family {family} is excluded"))
    if screens.exclude:
        masks.append((table["id"].isin(screens.exclude).to_numpy(), "excluded by id"))
    return masks


def check_excluded_ids(table: pd.DataFrame, screens: Screens, where: str = "screen.exclude") -> None:
    """Raise InputError, with the nearest ids, for an excluded id that names no class of ``table``
    nor of the built-in table."""
    from selector.suggest import CLASS_FALLBACK, class_aliases, did_you_mean

    known = set(table["id"])
    unknown = [c for c in screens.exclude if c not in known]
    if unknown:  # a built-in id stays harmless when a user's table replaces the built-in one
        from selector.inputs.materials import load_materials

        known |= set(load_materials([])["id"])
    for i, class_id in enumerate(screens.exclude):
        if class_id not in known:
            raise InputError(
                f"{where}[{i}]",
                f"no class with id {class_id!r}",
                did_you_mean(class_id, sorted(known), fallback=CLASS_FALLBACK, aliases=class_aliases(table)),
            )


def apply_screens(table: pd.DataFrame, screens: Screens) -> pd.DataFrame:
    """A copy of ``table`` with ``status`` and ``reasons`` columns added.

    Raises InputError when ``screens.exclude`` names a class the table does not hold.
    """
    check_excluded_ids(table, screens)
    n = len(table)
    rejected = np.zeros(n, dtype=bool)
    partly = np.zeros(n, dtype=bool)
    reasons: list[list[str]] = [[] for _ in range(n)]

    family = table["family"].to_numpy()
    for mask, template in _family_masks(table, screens):
        rejected |= mask
        for i in _positions(mask):
            reasons[i].append(template.format(family=family[i]))

    for limit in screens.limits:
        low, high = _range_of(table, limit)
        missing, fail, part = _outcome(low, high, limit)
        rejected |= fail | missing
        partly |= part
        rule = limit.describe()
        for i in _positions(missing):
            reasons[i].append(f"no data for {limit.symbol}")
        for i in _positions(fail):
            reasons[i].append(f"{limit.symbol} {_shown(table, limit, low, high, i)} fails {rule}")
        for i in _positions(part):
            shown = _shown(table, limit, low, high, i)
            reasons[i].append(f"only part of {limit.symbol} {shown} meets {rule}")

    status = np.where(rejected, REJECTED, np.where(partly, PARTLY, PASSES))
    out = table.copy()
    out["status"] = status
    out["reasons"] = reasons
    return out


def _positions(mask: np.ndarray) -> list[int]:
    return np.flatnonzero(mask).tolist()


def _shown(table: pd.DataFrame, limit: Limit, low: np.ndarray, high: np.ndarray, i: int) -> str:
    """Row ``i``'s rating, or its range with the unit, as a screen's reason shows it."""
    if limit.is_rating:
        return str(table[limit.symbol].iat[i])
    return f"{format_number(low[i])}–{format_number(high[i])} {PROPERTIES[limit.symbol].label}"


def screen_mask(table: pd.DataFrame, screens: Screens) -> np.ndarray:
    """The ``status`` column ``apply_screens`` would give, without the reasons.

    A vectorised path for very large tables: the same rules, but no per-class
    reason text, so no Python loop over classes.
    """
    n = len(table)
    rejected = np.zeros(n, dtype=bool)
    partly = np.zeros(n, dtype=bool)
    for mask, _ in _family_masks(table, screens):
        rejected |= mask
    for limit in screens.limits:
        missing, fail, part = _outcome(*_range_of(table, limit), limit)
        rejected |= fail | missing
        partly |= part
    return np.where(rejected, REJECTED, np.where(partly, PARTLY, PASSES))


def qualifying_ranges(screened: pd.DataFrame, screens: Screens) -> pd.DataFrame:
    """A copy where each class that passes *partly* keeps only the part of its ranges that qualifies.

    Ranking and sizing then use property values the screens allow (e.g. a class with
    σ_y 140–305 MPa under a screen σ_y ≥ 300 MPa is treated as 300–305 MPa).
    """
    out = screened.copy()
    partly = (out["status"] == PARTLY).to_numpy()
    for limit in screens.limits:
        if limit.is_rating:
            continue
        prop = PROPERTIES[limit.symbol]
        low, high = out[prop.low].to_numpy(dtype=float), out[prop.high].to_numpy(dtype=float)
        if limit.op == ">=":
            out[prop.low] = np.where(partly & (low < limit.value) & (high >= limit.value), limit.value, low)
        else:
            out[prop.high] = np.where(partly & (high > limit.value) & (low <= limit.value), limit.value, high)
    return out


STRENGTH_CHECKS = ("strength", "fatigue")


def brittle_rule_applies(kind: PartKind, constraint_types: tuple[str, ...], screens: Screens) -> bool:
    """True when brittle classes must leave the ranking: a tensile or bending strength check
    without a fracture constraint, and no ``allow_brittle``. A part in compression (``kind``:
    a column, a plate, a cylinder under external pressure) keeps them."""
    return (
        not kind.in_compression
        and any(t in STRENGTH_CHECKS for t in constraint_types)
        and "fracture" not in constraint_types
        and not screens.allow_brittle
    )


def reject_brittle(table: pd.DataFrame) -> pd.DataFrame:
    """A copy with classes whose K_IC is below the brittle threshold rejected (or passing partly).

    The threshold (``BRITTLE_K_IC``, 15 MPa·m½) is common practice for deterministic design on
    strength alone (no source). A class with part of its range above it passes partly, on that part;
    one without K_IC data keeps its status with a note saying it was not checked.
    """
    from selector.mechanics.failure_modes import BRITTLE_K_IC

    prop = PROPERTIES["K_IC"]
    limit = Limit("K_IC", ">=", BRITTLE_K_IC, f">= {BRITTLE_K_IC:g} MPa·m½")
    low, high = _range_of(table, limit)
    missing, fail, part = _outcome(low, high, limit)
    alive = (table["status"] != REJECTED).to_numpy()
    missing, fail, part = missing & alive, fail & alive, part & alive
    advice = "add a fracture constraint (crack_length) or set [screen] allow_brittle = true"
    out = table.copy()
    reasons = [list(r) for r in out["reasons"]]
    for i in np.flatnonzero(missing):
        reasons[i].append(
            "no data for K_IC: not checked for brittleness (give K_IC or a fracture constraint)"
        )
    for i in np.flatnonzero(fail):
        reasons[i].append(
            f"brittle: K_IC {format_number(low[i])}–{format_number(high[i])} {prop.label} is below "
            f"{BRITTLE_K_IC:g} {prop.label}, too low for a part sized on strength alone; {advice}"
        )
    for i in np.flatnonzero(part):
        reasons[i].append(
            f"only part of K_IC {format_number(low[i])}–{format_number(high[i])} {prop.label} reaches "
            f"{BRITTLE_K_IC:g} {prop.label} (brittle below it, for a part sized on strength alone)"
        )
    status = out["status"].to_numpy(dtype=object).copy()
    status[fail] = REJECTED
    status[part & (status == PASSES)] = PARTLY
    out["status"] = status
    out["reasons"] = reasons
    out[prop.low] = np.where(part, np.maximum(low, BRITTLE_K_IC), low)
    return out

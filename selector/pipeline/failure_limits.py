"""What fracture, fatigue and frequency constraints take from the spec, in SI.

The crack length and geometry factor of a fracture check, the load ratio of a
fatigue check (and the Goodman fatigue strength it implies for every class), the
lowest natural frequency, and the effective span of a plate's first mode.
"""

from __future__ import annotations

from collections.abc import Iterable, Mapping
from typing import Any

import numpy as np
import pandas as pd

from selector.errors import InputError
from selector.inputs.properties import DERIVED_PROPERTIES, PROPERTIES, property_of
from selector.inputs.spec_keys import CONSTRAINT_KEYS
from selector.mechanics import failure_modes as fm
from selector.mechanics.loadcases import part_kind

FIELDS_OF_TYPE: dict[str, tuple[str, ...]] = {t: CONSTRAINT_KEYS[t] for t in fm.FAILURE_CONSTRAINTS}
"""The fields each failure-mode constraint accepts (beside ``safety_factor``)."""
MADE_OF: dict[str, tuple[str, ...]] = {"sigma_R": ("sigma_e", "sigma_ts")}
"""Stored properties each derived property is computed from."""


def failure_limits(constraint: Any, where: str, function: str, si: Mapping[str, float]) -> dict[str, float]:
    """The symbols a fracture, fatigue or frequency constraint adds (a, Y, f_min); checks its fields.

    Args:
        constraint: one ``[[constraint]]`` of the spec.
        where: its location for messages, e.g. ``constraint[2]``.
        function: the part's function (a criterion needs a vessel).
        si: the spec's quantities in SI by path (``spec_quantities.si_values``).
    """
    for fields_type, fields in FIELDS_OF_TYPE.items():
        for name in fields:
            if getattr(constraint, name) is not None and constraint.type != fields_type:
                raise InputError(
                    f"{where}.{name}",
                    f"{name} does not apply to a {constraint.type} constraint",
                    f"a {fields_type} constraint",
                )
    out: dict[str, float] = {}
    if constraint.type == "fracture":
        if constraint.criterion is not None and not part_kind(function).vessel:
            raise InputError(
                f"{where}.criterion",
                f"{constraint.criterion!r} applies to pressure vessels, not a {function}",
                "function cylinder or sphere, or crack_length alone",
            )
        if constraint.criterion == "leak-before-break" and constraint.crack_length is not None:
            raise InputError(
                f"{where}.crack_length",
                "leak-before-break takes a crack as deep as the wall",
                "no crack_length with this criterion",
            )
        out["Y"] = constraint.geometry_factor or fm.DEFAULT_GEOMETRY_FACTOR
        if constraint.crack_length is not None:
            out["a"] = si[f"{where}.crack_length"]
    if constraint.type == "frequency":
        if "safety_factor" in constraint.model_fields_set and constraint.safety_factor != 1:
            raise InputError(
                f"{where}.safety_factor",
                "a frequency limit takes no safety factor",
                "the margin in min_frequency itself",
            )
        if constraint.min_frequency is not None:
            out["f_min"] = si[f"{where}.min_frequency"]
    return out


def requirement_of(constraints: list[Any]) -> tuple[str | None, float]:
    """(fracture criterion, fatigue load ratio R) of a spec's constraints."""
    criterion = next((c.criterion for c in constraints if c.type == "fracture"), None)
    ratio = next((c.load_ratio for c in constraints if c.type == "fatigue"), None)
    return criterion, fm.FULLY_REVERSED if ratio is None else float(ratio)


def derived_geometry(function: str, values: dict[str, float]) -> dict[str, float]:
    """Geometry symbols computed from the given ones: L_e of a plate with length and width."""
    if function == "plate" and "L" in values and "b" in values:
        return {"L_e": fm.effective_span(values["L"], values["b"])}
    return {}


def with_fatigue_strength(table: pd.DataFrame, load_ratio: float) -> pd.DataFrame:
    """A copy with ``sigma_R_low`` / ``sigma_R_high`` [MPa]: the Goodman fatigue strength at R."""
    out = table.copy()
    prop = DERIVED_PROPERTIES["sigma_R"]
    for end in ("low", "high"):
        e = table[f"sigma_e_{end}"].to_numpy(dtype=float)
        ts = table[f"sigma_ts_{end}"].to_numpy(dtype=float)
        out[f"{prop.symbol}_{end}"] = fm.goodman_strength(e, ts, load_ratio)
    return out


def stored_symbols(symbols: Iterable[str]) -> tuple[str, ...]:
    """The stored properties behind ``symbols``: a derived one (sigma_R) replaced by what it is made of."""
    out: list[str] = []
    for s in symbols:
        out += MADE_OF.get(s, (s,))
    return tuple(sorted(set(out)))


def with_derived_values(values: Mapping[str, Any], load_ratio: float) -> dict[str, Any]:
    """``values`` (stored units) with the Goodman ``sigma_R`` at R added when sigma_e and sigma_ts are there.

    Sampled values recombine draw by draw: σ_R of one draw comes from that draw's σ_e and σ_ts.
    """
    out = dict(values)
    if "sigma_e" in out and "sigma_ts" in out:
        out["sigma_R"] = fm.goodman_strength(out["sigma_e"], out["sigma_ts"], load_ratio)
    return out


def needed_properties(utilisations: dict[str, Any]) -> dict[str, tuple[str, ...]]:
    """Constraint type → the stored properties its utilisation monomial needs."""
    out = {}
    for kind, m in utilisations.items():
        stored: list[str] = []
        for s in sorted(m.symbols):
            if s in PROPERTIES:
                stored.append(s)
            elif s in DERIVED_PROPERTIES:
                stored += MADE_OF[s]
        out[kind] = tuple(dict.fromkeys(stored))
    return out


def reject_missing(table: pd.DataFrame, needs: dict[str, tuple[str, ...]]) -> pd.DataFrame:
    """A copy with every class lacking data a constraint needs rejected, the reason naming both."""
    from selector.pipeline.screen import REJECTED

    out = table.copy()
    reasons = [list(r) for r in out["reasons"]]
    rejected = np.zeros(len(out), dtype=bool)
    for kind, symbols in needs.items():
        for s in symbols:
            prop = property_of(s)
            absent = out[prop.low].isna().to_numpy() | out[prop.high].isna().to_numpy()
            rejected |= absent
            for i in np.flatnonzero(absent):
                reasons[i].append(f"no data for {s}, which the {kind} constraint needs")
    out["reasons"] = reasons
    out.loc[rejected, "status"] = REJECTED
    return out

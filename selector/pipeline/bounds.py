"""Bounds on the sized part: the deepest, widest or largest-diameter part the design allows.

``[section]`` may set ``max_depth``, ``max_width`` and ``max_diameter``. Each bound
reads one dimension of the part, chosen by the function and the section shape:

* depth: the overall depth h of a section in its bending plane (the diameter d of a
  round or tube), the thickness of a panel or plate, the overall thickness of a sandwich;
* width: the width b of a section (d of a round or tube);
* diameter: d of a round or tube; the outer diameter 2·r + t of a cylinder or sphere
  (r the mean radius of the thin-wall formulas).

A class whose part needs more than a bound is rejected with the bound and the size
it needs. A bound that reads no dimension of the part is an error.
"""

from __future__ import annotations

from collections.abc import Callable, Mapping

import pandas as pd

from selector.errors import InputError
from selector.mechanics.loadcases import part_kind
from selector.pipeline.sizing import Design

BOUND_FIELDS = ("max_depth", "max_width", "max_diameter")
ROUND_SHAPES = ("round", "tube")

Reader = Callable[[Mapping[str, float]], float | None]
"""Reads the bounded dimension [m] from a part's dimensions (None: not in this part)."""


def _dimension(name: str) -> Reader:
    return lambda dims: dims.get(name)


def _outer_diameter(radius: float) -> Reader:
    return lambda dims: 2 * radius + dims["t"] if "t" in dims else None


def _uses(fn: str, shape: str, radius: float = 0.0) -> dict[str, tuple[str, Reader]]:
    """Bound field → (what it reads, in words; how to read it) for this function and shape;
    ``radius`` r [m] of a cylinder or sphere."""
    kind = part_kind(fn)
    if kind.takes_section:
        if shape in ROUND_SHAPES:
            d = ("the diameter d", _dimension("d"))
            return {"max_depth": d, "max_width": d, "max_diameter": d}
        return {"max_depth": ("the depth h", _dimension("h")), "max_width": ("the width b", _dimension("b"))}
    if fn == "panel":
        return {"max_depth": ("the thickness h", _dimension("h"))}
    if fn == "plate":
        return {"max_depth": ("the thickness t", _dimension("t"))}
    if kind.vessel:
        return {"max_diameter": ("the outer diameter 2·r + t", _outer_diameter(radius))}
    return {}


def check_bounds(fn: str, shape: str, bounds: Mapping[str, float]) -> None:
    """Refuse a bound that reads no dimension of this function's part.

    Raises:
        InputError: naming the bound and the bounds this part does take.
    """
    uses = _uses(fn, shape)
    for name in bounds:
        if name not in uses:
            part = f"a {fn} of {shape} section" if part_kind(fn).takes_section else f"a {fn}"
            none = f"no size bound: {part} has no depth, width or diameter"
            expected = f"one of: {', '.join(uses)}" if uses else none
            raise InputError(f"section.{name}", f"{name} does not apply to {part}", expected)


def bound_reasons(
    fn: str, shape: str, bounds: Mapping[str, float], dimensions: Mapping[str, float], radius: float = 0.0
) -> list[str]:
    """Why a part with ``dimensions`` [m] exceeds ``bounds`` [m] (empty when within every one)."""
    uses = _uses(fn, shape, radius)
    reasons = []
    for name, limit in bounds.items():
        words, read = uses[name]
        needed = read(dimensions)
        if needed is not None and needed > limit * (1 + 1e-9):
            reasons.append(f"needs {words} = {needed * 1e3:.3g} mm, above {name} = {limit * 1e3:.3g} mm")
    return reasons


def reject_out_of_bounds(table: pd.DataFrame, design: Design, fn: str) -> pd.DataFrame:
    """The table with every sized part that exceeds a ``[section]`` bound made infeasible, with why."""
    table = table.copy()
    radius = design.values.get("r", 0.0)
    for i in table.index[table["feasible"]]:
        why = bound_reasons(fn, design.shape, design.bounds, table.at[i, "dimensions"], radius)
        if why:
            table.at[i, "feasible"] = False
            table.at[i, "size_warnings"] = [*table.at[i, "size_warnings"], *why]
    return table

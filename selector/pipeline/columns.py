"""The names of the Selection table's columns: one home, read by the steps that write them and every output.

A column holds one value per material class in stored units (index values) or SI (sized
parts); outputs add the display unit to the name themselves (``mass [kg]``).
"""

from __future__ import annotations

ID = "id"
NAME = "name"
FAMILY = "family"
STATUS = "status"
REASONS = "reasons"

INDEX = "index"
"""The merit index at each property's typical value (stored units)."""
INDEX_LOW = "index_low"
"""The index with every property at its unfavourable end."""
INDEX_HIGH = "index_high"
"""The index with every property at its favourable end."""
INDEX_WITH_SHAPE = "index_with_shape"
"""The index with the family's practical maximum shape factor folded in."""
RANK = "rank"
CLOSE_TO_LEADER = "close_to_leader"
"""True where a candidate's range overlaps the leader's: too close to call."""

FEASIBLE = "feasible"
DIMENSIONS = "dimensions"
"""The sized part's dimensions, a dict of name → metres."""
MASS = "mass"
COST = "cost"
CO2 = "co2"
ENERGY = "energy"
"""Embodied energy of the sized part [MJ] (the property ``energy`` is per kilogram)."""
VOLUME = "volume"
DEFLECTION = "deflection"
TWIST = "twist"
STRESS = "stress"
UTILISATION = "utilisation"
"""A dict of constraint → demand / limit (1 at the limit)."""
GOVERNING = "governing"
GOVERNING_INDEX = "governing_index"
"""The index text of the governing constraint."""
SIZE_WARNINGS = "size_warnings"
OBJECTIVE = "objective"
"""The sized part's value of the spec's objective (infinite where it cannot be sized)."""

SIZED_VALUES = (MASS, COST, CO2)
"""The per-part totals every output shows beside a sized part."""


def sized_values(objective: str) -> tuple[str, ...]:
    """The per-part totals shown beside a sized part: ``SIZED_VALUES``, and the embodied
    energy when it is the objective."""
    return (*SIZED_VALUES, ENERGY) if objective == ENERGY else SIZED_VALUES


_CONSTRAINT_INDEX = "index_"


def constraint_index(constraint: str) -> str:
    """The column holding a further constraint's index, e.g. ``index_strength``."""
    return _CONSTRAINT_INDEX + constraint


def is_index_column(column: str) -> bool:
    """True for an index a trade-off may use: the ranking index, a further constraint's, with shape.

    The range ends (``index_low``, ``index_high``) are not indices of their own.
    """
    return column == INDEX or (column.startswith(_CONSTRAINT_INDEX) and column not in (INDEX_LOW, INDEX_HIGH))

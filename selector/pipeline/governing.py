"""Which constraint's merit index leads: the one that governs most sized parts.

With several constraints each class's part is set by one of them (its *governing*
constraint). The headline index is the index of the constraint that governs the
most ranked candidates (ties go to the earlier in ``CONSTRAINTS`` order), so the
order of the ``[[constraint]]`` blocks in a spec never changes it. Without sizes
the first constraint in that order leads.
"""

from __future__ import annotations

from collections import Counter

import pandas as pd

from selector.mechanics.loadcases import CONSTRAINTS
from selector.pipeline import columns
from selector.pipeline.derive import Derivation
from selector.pipeline.rank import monomial_index


def canonical_order(derivations: list[Derivation]) -> list[Derivation]:
    """Derivations that size the part first, each group in ``CONSTRAINTS`` order; checks last."""
    order = {c: i for i, c in enumerate(CONSTRAINTS)}
    return sorted(derivations, key=lambda d: (d.screen, order.get(d.constraint, len(order))))


def governing_counts(table: pd.DataFrame) -> dict[str, int]:
    """Constraint → how many ranked candidates it governs (most first)."""
    if "governing" not in table:
        return {}
    ranked = table[table["rank"].notna() & table["feasible"].eq(True)]
    return dict(Counter(ranked["governing"].dropna()).most_common())


def lead_with_governing(
    table: pd.DataFrame, derivations: list[Derivation]
) -> tuple[pd.DataFrame, list[Derivation]]:
    """The derivations with the one that governs most ranked candidates first, and the table
    with its ``index`` columns (and each ``index_<constraint>``) recomputed to match.

    Each row also gets ``governing_index``: the index text of its governing constraint.
    """
    counts = governing_counts(table)
    sizing = [d for d in derivations if not d.screen]
    lead = max(sizing, key=lambda d: counts.get(d.constraint, 0)) if counts else sizing[0]
    out = table.copy()
    if lead is not derivations[0]:
        former = derivations[0]
        derivations = [lead, *(d for d in derivations if d is not lead)]
        low, high, typical = monomial_index(out, lead.exponents)
        out[columns.constraint_index(former.constraint)] = out[columns.INDEX]
        out[columns.INDEX_LOW], out[columns.INDEX_HIGH], out[columns.INDEX] = low, high, typical
        out = out.drop(columns=columns.constraint_index(lead.constraint))
    text = {d.constraint: d.index_text for d in derivations}
    has_governing = columns.GOVERNING in out
    out[columns.GOVERNING_INDEX] = out[columns.GOVERNING].map(text) if has_governing else None
    return out, derivations

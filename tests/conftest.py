"""Shared fixtures: a small hand-made materials table and a CLI runner."""

from __future__ import annotations

import math

import pandas as pd
import pytest

from selector.inputs.properties import PROPERTIES, RATINGS, data_columns


def make_table(rows: list[dict]) -> pd.DataFrame:
    """A materials table from compact rows: ``{"id": .., "E": (lo, hi), ...}``.

    Properties not given get a wide, harmless range so screens and indices on
    other properties are unaffected.
    """
    defaults = {
        "rho": (1000.0, 1000.0),
        "E": (1.0, 1.0),
        "G": (0.4, 0.4),
        "nu": (0.3, 0.3),
        "sigma_y": (10.0, 10.0),
        "sigma_ts": (20.0, 20.0),
        "sigma_c": (10.0, 10.0),
        "elongation": (5.0, 5.0),
        "K_IC": (50.0, 50.0),  # tough, so the brittle rule leaves these classes alone
        "sigma_e": (5.0, 5.0),
        "T_max": (100.0, 100.0),
        "T_min": (-50.0, -50.0),
        "lambda": (1.0, 1.0),
        "alpha": (10.0, 10.0),
        "c_p": (1000.0, 1000.0),
        "price": (1.0, 1.0),
        "co2": (1.0, 1.0),
        "energy": (10.0, 10.0),
    }
    records = []
    for row in rows:
        rec: dict = {
            "id": row["id"],
            "name": row.get("name", row["id"]),
            "family": row.get("family", "metal"),
        }
        for symbol, prop in PROPERTIES.items():
            lo, hi = row.get(symbol, defaults.get(symbol, (float("nan"), float("nan"))))  # unknown
            rec[prop.low], rec[prop.high] = float(lo), float(hi)
        for rating in RATINGS:
            rec[rating] = row.get(rating, "good")
        rec["directions"] = row.get("directions", "all")
        rec["note"], rec["source"] = "", "test"
        records.append(rec)
    return pd.DataFrame(records, columns=data_columns())


@pytest.fixture
def five_classes() -> pd.DataFrame:
    """Five invented classes for hand-worked ranking (demo data, not real materials)."""
    return make_table(
        [
            {"id": "a", "E": (100, 100), "rho": (1000, 1000), "family": "metal"},
            {"id": "b", "E": (64, 64), "rho": (500, 500), "family": "metal"},
            {"id": "c", "E": (36, 64), "rho": (600, 700), "family": "composite"},
            {"id": "d", "E": (4, 4), "rho": (100, 100), "family": "natural"},
            {"id": "e", "E": (1, 1), "rho": (2000, 2000), "family": "polymer"},
        ]
    )


@pytest.fixture
def gm():
    return lambda lo, hi: math.sqrt(lo * hi)


def sandwich_panel(**tables: object) -> dict:
    """A spec (nested dicts) of an invented plant-room hatch: a simply supported sandwich panel,
    centre load, stiffness and strength constraints; ``tables`` replace or add whole tables."""
    return {
        "part": {
            "function": "panel",
            "support": "simply-supported",
            "load": "centre",
            "length": "0.9 m",
            "width": "0.6 m",
            "force": "1.5 kN",
        },
        "section": {"shape": "sandwich", "free": "faces-and-core"},
        "constraint": [
            {"type": "stiffness", "max_deflection": "3 mm"},
            {"type": "strength", "safety_factor": 2.0},
        ],
        **tables,
    }

"""The curated table of generic material classes, shipped as package data."""

from pathlib import Path

CLASSES_CSV: Path = Path(__file__).with_name("classes.csv")
"""Path of the built-in table: one row per class, low and high for each property."""

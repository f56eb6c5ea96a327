"""Cells safe to open: no live formulas in CSV or XLSX, no raw HTML in Markdown.

Spreadsheet programs run a cell that begins with ``=``, ``+``, ``-`` or ``@`` (and,
in some, a tab or carriage return) as a formula. Following the usual published
guidance on CSV (formula) injection (from memory), such text cells get a leading
apostrophe, which the spreadsheet shows as plain text. Numbers stay numbers, and so
does text that is only a number (``-40``), which no spreadsheet runs as a formula.
"""

from __future__ import annotations

import html
import re
from typing import Any

import pandas as pd

FORMULA_START = ("=", "+", "-", "@", "\t", "\r")
_PLAIN_NUMBER = re.compile(r"[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?")


def neutral(value: Any) -> Any:
    """``value`` with a leading apostrophe if it is text a spreadsheet would run as a formula."""
    if isinstance(value, str) and value.startswith(FORMULA_START) and not _PLAIN_NUMBER.fullmatch(value):
        return "'" + value
    return value


def neutral_frame(frame: pd.DataFrame) -> pd.DataFrame:
    """A copy of ``frame`` with every text cell (and header) passed through :func:`neutral`."""
    out = frame.copy()
    out.columns = [neutral(c) for c in out.columns]
    for i in range(out.shape[1]):
        if not pd.api.types.is_numeric_dtype(out.iloc[:, i]):
            out.iloc[:, i] = out.iloc[:, i].map(neutral)
    return out


def csv_text(frame: pd.DataFrame) -> str:
    """``frame`` as CSV with no formula cells (no trailing newline)."""
    return neutral_frame(frame).to_csv(index=False).rstrip("\n")


def markdown_text(value: str) -> str:
    """Text for Markdown with ``&``, ``<`` and ``>`` escaped, so no HTML passes through."""
    return html.escape(value, quote=False)

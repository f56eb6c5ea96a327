"""Nearest-name suggestions for error messages."""

from __future__ import annotations

import difflib
from collections.abc import Iterable


def did_you_mean(word: str, choices: Iterable[str]) -> str:
    """An 'expected' phrase: the closest valid name if one is close, else the list."""
    options = sorted(choices)
    close = difflib.get_close_matches(word, options, n=1, cutoff=0.6)
    listing = ", ".join(options)
    if close:
        return f"did you mean {close[0]!r}? (valid: {listing})"
    return f"expected one of: {listing}"

"""Nearest-name suggestions for error messages."""

from __future__ import annotations

import difflib
from collections.abc import Iterable

LIST_AT_MOST = 30
"""Longer lists of valid names are not spelled out in a message."""


def did_you_mean(word: str, choices: Iterable[str], keep_order: bool = False, fallback: str = "") -> str:
    """An 'expected' phrase: the closest valid name(s) if close, else the valid names.

    Args:
        word: what the user wrote.
        choices: the valid names.
        keep_order: list the names in the given order rather than sorted.
        fallback: said instead of the list when there are more than ``LIST_AT_MOST`` names.
    """
    options = [str(c) for c in choices]
    options = options if keep_order else sorted(options)
    many = len(options) > LIST_AT_MOST
    close = difflib.get_close_matches(str(word), options, n=3 if many else 1, cutoff=0.6)
    listing = fallback or f"{len(options)} names" if many else ", ".join(options)
    if close:
        names = ", ".join(repr(c) for c in close)
        return f"did you mean {names}?" if many else f"did you mean {names}? (valid: {listing})"
    return listing if many else f"expected one of: {listing}"

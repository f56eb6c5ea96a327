"""Nearest-name suggestions for error messages."""

from __future__ import annotations

import difflib
import re
from collections.abc import Iterable, Mapping

LIST_AT_MOST = 30
"""Longer lists of valid names are not spelled out in a message."""

CUTOFF = 0.6
"""Least similarity (difflib ratio, 0–1) for a name to be suggested."""

PREFIX_SIMILARITY = 0.9
"""Least similarity of a name that begins with what the user wrote (three letters or more);
the closer the whole name, the higher above it."""


def _words(text: str) -> str:
    """Lower-case words in sorted order, so "natural-rubber" meets "rubber-natural"."""
    return " ".join(sorted(w for w in re.split(r"[^0-9a-z]+", str(text).lower()) if w))


def _similarity(word: str, known_as: Iterable[str]) -> float:
    """Best match of ``word`` against any of the forms a name is known by."""
    best = 0.0
    for form in known_as:
        if len(word) >= 3 and str(form).lower().startswith(str(word).lower()):
            closeness = difflib.SequenceMatcher(None, str(word).lower(), str(form).lower()).ratio()
            best = max(best, PREFIX_SIMILARITY + (1 - PREFIX_SIMILARITY) * closeness)
        pairs = ((str(word), str(form)), (str(word).lower(), str(form).lower()), (_words(word), _words(form)))
        for a, b in pairs:
            if a and b:
                best = max(best, difflib.SequenceMatcher(None, a, b).ratio())
    return best


def nearest(
    word: str, choices: Iterable[str], aliases: Mapping[str, Iterable[str]] | None = None
) -> list[str]:
    """Up to three valid names closest to ``word``, best first.

    Args:
        word: what the user wrote.
        choices: the valid names.
        aliases: other words each valid name is known by (a class's full and short name),
            matched as well as the name itself.
    """
    aliases = aliases or {}
    scored = [(_similarity(word, [c, *aliases.get(c, ())]), c) for c in dict.fromkeys(map(str, choices))]
    close = sorted(((s, c) for s, c in scored if s >= CUTOFF), key=lambda sc: (-sc[0], sc[1]))
    return [c for _, c in close[:3]]


def did_you_mean(
    word: str,
    choices: Iterable[str],
    keep_order: bool = False,
    fallback: str = "",
    aliases: Mapping[str, Iterable[str]] | None = None,
) -> str:
    """An 'expected' phrase: the closest valid name(s) if close, else the valid names.

    Args:
        word: what the user wrote.
        choices: the valid names.
        keep_order: list the names in the given order rather than sorted.
        fallback: said instead of the list when there are more than ``LIST_AT_MOST`` names.
        aliases: other words each valid name is known by, matched too (see ``nearest``).
    """
    options = [str(c) for c in choices]
    options = options if keep_order else sorted(options)
    many = len(options) > LIST_AT_MOST
    close = nearest(word, options, aliases)
    if not many:
        close = close[:1]
    listing = fallback or f"{len(options)} names" if many else ", ".join(options)
    if close:
        names = ", ".join(repr(c) for c in close)
        return f"did you mean {names}?" if many else f"did you mean {names}? (valid: {listing})"
    return listing if many else f"expected one of: {listing}"


def class_aliases(table: object) -> dict[str, list[str]]:
    """The full and short names of each class id in a materials table (for ``did_you_mean``)."""
    columns = [c for c in ("name", "short_name") if c in table]  # type: ignore[operator]
    ids = [str(i) for i in table["id"]]  # type: ignore[index]
    return {i: [str(table[c].iat[k]) for c in columns] for k, i in enumerate(ids)}  # type: ignore[index]


CLASS_FALLBACK = "`selector materials list` shows every class id"

"""Limits on what the user gives: TOML size and nesting, and the range of each design quantity.

The ranges are wide (a micrometre to a hundred kilometres, a micronewton to a
teranewton) but finite, so that the power laws of the sizing never overflow or
divide by zero in double precision; a value outside them is almost surely a typo.
"""

from __future__ import annotations

import math
import re

from selector.errors import InputError

MAX_TOML_BYTES = 5_000_000
"""The largest spec or materials TOML file read (a table of some thousands of classes)."""
MAX_TOML_DEPTH = 16
"""The deepest nesting of arrays and inline tables accepted in a TOML file."""

QUANTITY_RANGES: dict[str, tuple[float, float]] = {
    "m": (1e-6, 1e5),
    "N": (1e-6, 1e12),
    "N*m": (1e-9, 1e12),
    "Pa": (1e-3, 1e12),
    "J": (1e-9, 1e12),
    "radian": (1e-9, 1e3),
    "Hz": (1e-9, 1e12),
}
"""SI unit → (smallest, largest) value accepted for a load, a length or a limit."""
SAFETY_FACTOR_RANGE = (1e-3, 1e3)

_TOML_TOKEN = re.compile(
    r'"""(?:[^\\]|\\.)*?"""|\'\'\'.*?\'\'\'|"(?:[^"\\\n]|\\.)*"|\'[^\'\n]*\'|#[^\n]*|[\[\]{}]',
    re.DOTALL,
)


def toml_depth(text: str) -> int:
    """The deepest nesting of ``[`` and ``{`` outside strings and comments (table headers count)."""
    depth = deepest = 0
    for match in _TOML_TOKEN.finditer(text):
        token = match.group()
        if token in "[{":
            depth += 1
            deepest = max(deepest, depth)
        elif token in "]}":
            depth -= 1
    return deepest


def check_toml_text(text: str, where: str) -> None:
    """Refuse a TOML text too large or too deeply nested to read safely, before parsing it."""
    size = len(text.encode("utf-8", errors="replace"))
    if size > MAX_TOML_BYTES:
        raise InputError(where, f"is {size:,} bytes long", f"a TOML file of at most {MAX_TOML_BYTES:,} bytes")
    depth = toml_depth(text)
    if depth > MAX_TOML_DEPTH:
        raise InputError(
            where,
            f"nests arrays or tables {depth} deep",
            f"at most {MAX_TOML_DEPTH} levels of [ ] and {{ }}",
        )


def _plain(value: float) -> str:
    return f"{value:g}"


def check_range(value: float, unit: str, where: str, text: str) -> float:
    """``value`` (in the SI ``unit``) if it is finite and within the range a part can have.

    Raises:
        InputError: naming the input, its value and the accepted range.
    """
    low, high = QUANTITY_RANGES[unit]
    if not (math.isfinite(value) and value > 0):
        raise InputError(where, f"{text!r} must be a finite value above zero", "a positive quantity")
    if not low <= value <= high:
        raise InputError(
            where,
            f"{text!r} is out of range",
            f"a value between {_plain(low)} and {_plain(high)} {unit}",
        )
    return value


def check_safety_factor(value: float, where: str) -> float:
    """A safety factor that is finite and within :data:`SAFETY_FACTOR_RANGE`."""
    low, high = SAFETY_FACTOR_RANGE
    if not (math.isfinite(value) and low <= value <= high):
        raise InputError(
            where,
            f"{_plain(value)} is out of range",
            f"a safety factor between {_plain(low)} and {_plain(high)}",
        )
    return value


def shown(value: object, width: int = 40) -> str:
    """``repr(value)`` cut to ``width`` characters, so a pasted megabyte stays one readable line."""
    text = repr(value)
    return text if len(text) <= width else f"{text[: width - 11]}… ({len(text)} characters)"


def finite_float(value: str | int | float) -> float | None:
    """``float(value)`` of a number or number text, or None when it overflows or is not finite
    (e.g. a 400-digit integer)."""
    try:
        number = float(value)
    except OverflowError:
        return None
    return number if math.isfinite(number) else None

"""Every quantity of a spec in SI, parsed once, with every problem found in one pass.

A spec keeps its quantities as the text the user wrote ("1.8 m"); this module reads them
all: each into its SI unit, checked finite, above zero and within the range a part can
have (``limits.check_range``). ``spec_from_dict`` calls it, so a spec that loads has no
bad quantity; the pipeline reads the values from ``si_values`` by their path
(``part.length``, ``section.t``, ``constraint[1].max_deflection``).
"""

from __future__ import annotations

import functools
from collections.abc import Iterator
from typing import TYPE_CHECKING

from selector.errors import InputError
from selector.inputs.limits import check_range
from selector.inputs.units import magnitude_in, quantity

if TYPE_CHECKING:
    from selector.inputs.spec import Spec

QUANTITY_FIELDS: dict[str, str] = {
    "length": "m",
    "force": "N",
    "torque": "N*m",
    "pressure": "Pa",
    "energy": "J",
    "width": "m",
    "radius": "m",
}
"""The ``[part]`` quantities and their SI units."""
DIMENSION_FIELDS = ("b", "h", "d", "t", "tf", "tw")
"""The ``[section]`` reference dimensions."""
UNIT_OF_KEY: dict[str, str] = {
    **QUANTITY_FIELDS,
    **{key: "m" for key in (*DIMENSION_FIELDS, "min_wall", "max_depth", "max_width", "max_diameter")},
    "min_face": "m",
    "min_core": "m",
    "max_deflection": "m",
    "max_twist": "radian",
    "crack_length": "m",
    "min_frequency": "Hz",
}
"""The SI unit each quantity key of a spec is read in."""

ROTATION_UNITS = ("revolution", "turn", "radian", "degree", "cycle")


def frequency_in_hz(text: str, where: str) -> float:
    """A frequency in cycles per second: rpm and rad/s count turns, not radians (pint's Hz is 1/s)."""
    import pint

    q = quantity(text, where)
    if any(word in str(q.units) for word in ROTATION_UNITS):
        try:
            return float(q.to("turn/second").magnitude)
        except pint.errors.DimensionalityError:
            pass  # reported by magnitude_in below
    return magnitude_in(text, "Hz", where)


def _texts(spec: Spec) -> Iterator[tuple[str, str, str]]:
    """(path, key, text) of every quantity the spec gives."""
    tables = [("part", spec.part), ("section", spec.section)]
    if spec.sandwich is not None:
        tables.append(("sandwich", spec.sandwich))
    tables += [(f"constraint[{i}]", c) for i, c in enumerate(spec.constraint)]
    for path, table in tables:
        for key in UNIT_OF_KEY:
            text = getattr(table, key, None)
            if isinstance(text, str):
                yield f"{path}.{key}", key, text


@functools.lru_cache(maxsize=512)
def _parse(
    items: tuple[tuple[str, str, str], ...],
) -> tuple[tuple[tuple[str, float], ...], tuple[InputError, ...]]:
    values: list[tuple[str, float]] = []
    problems: list[InputError] = []
    for path, key, text in items:
        unit = UNIT_OF_KEY[key]
        try:
            value = frequency_in_hz(text, path) if unit == "Hz" else magnitude_in(text, unit, path)
            values.append((path, check_range(value, unit, path, text)))
        except InputError as exc:
            problems.append(exc)
    return tuple(values), tuple(problems)


def quantity_problems(spec: Spec, source: str) -> list[InputError]:
    """Every quantity of ``spec`` that does not read as its SI unit within range, located in ``source``."""
    _, problems = _parse(tuple(_texts(spec)))
    return [InputError(f"{source}: {p.where}", p.what, p.expected, _keys(p.where)) for p in problems]


def si_values(spec: Spec) -> dict[str, float]:
    """Path → SI value of every quantity of ``spec`` (parsed once per distinct spec text).

    Raises:
        InputError: the first quantity that does not read (``spec_from_dict`` lists them all).
    """
    values, problems = _parse(tuple(_texts(spec)))
    if problems:
        raise problems[0]
    return dict(values)


def _keys(path: str) -> tuple[str | int, ...]:
    """``constraint[1].max_deflection`` → ("constraint", 1, "max_deflection")."""
    out: list[str | int] = []
    for part in path.split("."):
        head, _, index = part.partition("[")
        out.append(head)
        if index:
            out.append(int(index.rstrip("]")))
    return tuple(out)

"""Which spec keys apply where: a key the chosen function, shape or constraint does not
read is an error naming the keys that do, so nothing in a spec is silently ignored.

The rules read the spec as parsed TOML (nested dicts), before the model is built, so
these problems are listed in the same pass as the model's own (unknown keys, wrong
types). A value the model will refuse anyway (an unknown function, say) is skipped.
"""

from __future__ import annotations

from collections.abc import Mapping
from typing import Any

from selector.errors import InputError, Location
from selector.mechanics.loadcases import (
    EXTERNAL_CRITERION,
    FUNCTIONS,
    SPHERE_EXTERNAL,
    VESSEL_LOADS_OF,
    load_case,
    part_kind,
)
from selector.suggest import did_you_mean

PART_KEYS: dict[str, tuple[str, ...]] = {
    "tie": ("length", "force"),
    "beam": ("support", "load", "length", "force", "width"),
    "column": ("support", "length", "force"),
    "shaft": ("length", "torque"),
    "panel": ("support", "load", "length", "force", "width", "edges"),
    "plate": ("length", "force", "width", "edges"),
    "cylinder": ("load", "length", "pressure", "radius"),
    "sphere": ("load", "pressure", "radius"),
    "spring": ("energy", "form"),
}
"""Function → the ``[part]`` keys it reads besides ``function`` (its loads, geometry and options).

The quantities are those its load case's equations hold (``tests`` check the two agree);
a panel's width is the b of its rectangular section."""

DIMENSIONS_OF_FUNCTION: dict[str, tuple[str, ...]] = {
    "panel": ("b", "t"),
    "plate": ("t",),
    "cylinder": ("t",),
    "sphere": ("t",),
    "spring": (),
}
"""``[section]`` dimensions read by functions without a cross-section shape (a panel's width
and thickness; a plate's or vessel's wall; a spring has none)."""

SECTION_DIMENSIONS = ("b", "h", "d", "t", "tf", "tw")

CONSTRAINT_KEYS: dict[str, tuple[str, ...]] = {
    "stiffness": ("max_deflection", "max_twist"),
    "strength": (),
    "buckling": (),
    "fracture": ("crack_length", "geometry_factor", "criterion"),
    "fatigue": ("load_ratio",),
    "frequency": ("min_frequency",),
}
"""Constraint type → the keys it reads besides ``type`` and ``safety_factor``."""

_OWN_KEYS = tuple(dict.fromkeys(k for keys in CONSTRAINT_KEYS.values() for k in keys))


def _listed(keys: tuple[str, ...] | list[str], none: str) -> str:
    return f"keys that apply: {', '.join(keys)}" if keys else none


def _problem(source: str, location: Location, what: str, expected: str) -> InputError:
    path = ""
    for part in location:
        path += f"[{part}]" if isinstance(part, int) else (f".{part}" if path else str(part))
    return InputError(f"{source}: {path}", what, expected, location)


def _table(data: Mapping[str, Any], name: str) -> Mapping[str, Any]:
    value = data.get(name, {})
    return value if isinstance(value, Mapping) else {}


def _part_problems(part: Mapping[str, Any], fn: str, free: Any, source: str) -> list[InputError]:
    keys = PART_KEYS[fn]
    out = []
    for key in part:
        if key == "function" or key not in _ALL_PART_KEYS:
            continue  # unknown keys are the model's to report
        if key not in keys:
            out.append(
                _problem(
                    source,
                    ("part", key),
                    f"{key} does not apply to a {fn}",
                    f"a {fn} takes: function, {', '.join(keys)}",
                )
            )
    load = part.get("load")
    loads = VESSEL_LOADS_OF.get(fn, ())
    if fn == "sphere" and load == "external":
        out.append(_problem(source, ("part", "load"), *SPHERE_EXTERNAL))
    elif loads and isinstance(load, str) and load not in loads:
        out.append(
            _problem(source, ("part", "load"), f"{load!r} is not a {fn}'s load", did_you_mean(load, loads))
        )
    support = part.get("support")
    if "support" in keys and isinstance(support, str) and (isinstance(load, str) or load is None):
        try:
            load_case(fn, support, load if isinstance(load, str) else None)
        except InputError as exc:  # an unknown support, or a load its support does not take
            field = exc.where.removeprefix("part.")
            out.append(_problem(source, ("part", field), exc.what, exc.expected))
    if fn == "beam" and "width" in part and free != "depth":
        out.append(
            _problem(
                source,
                ("part", "width"),
                f"a beam reads width only when its depth is free (free = {free!r})",
                'free = "depth" for a rectangle of fixed width, or the section\'s b',
            )
        )
    return out


_ALL_PART_KEYS = frozenset(k for keys in PART_KEYS.values() for k in keys)


def _section_problems(
    section: Mapping[str, Any], fn: str, part: Mapping[str, Any], source: str
) -> list[InputError]:
    from selector.mechanics.sections import SHAPES

    shape = section.get("shape", "generic")
    free = section.get("free", "scale")
    if not isinstance(shape, str) or shape == "sandwich":
        return []  # a sandwich's section is checked with its [sandwich] table
    if part_kind(fn).takes_section:  # its dimensions are the shape's
        if shape not in (*SHAPES, "generic"):
            return []  # refused with the shapes that are sized
        dims = SHAPES["rectangle" if shape == "generic" else shape]
        owner = f"a {shape} section"
    else:
        dims = DIMENSIONS_OF_FUNCTION[fn]
        owner = f"a {fn}"
    out = []
    for key in section:
        if key in SECTION_DIMENSIONS and key not in dims:
            out.append(
                _problem(
                    source,
                    ("section", key),
                    f"{key} is not a dimension of {owner}",
                    _listed(list(dims), f"{owner} takes no dimensions"),
                )
            )
    if fn in ("beam", "panel") and (fn == "panel" or free == "depth") and "b" in section and "width" in part:
        out.append(
            _problem(
                source,
                ("part", "width"),
                "the width is given twice, as part.width and section.b",
                "one of them",
            )
        )
    if "min_wall" in section:
        walled = part_kind(fn).own_dimension == "t" or free in ("thickness", "wall")
        if not walled or free == "none":
            out.append(
                _problem(
                    source,
                    ("section", "min_wall"),
                    f"min_wall applies to a part whose wall or thickness is sized, not free = {free!r}",
                    'free = "wall" (a tube) or "thickness" (a panel); a plate or vessel wall',
                )
            )
    return out


def _constraint_problems(constraints: list[Any], fn: str | None, load: Any, source: str) -> list[InputError]:
    out = []
    outside = fn is not None and part_kind(fn).vessel and load == "external"
    for i, item in enumerate(constraints):
        kind = item.get("type") if isinstance(item, Mapping) else None
        if not isinstance(kind, str) or kind not in CONSTRAINT_KEYS:
            continue  # the model reports a missing or unknown type
        keys = list(CONSTRAINT_KEYS[kind])
        if kind == "stiffness" and fn is not None:
            keys = ["max_twist" if fn == "shaft" else "max_deflection"]
        if kind == "fracture" and fn is not None and not part_kind(fn).vessel:
            keys.remove("criterion")
        for key in item:
            if kind == "fracture" and key == "criterion" and outside:
                out.append(_problem(source, ("constraint", i, key), *EXTERNAL_CRITERION))
            elif key in _OWN_KEYS and key not in keys:
                whose = f"a {kind} constraint" + (f" of a {fn}" if fn is not None else "")
                why = (
                    "criterion applies to the fracture constraint of a cylinder or sphere; "
                    if key == "criterion" and kind == "fracture"
                    else ""
                )
                applies = _listed(["type", "safety_factor", *keys], "")
                out.append(
                    _problem(
                        source, ("constraint", i, key), f"{key} does not apply to {whose}", why + applies
                    )
                )
    return out


def key_problems(data: Mapping[str, Any], source: str = "spec") -> list[InputError]:
    """Every key of the parsed spec ``data`` that its function, shape or constraint does not read.

    Args:
        data: the spec as nested dicts (parsed TOML).
        source: the file name (or "spec") that starts each message.
    """
    part = _table(data, "part")
    section = _table(data, "section")
    fn = part.get("function")
    fn = fn if isinstance(fn, str) and fn in FUNCTIONS else None
    constraints = data.get("constraint", [])
    out: list[InputError] = []
    if fn is not None:
        out += _part_problems(part, fn, section.get("free", "scale"), source)
        out += _section_problems(section, fn, part, source)
    if isinstance(constraints, list):
        out += _constraint_problems(constraints, fn, part.get("load"), source)
    return out

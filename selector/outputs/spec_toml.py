"""A spec written back as TOML text, in the order and layout of the bundled examples.

The spec is plain data (text, numbers, true/false, lists of text, tables and the
``[[constraint]]`` list), so a small writer suffices: reading its text back with
``tomllib`` gives the same data.
"""

from __future__ import annotations

import math
import re
from collections.abc import Mapping, Sequence
from typing import Any

TABLE_ORDER = ("part", "section", "sandwich", "objective", "constraint", "screen", "materials")
"""Tables in the order the examples give them; any other table follows."""
_BARE_KEY = re.compile(r"[A-Za-z0-9_-]+")
_ESCAPES = {'"': '\\"', "\\": "\\\\", "\b": "\\b", "\t": "\\t", "\n": "\\n", "\f": "\\f", "\r": "\\r"}


def _key(key: str) -> str:
    return key if _BARE_KEY.fullmatch(key) else _string(key)


def _string(text: str) -> str:
    out = []
    for ch in text:
        if ch in _ESCAPES:
            out.append(_ESCAPES[ch])
        elif ord(ch) < 0x20 or ord(ch) == 0x7F:
            out.append(f"\\u{ord(ch):04x}")
        else:
            out.append(ch)
    return '"' + "".join(out) + '"'


def _value(value: Any, where: str) -> str:
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, int):
        return str(value)
    if isinstance(value, float):
        if not math.isfinite(value):
            raise ValueError(f"{where}: {value!r} cannot be written in a spec")
        return repr(value)
    if isinstance(value, str):
        return _string(value)
    if isinstance(value, Sequence):
        return "[" + ", ".join(_value(v, where) for v in value) + "]"
    raise ValueError(f"{where}: {type(value).__name__} cannot be written in a spec")


def _is_table(value: Any) -> bool:
    return isinstance(value, Mapping)


def _is_table_list(value: Any) -> bool:
    return isinstance(value, list) and bool(value) and all(isinstance(v, Mapping) for v in value)


def _lines(table: Mapping[str, Any], where: str) -> list[str]:
    return [f"{_key(k)} = {_value(v, f'{where}.{k}')}" for k, v in table.items()]


def spec_toml(data: Mapping[str, Any], heading: Sequence[str] = ()) -> str:
    """Spec data (nested dicts, as ``Spec.model_dump`` gives) as TOML text.

    ``heading`` lines are written first as comments. Tables nest one level, as a spec's do.

    Raises:
        ValueError: a value TOML cannot hold (NaN, infinity, an object).
    """
    out = [f"# {line}" for line in heading]
    scalars = {k: v for k, v in data.items() if not (_is_table(v) or _is_table_list(v))}
    out += _lines(scalars, "spec")
    names = [k for k in TABLE_ORDER if k in data] + [k for k in data if k not in TABLE_ORDER]
    for name in names:
        value = data[name]
        if _is_table(value):
            out += ["", f"[{_key(name)}]", *_lines(value, name)]
        elif _is_table_list(value):
            for i, item in enumerate(value):
                out += ["", f"[[{_key(name)}]]", *_lines(item, f"{name}[{i}]")]
    return "\n".join(out).lstrip("\n") + "\n"

"""The syntax tree of a typed formula: its nodes, the functions it may call, and walks over it."""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, field

import numpy as np


@dataclass(frozen=True)
class _Function:
    min_args: int
    max_args: int | None
    usage: str


FUNCTIONS: dict[str, _Function] = {
    "min": _Function(2, None, "min(a, b, ...)"),
    "max": _Function(2, None, "max(a, b, ...)"),
    "sqrt": _Function(1, 1, "sqrt(x)"),
}
"""The functions the language knows, with their argument counts."""


# --------------------------------------------------------------------------- syntax tree


@dataclass(frozen=True)
class Number:
    """A numeric literal."""

    value: float
    pos: int = field(default=0, compare=False, repr=False)


@dataclass(frozen=True)
class Symbol:
    """A property symbol, e.g. ``rho``."""

    name: str
    pos: int = field(default=0, compare=False, repr=False)


@dataclass(frozen=True)
class Negate:
    """Unary minus."""

    operand: Node
    pos: int = field(default=0, compare=False, repr=False)


@dataclass(frozen=True)
class Binary:
    """A binary operation; ``op`` is one of ``+ - * / ^``."""

    op: str
    left: Node
    right: Node
    pos: int = field(default=0, compare=False, repr=False)


@dataclass(frozen=True)
class Call:
    """A function call: ``min``, ``max`` or ``sqrt``."""

    name: str
    args: tuple[Node, ...]
    pos: int = field(default=0, compare=False, repr=False)


Node = Number | Symbol | Negate | Binary | Call

Interval = tuple[np.ndarray, np.ndarray]


def children(node: Node) -> Sequence[Node]:
    """The operands or arguments of ``node`` (none for a number or symbol)."""
    match node:
        case Negate(operand):
            return (operand,)
        case Binary(_, left, right):
            return (left, right)
        case Call(_, args):
            return args
    return ()


def symbols_of(node: Node) -> frozenset[str]:
    """The property symbols used anywhere below ``node``."""
    if isinstance(node, Symbol):
        return frozenset((node.name,))
    return frozenset().union(*(symbols_of(child) for child in children(node)))


def first_position(node: Node, name: str) -> int:
    """Where symbol ``name`` first appears in the text (characters from the start)."""
    if isinstance(node, Symbol) and node.name == name:
        return node.pos
    for child in children(node):
        pos = first_position(child, name)
        if pos >= 0:
            return pos
    return -1

"""Formulas marked up for a page: one set of pieces (text, raised, lowered), drawn as HTML or page elements.

A derived index is written from its monomial (:func:`monomial_pieces`): its powers and
its symbols' subscripts come from the algebra, not from reading text back. Prose that
carries formulas (derivation steps, load-case equations, a typed index) is split by
:func:`text_pieces`, the one reader of the plain formula text that
``mechanics.monomial.format_monomial`` and the load cases write: ``x^(1/2)`` and ``x^3``
are raised, ``δ_max`` is lowered.
"""

from __future__ import annotations

import html
import re
from collections.abc import Mapping
from fractions import Fraction
from typing import TYPE_CHECKING, Literal

from selector.mechanics.monomial import Monomial
from selector.pipeline.derive import SYMBOLS_TEXT

if TYPE_CHECKING:
    from markupsafe import Markup

    from selector.pipeline.derive import Derivation
    from selector.pipeline.selection import Selection

Kind = Literal["text", "sup", "sub"]
Piece = tuple[Kind, str]
"""One run of a formula: plain text, a raised power or a lowered subscript."""

_PLAIN_FORMULA = re.compile(
    r"\^\((?P<group>[^()]{1,40})\)|\^(?P<number>-?[0-9]+(?:\.[0-9]+)?)|(?<=[A-Za-zα-ωΑ-Ω])_(?P<sub>[A-Za-z0-9]{1,6})"
)


def text_pieces(text: str) -> list[Piece]:
    """Prose with plain-text formulas as pieces: ``x^(1/2)``, ``x^3`` raised, ``δ_max`` lowered."""
    out: list[Piece] = []
    at = 0
    for match in _PLAIN_FORMULA.finditer(text):
        if match.start() > at:
            out.append(("text", text[at : match.start()]))
        if match.group("sub") is not None:
            out.append(("sub", match.group("sub")))
        else:
            out.append(("sup", match.group("group") or match.group("number")))
        at = match.end()
    if at < len(text):
        out.append(("text", text[at:]))
    return out


def _symbol_pieces(symbol: str) -> list[Piece]:
    """A written symbol such as ``σ_y`` as a head and its subscript."""
    head, _, sub = symbol.partition("_")
    return [("text", head), ("sub", sub)] if sub else [("text", head)]


def _power(power: Fraction) -> str:
    return str(power.numerator) if power.denominator == 1 else f"{power.numerator}/{power.denominator}"


def monomial_pieces(m: Monomial, symbols: Mapping[str, str] | None = None) -> list[Piece]:
    """A monomial's factors as pieces, numerator over denominator (no coefficient): ``E^(1/2)/ρ``."""
    names = symbols or {}

    def side(items: list[tuple[str, Fraction]]) -> list[Piece]:
        out: list[Piece] = []
        for i, (name, power) in enumerate(items):
            if i:
                out.append(("text", "·"))
            out += _symbol_pieces(names.get(name, name))
            if power != 1:
                out.append(("sup", _power(power)))
        return out

    up = [(k, v) for k, v in m.powers if v > 0]
    down = [(k, -v) for k, v in m.powers if v < 0]
    top = side(up) or [("text", "1")]
    if not down:
        return top
    bottom = side(down)
    if len(down) > 1:
        return [*top, ("text", "/("), *bottom, ("text", ")")]
    return [*top, ("text", "/"), *bottom]


def pieces_html(pieces: list[Piece]) -> Markup:
    """Pieces as safe HTML: every run escaped, powers in ``<sup>``, subscripts in ``<sub>``."""
    from markupsafe import Markup  # the page templates' safe-text type, loaded only for pages

    tags = {"text": "{}", "sup": "<sup>{}</sup>", "sub": "<sub>{}</sub>"}
    return Markup("".join(tags[kind].format(html.escape(run, quote=False)) for kind, run in pieces))


def formula_html(text: str) -> Markup:
    """Plain formula text as safe HTML (see :func:`text_pieces`)."""
    return pieces_html(text_pieces(text))


def index_pieces(derivation: Derivation) -> list[Piece]:
    """A derivation's merit index, written from its monomial."""
    return monomial_pieces(derivation.index, SYMBOLS_TEXT)


def headline_index_pieces(selection: Selection) -> list[Piece]:
    """The index that ranks a Selection: the typed one as written, else the leading derivation's."""
    if selection.expression is not None:
        return text_pieces(selection.expression)
    return index_pieces(selection.derivations[0])

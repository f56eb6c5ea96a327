"""Chart text: escaping, shortening, and symbols, powers and expressions as plotly HTML."""

from __future__ import annotations

import html
import math
from collections.abc import Sequence
from fractions import Fraction
from typing import Any

from selector.inputs.expressions import Binary, Call, Negate, Node, Number, Symbol
from selector.inputs.units import format_number
from selector.outputs.charts.style import _GREEK, _SPECIAL, MAX_LABEL


def _esc(text: Any) -> str:
    """User text made safe for plotly's HTML-like labels: ``&``, ``<`` and ``>`` escaped."""
    return html.escape(str(text), quote=False)


def _short(text: str, limit: int = MAX_LABEL) -> str:
    return text if len(text) <= limit else text[: limit - 1].rstrip() + "…"


def symbol_html(symbol: str) -> str:
    """A property symbol written for a chart: ``sigma_y`` → ``σ<sub>y</sub>``."""
    if symbol in _SPECIAL:
        return _SPECIAL[symbol]
    head, _, tail = symbol.partition("_")
    head = _GREEK.get(head, head)
    return f"{head}<sub>{tail}</sub>" if tail else head


def _power_text(p: float) -> str:
    """An exponent as a short fraction where it is one (0.5 → 1/2), else a number."""
    frac = Fraction(p).limit_denominator(12)
    if abs(float(frac) - p) < 1e-9:
        return str(frac.numerator) if frac.denominator == 1 else f"{frac.numerator}/{frac.denominator}"
    return format_number(p)


def _monomial_html(terms: Sequence[tuple[str, float, bool]]) -> str:
    """``Π base^p`` written as numerator/denominator; each term is (html, power, needs brackets).

    A base that needs brackets (a unit such as kg/m³) gets them whenever it is raised to a
    power or stands beside another term.
    """
    top = [(b, p, w) for b, p, w in terms if p > 0]
    bottom = [(b, -p, w) for b, p, w in terms if p < 0]

    def group(part: list[tuple[str, float, bool]], alone: bool) -> str:
        out = []
        for base, p, wrap in part:
            body = f"({base})" if wrap and (p != 1 or not alone or len(part) > 1) else base
            out.append(body if p == 1 else f"{body}<sup>{_power_text(p)}</sup>")
        return "·".join(out)

    upper = group(top, not bottom) if top else "1"
    if not bottom:
        return upper
    lower = group(bottom, False)
    return f"{upper}/({lower})" if len(bottom) > 1 else f"{upper}/{lower}"


def _number_html(value: float) -> str:
    """A number for chart labels: plain in 0.001–99 999, else as m×10ⁿ."""
    if not math.isfinite(value) or value == 0 or 1e-3 <= abs(value) < 1e5:
        return format_number(value)
    exp = math.floor(math.log10(abs(value)))
    mantissa = format_number(value / 10**exp)
    if mantissa in ("10", "-10"):
        mantissa, exp = mantissa[:-1], exp + 1
    power = f"10<sup>{'−' if exp < 0 else ''}{abs(exp)}</sup>"
    return power if mantissa == "1" else f"{mantissa}×{power}"


def _needs_brackets(label: str) -> bool:
    return any(c in label for c in "/· ")


def _expression_html(node: Node, parent: int = 0) -> str:
    """An expression tree as chart text, bracketed by precedence."""
    match node:
        case Number(value):
            text, prec = format_number(value), 5
        case Symbol(name):
            text, prec = symbol_html(name), 5
        case Negate(operand):
            text, prec = "−" + _expression_html(operand, 3), 3
        case Binary("^", left, right):
            text, prec = f"{_expression_html(left, 5)}<sup>{_expression_html(right, 0)}</sup>", 4
        case Binary(op, left, right) if op in "*/":
            sign = "·" if op == "*" else "/"
            text, prec = f"{_expression_html(left, 2)}{sign}{_expression_html(right, 3)}", 2
        case Binary(op, left, right):
            sign = "+" if op == "+" else "−"
            text, prec = f"{_expression_html(left, 1)} {sign} {_expression_html(right, 2)}", 1
        case Call(name, args):
            text, prec = f"{name}({', '.join(_expression_html(a) for a in args)})", 5
        case _:  # pragma: no cover - the parser makes no other nodes
            raise TypeError(f"not an expression node: {node!r}")
    return f"({text})" if prec < parent else text


def _plain(text: str) -> str:
    """HTML chart text as plain text for messages."""
    for tag, plain in (("<sup>", "^"), ("</sup>", ""), ("<sub>", "_"), ("</sub>", "")):
        text = text.replace(tag, plain)
    return html.unescape(text)


def unit_html(label: str) -> str:
    """A unit written as plain text by ``display_units`` (``GPa^(1/2)/(Mg/m³)``) as chart text."""
    from selector.outputs.formula import text_pieces

    tags = {"text": "{}", "sup": "<sup>{}</sup>", "sub": "<sub>{}</sub>"}
    return "".join(tags[kind].format(_esc(run)) for kind, run in text_pieces(label))

"""A small algebra of monomials: coefficient × product of symbols raised to rational powers.

The load cases are written in it, and the derivation of a merit index is done in
it: solve a constraint for the free variable, substitute into the objective and
split what is left into a load/geometry part and a material part.
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Mapping
from dataclasses import dataclass
from fractions import Fraction
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    import numpy as np

Exponent = Fraction


def _frac(value: float | int | Fraction) -> Fraction:
    return value if isinstance(value, Fraction) else Fraction(value).limit_denominator(1000)


@dataclass(frozen=True)
class Monomial:
    """``coef · Π symbol^power`` with rational powers.

    Attributes:
        coef: positive numeric coefficient.
        powers: sorted (symbol, power) pairs; no zero powers.
    """

    coef: float = 1.0
    powers: tuple[tuple[str, Fraction], ...] = ()

    @staticmethod
    def of(coef: float = 1.0, **powers: float | Fraction) -> Monomial:
        """Build from keyword powers, e.g. ``Monomial.of(3, E=1, I=1, L=-3)``."""
        return Monomial._make(coef, powers.items())

    @staticmethod
    def sym(name: str, power: float | Fraction = 1) -> Monomial:
        """One symbol, optionally raised to ``power``."""
        return Monomial._make(1.0, [(name, power)])

    @staticmethod
    def _make(coef: float, items: Iterable[tuple[str, float | Fraction]]) -> Monomial:
        merged: dict[str, Fraction] = {}
        for name, power in items:
            merged[name] = merged.get(name, Fraction(0)) + _frac(power)
        return Monomial(float(coef), tuple(sorted((k, v) for k, v in merged.items() if v != 0)))

    @property
    def exponents(self) -> dict[str, Fraction]:
        return dict(self.powers)

    @property
    def symbols(self) -> frozenset[str]:
        return frozenset(k for k, _ in self.powers)

    def power_of(self, name: str) -> Fraction:
        return self.exponents.get(name, Fraction(0))

    def __mul__(self, other: Monomial | float) -> Monomial:
        if not isinstance(other, Monomial):
            return Monomial(self.coef * float(other), self.powers)
        return Monomial._make(self.coef * other.coef, [*self.powers, *other.powers])

    __rmul__ = __mul__

    def __truediv__(self, other: Monomial | float) -> Monomial:
        if not isinstance(other, Monomial):
            return Monomial(self.coef / float(other), self.powers)
        return self * other**-1

    def __rtruediv__(self, other: float) -> Monomial:
        return Monomial(float(other), ()) * self**-1

    def __pow__(self, power: float | Fraction) -> Monomial:
        p = _frac(power)
        return Monomial._make(self.coef ** float(p), [(k, v * p) for k, v in self.powers])

    def split(self, names: Iterable[str]) -> tuple[Monomial, Monomial]:
        """(part in ``names`` with coefficient 1, the rest with the coefficient)."""
        chosen = set(names)
        inside = Monomial._make(1.0, [(k, v) for k, v in self.powers if k in chosen])
        outside = Monomial._make(self.coef, [(k, v) for k, v in self.powers if k not in chosen])
        return inside, outside

    def solve_for(self, name: str, equals: Monomial) -> Monomial:
        """Solve ``self == equals`` for symbol ``name`` (which must appear in self only)."""
        power = self.power_of(name)
        if power == 0:
            raise ValueError(f"{name} does not appear in {self}")
        _, rest = self.split([name])
        return (equals / rest) ** (1 / power)

    def substitute(self, name: str, value: Monomial) -> Monomial:
        """Replace symbol ``name`` by the monomial ``value``."""
        power = self.power_of(name)
        _, rest = self.split([name])
        return rest * value**power if power else self

    def evaluate(self, values: Mapping[str, float | np.ndarray]) -> float | np.ndarray:
        """Numeric value; ``values`` may hold floats or numpy arrays (broadcast)."""
        result: float | np.ndarray = self.coef
        for name, power in self.powers:
            result = result * values[name] ** float(power)
        return result

    def __str__(self) -> str:
        return format_monomial(self)


def _power_text(power: Fraction) -> str:
    if power.denominator == 1:
        return str(power.numerator)
    return f"({power.numerator}/{power.denominator})"


def format_monomial(m: Monomial, symbols: Mapping[str, str] | None = None, coef: bool = True) -> str:
    """Readable text, e.g. ``0.5·F^(1/2)·L^(5/2)/E^(1/2)``."""
    names = symbols or {}
    up = [(names.get(k, k), v) for k, v in m.powers if v > 0]
    down = [(names.get(k, k), -v) for k, v in m.powers if v < 0]

    def side(items: list[tuple[str, Fraction]]) -> str:
        return "·".join(k if v == 1 else f"{k}^{_power_text(v)}" for k, v in items)

    top = side(up)
    if coef and not math.isclose(m.coef, 1.0, rel_tol=1e-12):
        top = f"{_coef_text(m.coef)}·{top}" if top else _coef_text(m.coef)
    top = top or "1"
    if not down:
        return top
    bottom = side(down)
    return f"{top}/({bottom})" if len(down) > 1 else f"{top}/{bottom}"


def format_monomial_latex(m: Monomial, symbols: Mapping[str, str] | None = None, coef: bool = True) -> str:
    """The same in LaTeX, e.g. ``\\frac{E^{1/2}}{\\rho}``."""
    names = symbols or {}

    def side(items: list[tuple[str, Fraction]]) -> str:
        parts = []
        for k, v in items:
            sym = names.get(k, k)
            parts.append(sym if v == 1 else f"{sym}^{{{v}}}")
        return r" \, ".join(parts)

    up = side([(k, v) for k, v in m.powers if v > 0])
    down = side([(k, -v) for k, v in m.powers if v < 0])
    if coef and not math.isclose(m.coef, 1.0, rel_tol=1e-12):
        up = f"{_coef_text(m.coef)} \\, {up}" if up else _coef_text(m.coef)
    up = up or "1"
    return rf"\frac{{{up}}}{{{down}}}" if down else up


def _coef_text(value: float) -> str:
    return f"{value:.4g}"

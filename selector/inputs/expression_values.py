"""Values of a formula's syntax tree: vectorised evaluation, interval arithmetic, monomial form.

Values are used in whatever units the caller passes (normally SI base units).
"""

from __future__ import annotations

import math
from collections.abc import Callable, Mapping
from functools import reduce

import numpy as np

from selector.inputs.expression_tree import Binary, Call, Interval, Negate, Node, Number, Symbol, symbols_of


def constant_value(node: Node) -> float:
    """The value of a symbol-free subtree."""
    with np.errstate(all="ignore"):
        return float(evaluate_node(node, {}))


_BINARY: dict[str, Callable[[np.ndarray, np.ndarray], np.ndarray]] = {
    "+": np.add,
    "-": np.subtract,
    "*": np.multiply,
    "/": np.divide,
    "^": np.power,
}

_CALLS: dict[str, Callable[..., np.ndarray]] = {
    "min": lambda *xs: reduce(np.minimum, xs),
    "max": lambda *xs: reduce(np.maximum, xs),
    "sqrt": np.sqrt,
}


def evaluate_node(node: Node, arrays: Mapping[str, np.ndarray]) -> np.ndarray:
    """``node`` evaluated over arrays of property values (NumPy rules for inf and nan)."""
    match node:
        case Number(value):
            return np.asarray(value, dtype=float)
        case Symbol(name):
            return arrays[name]
        case Negate(operand):
            return np.negative(evaluate_node(operand, arrays))
        case Binary(op, left, right):
            return _BINARY[op](evaluate_node(left, arrays), evaluate_node(right, arrays))
        case Call(name, args):
            return _CALLS[name](*(evaluate_node(arg, arrays) for arg in args))
    raise TypeError(f"not an expression node: {node!r}")


# --------------------------------------------------------------------------- interval arithmetic


def _mul(a: np.ndarray, b: np.ndarray) -> np.ndarray:
    """``a*b`` taking ``0*inf`` as 0, as interval arithmetic does."""
    zero = ((a == 0) & ~np.isnan(b)) | ((b == 0) & ~np.isnan(a))
    return np.where(zero, 0.0, a * b)


def _hull(*corners: np.ndarray) -> Interval:
    return reduce(np.minimum, corners), reduce(np.maximum, corners)


def _divide(a: Interval, b: Interval) -> Interval:
    (alo, ahi), (blo, bhi) = a, b
    lo, hi = _hull(alo / blo, alo / bhi, ahi / blo, ahi / bhi)
    spans_zero = (blo <= 0) & (bhi >= 0)
    return np.where(spans_zero, -np.inf, lo), np.where(spans_zero, np.inf, hi)


def _power_constant(lo: np.ndarray, hi: np.ndarray, p: float) -> Interval:
    """Range of ``x^p`` for x in ``[lo, hi]`` and a constant ``p``."""
    if p == 0:
        one = np.ones_like(lo * hi)
        return one, one
    pl, ph = np.power(lo, p), np.power(hi, p)
    if not float(p).is_integer():
        valid = lo >= 0
        low, high = (pl, ph) if p > 0 else (ph, pl)
        low, high = np.where(valid, low, np.nan), np.where(valid, high, np.nan)
    elif p > 0 and int(p) % 2 == 0:
        low = np.where(lo >= 0, pl, np.where(hi <= 0, ph, 0.0))
        high = np.where(lo >= 0, ph, np.where(hi <= 0, pl, np.maximum(pl, ph)))
    elif p > 0:
        low, high = pl, ph
    elif int(p) % 2 == 0:
        low = np.where(lo > 0, ph, np.where(hi < 0, pl, np.minimum(pl, ph)))
        high = np.where(lo > 0, pl, np.where(hi < 0, ph, np.inf))
    else:
        one_sided = (lo > 0) | (hi < 0)
        low, high = np.where(one_sided, ph, -np.inf), np.where(one_sided, pl, np.inf)
    unknown = np.isnan(lo) | np.isnan(hi)
    return np.where(unknown, np.nan, low), np.where(unknown, np.nan, high)


def _power(base: Interval, exponent: Interval, constant: float | None) -> Interval:
    (blo, bhi), (elo, ehi) = base, exponent
    if constant is not None:
        return _power_constant(blo, bhi, constant)
    lo, hi = _hull(np.power(blo, elo), np.power(blo, ehi), np.power(bhi, elo), np.power(bhi, ehi))
    valid = blo >= 0
    return np.where(valid, lo, np.nan), np.where(valid, hi, np.nan)


def interval_of(node: Node, bounds: Mapping[str, Interval]) -> Interval:
    """(low, high) bounds of ``node`` as each symbol varies within its (low, high) bounds."""
    match node:
        case Number(value):
            return np.asarray(value, dtype=float), np.asarray(value, dtype=float)
        case Symbol(name):
            return bounds[name]
        case Negate(operand):
            lo, hi = interval_of(operand, bounds)
            return -hi, -lo
        case Binary("+", left, right):
            (alo, ahi), (blo, bhi) = interval_of(left, bounds), interval_of(right, bounds)
            return alo + blo, ahi + bhi
        case Binary("-", left, right):
            (alo, ahi), (blo, bhi) = interval_of(left, bounds), interval_of(right, bounds)
            return alo - bhi, ahi - blo
        case Binary("*", left, right):
            (alo, ahi), (blo, bhi) = interval_of(left, bounds), interval_of(right, bounds)
            return _hull(_mul(alo, blo), _mul(alo, bhi), _mul(ahi, blo), _mul(ahi, bhi))
        case Binary("/", left, right):
            return _divide(interval_of(left, bounds), interval_of(right, bounds))
        case Binary("^", left, right):
            constant = None if symbols_of(right) else constant_value(right)
            return _power(interval_of(left, bounds), interval_of(right, bounds), constant)
        case Call("sqrt", (arg,)):
            lo, hi = interval_of(arg, bounds)
            valid = lo >= 0
            return np.where(valid, np.sqrt(lo), np.nan), np.where(valid, np.sqrt(hi), np.nan)
        case Call("min" | "max" as name, args):
            parts = [interval_of(arg, bounds) for arg in args]
            pick = np.minimum if name == "min" else np.maximum
            return reduce(pick, (p[0] for p in parts)), reduce(pick, (p[1] for p in parts))
    raise TypeError(f"not an expression node: {node!r}")


# --------------------------------------------------------------------------- monomials

_Monomial = tuple[float, dict[str, float]]

_ZERO_POWER = 1e-12


def _combine(a: _Monomial, b: _Monomial, sign: float) -> _Monomial | None:
    """``a · b^sign`` for sign ±1."""
    coef = float(np.float64(a[0]) * np.float64(b[0]) if sign > 0 else np.float64(a[0]) / np.float64(b[0]))
    powers = dict(a[1])
    for name, power in b[1].items():
        powers[name] = powers.get(name, 0.0) + sign * power
    return _monomial_result(coef, powers)


def _raise(a: _Monomial, p: float) -> _Monomial | None:
    coef, powers = a
    if coef < 0 and not float(p).is_integer():
        return None
    return _monomial_result(float(np.power(np.float64(coef), p)), {k: v * p for k, v in powers.items()})


def _monomial_result(coef: float, powers: dict[str, float]) -> _Monomial | None:
    if not math.isfinite(coef):
        return None
    return coef, {name: power for name, power in powers.items() if abs(power) > _ZERO_POWER}


def monomial_of(node: Node) -> _Monomial | None:
    """``(c, {symbol: power})`` when ``node`` is c · Π symbol^power, else None."""
    if not symbols_of(node):
        return _monomial_result(constant_value(node), {})
    match node:
        case Symbol(name):
            return 1.0, {name: 1.0}
        case Negate(operand):
            inner = monomial_of(operand)
            return None if inner is None else (-inner[0], inner[1])
        case Binary("*" | "/" as op, left, right):
            a, b = monomial_of(left), monomial_of(right)
            if a is None or b is None:
                return None
            return _combine(a, b, 1.0 if op == "*" else -1.0)
        case Binary("^", left, right):
            base = monomial_of(left)
            if base is None or symbols_of(right):
                return None
            return _raise(base, constant_value(right))
        case Call("sqrt", (arg,)):
            base = monomial_of(arg)
            return None if base is None else _raise(base, 0.5)
    return None

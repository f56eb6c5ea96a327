"""A small, safe formula language for merit indices typed by users.

Grammar (lowest to highest precedence)::

    sum     := product (("+" | "-") product)*
    product := unary (("*" | "/") unary)*
    unary   := ("-" | "+") unary | power
    power   := atom (("^" | "**") unary)?          # right-associative
    atom    := number | property | function "(" sum ("," sum)* ")" | "(" sum ")"

So ``-E^2`` is ``-(E^2)``, ``2^3^2`` is ``2^(3^2)`` and ``E^-0.5`` is allowed.
Names are the property symbols of :mod:`selector.inputs.properties`; the functions are
``min``, ``max`` and ``sqrt``. The text is read by our own tokenizer and
recursive-descent parser; nothing is ever handed to Python's evaluator.

Values are used in whatever units the caller passes (normally SI base units).
"""

from __future__ import annotations

import math
import re
from collections.abc import Callable, Iterator, Mapping, Sequence
from contextlib import contextmanager
from dataclasses import dataclass, field
from functools import reduce

import numpy as np

from selector.errors import ExpressionError
from selector.inputs.properties import PROPERTIES
from selector.suggest import did_you_mean

__all__ = [
    "FUNCTIONS",
    "MAX_DEPTH",
    "MAX_EXPONENT",
    "MAX_LENGTH",
    "Binary",
    "Call",
    "Expression",
    "Negate",
    "Node",
    "Number",
    "Symbol",
    "parse",
]

MAX_LENGTH = 500
"""Longest expression accepted, in characters."""

MAX_DEPTH = 50
"""Deepest nesting of parentheses, function calls, signs and exponents."""

MAX_EXPONENT = 10.0
"""Largest magnitude of a constant exponent."""


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


# --------------------------------------------------------------------------- tokenizer


@dataclass(frozen=True)
class _Token:
    kind: str  # "number", "name", "op", "(", ")", ",", "end"
    text: str
    pos: int


_TOKEN = re.compile(
    r"(?P<space>\s+)"
    r"|(?P<number>(?:[0-9]+\.?[0-9]*|\.[0-9]+)(?:[eE][+-]?[0-9]+)?)"
    r"|(?P<name>[A-Za-z_][A-Za-z0-9_]*)"
    r"|(?P<op>\*\*|[-+*/^])"
    r"|(?P<punct>[(),])"
)

_OPERAND = "expected a number, a property symbol or '('"


def _tokenize(text: str) -> list[_Token]:
    """Split ``text`` into tokens, ending with an ``end`` token."""
    tokens: list[_Token] = []
    pos = 0
    while pos < len(text):
        match = _TOKEN.match(text, pos)
        if match is None:
            raise ExpressionError(
                text,
                pos,
                f"unexpected character {text[pos]!r}; expected a number, a property symbol, "
                "an operator (+ - * / ^), a comma or a parenthesis",
            )
        kind = match.lastgroup or ""
        if kind != "space":
            word = match.group()
            tokens.append(_Token(word if kind == "punct" else kind, word, pos))
        pos = match.end()
    tokens.append(_Token("end", "", len(text)))
    return tokens


# --------------------------------------------------------------------------- parser


class _Parser:
    """Recursive-descent parser over a token list; one instance per parse."""

    def __init__(self, text: str, tokens: list[_Token]) -> None:
        self.text = text
        self.tokens = tokens
        self.index = 0
        self.depth = 0

    def error(self, pos: int, what: str) -> ExpressionError:
        return ExpressionError(self.text, pos, what)

    def peek(self) -> _Token:
        return self.tokens[self.index]

    def advance(self) -> _Token:
        token = self.tokens[self.index]
        self.index = min(self.index + 1, len(self.tokens) - 1)
        return token

    def at_op(self, *ops: str) -> bool:
        token = self.peek()
        return token.kind == "op" and token.text in ops

    @contextmanager
    def nested(self, token: _Token) -> Iterator[None]:
        self.depth += 1
        if self.depth > MAX_DEPTH:
            raise self.error(
                token.pos, f"expression is nested more than {MAX_DEPTH} deep; expected a simpler formula"
            )
        try:
            yield
        finally:
            self.depth -= 1

    def parse(self) -> Node:
        node = self.sum()
        token = self.peek()
        if token.kind != "end":
            raise self.after_operand(token)
        return node

    def sum(self) -> Node:
        node = self.product()
        while self.at_op("+", "-"):
            op = self.advance()
            node = Binary(op.text, node, self.product(), op.pos)
        return node

    def product(self) -> Node:
        node = self.unary()
        while self.at_op("*", "/"):
            op = self.advance()
            node = Binary(op.text, node, self.unary(), op.pos)
        return node

    def unary(self) -> Node:
        if not self.at_op("+", "-"):
            return self.power()
        sign = self.advance()
        with self.nested(sign):
            operand = self.unary()
        return Negate(operand, sign.pos) if sign.text == "-" else operand

    def power(self) -> Node:
        base = self.atom()
        if not self.at_op("^", "**"):
            return base
        op = self.advance()
        start = self.peek().pos
        with self.nested(op):
            exponent = self.unary()
        self.check_exponent(exponent, start)
        return Binary("^", base, exponent, op.pos)

    def atom(self) -> Node:
        token = self.advance()
        if token.kind == "number":
            return self.number(token)
        if token.kind == "name":
            return self.call(token) if self.peek().kind == "(" else self.symbol(token)
        if token.kind == "(":
            with self.nested(token):
                node = self.sum()
            self.close(token)
            return node
        raise self.missing_operand(token)

    def number(self, token: _Token) -> Number:
        value = float(token.text)
        if not math.isfinite(value):
            raise self.error(token.pos, f"number {token.text} is out of range; expected a finite number")
        return Number(value, token.pos)

    def symbol(self, token: _Token) -> Symbol:
        name = token.text
        if name in PROPERTIES:
            return Symbol(name, token.pos)
        if name in FUNCTIONS:
            usage = FUNCTIONS[name].usage
            raise self.error(token.pos, f"function {name!r} is used without parentheses; expected {usage}")
        raise self.error(token.pos, f"unknown property {name!r}; {did_you_mean(name, PROPERTIES)}")

    def call(self, token: _Token) -> Call:
        name = token.text
        if name not in FUNCTIONS:
            if name in PROPERTIES:
                what = f"{name!r} is a property, not a function; write {name}*(...) to multiply"
            else:
                what = f"unknown function {name!r}; {did_you_mean(name, FUNCTIONS)}"
            raise self.error(token.pos, what)
        opening = self.advance()
        args: list[Node] = []
        with self.nested(opening):
            if self.peek().kind != ")":
                args.append(self.sum())
                while self.peek().kind == ",":
                    self.advance()
                    args.append(self.sum())
        self.close(opening)
        self.check_arity(token, len(args))
        return Call(name, tuple(args), token.pos)

    def close(self, opening: _Token) -> None:
        token = self.peek()
        if token.kind == ")":
            self.advance()
        elif token.kind == "end":
            raise self.error(opening.pos, "'(' is never closed; expected a matching ')'")
        else:
            raise self.after_operand(token)

    def check_arity(self, token: _Token, count: int) -> None:
        spec = FUNCTIONS[token.text]
        if spec.max_args == spec.min_args and count != spec.min_args:
            n = spec.min_args
            plural = "argument" if n == 1 else "arguments"
            raise self.error(
                token.pos, f"{token.text}() takes exactly {n} {plural}, got {count}; expected {spec.usage}"
            )
        if count < spec.min_args:
            n = spec.min_args
            raise self.error(
                token.pos, f"{token.text}() takes at least {n} arguments, got {count}; expected {spec.usage}"
            )

    def check_exponent(self, exponent: Node, pos: int) -> None:
        if _symbols(exponent):
            return
        value = _constant(exponent)
        if not math.isfinite(value):
            raise self.error(pos, "exponent is not a finite number; expected a constant such as 0.5 or 1/3")
        if abs(value) > MAX_EXPONENT:
            raise self.error(
                pos, f"exponent {value:g} is too large; expected a magnitude of at most {MAX_EXPONENT:g}"
            )

    def missing_operand(self, token: _Token) -> ExpressionError:
        """The error for ``token`` found where a number, symbol or '(' should be."""
        if token.kind == "end":
            before = self.tokens[self.index - 1] if self.index > 0 else token
            if before.kind == "op":
                return self.error(before.pos, f"trailing operator {before.text!r}; {_OPERAND} after it")
            return self.error(before.pos, f"expression ends after {before.text!r}; {_OPERAND}")
        if token.kind == "op":
            return self.error(token.pos, f"unexpected operator {token.text!r}; {_OPERAND}")
        return self.error(token.pos, f"unexpected {token.text!r}; {_OPERAND}")

    def after_operand(self, token: _Token) -> ExpressionError:
        """The error for ``token`` found right after a complete operand."""
        if token.kind == ")":
            return self.error(token.pos, "')' has no matching '('; expected an operator or the end")
        if token.kind == ",":
            return self.error(
                token.pos, "',' outside a function call; commas only separate function arguments"
            )
        return self.error(
            token.pos, f"missing operator before {token.text!r}; expected one of + - * / ^ between terms"
        )


def parse(text: str) -> Expression:
    """Parse a merit-index formula such as ``"E^0.5/rho"``.

    Raises:
        ExpressionError: the text is empty, too long, too deep or not a valid formula;
            the error's ``position`` is the 0-based column of the offending token.
    """
    if not isinstance(text, str):
        raise ExpressionError(repr(text), 0, f"expected the formula as text, got {type(text).__name__}")
    if len(text) > MAX_LENGTH:
        shown = text[:MAX_LENGTH] + "…"
        raise ExpressionError(
            shown, MAX_LENGTH, f"expression is {len(text)} characters long; expected at most {MAX_LENGTH}"
        )
    if not text.strip():
        raise ExpressionError(text, 0, "empty expression; expected a formula such as E^0.5/rho")
    root = _Parser(text, _tokenize(text)).parse()
    return Expression(text, root)


# --------------------------------------------------------------------------- the expression


@dataclass(frozen=True)
class Expression:
    """A parsed formula.

    Attributes:
        text: the text as the user typed it.
        root: the syntax tree.
    """

    text: str
    root: Node

    @property
    def symbols(self) -> frozenset[str]:
        """The property symbols the formula uses."""
        return _symbols(self.root)

    def evaluate(self, values: Mapping[str, np.ndarray | float]) -> np.ndarray:
        """Evaluate over arrays of property values (any mapping, e.g. a DataFrame).

        Division by zero gives ±inf and undefined results (``0/0``, ``sqrt`` of a
        negative number) give nan, silently. A formula with no symbols gives a 0-d
        array.

        Raises:
            ExpressionError: ``values`` lacks a symbol the formula uses.
        """
        arrays = {name: self._lookup(values, name) for name in self.symbols}
        with np.errstate(all="ignore"):
            return np.asarray(_evaluate(self.root, arrays), dtype=float)

    def interval(
        self, low: Mapping[str, np.ndarray | float], high: Mapping[str, np.ndarray | float]
    ) -> Interval:
        """The range of the formula as each symbol varies within ``[low, high]``.

        Interval arithmetic, vectorised: the bounds contain every value the formula
        takes inside the box. For a monomial the low end takes each property at its
        unfavourable end. Division by a range containing 0 gives ``(-inf, inf)``; a
        fractional power or ``sqrt`` of a range reaching below 0 gives nan.

        Raises:
            ExpressionError: ``low`` or ``high`` lacks a symbol the formula uses.
        """
        bounds = {}
        for name in self.symbols:
            lo, hi = self._lookup(low, name), self._lookup(high, name)
            bounds[name] = (np.minimum(lo, hi), np.maximum(lo, hi))
        with np.errstate(all="ignore"):
            lo, hi = _interval(self.root, bounds)
        return np.asarray(lo, dtype=float), np.asarray(hi, dtype=float)

    def monomial(self) -> tuple[float, dict[str, float]] | None:
        """``(c, {symbol: power})`` if the formula is ``c · Π symbol^power``, else None.

        Constant parts (``2/3``, ``sqrt(2)``) are folded. Sums or ``min``/``max``
        of symbols, or powers whose exponent contains a symbol, give None.
        """
        with np.errstate(all="ignore"):
            return _monomial(self.root)

    def latex(self) -> str:
        """The formula in LaTeX math notation (without surrounding ``$``)."""
        return _latex(self.root)[0]

    def __str__(self) -> str:
        return _format(self.root, 0)

    def _lookup(self, values: Mapping[str, np.ndarray | float], name: str) -> np.ndarray:
        pos = _first_position(self.root, name)
        try:
            raw = values[name]
        except KeyError:
            raise ExpressionError(self.text, pos, f"no values given for property {name!r}") from None
        try:
            return np.asarray(raw, dtype=float)
        except (TypeError, ValueError):
            raise ExpressionError(self.text, pos, f"values for property {name!r} are not numbers") from None


# --------------------------------------------------------------------------- tree walks


def _children(node: Node) -> Sequence[Node]:
    match node:
        case Negate(operand):
            return (operand,)
        case Binary(_, left, right):
            return (left, right)
        case Call(_, args):
            return args
    return ()


def _symbols(node: Node) -> frozenset[str]:
    if isinstance(node, Symbol):
        return frozenset((node.name,))
    return frozenset().union(*(_symbols(child) for child in _children(node)))


def _first_position(node: Node, name: str) -> int:
    if isinstance(node, Symbol) and node.name == name:
        return node.pos
    for child in _children(node):
        pos = _first_position(child, name)
        if pos >= 0:
            return pos
    return -1


def _constant(node: Node) -> float:
    """The value of a symbol-free subtree."""
    with np.errstate(all="ignore"):
        return float(_evaluate(node, {}))


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


def _evaluate(node: Node, arrays: Mapping[str, np.ndarray]) -> np.ndarray:
    match node:
        case Number(value):
            return np.asarray(value, dtype=float)
        case Symbol(name):
            return arrays[name]
        case Negate(operand):
            return np.negative(_evaluate(operand, arrays))
        case Binary(op, left, right):
            return _BINARY[op](_evaluate(left, arrays), _evaluate(right, arrays))
        case Call(name, args):
            return _CALLS[name](*(_evaluate(arg, arrays) for arg in args))
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


def _interval(node: Node, bounds: Mapping[str, Interval]) -> Interval:
    match node:
        case Number(value):
            return np.asarray(value, dtype=float), np.asarray(value, dtype=float)
        case Symbol(name):
            return bounds[name]
        case Negate(operand):
            lo, hi = _interval(operand, bounds)
            return -hi, -lo
        case Binary("+", left, right):
            (alo, ahi), (blo, bhi) = _interval(left, bounds), _interval(right, bounds)
            return alo + blo, ahi + bhi
        case Binary("-", left, right):
            (alo, ahi), (blo, bhi) = _interval(left, bounds), _interval(right, bounds)
            return alo - bhi, ahi - blo
        case Binary("*", left, right):
            (alo, ahi), (blo, bhi) = _interval(left, bounds), _interval(right, bounds)
            return _hull(_mul(alo, blo), _mul(alo, bhi), _mul(ahi, blo), _mul(ahi, bhi))
        case Binary("/", left, right):
            return _divide(_interval(left, bounds), _interval(right, bounds))
        case Binary("^", left, right):
            constant = None if _symbols(right) else _constant(right)
            return _power(_interval(left, bounds), _interval(right, bounds), constant)
        case Call("sqrt", (arg,)):
            lo, hi = _interval(arg, bounds)
            valid = lo >= 0
            return np.where(valid, np.sqrt(lo), np.nan), np.where(valid, np.sqrt(hi), np.nan)
        case Call("min" | "max" as name, args):
            parts = [_interval(arg, bounds) for arg in args]
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


def _monomial(node: Node) -> _Monomial | None:
    if not _symbols(node):
        return _monomial_result(_constant(node), {})
    match node:
        case Symbol(name):
            return 1.0, {name: 1.0}
        case Negate(operand):
            inner = _monomial(operand)
            return None if inner is None else (-inner[0], inner[1])
        case Binary("*" | "/" as op, left, right):
            a, b = _monomial(left), _monomial(right)
            if a is None or b is None:
                return None
            return _combine(a, b, 1.0 if op == "*" else -1.0)
        case Binary("^", left, right):
            base = _monomial(left)
            if base is None or _symbols(right):
                return None
            return _raise(base, _constant(right))
        case Call("sqrt", (arg,)):
            base = _monomial(arg)
            return None if base is None else _raise(base, 0.5)
    return None


# --------------------------------------------------------------------------- printing

_ADD, _MUL, _NEG, _POW, _ATOM = 1, 2, 3, 4, 5
_LEFT_PREC = {"+": _ADD, "-": _ADD, "*": _MUL, "/": _MUL}


def _number_text(value: float) -> str:
    if value.is_integer() and abs(value) < 1e16:
        return str(int(value))
    return repr(value)


def _prec(node: Node) -> int:
    match node:
        case Negate():
            return _NEG
        case Binary(op):
            return _LEFT_PREC.get(op, _POW)
    return _ATOM


def _format(node: Node, min_prec: int) -> str:
    match node:
        case Number(value):
            text = _number_text(value)
        case Symbol(name):
            text = name
        case Negate(operand):
            text = "-" + _format(operand, _NEG)
        case Binary("^", left, right):
            text = f"{_format(left, _ATOM)}^{_format(right, _NEG)}"
        case Binary(op, left, right):
            prec = _LEFT_PREC[op]
            sep = f" {op} " if prec == _ADD else op
            text = f"{_format(left, prec)}{sep}{_format(right, prec + 1)}"
        case Call(name, args):
            text = f"{name}({', '.join(_format(arg, 0) for arg in args)})"
        case _:
            raise TypeError(f"not an expression node: {node!r}")
    return f"({text})" if _prec(node) < min_prec else text


_GREEK = {"rho", "nu", "sigma", "lambda", "alpha"}
_LATEX_NAMES = {"co2": "\\mathrm{CO_2}"}


def _latex_symbol(name: str) -> str:
    if name in _LATEX_NAMES:
        return _LATEX_NAMES[name]
    stem, _, sub = name.partition("_")
    if stem in _GREEK:
        head = "\\" + stem
    elif len(stem) == 1:
        head = stem
    else:
        head = f"\\mathrm{{{stem}}}"
    return f"{head}_{{\\mathrm{{{sub}}}}}" if sub else head


def _latex_number(value: float) -> tuple[str, int]:
    text = _number_text(value)
    if "e" not in text:
        return text, _ATOM
    mantissa, _, exponent = text.partition("e")
    return f"{mantissa} \\times 10^{{{int(exponent)}}}", _MUL


def _paren(text: str, prec: int, min_prec: int) -> str:
    return f"\\left({text}\\right)" if prec < min_prec else text


def _latex(node: Node) -> tuple[str, int]:
    """LaTeX text of ``node`` and the precedence it binds with."""
    match node:
        case Number(value):
            return _latex_number(value)
        case Symbol(name):
            return _latex_symbol(name), _ATOM
        case Negate(operand):
            text, prec = _latex(operand)
            return "-" + _paren(text, prec, _NEG), _NEG
        case Binary("/", left, right):
            return f"\\frac{{{_latex(left)[0]}}}{{{_latex(right)[0]}}}", _POW
        case Binary("^", left, right):
            text, prec = _latex(left)
            return f"{_paren(text, prec, _ATOM)}^{{{_latex(right)[0]}}}", _POW
        case Binary(op, left, right):
            prec = _LEFT_PREC[op]
            (ltext, lprec), (rtext, rprec) = _latex(left), _latex(right)
            sep = f" {op} " if prec == _ADD else " \\cdot "
            return f"{_paren(ltext, lprec, prec)}{sep}{_paren(rtext, rprec, prec + 1)}", prec
        case Call("sqrt", (arg,)):
            return f"\\sqrt{{{_latex(arg)[0]}}}", _ATOM
        case Call(name, args):
            inner = ", ".join(_latex(arg)[0] for arg in args)
            return f"\\{name}\\left({inner}\\right)", _ATOM
    raise TypeError(f"not an expression node: {node!r}")

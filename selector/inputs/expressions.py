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
from collections.abc import Iterator, Mapping
from contextlib import contextmanager
from dataclasses import dataclass

import numpy as np

from selector.errors import ExpressionError
from selector.inputs.expression_text import latex_of, text_of
from selector.inputs.expression_tree import (
    FUNCTIONS,
    Binary,
    Call,
    Interval,
    Negate,
    Node,
    Number,
    Symbol,
    first_position,
    symbols_of,
)
from selector.inputs.expression_values import constant_value, evaluate_node, interval_of, monomial_of
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
        if symbols_of(exponent):
            return
        value = constant_value(exponent)
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
        return symbols_of(self.root)

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
            return np.asarray(evaluate_node(self.root, arrays), dtype=float)

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
            lo, hi = interval_of(self.root, bounds)
        return np.asarray(lo, dtype=float), np.asarray(hi, dtype=float)

    def monomial(self) -> tuple[float, dict[str, float]] | None:
        """``(c, {symbol: power})`` if the formula is ``c · Π symbol^power``, else None.

        Constant parts (``2/3``, ``sqrt(2)``) are folded. Sums or ``min``/``max``
        of symbols, or powers whose exponent contains a symbol, give None.
        """
        with np.errstate(all="ignore"):
            return monomial_of(self.root)

    def latex(self) -> str:
        """The formula in LaTeX math notation (without surrounding ``$``)."""
        return latex_of(self.root)[0]

    def __str__(self) -> str:
        return text_of(self.root, 0)

    def _lookup(self, values: Mapping[str, np.ndarray | float], name: str) -> np.ndarray:
        pos = first_position(self.root, name)
        try:
            raw = values[name]
        except KeyError:
            raise ExpressionError(self.text, pos, f"no values given for property {name!r}") from None
        try:
            return np.asarray(raw, dtype=float)
        except (TypeError, ValueError):
            raise ExpressionError(self.text, pos, f"values for property {name!r} are not numbers") from None

"""A formula's syntax tree written out: plain text that parses back, and LaTeX."""

from __future__ import annotations

from selector.inputs.expression_tree import Binary, Call, Negate, Node, Number, Symbol

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


def text_of(node: Node, min_prec: int = 0) -> str:
    """Plain text of ``node`` that parses back to it, in parentheses if it binds looser than ``min_prec``."""
    match node:
        case Number(value):
            text = _number_text(value)
        case Symbol(name):
            text = name
        case Negate(operand):
            text = "-" + text_of(operand, _NEG)
        case Binary("^", left, right):
            text = f"{text_of(left, _ATOM)}^{text_of(right, _NEG)}"
        case Binary(op, left, right):
            prec = _LEFT_PREC[op]
            sep = f" {op} " if prec == _ADD else op
            text = f"{text_of(left, prec)}{sep}{text_of(right, prec + 1)}"
        case Call(name, args):
            text = f"{name}({', '.join(text_of(arg, 0) for arg in args)})"
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


def latex_of(node: Node) -> tuple[str, int]:
    """LaTeX text of ``node`` and the precedence it binds with."""
    match node:
        case Number(value):
            return _latex_number(value)
        case Symbol(name):
            return _latex_symbol(name), _ATOM
        case Negate(operand):
            text, prec = latex_of(operand)
            return "-" + _paren(text, prec, _NEG), _NEG
        case Binary("/", left, right):
            return f"\\frac{{{latex_of(left)[0]}}}{{{latex_of(right)[0]}}}", _POW
        case Binary("^", left, right):
            text, prec = latex_of(left)
            return f"{_paren(text, prec, _ATOM)}^{{{latex_of(right)[0]}}}", _POW
        case Binary(op, left, right):
            prec = _LEFT_PREC[op]
            (ltext, lprec), (rtext, rprec) = latex_of(left), latex_of(right)
            sep = f" {op} " if prec == _ADD else " \\cdot "
            return f"{_paren(ltext, lprec, prec)}{sep}{_paren(rtext, rprec, prec + 1)}", prec
        case Call("sqrt", (arg,)):
            return f"\\sqrt{{{latex_of(arg)[0]}}}", _ATOM
        case Call(name, args):
            inner = ", ".join(latex_of(arg)[0] for arg in args)
            return f"\\{name}\\left({inner}\\right)", _ATOM
    raise TypeError(f"not an expression node: {node!r}")

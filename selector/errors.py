"""One family of exceptions for problems in user input.

Every concrete error also inherits the matching builtin, carries the fields that
locate the problem and builds its own one-line message from them. The library
raises; only the CLI prints and exits (status 2).
"""

from __future__ import annotations

from dataclasses import dataclass


class SelectorError(Exception):
    """Base of every error caused by user input (files, specs, options)."""

    exit_code = 2


@dataclass(frozen=True)
class Problem:
    """One thing wrong with an input, located as exactly as we know it."""

    where: str
    what: str
    expected: str = ""

    def __str__(self) -> str:
        text = f"{self.where}: {self.what}" if self.where else self.what
        return f"{text}; {self.expected}" if self.expected else text


class InputError(SelectorError, ValueError):
    """A value in a file, spec or option is wrong.

    Args:
        where: location, e.g. ``"spec.toml: constraint[0].max_deflection"``.
        what: what was wrong, including the offending value.
        expected: what would have been accepted.
    """

    def __init__(self, where: str, what: str, expected: str = "") -> None:
        self.problem = Problem(where, what, expected)
        self.where, self.what, self.expected = where, what, expected
        super().__init__(str(self.problem))


class DataFileError(SelectorError, ValueError):
    """A materials data file has one or more problems; all are listed."""

    def __init__(self, problems: list[Problem]) -> None:
        self.problems = list(problems)
        first = str(self.problems[0]) if self.problems else "no problems"
        more = len(self.problems) - 1
        super().__init__(first if more == 0 else f"{first} (and {more} more problems)")


class UnitError(InputError):
    """A quantity has no unit, an unknown unit or the wrong dimension."""


class ExpressionError(InputError):
    """An index expression cannot be parsed or evaluated.

    The message shows the expression with a caret under the bad token.
    """

    def __init__(self, text: str, position: int, what: str, where: str = "expression") -> None:
        self.text, self.position = text, position
        caret = " " * position + "^"
        super().__init__(f"{where}, column {position + 1}", f"{what}\n  {text}\n  {caret}")


class OutputError(SelectorError, OSError):
    """An output file cannot be written where asked."""

    def __init__(self, path: str, what: str) -> None:
        self.path = path
        super().__init__(f"{path}: {what}")

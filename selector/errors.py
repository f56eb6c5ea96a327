"""One family of exceptions for problems in user input.

Every concrete error also inherits the matching builtin, carries the fields that
locate the problem and builds its own one-line message from them. The library
raises; only the CLI prints and exits (status 2).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

Location = tuple[str | int, ...]
"""Where a problem sits in a nested input, as keys, e.g. ``("constraint", 0, "max_deflection")``."""


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
        location: the same place as keys, for programs (``()`` when not inside a spec).
    """

    def __init__(self, where: str, what: str, expected: str = "", location: Location = ()) -> None:
        self.problem = Problem(where, what, expected)
        self.where, self.what, self.expected = where, what, expected
        self.location = tuple(location)
        super().__init__(str(self.problem))


class SpecError(InputError):
    """A spec has one or more problems; every one is kept in ``errors`` and listed, one per line.

    ``where``, ``what``, ``expected`` and ``location`` are those of the first problem.
    """

    def __init__(self, errors: Sequence[InputError]) -> None:
        if not errors:
            raise ValueError("SpecError needs at least one problem")
        self.errors = tuple(errors)
        first = self.errors[0]
        super().__init__(first.where, first.what, first.expected, first.location)
        self.args = ("\n".join(str(e) for e in self.errors),)

    def __str__(self) -> str:
        return str(self.args[0])


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

"""Fixtures shared by the output tests: writes that break part-way."""

from __future__ import annotations

import os
from collections.abc import Callable

import pytest


class BreakingFile:
    """An open file that writes the first ``keep(data)`` characters of a write, then raises ``error``."""

    def __init__(self, handle, keep: Callable[[object], int], error: BaseException) -> None:
        self.handle, self.keep, self.error = handle, keep, error

    def __enter__(self) -> BreakingFile:
        return self

    def __exit__(self, *exc: object) -> bool:
        self.handle.close()
        return False

    def write(self, data) -> None:
        self.handle.write(data[: self.keep(data)])
        raise self.error


@pytest.fixture
def break_writes(monkeypatch) -> Callable[..., None]:
    """Install files whose writes break: ``break_writes(error, keep=...)``.

    Every file opened through ``os.fdopen`` (as the atomic writers do) then writes part of the
    data (half of it by default) and raises ``error``: an interrupted write or a full disk.
    """
    real_fdopen = os.fdopen

    def install(error: BaseException, keep: Callable[[object], int] = lambda data: len(data) // 2) -> None:
        monkeypatch.setattr(os, "fdopen", lambda fd, mode: BreakingFile(real_fdopen(fd, mode), keep, error))

    return install

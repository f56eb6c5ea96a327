"""Writing files safely: outputs never replace an input, and every write is atomic."""

from __future__ import annotations

import os
import sys
import tempfile
from collections.abc import Sequence
from pathlib import Path

from selector.errors import OutputError


def check_output(output: str | Path | None, protect: Sequence[str | Path]) -> None:
    """Refuse an output path that is one of the inputs."""
    if not output:
        return
    target = Path(output).resolve()
    for path in protect:
        if Path(path).resolve() == target:
            raise OutputError(str(output), "refusing to write over an input file; choose another name")


def write_bytes_atomic(path: Path, data: bytes) -> None:
    """Write ``data`` to ``path`` via a temporary file in the same folder, then rename.

    An interrupted write leaves any previous file intact.
    """
    path = Path(path)
    folder = path.parent if str(path.parent) else Path(".")
    if not folder.is_dir():
        raise OutputError(str(path), f"folder {str(folder)!r} does not exist")
    try:
        fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=folder)
    except OSError as exc:
        raise OutputError(str(path), f"cannot write in {str(folder)!r} ({exc.strerror})") from None
    try:
        with os.fdopen(fd, "wb") as handle:
            handle.write(data)
        os.replace(tmp, path)
    except OSError as exc:
        Path(tmp).unlink(missing_ok=True)
        raise OutputError(str(path), f"cannot be written ({exc.strerror})") from None
    except BaseException:
        Path(tmp).unlink(missing_ok=True)
        raise


def write_text_atomic(path: Path, text: str) -> None:
    """Write UTF-8 text atomically."""
    write_bytes_atomic(path, text.encode("utf-8"))


def ensure_folder(path: str | Path) -> Path:
    """The output path, checked before any work: its folder must exist and be a folder."""
    target = Path(path)
    folder = target.parent if str(target.parent) else Path(".")
    if not folder.is_dir():
        raise OutputError(str(path), f"folder {str(folder)!r} does not exist")
    if target.is_dir():
        raise OutputError(str(path), "is a folder; give a file name")
    return target


def silence_stdout() -> None:
    """Point stdout at the null device, so a stdout that failed once is not flushed again at exit."""
    try:
        null = os.open(os.devnull, os.O_WRONLY)
        os.dup2(null, sys.stdout.fileno())
        os.close(null)
    except (OSError, ValueError, AttributeError):  # no real file behind stdout (e.g. under a test runner)
        pass

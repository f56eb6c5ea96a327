"""Writing files safely: outputs never replace an input; every write is atomic and keeps modes."""

from __future__ import annotations

import os
import stat
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


def _umask() -> int:
    """The process umask, read without changing it where the system allows (Linux)."""
    try:
        for line in Path("/proc/self/status").read_text().splitlines():
            if line.startswith("Umask:"):
                return int(line.split()[1], 8)
    except (OSError, ValueError, IndexError):
        pass
    mask = os.umask(0o022)  # elsewhere: read it by setting it, and put it back at once
    os.umask(mask)
    return mask


def _mode_for(target: Path) -> int:
    """The mode a write gives ``target``: the existing file's mode, or what the umask allows.

    Raises:
        OutputError: the existing file is read-only.
    """
    try:
        info = target.stat()
    except FileNotFoundError:
        return 0o666 & ~_umask()
    except OSError as exc:
        raise OutputError(str(target), f"cannot be checked ({exc.strerror})") from None
    if not stat.S_ISREG(info.st_mode):
        raise OutputError(str(target), "is not a regular file; give the name of a file")
    if not info.st_mode & 0o222 or not os.access(target, os.W_OK):
        raise OutputError(str(target), "is read-only; make it writable first or choose another name")
    return stat.S_IMODE(info.st_mode)


def write_bytes_atomic(path: Path, data: bytes) -> None:
    """Write ``data`` to ``path`` via a temporary file in the same folder, then rename.

    A new file gets the mode the umask gives; a file written over keeps its mode; a
    read-only file is refused. Through a symlink the link's target is written (the link
    stays). An interrupted or failed write (a full disk) leaves any previous file whole.
    """
    path = Path(path)
    target = Path(os.path.realpath(path)) if path.is_symlink() else path
    folder = target.parent if str(target.parent) else Path(".")
    if not folder.is_dir():
        raise OutputError(str(path), f"folder {str(folder)!r} does not exist")
    mode = _mode_for(target)
    try:
        fd, tmp = tempfile.mkstemp(prefix=f".{target.name}.", suffix=".tmp", dir=folder)
    except OSError as exc:
        raise OutputError(str(path), f"cannot write in {str(folder)!r} ({exc.strerror})") from None
    try:
        os.fchmod(fd, mode)
        with os.fdopen(fd, "wb") as handle:
            handle.write(data)
            handle.flush()
            os.fsync(handle.fileno())
        os.replace(tmp, target)
    except OSError as exc:
        Path(tmp).unlink(missing_ok=True)
        raise OutputError(
            str(path), f"cannot be written ({exc.strerror}); any previous file is unchanged"
        ) from None
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

"""Written files: umask modes, kept modes, read-only files refused, symlinks, full disks.

The expected modes follow POSIX open(2)/umask(2) semantics (a new file is 0666 less
the umask; common practice, no source for the choice of keeping an existing mode).
"""

from __future__ import annotations

import errno
import os
import stat
from pathlib import Path

import pytest

from selector.errors import OutputError
from selector.outputs import files

pytestmark = pytest.mark.skipif(os.name != "posix", reason="file modes and symlinks as POSIX defines them")


@pytest.fixture
def umask_027():
    old = os.umask(0o027)
    yield 0o027
    os.umask(old)


def _mode(path: Path) -> int:
    return stat.S_IMODE(path.stat().st_mode)


def test_new_file_gets_the_mode_the_umask_gives(tmp_path, umask_027) -> None:
    target = tmp_path / "new.csv"
    files.write_text_atomic(target, "a,b\n")
    assert _mode(target) == 0o640  # 0666 & ~0027
    assert target.read_text() == "a,b\n"


def test_new_file_under_another_umask(tmp_path) -> None:
    old = os.umask(0o002)
    try:
        files.write_text_atomic(tmp_path / "shared.csv", "x\n")
    finally:
        os.umask(old)
    assert _mode(tmp_path / "shared.csv") == 0o664


def test_overwritten_file_keeps_its_mode(tmp_path, umask_027) -> None:
    target = tmp_path / "kept.csv"
    target.write_text("old\n")
    target.chmod(0o604)
    files.write_text_atomic(target, "new\n")
    assert target.read_text() == "new\n"
    assert _mode(target) == 0o604


def test_read_only_file_is_refused_and_untouched(tmp_path) -> None:
    target = tmp_path / "locked.csv"
    target.write_text("precious\n")
    target.chmod(0o444)
    with pytest.raises(OutputError, match=r"locked\.csv: is read-only; make it writable first"):
        files.write_text_atomic(target, "new\n")
    assert target.read_text() == "precious\n"
    assert _mode(target) == 0o444
    assert [p.name for p in tmp_path.iterdir()] == ["locked.csv"]


def test_symlink_writes_its_target_atomically_with_the_mode_kept(tmp_path) -> None:
    real = tmp_path / "data" / "real.csv"
    real.parent.mkdir()
    real.write_text("old\n")
    real.chmod(0o640)
    link = tmp_path / "link.csv"
    link.symlink_to(real)
    files.write_text_atomic(link, "new\n")
    assert link.is_symlink() and link.resolve() == real.resolve()
    assert real.read_text() == "new\n"
    assert _mode(real) == 0o640
    assert sorted(p.name for p in real.parent.iterdir()) == ["real.csv"]


def test_symlink_to_a_read_only_file_is_refused(tmp_path) -> None:
    real = tmp_path / "real.csv"
    real.write_text("precious\n")
    real.chmod(0o444)
    link = tmp_path / "link.csv"
    link.symlink_to(real)
    with pytest.raises(OutputError, match="read-only"):
        files.write_text_atomic(link, "new\n")
    assert real.read_text() == "precious\n"


def test_full_disk_gives_a_clean_error_and_keeps_the_previous_file(
    tmp_path, monkeypatch, break_writes
) -> None:
    target = tmp_path / "report.html"
    target.write_text("the previous report\n")
    # the disk fills after the first few bytes
    break_writes(OSError(errno.ENOSPC, os.strerror(errno.ENOSPC)), keep=lambda data: 4)
    with pytest.raises(OutputError, match=r"No space left on device.*previous file is unchanged"):
        files.write_bytes_atomic(target, b"a much longer new report\n")
    monkeypatch.undo()
    assert target.read_text() == "the previous report\n"
    assert [p.name for p in tmp_path.iterdir()] == ["report.html"]


def test_output_over_a_read_only_file_through_the_cli(tmp_path) -> None:
    from click.testing import CliRunner

    from selector.cli import cli
    from selector.inputs.spec import EXAMPLES

    target = tmp_path / "shortlist.csv"
    target.write_text("kept\n")
    target.chmod(0o400)
    result = CliRunner().invoke(cli, ["rank", str(EXAMPLES / "camera-dolly-boom.toml"), "-o", str(target)])
    error = result.exception
    message = str(error) if isinstance(error, OutputError) else result.output
    assert "is read-only" in message
    assert target.read_text() == "kept\n"

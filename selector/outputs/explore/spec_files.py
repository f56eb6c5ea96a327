"""The spec as a file: the edited spec downloaded as TOML, a TOML spec read from an upload."""

from __future__ import annotations

import base64
import binascii
import tomllib
from typing import Any

from selector.errors import InputError
from selector.inputs.limits import MAX_TOML_BYTES, check_toml_text
from selector.outputs.explore.state import Start, start_with
from selector.outputs.spec_toml import spec_toml

SPEC_HEADING = (
    "Spec saved from the selector explorer; load it with `selector rank FILE` or `selector explore FILE`.",
    "Preliminary selection only: use certified design-allowable data for the chosen grade, appropriate",
    "safety factors, and defer to local codes and licensed engineering review.",
)


def spec_text(data: dict[str, Any], title: str) -> str:
    """The spec data as a TOML file, headed by where it came from and the caution."""
    return spec_toml(data, heading=(f"{title}", *SPEC_HEADING))


def _uploaded_text(contents: Any, filename: str) -> str:
    """The text of an upload (a ``data:...;base64,...`` address, as the page sends it)."""
    if not isinstance(contents, str) or not contents.startswith("data:") or "," not in contents:
        raise InputError(filename, "the upload arrived in a form that cannot be read", "a TOML spec file")
    head, _, body = contents.partition(",")
    if not head.endswith(";base64"):
        raise InputError(filename, "the upload is not base64-encoded", "a file chosen on the page")
    if len(body) > 4 * MAX_TOML_BYTES // 3 + 4:
        raise InputError(filename, "the file is too long for a spec", f"at most {MAX_TOML_BYTES} bytes")
    try:
        raw = base64.b64decode(body, validate=True)
    except (binascii.Error, ValueError):
        raise InputError(filename, "the upload is damaged", "a file chosen on the page") from None
    try:
        return raw.decode("utf-8")
    except UnicodeDecodeError:
        raise InputError(filename, "is not UTF-8 text", "a TOML spec file") from None


def start_from_upload(start: Start, contents: Any, filename: Any) -> Start:
    """A Start for an uploaded TOML spec, on the materials the explorer has loaded.

    Raises:
        InputError: the upload is not a readable TOML spec (with the field, for a bad spec).
    """
    name = filename if isinstance(filename, str) and filename.strip() else "uploaded spec"
    text = _uploaded_text(contents, name)
    check_toml_text(text, name)
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise InputError(name, f"is not valid TOML: {exc}", "TOML as in examples/") from None
    return start_with(start, data, name, text)

"""The explorer's view in the page address, so a view can be bookmarked and shared.

The address fragment (after ``#``, never sent to the server) holds the spec as edited,
compressed JSON in URL-safe base64, and the view beside it in plain words:
``#spec=eJy...&x=rho&y=E&line=class&class=balsa``. Reading one back checks it as
any input: a fragment that cannot be read gets a message, never a failure.
"""

from __future__ import annotations

import base64
import binascii
import json
import zlib
from collections.abc import Mapping
from typing import Any
from urllib.parse import parse_qsl, urlencode

from selector.errors import InputError
from selector.inputs.limits import MAX_TOML_BYTES

VIEW_KEYS = ("x", "y", "line", "value", "class")
"""The view's parts beside the spec: axes, index line mode and value, the chosen class."""
WHERE = "page address"


def encode(data: Mapping[str, Any], view: Mapping[str, str]) -> str:
    """The fragment (with its ``#``) for spec data and a view."""
    packed = zlib.compress(json.dumps(data, separators=(",", ":"), sort_keys=True).encode("utf-8"), 9)
    parts = [("spec", base64.urlsafe_b64encode(packed).decode("ascii").rstrip("="))]
    parts += [(k, str(view[k])) for k in VIEW_KEYS if view.get(k)]
    return "#" + urlencode(parts)


def _unpack(text: str) -> Any:
    try:
        packed = base64.urlsafe_b64decode(text + "=" * (-len(text) % 4))
        inflate = zlib.decompressobj()
        raw = inflate.decompress(packed, MAX_TOML_BYTES + 1)
        if len(raw) > MAX_TOML_BYTES or inflate.unconsumed_tail:
            raise InputError(WHERE, "the spec in it is too long", f"at most {MAX_TOML_BYTES} bytes")
        return json.loads(raw.decode("utf-8"))
    except (binascii.Error, ValueError, zlib.error, UnicodeDecodeError):
        raise InputError(
            WHERE,
            "the spec in it cannot be read (cut short or changed by hand?)",
            "an address the explorer wrote",
        ) from None


def decode(fragment: str) -> tuple[Any, dict[str, str]] | None:
    """(spec data, view) from a fragment, or None when it holds no view.

    Raises:
        InputError: the fragment names a spec that cannot be read.
    """
    if not isinstance(fragment, str):
        raise InputError(WHERE, f"{type(fragment).__name__} given", "text after '#'")
    text = fragment.removeprefix("#")
    if not text:
        return None
    parts = dict(parse_qsl(text, keep_blank_values=True))
    if "spec" not in parts:
        return None
    view = {k: parts[k] for k in VIEW_KEYS if k in parts}
    return _unpack(parts["spec"]), view

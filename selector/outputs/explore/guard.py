"""Refusing requests the explorer should not answer: foreign hosts, malformed callbacks, unknown paths.

The explorer listens on 127.0.0.1 only, but a page on another site can still reach
a loopback port by DNS rebinding, where its own domain name resolves to 127.0.0.1.
The browser then sends that domain in the ``Host`` header, so any request whose Host
is not the loopback name or address is refused (403), as the usual guidance against
DNS rebinding advises (from memory). Callback requests that do not have the shape
the page sends get 400; paths the explorer does not serve get 404.
"""

from __future__ import annotations

from typing import Any

LOOPBACK_NAMES = ("127.0.0.1", "localhost")
"""Host names a request to the explorer may carry."""
_PAGE_ROUTES = ("/_dash-layout", "/_dash-dependencies", "/_dash-update-component", "/_favicon.ico")
_SUITES = "/_dash-component-suites/"


def host_allowed(host: str | None, port: int | None = None) -> bool:
    """Whether a ``Host`` header names the loopback address (and, when known, the port served)."""
    if not host:
        return False
    name, sep, given_port = host.rpartition(":") if not host.startswith("[") else (host, "", "")
    if not sep:
        name, given_port = host, ""
    if name.lower() not in LOOPBACK_NAMES:
        return False
    return port is None or given_port in ("", str(port))


def _ids_and_props(items: Any) -> bool:
    """Whether ``items`` is a list of {id, property} (a list of them for a pattern-matching input)."""
    if not isinstance(items, list):
        return False
    for item in items:
        group = item if isinstance(item, list) else [item]
        for one in group:
            if not (isinstance(one, dict) and "id" in one and isinstance(one.get("property"), str)):
                return False
    return True


def callback_shape_problem(body: Any) -> str | None:
    """What is wrong with a callback request body, or None when it has the shape the page sends."""
    if not isinstance(body, dict):
        return "the body is not a JSON object"
    if not isinstance(body.get("output"), str):
        return "'output' is missing or not text"
    outputs = body.get("outputs")
    if not (isinstance(outputs, dict) or _ids_and_props(outputs)):
        return "'outputs' is not an {id, property} object or a list of them"
    if isinstance(outputs, dict) and not isinstance(outputs.get("property"), str):
        return "'outputs' has no property"
    for key in ("inputs", "state"):
        if key in body and not _ids_and_props(body[key]):
            return f"{key!r} is not a list of {{id, property}} objects"
    if "inputs" not in body:
        return "'inputs' is missing"
    changed = body.get("changedPropIds", [])
    if not (isinstance(changed, list) and all(isinstance(c, str) for c in changed)):
        return "'changedPropIds' is not a list of text"
    return None


def install(server: Any, port_of: Any = None) -> None:
    """Add the checks to the Flask ``server`` behind the Dash app.

    ``port_of`` is a callable giving the port served (None while unknown), so the Host
    check can also match the port once the server is bound.
    """
    from dash.exceptions import DependencyException
    from flask import request

    def check() -> Any:
        port = port_of() if port_of is not None else None
        if not host_allowed(request.host, port):
            return "forbidden: the explorer answers requests for 127.0.0.1 only\n", 403
        path = request.path
        if path != "/" and not path.startswith(_SUITES) and path not in _PAGE_ROUTES:
            return "not found\n", 404
        if path == "/_dash-update-component":
            problem = callback_shape_problem(request.get_json(silent=True))
            if problem is not None:
                return f"bad request: {problem}\n", 400
        return None

    server.before_request(check)
    server.register_error_handler(DependencyException, lambda _exc: ("not found\n", 404))

"""The explorer refuses what it should not answer, and holds under many sessions at once.

A foreign ``Host`` header is refused (the usual guidance against DNS rebinding: check
the Host of every request to a local server; from memory); malformed callback bodies
get 400 and malformed control values get the control's own message, never a 500;
unknown paths get 404; 50 simultaneous sessions on 127.0.0.1 all get the same answer.
"""

from __future__ import annotations

import json
import threading
import urllib.request
from collections.abc import Iterator
from typing import Any

import pytest

from selector.outputs.explore.guard import callback_shape_problem, host_allowed
from selector.outputs.explore.server import bind, make_app


@pytest.fixture(scope="module")
def app():
    return make_app()


@pytest.fixture(scope="module")
def client(app):
    return app.server.test_client()


def _values(component: Any, out: dict[str, Any]) -> dict[str, Any]:
    """id → value of every component in the layout that has both."""
    cid = getattr(component, "id", None)
    if isinstance(cid, str) and hasattr(component, "value"):
        out[cid] = component.value
    children = getattr(component, "children", None)
    for child in children if isinstance(children, list | tuple) else [children]:
        if child is not None and not isinstance(child, str | int | float):
            _values(child, out)
    return out


def _callback_body(app: Any, client: Any, output: str) -> dict[str, Any]:
    """A body for the callback whose output names ``output``, as the page sends it on load."""
    deps = client.get("/_dash-dependencies").get_json()
    dep = next(d for d in deps if output in d["output"])
    values = _values(app.layout, {})

    def item(i: dict[str, Any]) -> dict[str, Any]:
        return {"id": i["id"], "property": i["property"], "value": values.get(i["id"])}

    body: dict[str, Any] = {
        "output": dep["output"],
        "outputs": [
            {"id": p.split(".")[0], "property": p.split(".")[1].split("@")[0]}
            for p in dep["output"].strip(".").split("...")
        ],
        "inputs": [item(i) for i in dep["inputs"]],
    }
    if dep.get("state"):
        body["state"] = [item(i) for i in dep["state"]]
    return body | {"changedPropIds": []}


@pytest.fixture(scope="module")
def refresh_body(app, client):
    """A callback body for the main refresh."""
    return _callback_body(app, client, "chart.figure")


def _with(body: dict[str, Any], control: str, value: Any) -> dict[str, Any]:
    changed = json.loads(json.dumps(body))
    for item in changed["inputs"]:
        if item["id"] == control:
            item["value"] = value
    changed["changedPropIds"] = [f"{control}.value"]
    return changed


def _messages(reply: Any) -> dict[str, str]:
    response = reply.get_json()["response"]
    return {cid: props["children"] for cid, props in response.items() if cid.startswith("msg-")}


# ---------------------------------------------------------------------------- Host


@pytest.mark.parametrize(
    ("host", "port", "allowed"),
    [
        ("127.0.0.1:8050", 8050, True),
        ("localhost:8050", 8050, True),
        ("127.0.0.1", None, True),
        ("127.0.0.1:9999", 8050, False),
        ("evil.example:8050", 8050, False),
        ("127.0.0.1.evil.example", None, False),
        ("", None, False),
        ("[::1]:8050", 8050, False),
    ],
)
def test_host_check(host, port, allowed) -> None:
    assert host_allowed(host, port) is allowed


def test_foreign_host_is_refused_on_every_route(client) -> None:
    for path in ("/", "/_dash-layout", "/_dash-dependencies"):
        assert client.get(path, headers={"Host": "rebound.example:8050"}).status_code == 403
        assert client.get(path, headers={"Host": "127.0.0.1"}).status_code == 200
    reply = client.post("/_dash-update-component", json={}, headers={"Host": "rebound.example"})
    assert reply.status_code == 403


# ---------------------------------------------------------------------------- paths


@pytest.mark.parametrize(
    "path",
    [
        "/assets/nope.css",
        "/_dash-component-suites/dash/nope.js",
        "/_dash-component-suites/nopkg/x.js",
        "/_dash-component-suites/dash/deps/../../x.js",
        "/report.html",
        "/static/x",
    ],
)
def test_unknown_paths_get_404(client, path) -> None:
    assert client.get(path).status_code == 404


# ---------------------------------------------------------------------------- callbacks


@pytest.mark.parametrize(
    "body",
    [
        "not json",
        {},
        {"output": 5},
        {"output": "x", "outputs": 7, "inputs": []},
        {"output": "x", "outputs": [], "inputs": 5},
        {"output": "x", "outputs": [], "inputs": [{"id": "a"}]},
        {"output": "x", "outputs": [], "inputs": [], "state": "s"},
        {"output": "x", "outputs": [], "inputs": [], "changedPropIds": [1]},
        [1, 2, 3],
    ],
)
def test_malformed_callback_bodies_get_400(client, body) -> None:
    data = body if isinstance(body, str) else json.dumps(body)
    reply = client.post("/_dash-update-component", data=data, content_type="application/json")
    assert reply.status_code == 400
    assert callback_shape_problem(body if not isinstance(body, str) else None) is not None


def test_the_page_body_has_the_expected_shape(refresh_body) -> None:
    assert callback_shape_problem(refresh_body) is None


@pytest.mark.parametrize(
    ("control", "value", "message_key"),
    [
        ("safety-factor", [1, 2], "msg-safety_factor"),
        ("safety-factor", {"a": 1}, "msg-safety_factor"),
        ("stiffness-limit", 12, "msg-stiffness_limit"),
        ("objective", {"x": 1}, "msg-objective"),
        ("constraints", 5, "msg-constraints"),
        ("families", "metal", None),
        ("screen-T_max", ["60 degC"], "msg-screen_T_max"),
        ("x-axis", 3.5, "msg-x"),
        ("line-value", [1], None),
        ("part-force", [1, 2], "msg-part-force"),
        ("section-d", {"d": 1}, "msg-section-d"),
        ("rating-uv", 3, "msg-rating_uv"),
        ("screen-K_IC", True, "msg-screen_K_IC"),
        ("base", "not a spec", "msg-general"),
        ("base", {"name": "x", "spec": {"part": 5}}, "msg-general"),
    ],
)
def test_malformed_control_values_get_the_controls_message(client, refresh_body, control, value, message_key):
    reply = client.post("/_dash-update-component", json=_with(refresh_body, control, value))
    assert reply.status_code in (200, 204), reply.get_data(as_text=True)[:300]
    if message_key is not None:
        assert _messages(reply)[message_key], _messages(reply)


def test_good_body_refreshes(client, refresh_body) -> None:
    reply = client.post("/_dash-update-component", json=refresh_body)
    assert reply.status_code == 200
    assert not any(_messages(reply).values())


# ---------------------------------------------------------------------------- 50 sessions


@pytest.fixture
def served(app) -> Iterator[str]:
    server = bind(app, 0)
    thread = threading.Thread(target=server.serve_forever, daemon=True)
    thread.start()
    try:
        yield f"http://127.0.0.1:{server.port}"
    finally:
        server.shutdown()
        server.server_close()
        thread.join(timeout=60)


@pytest.mark.slow
def test_fifty_simultaneous_sessions_agree(served, refresh_body) -> None:
    bodies = [
        refresh_body,
        _with(refresh_body, "objective", "cost"),
        _with(refresh_body, "screen-T_max", "120 degC"),
    ]
    results: dict[int, tuple[int, str]] = {}
    errors: list[str] = []
    start = threading.Barrier(50, timeout=120)

    def session(i: int) -> None:
        data = json.dumps(bodies[i % len(bodies)]).encode()
        request = urllib.request.Request(
            f"{served}/_dash-update-component", data=data, headers={"Content-Type": "application/json"}
        )
        try:
            start.wait()
            with urllib.request.urlopen(request, timeout=300) as reply:
                answer = json.loads(reply.read())["response"]
                results[i] = (reply.status, json.dumps(answer["shortlist"], sort_keys=True))
        except Exception as exc:  # recorded and reported below, so one failure names itself
            errors.append(f"session {i}: {type(exc).__name__}: {exc}")

    threads = [threading.Thread(target=session, args=(i,), daemon=True) for i in range(50)]
    for t in threads:
        t.start()
    for t in threads:
        t.join(timeout=600)
    assert errors == []
    assert len(results) == 50 and {status for status, _ in results.values()} == {200}
    for k in range(len(bodies)):
        answers = {results[i][1] for i in range(k, 50, len(bodies))}
        assert len(answers) == 1, f"variant {k} got {len(answers)} different shortlists"
    assert len({results[k][1] for k in range(len(bodies))}) == len(bodies)  # the variants differ


@pytest.fixture(scope="module")
def reload_body(app, client):
    """A callback body for the upload / solid-sandwich / address callback."""
    return _callback_body(app, client, "msg-upload.children")


@pytest.mark.parametrize(
    ("control", "prop", "value", "said"),
    [
        ("upload", "contents", 5, "cannot be read"),
        ("upload", "contents", "data:text/plain;base64,!!", "damaged"),
        ("address", "hash", "#spec=%%%", "page address"),
        ("address", "hash", ["#spec="], "page address"),
    ],
)
def test_malformed_uploads_and_addresses_get_a_message(client, reload_body, control, prop, value, said):
    body = json.loads(json.dumps(reload_body))
    for entry in body["inputs"]:
        if entry["id"] == control:
            entry["value"] = value
    body["changedPropIds"] = [f"{control}.{prop}"]
    reply = client.post("/_dash-update-component", json=body)
    assert reply.status_code == 200, reply.get_data(as_text=True)[:300]
    assert said in _messages(reply)["msg-upload"]

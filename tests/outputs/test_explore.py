"""The explorer's callbacks called directly, and the app's layout, without a browser.

The explorer must show what the library computes: expected answers are built from the
example spec file read with tomllib and run through ``select`` directly, not through the
explorer's own code.
"""

from __future__ import annotations

import base64
import io
import json
import socket
import tomllib
from dataclasses import replace
from typing import Any

import pandas as pd
import pytest
from click.testing import CliRunner
from dash import html
from dash.development.base_component import Component

from selector.errors import InputError
from selector.inputs.properties import PROPERTIES, RATINGS
from selector.inputs.spec import DEMO_SPEC, EXAMPLES
from selector.outputs.explore import server as explore
from selector.outputs.explore.callbacks import download, pick_class, refresh
from selector.outputs.explore.fields import FIELDS
from selector.outputs.explore.server import bind, make_app, serve
from selector.outputs.explore.state import (
    MESSAGE_KEYS,
    SCREEN_ROWS,
    SLIDER_ROWS,
    Controls,
    initial_controls,
    load_start,
    spec_data,
    sync_screen,
)

SPEC = EXAMPLES / DEMO_SPEC


@pytest.fixture(scope="module")
def start():
    return load_start()


@pytest.fixture(scope="module")
def controls(start) -> Controls:
    return initial_controls(start)


def _expected(change=None, index: str | None = None):
    """The Selection of the example spec file with ``change(data)`` applied, from the library alone."""
    from selector.inputs.materials import load_materials
    from selector.inputs.spec import spec_from_dict
    from selector.pipeline.selection import select

    data = tomllib.loads(SPEC.read_text(encoding="utf-8"))
    if change is not None:
        change(data)
    return select(spec_from_dict(data), load_materials(), index=index)


def _walk(node: Any):
    if isinstance(node, list | tuple):
        for item in node:
            yield from _walk(item)
    elif isinstance(node, Component):
        yield node
        yield from _walk(getattr(node, "children", None))


def _text(node: Any) -> str:
    if isinstance(node, str | int | float):
        return str(node)
    if isinstance(node, list | tuple):
        return "".join(_text(n) for n in node)
    if isinstance(node, Component):
        return _text(getattr(node, "children", None))
    return ""


def _row_ids(view) -> list[str]:
    return [
        getattr(c, "data-id")
        for c in _walk(view.shortlist)
        if isinstance(c, html.Tr) and hasattr(c, "data-id")
    ]


def _screen(c: Controls, symbol: str) -> tuple[str, str]:
    return dict(zip((r.symbol for r in SCREEN_ROWS), c.screens, strict=True))[symbol]


# --------------------------------------------------------------------------- the app


def test_make_app_builds_the_layout_with_every_control():
    app = make_app(SPEC)
    ids = {c.id for c in _walk(app.layout) if isinstance(getattr(c, "id", None), str)}
    needed = {
        "chart",
        "shortlist",
        "summary",
        "derivation",
        "class",
        "class-panel",
        "objective",
        "constraints",
    }
    needed |= {"free", "index", "units", "families", "x-axis", "y-axis", "line-mode", "line-value"}
    needed |= {"get-csv", "get-xlsx", "get-report", "download"}
    needed |= {f"screen-{r.symbol}" for r in SCREEN_ROWS} | {f"slider-{r.symbol}" for r in SLIDER_ROWS}
    needed |= {f"msg-{key}" for key in MESSAGE_KEYS}
    needed |= {f.key for f in FIELDS} | {f"rating-{r}" for r in RATINGS}
    needed |= {"exclude", "allow-brittle", "construction", "faces", "cores", "upload", "get-spec"}
    assert needed <= ids, sorted(needed - ids)
    # Every property can be screened; the usual ones have sliders too.
    assert {r.symbol for r in SCREEN_ROWS} == set(PROPERTIES)
    assert {"T_max", "T_min", "price", "K_IC"} <= {r.symbol for r in SLIDER_ROWS}
    # Every callback's inputs and outputs exist on the page (pattern ids aside).
    client = app.server.test_client()
    assert client.get("/").status_code == 200
    for dep in client.get("/_dash-dependencies").get_json():
        for item in dep["inputs"] + dep["state"]:
            assert item["id"].startswith("{") or item["id"] in ids, item
    # The page asks for nothing outside this machine: Dash serves its scripts itself.
    page = client.get("/").get_data(as_text=True)
    assert "https://" not in page and "http://" not in page


def test_make_app_without_a_spec_starts_from_the_bundled_example():
    app = make_app()
    title = next(c for c in _walk(app.layout) if isinstance(c, html.H1))
    assert _text(title) == tomllib.loads(SPEC.read_text(encoding="utf-8"))["title"]


def test_make_app_reports_a_missing_spec_as_input_error(tmp_path):
    with pytest.raises(InputError, match="no such file"):
        make_app(tmp_path / "missing.toml")


def test_initial_controls_follow_the_spec_file(controls):
    written = tomllib.loads(SPEC.read_text(encoding="utf-8"))
    assert _screen(controls, "T_max") == (">=", written["screen"]["T_max"].removeprefix(">=").strip())
    assert _screen(controls, "price") == ("<=", written["screen"]["price"].removeprefix("<=").strip())
    assert _screen(controls, "rho") == ("<=", "")
    assert controls.families == tuple(written["screen"]["families"])
    assert controls.constraints == tuple(c["type"] for c in written["constraint"])
    assert controls.objective == written["objective"]["minimize"]
    assert controls.stiffness_limit == written["constraint"][0]["max_deflection"]


def test_spec_data_changes_only_what_the_controls_change(start, controls):
    from selector.inputs.spec import spec_from_dict

    assert spec_from_dict(spec_data(start, controls)) == start.spec
    changed = spec_data(start, controls.with_screen("rho", "2000 kg/m^3"))
    assert changed["screen"]["rho"] == "<= 2000 kg/m^3"
    assert changed["part"] == start.data["part"]


# --------------------------------------------------------------------------- refresh


def test_refresh_shows_the_library_shortlist(start, controls):
    view = refresh(start, controls)
    assert _row_ids(view) == list(_expected().shortlist["id"])
    assert not any(view.messages.values())
    assert view.figure.layout.meta["chart"] == "property"
    assert view.axes == ("rho", "E")  # E^1/2/rho is straight on density–modulus axes
    assert "size (mm)" in _text(view.shortlist)  # the spec has loads: parts are sized
    assert "Preliminary selection" in _text(view.shortlist)


def test_changing_a_screen_changes_the_shortlist_as_the_library_does(start, controls):
    def hotter(data):
        data["screen"]["T_max"] = ">= 150 degC"

    view = refresh(start, controls.with_screen("T_max", "150 degC"))
    expected = _expected(hotter)
    assert _row_ids(view) == list(expected.shortlist["id"])
    assert len(_row_ids(view)) < len(_row_ids(refresh(start, controls)))
    table = start.table.set_index("id")
    assert all(table.loc[i, "T_max_high"] >= 150 for i in _row_ids(view))


def test_a_screen_in_other_units_gives_the_same_shortlist(start, controls):
    # 302 °F = 150 °C (°F = °C·9/5 + 32; common practice, no source)
    def hotter(data):
        data["screen"]["T_max"] = ">= 150 degC"

    expected = list(_expected(hotter).shortlist["id"])
    assert expected  # the library ranks some classes at 150 °C
    celsius = refresh(start, controls.with_screen("T_max", "150 degC"))
    fahrenheit = refresh(start, controls.with_screen("T_max", "302 degF"))
    for view in (celsius, fahrenheit):
        assert not any(view.messages.values())
        assert _row_ids(view) == expected


def test_a_screen_with_a_unit_that_does_not_fit_shows_a_message(start, controls):
    view = refresh(start, controls.with_screen("T_max", "60 kg"))
    assert "expected a temperature (degC, degF, K …)" in view.messages["screen_T_max"]
    assert "screen.T_max" in view.messages["screen_T_max"]
    assert view.shortlist is None and view.figure is None  # the last good result stays
    assert view.messages["general"]


def test_no_family_ticked_shows_a_message(start, controls):
    view = refresh(start, replace(controls, families=()))
    assert "family" in view.messages["families"]
    assert view.shortlist is None


def test_a_malformed_axis_expression_shows_a_message_and_keeps_the_chart(start, controls):
    view = refresh(start, replace(controls, x="rho^^2"))
    assert "column 5" in view.messages["x"]
    assert view.figure is None
    assert _row_ids(view) == list(_expected().shortlist["id"])  # the shortlist still updates


def test_an_axis_expression_is_drawn(start, controls):
    view = refresh(start, replace(controls, x="price*rho", y="E"))
    assert not view.messages["x"]
    assert "USD/kg" in view.figure.layout.xaxis.title.text


def test_requirement_errors_appear_beside_their_controls(start, controls):
    cases = {
        "safety_factor": replace(controls, safety_factor="lots"),
        "stiffness_limit": replace(controls, stiffness_limit="4 kg"),
        "constraints": replace(controls, constraints=()),
        "free": replace(controls, free="thickness"),
        "index": replace(controls, index="E^"),
    }
    for key, bad in cases.items():
        view = refresh(start, bad)
        assert view.messages[key], key
        assert view.shortlist is None, key
    negative = refresh(start, replace(controls, safety_factor="-1"))
    assert "safety_factor" in negative.messages["safety_factor"]


def test_objective_and_typed_index_rank_as_the_library_does(start, controls):
    def cheapest(data):
        data["objective"]["minimize"] = "cost"

    assert _row_ids(refresh(start, replace(controls, objective="cost"))) == list(
        _expected(cheapest).shortlist["id"]
    )
    typed = refresh(start, replace(controls, index="E/rho"))
    assert _row_ids(typed) == list(_expected(index="E/rho").shortlist["id"])
    assert "typed index" in _text(typed.derivation)


def test_the_derivation_shows_each_step(start, controls):
    view = refresh(start, controls)
    expected = _expected()
    items = [c for c in _walk(view.derivation) if isinstance(c, html.Li)]
    assert len(items) == sum(len(d.steps) for d in expected.derivations)
    plain = _text(view.derivation)
    assert "stiffness constraint" in plain and "strength constraint" in plain


def test_the_index_line_goes_through_the_chosen_class_or_at_a_typed_value(start, controls):
    view = refresh(start, replace(controls, chosen="lead", line_mode="class"))
    notes = [a.text for a in view.figure.layout.annotations if a.text and "through" in a.text]
    assert any("Lead" in t for t in notes)
    at = refresh(start, replace(controls, line_mode="value", line_value="2"))
    main = [t for t in at.figure.data if (t.meta or {}).get("role") == "index-line" and t.meta["main"]]
    assert main and main[0].meta["value"] == pytest.approx(2.0)
    bad = refresh(start, replace(controls, line_mode="value", line_value="steep"))
    assert "not an index value" in bad.messages["line"]
    assert bad.figure is not None


def _index_cells(view) -> dict[str, str]:
    """Each shortlist row's index cell (the fifth column), by class id."""
    out = {}
    for row in _walk(view.shortlist):
        if isinstance(row, html.Tr) and hasattr(row, "data-id"):
            out[getattr(row, "data-id")] = _text(row.children[4])
    return out


@pytest.mark.parametrize("units", ["si", "us"])
def test_the_index_line_reads_the_shortlists_index_and_a_typed_value_in_that_unit(start, controls, units):
    from selector.outputs.tables import index_shown

    view = refresh(start, replace(controls, units=units))
    expected = _expected(lambda data: data.update(units=units))
    leader = expected.shortlist.iloc[0]
    shown = index_shown(expected, units)
    main = [t for t in view.figure.data if (t.meta or {}).get("role") == "index-line" and t.meta["main"]]
    assert main[0].meta["value"] == pytest.approx(leader["index"] * shown.factor, rel=1e-12)
    cell = _index_cells(view)[leader["id"]]
    through = next(a.text for a in view.figure.layout.annotations if a.text and "through" in a.text)
    assert f"= {cell}," in through  # the chart's label and the table print one number
    # the value typed in the unit of the table's index column puts the line through the leader
    typed = refresh(start, replace(controls, units=units, line_mode="value", line_value=cell))
    line = [t for t in typed.figure.data if (t.meta or {}).get("role") == "index-line" and t.meta["main"]]
    assert line[0].meta["value"] == pytest.approx(float(cell))
    assert float(cell) == pytest.approx(main[0].meta["value"], rel=5e-3)  # three figures
    assert not typed.messages["line"]


def test_the_chosen_class_shows_its_data_and_sources(start, controls):
    from selector.outputs.report import provenance
    from selector.outputs.tables import class_frame

    view = refresh(start, replace(controls, chosen="balsa"))
    panel = _text(view.class_panel)
    frame = class_frame(start.table, "balsa")
    assert frame.loc[frame["property"] == "name", "low"].iat[0] in panel
    rho = frame[frame["property"].str.startswith("rho")].iloc[0]
    assert f"{rho['low']:g} – {rho['high']:g}" in panel
    for key, description in provenance(start.table[start.table["id"] == "balsa"]).sources:
        assert key in panel and description in panel
    missing = refresh(start, replace(controls, chosen="no-such-class"))
    assert "no-such-class" in missing.messages["class"]


# --------------------------------------------------------------------------- the other callbacks


def test_sync_screen_moves_the_slider_and_writes_the_input():
    assert sync_screen("price", "slider", 2.0, "80 USD/kg", "<=") == ("100 USD/kg", None)
    assert sync_screen("T_max", "slider", 60, "", ">=") == ("60 degC", None)
    # 140 °F = 60 °C (common practice, no source)
    text, value = sync_screen("T_max", "text", None, "140 degF", ">=")
    assert text is None and value == pytest.approx(60.0)
    _, log_value = sync_screen("rho", "text", None, "1 t/m^3", "<=")
    assert log_value == pytest.approx(3.0)  # 1 t/m³ = 1000 kg/m³
    assert sync_screen("T_max", "text", None, "sixty", ">=") == (None, None)
    assert sync_screen("T_max", "text", None, "", ">=") == (None, None)


def test_pick_class_from_the_chart_the_shortlist_and_the_typed_value():
    click = {"points": [{"customdata": "balsa", "x": 1, "y": 2}]}
    assert pick_class("chart", click, click, None, "", "leader") == ("balsa", "class")
    assert pick_class({"type": "pick", "id": "cfrp-ud"}, 1, None, "balsa", "", "leader") == (
        "cfrp-ud",
        "class",
    )
    assert pick_class({"type": "pick", "id": "cfrp-ud"}, 0, None, "balsa", "", "value") == ("balsa", "value")
    assert pick_class("line-value", "0.01", None, "balsa", "0.01", "class") == ("balsa", "value")
    assert pick_class("line-value", "", None, "balsa", "", "value") == ("balsa", "class")
    assert pick_class("class", None, None, None, "", "class") == (None, "leader")
    assert pick_class(None, None, None, "balsa", "", "class") == ("balsa", "class")


def _content(data: dict) -> bytes:
    return base64.b64decode(data["content"]) if data.get("base64") else data["content"].encode("utf-8")


def test_downloads_are_the_library_files(start, controls):
    from openpyxl import load_workbook

    from selector.outputs.tables import render_selection

    expected = _expected()
    data, message = download(start, controls, "csv")
    assert message == "" and data["filename"].endswith(".csv")
    assert _content(data).decode("utf-8") == render_selection(expected, "csv", "si") + "\n"
    frame = pd.read_csv(io.BytesIO(_content(data)))
    assert list(frame["id"]) == list(expected.shortlist["id"])
    book, _ = download(start, controls, "xlsx")
    sheets = load_workbook(io.BytesIO(_content(book))).sheetnames
    assert sheets[0] == "shortlist" and "spec" in sheets
    report, _ = download(start, controls, "report")
    page = _content(report).decode("utf-8")
    assert page.lstrip().lower().startswith("<!doctype html") and expected.spec.title in page
    assert "max_deflection = &#34;4 mm&#34;" in page  # the spec file as written (escaped)
    changed, _ = download(start, controls.with_screen("rho", "3000 kg/m^3"), "report")
    assert "as changed in the explorer" in _content(changed).decode("utf-8")
    nothing, why = download(start, controls.with_screen("price", "80 kg"), "csv")
    assert nothing is None and "screen.price" in why


# --------------------------------------------------------------------------- serving


def test_bind_listens_on_loopback_and_refuses_a_busy_port(start):
    app = make_app()
    server = bind(app, 0)
    try:
        assert server.host == "127.0.0.1" and server.port > 0
        with socket.create_connection(("127.0.0.1", server.port), timeout=2):
            pass
        with pytest.raises(InputError, match="--port"):
            bind(app, server.port)
    finally:
        server.server_close()
    with pytest.raises(InputError, match="not a port"):
        bind(app, 70000)


@pytest.mark.parametrize("open_browser", [True, False])
def test_serve_prints_the_address_and_opens_the_browser_when_asked(monkeypatch, open_browser):
    from werkzeug.serving import BaseWSGIServer

    opened: list[str] = []
    said: list[str] = []

    def stop(self, *args, **kwargs):
        return None  # as werkzeug's serve_forever does after Ctrl+C

    monkeypatch.setattr(explore.webbrowser, "open", opened.append)
    monkeypatch.setattr(BaseWSGIServer, "serve_forever", stop)
    serve(SPEC, 0, open_browser, echo=said.append)
    url = said[0].split()[2]
    assert url.startswith("http://127.0.0.1:") and said[-1] == "stopped"
    assert opened == ([url] if open_browser else [])


def test_the_explore_command_passes_its_options(monkeypatch):
    import selector.outputs.explore
    from selector.cli import cli

    calls: list[tuple] = []
    monkeypatch.setattr(selector.outputs.explore, "serve", lambda *args, **kw: calls.append(args))
    result = CliRunner().invoke(cli, ["explore", str(SPEC), "--port", "8123", "--no-browser"])
    assert result.exit_code == 0, result.output
    assert calls[0][:3] == (str(SPEC), 8123, False)
    result = CliRunner().invoke(cli, ["explore"])
    assert result.exit_code == 0 and calls[1][:3] == (None, 8050, True)


def test_the_explore_command_reports_a_bad_spec_cleanly(tmp_path):
    from selector.cli import cli

    result = CliRunner().invoke(cli, ["explore", str(tmp_path / "nope.toml"), "--no-browser"])
    assert result.exit_code == 2 and isinstance(result.exception, SystemExit)
    assert result.stderr.startswith("error: ") and "no such file" in result.stderr


def test_dash_is_a_runtime_dependency():
    from pathlib import Path

    project = tomllib.loads((Path(__file__).parents[2] / "pyproject.toml").read_text(encoding="utf-8"))
    assert any(d.replace(" ", "").startswith("dash>=") for d in project["project"]["dependencies"])


def test_layout_serialises_to_json():
    import plotly

    app = make_app()
    text = json.dumps(app.layout.to_plotly_json(), cls=plotly.utils.PlotlyJSONEncoder)
    assert '"id": "chart"' in text


def test_no_page_property_is_written_by_two_callbacks_unless_marked():
    """Dash lets only one callback write a property unless the others say allow_duplicate."""
    client = make_app().server.test_client()
    writers: dict[str, list[bool]] = {}
    for dep in client.get("/_dash-dependencies").get_json():
        for out in dep["output"].strip(".").split("..."):
            writers.setdefault(out.split("@")[0], []).append("@" in out)
    shared = {prop: marks for prop, marks in writers.items() if len(marks) > 1}
    assert "msg-upload.children" not in shared
    assert all(marks.count(False) == 1 for marks in shared.values()), shared


def test_in_us_units_the_reasons_notes_and_sources_read_in_us_units(start, controls):
    # structural steel's source quotes EN 1993-1-1 (E = 210 GPa): the figure stays as quoted,
    # with the US one beside it; 210 GPa = 30.5 Msi (NIST SP 811: 1 psi = 6894.757 Pa)
    view = refresh(start, replace(controls, units="us", chosen="structural-steel"))
    panel = _text(view.class_panel)
    assert "210 GPa [30.5 Msi]" in panel
    listed = _text(view.shortlist)
    assert "MPa·m½" not in listed and "°C" not in listed and " mm" not in listed

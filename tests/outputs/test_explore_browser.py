"""The explorer end to end: a real server on 127.0.0.1 and headless Chromium driving the page.

Expected answers come from the library called directly (``select``, ``chart_for_selection``,
``class_frame``), so these tests check that the page shows what the pipeline computes.
Plotly sends arrays base64-encoded, so drawn elements are counted in the DOM.
"""

from __future__ import annotations

import os
import re
import tempfile
import threading
import urllib.request
from collections.abc import Iterator
from pathlib import Path
from typing import Any
from urllib.parse import urlsplit

import numpy as np
import pandas as pd
import pytest

from selector.outputs.explore.server import bind, make_app
from selector.outputs.explore.state import initial_controls, load_start, spec_data
from tests.browser import BROWSER_WAIT_MS, chromium, chromium_page, need_browser

pytestmark = pytest.mark.browser

WAIT_MS = BROWSER_WAIT_MS
"""Longest wait for the page to answer a change (a bound, not a pause)."""
SHOTS = Path(os.environ.get("SELECTOR_SCREENSHOTS", tempfile.gettempdir()))
"""Where the window-size tests leave their screenshots for a person to look at."""


def _wait_until_up(url: str, limit_s: float = BROWSER_WAIT_MS / 1000) -> None:
    """One request to the server (127.0.0.1 only), waiting at most ``limit_s`` seconds for its answer.

    The socket is bound and listening before the serving thread starts, so the request
    queues until the server takes it: no polling and no pause.
    """
    assert urlsplit(url).hostname == "127.0.0.1"
    with urllib.request.urlopen(url, timeout=limit_s) as reply:
        assert reply.status == 200, f"the explorer answered {reply.status} at {url}"


@pytest.fixture(scope="module")
def server() -> Iterator[str]:
    need_browser()
    app = make_app()
    srv = bind(app, 0)
    thread = threading.Thread(target=srv.serve_forever, daemon=True)
    thread.start()
    url = f"http://127.0.0.1:{srv.port}/"
    try:
        _wait_until_up(url)
        yield url
    finally:
        srv.shutdown()
        srv.server_close()
        thread.join(timeout=10)


@pytest.fixture(scope="module")
def browser(server: str) -> Iterator[Any]:
    with chromium() as b:
        yield b


@pytest.fixture(scope="module")
def loaded(browser: Any, server: str) -> Iterator[Any]:
    """One page for the module (loading plotly.js is the slow part); each test undoes its changes.

    Requests to the server go through; all others are logged and refused.
    """
    with chromium_page(browser, width=1440, height=1000) as log:
        pg = log.page

        def loopback(route: Any) -> None:
            if urlsplit(route.request.url).hostname == "127.0.0.1":
                route.continue_()
            else:
                route.fallback()  # the handler of tests/browser.py logs and aborts it

        pg.route("**/*", loopback)
        pg.set_default_timeout(WAIT_MS)
        pg.goto(server)
        pg.wait_for_selector("#shortlist-table tbody tr")
        pg.wait_for_selector("#chart .scatterlayer path.point")
        yield log


@pytest.fixture
def page(loaded: Any) -> Iterator[Any]:
    yield loaded.page
    assert loaded.page_errors == []
    assert loaded.console_errors == []
    assert loaded.outside_requests == []
    assert loaded.dialogs == []


def _library(**screen: str):
    """The Selection for the example with some screens changed, straight from the library."""
    from selector.inputs.spec import spec_from_dict
    from selector.pipeline.selection import select

    start = load_start()
    data = spec_data(start, initial_controls(start))
    data["screen"].update(screen)
    return select(spec_from_dict(data), start.table)


def _type(page: Any, selector: str, text: str) -> None:
    box = page.locator(selector)
    box.fill(text)
    box.press("Enter")


def test_changing_a_screen_changes_the_shortlist(page):
    from playwright.sync_api import expect

    rows = page.locator("#shortlist-table tbody tr")
    before, after = _library(), _library(T_max=">= 200 degC")
    assert len(after.shortlist) < len(before.shortlist)  # the woods are rated below 200 °C
    expect(rows).to_have_count(len(before.shortlist))
    _type(page, "#screen-T_max", "200 degC")
    expect(rows).to_have_count(len(after.shortlist))
    shown = [rows.nth(i).get_attribute("data-id") for i in range(rows.count())]
    assert shown == list(after.shortlist["id"])
    _type(page, "#screen-T_max", "60 degC")
    expect(rows).to_have_count(len(before.shortlist))


def test_swapping_an_axis_redraws_the_chart(page):
    from playwright.sync_api import expect

    from selector.outputs.charts import chart_for_selection

    lib = chart_for_selection(_library(), "rho", "sigma_y", top=5)
    _type(page, "#y-axis", "sigma_y")
    expect(page.locator("#chart .ytitle")).to_contain_text("Yield strength")
    expect(page.locator("#chart .scatterlayer .trace")).to_have_count(len(lib.data))
    points = sum(len(t.x) for t in lib.data if t.mode == "markers")
    expect(page.locator("#chart .scatterlayer path.point")).to_have_count(points)
    # E^1/2/rho does not reduce to rho and sigma_y: the index lines are gone.
    assert not any((t.meta or {}).get("role") == "index-line" for t in lib.data)
    _type(page, "#y-axis", "")
    expect(page.locator("#chart .ytitle")).to_contain_text("Young")


def test_a_bad_expression_shows_a_message_and_the_page_keeps_working(page):
    from playwright.sync_api import expect

    message = page.locator("#msg-x")
    _type(page, "#x-axis", "rho^^2")
    expect(message).to_be_visible()
    expect(message).to_contain_text("column 5")
    _type(page, "#x-axis", "price*rho")
    expect(message).to_be_empty()
    expect(page.locator("#chart .xtitle")).to_contain_text("Mg/m³")  # the index's unit for density
    expect(page.locator("#chart .xtitle")).to_contain_text("USD/kg")
    _type(page, "#x-axis", "")
    expect(page.locator("#chart .xtitle")).not_to_contain_text("USD/kg")


def _loneliest(table: pd.DataFrame) -> str:
    """The class whose marker on the density–modulus chart is farthest from every other one."""
    x = np.log10(np.sqrt(table["rho_low"] * table["rho_high"]).to_numpy(dtype=float))
    y = np.log10(np.sqrt(table["E_low"] * table["E_high"]).to_numpy(dtype=float))
    gap = np.hypot(x[:, None] - x[None, :], y[:, None] - y[None, :])
    np.fill_diagonal(gap, np.inf)
    return str(table["id"].iat[int(np.argmax(gap.min(axis=1)))])


def test_clicking_a_class_shows_its_data(page):
    from playwright.sync_api import expect

    from selector.inputs.units import format_number
    from selector.outputs.charts import chart_for_selection
    from selector.outputs.tables import class_frame

    selection = _library()
    picked = _loneliest(selection.table)
    box = page.evaluate(
        """(id) => {
          for (const g of document.querySelectorAll('#chart .scatterlayer .trace')) {
            const trace = g.__data__ && g.__data__[0] && g.__data__[0].trace;
            const ids = trace && trace.customdata ? Array.from(trace.customdata) : [];
            if (!ids.includes(id)) continue;
            const r = g.querySelectorAll('path.point')[ids.indexOf(id)].getBoundingClientRect();
            return {x: r.x + r.width / 2, y: r.y + r.height / 2};
          }
          return null;
        }""",
        picked,
    )
    assert box is not None, f"no marker for {picked}"
    page.mouse.move(box["x"], box["y"])
    page.mouse.click(box["x"], box["y"])
    mine = selection.table[selection.table["id"] == picked].iloc[0]
    expect(page.locator("#class-name")).to_have_text(str(mine["name"]))
    data = class_frame(selection.table, picked)
    rho = data[data["property"].str.startswith("rho")].iloc[0]
    expect(page.locator("#class-table")).to_contain_text(
        f"{format_number(rho['low'])} – {format_number(rho['high'])}"
    )
    expect(page.locator("#class-status")).to_contain_text(str(mine["status"]))
    expect(page.locator("#class-sources li").first).to_be_visible()
    # The index line now passes through the clicked class, as the library draws it.
    expect(page.locator("#line-mode input[value=class]")).to_be_checked()
    lib = chart_for_selection(selection, "rho", "E", through=picked)
    label = next(a.text for a in lib.layout.annotations if a.text and "through" in a.text)
    expect(page.locator("#chart .annotation")).to_contain_text([label.split(", ", 1)[1]])


def test_the_shortlist_downloads_as_csv(page):
    from selector.outputs.tables import render_selection

    with page.expect_download() as info:
        page.click("#get-csv")
    path = info.value.path()
    got = pd.read_csv(path)
    selection = _library()
    assert list(got["id"]) == list(selection.shortlist["id"])
    assert "mass [kg]" in got.columns
    with open(path, encoding="utf-8") as handle:
        assert handle.read().rstrip("\n") == render_selection(selection, "csv", "si")


# ---------------------------------------------------------------------- the whole spec, files and the address


OVERFLOW_JS = """() => {
  const bad = [];
  const root = document.documentElement;
  if (root.scrollWidth > root.clientWidth + 1) bad.push(`page: ${root.scrollWidth} > ${root.clientWidth}`);
  const name = (el) => el.id || (typeof el.className === "string" && el.className) || el.tagName;
  const panels = "nav, nav section, main section, .chartbar, .classbox, .field, .scroll, .constraint, "
    + "details";
  for (const el of document.querySelectorAll(panels)) {
    if (el.offsetParent === null) continue;
    if (el.scrollWidth > el.clientWidth + 1) bad.push(`${name(el)}: ${el.scrollWidth} > ${el.clientWidth}`);
  }
  const controls = "input, button, table, .dash-dropdown, label, .js-plotly-plot";
  for (const el of document.querySelectorAll(controls)) {
    if (el.offsetParent === null) continue;
    const box = el.closest("section, .chartbar, .classbox, header, .chartrow");
    const r = el.getBoundingClientRect();
    if (!box || r.width === 0) continue;
    const b = box.getBoundingClientRect();
    if (r.left < b.left - 1 || r.right > b.right + 1) bad.push(`${name(el)} sticks out of ${name(box)}`);
    if (r.left < 0 || r.right > root.clientWidth + 1) bad.push(`${name(el)} is outside the window`);
  }
  return bad;
}"""
"""Every panel and control that shows, as (what, why) where it overflows its container or the window."""


SPLIT_WORDS_JS = """() => {
  const split = [];
  for (const th of document.querySelectorAll("table th")) {
    if (th.offsetParent === null) continue;
    const walker = document.createTreeWalker(th, NodeFilter.SHOW_TEXT);
    for (let node = walker.nextNode(); node; node = walker.nextNode()) {
      const text = node.textContent;
      const words = /\\S+/g;
      for (let m = words.exec(text); m; m = words.exec(text)) {
        const range = document.createRange();
        const tops = new Set();
        for (let i = m.index; i < m.index + m[0].length; i++) {
          range.setStart(node, i);
          range.setEnd(node, i + 1);
          const r = range.getBoundingClientRect();
          if (r.width > 0) tops.add(Math.round(r.top));
        }
        if (tops.size > 1) split.push(`${th.closest("table").id || "table"}: ${m[0]}`);
      }
    }
  }
  return split;
}"""
"""Every table header word (text between spaces) whose letters sit on more than one line."""


def _fresh(browser: Any, url: str, width: int = 1440, height: int = 1000):
    """A new page on ``url`` (requests to the server only), once the shortlist and chart are drawn."""
    from contextlib import contextmanager

    @contextmanager
    def opened():
        with chromium_page(browser, width=width, height=height) as log:
            pg = log.page

            def loopback(route: Any) -> None:
                if urlsplit(route.request.url).hostname == "127.0.0.1":
                    route.continue_()
                else:
                    route.fallback()

            pg.route("**/*", loopback)
            pg.goto(url)
            pg.wait_for_selector("#shortlist-table tbody tr")
            pg.wait_for_selector("#chart .scatterlayer path.point")
            yield pg
            assert log.page_errors == [] and log.console_errors == [] and log.outside_requests == []

    return opened()


def _shown_ids(page: Any) -> list[str]:
    rows = page.locator("#shortlist-table tbody tr")
    return [rows.nth(i).get_attribute("data-id") for i in range(rows.count())]


_SHOWS_IDS = """ids => JSON.stringify(
    [...document.querySelectorAll('#shortlist-table tbody tr')].map(row => row.dataset.id)
) === JSON.stringify(ids)"""


def _expect_ids(page: Any, ids: list[str]) -> None:
    """Wait until the shortlist shows exactly ``ids``, in order: a refresh can keep the row
    count and the leader while the rows below are still the old ones."""
    from playwright.sync_api import Error

    try:
        page.wait_for_function(_SHOWS_IDS, arg=ids)
    except Error:
        assert _shown_ids(page) == ids  # the difference, for the report
        raise


def test_a_new_constraint_with_its_fields_and_a_new_load_rank_as_the_library_does(browser, server):
    from playwright.sync_api import expect

    from selector.inputs.spec import spec_from_dict
    from selector.pipeline.selection import select

    start = load_start()
    data = spec_data(start, initial_controls(start))
    data["part"]["force"] = "240 N"
    data["constraint"].append({"type": "frequency", "min_frequency": "40 Hz"})
    expected = list(select(spec_from_dict(data), start.table).shortlist["id"])
    with _fresh(browser, server) as pg:
        expect(pg.locator("#con-frequency")).to_be_hidden()
        pg.locator("#constraints input[value=frequency]").check()
        expect(pg.locator("#con-frequency")).to_be_visible()
        _type(pg, "#constraint-frequency-min_frequency", "40 Hz")
        _type(pg, "#part-force", "240 N")
        expect(pg.locator("#shortlist-table tbody tr")).to_have_count(len(expected))
        expect(pg.locator("#shortlist-table tbody tr").first).to_have_attribute("data-id", expected[0])
        _expect_ids(pg, expected)
        expect(pg.locator("#derivation")).to_contain_text("frequency constraint")


def test_the_edited_spec_downloads_and_loads_back_by_upload(browser, server, tmp_path):
    from playwright.sync_api import expect

    from selector.inputs.spec import spec_from_dict
    from selector.outputs.explore.spec_files import spec_text
    from selector.pipeline.selection import select

    start = load_start()
    controls = initial_controls(start).with_field("part.force", "200 N").with_screen("K_IC", "18 MPa*m^0.5")
    expected = list(select(spec_from_dict(spec_data(start, controls)), start.table).shortlist["id"])
    with _fresh(browser, server) as pg:
        _type(pg, "#part-force", "200 N")
        _type(pg, "#screen-K_IC", "18 MPa*m^0.5")
        expect(pg.locator("#shortlist-table tbody tr")).to_have_count(len(expected))
        _expect_ids(pg, expected)
        with pg.expect_download() as info:
            pg.click("#get-spec")
        saved = tmp_path / info.value.suggested_filename
        info.value.save_as(saved)
    text = saved.read_text(encoding="utf-8")
    assert text == spec_text(spec_data(start, controls), start.spec.title)
    with _fresh(browser, server) as pg:
        as_started = list(_library().shortlist["id"])
        assert as_started != expected
        _expect_ids(pg, as_started)  # the spec as started
        pg.set_input_files("#upload input[type=file]", str(saved))
        expect(pg.locator("#part-force")).to_have_value("200 N")
        expect(pg.locator("#screen-K_IC")).to_have_value("18 MPa*m^0.5")
        expect(pg.locator("#shortlist-table tbody tr")).to_have_count(len(expected))
        _expect_ids(pg, expected)
        expect(pg.locator("#msg-upload")).to_be_empty()


def test_a_bad_upload_gets_its_message_and_the_page_keeps_working(browser, server, tmp_path):
    from playwright.sync_api import expect

    bad = tmp_path / "broken.toml"
    bad.write_text("[part]\nfunction = 'beem'\n", encoding="utf-8")
    with _fresh(browser, server) as pg:
        before = _shown_ids(pg)
        pg.set_input_files("#upload input[type=file]", str(bad))
        expect(pg.locator("#msg-upload")).to_contain_text("part.function")
        assert _shown_ids(pg) == before


def test_a_page_address_brings_back_the_view(browser, server):
    from playwright.sync_api import expect

    from selector.outputs.explore import address

    start = load_start()
    data = spec_data(start, initial_controls(start))
    data["screen"]["T_max"] = ">= 200 degC"
    fragment = address.encode(data, {"y": "sigma_y", "class": "cfrp-ud", "line": "class"})
    expected = _library(T_max=">= 200 degC")
    with _fresh(browser, server + fragment) as pg:
        expect(pg.locator("#screen-T_max")).to_have_value("200 degC")
        expect(pg.locator("#shortlist-table tbody tr")).to_have_count(len(expected.shortlist))
        _expect_ids(pg, list(expected.shortlist["id"]))
        expect(pg.locator("#chart .ytitle")).to_contain_text("Yield strength")
        expect(pg.locator("#class-name")).to_have_text(
            str(start.table.set_index("id").loc["cfrp-ud", "name"])
        )
        # A change on the page is written into the address, which brings it back again.
        _type(pg, "#screen-T_max", "150 degC")
        expect(pg).to_have_url(re.compile(r"#spec="))
        pg.wait_for_function("(old) => window.location.hash !== old", arg=fragment)
        shared = pg.url
        hotter = _library(T_max=">= 150 degC")
        expect(pg.locator("#shortlist-table tbody tr")).to_have_count(len(hotter.shortlist))
        shown = list(hotter.shortlist["id"])
        _expect_ids(pg, shown)
    with _fresh(browser, shared) as pg:
        expect(pg.locator("#screen-T_max")).to_have_value("150 degC")
        expect(pg.locator("#shortlist-table tbody tr")).to_have_count(len(shown))
        _expect_ids(pg, shown)


def test_a_panel_switches_between_solid_and_sandwich(browser, server, tmp_path):
    from playwright.sync_api import expect

    from selector.inputs.spec import EXAMPLES

    lid = tmp_path / "lid.toml"
    lid.write_text((EXAMPLES / "enclosure-lid.toml").read_text(encoding="utf-8"), encoding="utf-8")
    with _fresh(browser, server) as pg:
        pg.set_input_files("#upload input[type=file]", str(lid))
        expect(pg.locator("#title")).to_have_text("Outdoor enclosure lid")
        expect(pg.locator("#row-construction")).to_be_visible()
        pg.locator("#construction input[value=sandwich]").check()
        expect(pg.locator("#pairs-table tbody tr").first).to_be_visible()
        expect(pg.locator("#best-solid")).to_contain_text("best solid part")
        expect(pg.locator("#sandwich-block")).to_be_visible()
        pg.locator("#construction input[value=solid]").check()
        expect(pg.locator("#pairs-table")).to_have_count(0)
        expect(pg.locator("#sandwich-block")).to_be_hidden()


@pytest.mark.parametrize(("width", "height"), [(1280, 800), (1920, 1080)])
@pytest.mark.parametrize("spec", ["camera-dolly-boom", "walkway-hatch"])
def test_nothing_is_clipped_at_common_window_sizes(browser, width, height, spec, tmp_path):
    """Every panel and control fits its container and the window, with every fold opened."""
    from selector.inputs.spec import EXAMPLES

    app = make_app(EXAMPLES / f"{spec}.toml")
    srv = bind(app, 0)
    thread = threading.Thread(target=srv.serve_forever, daemon=True)
    thread.start()
    try:
        url = f"http://127.0.0.1:{srv.port}/"
        _wait_until_up(url)
        with _fresh(browser, url, width, height) as pg:
            pg.screenshot(path=str(SHOTS / f"explorer-{spec}-{width}x{height}.png"))
            assert pg.evaluate(OVERFLOW_JS) == []
            pg.evaluate("document.querySelectorAll('details').forEach(d => { d.open = true; })")
            pg.wait_for_function("() => [...document.querySelectorAll('details')].every(d => d.open)")
            assert pg.evaluate(OVERFLOW_JS) == []
            assert pg.evaluate(SPLIT_WORDS_JS) == []
            pg.locator("#units input[value=us]").check()  # US headers: "index (Msi^(1/2)/(lb/in³))"
            pg.wait_for_function("() => document.querySelector('#shortlist-table').innerText.includes('lb')")
            assert pg.evaluate(SPLIT_WORDS_JS) == []
            assert pg.evaluate(OVERFLOW_JS) == []
            # the check sees a split word: squeezed to 20 px, a header's words must overflow, not break
            pg.add_style_tag(content="table.grid th { width: 20px; max-width: 20px; }")
            assert pg.evaluate(SPLIT_WORDS_JS) == []
            pg.add_style_tag(content="table.grid th { overflow-wrap: anywhere; }")
            assert pg.evaluate(SPLIT_WORDS_JS) != []
            caution = pg.locator("header .caution-banner")
            assert "certified design-allowable data" in caution.inner_text()
            assert "licensed engineering review" in caution.inner_text()
    finally:
        srv.shutdown()
        srv.server_close()
        thread.join(timeout=10)

"""Charts in a real headless Chromium: drawing, hover, legend, escaping, static images."""

from __future__ import annotations

import struct
import xml.etree.ElementTree as ET

import pytest

from selector.outputs.charts import property_chart, write_chart
from selector.pipeline.screen import parse_screens
from tests.browser import chromium, chromium_page, need_browser
from tests.conftest import make_table

pytestmark = pytest.mark.browser

EVIL = "<img src=x onerror=alert(1)>"
BOXES = 'g.trace[class*="tracebox-"] path.js-line'
POINTS = 'g.trace[class*="tracemark-"] path.point'


def small_table():
    """Four invented, well separated classes (demo data), one of them with a hostile name."""
    return make_table(
        [
            {"id": "alu", "name": "Light alloy", "family": "metal", "E": (68, 72), "rho": (2600, 2800)},
            {"id": "wood", "name": "Grain wood", "family": "natural", "E": (8, 12), "rho": (400, 600)},
            {"id": "evil", "name": EVIL, "family": "polymer", "E": (1, 1.6), "rho": (1000, 1200)},
            {"id": "foam", "name": "Cell foam", "family": "foam", "E": (0.001, 0.01), "rho": (30, 100)},
        ]
    )


@pytest.fixture(scope="module")
def browser():
    with chromium() as b:
        yield b


@pytest.fixture(scope="module")
def builtin_chart(tmp_path_factory):
    from selector.inputs.materials import load_materials

    table = load_materials()
    screens = parse_screens({"T_max": ">= 60 degC", "E": ">= 1 GPa"})
    fig = property_chart(
        table,
        "rho",
        "E",
        index="E^0.5/rho",
        through="al-6xxx-wrought",
        screens=screens,
        highlight=["cfrp-ud", "al-6xxx-wrought", "balsa"],
    )
    path = write_chart(fig, tmp_path_factory.mktemp("chart") / "builtin.html")
    return table, fig, path


def open_chart(log, path) -> None:
    log.page.goto(path.as_uri())
    log.page.wait_for_selector(POINTS)


def point_centre(log, fig, class_id: str) -> tuple[float, float]:
    """Pixel centre of the marker of one class, found through its trace's uid."""
    trace = next(
        t for t in fig.data if t.meta and t.meta.get("role") == "markers" and class_id in t.meta["ids"]
    )
    point = log.page.locator(f"g.trace{trace.uid} path.point").nth(trace.meta["ids"].index(class_id))
    box = point.bounding_box()
    assert box is not None
    return box["x"] + box["width"] / 2, box["y"] + box["height"] / 2


def test_builtin_chart_loads_offline_and_draws_one_box_per_class(browser, builtin_chart):
    table, _, path = builtin_chart
    with chromium_page(browser) as log:
        open_chart(log, path)
        assert log.page.locator(BOXES).count() == len(table)
        assert log.page.locator(POINTS).count() == len(table)
        assert log.page.locator("g.trace.traceshortlist path.point").count() == 3
        assert log.page.locator('g.trace[class*="traceindex-"]').count() >= 2
        assert log.console_errors == [] and log.page_errors == [] and log.outside_requests == []


def test_legend_click_hides_a_family_with_its_boxes(browser, builtin_chart):
    table, _, path = builtin_chart
    metals = int((table["family"] == "metal").sum())
    with chromium_page(browser) as log:
        open_chart(log, path)
        entry = log.page.locator(".legend .traces").filter(has_text=f"metal ({metals})")
        entry.locator(".legendtoggle").click()
        log.page.wait_for_function(f"document.querySelectorAll('{POINTS}').length === {len(table) - metals}")
        assert log.page.locator(BOXES).count() == len(table) - metals
        assert log.page_errors == []


def test_hover_shows_the_class_and_its_ranges(browser, tmp_path):
    table = small_table()
    fig = property_chart(table, "rho", "E")
    path = write_chart(fig, tmp_path / "small.html")
    with chromium_page(browser) as log:
        open_chart(log, path)
        log.page.mouse.move(*point_centre(log, fig, "alu"))
        label = log.page.locator("g.hovertext")
        label.first.wait_for()
        text = label.first.text_content() or ""
        assert "Light alloy" in text
        assert "2600–2800 kg/m³" in text and "68–72 GPa" in text
        assert log.console_errors == [] and log.page_errors == []


def test_hostile_class_name_shows_as_text_and_runs_nothing(browser, tmp_path):
    table = small_table()
    fig = property_chart(table, "rho", "E", highlight=["evil"], title=EVIL)
    path = write_chart(fig, tmp_path / "evil.html")
    with chromium_page(browser) as log:
        open_chart(log, path)
        log.page.mouse.move(*point_centre(log, fig, "evil"))
        log.page.locator("g.hovertext").first.wait_for()
        assert EVIL in (log.page.locator("g.hovertext").first.text_content() or "")
        assert EVIL in (log.page.locator("g.annotation").filter(has_text="1 ").first.text_content() or "")
        assert EVIL in (log.page.locator(".gtitle").first.text_content() or "")
        assert log.page.evaluate("document.querySelectorAll('img').length") == 0
        log.page.wait_for_load_state("load")  # every resource loaded, so any onerror handler has run
        log.page.evaluate("() => new Promise(done => setTimeout(done, 0))")  # and the task queue drained
        assert log.dialogs == []
        assert log.page_errors == []


def test_kaleido_writes_png_and_svg(tmp_path):
    need_browser("kaleido")
    table = small_table()
    fig = property_chart(table, "rho", "E", index="E^0.5/rho", through="alu", highlight=["evil"])
    png = write_chart(fig, tmp_path / "chart.png", width=800, height=600, scale=1)
    data = png.read_bytes()
    assert data[:8] == b"\x89PNG\r\n\x1a\n"
    width, height = struct.unpack(">II", data[16:24])  # IHDR (PNG specification, ISO/IEC 15948)
    assert (width, height) == (800, 600)
    svg = write_chart(fig, tmp_path / "chart.svg", width=800, height=600, scale=1)
    root = ET.fromstring(svg.read_bytes())
    assert root.tag.endswith("svg")
    drawn = [
        p
        for g in root.iter("{http://www.w3.org/2000/svg}g")
        if "tracebox-" in (g.get("class") or "")
        for p in g.iter("{http://www.w3.org/2000/svg}path")
        if "js-line" in (p.get("class") or "")
    ]
    assert len(drawn) == len(table)
    texts = "".join(root.itertext())
    assert EVIL in texts  # shown as text, not markup
    assert sorted(p.name for p in tmp_path.iterdir()) == ["chart.png", "chart.svg"]

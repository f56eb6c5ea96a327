"""The report in a real headless Chromium: it opens offline, shows each section, runs no user text."""

from __future__ import annotations

from pathlib import Path

import pytest

from selector.api import run_spec
from selector.outputs import report
from selector.pipeline.selection import report_studies
from tests.browser import chromium, chromium_page
from tests.outputs.test_report import SECTIONS, XSS, _hostile_selection

pytestmark = pytest.mark.browser

SPEC = Path(__file__).parents[2] / "examples" / "camera-dolly-boom.toml"


@pytest.fixture(scope="module")
def browser():
    with chromium() as b:
        yield b


@pytest.fixture(scope="module")
def demo_report(tmp_path_factory):
    path = tmp_path_factory.mktemp("report") / "report.html"
    report.write_report(
        report_studies(run_spec(SPEC), 300), path, SPEC.read_text(encoding="utf-8"), SPEC.name
    )
    return path


def _open(log, path: Path) -> None:
    log.page.goto(path.as_uri(), wait_until="load")
    log.page.wait_for_function("document.querySelectorAll('.js-plotly-plot .main-svg').length >= 2")


def test_report_opens_offline_without_errors_and_shows_each_section(browser, demo_report):
    with chromium_page(browser, 1280, 900) as log:
        _open(log, demo_report)
        page = log.page
        assert log.console_errors == []
        assert log.page_errors == []
        assert log.outside_requests == []
        for section in SECTIONS:
            assert page.locator(f"section#{section}").is_visible(), section
            assert page.locator(f"section#{section} h2").inner_text().strip()
        caution = page.locator("#caution")
        assert caution.is_visible()
        box = caution.bounding_box()
        assert box is not None and box["y"] + box["height"] < 900  # in view without scrolling
        assert "Preliminary selection only" in caution.inner_text()
        assert page.locator("#chart-property .main-svg").count() >= 1
        assert page.locator("#chart-tradeoff .main-svg").count() >= 1
        rows = page.locator("table.shortlist tbody tr").count()
        assert rows == len(run_spec(SPEC).shortlist)


def test_print_layout_hides_controls_and_fits_the_charts(browser, demo_report):
    with chromium_page(browser, 1280, 900) as log:
        _open(log, demo_report)
        page = log.page
        page.emulate_media(media="print")
        assert page.evaluate("getComputedStyle(document.querySelector('nav.contents')).display") == "none"
        assert page.evaluate(
            "Array.from(document.querySelectorAll('.modebar-container'))"
            ".every(e => getComputedStyle(e).display === 'none')"
        )
        assert page.evaluate("getComputedStyle(document.querySelector('tbody tr')).breakInside") == "avoid"
        page.evaluate("window.dispatchEvent(new Event('beforeprint'))")
        widths = page.evaluate(
            "Array.from(document.querySelectorAll('.js-plotly-plot .main-svg:first-child'))"
            ".map(s => s.getBoundingClientRect().width)"
        )
        assert widths and all(w <= 720 for w in widths), widths  # A4 text width is about 700 px at 96 dpi
        pdf = page.pdf(format="A4")
        assert pdf[:4] == b"%PDF"
        page.emulate_media(media="screen")
        page.wait_for_function(
            "Array.from(document.querySelectorAll('.js-plotly-plot .main-svg:first-child'))"
            ".every(s => s.getBoundingClientRect().width > 900)"
        )
        assert log.console_errors == [] and log.page_errors == []


def test_hostile_title_and_class_names_show_as_text_and_run_nothing(browser, tmp_path):
    path = tmp_path / "hostile.html"
    selection = _hostile_selection()
    report.write_report(report_studies(selection, 50), path, f'title = "{XSS}"\n', "hostile.toml")
    with chromium_page(browser, 1280, 900) as log:
        _open(log, path)
        page = log.page
        assert page.locator("#report-title").inner_text() == f"Boom {XSS}"
        assert f"Evil {XSS} class" in page.locator("table.shortlist").inner_text()
        assert f"Shut {XSS}" in page.locator("table.rejected").inner_text()
        # Hover the chart point of the hostile class: the label shows the text as written.
        shown = page.evaluate(
            """() => {
                const div = document.getElementById('chart-property');
                for (let c = 0; c < div.data.length; c++) {
                    const text = div.data[c].text || [];
                    for (let p = 0; p < text.length; p++) {
                        if (String(text[p]).includes('Evil')) {
                            Plotly.Fx.hover(div, [{curveNumber: c, pointNumber: p}]);
                            const label = div.querySelector('.hovertext');
                            return label ? label.textContent : null;
                        }
                    }
                }
                return null;
            }"""
        )
        assert shown is not None and XSS in shown
        assert log.dialogs == []
        assert log.page_errors == [] and log.console_errors == []
        assert page.evaluate("document.querySelectorAll('img').length") == 0

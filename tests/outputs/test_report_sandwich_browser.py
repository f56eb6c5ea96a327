"""The report of a sandwich spec in a real headless Chromium: the pairs section shows and fits."""

from __future__ import annotations

from pathlib import Path

import pytest

from selector.api import run_spec
from selector.outputs import report
from selector.pipeline.selection import report_studies
from tests.browser import chromium_page

pytestmark = pytest.mark.browser

HATCH = Path(__file__).parents[2] / "examples" / "walkway-hatch.toml"


@pytest.mark.parametrize(("width", "height"), [(1280, 800), (1920, 1080)])
def test_sandwich_section_shows_its_chart_and_fits_the_window(tmp_path, width, height):
    path = tmp_path / "hatch.html"
    report.write_report(
        report_studies(run_spec(HATCH), 0), path, HATCH.read_text(encoding="utf-8"), HATCH.name
    )
    with chromium_page(None, width, height) as log:
        page = log.page
        page.goto(path.as_uri(), wait_until="load")
        page.wait_for_function("document.querySelectorAll('#chart-sandwich .main-svg').length >= 1")
        assert log.console_errors == [] and log.page_errors == [] and log.outside_requests == []
        section = page.locator("section#sandwich")
        section.scroll_into_view_if_needed()
        assert section.is_visible()
        assert "Preliminary selection only" in section.locator(".caution").inner_text()
        table = page.locator("table.sandwich-pairs").bounding_box()
        frame = section.bounding_box()
        assert table is not None and frame is not None
        # nothing clipped: the pairs table stays inside its section and the window
        assert table["x"] >= frame["x"] - 1 and table["x"] + table["width"] <= frame["x"] + frame["width"] + 1
        assert page.evaluate("document.documentElement.scrollWidth") <= width
        page.screenshot(path=str(tmp_path / f"hatch-{width}.png"), full_page=False)

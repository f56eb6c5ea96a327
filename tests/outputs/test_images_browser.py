"""Images through one Chromium: a session shared by several files and by a report's charts."""

from __future__ import annotations

import base64
import re
import struct
import xml.etree.ElementTree as ET
from pathlib import Path

import pytest
from click.testing import CliRunner

from selector.api import run_spec
from selector.cli import cli
from selector.outputs.charts import chart_for_selection, write_chart, writing
from selector.outputs.report import build_report
from selector.pipeline.selection import CAUTION, report_studies
from tests.browser import chromium_page, need_browser

pytestmark = pytest.mark.browser

EXAMPLES = Path(__file__).parents[2] / "examples"


@pytest.fixture
def opened(monkeypatch):
    """Count the browsers started."""
    need_browser("kaleido")
    count = {"n": 0}
    original = writing.ImageSession.open

    def counting(self):
        count["n"] += 1
        original(self)

    monkeypatch.setattr(writing.ImageSession, "open", counting)
    return count


def test_one_session_writes_every_format(tmp_path, opened):
    fig = chart_for_selection(run_spec(EXAMPLES / "camera-dolly-boom.toml"))
    with writing.image_session() as session:
        with writing.image_session() as inner:
            assert inner is session  # nested blocks share the browser
        png = write_chart(fig, tmp_path / "a.png", width=640, height=480, scale=1)
        svg = write_chart(fig, tmp_path / "a.svg")
        pdf = write_chart(fig, tmp_path / "a.pdf")
    assert opened["n"] == 1
    data = png.read_bytes()
    # PNG signature and IHDR size (PNG specification, ISO/IEC 15948)
    assert data[:8] == b"\x89PNG\r\n\x1a\n" and struct.unpack(">II", data[16:24]) == (640, 480)
    assert ET.fromstring(svg.read_bytes()).tag.endswith("svg")
    assert pdf.read_bytes()[:5] == b"%PDF-"  # PDF header (ISO 32000-1, 7.5.2)
    assert writing._OPEN == [] and not session._thread.is_alive()


def test_without_a_session_each_image_starts_its_own_browser(tmp_path, opened):
    fig = chart_for_selection(run_spec(EXAMPLES / "camera-dolly-boom.toml"))
    write_chart(fig, tmp_path / "a.svg")
    write_chart(fig, tmp_path / "b.svg")
    assert opened["n"] == 2 and writing._OPEN == []


def test_static_report_draws_every_chart_as_svg_in_one_session(tmp_path, opened):
    selection = report_studies(run_spec(EXAMPLES / "walkway-hatch.toml"), 0)
    html = build_report(selection, static=True)
    assert opened["n"] == 1
    images = re.findall(
        r'<img id="(chart-[a-z]+)" class="chart-image" alt="[^"]*" src="data:image/svg\+xml;base64,([^"]+)"',
        html,
    )
    assert {name for name, _ in images} == {"chart-property", "chart-tradeoff", "chart-sandwich"}
    for _, data in images:
        assert ET.fromstring(base64.b64decode(data)).tag.endswith("svg")
    assert "Plotly.newPlot" not in html and len(html) < len(build_report(selection)) / 4
    assert CAUTION in html and "Charts are SVG images." in html
    path = tmp_path / "static.html"
    path.write_text(html, encoding="utf-8")
    with chromium_page(None, 1280, 800) as log:
        log.page.goto(path.as_uri(), wait_until="load")
        sizes = log.page.evaluate(
            "[...document.querySelectorAll('img.chart-image')].map(i => i.naturalWidth)"
        )
        assert log.console_errors == [] and log.page_errors == [] and log.outside_requests == []
    assert sizes == [1000, 1000, 1000]


def test_cli_static_charts(tmp_path):
    need_browser("kaleido")
    out = tmp_path / "report.html"
    spec = EXAMPLES / "camera-dolly-boom.toml"
    result = CliRunner().invoke(
        cli, ["report", str(spec), "-o", str(out), "--robust", "0", "--static-charts"], catch_exceptions=False
    )
    assert result.exit_code == 0, result.output
    text = out.read_text(encoding="utf-8")
    assert text.count('class="chart-image"') == 2 and "Plotly.newPlot" not in text

"""Image sessions without a browser: a stand-in session, and the error when Chromium is missing."""

from __future__ import annotations

from pathlib import Path

from click.testing import CliRunner

from selector.api import run_spec
from selector.cli import cli
from selector.outputs.charts import writing
from selector.outputs.report import build_report
from selector.pipeline.selection import report_studies

EXAMPLES = Path(__file__).parents[2] / "examples"
SVG = b'<svg xmlns="http://www.w3.org/2000/svg" width="1" height="1"/>'


class StandIn:
    """Renders every figure as a one-pixel SVG and counts what it was asked."""

    started = 0

    def __init__(self) -> None:
        self.rendered: list[tuple[str, int, int]] = []
        self.closed = False

    def open(self) -> None:
        StandIn.started += 1

    def render(self, fig, fmt, width, height, scale):
        self.rendered.append((fmt, width, height))
        return SVG

    def close(self) -> None:
        self.closed = True


def test_a_static_report_renders_its_charts_in_one_session(monkeypatch):
    monkeypatch.setattr(writing, "ImageSession", StandIn)
    monkeypatch.setattr(StandIn, "started", 0)
    html = build_report(report_studies(run_spec(EXAMPLES / "walkway-hatch.toml"), 0), static=True)
    assert StandIn.started == 1
    assert html.count('class="chart-image"') == 3
    assert writing._OPEN == []


def test_missing_chromium_is_one_clean_error_and_no_file(tmp_path, monkeypatch):
    monkeypatch.setenv("BROWSER_PATH", str(tmp_path / "no-such-chromium"))
    monkeypatch.setenv("PATH", str(tmp_path))
    out = tmp_path / "report.html"
    result = CliRunner().invoke(
        cli,
        [
            "report",
            str(EXAMPLES / "camera-dolly-boom.toml"),
            "-o",
            str(out),
            "--robust",
            "0",
            "--static-charts",
        ],
    )
    assert result.exit_code == 2
    lines = [line for line in result.output.splitlines() if line.strip()]
    assert len(lines) == 1 and lines[0].startswith("error: report charts: ")
    assert "Chromium" in lines[0] or "kaleido" in lines[0]
    assert not out.exists()

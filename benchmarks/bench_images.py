"""Chart images through one Chromium session against one browser per image.

Starting headless Chromium is most of the time an image takes. The library path opens
one ``image_session`` and writes IMAGES chart files (PNG, SVG, PDF, PNG) in it, then
builds a static report (three SVG charts in one session). The baseline, measured in
the same run, is how images were made before sessions: ``kaleido.calc_fig_sync`` per
image, each starting and closing its own browser; for the report, its three charts
rendered that way plus the rest of the report (the interactive build, which needs no
browser). Needs Chromium (Debian: apt-get install chromium).

Targets: the IMAGES files in at most half the baseline's time, and the static report
in at most 0.6 of its baseline.
"""

from __future__ import annotations

import tempfile
from pathlib import Path

from _timing import ROOT, best_of, report

from selector.api import run_spec
from selector.outputs.charts import chart_for_selection
from selector.outputs.charts.writing import image_session, write_chart
from selector.outputs.report import build_report
from selector.outputs.report_sandwich import sandwich_view
from selector.pipeline.selection import report_studies

FORMATS = ("png", "svg", "pdf", "png")
IMAGES = len(FORMATS)
SIZE = {"width": 1100, "height": 760, "scale": 2.0}
FILES_TARGET, REPORT_TARGET = 0.5, 0.6


def one_browser_per_image(fig, fmt: str) -> bytes:
    """The image as the chart writer made it before sessions: a browser of its own."""
    import kaleido

    return kaleido.calc_fig_sync(fig.to_dict(), opts={"format": fmt, **SIZE}, kopts={"mathjax": False})


def main() -> None:
    boom = run_spec(ROOT / "examples" / "camera-dolly-boom.toml")
    fig = chart_for_selection(boom)
    with tempfile.TemporaryDirectory() as folder:
        out = Path(folder)

        def files() -> None:
            with image_session():
                for i, fmt in enumerate(FORMATS):
                    write_chart(fig, out / f"chart{i}.{fmt}", **SIZE)

        one, _ = best_of(lambda: one_browser_per_image(fig, "png"), repeat=2)
        base_files, _ = best_of(lambda: [one_browser_per_image(fig, f) for f in FORMATS], repeat=1)
        ours_files, _ = best_of(files, repeat=2)
    print(f"one PNG with a browser of its own: {one:.2f} s")
    report(
        f"{IMAGES} chart images ({', '.join(FORMATS)})",
        ours_files,
        base_files,
        f"at most {FILES_TARGET:g} x the baseline",
        ours_files <= FILES_TARGET * base_files,
        "one per image",
    )

    hatch = report_studies(run_spec(ROOT / "examples" / "walkway-hatch.toml"), 0)
    figures = [chart_for_selection(hatch), sandwich_view(hatch, "si")["figure"]]
    if hatch.tradeoff is not None:
        from selector.outputs.charts import tradeoff_chart

        points = hatch.tradeoff.points
        figures.append(tradeoff_chart(points, "mass", "cost", front_ids=list(hatch.tradeoff.front["id"])))

    def before() -> None:
        build_report(hatch)
        for f in figures:
            one_browser_per_image(f, "svg")

    base_report, _ = best_of(before, repeat=1)
    ours_report, _ = best_of(lambda: build_report(hatch, static=True), repeat=2)
    report(
        f"static report of the walkway hatch ({len(figures)} SVG charts)",
        ours_report,
        base_report,
        f"at most {REPORT_TARGET:g} x the baseline",
        ours_report <= REPORT_TARGET * base_report,
        "one per image",
    )


if __name__ == "__main__":
    main()

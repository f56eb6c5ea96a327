"""File-level entry points shared by the CLI and the explorer: read a spec, run, write."""

from __future__ import annotations

from collections.abc import Sequence
from pathlib import Path

from selector.errors import OutputError

EXAMPLES = Path(__file__).with_name("examples")
DEMO_SPEC = "camera-dolly-boom.toml"


def check_output(output: str | Path | None, protect: Sequence[str | Path]) -> None:
    """Refuse an output path that is one of the inputs."""
    if not output:
        return
    target = Path(output).resolve()
    for path in protect:
        if Path(path).resolve() == target:
            raise OutputError(str(output), "refusing to write over an input file; choose another name")


def run_spec(
    spec_path: str | Path,
    files: Sequence[str] = (),
    no_builtin: bool = False,
    conservative: bool = False,
    index: str | None = None,
    protect: Sequence[str | Path] = (),
    output: str | Path | None = None,
):
    """Load a spec and its materials, run the pipeline, return the Selection."""
    from selector.materials import load_materials
    from selector.selection import select
    from selector.spec import load_spec

    check_output(output, protect)
    spec = load_spec(spec_path)
    base = Path(spec_path).parent
    spec_files = [str(base / f) for f in spec.materials.files]
    check_output(output, spec_files)
    builtin = spec.materials.builtin and not no_builtin
    table = load_materials([*spec_files, *files], builtin=builtin)
    return select(spec, table, conservative=conservative, index=index)


def run_demo(out_dir: Path, robust_draws: int | None = None):
    """Run the bundled demo spec and write its files into ``out_dir``.

    Writes ``shortlist.csv``, the property chart ``chart.html`` and the HTML report
    ``report.html``; returns (selection, paths).
    """
    from selector import tables
    from selector.charts import chart_for_selection, write_chart
    from selector.export import write_text_atomic
    from selector.report import DEFAULT_REPORT_DRAWS, write_report

    spec_path = EXAMPLES / DEMO_SPEC
    selection = run_spec(spec_path)
    try:
        out_dir.mkdir(parents=True, exist_ok=True)
    except OSError as exc:
        raise OutputError(str(out_dir), f"cannot create the folder ({exc.strerror})") from None
    written = []
    csv_path = out_dir / "shortlist.csv"
    write_text_atomic(csv_path, tables.render_selection(selection, "csv", selection.spec.units) + "\n")
    written.append(csv_path)
    chart_path = out_dir / "chart.html"
    write_chart(chart_for_selection(selection), chart_path)
    written.append(chart_path)
    report_path = out_dir / "report.html"
    draws = DEFAULT_REPORT_DRAWS if robust_draws is None else robust_draws
    spec_text = spec_path.read_text(encoding="utf-8")
    write_report(selection, report_path, spec_text, spec_path.name, robust_draws=draws, protect=[spec_path])
    written.append(report_path)
    return selection, written

"""File-level entry points shared by the CLI and the explorer: read a spec, run, write."""

from __future__ import annotations

from collections.abc import Sequence
from pathlib import Path
from typing import TYPE_CHECKING, Any

from selector.errors import OutputError
from selector.inputs.spec import DEMO_SPEC, EXAMPLES
from selector.outputs.files import check_output

if TYPE_CHECKING:
    from selector.pipeline.selection import Selection


def run_spec(
    spec_path: str | Path,
    files: Sequence[str] = (),
    no_builtin: bool = False,
    conservative: bool = False,
    index: str | None = None,
    protect: Sequence[str | Path] = (),
    output: str | Path | None = None,
    **studies: Any,
) -> Selection:
    """Load a spec and its materials, run the pipeline, return the Selection.

    ``studies`` are passed to ``select`` (robust, tradeoff, exchange, seed, distribution, sensitivity).
    """
    from selector.inputs.materials import load_materials
    from selector.inputs.spec import load_spec
    from selector.pipeline.selection import select

    check_output(output, protect)
    spec = load_spec(spec_path)
    spec_files = list(spec.materials.files)  # resolved beside the spec by load_spec
    check_output(output, spec_files)
    builtin = spec.materials.builtin and not no_builtin
    table = load_materials([*spec_files, *files], builtin=builtin)
    return select(spec, table, conservative=conservative, index=index, **studies)


def run_demo(out_dir: Path, robust_draws: int | None = None) -> tuple[Selection, list[Path]]:
    """Run the bundled demo spec and write its files into ``out_dir``.

    Writes ``shortlist.csv``, the property chart ``chart.html`` and the HTML report
    ``report.html``; returns (selection, paths).
    """
    from selector.outputs import tables
    from selector.outputs.charts import chart_for_selection, write_chart
    from selector.outputs.export import write_text_atomic
    from selector.outputs.report import DEFAULT_REPORT_DRAWS, write_report
    from selector.pipeline.selection import report_studies

    spec_path = EXAMPLES / DEMO_SPEC
    draws = DEFAULT_REPORT_DRAWS if robust_draws is None else robust_draws
    selection = report_studies(run_spec(spec_path), draws)
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
    spec_text = spec_path.read_text(encoding="utf-8")
    write_report(selection, report_path, spec_text, spec_path.name, protect=[spec_path])
    written.append(report_path)
    return selection, written


def report_from_spec(
    spec_path: str | Path,
    output: str | Path,
    files: Sequence[str] = (),
    no_builtin: bool = False,
    units: str | None = None,
    robust_draws: int | None = None,
    seed: int | None = None,
    static: bool = False,
) -> Path:
    """Run a spec file and write its report to ``output`` (checked before any work is done).

    ``static`` draws the charts as SVG images instead of interactive ones."""
    from selector.outputs.files import ensure_folder
    from selector.outputs.report import DEFAULT_REPORT_DRAWS, check_report_path, write_report
    from selector.pipeline.selection import report_studies

    draws = DEFAULT_REPORT_DRAWS if robust_draws is None else robust_draws

    protect = [spec_path, *files]
    check_output(output, protect)
    target = check_report_path(output)
    ensure_folder(target)
    selection = run_spec(spec_path, files, no_builtin, protect=protect, output=target)
    selection = report_studies(selection, draws, seed)
    protect += list(selection.spec.materials.files)
    text = Path(spec_path).read_text(encoding="utf-8")
    return write_report(selection, target, text, Path(spec_path).name, units, protect, static)

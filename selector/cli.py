"""The command line: thin commands that parse, call the library and print.

Heavy modules are imported inside the commands so ``selector --help`` is fast.
"""

from __future__ import annotations

import sys
from pathlib import Path
from typing import IO, TYPE_CHECKING, Any

import click

from selector import __version__
from selector.inputs.properties import FAMILIES

if TYPE_CHECKING:
    from selector.pipeline.selection import Selection

FORMATS = ("table", "csv", "json", "md")
format_option = click.option(
    "--format", "fmt", type=click.Choice(FORMATS), default=None, help="Output format (default: table)."
)
units_option = click.option(
    "--units", type=click.Choice(("si", "us")), default=None, help="Units system for output."
)
wide_option = click.option(
    "--wide", is_flag=True, help="Print every column in full, however wide (default: fit the terminal)."
)


def _width(wide: bool, output: str | None = None) -> int | None:
    """Characters a printed table may use: the terminal's (COLUMNS if set), or None for a file or --wide."""
    import shutil

    return None if wide or output else shutil.get_terminal_size().columns


class UserInputError(click.ClickException):
    """A library ``SelectorError`` as click shows it: ``error: ...`` on stderr, one line per problem."""

    exit_code = 2  # as ``SelectorError.exit_code``: a usage error

    def __init__(self, error: Exception) -> None:
        super().__init__(str(error))
        self.messages = [str(e) for e in getattr(error, "errors", (error,))]

    def show(self, file: IO[Any] | None = None) -> None:
        for message in self.messages:
            click.echo(f"error: {message}", err=True, file=file)


class SelectorGroup(click.Group):
    """A command group that turns user-input errors from the library into click exceptions."""

    def invoke(self, ctx: click.Context) -> Any:
        from selector.errors import SelectorError

        try:
            return super().invoke(ctx)
        except SelectorError as exc:
            raise UserInputError(exc) from exc


def _emit(text: str, output: str | None) -> None:
    if output:
        from selector.outputs.files import write_text_atomic

        write_text_atomic(Path(output), text)
        click.echo(f"wrote {output}", err=True)
    else:
        click.echo(text)


@click.group(cls=SelectorGroup, context_settings={"help_option_names": ["-h", "--help"]})
@click.version_option(__version__, prog_name="selector")
def cli() -> None:
    """Material selection for the concept design of load-bearing parts.

    Screens a table of generic material classes, derives the merit index from
    the design requirement, sizes every candidate and ranks them.
    """


@cli.group()
def materials() -> None:
    """List, show and check material tables."""


@materials.command("list")
@click.option("--family", multiple=True, type=click.Choice(FAMILIES), help="Only this family (repeatable).")
@click.option("--search", default=None, help="Only classes whose id or name contains TEXT.")
@click.option("--materials", "files", multiple=True, type=click.Path(), help="Add a materials file.")
@click.option("--no-builtin", is_flag=True, help="Leave out the built-in table.")
@format_option
@units_option
@wide_option
def materials_list(
    family: tuple[str, ...],
    search: str | None,
    files: tuple[str, ...],
    no_builtin: bool,
    fmt: str | None,
    units: str | None,
    wide: bool,
) -> None:
    """List the material classes."""
    from selector.inputs.materials import load_materials
    from selector.outputs import tables

    table = load_materials(files, builtin=not no_builtin)
    click.echo(tables.render_materials(table, fmt or "table", family, search, units or "si", _width(wide)))


@materials.command("show")
@click.argument("class_id")
@click.option("--materials", "files", multiple=True, type=click.Path(), help="Add a materials file.")
@format_option
@units_option
@wide_option
def materials_show(
    class_id: str, files: tuple[str, ...], fmt: str | None, units: str | None, wide: bool
) -> None:
    """Show every property of one class."""
    from selector.inputs.materials import load_materials
    from selector.outputs import tables

    table = load_materials(files)
    click.echo(tables.render_class(table, class_id, fmt or "table", units or "si", _width(wide)))


@materials.command("check")
@click.argument("file", type=click.Path())
@format_option
def materials_check(file: str, fmt: str | None) -> None:
    """Check a materials file; list every problem (exit 2 if any)."""
    import json

    from selector.inputs.materials import check_materials_file

    problems = check_materials_file(file)
    if fmt == "json":
        click.echo(json.dumps([{"where": p.where, "what": p.what, "expected": p.expected} for p in problems]))
    elif problems:
        for p in problems:
            click.echo(f"error: {p}", err=True)
    if problems:
        click.echo(f"{file}: {len(problems)} problem{'s' if len(problems) != 1 else ''}", err=True)
        sys.exit(2)
    if fmt != "json":
        click.echo(f"{file}: no problems found")


@cli.command()
@click.argument("function")
@click.option("--objective", default="mass", show_default=True, help="mass | cost | co2 | energy | volume")
@click.option(
    "--constraint",
    default="stiffness",
    show_default=True,
    help="stiffness | strength | buckling | fracture | fatigue | frequency",
)
@click.option("--free", default="scale", show_default=True, help="scale | depth | width | thickness | wall")
@click.option("--support", default=None, help="Beam or column end conditions.")
@click.option(
    "--load", default=None, help="Beam load: end | centre | uniform; cylinder: internal | external pressure."
)
@click.option("--criterion", default=None, help="Vessel fracture: leak-before-break | yield-before-break.")
@click.option(
    "--load-ratio",
    type=click.FloatRange(-1, 1, max_open=True),
    default=-1.0,
    show_default=True,
    help="Fatigue: R = min load / max load.",
)
@format_option
@wide_option
def derive(
    function: str,
    objective: str,
    constraint: str,
    free: str,
    support: str | None,
    load: str | None,
    criterion: str | None,
    load_ratio: float,
    fmt: str | None,
    wide: bool,
) -> None:
    """Derive the merit index for FUNCTION and show the steps."""
    from selector.outputs import tables
    from selector.pipeline.derive import derive as run

    result = run(function, constraint, objective, free, support, load, criterion, load_ratio)
    click.echo(tables.render_derivation(result, fmt or "table", _width(wide)))


@cli.command()
@click.argument("spec", type=click.Path())
@click.option(
    "--materials", "files", multiple=True, type=click.Path(), help="Add a materials file (repeatable)."
)
@click.option("--no-builtin", is_flag=True, help="Rank the given materials files alone.")
@click.option("--conservative", is_flag=True, help="Rank by the unfavourable end of each range.")
@click.option("--index", "expression", default=None, help='Rank by a typed index, e.g. "E^0.5/rho".')
@click.option("--top", type=click.IntRange(min=1), default=None, help="Show the best N only.")
@click.option("--all", "show_all", is_flag=True, help="Also list the rejected classes with reasons.")
@click.option(
    "--tradeoff",
    "other",
    default=None,
    help="Second objective for a Pareto front: mass|cost|co2|energy|volume.",
)
@click.option("--exchange", default=None, help='Value of the ranked objective saved, e.g. "40 USD/kg".')
@click.option(
    "--robust", "draws", type=click.IntRange(min=1), default=None, help="Monte Carlo draws over ranges."
)
@click.option("--seed", type=int, default=None, help="Seed for --robust (a fixed default otherwise).")
@click.option(
    "--distribution",
    type=click.Choice(("log-uniform", "triangular", "log-normal")),
    default="log-uniform",
    show_default=True,
    help="How --robust samples each property range.",
)
@format_option
@units_option
@wide_option
@click.option(
    "-o", "--output", type=click.Path(), default=None, help="Write to FILE (format from extension)."
)
def rank(
    spec: str,
    files: tuple[str, ...],
    no_builtin: bool,
    conservative: bool,
    expression: str | None,
    top: int | None,
    show_all: bool,
    other: str | None,
    exchange: str | None,
    draws: int | None,
    seed: int | None,
    distribution: str,
    fmt: str | None,
    units: str | None,
    wide: bool,
    output: str | None,
) -> None:
    """Screen, derive, size and rank the classes for a SPEC file.

    With --tradeoff the Pareto front against a second objective is shown (and a penalty
    ranking with --exchange); with --robust, the odds of each rank under property scatter.
    """
    from selector.api import run_spec
    from selector.errors import InputError
    from selector.outputs import tables

    selection = run_spec(
        spec,
        files,
        no_builtin,
        conservative,
        expression,
        protect=[spec, *files],
        output=output,
        robust=draws,
        tradeoff=None if exchange is not None and other is None else other,
        exchange=exchange,
        seed=seed,
        distribution=distribution,
        sensitivity=True,
    )
    if selection.sandwich is not None and output and str(output).lower().endswith(".html") and not fmt:
        from selector.outputs.charts.sandwich import pairs_chart
        from selector.outputs.charts.writing import write_chart

        write_chart(pairs_chart(selection), output)
        click.echo(f"wrote {output}", err=True)
        return
    fmt = fmt or tables.format_for(output)
    units = units or selection.spec.units
    if exchange is not None and other is None:
        raise InputError(
            "--exchange",
            "an exchange constant needs a second objective",
            "add --tradeoff cost (or mass, co2)",
        )
    if other is not None or draws is not None:
        _show_studies(selection, fmt, units, top, output, _width(wide, output), [spec, *files])
        return
    if selection.sandwich is not None and fmt != "xlsx":
        from selector.outputs.sandwich_tables import render_sandwich

        _emit(render_sandwich(selection, fmt, units, top, _width(wide, output)), output)
        return
    if output and fmt == "xlsx":
        from selector.outputs.export import write_xlsx

        write_xlsx(selection, Path(output), units, protect=[spec, *files])
        click.echo(f"wrote {output}", err=True)
        return
    _emit(tables.render_selection(selection, fmt, units, top, show_all, _width(wide, output)), output)


def _show_studies(
    selection: Selection,
    fmt: str,
    units: str,
    top: int | None,
    output: str | None,
    width: int | None,
    protect: list[str],
) -> None:
    """Print or write every table of the studies: text and JSON whole, CSV one file per table,
    XLSX one sheet per table beside the shortlist's sheets."""
    for error in (selection.tradeoff_error, selection.robust_error):
        if error is not None:
            raise error
    if fmt == "xlsx" and output:
        from selector.outputs.export import write_xlsx

        write_xlsx(selection, Path(output), units, protect=protect, top=top)
        click.echo(f"wrote {output}", err=True)
    elif fmt == "csv":
        from selector.outputs.export import csv_tables, write_csv_tables
        from selector.outputs.studies import study_frames

        frames = study_frames(selection, units, top)
        if output:
            for path in write_csv_tables(frames, Path(output), selection, protect):
                click.echo(f"wrote {path}", err=True)
        else:
            first, *others = csv_tables(frames, selection)
            click.echo(first)
            if others:
                more = ", ".join(list(frames)[1:])
                click.echo(f"also: {more} (-o FILE.csv writes each table, --format json all)", err=True)
    else:
        _emit(_studies(selection, fmt, width, units, top), output)


def _studies(
    selection: Selection, fmt: str, width: int | None = None, units: str = "si", top: int | None = None
) -> str:
    """Text of the trade-off and robustness studies the Selection carries (JSON: one object)."""
    import json

    from selector.outputs.studies import render_robustness, render_tradeoff
    from selector.outputs.tables import short_names
    from selector.outputs.terminal import wrap

    short = short_names(selection.table)
    parts = []
    if selection.tradeoff_error is not None:
        raise selection.tradeoff_error
    if selection.tradeoff is not None:
        study = selection.tradeoff
        parts.append(
            render_tradeoff(study.front, study.second, fmt, study.alpha, study.note, width, short, units, top)
        )
    if selection.robust_error is not None:
        raise selection.robust_error
    if selection.robust is not None:
        parts.append(render_robustness(selection.robust, fmt, selection.sensitivity, width, short, top))
    if fmt == "json":
        asked = (("tradeoff", selection.tradeoff), ("robustness", selection.robust))
        names = [n for n, study in asked if study is not None]
        merged = {name: json.loads(part) for name, part in zip(names, parts, strict=True)}
        stated = {"assumptions": list(selection.assumptions)}
        return json.dumps(merged | stated | {"caution": selection.caution}, indent=2)
    if fmt in (None, "table", "md"):
        parts.append("\n".join(wrap([f"CAUTION: {selection.caution}"], width)))
    return "\n\n".join(parts)


@cli.command()
@click.option("--out", "out_dir", type=click.Path(), default="selector-demo", show_default=True)
@wide_option
def demo(out_dir: str, wide: bool) -> None:
    """Run a bundled example end to end and write its files."""
    from selector.api import run_demo
    from selector.outputs import tables

    selection, written = run_demo(Path(out_dir))
    click.echo(tables.render_selection(selection, "table", selection.spec.units, 10, False, _width(wide)))
    for path in written:
        click.echo(f"wrote {path}")


@cli.command()
@click.argument("shape")
@click.argument("dims", nargs=-1)
@format_option
@units_option
@wide_option
def section(shape: str, dims: tuple[str, ...], fmt: str | None, units: str | None, wide: bool) -> None:
    """Properties of a cross-section: SHAPE DIM=VALUE ... (e.g. i-section b=100mm h=200mm tf=10mm tw=6mm)."""
    from selector.inputs.spec import parse_dimension_args
    from selector.mechanics.sections import build_section
    from selector.outputs.section_table import render_section

    section = build_section(shape, parse_dimension_args(shape, dims))
    click.echo(render_section(section, fmt or "table", units or "si", _width(wide)))


@cli.command()
@click.option("--x", "x_axis", default=None, help="Property or expression on the x axis, e.g. rho.")
@click.option("--y", "y_axis", default=None, help="Property or expression on the y axis, e.g. E.")
@click.option("--spec", type=click.Path(), default=None, help="Show the screens, shortlist, index of SPEC.")
@click.option("--index", default=None, help='Merit index for the index lines, e.g. "E^0.5/rho".')
@click.option("--through", default=None, help="Class id the index line passes through.")
@click.option(
    "--at", "at_value", type=float, default=None, help="Index value of the line, in the table's index unit."
)
@click.option("--top", type=click.IntRange(min=0), default=5, show_default=True, help="Name the best N.")
@click.option("--title", default=None, help="Chart title.")
@click.option("--materials", "files", multiple=True, type=click.Path(), help="Add a materials file.")
@click.option("--no-builtin", is_flag=True, help="Chart the given materials files alone.")
@units_option
@click.option("-o", "--output", type=click.Path(), required=True, help="chart.html, .png, .svg or .pdf")
def chart(
    x_axis: str | None,
    y_axis: str | None,
    spec: str | None,
    index: str | None,
    through: str | None,
    at_value: float | None,
    top: int,
    title: str | None,
    files: tuple[str, ...],
    no_builtin: bool,
    units: str | None,
    output: str,
) -> None:
    """Draw a property chart: every class as a box, with index lines, screens and shortlist."""
    from selector.outputs.charts import chart_for_selection, property_chart, write_chart
    from selector.outputs.files import check_output

    if spec:
        from selector.api import run_spec

        selection = run_spec(spec, files, no_builtin, protect=[spec, *files], output=output)
        fig = chart_for_selection(
            selection, x_axis, y_axis, units, index=index, through=through, at=at_value, top=top, title=title
        )
    else:
        from selector.errors import InputError
        from selector.inputs.materials import load_materials

        if not x_axis or not y_axis:
            raise InputError("chart", "--x and --y are needed without --spec", "e.g. --x rho --y E")
        check_output(output, files)
        table = load_materials(files, builtin=not no_builtin)
        fig = property_chart(
            table, x_axis, y_axis, units=units or "si", index=index, through=through, at=at_value, title=title
        )
    write_chart(fig, Path(output))
    click.echo(f"wrote {output}", err=True)


@cli.command()
@click.argument("spec", type=click.Path())
@click.option(
    "--materials", "files", multiple=True, type=click.Path(), help="Add a materials file (repeatable)."
)
@click.option("--no-builtin", is_flag=True, help="Use the given materials files alone.")
@units_option
@click.option(
    "--robust",
    "draws",
    type=click.IntRange(min=0),
    default=2000,
    show_default=True,
    help="Monte Carlo draws for the robustness figures (0 leaves them out).",
)
@click.option("--seed", type=click.IntRange(min=0), default=None, help="Random seed of the draws.")
@click.option(
    "-o",
    "--output",
    type=click.Path(),
    default="report.html",
    show_default=True,
    help="The report file (.html).",
)
@click.option(
    "--static-charts",
    "static",
    is_flag=True,
    help="Draw the charts as SVG images, without plotly.js (a smaller file for print and archive).",
)
def report(
    spec: str,
    files: tuple[str, ...],
    no_builtin: bool,
    units: str | None,
    draws: int,
    seed: int | None,
    output: str,
    static: bool,
) -> None:
    """Write a self-contained HTML design report for a SPEC file (opens offline, prints cleanly)."""
    from selector.api import report_from_spec

    path = report_from_spec(spec, output, files, no_builtin, units, draws, seed, static)
    click.echo(f"wrote {path}", err=True)


@cli.command()
@click.argument("spec", type=click.Path(), required=False)
@click.option(
    "--port",
    type=click.IntRange(0, 65535),
    default=8050,
    show_default=True,
    help="Port on 127.0.0.1 (0: any free port).",
)
@click.option("--no-browser", is_flag=True, help="Do not open the default web browser.")
def explore(spec: str | None, port: int, no_browser: bool) -> None:
    """Explore a SPEC in a local web page on 127.0.0.1 (a bundled example without SPEC)."""
    from selector.outputs import explore as explorer

    explorer.serve(spec, port, not no_browser, echo=click.echo)


def main() -> None:
    """Entry point: user-input errors (click exceptions, see SelectorGroup) as one line each, exit 2."""
    try:
        cli.main(standalone_mode=False)
        sys.stdout.flush()
    except OSError as exc:  # stdout full or closed: say so once, and keep Python's exit flush quiet
        from selector.outputs.files import silence_stdout

        silence_stdout()
        where = exc.filename or "stdout"
        click.echo(
            f"error: {where}: cannot be written ({exc.strerror}); free some space or write elsewhere",
            err=True,
        )
        sys.exit(2)
    except click.exceptions.Abort:
        click.echo("aborted", err=True)
        sys.exit(1)
    except click.exceptions.ClickException as exc:
        exc.show()
        sys.exit(exc.exit_code)
    except click.exceptions.Exit as exc:
        sys.exit(exc.exit_code)

"""The HTML design report: one self-contained file that opens offline and prints cleanly.

The report only reads a Selection (and, when asked, the robustness odds and the
trade-off front computed from it); it computes no engineering of its own. Every
piece of user text (title, notes, class names, reasons, the spec) is escaped by
jinja2's autoescaping; formulas are written as HTML text, so no MathJax is needed.
plotly.js is embedded once, so the file needs no network.
"""

from __future__ import annotations

import datetime as _dt
import math
import re
from collections.abc import Sequence
from dataclasses import dataclass, replace
from pathlib import Path
from typing import Any

from selector.errors import InputError, SelectorError
from selector.outputs.display_units import text_in_units
from selector.outputs.formula import formula_html, headline_index_pieces, index_pieces, pieces_html
from selector.pipeline import columns

DEFAULT_REPORT_DRAWS = 2000
"""Monte Carlo draws for the robustness figures unless asked otherwise."""
REPORT_EXTENSIONS = (".html", ".htm")
PRICE_FALLBACK = "indicative 2025 USD bands"
CHART_HEIGHT = 640
STATIC_CHART_WIDTH = 1000
"""Width [px] of a chart drawn as an image (the report's text column is about this wide)."""
ROBUST_ROWS = 15
"""Rows of the robustness table (the most likely best first)."""

_EMPHASIS = re.compile(r"\*([^*]+)\*")
_SOURCE_ROW = re.compile(r"^\|\s*`([^`]+)`\s*\|\s*(.+?)\s*\|\s*$")
_PRICE_YEAR = re.compile(r"price-(\d{4})")


def _number(value: Any, digits: int = 3) -> str:
    """A number to ``digits`` significant figures; a dash for a missing one."""
    from selector.inputs.units import format_number

    if value is None:
        return "–"
    try:
        v = float(value)
    except (TypeError, ValueError):
        return str(value)
    return "–" if math.isnan(v) else format_number(v, digits)


def _percent(value: float) -> str:
    return "–" if value is None or math.isnan(value) else f"{100 * value:.1f} %"


@dataclass(frozen=True)
class Provenance:
    """Where the data comes from.

    Attributes:
        sources: (key, description) of each source cited by the classes in the report.
        price_note: the basis of the prices (e.g. "indicative 2025 USD bands").
        user_sources: (file, class name, source text) of classes read from user files.
        unknown: source keys of built-in classes not described in SOURCES.md.
        price_basis: the "Price" paragraph of SOURCES.md, as plain text ("" when absent).
    """

    sources: tuple[tuple[str, str], ...]
    price_note: str
    user_sources: tuple[tuple[str, str, str], ...]
    unknown: tuple[str, ...] = ()
    price_basis: str = ""


def source_keys(text: str) -> dict[str, str]:
    """The ``| `key` | description |`` rows of SOURCES.md as {key: description}."""
    out: dict[str, str] = {}
    for line in text.splitlines():
        match = _SOURCE_ROW.match(line.strip())
        if match and match.group(1) != "key":
            out[match.group(1)] = match.group(2)
    return out


def price_basis(text: str) -> str:
    """The first paragraph under the "## Price" heading of SOURCES.md, markup removed."""
    lines = text.splitlines()
    try:
        start = next(i for i, line in enumerate(lines) if line.strip().lower() == "## price")
    except StopIteration:
        return ""
    body: list[str] = []
    for line in lines[start + 1 :]:
        if line.startswith("#") or (not line.strip() and body):
            break
        if line.strip():
            body.append(line.strip())
    return " ".join(body).replace("**", "")


def _sources_text() -> str:
    from importlib import resources

    try:
        return (resources.files("materials_db") / "SOURCES.md").read_text(encoding="utf-8")
    except (OSError, ModuleNotFoundError):
        return ""


def provenance(table: Any, sources_text: str | None = None) -> Provenance:
    """The sources cited by the classes of ``table`` (built-in keys and user files)."""
    text_of_sources = _sources_text() if sources_text is None else sources_text
    described = source_keys(text_of_sources)
    used: list[str] = []
    user: list[tuple[str, str, str]] = []
    origins = table["origin"] if "origin" in table else ["built-in"] * len(table)
    for origin, name, source in zip(origins, table["name"], table["source"], strict=True):
        text = "" if not isinstance(source, str) else source
        if origin == "built-in":
            for key in (k.strip() for k in text.split(";")):
                if key and key not in used:
                    used.append(key)
        else:
            user.append((str(origin), str(name), text or "no source given"))
    years = sorted({m.group(1) for k in [*used, *described] for m in [_PRICE_YEAR.fullmatch(k)] if m})
    price = f"indicative {years[-1]} USD bands" if years else PRICE_FALLBACK
    return Provenance(
        tuple((k, described[k]) for k in used if k in described),
        price,
        tuple(user),
        tuple(k for k in used if k not in described),
        price_basis(text_of_sources),
    )


def _source_html(text: str) -> Any:
    from markupsafe import Markup, escape

    return Markup(_EMPHASIS.sub(r"<em>\1</em>", str(escape(text))))


def shortlist_rows(selection: Any, units: str) -> tuple[dict[str, Any], list[dict[str, Any]]]:
    """Column headings and one row per ranked candidate, formatted for the page."""
    from selector.outputs.tables import (
        LENGTH_UNIT,
        column_headers,
        selection_frame,
        sized_value_headers,
        split_header,
    )

    frame = selection_frame(selection, units)
    heads = column_headers(selection, units)
    index_col, low_col, high_col = (heads[c] for c in (columns.INDEX, columns.INDEX_LOW, columns.INDEX_HIGH))
    value_cols = sized_value_headers(selection, units)
    kinds = [d.constraint for d in selection.derivations]
    rows = []
    for r in frame.to_dict(orient="records"):
        row = {
            "rank": int(r["rank"]),
            "close": bool(r["close_to_leader"]),
            "name": r["name"],
            "id": r["id"],
            "family": r["family"],
            "status": r["status"],
            "index": _number(r[index_col]),
            "index_range": f"{_number(r[low_col])}–{_number(r[high_col])}",
            "reasons": list(r["reasons"]),
        }
        if selection.has_sizes:
            dims = r["dimensions"] if isinstance(r["dimensions"], dict) else {}
            row["size"] = [f"{k} = {_number(v)}" for k, v in dims.items()]
            row["values"] = [_number(r[c]) for c in value_cols]
            use = r["utilisation"] if isinstance(r["utilisation"], dict) else {}
            governing = r["governing"] if isinstance(r["governing"], str) else ""
            row["utilisation"] = [
                {"kind": k, "value": f"{use[k]:.2f}", "governs": k == governing}
                for k in kinds
                if use.get(k) is not None and math.isfinite(use[k])
            ]
            row["governing"] = governing or "–"
            row["warnings"] = list(r["warnings"]) if isinstance(r["warnings"], list) else []
        rows.append(row)
    header = {
        "index": split_header(index_col)[1],
        "size": LENGTH_UNIT[units],
        "values": [split_header(c) for c in value_cols],
    }
    return header, rows


def _derivation_view(d: Any) -> dict[str, Any]:
    return {
        "constraint": d.constraint,
        "objective": d.objective,
        "case": d.case.title,
        "free": d.geometry.free,
        "equation": formula_html(d.case.equations.get(d.constraint, "")),
        "steps": [formula_html(s) for s in d.steps],
        "index": pieces_html(index_pieces(d)),
    }


def _in_units(texts: Sequence[Any], units: str, quoted: bool = False) -> list[str]:
    """Texts with their quantities in ``units`` (a quotation keeps its own and adds them)."""
    return [text_in_units(str(t), units, quoted) for t in texts]


def _screens_view(selection: Any, units: str) -> dict[str, Any]:
    s = selection.screens
    limits = [{"text": text_in_units(lim.describe(), units), "as_written": lim.text} for lim in s.limits]
    rejected = [
        {"name": r.name, "id": r.id, "family": r.family, "reasons": _in_units(r.reasons, units)}
        for r in selection.rejected[["name", "id", "family", "reasons"]].itertuples(index=False)
    ]
    partly = selection.shortlist
    partly = partly[partly["status"] == "partly"]
    return {
        "limits": limits,
        "families": list(s.families),
        "exclude_families": list(s.exclude_families),
        "exclude": list(s.exclude),
        "rejected": rejected,
        "partly": [
            {"name": r.name, "reasons": _in_units(r.reasons, units)}
            for r in partly[["name", "reasons"]].itertuples(index=False)
        ],
        "total": len(selection.table),
    }


def _robust_view(selection: Any) -> dict[str, Any] | None:
    """The odds table the Selection carries, or a note saying why there is none; None when not asked."""
    if selection.sandwich is not None:
        return {
            "note": "not computed for a sandwich: its pairs are sized at the typical values of their "
            "ranges (a conservative run sizes them at the unfavourable ends instead)"
        }
    if selection.robust is None and selection.robust_error is None:
        return None
    if selection.shortlist.empty:
        return {"note": "no ranked candidates, so there are no odds to estimate"}
    if not selection.derivations or (selection.expression is not None and not selection.sized):
        return {"note": "the ranking uses a typed index; the robustness figures cover derived indices only"}
    if selection.robust_error is not None:
        return {"note": f"the robustness figures could not be computed: {selection.robust_error}"}
    result = selection.robust
    table = result.table.head(ROBUST_ROWS)
    rows = [
        {
            "name": r["name"],
            "rank": int(r["rank"]),
            "p_best": _percent(r["p_best"]),
            "p_best_se": _percent(r["p_best_se"]),
            "p_top_k": _percent(r["p_top_k"]),
            "ranks": f"{int(r['rank_p05'])} – {int(r['rank_p50'])} – {int(r['rank_p95'])}",
            "bar": max(0.0, min(1.0, float(r["p_best"]))),
        }
        for r in table.to_dict(orient="records")
    ]
    better = (
        "higher merit index is better"
        if result.ranked_by == "index"
        else f"lower {result.ranked_by} is better"
    )
    return {
        "rows": rows,
        "draws": result.draws,
        "seed": result.seed,
        "distribution": result.distribution,
        "top_k": result.top_k,
        "properties": ", ".join(result.properties),
        "better": better,
        "shown": len(rows),
        "total": len(result.table),
    }


def _tradeoff_view(selection: Any, units: str) -> dict[str, Any]:
    """The Pareto front of the ranked objective against a second one, with its chart."""
    if not selection.has_sizes:
        return {"note": "parts are not sized (the spec gives no loads), so there is no trade-off to draw"}
    if selection.tradeoff_error is not None:
        return {"note": f"no trade-off: {selection.tradeoff_error}"}
    if selection.tradeoff is None:
        return {"note": "no trade-off study was asked for"}
    from selector.outputs.studies import exchange_unit, objective_unit

    first = selection.spec.objective.minimize
    other = selection.tradeoff.other
    (x_unit, fx), (y_unit, fy) = objective_unit(first, units), objective_unit(other, units)
    front, ranges = selection.tradeoff.front, selection.tradeoff.second
    rows = []
    by_id = ranges.set_index("id") if "id" in ranges else None
    for r in front.to_dict(orient="records"):
        alpha = ""
        if by_id is not None and r["id"] in by_id.index:
            a = by_id.loc[r["id"]]
            lo, hi = a.get("alpha_low"), a.get("alpha_high")
            if lo is not None and hi is not None and not (math.isnan(lo) and math.isnan(hi)):
                unit, fa = exchange_unit(str(a.get("alpha_unit", "")), units)
                alpha = f"{_number(lo * fa)} to {_number(hi * fa)} {unit}"
        x, y = _number(r[first] * fx), _number(r[other] * fy)
        rows.append({"name": r["name"], "x": x, "y": y, "alpha": alpha or "–"})
    chart = None
    try:
        from selector.outputs.charts import tradeoff_chart

        points = selection.tradeoff.points  # sandwich pairs, at their typical values
        what = "sized face × core pairs"
        if points is None:
            points = selection.shortlist
            points = points[points["feasible"]]
            points = points.assign(
                **{f"{first}_low": points["objective_low"], f"{first}_high": points["objective_high"]}
            )
            what = "sized parts"
        shown = {
            col: points[col] * factor
            for name, factor in ((first, fx), (other, fy))
            for col in (name, f"{name}_low", f"{name}_high")
            if col in points and factor != 1.0
        }
        chart = tradeoff_chart(
            points.assign(**shown),
            first,
            other,
            front_ids=[str(i) for i in front["id"]],
            x_title=f"{first} ({x_unit})",
            y_title=f"{other} ({y_unit})",
            title=f"Trade-off: {other} against {first} of the {what}",
        )
    except (ImportError, SelectorError) as exc:
        chart = {"note": f"the trade-off chart could not be drawn: {exc}"}
    return {
        "x": first,
        "y": other,
        "x_unit": x_unit,
        "y_unit": y_unit,
        "rows": rows,
        "chart": chart,
        "assumes": selection.tradeoff.note,
    }


def _property_chart(selection: Any, units: str) -> Any:
    """The property chart; a typed monomial index draws its own index line, in the table's units."""
    try:
        from selector.outputs.charts import chart_for_selection

        typed = selection.expression if selection.index_exponents else None
        return chart_for_selection(selection, units=units, index=typed)
    except (ImportError, SelectorError) as exc:
        return {"note": f"the property chart could not be drawn: {exc}"}


def _chart_html(fig: Any, div_id: str) -> Any:
    """A figure as a <div> and its script (plotly.js itself is embedded once, elsewhere)."""
    from markupsafe import Markup

    if fig is None or isinstance(fig, dict):
        return fig
    import plotly.io as pio

    return Markup(
        pio.to_html(
            fig,
            full_html=False,
            include_plotlyjs=False,
            include_mathjax=False,
            div_id=div_id,
            default_width="100%",
            default_height=f"{CHART_HEIGHT}px",
            config={"displaylogo": False, "responsive": True},
        )
    )


def _chart_image(fig: Any, div_id: str) -> Any:
    """A figure as an SVG image in an <img> (no script runs in it); a note dict passes through."""
    import base64

    from markupsafe import Markup

    from selector.outputs.charts.writing import figure_image

    if fig is None or isinstance(fig, dict):
        return fig
    svg = figure_image(fig, "svg", STATIC_CHART_WIDTH, CHART_HEIGHT, 1.0, "report charts")
    title = fig.layout.title.text or "chart"
    data = base64.b64encode(svg).decode("ascii")
    return Markup('<img id="{}" class="chart-image" alt="{}" src="data:image/svg+xml;base64,{}">').format(
        div_id, title, data
    )


def _embed_charts(figures: dict[str, Any], static: bool) -> dict[str, Any]:
    """Each figure as interactive plotly markup, or as an SVG image with every image from one browser."""
    if not static:
        return {name: _chart_html(fig, f"chart-{name}") for name, fig in figures.items()}
    from selector.outputs.charts.writing import image_session

    with image_session("report charts"):
        return {name: _chart_image(fig, f"chart-{name}") for name, fig in figures.items()}


def _failure_mode_limits(c: Any) -> list[str]:
    """What a fracture, fatigue or frequency constraint states, as the spec wrote it."""
    from selector.mechanics.failure_modes import DEFAULT_GEOMETRY_FACTOR, FULLY_REVERSED

    out = []
    if c.type == "fracture":
        out += [f"crack length a = {c.crack_length}"] if c.crack_length else []
        out.append(f"geometry factor Y = {_number(c.geometry_factor or DEFAULT_GEOMETRY_FACTOR)}")
        out += [f"criterion {c.criterion}"] if c.criterion else []
    if c.type == "fatigue":
        ratio = FULLY_REVERSED if c.load_ratio is None else c.load_ratio
        out.append(
            f"load ratio R = {_number(ratio)}" + (" (fully reversed)" if ratio == -1 else ", Goodman line")
        )
    if c.type == "frequency" and c.min_frequency:
        out.append(f"lowest natural frequency {c.min_frequency}")
    return out


def _summary(selection: Any, units: str) -> list[tuple[str, Any]]:
    spec = selection.spec
    part = spec.part
    facts: list[tuple[str, Any]] = []
    if selection.derivations:
        facts.append(("load case", selection.derivations[0].case.title))
    else:
        facts.append(("function", part.function))
    loads = [
        f"{name} {getattr(part, name)}"
        for name in ("length", "force", "torque", "pressure", "energy", "width", "radius")
        if getattr(part, name)
    ]
    if loads:
        facts.append(("loads and geometry", ", ".join(loads)))
    facts.append(("section", f"{spec.section.shape}, free variable: {spec.section.free}"))
    facts.append(("objective", f"minimise {spec.objective.minimize}"))
    for c in spec.constraint:
        limits = [f"max deflection {c.max_deflection}"] if c.max_deflection else []
        limits += [f"max twist {c.max_twist}"] if c.max_twist else []
        limits += _failure_mode_limits(c)
        if c.type != "frequency":  # a frequency limit carries its margin in min_frequency
            limits.append(f"safety factor {_number(c.safety_factor)}")
        facts.append((f"{c.type} constraint", ", ".join(limits)))
    headline = pieces_html([("text", "M = "), *headline_index_pieces(selection)])
    facts.append(("merit index (maximise)", headline))
    ranked = f"{selection.ranked_by} of the sized part" if selection.sized else "merit index"
    facts.append(("ranked by", ranked))
    facts.append(
        (
            "result",
            f"{len(selection.shortlist)} candidates ranked, {len(selection.rejected)} classes rejected",
        )
    )
    if not selection.shortlist.empty:
        best = selection.shortlist.iloc[0]
        facts.append(("leader", best["name"]))
    facts.append(("units", "SI (mm, kg, MPa)" if units == "si" else "US customary (in, lb, ksi)"))
    return facts


def report_context(
    selection: Any,
    spec_text: str | None = None,
    spec_name: str | None = None,
    units: str | None = None,
    generated: _dt.date | None = None,
    static: bool = False,
) -> dict[str, Any]:
    """Everything the template shows, as plain values (strings, lists, figures).

    With ``static`` the charts are SVG images (rendered in one Chromium session).
    """
    from selector import __version__

    units = units or selection.spec.units
    if units not in ("si", "us"):
        raise InputError("--units", f"{units!r} is not a units system", "si or us")
    if spec_text is None:
        spec_text = selection.spec.model_dump_json(indent=2, exclude_none=True)
        spec_name = spec_name or "spec given in Python (shown as JSON)"
    header, rows = shortlist_rows(selection, units)
    size_warnings = sorted({w for r in rows for w in r.get("warnings", [])})
    trade = _tradeoff_view(selection, units)
    figures = {"property": _property_chart(selection, units), "tradeoff": trade.get("chart")}
    from selector.outputs.report_sandwich import sandwich_view

    sandwich = sandwich_view(selection, units)
    if sandwich is not None:
        figures["sandwich"] = sandwich.pop("figure")
    charts = _embed_charts(figures, static)
    notes = selection.spec.notes
    known = provenance(selection.table)
    if units == "us":  # quoted figures keep their SI value, with the US one beside it
        known = replace(
            known,
            sources=tuple((k, text_in_units(t, units, quoted=True)) for k, t in known.sources),
            user_sources=tuple(
                (f, n, text_in_units(t, units, quoted=True)) for f, n, t in known.user_sources
            ),
        )
    return {
        "title": selection.spec.title,
        "notes": text_in_units(notes, units, quoted=True) if notes else notes,
        "caution": selection.caution,
        "generated": (generated or _dt.date.today()).isoformat(),
        "version": __version__,
        "spec_text": spec_text,
        "spec_name": spec_name or "spec",
        "summary": [
            (k, text_in_units(v, units) if type(v) is str else v) for k, v in _summary(selection, units)
        ],
        "run_notes": _in_units(selection.notes, units),
        "assumptions": _in_units(selection.assumptions, units),
        "derivations": [_derivation_view(d) for d in selection.derivations],
        "typed_index": formula_html(selection.expression) if selection.expression else None,
        "screens": _screens_view(selection, units),
        "sized": selection.has_sizes,
        "ranked_by_value": selection.sized,
        "ranked_by": selection.ranked_by,
        "header": header,
        "rows": rows,
        "size_warnings": size_warnings,
        "charts": charts,
        "static_charts": static,
        "tradeoff": trade,
        "robust": _robust_view(selection),
        "sandwich": sandwich,
        "provenance": known,
        "source_html": _source_html,
    }


def _environment() -> Any:
    from jinja2 import Environment, PackageLoader, StrictUndefined

    env = Environment(
        loader=PackageLoader("selector.outputs", "templates"),
        autoescape=True,
        undefined=StrictUndefined,
        trim_blocks=True,
        lstrip_blocks=True,
    )
    env.filters["formula"] = formula_html
    return env


def _plotly_js() -> str:
    from plotly.offline import get_plotlyjs

    return get_plotlyjs()


def build_report(
    selection: Any,
    spec_text: str | None = None,
    spec_name: str | None = None,
    units: str | None = None,
    generated: _dt.date | None = None,
    static: bool = False,
) -> str:
    """The report as one HTML document (plotly.js inlined once, or SVG charts with ``static``).

    Args:
        selection: the result of ``select``; its robustness and trade-off studies are shown
            (``select(..., robust=DEFAULT_REPORT_DRAWS, tradeoff=SECOND_OBJECTIVE[objective])``).
        spec_text: the spec as written (TOML); without it the validated spec is shown as JSON.
        spec_name: the spec's file name, shown above its text.
        units: "si" or "us" for the tables (the spec's units by default).
        generated: the date printed on the report (today by default).
        static: draw the charts as SVG images and leave plotly.js out (a far smaller file,
            for printing and archiving; needs Chromium, like any image).
    """
    context = report_context(selection, spec_text, spec_name, units, generated, static)
    from markupsafe import Markup

    context["plotly_js"] = Markup("" if static else _plotly_js())
    return _environment().get_template("report.html.j2").render(**context)


def check_report_path(path: str | Path) -> Path:
    """The report path, if its extension is .html or .htm."""
    target = Path(path)
    if target.suffix.lower() not in REPORT_EXTENSIONS:
        raise InputError(
            f"-o {path}",
            f"a report is HTML, not {target.suffix or 'a file with no extension'!r}",
            "a file name ending in .html",
        )
    return target


def write_report(
    selection: Any,
    path: str | Path,
    spec_text: str | None = None,
    spec_name: str | None = None,
    units: str | None = None,
    protect: Sequence[str | Path] = (),
    static: bool = False,
) -> Path:
    """Build the report and write it atomically; refuses to write over any path in ``protect``.

    ``static`` draws the charts as SVG images (see ``build_report``)."""
    from selector.outputs.files import check_output, ensure_folder, write_text_atomic

    check_output(path, protect)
    target = check_report_path(path)
    ensure_folder(target)
    write_text_atomic(target, build_report(selection, spec_text, spec_name, units, static=static))
    return target


__all__ = [
    "DEFAULT_REPORT_DRAWS",
    "Provenance",
    "build_report",
    "formula_html",
    "provenance",
    "report_context",
    "write_report",
]

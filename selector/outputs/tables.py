"""Turn results into tables for people (terminal, Markdown) and machines (CSV, JSON).

Only presentation lives here: unit conversion for display, significant figures,
and the JSON shape in which every physical number carries its unit.
"""

from __future__ import annotations

import json
import math
from collections.abc import Sequence
from typing import Any

import numpy as np
import pandas as pd

from selector.errors import InputError
from selector.inputs.properties import PROPERTIES, RATINGS
from selector.inputs.units import format_number
from selector.outputs import display_units
from selector.outputs.cells import csv_text, markdown_text
from selector.outputs.terminal import Fitted, Layout, Shorten, Step, fit, wrap
from selector.pipeline import columns

SUMMARY_PROPERTIES = ("rho", "E", "sigma_y", "sigma_ts", "T_max", "price")
LENGTH_UNIT = {"si": "mm", "us": "in"}
MASS_UNIT = {"si": "kg", "us": "lb"}
_LENGTH_FACTOR = {"si": 1e3, "us": 1 / display_units.INCH}
_MASS_FACTOR = {"si": 1.0, "us": 1 / display_units.POUND}
_STRESS = {"si": ("MPa", 1e-6), "us": ("ksi", 1 / (1e3 * display_units.PSI))}
ENERGY_UNIT = {"si": ("MJ", 1.0), "us": ("kBtu", 1e3 / display_units.BTU)}
"""Embodied energy of a part: (unit, factor from MJ)."""
ANGLE_UNIT = "deg"


def format_for(path: str | None) -> str:
    """Output format from a file name's extension (table when writing to the terminal)."""
    if not path:
        return "table"
    ext = path.rsplit(".", 1)[-1].lower() if "." in path else ""
    formats = {"csv": "csv", "json": "json", "md": "md", "xlsx": "xlsx", "txt": "table"}
    if ext not in formats:
        raise InputError(
            f"-o {path}", f"unknown file extension {ext!r}", "one of .csv, .json, .md, .xlsx, .txt"
        )
    return formats[ext]


def property_unit(symbol: str, units: str) -> str:
    """Display unit label of a property in the chosen system."""
    prop = PROPERTIES[symbol]
    return prop.us_label if units == "us" else prop.label


def property_values(table: pd.DataFrame, symbol: str, units: str) -> tuple[np.ndarray, np.ndarray]:
    """(low, high) of a property in display units."""
    prop = PROPERTIES[symbol]
    low = table[prop.low].to_numpy(dtype=float)
    high = table[prop.high].to_numpy(dtype=float)
    if units == "us" and prop.us != prop.stored:
        from selector.inputs.units import convert

        low, high = convert(low, prop.stored, prop.us), convert(high, prop.stored, prop.us)
    return low, high


def _people_range(symbol: str, low: float, high: float, units: str) -> tuple[str, str]:
    """(text, unit) of a stored-unit range in the unit that reads best for its size."""
    shown = display_units.range_unit(symbol, high, units)
    if math.isnan(shown.factor):  # an offset unit (temperature): through the unit registry
        one = pd.DataFrame({PROPERTIES[symbol].low: [low], PROPERTIES[symbol].high: [high]})
        lo, hi = property_values(one, symbol, units)
        return _range(float(lo[0]), float(hi[0])), shown.label
    return _range(low * shown.factor, high * shown.factor), shown.label


def _range(low: float, high: float) -> str:
    if np.isnan(low) and np.isnan(high):
        return "n/a"
    if low == high:
        return format_number(low)
    return f"{format_number(low)}–{format_number(high)}"


def materials_frame(
    table: pd.DataFrame, families: Sequence[str] = (), search: str | None = None, units: str = "si"
) -> pd.DataFrame:
    """The classes with every property's low and high in display units (one column each)."""
    rows = table
    if families:
        rows = rows[rows["family"].isin(families)]
    if search:
        text = search.lower()
        rows = rows[
            rows["id"].str.lower().str.contains(text, regex=False)
            | rows["name"].str.lower().str.contains(text, regex=False)
        ]
    out = rows[["id", "name", "family"]].copy()
    for symbol in PROPERTIES:
        unit = property_unit(symbol, units)
        low, high = property_values(rows, symbol, units)
        out[f"{symbol}_low [{unit}]"] = low
        out[f"{symbol}_high [{unit}]"] = high
    for rating in RATINGS:
        out[rating] = rows[rating].to_numpy()
    out["source"] = rows["source"].to_numpy()
    return out.reset_index(drop=True)


def render_materials(
    table: pd.DataFrame,
    fmt: str,
    families: Sequence[str] = (),
    search: str | None = None,
    units: str = "si",
    width: int | None = None,
) -> str:
    """The classes: every column for machines (CSV, JSON), a summary for people, fitted to ``width``."""
    frame = materials_frame(table, families, search, units)
    if fmt not in ("table", "md"):
        return render(frame, fmt)
    chosen = table[table["id"].isin(frame["id"])]
    summary = materials_summary(chosen, units)
    layout = Layout(
        steps=(
            Shorten("name", _shorts(chosen["id"], short_names(chosen))),
            "sigma_ts",
            "T_max",
            "family",
            "price",
            "sigma_y",
        ),
        elide=("name",),
    )
    return render(summary, fmt, width, layout)


def materials_summary(table: pd.DataFrame, units: str = "si") -> pd.DataFrame:
    """A narrow view for people: id, name, family and the ranges of a few key properties."""
    out = table[["id", "name", "family"]].copy()
    for symbol in SUMMARY_PROPERTIES:
        prop = PROPERTIES[symbol]
        highs = table[prop.high].to_numpy(float)
        typical = float(np.nanmedian(highs)) if np.isfinite(highs).any() else float("nan")
        column = display_units.range_unit(symbol, typical, units).label  # the unit most rows read best in
        cells = []
        for lo, hi in zip(table[prop.low].to_numpy(float), table[prop.high].to_numpy(float), strict=True):
            text, unit = _people_range(symbol, float(lo), float(hi), units)
            cells.append(text if unit == column or text == "n/a" else f"{text} {unit}")
        out[f"{symbol} [{column}]"] = cells
    return out.reset_index(drop=True)


def class_frame(table: pd.DataFrame, class_id: str, units: str = "si") -> pd.DataFrame:
    """One class as a property / low / high / unit table."""
    match = table[table["id"] == class_id]
    if match.empty:
        from selector.suggest import CLASS_FALLBACK, class_aliases, did_you_mean

        raise InputError(
            "materials show",
            f"no class with id {class_id!r}",
            did_you_mean(class_id, table["id"], fallback=CLASS_FALLBACK, aliases=class_aliases(table)),
        )
    row = match.iloc[[0]]
    records = [
        {"property": "name", "low": row["name"].iat[0], "high": "", "unit": ""},
        {"property": "family", "low": row["family"].iat[0], "high": "", "unit": ""},
    ]
    for symbol, prop in PROPERTIES.items():
        shown = display_units.range_unit(symbol, float(row[prop.high].iat[0]), units)
        if math.isnan(shown.factor):
            low, high = property_values(row, symbol, units)
        else:
            low, high = (
                row[prop.low].to_numpy(float) * shown.factor,
                row[prop.high].to_numpy(float) * shown.factor,
            )
        records.append(
            {
                "property": f"{symbol} ({prop.name})",
                "low": low[0],
                "high": high[0],
                "unit": shown.label,
            }
        )
    for rating, meaning in RATINGS.items():
        records.append(
            {"property": f"{rating} ({meaning})", "low": row[rating].iat[0], "high": "", "unit": ""}
        )
    for text in ("note", "source", "origin"):
        if text in row:
            value = row[text].iat[0]
            if text == "note" and isinstance(value, str):  # the data's words, often a standard's
                value = display_units.text_in_units(value, units, quoted=True)
            records.append({"property": text, "low": value, "high": "", "unit": ""})
    return pd.DataFrame(records)


TEXT_ROWS = ("note", "source", "origin")
"""Rows of a class's table that hold prose; a terminal shows them below the table, wrapped."""


def render_class(
    table: pd.DataFrame, class_id: str, fmt: str, units: str = "si", width: int | None = None
) -> str:
    """One class in the chosen format; on a terminal its name heads the table and its notes and
    source follow it, wrapped."""
    frame = class_frame(table, class_id, units)
    if fmt != "table":
        return render(frame, fmt)
    prose = frame["property"].isin(TEXT_ROWS) & (frame["low"].astype(str) != "")
    text = [f"{row.property}: {row.low}" for row in frame[prose].itertuples()]
    title = frame["property"] == "name"
    body = render(frame[~prose & ~title], fmt, width, Layout(elide=("low",)))
    name = f"{class_id}: {frame.loc[title, 'low'].iat[0]}"
    return "\n".join([*wrap([name], width), "", body, *([""] if text else []), *wrap(text, width)])


def _cell(value: Any) -> str:
    if isinstance(value, float | np.floating):
        return "n/a" if math.isnan(value) else format_number(float(value))
    if isinstance(value, list | tuple):
        return "; ".join(str(v) for v in value)
    if value is None or value is pd.NA:
        return ""
    return str(value)


def render(frame: pd.DataFrame, fmt: str, width: int | None = None, layout: Layout | None = None) -> str:
    """A frame as a terminal table, CSV, JSON or Markdown.

    A terminal table is fitted to ``width`` characters by ``layout`` (see ``terminal``);
    without a width every column is printed in full.
    """
    if fmt == "csv":
        return csv_text(frame)
    if fmt == "json":
        return json.dumps(_json_records(frame), indent=2, allow_nan=False)
    if fmt == "md":
        cells = _cells(frame)
        header = [str(c) for c in frame.columns]
        lines = [
            "| " + " | ".join(markdown_text(h) for h in header) + " |",
            "|" + "|".join("---" for _ in header) + "|",
        ]
        lines += [
            "| " + " | ".join(markdown_text(c).replace("|", "\\|") for c in row) + " |" for row in cells
        ]
        return "\n".join(lines)
    return fit_frame(frame, width, layout).text


def _cells(frame: pd.DataFrame) -> list[list[str]]:
    return [[_cell(v) for v in row] for row in frame.itertuples(index=False)]


def fit_frame(frame: pd.DataFrame, width: int | None, layout: Layout | None = None) -> Fitted:
    """A frame as a terminal table fitted to ``width`` (``terminal.fit``), with what it shortened."""
    return fit([str(c) for c in frame.columns], _cells(frame), width, layout)


def short_names(table: pd.DataFrame) -> dict[str, str]:
    """Each class id's short name (its name where the table has no short names)."""
    names = table["short_name"] if "short_name" in table else table["name"]
    return dict(zip(table["id"].astype(str), names.astype(str), strict=True))


def _shorts(ids: Any, names: dict[str, str]) -> list[str]:
    return [names.get(str(i), str(i)) for i in ids]


def _json_value(value: Any) -> Any:
    if isinstance(value, float | np.floating):
        return None if not math.isfinite(value) else float(value)
    if isinstance(value, np.integer):
        return int(value)
    if value is pd.NA:
        return None
    return value


def _json_records(frame: pd.DataFrame) -> list[dict[str, Any]]:
    """Records where a column named ``name [unit]`` becomes ``{"value": .., "unit": ..}``."""
    out = []
    for row in frame.to_dict(orient="records"):
        record: dict[str, Any] = {}
        for key, value in row.items():
            name, unit = split_header(key) if isinstance(key, str) else (key, None)
            if unit is not None:
                record[name] = {"value": _json_value(value), "unit": unit}
            else:
                record[key] = _json_value(value)
        out.append(record)
    return out


def render_derivation(d: Any, fmt: str, width: int | None = None) -> str:
    """The derived index and its steps; a terminal's lines are wrapped to ``width``."""
    if fmt == "json":
        return json.dumps(
            {
                "function": d.case.function,
                "load_case": d.case.title,
                "constraint": d.constraint,
                "objective": d.objective,
                "free": d.geometry.free,
                "index": d.exponents,
                "index_text": d.index_text,
                "index_latex": d.index_latex,
                "steps": list(d.steps),
                "steps_latex": list(d.steps_latex),
            },
            indent=2,
        )
    if fmt == "md":
        lines = [
            f"**Merit index:** $M = {d.index_latex}$",
            "",
            *[f"{i}. {s}" for i, s in enumerate(d.steps, 1)],
        ]
        return "\n".join(lines)
    if fmt == "csv":
        return "symbol,exponent\n" + "\n".join(f"{k},{v:g}" for k, v in d.exponents.items())
    lines = [
        f"{d.case.title}: minimise {d.objective}, {d.constraint} constraint, free: {d.geometry.free}",
        "",
    ]
    lines += [f"  {i}. {s}" for i, s in enumerate(d.steps, 1)]
    lines += ["", f"Merit index (maximise): M = {d.index_text}"]
    return "\n".join(wrap(lines, width, indent="     "))


def index_shown(selection: Any, units: str = "si") -> display_units.Shown:
    """The unit the Selection's index is shown in, and its factor from stored units (``display_units``)."""
    exponents = selection.index_exponents
    if exponents is None:
        return display_units.Shown("as typed", 1.0)
    values = selection.shortlist[columns.INDEX].to_numpy(dtype=float)
    return display_units.index_unit(exponents, units, values)


def header(column: str, unit: str) -> str:
    """A display header that carries its unit, e.g. ``mass [kg]``."""
    return f"{column} [{unit}]"


def split_header(label: str) -> tuple[str, str | None]:
    """``"mass [kg]"`` → ("mass", "kg"); a header without a unit → (header, None)."""
    if label.endswith("]") and " [" in label:
        name, unit = label[:-1].split(" [", 1)
        return name, unit
    return label, None


def column_headers(selection: Any, units: str = "si") -> dict[str, str]:
    """The display header of each shortlist column that carries a unit, keyed by its column name."""
    unit = index_shown(selection, units).label
    mu, lu = MASS_UNIT[units], LENGTH_UNIT[units]
    return {
        columns.INDEX: header(columns.INDEX, unit),
        columns.INDEX_LOW: header(columns.INDEX_LOW, unit),
        columns.INDEX_HIGH: header(columns.INDEX_HIGH, unit),
        columns.INDEX_WITH_SHAPE: header(columns.INDEX_WITH_SHAPE, unit),
        columns.MASS: header(columns.MASS, mu),
        columns.COST: header(columns.COST, "USD"),
        columns.CO2: header(columns.CO2, "kg CO2e"),
        columns.ENERGY: header(columns.ENERGY, ENERGY_UNIT[units][0]),
        columns.DEFLECTION: header(columns.DEFLECTION, lu),
        columns.TWIST: header(columns.TWIST, ANGLE_UNIT),
        columns.STRESS: header(columns.STRESS, _STRESS[units][0]),
    }


def sized_value_headers(selection: Any, units: str = "si") -> list[str]:
    """Headers of the per-part totals (mass, cost, CO2) shown beside a sized part; none unsized."""
    if not selection.has_sizes:
        return []
    heads = column_headers(selection, units)
    return [heads[c] for c in columns.sized_values(selection.spec.objective.minimize)]


def selection_frame(selection: Any, units: str = "si", show_all: bool = False) -> pd.DataFrame:
    """The shortlist (and optionally the rejected classes) with units in the headers."""
    table = selection.table if show_all else selection.shortlist
    heads = column_headers(selection, units)
    k = index_shown(selection, units).factor
    out = pd.DataFrame(
        {
            columns.RANK: table[columns.RANK],
            columns.ID: table[columns.ID],
            columns.NAME: table[columns.NAME],
            columns.FAMILY: table[columns.FAMILY],
            columns.STATUS: table[columns.STATUS],
            heads[columns.INDEX]: table[columns.INDEX] * k,
            heads[columns.INDEX_LOW]: table[columns.INDEX_LOW] * k,
            heads[columns.INDEX_HIGH]: table[columns.INDEX_HIGH] * k,
            columns.CLOSE_TO_LEADER: table[columns.CLOSE_TO_LEADER].astype(bool),
        }
    )
    if columns.INDEX_WITH_SHAPE in table and table[columns.INDEX_WITH_SHAPE].notna().any():
        out.insert(
            out.columns.get_loc(columns.CLOSE_TO_LEADER),
            heads[columns.INDEX_WITH_SHAPE],
            table[columns.INDEX_WITH_SHAPE] * k,
        )
    if selection.has_sizes:
        lf, mf = _LENGTH_FACTOR[units], _MASS_FACTOR[units]
        sf = _STRESS[units][1]
        feasible = table[columns.FEASIBLE]
        out[columns.DIMENSIONS] = [
            {k: v * lf for k, v in d.items() if k != "V"} if isinstance(d, dict) else None
            for d in table[columns.DIMENSIONS]
        ]
        out[heads[columns.MASS]] = table[columns.MASS].where(feasible) * mf
        out[heads[columns.COST]] = table[columns.COST].where(feasible)
        out[heads[columns.CO2]] = table[columns.CO2].where(feasible)  # kg CO2e in every system
        if columns.ENERGY in columns.sized_values(selection.spec.objective.minimize):
            out[heads[columns.ENERGY]] = table[columns.ENERGY].where(feasible) * ENERGY_UNIT[units][1]
        out[heads[columns.DEFLECTION]] = table[columns.DEFLECTION].where(feasible) * lf
        if columns.TWIST in table and table[columns.TWIST].notna().any():
            out[heads[columns.TWIST]] = np.degrees(table[columns.TWIST].where(feasible))
        out[heads[columns.STRESS]] = table[columns.STRESS].where(feasible) * sf
        out["utilisation"] = table[columns.UTILISATION]
        out["governing"] = table[columns.GOVERNING]
        if columns.GOVERNING_INDEX in table:
            out["governing_index"] = table[columns.GOVERNING_INDEX]
        out["warnings"] = _texts_in(table[columns.SIZE_WARNINGS], units)
    out["reasons"] = _texts_in(table[columns.REASONS], units)
    return out.reset_index(drop=True)


def assumptions_in(selection: Any, units: str) -> list[str]:
    """The Selection's modelling assumptions with any quantity they state in ``units``."""
    return [display_units.text_in_units(a, units) for a in selection.assumptions]


def _texts_in(texts: pd.Series, units: str) -> list[Any]:
    """Reasons or warnings (lists of text) with their quantities in ``units``."""
    return [
        [display_units.text_in_units(str(t), units) for t in x] if isinstance(x, list | tuple) else x
        for x in texts
    ]


def flat_frame(selection: Any, units: str = "si", show_all: bool = False) -> pd.DataFrame:
    """The shortlist frame with one column per dimension and per constraint's utilisation.

    Columns keep their units in the headers (``d [mm]``, ``mass [kg]``); ``utilisation_<constraint>``
    is the ratio of the constraint's demand to its limit (1 at the limit); reasons and warnings
    are joined with "; ".
    """
    out = selection_frame(selection, units, show_all)
    if "dimensions" in out:
        lu = LENGTH_UNIT[units]
        names = sorted({k for d in out["dimensions"] if isinstance(d, dict) for k in d})
        at = out.columns.get_loc("dimensions")
        for offset, k in enumerate(names):
            values = [d.get(k) if isinstance(d, dict) else None for d in out["dimensions"]]
            out.insert(at + offset, f"{k} [{lu}]", pd.array(values, dtype="Float64").astype(float))
        out = out.drop(columns="dimensions")
    if "utilisation" in out:
        kinds = [d.constraint for d in selection.derivations]
        at = out.columns.get_loc("utilisation")
        for offset, k in enumerate(kinds):
            values = [u.get(k) if isinstance(u, dict) else None for u in out["utilisation"]]
            out.insert(at + offset, f"utilisation_{k}", pd.array(values, dtype="Float64").astype(float))
        out = out.drop(columns="utilisation")
    for col in ("warnings", "reasons"):
        if col in out:
            out[col] = ["; ".join(v) if isinstance(v, list | tuple) else "" for v in out[col]]
    if "rank" in out and out["rank"].notna().all():
        out["rank"] = out["rank"].astype(int)
    if selection.has_sizes:
        out["caution"] = selection.caution
    return out


def render_selection(
    selection: Any,
    fmt: str,
    units: str = "si",
    top: int | None = None,
    show_all: bool = False,
    width: int | None = None,
) -> str:
    """The shortlist in the chosen format; the table form adds the derivation and the caution.

    A terminal table is fitted to ``width`` characters (every column in full when None).
    """
    frame = selection_frame(selection, units, show_all)
    if top:
        frame = frame[(frame["rank"].isna()) | (frame["rank"] <= top)] if show_all else frame.head(top)
    if fmt == "json":
        records = _json_records(frame)
        lu = LENGTH_UNIT[units]
        for r in records:
            if r.get("dimensions"):
                r["dimensions"] = {k: {"value": v, "unit": lu} for k, v in r["dimensions"].items()}
            if "rank" in r and r["rank"] is not None:
                r["rank"] = int(r["rank"])
            if selection.assumptions:
                r["assumptions"] = assumptions_in(selection, units)
            if selection.has_sizes:
                r["caution"] = selection.caution
        return json.dumps(records, indent=2, allow_nan=False, default=_json_value)
    if fmt == "csv":
        flat = flat_frame(selection, units, show_all)
        if top:
            flat = flat[flat["rank"].isna() | (flat["rank"] <= top)] if show_all else flat.head(top)
        return csv_text(flat)
    shown = _compact(frame, units, column_headers(selection, units), selection.ranking_key)
    body = render(shown, "md" if fmt == "md" else "table", width, _rank_layout(selection, frame, shown))
    if selection.derivations:
        d = selection.derivations[0]
        head = [f"{selection.spec.title}: {d.case.title}; minimise {d.objective}"]
    else:
        head = [selection.spec.title]
    counts = selection.governing_counts
    sized = sum(counts.values())

    def governs(constraint: str) -> str:
        return f" (governs {counts.get(constraint, 0)} of {sized} sized parts)" if sized else ""

    lead = selection.derivations[0].constraint if selection.derivations else ""
    typed = selection.expression is not None
    unit = index_shown(selection, units).label
    stated = f" in {unit}" if selection.index_exponents is not None else TYPED_IN_STORED_UNITS
    head.append(f"merit index (maximise): M = {selection.index_text}{stated}{'' if typed else governs(lead)}")
    shown = selection.derivations[1:] if not typed else selection.derivations
    head += [f"also: {x.constraint} index M = {x.index_text}{governs(x.constraint)}" for x in shown]
    head += [f"note: {display_units.text_in_units(n, units)}" for n in selection.notes]
    ranked = "ranked by " + (f"{selection.ranked_by} of the sized part" if selection.sized else "merit index")
    foot = [
        f"{len(selection.shortlist)} candidates ({ranked}); {len(selection.rejected)} rejected"
        + ("" if show_all else " (--all lists them with reasons)"),
        "* its "
        + ("objective" if selection.sized else "index")
        + " range overlaps the leader's: too close to call",
        "",
        *(f"assumes: {a}" for a in assumptions_in(selection, units)),
        *([""] if selection.assumptions else []),
        f"CAUTION: {selection.caution}",
    ]
    if fmt == "md":
        head = [markdown_text(line) for line in head]
        foot = [markdown_text(line) for line in foot]
    return "\n".join([*wrap(head, width), "", body, "", *wrap(foot, width)])


TYPED_IN_STORED_UNITS = ", its value in the table's stored units (GPa, MPa, kg/m³, USD/kg …)"
"""What a typed index that is no single power product is reckoned in (it has no one unit)."""


def _rank_layout(selection: Any, frame: pd.DataFrame, shown: pd.DataFrame) -> Layout:
    """How the rank table narrows.

    Notes go under the table first; then narrower forms that lose nothing the lines above
    do not say (the index unit, stated on the merit index line; the governing constraint's
    name only, its index being listed above; short class names; sizes as ``d×t``); then
    the columns least needed, utilisations first, the objective kept longest.
    """
    objective = selection.ranked_by if selection.sized else None
    names = {split_header(str(c))[0]: split_header(str(c))[1] for c in shown.columns}
    others = tuple(a for a in ("co2", "cost", "mass") if a in names and a != objective)
    index = next(c for c in (columns.INDEX, columns.INDEX_LOW) if c in names)
    symbol = "M" if index == columns.INDEX else "M low"
    steps: list[Step] = [Shorten(index, name=symbol, unit="")]
    if "governing" in names:
        steps.append(Shorten("governing", list(frame["governing"].fillna("–"))))
    if names.get("co2") == "kg CO2e":
        steps.append(Shorten("co2", name="CO2e", unit="kg"))
    steps.append(Shorten("class", _shorts(frame["id"], short_names(selection.table))))
    sizes = _size_product(frame["dimensions"]) if "size" in names else None
    if sizes is not None:
        steps.append(Shorten("size", sizes[1], name=sizes[0]))
    steps += ["utilisation", "family", *others, index, "status", "governing"]
    return Layout(notes=("notes", "reasons"), steps=steps, elide=("class",))


def _size_product(dims: pd.Series) -> tuple[str, list[str]] | None:
    """Sizes written ``90.1×3.6`` under a header ``d×t``, when every sized part has the same dimensions."""
    keys = {tuple(d) for d in dims if isinstance(d, dict)}
    if len(keys) != 1 or not next(iter(keys)):
        return None
    cells = ["×".join(format_number(v) for v in d.values()) if isinstance(d, dict) else "–" for d in dims]
    return "×".join(next(iter(keys))), cells


def _util_text(u: Any) -> str:
    if not isinstance(u, dict):
        return ""
    return ", ".join(f"{k} {v:.2f}" for k, v in u.items())


def _compact(frame: pd.DataFrame, units: str, heads: dict[str, str], ranking_key: str) -> pd.DataFrame:
    """Fewer, narrower columns for people.

    ``heads`` maps column names to their display headers; the index column shown is the low end
    when that is what ranks the shortlist (``ranking_key``), else the typical index.
    """
    index_col = heads[columns.INDEX_LOW if ranking_key == columns.INDEX_LOW else columns.INDEX]
    out = pd.DataFrame(
        {
            "rank": [
                ("" if pd.isna(r) else f"{int(r)}{'*' if c else ''}")
                for r, c in zip(frame["rank"], frame["close_to_leader"], strict=True)
            ],
            "class": frame["name"],
            "family": frame["family"],
            "status": frame["status"],
            index_col: frame[index_col],
        }
    )
    if "dimensions" in frame:
        lu = LENGTH_UNIT[units]
        sizes = [
            " ".join(f"{k}={format_number(v)}" for k, v in d.items()) if isinstance(d, dict) else "–"
            for d in frame["dimensions"]
        ]
        if any(size not in ("", "–") for size in sizes):  # a spring is sized by its volume alone
            out[f"size [{lu}]"] = sizes
        for value in (*columns.SIZED_VALUES, columns.ENERGY):
            if heads[value] in frame:
                out[heads[value]] = frame[heads[value]]
        governing = frame["governing"].fillna("–")
        if "governing_index" in frame:
            governing = [
                f"{g} ({m})" if isinstance(m, str) else g
                for g, m in zip(governing, frame["governing_index"], strict=True)
            ]
        out["governing"] = governing
        out["utilisation"] = [_util_text(u) for u in frame["utilisation"]]
        warned = [w if isinstance(w, list) else [] for w in frame["warnings"]]
        notes = ["; ".join(w) for w in warned]
        # an unsizable part's warnings are also its reasons: show each once
        reasons = [
            "; ".join(x for x in r if x not in w) for r, w in zip(frame["reasons"], warned, strict=True)
        ]
        out["notes"] = ["; ".join(x for x in pair if x) for pair in zip(notes, reasons, strict=True)]
    else:
        out["reasons"] = ["; ".join(r) for r in frame["reasons"]]
    return out

"""Size every candidate class into a real part.

For each class: the smallest part meeting every constraint of the spec, its
dimensions, mass, cost, CO2, deflection and peak stress at the load, each
constraint's utilisation and the governing constraint.

The free variable is solved in closed form from the derived monomials; the
part is then rebuilt as a real section and every utilisation evaluated from
its exact properties. Where the monomial section model is only approximate
(thin-wall formulas, shapes other than a rectangle with one dimension free) a
bracketed 1-D root finder on the exact section corrects the size.
"""

from __future__ import annotations

import functools
import math
from collections.abc import Mapping
from dataclasses import dataclass, field, replace

import numpy as np
import pandas as pd

from selector.errors import InputError
from selector.inputs.properties import DERIVED_PROPERTIES, HIGH_IS_UNFAVOURABLE, PROPERTIES, property_of
from selector.inputs.units import format_number
from selector.mechanics import sections as sec
from selector.mechanics.column_buckling import euler_overestimate, is_stocky
from selector.mechanics.loadcases import LoadCase
from selector.mechanics.objectives import OBJECTIVE_FACTORS
from selector.mechanics.product_forms import WIRE_CLASSES, WIRE_MAX_DIAMETER, minimum_walls
from selector.mechanics.tube_buckling import yield_interaction_note
from selector.numeric import bisect_log
from selector.pipeline import columns
from selector.pipeline.derive import Derivation

MIN_PRACTICAL_WALL = 0.5e-3
"""Walls thinner than this [m] get a warning (common practice for formed or cast parts, no source)."""
THIN_WALL_RATIO = 50.0
"""d/t (or b/t) above which local buckling of a wall should be checked (common practice, no source)."""
VESSEL_THIN_WALL_RATIO = 10.0
"""r/t below which a vessel's membrane (thin-wall) stresses understate the peak stress at the
bore (common practice, no source; Lamé's thick-cylinder relations apply)."""

DEFAULT_DIMS: dict[str, dict[str, float]] = {
    # Reference proportions when the spec gives none (only ratios matter when the scale is free).
    "generic": {"b": 1.0, "h": 1.0},
    "rectangle": {"b": 1.0, "h": 2.0},
    "round": {"d": 1.0},
    "tube": {"d": 1.0, "t": 0.1},
    "box": {"b": 1.0, "h": 1.5, "t": 0.1},
    "i-section": {"b": 0.5, "h": 1.0, "tf": 0.06, "tw": 0.04},
    "channel": {"b": 0.4, "h": 1.0, "tf": 0.06, "tw": 0.04},
    "angle": {"b": 1.0, "h": 1.0, "t": 0.1},
    "tee": {"b": 1.0, "h": 1.0, "tf": 0.1, "tw": 0.08},
}
SHAPE_CONSTANTS = frozenset({"k_I", "k_Imin", "k_Z", "k_J", "k_Zt"})
"""Section-model symbols with the scale free: I = k_I·A², I_min = k_Imin·A², Z = k_Z·A^1.5, ..."""
CHECK_TOLERANCE = 1e-9
"""Utilisation slack when checking a part whose dimensions are all fixed (free = none)."""
SIZED_COLUMNS = (
    columns.FEASIBLE,
    columns.DIMENSIONS,
    columns.MASS,
    columns.COST,
    columns.CO2,
    columns.ENERGY,
    columns.VOLUME,
    columns.DEFLECTION,
    columns.TWIST,
    columns.STRESS,
    columns.UTILISATION,
    columns.GOVERNING,
    columns.SIZE_WARNINGS,
)
"""Columns ``size_parts`` adds, present even when no class is sized."""
FREE_DIMENSION = {"depth": "h", "width": "b", "thickness": "h", "wall": "t"}
MATERIAL_SYMBOLS = frozenset(PROPERTIES) | frozenset(DERIVED_PROPERTIES)
"""Symbols read from the materials table (stored properties and those the pipeline derives)."""


SCALE_POWER = {"A": 2, "I": 4, "Imin": 4, "Z": 3, "J": 4, "Zt": 3}
"""Power of the linear scale factor by which each section quantity grows."""


def section_quantities(section: sec.Section) -> dict[str, float]:
    """The section quantities the load cases use: A, I, Z, J, Zt [SI]."""
    return {
        "A": section.A,
        "I": section.Ixx,
        "Imin": section.I22,
        "Z": section.Zx,
        "J": section.J,
        "Zt": section.Zt,
    }


def shape_constants(shape: str, dims: Mapping[str, float]) -> dict[str, float]:
    """k_I = I/A², k_Z = Z/A^1.5, k_J = J/A², k_Zt = Zt/A^1.5 of a shape at these proportions."""
    q = section_quantities(build(shape, dims))
    a = q["A"]
    return {
        "k_I": q["I"] / a**2,
        "k_Imin": q["Imin"] / a**2,
        "k_Z": q["Z"] / a**1.5,
        "k_J": q["J"] / a**2,
        "k_Zt": q["Zt"] / a**1.5,
    }


def build(shape: str, dims: Mapping[str, float]) -> sec.Section:
    """A real section; the generic shape is a solid square (sections are immutable, so cached)."""
    return _build(shape, tuple(sorted(dims.items())))


@functools.lru_cache(maxsize=1024)
def _build(shape: str, dims: tuple[tuple[str, float], ...]) -> sec.Section:
    return sec.build_section("rectangle" if shape == "generic" else shape, dict(dims))


@dataclass(frozen=True)
class Design:
    """What the sizing needs beyond the material: loads, limits and the section (SI)."""

    values: dict[str, float]  # F, L, T, p, U, b, r, d, ... and delta, theta, SF per constraint
    limits: dict[str, dict[str, float]]  # constraint type → {delta|theta: ..., SF: ...}
    shape: str
    dims: dict[str, float]  # reference dimensions [m]
    free: str
    ends: str = "typical"  # "typical" (geometric mean of each range) or "unfavourable" (--conservative)
    bounds: dict[str, float] = field(default_factory=dict)  # max_depth, max_width, max_diameter [m]


def missing_inputs(derivations: list[Derivation], design: Design) -> list[str]:
    """Symbols the closed-form sizes need that the spec does not give."""
    need: set[str] = set()
    for d in derivations:
        need |= set(d.solution.symbols) - MATERIAL_SYMBOLS - SHAPE_CONSTANTS
    have = set(design.values) | {k for lim in design.limits.values() for k in lim} | set(design.dims)
    return sorted(need - have)


def _si(table: pd.DataFrame, symbols: set[str], pick: str) -> dict[str, np.ndarray]:
    """Property arrays in SI at the ``low``, ``high`` or ``mid`` (typical value) of each range,
    or at the ``unfavourable`` end (low strength and stiffness; high ρ, price, CO2, energy)."""
    out = {}
    for s in symbols & MATERIAL_SYMBOLS:
        prop = property_of(s)
        lo = table[prop.low].to_numpy(dtype=float) * prop.si_factor
        hi = table[prop.high].to_numpy(dtype=float) * prop.si_factor
        worst = hi if s in HIGH_IS_UNFAVOURABLE else lo
        out[s] = {"low": lo, "high": hi, "mid": prop.typical(lo, hi), "unfavourable": worst}[pick]
    return out


SIZING_PROPERTIES = ("E", "G", "sigma_y", "sigma_c", "rho", "price", "co2", "energy")
"""Properties every sized part reads (stiffness, strength, mass and the objectives)."""


def _sizing_ends(design: Design) -> str:
    return "unfavourable" if design.ends == "unfavourable" else "mid"


def _inputs(
    props: Mapping[str, np.ndarray], d: Derivation, design: Design, constants: Mapping[str, float]
) -> dict[str, float | np.ndarray]:
    """What one derivation's monomials read: property values (SI), then the design's
    dimensions, values and constants, then this constraint's limits."""
    values: dict[str, float | np.ndarray] = dict(props)
    for part in (design.dims, design.values, constants, design.limits.get(d.constraint, {})):
        values.update(part)
    return values


WALL_DIMENSIONS = ("t", "tf", "tw")
"""Dimensions thickened when a section is more efficient than its family can be made."""


def size_parts(table: pd.DataFrame, derivations: list[Derivation], design: Design) -> pd.DataFrame:
    """Size every row of ``table``; returns new columns (one row per class, same order).

    With the scale free, a thin-walled section more efficient than a family can
    practically be made (its shape factor above the family's limit) is sized with its
    walls thickened to that limit for the classes of that family.
    ``objective_low`` / ``objective_high`` bound the objective with every property at
    its favourable / unfavourable end of the class range.
    """
    if design.free != "scale" or not derivations[0].case.kind.shape_capped or table.empty:
        return _size_group(table, derivations, design)
    parts = []
    for family, rows in table.groupby("family", sort=False):
        capped = capped_dims(design.shape, design.dims, str(family))
        if capped is None:
            parts.append(_size_group(rows, derivations, design))
            continue
        dims, note = capped
        sized = _size_group(rows, derivations, replace(design, dims=dims))
        sized["size_warnings"] = [
            [note, *w] if isinstance(w, list) else [note] for w in sized["size_warnings"]
        ]
        parts.append(sized)
    return pd.concat(parts).reindex(table.index)


def capped_dims(shape: str, dims: Mapping[str, float], family: str) -> tuple[dict[str, float], str] | None:
    """Proportions with the walls thickened to the family's shape-factor limits, and a note.

    None when the section is already within both limits (bending stiffness and strength)
    or has no walls to thicken.
    """
    from selector.mechanics.shape_limits import max_shape_factor

    walls = [k for k in WALL_DIMENSIONS if k in dims]
    if not walls:
        return None
    limit_e = max_shape_factor(family, "bending_stiffness")
    limit_f = max_shape_factor(family, "bending_strength")

    def thickened(w: float) -> dict[str, float]:
        return {k: v * w if k in walls else v for k, v in dims.items()}

    def within(w: float) -> bool | None:
        try:
            section = build(shape, thickened(w))
        except InputError:
            return None
        return section.phi_bending_stiffness <= limit_e and section.phi_bending_strength <= limit_f

    if within(1.0):
        return None
    lo, hi = 1.0, 2.0
    while within(hi) is False:
        lo, hi = hi, hi * 2
    if within(hi) is None:  # walls would overlap before the limit is reached: find the thickest valid
        valid = float(bisect_log(lambda w: within(w) is None, lo, hi, 60)[0])
        if not within(valid):
            return thickened(valid), f"walls thickened as far as the shape allows for {family}"
        hi = valid
    hi = float(bisect_log(lambda w: bool(within(w)), lo, hi, 60)[1])
    before = build(shape, dims).phi_bending_stiffness
    after = build(shape, thickened(hi)).phi_bending_stiffness
    note = (
        f"walls thickened ×{hi:.2g} to the practical shape limit for {family} "
        f"(shape factor {before:.3g} → {after:.3g})"
    )
    return thickened(hi), note


def _size_group(table: pd.DataFrame, derivations: list[Derivation], design: Design) -> pd.DataFrame:
    """Size every row of ``table`` with one design (one section at given proportions)."""
    constants = design_constants(derivations, design)
    symbols = set().union(*(d.objective_value.symbols | d.solution.symbols for d in derivations))
    mid = _si(table, symbols | set(SIZING_PROPERTIES), _sizing_ends(design))
    x = _governing(
        [
            np.broadcast_to(d.solution.evaluate(_inputs(mid, d, design, constants)), len(table))
            for d in derivations
        ]
    )
    floors = np.maximum(minimum_walls(table).to_numpy(dtype=float), design.values.get("t_min", 0.0))
    rows = [
        _one_part(table.iloc[i], x[i], derivations, design, mid, i, constants, float(floors[i]))
        for i in range(len(table))
    ]
    frame = pd.DataFrame(rows, index=table.index).reindex(columns=SIZED_COLUMNS)
    objective = derivations[0].objective
    case = derivations[0].case
    for column, worst in (("objective_low", False), ("objective_high", True)):
        if design.free == "none":
            # The part is given: only the material factor (ρ, C_m·ρ, CO2·ρ) moves the objective.
            factor = OBJECTIVE_FACTORS[objective]
            props = _si(table, set(factor.symbols), "high" if worst else "low")
            frame[column] = frame["volume"].to_numpy(dtype=float) * factor.evaluate(props)
            continue
        ends = _governing([_objective_at_end(table, d, design, constants, worst) for d in derivations])
        if _approximate(design, case):
            # Scale the closed-form ends by how far the exact part differs from the closed form.
            closed = _governing(
                [_objective_at_mid(d, design, constants, mid, len(table)) for d in derivations]
            )
            with np.errstate(divide="ignore", invalid="ignore"):
                ends = ends * frame[objective].to_numpy(dtype=float) / closed
        frame[column] = ends
    # A part held at its product form's minimum wall is heavier than the closed form says.
    sized = frame[objective].to_numpy(dtype=float)
    frame["objective_high"] = np.fmax(frame["objective_high"].to_numpy(dtype=float), sized)
    return frame


def _objective_at_mid(
    d: Derivation, design: Design, constants: Mapping[str, float], mid: Mapping[str, np.ndarray], n: int
) -> np.ndarray:
    return np.broadcast_to(d.objective_value.evaluate(_inputs(mid, d, design, constants)), n)


def _governing(values: list[np.ndarray]) -> np.ndarray:
    """The largest requirement over the constraints, ignoring those that cannot be evaluated."""
    with np.errstate(invalid="ignore"):
        return np.fmax.reduce(np.vstack(values), axis=0)


def _objective_at_end(
    table: pd.DataFrame, d: Derivation, design: Design, constants: Mapping[str, float], worst: bool
) -> np.ndarray:
    """One constraint's objective with each property at its unfavourable (or favourable) end."""
    props: dict[str, np.ndarray] = {}
    for symbol, power in d.objective_value.powers:
        if symbol in MATERIAL_SYMBOLS:
            props |= _si(table, {symbol}, "high" if (power > 0) == worst else "low")
    return np.broadcast_to(d.objective_value.evaluate(_inputs(props, d, design, constants)), len(table))


def _dims_for(design: Design, x: float, case: LoadCase) -> dict[str, float]:
    ref = dict(design.dims)
    if design.free == "none":
        return ref
    own = case.kind.own_dimension
    if own is not None:
        return {own: x}
    if design.free == "scale":
        area = build(design.shape, ref).A
        factor = math.sqrt(x / area)
        return {k: v * factor for k, v in ref.items()}
    ref[FREE_DIMENSION[design.free]] = x
    return ref


def _wall_key(design: Design, case: LoadCase) -> str | None:
    """The dimension held to the product form's minimum wall, when it is the free one."""
    if design.free == "none":
        return None
    if case.kind.own_dimension == "t":
        return "t"
    return {"thickness": "h", "wall": "t"}.get(design.free)


def _one_part(
    row: pd.Series,
    x: float,
    derivations: list[Derivation],
    design: Design,
    mid: Mapping[str, np.ndarray],
    i: int,
    constants: Mapping[str, float],
    floor: float = 0.0,
) -> dict[str, object]:
    case = derivations[0].case
    props = {k: v[i] for k, v in mid.items()}
    warnings: list[str] = []
    if design.free != "none" and (not np.isfinite(x) or x <= 0):
        return {"feasible": False, "size_warnings": ["cannot be sized (missing property data)"]}
    dims = _dims_for(design, float(x), case)
    geometry = _geometry_values(design, dims, case)
    if geometry is None:
        return {"feasible": False, "size_warnings": ["no valid section of this shape meets the constraints"]}
    if design.free != "none" and _approximate(design, case):
        dims, geometry = _refine(design, dims, derivations, props)
        if geometry is None:
            return {
                "feasible": False,
                "size_warnings": ["no valid section of this shape meets the constraints"],
            }
    euler_dims = dims
    key = _wall_key(design, case)
    if key is not None and dims.get(key, math.inf) < floor:
        warnings.append(
            f"sized at the {floor * 1e3:.3g} mm minimum wall of its product form "
            f"(needs {dims[key] * 1e3:.2g} mm): over-designed"
        )
        dims = dict(dims) | {key: floor}
        geometry = _geometry_values(design, dims, case)
        if geometry is None:
            return {
                "feasible": False,
                "size_warnings": [
                    f"no valid section of this shape has the {floor * 1e3:.3g} mm minimum wall"
                ],
            }
    thinnest = min((dims[k] for k in WALL_DIMENSIONS if k in dims), default=math.inf)
    if design.free == "scale" and case.kind.own_dimension is None and thinnest < floor:
        # At fixed proportions the whole section grows until its thinnest wall can be made.
        grow = floor / thinnest
        warnings.append(
            f"scaled ×{grow:.3g} so its thinnest wall meets the {floor * 1e3:.3g} mm minimum of its "
            f"product form (needs {thinnest * 1e3:.2g} mm): over-designed"
        )
        dims = {k: v * grow for k, v in dims.items()}
        geometry = _geometry_values(design, dims, case) or geometry
    johnson = 1.0
    if case.function == "column" and any(d.constraint == "buckling" for d in derivations):
        dims, geometry, johnson, note, grown = _stocky_column(design, dims, geometry, case, props, euler_dims)
        if grown:
            warnings = []  # grown past any minimum wall: the notes above no longer hold
        warnings += [note] if note else []
    values = dict(design.values) | geometry | props
    util: dict[str, float] = {}
    for d in derivations:
        v = values | design.limits.get(d.constraint, {})
        util[d.constraint] = float(case.utilisation[d.constraint].evaluate(v))
    if "buckling" in util:
        util["buckling"] *= johnson  # Euler's load over the critical load (1 unless stocky)
    governing = max(util, key=util.__getitem__)
    feasible = not (design.free != "none" and johnson > 1 and util["buckling"] > 1 + CHECK_TOLERANCE)
    # a generic section (a tie) made of wire is a bar of its area: d = (4A/π)^½
    wire_d = dims.get("d") or math.sqrt(4 * values.get("A", 0.0) / math.pi)
    if row["id"] in WIRE_CLASSES and wire_d > WIRE_MAX_DIAMETER:
        feasible = False
        warnings.append(
            f"needs d = {format_number(wire_d * 1e3)} mm, thicker than the "
            f"{format_number(WIRE_MAX_DIAMETER * 1e3)} mm its wire data cover"
        )
    if design.free == "none" and util[governing] > 1 + CHECK_TOLERANCE:
        feasible = False
        warnings.append(f"the given part fails {governing} (utilisation {util[governing]:.2f})")
    for d in derivations:
        if d.screen and design.free != "none" and util[d.constraint] > 1 + CHECK_TOLERANCE:
            feasible = False
            warnings.append(
                f"fails {d.constraint} (utilisation {util[d.constraint]:.2f}), which no size can "
                f"change: it needs {d.index_text} above the class's value"
            )
    volume = float(case.volume.evaluate(values))
    mass = volume * props["rho"]
    responses = {
        name: float(m.evaluate(values)) for name, m in case.responses.items() if m.symbols <= set(values)
    }
    warnings += _shape_warnings(design, dims, case, str(row["family"]))
    wall = dims.get("t") or dims.get("tw")
    if wall is not None and wall < MIN_PRACTICAL_WALL:
        warnings.append(f"wall {wall * 1e3:.2g} mm is thinner than a practical minimum of 0.5 mm")
    outer = dims.get("d") or max(dims.get("b", 0.0), dims.get("h", 0.0)) or dims.get("r", 0.0) * 2
    if wall and outer and outer / wall > THIN_WALL_RATIO:
        warnings.append(f"slender wall (ratio {outer / wall:.0f}): check local buckling")
    radius, t = values.get("r"), dims.get("t")
    if case.kind.vessel and radius and t and radius / t < VESSEL_THIN_WALL_RATIO:
        warnings.append(
            f"thick wall (r/t = {radius / t:.2g}, below {VESSEL_THIN_WALL_RATIO:g}): the thin-wall "
            "stress p·r/t understates the stress at the bore; check with Lamé's thick-wall relations"
        )
    if case.kind.vessel and "buckling" in util and radius and t:
        demand = responses.get("stress", 0.0) * design.limits.get("buckling", {}).get("SF", 1.0)
        note = yield_interaction_note(
            props.get("E", math.nan), props.get("sigma_c", math.nan), t, radius, demand
        )
        warnings += [note] if note else []
    return {
        "feasible": feasible,
        "dimensions": dims,
        "mass": mass,
        "cost": mass * props["price"],
        "co2": mass * props["co2"],
        "energy": mass * props["energy"] * 1e-6,  # MJ (the property is J/kg in SI)
        "volume": volume,
        "deflection": responses.get("deflection", float("nan")),
        "twist": responses.get("twist", float("nan")),
        "stress": responses.get("stress", float("nan")),
        "utilisation": util,
        "governing": governing,
        "size_warnings": warnings,
    }


def _stocky_column(
    design: Design,
    dims: dict[str, float],
    geometry: dict[str, float],
    case: LoadCase,
    props: Mapping[str, float],
    euler_dims: Mapping[str, float],
) -> tuple[dict[str, float], dict[str, float], float, str | None, bool]:
    """A column in the inelastic range, grown until the Johnson parabola carries its load.

    ``euler_dims`` is the size Euler's load alone gives (before any minimum wall), the one
    the growth is stated against. Returns the dimensions (grown where the size is free),
    their section quantities, how many times Euler's load overestimates the critical load
    at them (1 when slender), a note for the part (None when slender) and whether it grew.
    """
    strength = float(props.get("sigma_c", math.nan))
    if not math.isfinite(strength) or strength <= 0:
        return (
            dims,
            geometry,
            1.0,
            "σ_c unknown: inelastic (Johnson) buckling of a stocky column not checked",
            False,
        )

    def check(g: float) -> tuple[dict[str, float], dict[str, float], float, float] | None:
        """(dims, section, Johnson utilisation, Euler stress [Pa]) at the free size ×g."""
        trial = _grown(design, dims, g)
        geo = _geometry_values(design, trial, case)
        if geo is None or not geo.get("A"):
            return None
        v = dict(design.values) | geo | dict(props) | design.limits.get("buckling", {})
        euler_stress = float(case.responses["buckling_load"].evaluate(v)) / geo["A"]
        euler_util = float(case.utilisation["buckling"].evaluate(v))
        return trial, geo, euler_util * euler_overestimate(euler_stress, strength), euler_stress

    first = check(1.0)
    if first is None or not is_stocky(first[3], strength):
        return dims, geometry, 1.0, None, False
    stress = (
        f"the Euler stress {format_number(first[3] / 1e6)} MPa is above "
        f"σ_c/2 = {format_number(strength / 2e6)} MPa"
    )
    if design.free == "none" or first[2] <= 1 + CHECK_TOLERANCE:
        note = f"stocky column: {stress}, so buckling is checked on the Johnson parabola"
        return dims, geometry, euler_overestimate(first[3], strength), note, False
    hi = 10.0
    while hi < 1e3 and check(hi) is not None and not _carries(check(hi)):
        hi *= 10.0
    if check(hi) is None:  # past the shape's limit (a wall over the radius): the largest valid size
        hi = float(bisect_log(lambda g: check(g) is None, 1.0, hi, 60)[0])
    grown = check(float(bisect_log(lambda g: _carries(check(g)), 1.0, hi, 60)[1]))
    if grown is None or not _carries(grown):
        note = f"stocky column: {stress}, and no size of this shape carries the load on the Johnson parabola"
        return dims, geometry, euler_overestimate(first[3], strength), note, False
    trial, geo, _util, euler_stress = grown
    key = FREE_DIMENSION.get(design.free) or next(iter(trial))
    growth = trial[key] / euler_dims[key]
    note = (
        f"stocky column: {stress}, so it is sized on the Johnson parabola "
        f"σ_cr = σ_c − σ_c²/(4σ_E), ×{growth:.3g} the Euler size"
    )
    return trial, geo, euler_overestimate(euler_stress, strength), note, True


def _carries(checked: tuple[dict[str, float], dict[str, float], float, float] | None) -> bool:
    return checked is not None and checked[2] <= 1 + CHECK_TOLERANCE


def _grown(design: Design, dims: dict[str, float], g: float) -> dict[str, float]:
    """The dimensions with the free size ×g (every dimension when the scale is free)."""
    if design.free == "scale":
        return {k: v * g for k, v in dims.items()}
    if design.free in FREE_DIMENSION:
        key = FREE_DIMENSION[design.free]
        return dict(dims) | {key: dims[key] * g}
    return dict(dims)


def _shape_warnings(design: Design, dims: dict[str, float], case: LoadCase, family: str) -> list[str]:
    """Warn where the section is more efficient than the family can practically be made."""
    if not case.kind.shape_capped or design.shape in (
        "generic",
        "rectangle",
        "round",
    ):
        return []
    from selector.mechanics.shape_limits import max_shape_factor

    section = build(
        design.shape, design.dims if design.free == "scale" else dims
    )  # φ does not change with scale
    phi, limit = section.phi_bending_stiffness, max_shape_factor(family, "bending_stiffness")
    if phi > limit:
        return [f"shape factor {phi:.3g} exceeds the practical limit of about {limit:g} for {family}"]
    return []


def _approximate(design: Design, case: LoadCase) -> bool:
    """True where the closed-form size came from an approximate section model."""
    # no section shape, or one read through its area alone (a tie), is sized exactly
    exact = case.section_symbols <= {"A"} or design.free == "scale"
    return not (
        exact or (design.free in ("depth", "width", "thickness") and design.shape in ("rectangle", "generic"))
    )


def _geometry_values(design: Design, dims: dict[str, float], case: LoadCase) -> dict[str, float] | None:
    """Section quantities and fixed geometry for evaluating the load case exactly."""
    own = case.kind.own_dimension
    if own is not None:
        return {own: dims[own]} | {s: design.values[s] for s in case.kind.fixed_geometry}
    try:
        if design.free == "scale" and design.dims:
            # Geometrically similar to the reference section: each quantity scales with a power of size.
            name = next(iter(design.dims))
            f = dims[name] / design.dims[name]
            ref = section_quantities(build(design.shape, design.dims))
            quantities = {k: v * f ** SCALE_POWER[k] for k, v in ref.items()}
        else:
            quantities = section_quantities(build(design.shape, dims))
    except InputError:
        return None
    return quantities | {"b": dims.get("b", 0.0)}


def _refine(
    design: Design,
    dims: dict[str, float],
    derivations: list[Derivation],
    props: Mapping[str, float],
) -> tuple[dict[str, float], dict[str, float] | None]:
    """Bisection (in log space) on the free dimension so the largest utilisation is 1."""
    name = FREE_DIMENSION[design.free]
    case = derivations[0].case

    def worst(value: float) -> float:
        trial = dict(dims)
        trial[name] = value
        geo = _geometry_values(design, trial, case)
        if geo is None:
            return math.inf
        vals = dict(design.values) | geo | dict(props)
        return max(
            float(case.utilisation[d.constraint].evaluate(vals | design.limits.get(d.constraint, {})))
            for d in derivations
        )

    lo, hi = dims[name] * 1e-3, dims[name] * 1e3
    if worst(hi) > 1 and not math.isfinite(worst(hi)):
        # Shrink the upper bracket to the largest valid dimension.
        while hi > lo and not math.isfinite(worst(hi)):
            hi /= 1.05
    if worst(hi) > 1:
        return dims, None
    out = dict(dims)
    out[name] = float(bisect_log(lambda m: not worst(m) > 1, lo, hi, 80)[1])
    return out, _geometry_values(design, out, case)


def design_constants(derivations: list[Derivation], design: Design) -> dict[str, float]:
    """Shape constants k_I, k_Z, k_J, k_Zt when the scale is free (none otherwise), as in ``size_parts``."""
    uses_section = derivations[0].case.kind.own_dimension is None
    if uses_section and SHAPE_CONSTANTS & set().union(*(d.solution.symbols for d in derivations)):
        return shape_constants(design.shape, dict(design.dims))
    return {}


def objective_samples(
    derivations: list[Derivation], design: Design, properties: Mapping[str, np.ndarray]
) -> np.ndarray:
    """The closed-form objective of the governing constraint for sampled properties.

    Each derivation's ``objective_value`` monomial (mass [kg], cost [USD], CO2
    [kg CO2e] or volume [m³] of the part that just meets that constraint) is
    evaluated with the spec's loads, limits and section; the largest value over
    the constraints is the one that governs.

    Args:
        derivations: one per constraint of the spec.
        design: loads, limits and section in SI (from ``selection.design_of``).
        properties: property symbol → values in SI units; arrays of any one
            broadcastable shape (e.g. draws × classes).

    Returns:
        The governing objective, broadcast to the shape of the property arrays.
    """
    if not derivations:
        raise ValueError("objective_samples needs at least one derivation")
    if design.free == "none":
        # A given part: its volume is fixed and only the material factor moves the objective.
        case = derivations[0].case
        geometry = _geometry_values(design, dict(design.dims), case) or {}
        volume = float(case.volume.evaluate(dict(design.values) | geometry))
        return np.asarray(volume * OBJECTIVE_FACTORS[derivations[0].objective].evaluate(dict(properties)))
    constants = design_constants(derivations, design)
    result: np.ndarray | None = None
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        for d in derivations:
            value = np.asarray(d.objective_value.evaluate(_inputs(properties, d, design, constants)))
            result = value if result is None else np.fmax(result, value)
    return np.asarray(result)


def screen_samples(
    derivations: list[Derivation], design: Design, properties: Mapping[str, np.ndarray]
) -> np.ndarray | None:
    """True where every size-free check (``Derivation.screen``) passes for sampled properties.

    A screen's utilisation (e.g. f_min/f₁ of a tie's axial mode) does not involve the
    free variable, so it is the product of its material and load/geometry factors
    evaluated with the spec's values. None when the derivations hold no such check.

    Args:
        derivations: one per constraint of the spec.
        design: loads, limits and section in SI.
        properties: property symbol → values in SI units (any one broadcastable shape).
    """
    checks = [d for d in derivations if d.screen]
    if not checks or design.free == "none":
        return None
    constants = design_constants(derivations, design)
    passes: np.ndarray | bool = True
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        for d in checks:
            utilisation = (d.material_factor * d.geometry_factor).evaluate(
                _inputs(properties, d, design, constants)
            )
            passes = passes & (np.asarray(utilisation) <= 1 + CHECK_TOLERANCE)
    return np.asarray(passes)

"""The sandwich pair search: every face × core pair sized by both thicknesses at once.

For each pair that passes the screens, the face thickness t_f and core thickness
t_c that minimise the objective subject to every failure mode of
``mechanics.sandwich`` and the minimum thicknesses. The objective, per unit
b·L, is 2·q_f·t_f + q_c·t_c (q: objective per unit volume of material), and every
mode's utilisation falls as t_f grows at fixed t_c, so for each t_c the least
feasible t_f is found by bisection; the best t_c is then a 1-D search (a log grid,
refined by golden section about its best point). Everything is vectorised over
pairs: arrays are pairs × grid points.
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field

import numpy as np
import pandas as pd

from selector.errors import InputError
from selector.inputs.properties import FAMILIES, PROPERTIES
from selector.inputs.spec import Spec
from selector.mechanics import sandwich as sw
from selector.mechanics.objectives import OBJECTIVE_FACTORS, OBJECTIVE_UNITS
from selector.mechanics.product_forms import CLASS_MIN_WALL, WIRE_CLASSES
from selector.mechanics.stress_states import UNIAXIAL, one_axis_reason
from selector.numeric import bisect_log
from selector.pipeline.applicability import one_axis_mask
from selector.suggest import CLASS_FALLBACK, class_aliases, did_you_mean

DEFAULT_FACE_FAMILIES = ("metal", "composite")
DEFAULT_CORE_FAMILIES = ("foam", "natural")

MIN_FACE: dict[str, float] = {
    # Thinnest face [m] commonly made and bonded in each family (common practice, no source):
    # sheet that survives handling, two plies of prepreg, a veneer.
    "metal": 0.5e-3,
    "composite": 0.25e-3,
    "polymer": 0.5e-3,
    "natural": 1.0e-3,
}
MIN_FACE_OTHER = 1.0e-3
MIN_FACE_CLASS: dict[str, float] = {
    # a metal-matrix composite is rolled like metal sheet, not laid up in plies
    # (common practice, no source)
    "al-sic-mmc": 0.5e-3,
}
MIN_CORE = 5e-3
"""Thinnest core [m] commonly made and bonded (sheet foam, honeycomb, end-grain balsa).

Common practice, no source."""
MAX_CORE_SPAN_RATIO = 0.25
"""The core search ends at L/4; deeper beams leave slender-beam theory (common practice, no source)."""
MAX_FACE_SPAN_RATIO = 0.125
"""The face search ends at L/8, so a face-only (monolithic) part up to L/4 deep is found."""

SANDWICH_FREE = "faces-and-core"
"""The free variable of a sandwich: both thicknesses."""

GRID_POINTS = 32
BISECTIONS = 30
GOLDEN_STEPS = 22
FEASIBLE_SLACK = 1e-6
"""Utilisation slack accepted after bisection (the thickness is rounded up to it)."""


@dataclass(frozen=True)
class SandwichLoads:
    """The loads, limits and bounds of one sandwich spec, in SI.

    Attributes:
        case: the beam constants of the support and load.
        function: "beam" or "panel".
        F: total load [N]; L: span [m]; b: width [m].
        delta: allowed deflection [m] (inf when the spec has no stiffness constraint).
        SF: safety factor on the face and core failure modes.
        objective: mass, cost, co2 or volume.
        min_face, min_core: minimum thicknesses [m] given in the spec (None: by family).
        max_depth: largest overall thickness h = t_c + 2·t_f [m] (inf: none).
    """

    case: sw.SandwichCase
    function: str
    F: float
    L: float
    b: float
    delta: float
    SF: float
    objective: str
    min_face: float | None = None
    min_core: float | None = None
    max_depth: float = math.inf
    conservative: bool = False
    notes: tuple[str, ...] = field(default=())

    @property
    def as_dict(self) -> dict[str, float]:
        return {"F": self.F, "L": self.L, "b": self.b, "delta": self.delta, "SF": self.SF}


@dataclass(frozen=True)
class SandwichResult:
    """The ranked face × core pairs of a sandwich spec.

    Attributes:
        pairs: one row per pair, best first (columns in ``PAIR_COLUMNS``).
        excluded: classes left out as face or core, with the reason (id, name, role, reason).
        loads: the loads and bounds the pairs were sized for.
        objective_unit: unit of the objective column.
        assumptions: what the model assumes, for every output to state.
    """

    pairs: pd.DataFrame
    excluded: pd.DataFrame
    loads: SandwichLoads
    objective_unit: str
    assumptions: tuple[str, ...]
    solid: Mapping[str, object] | None = None
    """The best solid part for the same spec within max_depth: id, name, thickness [m], mass, cost, co2."""

    @property
    def feasible(self) -> pd.DataFrame:
        return self.pairs[self.pairs["feasible"]].reset_index(drop=True)


PAIR_COLUMNS = (
    "rank",
    "face",
    "core",
    "face_name",
    "core_name",
    "face_short",
    "core_short",
    "face_family",
    "core_family",
    "feasible",
    "t_face",
    "t_core",
    "depth",
    "mass",
    "cost",
    "co2",
    "energy",
    "volume",
    "objective",
    "deflection",
    "deflection_bending",
    "deflection_shear",
    "face_stress",
    "utilisation",
    "governing",
    "warnings",
)


def _members(
    table: pd.DataFrame, chosen: Sequence[str] | None, default: tuple[str, ...], where: str
) -> pd.DataFrame:
    """Rows of ``table`` named by families or class ids (``default`` families when None)."""
    names = list(default if chosen is None else chosen)
    ids = set(table["id"])
    for i, name in enumerate(names):
        if name not in FAMILIES and name not in ids:
            raise InputError(
                f"{where}[{i}]",
                f"{name!r} is neither a family nor a class id",
                did_you_mean(
                    name, [*FAMILIES, *sorted(ids)], fallback=CLASS_FALLBACK, aliases=class_aliases(table)
                ),
            )
    return table[table["family"].isin(names) | table["id"].isin(names)]


def _values(table: pd.DataFrame, symbol: str, end: str) -> np.ndarray:
    """One property in SI: the typical value of the range, or its low or high end."""
    prop = PROPERTIES[symbol]
    low = table[prop.low].to_numpy(dtype=float) * prop.si_factor
    high = table[prop.high].to_numpy(dtype=float) * prop.si_factor
    return {"low": low, "high": high, "mid": prop.typical(low, high)}[end]


def _ends(conservative: bool) -> tuple[str, str]:
    """(end for stiffness and strength, end for density, price and CO2)."""
    return ("low", "high") if conservative else ("mid", "mid")


def _objective_per_volume(table: pd.DataFrame, objective: str, end: str) -> np.ndarray:
    factor = OBJECTIVE_FACTORS[objective]
    values = {s: _values(table, s, end) for s in factor.symbols}
    return np.broadcast_to(np.asarray(factor.evaluate(values), dtype=float), len(table)).copy()


def face_properties(faces: pd.DataFrame, objective: str, conservative: bool = False) -> dict[str, np.ndarray]:
    """E, allowable stress min(σ_y, σ_c) [Pa], ρ [kg/m³] and objective per volume of each face class."""
    strong, heavy = _ends(conservative)
    allow = np.fmin(_values(faces, "sigma_y", strong), _values(faces, "sigma_c", strong))
    return {
        "E": _values(faces, "E", strong),
        "allow": allow,
        "rho": _values(faces, "rho", heavy),
        "q": _objective_per_volume(faces, objective, heavy),
    }


def core_properties(cores: pd.DataFrame, objective: str, conservative: bool = False) -> dict[str, np.ndarray]:
    """Out-of-plane E_core, G_core, τ_core [Pa], ρ and q of each core.

    Where a user's table leaves E_core or G_core empty the class is taken as isotropic (E, G).
    """
    strong, heavy = _ends(conservative)
    return {
        "E": np.where(np.isnan(e := _values(cores, "E_core", strong)), _values(cores, "E", strong), e),
        "G": np.where(np.isnan(g := _values(cores, "G_core", strong)), _values(cores, "G", strong), g),
        "tau": _values(cores, "tau_core", strong),
        "rho": _values(cores, "rho", heavy),
        "q": _objective_per_volume(cores, objective, heavy),
    }


def _usable(props: Mapping[str, np.ndarray]) -> np.ndarray:
    return np.logical_and.reduce([np.isfinite(v) & (v > 0) for k, v in props.items() if k != "q"])


def least_face(
    case: sw.SandwichCase,
    loads: Mapping[str, sw.Value],
    faces: Mapping[str, sw.Value],
    cores: Mapping[str, sw.Value],
    t_c: np.ndarray,
    f_min: sw.Value,
    f_max: sw.Value,
) -> np.ndarray:
    """The least t_f [m] in [f_min, f_max] meeting every mode at core thickness t_c; NaN where none does."""
    lo = np.broadcast_to(f_min, np.shape(t_c)).astype(float)
    hi = np.broadcast_to(f_max, np.shape(t_c)).astype(float)
    possible = (hi >= lo) & (sw.max_utilisation(case, loads, faces, cores, hi, t_c) <= 1 + FEASIBLE_SLACK)
    done = sw.max_utilisation(case, loads, faces, cores, lo, t_c) <= 1
    _, upper = bisect_log(
        lambda t_f: sw.max_utilisation(case, loads, faces, cores, t_f, t_c) <= 1,
        lo,
        np.maximum(hi, lo),
        BISECTIONS,
    )
    t_f = np.where(done, lo, upper)
    return np.where(possible, t_f, np.nan)


def optimise_pairs(
    case: sw.SandwichCase,
    loads: Mapping[str, float],
    faces: Mapping[str, np.ndarray],
    cores: Mapping[str, np.ndarray],
    face_min: np.ndarray,
    core_min: np.ndarray,
    face_max: float,
    core_max: float,
    max_depth: float = math.inf,
) -> tuple[np.ndarray, np.ndarray]:
    """(t_f, t_c) [m] minimising 2·q_f·t_f + q_c·t_c for each pair; NaN where no pair is feasible.

    ``faces`` and ``cores`` hold one value per pair (arrays of equal length P).
    """
    f = {k: np.asarray(v, dtype=float)[:, None] for k, v in faces.items()}
    c = {k: np.asarray(v, dtype=float)[:, None] for k, v in cores.items()}
    f["limit"] = np.fmin(f["allow"], sw.wrinkling_stress(f["E"], c["E"], c["G"]))
    f_min = np.asarray(face_min, dtype=float)[:, None]
    c_min = np.asarray(core_min, dtype=float)[:, None]
    c_max = np.minimum(core_max, max_depth - 2 * f_min)
    steps = np.linspace(0.0, 1.0, GRID_POINTS)[None, :]
    log_c = np.log(c_min) + steps * (np.log(np.maximum(c_max, c_min)) - np.log(c_min))

    def cost(log_tc: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        t_c = np.exp(log_tc)
        f_max = np.minimum(face_max, (max_depth - t_c) / 2)
        t_f = least_face(case, loads, f, c, t_c, f_min, f_max)
        value = 2 * f["q"] * t_f + c["q"] * t_c
        return np.where(np.isnan(value), np.inf, value), t_f

    values, _ = cost(log_c)
    best = np.argmin(values, axis=1)
    rows = np.arange(len(best))
    lo = log_c[rows, np.maximum(best - 1, 0)][:, None]
    hi = log_c[rows, np.minimum(best + 1, GRID_POINTS - 1)][:, None]
    best_log = log_c[rows, best][:, None]
    best_value = values[rows, best][:, None]
    ratio = (math.sqrt(5) - 1) / 2
    x1, x2 = hi - ratio * (hi - lo), lo + ratio * (hi - lo)
    v1, v2 = cost(x1)[0], cost(x2)[0]
    for _ in range(GOLDEN_STEPS):
        left = v1 <= v2  # the minimum lies in [lo, x2]; otherwise in [x1, hi]
        lo, hi = np.where(left, lo, x1), np.where(left, x2, hi)
        x1, x2 = (
            np.where(left, hi - ratio * (hi - lo), x2),
            np.where(left, x1, lo + ratio * (hi - lo)),
        )
        v_new = cost(np.where(left, x1, x2))[0]
        v1, v2 = np.where(left, v_new, v2), np.where(left, v1, v_new)
    refined = np.where(v1 <= v2, x1, x2)
    refined_value = np.fmin(v1, v2)
    final_log = np.where(refined_value < best_value, refined, best_log)
    value, t_f = cost(final_log)
    t_c = np.exp(final_log)
    feasible = np.isfinite(value)
    return np.where(feasible, t_f, np.nan)[:, 0], np.where(feasible, t_c, np.nan)[:, 0]


def _excluded_rows(table: pd.DataFrame, usable: np.ndarray, role: str, reason: str) -> pd.DataFrame:
    out = table.loc[~usable, ["id", "name"]].assign(role=role, reason=reason)
    return out.reset_index(drop=True)


def size_pairs(
    screened: pd.DataFrame,
    loads: SandwichLoads,
    faces_chosen: Sequence[str] | None = None,
    cores_chosen: Sequence[str] | None = None,
    face_state: str = UNIAXIAL,
) -> SandwichResult:
    """Size and rank every face × core pair among the classes of ``screened`` not rejected.

    Args:
        screened: the materials table after the screens (``status`` column), qualifying ranges applied.
        loads: loads, limits and bounds in SI.
        faces_chosen, cores_chosen: families or class ids (defaults: metals and composites on
            foams and natural materials).
        face_state: the stress state of the faces (``mechanics.stress_states``); for a biaxial
            one, classes whose data hold along one axis only are left out as faces.
    With ``loads.conservative`` stiffness and strength are taken at the low ends of the
    ranges and density, price and CO2 at the high ends; otherwise at geometric means.
    """
    conservative = loads.conservative
    alive = screened[screened["status"] != "rejected"]
    face_rows = _members(alive, faces_chosen, DEFAULT_FACE_FAMILIES, "sandwich.faces").reset_index(drop=True)
    core_rows = _members(alive, cores_chosen, DEFAULT_CORE_FAMILIES, "sandwich.cores").reset_index(drop=True)
    fp = face_properties(face_rows, loads.objective, conservative)
    cp = core_properties(core_rows, loads.objective, conservative)
    sheet = ~face_rows["id"].isin(WIRE_CLASSES).to_numpy()
    # a panel's faces carry biaxial stress, as a solid panel does: one-axis data do not cover it
    biaxial = face_state != UNIAXIAL
    any_axis = ~one_axis_mask(face_rows).to_numpy() if biaxial else np.ones(len(face_rows), dtype=bool)
    face_ok, core_ok = _usable(fp) & sheet & any_axis, _usable(cp)
    excluded = pd.concat(
        [
            _excluded_rows(face_rows, sheet, "face", "made as round wire, not as sheet for a face"),
            _excluded_rows(
                face_rows, any_axis | ~sheet, "face", one_axis_reason(face_state) if biaxial else ""
            ),
            _excluded_rows(
                face_rows,
                _usable(fp) | ~sheet | ~any_axis,
                "face",
                "missing stiffness, strength or cost data",
            ),
            _excluded_rows(
                core_rows,
                core_ok,
                "core",
                "no core shear strength (tau_core): not made as a core",
            ),
        ],
        ignore_index=True,
    )
    face_rows, core_rows = (
        face_rows[face_ok].reset_index(drop=True),
        core_rows[core_ok].reset_index(drop=True),
    )
    fp = {k: v[face_ok] for k, v in fp.items()}
    cp = {k: v[core_ok] for k, v in cp.items()}
    fi, ci = (
        np.repeat(np.arange(len(face_rows)), len(core_rows)),
        np.tile(np.arange(len(core_rows)), len(face_rows)),
    )
    pf = {k: v[fi] for k, v in fp.items()}
    pc = {k: v[ci] for k, v in cp.items()}
    by_family = face_rows["family"].map(lambda fam: MIN_FACE.get(fam, MIN_FACE_OTHER)).to_numpy(dtype=float)
    # a cast face is no thinner than its casting can be made (product_forms), whatever the spec says
    by_class = face_rows["id"].map(CLASS_MIN_WALL | MIN_FACE_CLASS).fillna(0.0).to_numpy(dtype=float)
    face_min = np.maximum(by_family if loads.min_face is None else loads.min_face, by_class)[fi]
    core_min = np.full(len(fi), loads.min_core if loads.min_core is not None else MIN_CORE)
    case = loads.case
    t_f, t_c = optimise_pairs(
        case,
        loads.as_dict,
        pf,
        pc,
        face_min,
        core_min,
        MAX_FACE_SPAN_RATIO * loads.L,
        MAX_CORE_SPAN_RATIO * loads.L,
        loads.max_depth,
    )
    pairs = _pair_frame(face_rows, core_rows, fi, ci, pf, pc, t_f, t_c, face_min, core_min, loads)
    assumptions = sw.ASSUMPTIONS + ((sw.PANEL_EDGES,) if loads.function == "panel" else ()) + loads.notes
    return SandwichResult(pairs, excluded, loads, OBJECTIVE_UNITS[loads.objective], assumptions)


def _short_names(rows: pd.DataFrame) -> np.ndarray:
    """Each class's short name (its name where the table has none)."""
    names = rows["name"].to_numpy(dtype=object)
    if "short_name" not in rows:
        return names
    short = rows["short_name"].to_numpy(dtype=object)
    return np.array(
        [s if isinstance(s, str) and s else n for s, n in zip(short, names, strict=True)], dtype=object
    )


def _pair_frame(
    face_rows: pd.DataFrame,
    core_rows: pd.DataFrame,
    fi: np.ndarray,
    ci: np.ndarray,
    pf: Mapping[str, np.ndarray],
    pc: Mapping[str, np.ndarray],
    t_f: np.ndarray,
    t_c: np.ndarray,
    face_min: np.ndarray,
    core_min: np.ndarray,
    loads: SandwichLoads,
) -> pd.DataFrame:
    """The table of pairs: thicknesses, mass, cost, CO2, deflection parts, utilisations, ranked."""
    case, lv = loads.case, loads.as_dict
    area = loads.b * loads.L
    util = sw.utilisations(case, lv, pf, pc, t_f, t_c)
    bending, shear = sw.deflection_parts(case, lv["F"], lv["L"], pf["E"], 0.0, pc["G"], lv["b"], t_f, t_c)
    face_volume, core_volume = 2 * t_f * area, t_c * area
    mass = face_volume * pf["rho"] + core_volume * pc["rho"]

    heavy = _ends(loads.conservative)[1]
    cost, co2, energy = (
        area
        * (
            2 * t_f * _objective_per_volume(face_rows, kind, heavy)[fi]
            + t_c * _objective_per_volume(core_rows, kind, heavy)[ci]
        )
        for kind in ("cost", "co2", "energy")
    )
    objective = area * (2 * pf["q"] * t_f + pc["q"] * t_c)
    feasible = np.isfinite(t_f) & np.isfinite(t_c)
    modes = list(sw.MODES)
    stacked = np.stack([util[m] for m in modes], axis=1)
    governing = np.array(modes, dtype=object)[np.argmax(np.nan_to_num(stacked, nan=-1.0), axis=1)]
    frame = pd.DataFrame(
        {
            "face": face_rows["id"].to_numpy()[fi],
            "core": core_rows["id"].to_numpy()[ci],
            "face_name": face_rows["name"].to_numpy()[fi],
            "core_name": core_rows["name"].to_numpy()[ci],
            "face_short": _short_names(face_rows)[fi],
            "core_short": _short_names(core_rows)[ci],
            "face_family": face_rows["family"].to_numpy()[fi],
            "core_family": core_rows["family"].to_numpy()[ci],
            "feasible": feasible,
            "t_face": t_f,
            "t_core": t_c,
            "depth": t_c + 2 * t_f,
            "mass": mass,
            "cost": cost,
            "co2": co2,
            "energy": energy,
            "volume": face_volume + core_volume,
            "objective": np.where(feasible, objective, np.inf),
            "deflection": bending + shear,
            "deflection_bending": bending,
            "deflection_shear": shear,
            "face_stress": sw.face_stress(case, lv["F"], lv["L"], pf["E"], 0.0, lv["b"], t_f, t_c),
        }
    )
    frame["utilisation"] = [dict(zip(modes, row, strict=True)) for row in stacked.tolist()]
    frame["governing"] = np.where(feasible, governing, None)
    frame["warnings"] = [
        _warnings(ok, tf, tc, fmin, cmin, loads)
        for ok, tf, tc, fmin, cmin in zip(feasible, t_f, t_c, face_min, core_min, strict=True)
    ]
    frame = frame.sort_values("objective", kind="stable").reset_index(drop=True)
    frame.insert(0, "rank", np.where(frame["feasible"], np.arange(1, len(frame) + 1), np.nan))
    return frame.reindex(columns=PAIR_COLUMNS)


def _warnings(
    ok: bool, t_f: float, t_c: float, f_min: float, c_min: float, loads: SandwichLoads
) -> list[str]:
    if not ok:
        bound = f"faces ≤ L/8, core ≤ L/4{', depth ≤ max_depth' if math.isfinite(loads.max_depth) else ''}"
        return [f"no thicknesses within the bounds ({bound}) meet every mode"]
    out = sw.validity_warnings(t_f, t_c)
    if t_f <= f_min * (1 + 1e-9):
        out.append(f"faces at the minimum thickness {f_min * 1e3:.2g} mm")
    if t_c <= c_min * (1 + 1e-9):
        out.append(f"core at the minimum thickness {c_min * 1e3:.2g} mm")
    if t_c >= MAX_CORE_SPAN_RATIO * loads.L * (1 - 1e-6):
        out.append("core at the search bound L/4: a deep beam, outside slender-beam theory")
    return out


def sandwich_loads(
    spec: Spec,
    values: Mapping[str, float],
    limits: Mapping[str, Mapping[str, float]],
    conservative: bool = False,
) -> SandwichLoads:
    """The SI loads of a sandwich spec from its parsed values and limits (as ``selection.design_of`` gives).

    Args:
        spec: the validated Spec (its part, objective and ``[sandwich]`` table).
        values: F [N], L [m], b [m] (the width of a panel or the section's b of a beam).
        limits: constraint type → {"delta": allowed deflection [m], "SF": safety factor}.
    """
    from selector.inputs.spec_quantities import si_values

    si = si_values(spec)
    part = spec.part
    missing = [name for name, symbol in (("part.force", "F"), ("part.length", "L")) if symbol not in values]
    if "b" not in values:
        missing.append("part.width" if part.function == "panel" else "section.b")
    if missing:
        raise InputError(
            "spec",
            f"a sandwich is sized for its loads, but {', '.join(missing)} is not given",
            "each of them",
        )
    support = part.support or "simply-supported"
    load = part.load or ("end" if support == "cantilever" else "centre")
    notes = []
    if "strength" not in limits:
        notes.append("no strength constraint: face and core failure modes are checked at safety factor 1")
    if "stiffness" in limits and "delta" not in limits["stiffness"]:
        raise InputError("spec: constraint", "the stiffness constraint has no max_deflection", "e.g. '3 mm'")
    if "stiffness" not in limits:
        notes.append("no stiffness constraint: the deflection is reported but not limited")
    options = spec.sandwich

    def length(name: str) -> float | None:
        text = getattr(options, name, None) if options is not None else None
        where = f"sandwich.{name}"
        if text is None and name == "max_depth":  # one meaning: the overall depth, given in either table
            text, where = spec.section.max_depth, "section.max_depth"
        return None if text is None else si[where]

    return SandwichLoads(
        case=sw.sandwich_case(support, load),
        function=part.function,
        F=values["F"],
        L=values["L"],
        b=values["b"],
        delta=limits.get("stiffness", {}).get("delta", math.inf),
        SF=limits.get("strength", {}).get("SF", 1.0),
        objective=spec.objective.minimize,
        min_face=length("min_face"),
        min_core=length("min_core"),
        max_depth=length("max_depth") or math.inf,
        conservative=conservative,
        notes=tuple(notes),
    )


PAIRS_SIZED_FOR = (
    "each pair keeps the thicknesses that minimise {first}; sized for {other} instead, a pair "
    "could sit lower on the {other} axis"
)
"""What a trade-off among sandwich pairs assumes ({first}: the ranked objective)."""


def pair_candidates(result: SandwichResult) -> pd.DataFrame:
    """The feasible pairs as candidates of a trade-off, best first.

    Columns: ``id`` (face+core), ``name`` ("face on core", short names), ``family`` (the face's),
    ``rank``, mass, cost, co2, energy, volume, ``t_face`` and ``t_core`` [m].
    """
    pairs = result.feasible
    return pd.DataFrame(
        {
            "id": pairs["face"] + "+" + pairs["core"],
            "name": pairs["face_short"] + " on " + pairs["core_short"],
            "family": pairs["face_family"],
            "rank": pairs["rank"].astype(int),
            **{k: pairs[k] for k in ("mass", "cost", "co2", "energy", "volume", "t_face", "t_core")},
        }
    )


def best_solid(shortlist: pd.DataFrame, max_depth: float) -> dict[str, object] | None:
    """The best-ranked solid part of the solid shortlist whose thickness h [m] is within ``max_depth``."""
    for row in shortlist.itertuples(index=False):
        dims = row.dimensions if isinstance(row.dimensions, dict) else {}
        h = dims.get("h")
        if getattr(row, "feasible", False) and h is not None and h <= max_depth:
            keys = ("id", "name", "family", "mass", "cost", "co2", "governing")
            return {k: getattr(row, k) for k in keys} | {"thickness": h}
    return None

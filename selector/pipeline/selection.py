"""The pipeline: spec → screen → derive → size → rank, gathered into one Selection."""

from __future__ import annotations

import math
from dataclasses import dataclass, field, replace
from typing import Any

import numpy as np
import pandas as pd

from selector.errors import InputError, SelectorError
from selector.inputs.expressions import Expression, parse
from selector.inputs.limits import check_safety_factor
from selector.inputs.properties import PROPERTIES
from selector.inputs.spec import Spec
from selector.inputs.spec_quantities import DIMENSION_FIELDS, QUANTITY_FIELDS, si_values
from selector.mechanics.loadcases import part_kind, with_requirement
from selector.mechanics.objectives import OBJECTIVE_UNITS
from selector.mechanics.stress_states import stress_state
from selector.pipeline import failure_limits as fl
from selector.pipeline.applicability import reject_for_product_form, reject_for_stress_state
from selector.pipeline.assumptions import assumptions_for
from selector.pipeline.bounds import BOUND_FIELDS, check_bounds, reject_out_of_bounds
from selector.pipeline.columns import INDEX, INDEX_LOW, INDEX_WITH_SHAPE, constraint_index
from selector.pipeline.derive import Derivation, derive_for_case
from selector.pipeline.governing import canonical_order, governing_counts, lead_with_governing
from selector.pipeline.rank import monomial_index, rank_by_index, rank_by_value, rerank_by_index
from selector.pipeline.robust import RobustResult, robustness
from selector.pipeline.robust import sensitivity as robust_sensitivity
from selector.pipeline.sandwich import (
    PAIRS_SIZED_FOR,
    SANDWICH_FREE,
    SandwichResult,
    best_solid,
    pair_candidates,
    sandwich_loads,
    size_pairs,
)
from selector.pipeline.screen import (
    PARTLY,
    REJECTED,
    Screens,
    apply_screens,
    brittle_rule_applies,
    parse_screens,
    qualifying_ranges,
    reject_brittle,
)
from selector.pipeline.sizing import DEFAULT_DIMS, Design, missing_inputs, size_parts
from selector.pipeline.tradeoff import SECOND_OBJECTIVE, TradeoffStudy, tradeoff_report
from selector.pipeline.variants import IMPLICIT_CONSTRAINTS, case_for

SYMBOL_OF_FIELD = {
    "length": "L",
    "force": "F",
    "torque": "T",
    "pressure": "p",
    "energy": "U",
    "width": "b",
    "radius": "r",
}
FIELD_OF_SYMBOL = {v: k for k, v in SYMBOL_OF_FIELD.items()} | {
    "delta": "max_deflection",
    "theta": "max_twist",
    "d": "section.d",
    "h": "section.h",
    "a": "crack_length",
    "f_min": "min_frequency",
    "L_e": "length and width",
}
CAUTION = (
    "Preliminary selection only: use certified design-allowable data for the chosen grade, "
    "appropriate safety factors, and defer to local codes and licensed engineering review."
)

CONSERVATIVE_NOTE = (
    "conservative: every part is sized and ranked at the unfavourable end of each range it uses "
    "(low E, G, σ_y, σ_c; high ρ, price, CO2, energy)"
)


@dataclass(frozen=True)
class Selection:
    """Everything one run of the pipeline found.

    Attributes:
        spec: the requirement.
        screens: the parsed screens.
        derivations: one per constraint, the first ranks when no loads are given.
        table: every class with status, reasons, index columns, rank and (when sized) the part.
        ranked_by: "index" or the objective (mass, cost, co2, volume) of the sized part.
        has_sizes: the table holds sized parts (the spec gave loads), whatever ranks them.
        objective_unit: unit of the objective columns when sized.
        notes: assumptions and warnings worth showing.
        expression: the typed ranking index as written (None: the derived index ranks).
        design: the design quantities in SI (loads, lengths, limits, section) when the spec
            gives enough of them to size parts, else None.
        parsed_index: ``expression`` parsed (None without a typed index).
        ranking_key: the column the shortlist is ordered by (``index``, ``index_low`` or
            ``objective``).
        tradeoff: the trade-off study asked for with ``select(..., tradeoff=...)``.
        robust: the Monte Carlo odds asked for with ``select(..., robust=draws)``.
        sensitivity: which property's scatter unsettles the leader (with ``sensitivity=True``).
        tradeoff_error, robust_error: why a study that was asked for could not be made.
        assumptions: every modelling assumption behind the result, each once (a sandwich's
            first, then those of the solid parts beside it).
    """

    spec: Spec
    screens: Screens
    derivations: tuple[Derivation, ...]
    table: pd.DataFrame
    ranked_by: str
    objective_unit: str = ""
    notes: tuple[str, ...] = field(default=())
    expression: str | None = None
    has_sizes: bool = False
    caution: str = CAUTION
    sandwich: SandwichResult | None = None
    """The ranked face × core pairs when the section is a sandwich; the table then holds solid parts."""
    design: Design | None = None
    parsed_index: Expression | None = field(default=None, compare=False)
    ranking_key: str = INDEX
    tradeoff: TradeoffStudy | None = None
    robust: RobustResult | None = None
    sensitivity: pd.DataFrame | None = field(default=None, compare=False)
    tradeoff_error: SelectorError | None = None
    robust_error: SelectorError | None = None
    assumptions: tuple[str, ...] = ()
    """The modelling assumptions behind the result (equations and constants, models, what is left out)."""

    @property
    def index_exponents(self) -> dict[str, float] | None:
        """The ranking index as {symbol: exponent}, or None for a typed index that is no monomial."""
        if self.expression is None:
            return self.derivations[0].exponents
        mono = (self.parsed_index or parse(self.expression)).monomial()
        return None if mono is None else mono[1]

    @property
    def index_text(self) -> str:
        return self.expression if self.expression is not None else self.derivations[0].index_text

    @property
    def governing_counts(self) -> dict[str, int]:
        """Constraint → how many ranked candidates it governs (empty without sizes)."""
        return governing_counts(self.table) if self.has_sizes else {}

    @property
    def sized(self) -> bool:
        return self.ranked_by != "index"

    @property
    def shortlist(self) -> pd.DataFrame:
        """The ranked candidates (passes and partly), best first."""
        return self.table[self.table["rank"].notna()].reset_index(drop=True)

    @property
    def rejected(self) -> pd.DataFrame:
        return self.table[self.table["rank"].isna()].reset_index(drop=True)


SIZABLE_SHAPES = ("generic", "rectangle", "round", "tube", "box", "i-section", "channel", "angle", "tee")


def _limits(spec: Spec) -> dict[str, dict[str, float]]:
    """Per constraint type: the allowed deflection or twist [m, rad] and the safety factor."""
    si = si_values(spec)
    twist_case = spec.part.function == "shaft"
    limits: dict[str, dict[str, float]] = {}
    for i, c in enumerate(spec.constraint):
        where = f"constraint[{i}]"
        check_safety_factor(c.safety_factor, f"{where}.safety_factor")
        lim = {"SF": c.safety_factor}
        allowed = ("max_twist" if twist_case else "max_deflection") if c.type == "stiffness" else None
        for key in ("max_deflection", "max_twist"):
            if getattr(c, key) is not None and key != allowed:
                raise InputError(
                    f"{where}.{key}",
                    f"{key} does not apply to the {c.type} constraint of a {spec.part.function}",
                    f"{allowed} instead" if allowed else "no deflection or twist limit on this constraint",
                )
        if c.max_deflection is not None:
            lim["delta"] = si[f"{where}.max_deflection"]
        if c.max_twist is not None:
            lim["theta"] = si[f"{where}.max_twist"]
        limits[c.type] = lim | fl.failure_limits(c, where, spec.part.function, si)
    return limits


def _check_section(fn: str, shape: str, free: str) -> None:
    """Refuse shape and free-variable pairs the sizing cannot honour."""
    kind = part_kind(fn)
    if not kind.takes_section and shape not in ("generic", *kind.shapes):
        uses = kind.shapes
        raise InputError(
            "section.shape",
            f"a {fn} does not use shape = {shape!r}",
            f"one of: {', '.join(uses)}" if uses else f"no shape: a {fn} is sized by its {kind.sized_by}",
        )
    if not kind.takes_section or (free == "none" and shape == "generic"):
        return
    if shape not in SIZABLE_SHAPES:
        raise InputError(
            "section.shape",
            f"{shape!r} sections are analysed by `selector section` but not sized",
            f"one of: {', '.join(SIZABLE_SHAPES)}",
        )
    if shape == "angle" and fn == "beam":
        raise InputError(
            "section.shape",
            "an angle bends about inclined principal axes, so its deflection is not F·L³/(C·E·Ixx)",
            "a section with Ixy = 0 (rectangle, round, tube, box, i-section, channel, tee)",
        )
    if free in ("depth", "width") and shape not in ("generic", "rectangle"):
        raise InputError(
            "section.free",
            f"free = {free!r} is sized for a rectangle, not a {shape}",
            'shape = "rectangle", or free = "scale" for other shapes',
        )
    if free == "wall" and shape != "tube":
        raise InputError(
            "section.free",
            f"free = 'wall' is sized for a tube, not a {shape}",
            'shape = "tube", or free = "scale" for other shapes',
        )


def design_of(spec: Spec, shape: str) -> Design:
    """Loads, limits and section dimensions of a spec, in SI; refuses what cannot be sized."""
    si = si_values(spec)
    values = {SYMBOL_OF_FIELD[name]: si[f"part.{name}"] for name in QUANTITY_FIELDS if f"part.{name}" in si}
    dims = {k: si[f"section.{k}"] for k in spec.section.dims}
    limits = _limits(spec)
    if spec.section.min_wall is not None:
        values["t_min"] = si["section.min_wall"]
    bounds = {name: si[f"section.{name}"] for name in BOUND_FIELDS if getattr(spec.section, name) is not None}
    check_bounds(spec.part.function, shape, bounds)
    if spec.part.function in IMPLICIT_CONSTRAINTS:  # checked on every part, with the SF of ``sf_from``
        implicit, sf_from = IMPLICIT_CONSTRAINTS[spec.part.function]
        limits[implicit] = {"SF": limits.get(sf_from, {}).get("SF", 1.0)}
    fn, free = spec.part.function, spec.section.free
    kind = part_kind(fn)
    values |= fl.derived_geometry(fn, values)
    _check_section(fn, shape, free)
    if fn == "panel":
        shape = "rectangle"
        width = values.get("b", dims.get("b"))
        dims = {"b": width} if width else {}
        if spec.section.t is not None:
            dims["h"] = si["section.t"]
    elif kind.own_dimension is not None:
        if free == "none" and fn == "spring":
            raise InputError(
                "section.free",
                "a spring is sized by its volume; 'none' has nothing to check",
                'free = "scale"',
            )
        dims = {"t": dims["t"]} if "t" in dims else {}
    elif shape == "generic" and free in ("depth", "width"):
        shape = "rectangle"
    if kind.takes_section:
        if free == "scale" and not dims:
            dims = dict(DEFAULT_DIMS.get(shape, {}))
        if free == "depth" and "b" not in dims and "b" in values:
            dims["b"] = values["b"]
    if free == "none":
        # a section shape checks its own dimensions; a panel is a rectangle of width b, thickness h
        own = (kind.own_dimension,) if kind.own_dimension else ("b", "h")
        needed = None if kind.takes_section else own
        given = set(dims)
        if needed is None:
            from selector.pipeline.sizing import build

            if not dims:
                raise InputError(
                    "section.free",
                    "'none' checks a given part, but no dimensions are given",
                    'the section\'s dimensions, e.g. d = "40 mm" and t = "2 mm"',
                )
            build(shape, dims)  # raises InputError naming a missing or inconsistent dimension
        elif not set(needed) <= given:
            names = ", ".join("width" if n == "b" else "t" for n in needed if n not in given)
            raise InputError(
                "section.free",
                f"'none' checks a given part, but {names} is not given",
                "every dimension of the part",
            )
    return Design(values, limits, shape, dims, free, bounds=bounds)


SHAPE_CONSTANT = {"k_I": "bending_stiffness", "k_Imin": "bending_stiffness", "k_Z": "bending_strength"}
"""Shape constant → the shape-limit mode it scales with (k_I = φ_B/12, k_Z = φ_f/6; square: φ = 1)."""


def index_with_shape(table: pd.DataFrame, derivation: Derivation) -> np.ndarray:
    """The merit index with each family's largest practical shape factor built in.

    For a light stiff beam this is (φ_max·E)^(1/2)/ρ, equal to the plain index for a solid
    square (φ = 1); NaN where the index does not depend on a bending shape factor (ties,
    vessels, springs, one dimension free).
    """
    from selector.mechanics.shape_limits import max_shape_factor

    powers = derivation.objective_value.exponents
    material = derivation.material_factor.exponents
    scale = abs(material.get("rho", 0)) or max((abs(v) for v in material.values()), default=1)
    used = [k for k in SHAPE_CONSTANT if powers.get(k)]
    if not used:
        return np.full(len(table), np.nan)
    factor = np.ones(len(table))
    for k in used:
        mode = SHAPE_CONSTANT[k]
        phi = table["family"].map(lambda f, mode=mode: max_shape_factor(f, mode)).to_numpy(dtype=float)
        factor *= phi ** (-float(powers[k]) / float(scale))
    return table[INDEX].to_numpy(dtype=float) * factor


def expression_index(
    table: pd.DataFrame, text: str
) -> tuple[np.ndarray, np.ndarray, np.ndarray, tuple[str, ...]]:
    """(low, high, typical, symbols) of a typed index expression over every class (stored units)."""
    from selector.inputs.expressions import parse
    from selector.pipeline.rank import property_arrays

    expr = parse(text)
    symbols = sorted(expr.symbols)
    low_v, high_v, mid_v = property_arrays(table, symbols)
    low, high = expr.interval(low_v, high_v)
    n = len(table)
    typical = np.broadcast_to(expr.evaluate(mid_v), n).astype(float)
    return (
        np.broadcast_to(low, n).astype(float),
        np.broadcast_to(high, n).astype(float),
        typical,
        tuple(symbols),
    )


def select(
    spec: Spec,
    materials: pd.DataFrame | None = None,
    conservative: bool = False,
    index: str | None = None,
    *,
    robust: int | None = None,
    tradeoff: str | None = None,
    exchange: float | str | None = None,
    seed: int | None = None,
    distribution: str = "log-uniform",
    sensitivity: bool = False,
) -> Selection:
    """Run the whole pipeline for a spec over a materials table (the built-in one by default).

    ``index`` (or the spec's ``index``) replaces the derived merit index for ranking by index.
    With ``robust`` (a number of draws) the Selection carries the Monte Carlo odds (and with
    ``sensitivity`` which property unsettles the leader), drawn with ``seed`` and
    ``distribution``; with ``tradeoff`` (a second objective) the Pareto front against it and,
    with ``exchange``, the penalty ranking. A study that cannot be made leaves its error in
    ``robust_error`` or ``tradeoff_error`` (see ``studies``).
    """
    selection = _select(spec, materials, conservative, index)
    return studies(selection, robust, tradeoff, exchange, seed, distribution, sensitivity)


def studies(
    selection: Selection,
    robust: int | None = None,
    tradeoff: str | None = None,
    exchange: float | str | None = None,
    seed: int | None = None,
    distribution: str = "log-uniform",
    sensitivity: bool = False,
) -> Selection:
    """The Selection with the trade-off and robustness studies asked for (None: not asked)."""
    found: dict[str, Any] = {}
    if tradeoff is not None:
        try:
            front, second = tradeoff_report(selection, tradeoff, exchange)
            found["tradeoff"] = TradeoffStudy(tradeoff, exchange, front, second)
            if selection.sandwich is not None:
                note = PAIRS_SIZED_FOR.format(first=selection.spec.objective.minimize, other=tradeoff)
                points = pair_candidates(selection.sandwich)
                found["tradeoff"] = TradeoffStudy(tradeoff, exchange, front, second, points, note)
        except SelectorError as exc:
            found["tradeoff_error"] = exc
    if robust is not None and selection.sandwich is not None:
        found["robust_error"] = InputError(
            "--robust",
            "the Monte Carlo odds rank solid parts; sandwich pairs are sized at the typical values "
            "of their ranges only",
            "--conservative to size every pair at the unfavourable ends of its ranges",
        )
        robust = None
    if robust is not None:
        try:
            found["robust"] = robustness(selection, draws=robust, seed=seed, distribution=distribution)
            if sensitivity:
                found["sensitivity"] = robust_sensitivity(selection, seed=seed, distribution=distribution)
        except SelectorError as exc:
            found["robust_error"] = exc
    return replace(selection, **found) if found else selection


def report_studies(selection: Selection, draws: int, seed: int | None = None) -> Selection:
    """The Selection with the studies a report shows: the usual trade-off (when parts are sized)
    and ``draws`` Monte Carlo draws (none for 0)."""
    second = SECOND_OBJECTIVE.get(selection.spec.objective.minimize) if selection.has_sizes else None
    return studies(selection, robust=draws or None, tradeoff=second, seed=seed)


def _select(spec: Spec, materials: pd.DataFrame | None, conservative: bool, index: str | None) -> Selection:
    if materials is None:
        from selector.inputs.materials import load_materials

        materials = load_materials(spec.materials.files, builtin=spec.materials.builtin)
    if spec.section.shape == "sandwich" or spec.section.free == SANDWICH_FREE or spec.sandwich is not None:
        return _select_sandwich(spec, materials, conservative, index)
    expression = index if index is not None else spec.index
    parsed = None
    index_key = INDEX_LOW if conservative else INDEX
    if not spec.constraint and expression is None:
        raise InputError(
            "spec: constraint", "the spec has no [[constraint]] and no index", "at least one constraint table"
        )
    for i, c in enumerate(spec.constraint):
        fl.failure_limits(
            c, f"constraint[{i}]", spec.part.function, si_values(spec)
        )  # misplaced fields first
    criterion, load_ratio = fl.requirement_of(spec.constraint)
    case = with_requirement(case_for(spec), criterion, load_ratio)
    free = spec.section.free
    # With every dimension fixed the part is only checked; the index shown is the one for
    # the first free variable the load case allows (the shape scaled at fixed proportions).
    derive_free = free if free != "none" else case.allowed_free[0]
    seen: set[str] = set()
    derivations = []
    for i, c in enumerate(spec.constraint):
        if c.type in seen:
            raise InputError(f"spec: constraint[{i}].type", f"{c.type!r} is given twice", "each type once")
        seen.add(c.type)
        derivations.append(derive_for_case(case, c.type, spec.objective.minimize, derive_free, c.criterion))
    derivations = canonical_order(derivations)  # a check on the class never ranks; block order never matters
    if derivations and all(d.screen for d in derivations):
        raise InputError(
            "spec: constraint",
            f"{', '.join(d.constraint for d in derivations)} sets no size for this {case.function}",
            "a constraint that does, such as strength or stiffness",
        )
    implicit, _ = IMPLICIT_CONSTRAINTS.get(case.function, (None, None))
    if implicit is not None and derivations:
        derivations.append(derive_for_case(case, implicit, spec.objective.minimize, derive_free))
    screens = parse_screens(spec.screen)
    screened = apply_screens(materials.reset_index(drop=True), screens)
    if brittle_rule_applies(case.kind, tuple(c.type for c in spec.constraint), screens):
        screened = reject_brittle(screened)
    screened = qualifying_ranges(screened, screens)
    screened = reject_for_stress_state(screened, stress_state(case.function, spec.part.form))
    screened = reject_for_product_form(screened, case.function, spec.section.shape)
    if load_ratio != -1.0:
        screened = fl.with_fatigue_strength(screened, load_ratio)
    if derivations:
        ranked_on = set(derivations[0].exponents) if expression is None else set()
        needs = fl.needed_properties({d.constraint: case.utilisation[d.constraint] for d in derivations})
        needs = {k: tuple(s for s in v if s not in ranked_on) for k, v in needs.items()}
        screened = fl.reject_missing(screened, needs)  # the index ranking reports its own gaps
    if expression is not None:
        low, high, typ, index_needs = expression_index(screened, expression)
        parsed = parse(expression)
        table = rank_by_index(screened, low, high, typ, conservative, needs=index_needs)
        if not derivations:
            notes = [f"ranked by the typed index {expression}"]
            return Selection(
                spec,
                screens,
                (),
                table,
                "index",
                notes=tuple(notes),
                expression=expression,
                parsed_index=parsed,
                ranking_key=index_key,
            )
    first = derivations[0]
    if expression is None:
        low, high, typ = monomial_index(screened, first.exponents)
        table = rank_by_index(screened, low, high, typ, conservative, needs=tuple(first.exponents))
    for d in derivations[1:]:
        _, _, extra = monomial_index(table, d.exponents)
        table[constraint_index(d.constraint)] = extra
    if expression is None:
        table[INDEX_WITH_SHAPE] = index_with_shape(table, first)
    notes = [
        f"{d.constraint} sets no size: it checks each class; {d.steps[-1][:1].lower()}{d.steps[-1][1:]}"
        for d in derivations
        if d.screen
    ]
    if (screened["status"] == PARTLY).any():
        notes.append("classes that pass partly are ranked on the part of their ranges that meets the screens")
    if free == "none":
        notes.append(
            f"free = none: every part is checked as given; the index shown is for free = {derive_free}"
        )
    shape = spec.section.shape
    if shape == "generic" and spec.section.free == "scale" and case.kind.takes_section:
        notes.append(
            "section: a generic solid square at fixed proportions (set [section] shape to size a real one)"
        )
    design = design_of(spec, shape)
    if conservative:
        design = replace(design, ends="unfavourable")
    assumptions = assumptions_for(spec, derivations, design)
    missing = missing_inputs(derivations, design)
    if not missing and "L" in case.volume.symbols and "L" not in design.values:
        raise InputError(
            "part.length",
            f"a {spec.part.function} is sized from its loads, but its length is not given",
            'the length of the part, e.g. length = "1.2 m"',
        )
    if missing:
        names = ", ".join(FIELD_OF_SYMBOL.get(s, s) for s in missing)
        notes.append(f"ranked by merit index; to size parts the spec also needs: {names}")
        return Selection(
            spec,
            screens,
            tuple(derivations),
            table,
            "index",
            notes=tuple(notes),
            expression=expression,
            parsed_index=parsed,
            ranking_key=index_key,
            assumptions=assumptions,
        )
    if conservative:
        notes.append(CONSERVATIVE_NOTE)
    alive = table["status"] != REJECTED
    sized = size_parts(table[alive], derivations, design)
    table = pd.concat([table, sized.reindex(table.index)], axis=1)
    table["feasible"] = table["feasible"].eq(True)
    if design.bounds:
        table = reject_out_of_bounds(table, design, spec.part.function)
    unsized = alive & ~table["feasible"]
    table.loc[unsized, "status"] = REJECTED
    table.loc[unsized, "reasons"] = pd.Series(
        [
            [*r, *w]
            for r, w in zip(table.loc[unsized, "reasons"], table.loc[unsized, "size_warnings"], strict=True)
        ],
        index=table.index[unsized],
        dtype=object,
    )
    objective = spec.objective.minimize
    table["objective"] = table[objective].where(table["feasible"], math.inf)
    if expression is not None:
        notes.append(f"ranked by the typed index {expression}; the parts are sized for the spec's loads")
        table = rerank_by_index(table, conservative)
        ranked_by, key = "index", index_key
    else:
        table = rank_by_value(table, "objective", "objective_low", "objective_high")
        table, derivations = lead_with_governing(table, derivations)
        table[INDEX_WITH_SHAPE] = index_with_shape(table, derivations[0])
        ranked_by, key = objective, "objective"
    return Selection(
        spec,
        screens,
        tuple(derivations),
        table,
        ranked_by,
        OBJECTIVE_UNITS[objective],
        tuple(notes),
        expression,
        has_sizes=True,
        design=design,
        parsed_index=parsed,
        ranking_key=key,
        assumptions=assumptions,
    )


def _select_sandwich(spec: Spec, materials: pd.DataFrame, conservative: bool, index: str | None) -> Selection:
    """Face × core pairs for a sandwich spec, beside the best solid part sized for the same loads."""
    from selector.inputs.spec import SectionSpec

    fn, section = spec.part.function, spec.section
    if not part_kind(fn).bends:
        raise InputError("section.shape", f"a {fn} is not sized as a sandwich", "function = beam or panel")
    if section.shape != "sandwich":
        raise InputError(
            "section.shape",
            f"free = {section.free!r} (or a [sandwich] table) sizes a sandwich, not a {section.shape!r}",
            f'shape = "sandwich" with free = "{SANDWICH_FREE}"',
        )
    if section.free != SANDWICH_FREE:
        raise InputError(
            "section.free",
            f"a sandwich is sized by both its thicknesses, not with free = {section.free!r}",
            f'free = "{SANDWICH_FREE}"',
        )
    extra = sorted(set(section.dims) - {"b"})
    if extra:
        raise InputError(
            f"section.{extra[0]}", "a sandwich's thicknesses are found, not given", "only the width b"
        )
    for name in ("max_width", "max_diameter"):
        if getattr(section, name) is not None:
            raise InputError(f"section.{name}", f"a sandwich does not take {name}", "max_depth only")
    if section.max_depth is not None and spec.sandwich is not None and spec.sandwich.max_depth is not None:
        raise InputError(
            "section.max_depth",
            "max_depth is given in both [section] and [sandwich]",
            "the overall depth bound once",
        )
    width = section.b if fn == "beam" else None
    max_depth = section.max_depth or (spec.sandwich.max_depth if spec.sandwich is not None else None)
    solid_section = SectionSpec(
        shape="rectangle", free="thickness" if fn == "panel" else "depth", b=width, max_depth=max_depth
    )
    solid = select(
        spec.model_copy(update={"section": solid_section, "sandwich": None}), materials, conservative, index
    )
    design = design_of(solid.spec, "rectangle")
    values = dict(design.values) | ({"b": design.dims["b"]} if "b" in design.dims else {})
    loads = sandwich_loads(spec, values, _limits(spec), conservative)
    screens = parse_screens(spec.screen)
    screened = qualifying_ranges(apply_screens(materials.reset_index(drop=True), screens), screens)
    options = spec.sandwich
    result = size_pairs(
        screened,
        loads,
        options.faces if options else None,
        options.cores if options else None,
        stress_state(fn, spec.part.form),
    )
    result = replace(result, solid=best_solid(solid.shortlist, loads.max_depth))
    sized = int(result.pairs["feasible"].sum())
    note = f"sandwich: {sized} face × core pairs sized; the table holds the solid parts for comparison"
    assumptions = (*result.assumptions, *(f"solid part: {a}" for a in solid.assumptions))
    return replace(solid, spec=spec, sandwich=result, notes=(*solid.notes, note), assumptions=assumptions)


__all__ = [
    "CAUTION",
    "DIMENSION_FIELDS",
    "PROPERTIES",
    "Selection",
    "design_of",
    "report_studies",
    "select",
    "studies",
]

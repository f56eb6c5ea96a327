"""Derive the merit index from the design requirement.

Solve the constraint for the free variable, substitute into the objective and
split the result into a load/geometry factor and a material factor; the merit
index is the inverse of the material factor, normalised. Nothing is looked up.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass, replace
from fractions import Fraction

from selector.errors import InputError
from selector.inputs.properties import DERIVED_PROPERTIES, PROPERTIES
from selector.mechanics.loadcases import FREE_VARIABLES, LoadCase, load_case, with_requirement
from selector.mechanics.monomial import Monomial as M
from selector.mechanics.monomial import format_monomial, format_monomial_latex
from selector.mechanics.objectives import OBJECTIVE_FACTORS, OBJECTIVE_WORDS, OBJECTIVES
from selector.suggest import did_you_mean

SYMBOLS_TEXT = {
    "rho": "ρ",
    "sigma_y": "σ_y",
    "sigma_c": "σ_c",
    "delta": "δ",
    "theta": "θ",
    "price": "C_m",
    "sigma_e": "σ_e",
    "sigma_R": "σ_R",
    "sigma_ts": "σ_ts",
}
SYMBOLS_LATEX = {
    "rho": r"\rho",
    "sigma_y": r"\sigma_y",
    "sigma_c": r"\sigma_c",
    "sigma_e": r"\sigma_e",
    "sigma_R": r"\sigma_R",
    "K_IC": r"K_{IC}",
    "f_min": r"f_{min}",
    "L_e": "L_e",
    "delta": r"\delta",
    "theta": r"\theta",
    "price": "C_m",
    "co2": r"\mathrm{CO_2}",
    "k_I": "k_I",
    "k_Z": "k_Z",
}
PROPERTY_SYMBOLS = frozenset(PROPERTIES) | frozenset(DERIVED_PROPERTIES)
OWN_DIMENSION_TEXT = {
    "V": "the volume V of spring material is free",
    "t": "the wall or plate thickness t is free; the other dimensions are fixed",
}
"""How the derivation states the free variable of a part sized by its own dimension."""


@dataclass(frozen=True)
class Geometry:
    """How the section quantities depend on the free variable.

    Attributes:
        free: the free variable's name in the spec (scale, depth, ...).
        symbol: its symbol in the equations (A, h, b, t, V).
        quantities: section quantity → monomial in the free symbol and fixed dimensions.
        description: the same, written for people.
    """

    free: str
    symbol: str
    quantities: dict[str, M]
    description: str


def geometry(case: LoadCase, free: str) -> Geometry:
    """The section model for a load case and free variable (shape constants stay symbolic)."""
    if free not in FREE_VARIABLES:
        raise InputError(
            "section.free", f"{free!r} is not a free variable", did_you_mean(free, FREE_VARIABLES)
        )
    if free == "none":
        raise InputError(
            "section.free", "'none' fixes every dimension, so there is nothing to derive", "scale, depth, ..."
        )
    if free not in case.allowed_free:
        raise InputError(
            "section.free",
            f"{free!r} cannot be chosen for a {case.function}",
            f"one of: {', '.join(case.allowed_free)}",
        )
    own = case.kind.own_dimension
    if own is not None:
        return Geometry(free, own, {}, OWN_DIMENSION_TEXT[own])
    if free == "scale":
        return Geometry(
            free,
            "A",
            {
                "I": M.of(1, k_I=1, A=2),
                "Imin": M.of(1, k_Imin=1, A=2),
                "Z": M.of(1, k_Z=1, A=1.5),
                "J": M.of(1, k_J=1, A=2),
                "Zt": M.of(1, k_Zt=1, A=1.5),
            },
            "the section keeps its proportions and scales with its area A: I = k_I·A² (I_min = k_Imin·A²), "
            "Z = k_Z·A^(3/2), "
            "J = k_J·A², Z_t = k_Zt·A^(3/2) (k_I = φ_B/12 for bending-stiffness shape factor φ_B)",
        )
    if free in ("depth", "thickness"):
        sym = "h" if free == "depth" else "t"
        return Geometry(
            free,
            sym,
            {
                "A": M.of(1, b=1, **{sym: 1}),
                "I": M.of(1 / 12, b=1, **{sym: 3}),
                "Z": M.of(1 / 6, b=1, **{sym: 2}),
            },
            f"rectangular section of fixed width b, free {free} {sym}: "
            f"A = b·{sym}, I = b·{sym}³/12, Z = b·{sym}²/6",
        )
    if free == "width":
        return Geometry(
            free,
            "b",
            {"A": M.of(1, b=1, h=1), "I": M.of(1 / 12, b=1, h=3), "Z": M.of(1 / 6, b=1, h=2)},
            "rectangular section of fixed depth h, free width b: A = b·h, I = b·h³/12, Z = b·h²/6",
        )
    # wall: thin-walled tube of fixed outer diameter d
    pi = math.pi
    return Geometry(
        free,
        "t",
        {
            "A": M.of(pi, d=1, t=1),
            "I": M.of(pi / 8, d=3, t=1),
            "Imin": M.of(pi / 8, d=3, t=1),
            "Z": M.of(pi / 4, d=2, t=1),
            "J": M.of(pi / 4, d=3, t=1),
            "Zt": M.of(pi / 2, d=2, t=1),
        },
        "thin-walled tube of fixed diameter d, free wall t (t ≪ d): A = π·d·t, I = π·d³·t/8, "
        "Z = π·d²·t/4, J = π·d³·t/4, Z_t = π·d²·t/2",
    )


@dataclass(frozen=True)
class Derivation:
    """The merit index for one constraint, with the algebra that led to it.

    Attributes:
        case: the load case.
        constraint: stiffness, strength, buckling, fracture, fatigue or frequency.
        objective: mass, cost, co2 or volume.
        geometry: the section model used.
        solution: the free variable at the limit (monomial in loads, geometry, properties).
        objective_value: the objective at the limit.
        geometry_factor: the part of ``objective_value`` set by loads and geometry.
        material_factor: the part set by the material (minimise it).
        index: the merit index to maximise, normalised (a monomial of properties).
        steps: the derivation as readable lines; ``steps_latex`` the same in LaTeX.
        screen: the constraint does not involve the free variable, so it sizes nothing and
            only checks the class (``solution`` and ``objective_value`` are then zero).
    """

    case: LoadCase
    constraint: str
    objective: str
    geometry: Geometry
    solution: M
    objective_value: M
    geometry_factor: M
    material_factor: M
    index: M
    steps: tuple[str, ...]
    steps_latex: tuple[str, ...]
    screen: bool = False

    @property
    def exponents(self) -> dict[str, float]:
        """Property symbol → exponent of the normalised index."""
        return {k: float(v) for k, v in self.index.powers}

    @property
    def index_text(self) -> str:
        return format_monomial(self.index, SYMBOLS_TEXT, coef=False)

    @property
    def index_latex(self) -> str:
        return format_monomial_latex(self.index, SYMBOLS_LATEX, coef=False)


def normalise(index: M) -> M:
    """Scale the exponents so density has power −1 (else the smallest integer powers); coefficient 1."""
    rho = index.power_of("rho")
    if rho:
        return M._make(1.0, [(k, v / abs(rho)) for k, v in index.powers])
    if not index.powers:
        return M._make(1.0, [])
    lcm = math.lcm(*(v.denominator for _, v in index.powers))
    gcd = math.gcd(*(v.numerator * lcm // v.denominator for _, v in index.powers))
    return M._make(1.0, [(k, Fraction(v * lcm, abs(gcd))) for k, v in index.powers])


def derive(
    function: str,
    constraint: str,
    objective: str = "mass",
    free: str = "scale",
    support: str | None = None,
    load: str | None = None,
    criterion: str | None = None,
    load_ratio: float = -1.0,
) -> Derivation:
    """Derive the merit index for one constraint of a part.

    ``criterion`` (leak-before-break, yield-before-break) qualifies a vessel's fracture
    constraint; ``load_ratio`` R a fatigue constraint.
    """
    if criterion is not None and constraint != "fracture":
        raise InputError(
            "--criterion",
            f"a criterion qualifies the fracture constraint, not {constraint}",
            "--constraint fracture",
        )
    case = with_requirement(load_case(function, support, load), criterion, load_ratio)
    return derive_for_case(case, constraint, objective, free, criterion)


def derive_for_case(
    case: LoadCase, constraint: str, objective: str, free: str, criterion: str | None = None
) -> Derivation:
    """Derive the merit index for ``constraint`` of an already chosen load case.

    A constraint the free variable does not enter (a tie's axial frequency, yield before
    break) sizes nothing: it is a screen on the class, returned with ``screen`` set.
    With ``criterion = "leak-before-break"`` the index is the criterion's: the wall at its
    yield limit, the largest pressure at which a crack as deep as the wall is stable.
    """
    if objective not in OBJECTIVES:
        raise InputError(
            "objective.minimize", f"{objective!r} is not an objective", did_you_mean(objective, OBJECTIVES)
        )
    if constraint not in case.utilisation:
        raise InputError(
            "constraint.type",
            f"{constraint!r} does not apply to a {case.function}",
            f"one of: {', '.join(case.constraints)}" + _buckling_hint(case, constraint),
        )
    geo = geometry(case, free)
    x = geo.symbol
    limit = _in_free_variable(case.utilisation[constraint], geo)
    volume = _in_free_variable(case.volume, geo)
    target = OBJECTIVE_FACTORS[objective] * volume
    word = OBJECTIVE_WORDS[objective]
    fmt = lambda m: format_monomial(m, SYMBOLS_TEXT)  # noqa: E731
    tex = lambda m: format_monomial_latex(m, SYMBOLS_LATEX)  # noqa: E731
    head = (
        f"Objective: minimise {word} = {fmt(target)} (x = {x} is free)",
        f"Constraint ({constraint}): {case.equations[constraint]}",
        f"Section: {geo.description}",
        f"At the limit the utilisation is 1: {fmt(limit)} = 1",
    )
    if limit.power_of(x) == 0:
        return _screen(case, constraint, objective, geo, limit, head, tex)
    solution = limit.solve_for(x, M.of(1))
    value = target.substitute(x, solution)
    material, rest = value.split(PROPERTY_SYMBOLS)
    index = normalise(material**-1)
    steps = (
        *head,
        f"Solve for the free variable: {x} = {fmt(solution)}",
        f"Substitute into the objective: {word} = [{fmt(rest)}] · [{fmt(material)}]",
        f"The loads and geometry fix the first factor; the material fixes the second. Minimising "
        f"{fmt(material)} means maximising the merit index "
        f"M = {format_monomial(index, SYMBOLS_TEXT, coef=False)}",
    )
    latex = (
        rf"\text{{objective: }} {tex(target)}",
        rf"\text{{limit: }} {tex(limit)} = 1",
        rf"{x} = {tex(solution)}",
        rf"\text{{{objective}}} = \left[{tex(rest)}\right] \left[{tex(material)}\right]",
        rf"M = {format_monomial_latex(index, SYMBOLS_LATEX, coef=False)}",
    )
    derivation = Derivation(
        case, constraint, objective, geo, solution, value, rest, material, index, steps, latex
    )
    if criterion == "leak-before-break" and constraint == "fracture":
        return _leak_before_break(derivation, tex)
    return derivation


def _buckling_hint(case: LoadCase, constraint: str) -> str:
    """Where buckling does apply, for a vessel under internal pressure asked for it."""
    if constraint == "buckling" and case.kind.vessel and not case.kind.in_compression:
        return '; buckling applies to a cylinder under external pressure (load = "external")'
    return ""


def _in_free_variable(m: M, geo: Geometry) -> M:
    """``m`` with the section quantities written in the free variable."""
    for name, value in geo.quantities.items():
        m = m.substitute(name, value)
    return m


def _screen(
    case: LoadCase,
    constraint: str,
    objective: str,
    geo: Geometry,
    limit: M,
    head: tuple[str, ...],
    tex: Callable[[M], str],
) -> Derivation:
    """A constraint free of the free variable: M ≥ threshold, a check on the class."""
    material, rest = limit.split(PROPERTY_SYMBOLS)
    index = normalise(material**-1)
    symbol, power = index.powers[0]
    k = power / (material**-1).power_of(symbol)  # index = (1/material)^k
    threshold = rest**k
    text = format_monomial(index, SYMBOLS_TEXT, coef=False)
    fmt = lambda m: format_monomial(m, SYMBOLS_TEXT)  # noqa: E731
    steps = (
        *head,
        f"The free variable {geo.symbol} does not appear: {constraint} sets no size, it is a "
        f"screen on the class",
        f"The part passes when M = {text} ≥ {fmt(threshold)}",
    )
    latex = (
        rf"\text{{limit: }} {tex(limit)} = 1",
        rf"\text{{screen: }} {format_monomial_latex(index, SYMBOLS_LATEX, coef=False)} \geq {tex(threshold)}",
    )
    zero = M._make(0.0, limit.powers)  # sizes nothing, but names what the check needs
    return Derivation(
        case, constraint, objective, geo, zero, M.of(0.0), rest, material, index, steps, latex, screen=True
    )


def _leak_before_break(d: Derivation, tex: Callable[[M], str]) -> Derivation:
    """The leak-before-break index: the wall at yield, then the largest safe pressure."""
    case, geo = d.case, d.geometry
    at_yield = _in_free_variable(case.utilisation["strength"], geo).solve_for(geo.symbol, M.of(1))
    crack = _in_free_variable(case.utilisation["fracture"], geo).substitute(geo.symbol, at_yield)
    material, _ = crack.split(PROPERTY_SYMBOLS)
    index = normalise(material**-1)
    fmt = lambda m: format_monomial(m, SYMBOLS_TEXT)  # noqa: E731
    text = format_monomial(index, SYMBOLS_TEXT, coef=False)
    steps = (
        *d.steps[:-1],
        f"Criterion (leak before break): with the wall at its yield limit {geo.symbol} = {fmt(at_yield)}, "
        f"a crack as deep as the wall has utilisation {fmt(crack)} ≤ 1",
        f"The largest pressure that leaks before it breaks rises with the merit index M = {text}; "
        f"the part is sized by the same check, {geo.symbol} = {fmt(d.solution)}",
    )
    latex = (*d.steps_latex[:-1], rf"M = {format_monomial_latex(index, SYMBOLS_LATEX, coef=False)}")
    return replace(d, index=index, steps=steps, steps_latex=latex)

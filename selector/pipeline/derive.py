"""Derive the merit index from the design requirement.

Solve the constraint for the free variable, substitute into the objective and
split the result into a load/geometry factor and a material factor; the merit
index is the inverse of the material factor, normalised. Nothing is looked up.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from selector.errors import InputError
from selector.inputs.properties import PROPERTIES
from selector.mechanics.loadcases import FREE_VARIABLES, LoadCase, load_case
from selector.mechanics.monomial import Monomial as M
from selector.mechanics.monomial import format_monomial, format_monomial_latex
from selector.mechanics.objectives import OBJECTIVE_FACTORS, OBJECTIVE_WORDS, OBJECTIVES
from selector.suggest import did_you_mean

SYMBOLS_TEXT = {"rho": "ρ", "sigma_y": "σ_y", "sigma_c": "σ_c", "delta": "δ", "theta": "θ", "price": "C_m"}
SYMBOLS_LATEX = {
    "rho": r"\rho",
    "sigma_y": r"\sigma_y",
    "sigma_c": r"\sigma_c",
    "delta": r"\delta",
    "theta": r"\theta",
    "price": "C_m",
    "co2": r"\mathrm{CO_2}",
    "k_I": "k_I",
    "k_Z": "k_Z",
}
PROPERTY_SYMBOLS = frozenset(PROPERTIES)


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
    if case.function == "spring":
        return Geometry(free, "V", {}, "the volume V of spring material is free")
    if case.function in ("cylinder", "sphere", "plate"):
        return Geometry(
            free, "t", {}, "the wall or plate thickness t is free; the other dimensions are fixed"
        )
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
        constraint: stiffness, strength or buckling.
        objective: mass, cost, co2 or volume.
        geometry: the section model used.
        solution: the free variable at the limit (monomial in loads, geometry, properties).
        objective_value: the objective at the limit.
        geometry_factor: the part of ``objective_value`` set by loads and geometry.
        material_factor: the part set by the material (minimise it).
        index: the merit index to maximise, normalised (a monomial of properties).
        steps: the derivation as readable lines; ``steps_latex`` the same in LaTeX.
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
    """Scale the exponents so density has power −1 (or the largest power is ±1); coefficient 1."""
    rho = index.power_of("rho")
    scale = abs(rho) if rho else max((abs(v) for _, v in index.powers), default=1)
    return M._make(1.0, [(k, v / scale) for k, v in index.powers])


def derive(
    function: str,
    constraint: str,
    objective: str = "mass",
    free: str = "scale",
    support: str | None = None,
    load: str | None = None,
) -> Derivation:
    """Derive the merit index for one constraint of a part."""
    case = load_case(function, support, load)
    return derive_for_case(case, constraint, objective, free)


def derive_for_case(case: LoadCase, constraint: str, objective: str, free: str) -> Derivation:
    """Derive the merit index for ``constraint`` of an already chosen load case."""
    if objective not in OBJECTIVES:
        raise InputError(
            "objective.minimize", f"{objective!r} is not an objective", did_you_mean(objective, OBJECTIVES)
        )
    if constraint not in case.utilisation:
        raise InputError(
            "constraint.type",
            f"{constraint!r} does not apply to a {case.function}",
            f"one of: {', '.join(case.constraints)}",
        )
    geo = geometry(case, free)
    x = geo.symbol
    limit = case.utilisation[constraint]
    for name, value in geo.quantities.items():
        limit = limit.substitute(name, value)
    volume = case.volume
    for name, value in geo.quantities.items():
        volume = volume.substitute(name, value)
    target = OBJECTIVE_FACTORS[objective] * volume
    solution = limit.solve_for(x, M.of(1))
    value = target.substitute(x, solution)
    material, rest = value.split(PROPERTY_SYMBOLS)
    index = normalise(material**-1)
    word = OBJECTIVE_WORDS[objective]
    fmt = lambda m: format_monomial(m, SYMBOLS_TEXT)  # noqa: E731
    tex = lambda m: format_monomial_latex(m, SYMBOLS_LATEX)  # noqa: E731
    steps = (
        f"Objective: minimise {word} = {fmt(target)} (x = {x} is free)",
        f"Constraint ({constraint}): {case.equations[constraint]}",
        f"Section: {geo.description}",
        f"At the limit the utilisation is 1: {fmt(limit)} = 1",
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
    return Derivation(case, constraint, objective, geo, solution, value, rest, material, index, steps, latex)

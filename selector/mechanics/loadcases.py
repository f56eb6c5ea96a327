"""Load cases as monomial equations.

Each case states, for the part at its limit, the *utilisation* of every
constraint it supports as one monomial (utilisation = 1 at the limit, < 1 safe)
in loads, geometry, section quantities and material properties. A new load case
is a few lines here; the derivation of its merit index is done by ``derive``.

Symbols (SI): F force [N], L length or span [m], T torque [N·m], p pressure [Pa],
U stored energy [J], b width [m], r radius [m], delta allowed deflection [m],
theta allowed twist [rad], SF safety factor [-]; section: A area [m²],
I second moment about the bending axis and Imin the least principal one [m⁴],
Z elastic section modulus [m³], J torsion constant [m⁴], Zt torsional section modulus [m³];
t wall or plate thickness [m], V volume [m³];
properties: E, G, sigma_y, sigma_c [Pa], rho [kg/m³].
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field, replace

from selector.errors import InputError
from selector.mechanics import failure_modes as fm
from selector.mechanics.monomial import Monomial as M
from selector.suggest import did_you_mean

FREE_VARIABLES = ("scale", "depth", "width", "thickness", "wall", "none", "faces-and-core")

FUNCTIONS = ("tie", "beam", "column", "shaft", "panel", "plate", "cylinder", "sphere", "spring")
SECTION_QUANTITIES = frozenset({"A", "I", "Imin", "Z", "J", "Zt"})
BEAM_SUPPORTS = ("cantilever", "simply-supported", "fixed-fixed")
BEAM_LOADS = ("end", "centre", "uniform")
VESSEL_LOADS = ("internal", "external")
"""A vessel's pressure: from inside (the wall in tension) or from outside (in compression)."""
VESSEL_LOADS_OF: dict[str, tuple[str, ...]] = {"cylinder": VESSEL_LOADS, "sphere": ("internal",)}
"""The pressures each vessel is sized for (a sphere refuses external pressure: ``SPHERE_EXTERNAL``)."""
COLUMN_SUPPORTS = ("pinned-pinned", "fixed-free", "fixed-pinned", "fixed-fixed")
CONSTRAINTS = ("stiffness", "strength", "buckling", *fm.FAILURE_CONSTRAINTS)

# δ = F·L³/(C·E·I) and M_max = F·L/C_M for each (support, load); F is the total load.
# Common practice (Roark, Table 8.1; Gere & Timoshenko) — from memory.
BEAM_CONSTANTS: dict[tuple[str, str], tuple[float, float]] = {
    ("cantilever", "end"): (3.0, 1.0),
    ("cantilever", "uniform"): (8.0, 2.0),
    ("simply-supported", "centre"): (48.0, 4.0),
    ("simply-supported", "uniform"): (384.0 / 5.0, 8.0),
    ("fixed-fixed", "centre"): (192.0, 8.0),
    ("fixed-fixed", "uniform"): (384.0, 12.0),
}

# Euler load F_cr = n²·π²·E·I/L²; n² for each end condition (the fixed-pinned
# value 2.046 is the root of tan(kL) = kL). Common practice, no source.
EULER_N2: dict[str, float] = {
    "pinned-pinned": 1.0,
    "fixed-free": 0.25,
    "fixed-pinned": 2.046,
    "fixed-fixed": 4.0,
}

PLATE_K = 4.0
"""Buckling coefficient of a long plate simply supported on all edges (common practice, no source)."""
PLATE_NU = 0.3
"""Poisson's ratio assumed in the plate-buckling coefficient (stated in the derivation)."""
TUBE_BUCKLING = 1 / (4 * (1 - PLATE_NU**2))
"""Bresse's long tube under external pressure: p_cr = E/(4(1−ν²))·(t/r)³, ν = ``PLATE_NU``
(Timoshenko & Gere, *Theory of Elastic Stability*, §7.2 — from memory)."""
SHEAR_YIELD_RATIO = 1 / math.sqrt(3)
"""Shear yield τ_y = σ_y/√3 (von Mises), used for shafts."""


@dataclass(frozen=True)
class PartKind:
    """What kind of part a function is: the questions the steps ask of a load case, not its name.

    Attributes:
        sized_by: what the free variable sets, in words: "section" (a cross-section shape of
            the spec's [section]), "thickness" (a panel's or plate's), "wall" (a pressure
            vessel's), "volume" (a spring's material volume).
        in_compression: its strength and failure checks are on a compressive stress (columns,
            plates); the others carry tension or bending, where a brittle class needs a
            fracture constraint to be ranked.
        bends: loaded in bending between supports (beam, panel): it takes a support and a load,
            a natural frequency of a bending mode, and may be made a sandwich.
        shape_capped: with the scale free, its section is held to the family's practical
            bending shape-factor limits (Weaver & Ashby).
        own_dimension: the one dimension the free variable is when no section shape is sized:
            "t" (wall or plate thickness) or "V" (spring volume); None otherwise.
        fixed_geometry: symbols of the fixed geometry the part's equations read beside its
            own dimension (a vessel's radius r, a plate's width b).
        shapes: the shapes, besides "generic", a part without a sized section takes.
    """

    sized_by: str
    in_compression: bool = False
    bends: bool = False
    shape_capped: bool = False
    own_dimension: str | None = None
    fixed_geometry: tuple[str, ...] = ()
    shapes: tuple[str, ...] = ()

    @property
    def takes_section(self) -> bool:
        """Sized through a cross-section shape (tie, beam, column, shaft)."""
        return self.sized_by == "section"

    @property
    def has_edges(self) -> bool:
        """A panel or plate: the conditions along its edges are part of the spec."""
        return self.sized_by == "thickness"

    @property
    def vessel(self) -> bool:
        """A pressure vessel (cylinder, sphere): sized by its wall at a given radius."""
        return self.sized_by == "wall"


PART_KINDS: dict[str, PartKind] = {
    "tie": PartKind("section"),
    "beam": PartKind("section", bends=True, shape_capped=True),
    "column": PartKind("section", in_compression=True, shape_capped=True),
    "shaft": PartKind("section"),
    "panel": PartKind("thickness", bends=True, shapes=("rectangle", "sandwich")),
    "plate": PartKind("thickness", in_compression=True, own_dimension="t", fixed_geometry=("b",)),
    "cylinder": PartKind("wall", own_dimension="t", fixed_geometry=("r",)),
    "sphere": PartKind("wall", own_dimension="t", fixed_geometry=("r",)),
    "spring": PartKind("volume", own_dimension="V"),
}
"""Every function's kind of part; ``LoadCase.kind`` and ``part_kind`` read it."""


def part_kind(function: str, load: str | None = None) -> PartKind:
    """The kind of part a function is (``function`` one of ``FUNCTIONS``).

    ``load`` matters for a vessel: under external pressure its wall is in compression.
    """
    kind = PART_KINDS[_check_choice(function, FUNCTIONS, "part.function")]
    if kind.vessel and load == "external":
        return replace(kind, in_compression=True)
    return kind


@dataclass(frozen=True)
class LoadCase:
    """One supported load case.

    Attributes:
        function: tie, beam, column, ...
        title: plain description, e.g. "beam, cantilever, end load".
        utilisation: constraint type → utilisation monomial (1 at the limit).
        responses: response name → monomial (e.g. deflection [m], stress [Pa]).
        equations: constraint type → the governing equation written for people.
        volume: material volume as a monomial in section and geometry.
        needs: symbols each constraint needs from the spec, by constraint type.
        allowed_free: free variables this case can be sized by.
        notes: assumptions of the case; ``constraint_notes`` those of one constraint type.
        load: the load where it changes what kind of part this is (a cylinder's "external"
            pressure puts its wall in compression); None otherwise.
    """

    function: str
    title: str
    utilisation: dict[str, M]
    responses: dict[str, M]
    equations: dict[str, str]
    volume: M
    allowed_free: tuple[str, ...]
    notes: tuple[str, ...] = field(default=())
    constraint_notes: dict[str, str] = field(default_factory=dict)
    load: str | None = None

    @property
    def constraints(self) -> tuple[str, ...]:
        return tuple(self.utilisation)

    @property
    def kind(self) -> PartKind:
        """What kind of part this case sizes."""
        return part_kind(self.function, self.load)

    @property
    def section_symbols(self) -> frozenset[str]:
        """The section quantities (A, I, Imin, Z, J, Zt) its constraints read."""
        used = frozenset().union(*(m.symbols for m in self.utilisation.values()))
        return used & SECTION_QUANTITIES


def _check_choice(value: str | None, choices: tuple[str, ...], where: str) -> str:
    if value not in choices:
        raise InputError(where, f"{value!r} is not supported here", did_you_mean(str(value), choices))
    return value


def load_case(function: str, support: str | None = None, load: str | None = None) -> LoadCase:
    """The load case for a function and, where it matters, its support and load.

    Every case carries fracture and fatigue on its peak stress, and natural frequency
    where it has a first mode (``_with_failure_modes``).
    """
    return _with_failure_modes(_base_case(function, support, load), support)


def _base_case(function: str, support: str | None, load: str | None) -> LoadCase:
    _check_choice(function, FUNCTIONS, "part.function")
    if PART_KINDS[function].bends:
        support = _check_choice(support or "simply-supported", BEAM_SUPPORTS, "part.support")
        default_load = "end" if support == "cantilever" else "centre"
        load = load or default_load
        valid = tuple(ld for (s, ld) in BEAM_CONSTANTS if s == support)
        _check_choice(load, valid, "part.load")
        return _bending(function, support, load)
    if function == "column":
        support = _check_choice(support or "pinned-pinned", COLUMN_SUPPORTS, "part.support")
        return _column(support)
    if function == "cylinder":
        load = _check_choice(load or "internal", VESSEL_LOADS, "part.load")
        return _cylinder() if load == "internal" else _cylinder_outside()
    if function == "sphere":
        if load == "external":
            raise InputError("part.load", *SPHERE_EXTERNAL)
        _check_choice(load or "internal", VESSEL_LOADS_OF["sphere"], "part.load")
    return {
        "tie": _tie,
        "shaft": _shaft,
        "plate": _plate,
        "sphere": _sphere,
        "spring": _spring,
    }[function]()


def _tie() -> LoadCase:
    return LoadCase(
        function="tie",
        title="tie in tension",
        utilisation={
            "stiffness": M.of(1, F=1, L=1, A=-1, E=-1, delta=-1),
            "strength": M.of(1, F=1, SF=1, A=-1, sigma_y=-1),
        },
        responses={"deflection": M.of(1, F=1, L=1, A=-1, E=-1), "stress": M.of(1, F=1, A=-1)},
        equations={
            "stiffness": "extension δ = F·L/(A·E) ≤ δ_max",
            "strength": "stress σ = F/A ≤ σ_y/SF",
        },
        volume=M.of(1, A=1, L=1),
        allowed_free=("scale",),
    )


def _bending(function: str, support: str, load: str) -> LoadCase:
    c_defl, c_moment = BEAM_CONSTANTS[(support, load)]
    return LoadCase(
        function=function,
        title=f"{function}, {support}, {load} load",
        utilisation={
            "stiffness": M.of(1 / c_defl, F=1, L=3, E=-1, I=-1, delta=-1),
            "strength": M.of(1 / c_moment, F=1, L=1, SF=1, Z=-1, sigma_y=-1),
        },
        responses={
            "deflection": M.of(1 / c_defl, F=1, L=3, E=-1, I=-1),
            "stress": M.of(1 / c_moment, F=1, L=1, Z=-1),
        },
        equations={
            "stiffness": f"deflection δ = F·L³/(C·E·I) ≤ δ_max, C = {c_defl:g}",
            "strength": f"peak stress σ = M/Z = F·L/(C_M·Z) ≤ σ_y/SF, C_M = {c_moment:g}",
        },
        volume=M.of(1, A=1, L=1),
        allowed_free=("thickness",) if function == "panel" else ("scale", "depth", "width", "wall"),
    )


def _column(support: str) -> LoadCase:
    n2 = EULER_N2[support]
    return LoadCase(
        function="column",
        title=f"column, {support}",
        utilisation={
            "buckling": M.of(1 / (n2 * math.pi**2), F=1, SF=1, L=2, E=-1, Imin=-1),
            "strength": M.of(1, F=1, SF=1, A=-1, sigma_c=-1),
            "stiffness": M.of(1, F=1, L=1, A=-1, E=-1, delta=-1),
        },
        responses={
            "deflection": M.of(1, F=1, L=1, A=-1, E=-1),
            "stress": M.of(1, F=1, A=-1),
            "buckling_load": M.of(n2 * math.pi**2, E=1, Imin=1, L=-2),
        },
        equations={
            "buckling": f"Euler load F_cr = n²·π²·E·I_min/L² ≥ SF·F (least principal I), n² = {n2:g}",
            "strength": "crushing stress σ = F/A ≤ σ_c/SF",
            "stiffness": "shortening δ = F·L/(A·E) ≤ δ_max",
        },
        volume=M.of(1, A=1, L=1),
        allowed_free=("scale", "wall"),
    )


def _shaft() -> LoadCase:
    return LoadCase(
        function="shaft",
        title="shaft in torsion",
        utilisation={
            "stiffness": M.of(1, T=1, L=1, G=-1, J=-1, theta=-1),
            "strength": M.of(1 / SHEAR_YIELD_RATIO, T=1, SF=1, Zt=-1, sigma_y=-1),
        },
        responses={"twist": M.of(1, T=1, L=1, G=-1, J=-1), "stress": M.of(1, T=1, Zt=-1)},
        equations={
            "stiffness": "twist θ = T·L/(G·J) ≤ θ_max",
            "strength": "shear stress τ = T/Z_t ≤ σ_y/(√3·SF)",
        },
        volume=M.of(1, A=1, L=1),
        allowed_free=("scale", "wall"),
    )


def _plate() -> LoadCase:
    k = PLATE_K * math.pi**2 / (12 * (1 - PLATE_NU**2))
    return LoadCase(
        function="plate",
        title="plate under in-plane compression",
        utilisation={
            "buckling": M.of(1 / k, F=1, SF=1, b=1, E=-1, t=-3),
            "strength": M.of(1, F=1, SF=1, b=-1, t=-1, sigma_c=-1),
        },
        responses={"stress": M.of(1, F=1, b=-1, t=-1)},
        equations={
            "buckling": f"σ = F/(b·t) ≤ σ_cr/SF, σ_cr = k·π²·E/(12(1−ν²))·(t/b)², "
            f"k = {PLATE_K:g}, ν = {PLATE_NU}",
            "strength": "σ = F/(b·t) ≤ σ_c/SF",
        },
        volume=M.of(1, b=1, t=1, L=1),
        allowed_free=("thickness",),
        notes=(f"plate buckling assumes ν = {PLATE_NU} for every class",),
    )


def _cylinder() -> LoadCase:
    return LoadCase(
        function="cylinder",
        title="thin-walled cylinder under internal pressure",
        utilisation={
            "strength": M.of(1, p=1, r=1, SF=1, t=-1, sigma_y=-1),
            "stiffness": M.of(1, p=1, r=2, t=-1, E=-1, delta=-1),
        },
        responses={"stress": M.of(1, p=1, r=1, t=-1), "deflection": M.of(1, p=1, r=2, t=-1, E=-1)},
        equations={
            "strength": "hoop stress σ = p·r/t ≤ σ_y/SF",
            "stiffness": "radial growth δ = p·r²/(E·t) ≤ δ_max (Poisson effect neglected)",
        },
        volume=M.of(2 * math.pi, r=1, L=1, t=1),
        allowed_free=("wall",),
    )


def _cylinder_outside() -> LoadCase:
    return LoadCase(
        function="cylinder",
        title="thin-walled cylinder under external pressure",
        utilisation={
            "buckling": M.of(1 / TUBE_BUCKLING, p=1, SF=1, r=3, t=-3, E=-1),
            "strength": M.of(1, p=1, r=1, SF=1, t=-1, sigma_c=-1),
            "stiffness": M.of(1, p=1, r=2, t=-1, E=-1, delta=-1),
        },
        responses={
            "stress": M.of(1, p=1, r=1, t=-1),
            "deflection": M.of(1, p=1, r=2, t=-1, E=-1),
            "buckling_pressure": M.of(TUBE_BUCKLING, E=1, t=3, r=-3),
        },
        equations={
            "buckling": "long-tube buckling pressure p_cr = E/(4(1−ν²))·(t/r)³ ≥ SF·p (Bresse), "
            f"ν = {PLATE_NU}",
            "strength": "compressive hoop stress σ = p·r/t ≤ σ_c/SF",
            "stiffness": "radial shrinkage δ = p·r²/(E·t) ≤ δ_max (Poisson effect neglected)",
        },
        volume=M.of(2 * math.pi, r=1, L=1, t=1),
        allowed_free=("wall",),
        notes=(f"tube buckling assumes ν = {PLATE_NU} for every class",),
        load="external",
    )


SPHERE_EXTERNAL = (
    "a sphere is sized for internal pressure only",
    'load = "internal" or no load; a sphere\'s buckling under external pressure is so sensitive '
    "to out-of-roundness "
    "that tests fall to a small fraction of the classical value, so no formula here sizes it: use "
    'a cylinder with load = "external", or test-based design rules for a sphere',
)
"""Why a sphere refuses external pressure, and what to do instead."""

EXTERNAL_CRITERION = (
    "leak-before-break and yield-before-break apply to a vessel under internal pressure, "
    "not external: its wall is in compression, where a through crack does not open",
    "no criterion; a fracture constraint with crack_length still checks the compressive hoop stress",
)
"""Why a vessel fracture criterion is refused under external pressure, and what to do instead."""


def _sphere() -> LoadCase:
    return LoadCase(
        function="sphere",
        title="thin-walled sphere under internal pressure",
        utilisation={
            "strength": M.of(0.5, p=1, r=1, SF=1, t=-1, sigma_y=-1),
            "stiffness": M.of(0.5, p=1, r=2, t=-1, E=-1, delta=-1),
        },
        responses={"stress": M.of(0.5, p=1, r=1, t=-1), "deflection": M.of(0.5, p=1, r=2, t=-1, E=-1)},
        equations={
            "strength": "membrane stress σ = p·r/(2t) ≤ σ_y/SF",
            "stiffness": "radial growth δ = p·r²/(2·E·t) ≤ δ_max (Poisson effect neglected)",
        },
        volume=M.of(4 * math.pi, r=2, t=1),
        allowed_free=("wall",),
    )


def _spring() -> LoadCase:
    return LoadCase(
        function="spring",
        title="spring storing elastic energy (uniform stress)",
        utilisation={"strength": M.of(math.sqrt(2), SF=1, E=0.5, U=0.5, V=-0.5, sigma_y=-1)},
        responses={"stress": M.of(math.sqrt(2), E=0.5, U=0.5, V=-0.5)},
        equations={"strength": "energy U = V·σ²/(2E), so σ = (2·E·U/V)^(1/2) ≤ σ_y/SF"},
        volume=M.of(1, V=1),
        allowed_free=("scale",),
        notes=("the spring is taken as uniformly stressed; a leaf or coil spring stores a fixed fraction",),
    )


SHAFT_FATIGUE_RATIO = math.sqrt(3)
"""Shafts: the von Mises equivalent of the shear stress, √3·τ, is set against σ_e (and σ_ts)."""


def _frequency(case: LoadCase, support: str | None) -> tuple[M, str, str | None] | None:
    """(utilisation, equation, note) of the lowest natural frequency, or None."""
    fn = case.function
    if case.kind.bends:
        support = support or "simply-supported"
        lam = fm.BEAM_EIGENVALUES[support]
        note = (
            "panel frequency: the first bending mode of a strip on its supports (ν neglected, "
            "which underestimates the plate's frequency by about 5 %)"
            if fn == "panel"
            else None
        )
        return (
            fm.bending_frequency(support),
            f"first bending mode f₁ = (λL)²/(2π·L²)·√(E·I/(ρ·A)) ≥ f_min, λL = {lam:.6g} "
            "(Euler–Bernoulli, own mass only)",
            note,
        )
    if fn == "shaft":
        return (
            fm.bending_frequency("simply-supported"),
            "whirling: first bending mode of a simply supported shaft "
            "f₁ = π/(2·L²)·√(E·I/(ρ·A)) ≥ f_min (own mass only)",
            "shaft whirling: the first critical speed is the first bending frequency of a simply "
            "supported shaft with its own mass",
        )
    if fn == "tie":
        return (
            fm.axial_frequency(),
            "first axial mode f₁ = √(E/ρ)/(2L) ≥ f_min, both ends held (independent of the area)",
            None,
        )
    if fn == "plate":
        return (
            fm.plate_frequency(),
            f"first mode of a plate simply supported on all edges f₁₁ = (π/2)·(1/L² + 1/b²)·"
            f"√(D/(ρ·t)) ≥ f_min, D = E·t³/(12(1−ν²)), ν = {fm.PLATE_NU}",
            None,
        )
    return None


def _with_failure_modes(case: LoadCase, support: str | None) -> LoadCase:
    """The case with fracture and fatigue on its peak stress and its first natural frequency."""
    stress = case.responses["stress"]
    notes: dict[str, str] = {}
    fatigue_ratio = SHAFT_FATIGUE_RATIO if case.function == "shaft" else 1.0
    utilisation = dict(case.utilisation) | {
        "fracture": fm.fracture(stress),
        "fatigue": fm.fatigue(stress, fatigue_ratio),
    }
    equations = dict(case.equations) | {"fracture": fm.FRACTURE_EQUATION, "fatigue": fm.FATIGUE_EQUATION}
    if case.function == "shaft":
        equations["fracture"] += "; in torsion the largest principal stress equals τ"
        equations["fatigue"] += "; in torsion σ is the von Mises equivalent √3·τ"
    if case.kind.in_compression:
        for kind in ("fracture", "fatigue"):
            notes[kind] = (
                f"{kind} is checked on the compressive stress (conservative: cracks close under compression)"
            )
    frequency = _frequency(case, support)
    if frequency is not None:
        utilisation["frequency"], equations["frequency"], note = frequency
        if note:
            notes["frequency"] = note
    return replace(case, utilisation=utilisation, equations=equations, constraint_notes=notes)


def with_requirement(case: LoadCase, criterion: str | None = None, load_ratio: float = -1.0) -> LoadCase:
    """The case with a vessel's fracture criterion and the fatigue load ratio R applied.

    ``criterion`` replaces the given-crack fracture check: leak-before-break takes a
    crack as deep as the wall at the working stress; yield-before-break asks that the
    given crack not run before the wall yields (a check on the class, free of size).
    """
    utilisation, equations = dict(case.utilisation), dict(case.equations)
    if criterion is not None:
        _check_choice(criterion, fm.CRITERIA, "constraint.criterion")
        if not case.kind.vessel:
            raise InputError(
                "constraint.criterion",
                f"{criterion!r} applies to pressure vessels, not a {case.function}",
                "function cylinder or sphere, or no criterion",
            )
        if case.kind.in_compression:
            raise InputError("constraint.criterion", *EXTERNAL_CRITERION)
        utilisation["fracture"] = (
            fm.leak_before_break(case.responses["stress"])
            if criterion == "leak-before-break"
            else fm.yield_before_break()
        )
        equations["fracture"] = fm.CRITERION_EQUATIONS[criterion]
    if not -1.0 <= load_ratio < 1.0:
        raise InputError(
            "constraint.load_ratio",
            f"{load_ratio!r} is outside the range handled",
            "R = min load / max load from -1 (fully reversed) up to, not including, 1",
        )
    if load_ratio != fm.FULLY_REVERSED:
        utilisation["fatigue"] = fm.with_load_ratio(utilisation["fatigue"], load_ratio)
        equations["fatigue"] += f"; R = {load_ratio:g}"
    return replace(case, utilisation=utilisation, equations=equations)

"""Sandwich beams and one-way panels: two equal faces bonded to a core.

Every relation takes numpy arrays (one value per face × core pair, or any
broadcastable shape) and returns arrays, so the pair search sizes thousands of
pairs at once.

Symbols (SI): b width [m] (a panel is sized per its given width), t_f face thickness
[m], t_c core thickness [m], d = t_c + t_f distance between the face centroids [m],
h = t_c + 2·t_f overall thickness [m]; E_f face modulus, E_c core modulus out of plane,
G_c core transverse shear modulus [Pa]; F total load [N], L span [m], M bending moment
[N·m], V shear force [N].

Sources (from memory): H. G. Allen, *Analysis and Design of Structural Sandwich
Panels*, Pergamon, 1969, ch. 2 (flexural rigidity, thin-face and weak-core limits)
and ch. 8 (face wrinkling); D. Zenkert, *An Introduction to Sandwich Construction*,
EMAS, 1995, ch. 4 (bending and shear deflection constants B₁, B₂);
L. J. Gibson and M. F. Ashby, *Cellular Solids*, 2nd ed., CUP, 1997, ch. 9
(failure modes of sandwich beams with foam cores).

Assumptions, stated with every result: equal faces, perfectly bonded; the core
is antiplane (carries no bending stress, so its own term E_c·b·t_c³/12 is left out
of D, which is conservative) and uniformly sheared, τ = V/(b·d); a panel spans
one way between two supported edges, with the other two edges free and plate
(Poisson) action neglected, which is conservative; loads are spread so no local
indentation of the core governs.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np

from selector.mechanics.loadcases import BEAM_CONSTANTS

Value = float | np.ndarray
"""One number, or an array of them (one per pair), in SI units."""

SOURCES = (
    "H. G. Allen, Analysis and Design of Structural Sandwich Panels, Pergamon, 1969: ch. 2 "
    "(flexural rigidity, thin-face and weak-core limits), ch. 8 (face wrinkling)",
    "D. Zenkert, An Introduction to Sandwich Construction, EMAS, 1995: ch. 4 "
    "(bending and shear deflection constants B₁, B₂)",
    "L. J. Gibson and M. F. Ashby, Cellular Solids, 2nd ed., Cambridge University Press, 1997: "
    "ch. 9 (failure modes of sandwich beams with foam cores)",
)
"""The texts the model follows (cited from memory), for every output that states the model."""

MODES = ("stiffness", "face-yield", "face-wrinkling", "core-shear")
"""The failure modes of a sandwich, in the order they are reported."""

SHEAR_CONSTANTS: dict[tuple[str, str], tuple[float, float]] = {
    # δ_shear = F·L/(B₂·S) and the largest shear force V = F/C_V, F the total load.
    # Zenkert 1995, Table 4.1 (from memory); the fixed-end moments do not depend on S by symmetry.
    ("cantilever", "end"): (1.0, 1.0),
    ("cantilever", "uniform"): (2.0, 1.0),
    ("simply-supported", "centre"): (4.0, 2.0),
    ("simply-supported", "uniform"): (8.0, 2.0),
    ("fixed-fixed", "centre"): (4.0, 2.0),
    ("fixed-fixed", "uniform"): (8.0, 2.0),
}

WRINKLING_COEFFICIENT = 0.5
"""σ_wr = 0.5·(E_f·E_c·G_c)^(1/3): Hoff and Mautner's lower value, as quoted by Allen (1969, ch. 8)."""

THIN_FACE_RATIO = 5.77
"""d/t_f above which the faces' own bending is under 1 % of D (Allen 1969, ch. 2, from memory)."""

ASSUMPTIONS = (
    "faces equal and perfectly bonded; D includes the faces' own bending E_f·b·t_f³/6",
    "antiplane core: its own bending E_c·b·t_c³/12 is left out of D (conservative) and it is "
    "uniformly sheared, core shear stress V/(b·d)",
    "face wrinkling by Hoff and Mautner's lower bound 0.5·(E_f·E_c·G_c)^(1/3), "
    "valid for a core thick enough that the wrinkle decays inside it",
    "face yield checks the compression face too: allowable min(σ_y, σ_c) of the face",
    "loads spread over the faces: local indentation of the core is not checked",
)
PANEL_EDGES = (
    "panel spans one way: the two edges across the span are supported as the part's support says, "
    "the two edges along it are free; plate (Poisson) action is neglected, which is conservative"
)


@dataclass(frozen=True)
class SandwichCase:
    """The beam constants of one support and load for a sandwich.

    Attributes:
        support, load: as in ``mechanics.loadcases``.
        b1: bending deflection constant, δ_b = F·L³/(B₁·D).
        b2: shear deflection constant, δ_s = F·L/(B₂·S).
        c_moment: M_max = F·L/C_M.
        c_shear: V_max = F/C_V.
    """

    support: str
    load: str
    b1: float
    b2: float
    c_moment: float
    c_shear: float

    @property
    def equations(self) -> tuple[str, ...]:
        return (
            f"δ = F·L³/(B₁·D) + F·L/(B₂·S), B₁ = {self.b1:g}, B₂ = {self.b2:g}",
            "D = E_f·b·t_f·d²/2 + E_f·b·t_f³/6 (antiplane core), S = G_c·b·d²/t_c, d = t_c + t_f",
            f"face stress σ_f = M·E_f·h/(2·D) ≈ M/(b·t_f·d), M = F·L/{self.c_moment:g}",
            "face wrinkling σ_wr = 0.5·(E_f·E_c·G_c)^(1/3)",
            f"core shear τ = V/(b·d), V = F/{self.c_shear:g}",
        )


def sandwich_case(support: str, load: str) -> SandwichCase:
    """The constants for a support and load that ``mechanics.loadcases`` knows."""
    b1, c_moment = BEAM_CONSTANTS[(support, load)]
    b2, c_shear = SHEAR_CONSTANTS[(support, load)]
    return SandwichCase(support, load, b1, b2, c_moment, c_shear)


def flexural_rigidity(E_f: Value, E_c: Value, b: Value, t_f: Value, t_c: Value) -> Value:
    """D [N·m²]: the faces about the centre line, their own bending, and the core's (E_c in-plane).

    The sizing passes E_c = 0 (antiplane core); the full form is for checks.
    """
    d = t_c + t_f
    return E_f * b * (t_f * d**2 / 2 + t_f**3 / 6) + E_c * b * t_c**3 / 12


def shear_stiffness(G_c: Value, b: Value, t_f: Value, t_c: Value) -> Value:
    """S = G_c·b·d²/t_c [N]: the core's shear stiffness (Allen's thin-face form)."""
    d = t_c + t_f
    return G_c * b * d**2 / t_c


def deflection_parts(
    case: SandwichCase,
    F: Value,
    L: Value,
    E_f: Value,
    E_c: Value,
    G_c: Value,
    b: Value,
    t_f: Value,
    t_c: Value,
) -> tuple[Value, Value]:
    """(bending, shear) deflection [m] of the loaded point for the total load F [N]."""
    bending = F * L**3 / (case.b1 * flexural_rigidity(E_f, E_c, b, t_f, t_c))
    with np.errstate(divide="ignore"):
        shear = F * L / (case.b2 * shear_stiffness(G_c, b, t_f, t_c))
    return bending, shear


def face_stress(
    case: SandwichCase, F: Value, L: Value, E_f: Value, E_c: Value, b: Value, t_f: Value, t_c: Value
) -> Value:
    """Peak face stress [Pa] at the outer fibre: M·E_f·h/(2·D), → M/(b·t_f·d) for thin faces."""
    moment = F * L / case.c_moment
    h = t_c + 2 * t_f
    return moment * E_f * h / (2 * flexural_rigidity(E_f, E_c, b, t_f, t_c))


def wrinkling_stress(E_f: Value, E_c: Value, G_c: Value) -> Value:
    """Compressive face stress [Pa] at which the face wrinkles into the core."""
    return WRINKLING_COEFFICIENT * np.cbrt(E_f * E_c * G_c)


def core_shear_stress(case: SandwichCase, F: Value, b: Value, t_f: Value, t_c: Value) -> Value:
    """Core shear stress [Pa]: V/(b·d), uniform through an antiplane core."""
    return F / case.c_shear / (b * (t_c + t_f))


def utilisations(
    case: SandwichCase,
    loads: Mapping[str, Value],
    faces: Mapping[str, Value],
    cores: Mapping[str, Value],
    t_f: Value,
    t_c: Value,
) -> dict[str, Value]:
    """Each mode's utilisation (1 at the limit) for thicknesses t_f, t_c [m].

    Args:
        loads: F [N], L [m], b [m], delta (allowed deflection [m], inf for none), SF (strength).
        faces: E [Pa], allow (min(σ_y, σ_c) [Pa]).
        cores: E (out of plane), G, tau [Pa].
    """
    F, L, b, sf = loads["F"], loads["L"], loads["b"], loads["SF"]
    E_f, G_c = faces["E"], cores["G"]
    bending, shear = deflection_parts(case, F, L, E_f, 0.0, G_c, b, t_f, t_c)
    sigma = face_stress(case, F, L, E_f, 0.0, b, t_f, t_c)
    return {
        "stiffness": (bending + shear) / loads["delta"],
        "face-yield": sf * sigma / faces["allow"],
        "face-wrinkling": sf * sigma / wrinkling_stress(E_f, cores["E"], G_c),
        "core-shear": sf * core_shear_stress(case, F, b, t_f, t_c) / cores["tau"],
    }


def validity_warnings(t_f: float, t_c: float) -> list[str]:
    """The thin-face limit a sized pair falls outside (Allen 1969, ch. 2)."""
    d = t_c + t_f
    if d / t_f < THIN_FACE_RATIO:
        return [
            f"thick faces (d/t_f = {d / t_f:.2g} < {THIN_FACE_RATIO}): wrinkling and core shear "
            "use thin-face relations"
        ]
    return []


def max_utilisation(
    case: SandwichCase,
    loads: Mapping[str, Value],
    faces: Mapping[str, Value],
    cores: Mapping[str, Value],
    t_f: Value,
    t_c: Value,
) -> np.ndarray:
    """The largest of the four utilisations of ``utilisations``, in one pass (the search's inner loop).

    D is formed once and the two face modes share one stress, so this is several times faster
    than taking the maximum over ``utilisations``; both give the same numbers.
    """
    F, L, b, sf = loads["F"], loads["L"], loads["b"], loads["SF"]
    E_f = faces["E"]
    d = t_c + t_f
    D = E_f * b * t_f * (d * d / 2 + t_f * t_f / 6)
    stiffness = (F * L**3 / (case.b1 * D) + F * L * t_c / (case.b2 * cores["G"] * b * d * d)) / loads["delta"]
    face_limit = faces.get("limit")  # min(allow, σ_wr), when the caller has formed it once
    if face_limit is None:
        face_limit = np.fmin(faces["allow"], wrinkling_stress(E_f, cores["E"], cores["G"]))
    face = sf * (F * L / case.c_moment) * E_f * (t_c + 2 * t_f) / (2 * D * face_limit)
    core = sf * F / (case.c_shear * b * d * cores["tau"])
    return np.maximum(np.maximum(stiffness, face), core)

"""Cross-section geometry: area, centroid, second moments, section moduli, torsion, shape factors.

Every length is in metres and every result in SI (m², m³, m⁴, rad). Axes: x runs along the
width, y up the depth; the centroid is measured from the bottom-left corner of the section's
bounding box, and Ixx, Iyy, Ixy are taken about centroidal axes parallel to x and y, with
Ixy = ∫ x·y dA. Straight-sided shapes are built from rectangles and polygons and combined by
the parallel-axis theorem, so their bending properties are exact; round shapes use the exact
circle formulas.

Shape factors compare a section with a solid square of the same area (so the square scores 1):

* bending stiffness  φ_B^e = 12·Ixx/A²
* bending strength   φ_B^f = 6·Zx/A^1.5
* torsion stiffness  φ_T^e = J/(c_J·A²), c_J = J/a⁴ of a solid square by our rectangle formula
* torsion strength   φ_T^f = Zt/(c_Z·A^1.5), c_Z = Zt/a³ of a solid square likewise
"""

from __future__ import annotations

import contextlib
import math
import numbers
from collections.abc import Callable, Iterable, Mapping, Sequence
from dataclasses import dataclass, field

import numpy as np

from selector.errors import InputError
from selector.suggest import did_you_mean

__all__ = [
    "SHAPES",
    "Polygon",
    "Rect",
    "Section",
    "angle",
    "box",
    "build_section",
    "channel",
    "composite",
    "i_section",
    "rectangle",
    "round_bar",
    "sandwich",
    "scaled",
    "tee",
    "tube",
    "with_dims",
]

SHAPES: dict[str, tuple[str, ...]] = {
    "rectangle": ("b", "h"),
    "round": ("d",),
    "tube": ("d", "t"),
    "box": ("b", "h", "t"),
    "i-section": ("b", "h", "tf", "tw"),
    "channel": ("b", "h", "tf", "tw"),
    "angle": ("b", "h", "t"),
    "tee": ("b", "h", "tf", "tw"),
    "sandwich": ("b", "h", "t", "E_face", "E_core"),
}
"""Shape name -> the dimension names it needs (lengths in m; E_face, E_core in Pa)."""

_MODULI = frozenset({"E_face", "E_core"})
"""Dimensions that are moduli, not lengths: scaling a section leaves them alone."""

_TINY = 1e-12
"""Relative size below which a product of inertia is rounding noise and is set to zero."""


@dataclass(frozen=True)
class Section:
    """The properties of one cross-section, all in SI units.

    Attributes:
        shape: shape name (a key of ``SHAPES``, or ``"composite"``).
        dims: the dimensions it was built from, name -> m (moduli in Pa).
        A: area [m²] (face-equivalent for a sandwich, see ``EI_per_E_face``).
        cx, cy: centroid from the bottom-left of the bounding box [m].
        Ixx, Iyy, Ixy: second moments and product of area about centroidal x, y [m⁴].
        I11, I22: major and minor principal second moments [m⁴].
        phi: angle from the x axis to the major principal axis [rad], in (-π/2, π/2].
        depth, width: bounding-box height (along y) and width (along x) [m].
        Zx_top, Zx_bottom: elastic moduli Ixx/(distance to the top or bottom fibre) [m³].
        Zy_left, Zy_right: elastic moduli Iyy/(distance to the left or right fibre) [m³].
        rx, ry: radii of gyration √(Ixx/A), √(Iyy/A) [m].
        J: torsion constant, torsional stiffness GJ [m⁴]; NaN where no formula is offered.
        J_method: the formula used for J and where it is valid.
        Zt: torsional section modulus, max shear stress τ = T/Zt [m³]; NaN where J is.
        Zt_method: the formula used for Zt and where it is valid.
        extra: shape-specific values (the sandwich's face and core areas).
    """

    shape: str
    dims: dict[str, float] = field(hash=False)
    A: float
    cx: float
    cy: float
    Ixx: float
    Iyy: float
    Ixy: float
    I11: float
    I22: float
    phi: float
    depth: float
    width: float
    Zx_top: float
    Zx_bottom: float
    Zy_left: float
    Zy_right: float
    rx: float
    ry: float
    J: float
    J_method: str
    Zt: float
    Zt_method: str
    extra: dict[str, float] = field(default_factory=dict, hash=False)

    @property
    def centroid(self) -> tuple[float, float]:
        """(cx, cy) [m] from the bottom-left of the bounding box."""
        return (self.cx, self.cy)

    @property
    def Zx(self) -> float:
        """Governing elastic modulus for bending about x, min(Zx_top, Zx_bottom) [m³]."""
        return min(self.Zx_top, self.Zx_bottom)

    @property
    def Zy(self) -> float:
        """Governing elastic modulus for bending about y, min(Zy_left, Zy_right) [m³]."""
        return min(self.Zy_left, self.Zy_right)

    @property
    def r_min(self) -> float:
        """Least radius of gyration √(I22/A) [m], the one that governs column buckling."""
        return math.sqrt(self.I22 / self.A)

    @property
    def EI_per_E_face(self) -> float:
        """Flexural rigidity about x over the face modulus, EI/E_face [m⁴].

        For a sandwich this counts the core through E_core/E_face and equals ``Ixx``;
        for a section of one material it is simply ``Ixx``.
        """
        return self.Ixx

    @property
    def phi_bending_stiffness(self) -> float:
        """Shape factor for elastic bending, φ_B^e = 12·Ixx/A² (solid square = 1)."""
        return 12.0 * self.Ixx / self.A**2

    @property
    def phi_bending_strength(self) -> float:
        """Shape factor for failure in bending, φ_B^f = 6·Zx/A^1.5 (solid square = 1)."""
        return 6.0 * self.Zx / self.A**1.5

    @property
    def phi_torsion_stiffness(self) -> float:
        """Shape factor for elastic twisting, φ_T^e = J/(c_J·A²), c_J ≈ 0.1408 (square = 1)."""
        return self.J / (_J_SQUARE * self.A**2)

    @property
    def phi_torsion_strength(self) -> float:
        """Shape factor for failure in torsion, φ_T^f = Zt/(c_Z·A^1.5), c_Z ≈ 0.208 (square = 1)."""
        return self.Zt / (_ZT_SQUARE * self.A**1.5)


@dataclass(frozen=True)
class Rect:
    """A rectangle for ``composite``: width b and height h [m], bottom-left corner at (x, y) [m].

    ``hole=True`` cuts it out of the solid parts instead of adding it.
    """

    b: float
    h: float
    x: float = 0.0
    y: float = 0.0
    hole: bool = False


@dataclass(frozen=True)
class Polygon:
    """A simple polygon for ``composite``: its corners (x, y) [m] in order, either direction.

    ``hole=True`` cuts it out of the solid parts instead of adding it.
    """

    points: tuple[tuple[float, float], ...]
    hole: bool = False

    def __post_init__(self) -> None:
        with contextlib.suppress(TypeError):  # if not, composite() reports it with the part's place
            object.__setattr__(self, "points", tuple(tuple(p) for p in self.points))


# --------------------------------------------------------------------------- pieces


@dataclass(frozen=True)
class _Piece:
    """Signed area A, centroid (cx, cy) and own-centroidal Ixx, Iyy, Ixy of one part."""

    A: float
    cx: float
    cy: float
    Ixx: float
    Iyy: float
    Ixy: float


def _rect_piece(b: float, h: float, x: float, y: float, sign: float = 1.0) -> _Piece:
    """A b × h rectangle with its bottom-left corner at (x, y); sign -1 for a hole."""
    return _Piece(sign * b * h, x + b / 2, y + h / 2, sign * b * h**3 / 12, sign * h * b**3 / 12, 0.0)


def _circle_piece(d: float, x: float, y: float, sign: float = 1.0) -> _Piece:
    """A circle of diameter d centred at (x, y); sign -1 for a hole."""
    inertia = sign * math.pi * d**4 / 64
    return _Piece(sign * math.pi * d**2 / 4, x, y, inertia, inertia, 0.0)


def _polygon_piece(points: np.ndarray, sign: float = 1.0) -> _Piece:
    """A simple polygon by the shoelace (Green's theorem) formulas; sign -1 for a hole.

    Integrals are taken about the mean of the corners to keep rounding small, then moved
    to the polygon's own centroid; a clockwise corner order is turned round.
    """
    origin = points.mean(axis=0)
    x, y = (points - origin).T
    xn, yn = np.roll(x, -1), np.roll(y, -1)
    cross = x * yn - xn * y
    area = cross.sum() / 2
    turn = 1.0 if area > 0 else -1.0
    area *= turn
    qy = turn * ((x + xn) * cross).sum() / 6  # ∫ x dA about the origin
    qx = turn * ((y + yn) * cross).sum() / 6  # ∫ y dA about the origin
    ixx = turn * ((y * y + y * yn + yn * yn) * cross).sum() / 12
    iyy = turn * ((x * x + x * xn + xn * xn) * cross).sum() / 12
    ixy = turn * ((x * yn + 2 * x * y + 2 * xn * yn + xn * y) * cross).sum() / 24
    cx, cy = qy / area, qx / area
    return _Piece(
        sign * area,
        float(origin[0] + cx),
        float(origin[1] + cy),
        sign * float(ixx - area * cy**2),
        sign * float(iyy - area * cx**2),
        sign * float(ixy - area * cx * cy),
    )


def _combine(pieces: Sequence[_Piece]) -> _Piece:
    """Sum parts about their common centroid by the parallel-axis theorem."""
    area = sum(p.A for p in pieces)
    cx = sum(p.A * p.cx for p in pieces) / area
    cy = sum(p.A * p.cy for p in pieces) / area
    ixx = sum(p.Ixx + p.A * (p.cy - cy) ** 2 for p in pieces)
    iyy = sum(p.Iyy + p.A * (p.cx - cx) ** 2 for p in pieces)
    ixy = sum(p.Ixy + p.A * (p.cx - cx) * (p.cy - cy) for p in pieces)
    if abs(ixy) <= _TINY * (abs(ixx) + abs(iyy)):
        ixy = 0.0
    return _Piece(area, cx, cy, ixx, iyy, ixy)


def _principal(ixx: float, iyy: float, ixy: float) -> tuple[float, float, float]:
    """Principal second moments I11 ≥ I22 [m⁴] and the major-axis angle φ [rad] (Mohr's circle)."""
    mean, half = (ixx + iyy) / 2, (ixx - iyy) / 2
    radius = math.hypot(half, ixy)
    if ixy == 0.0:
        phi = 0.0 if ixx >= iyy or abs(half) <= _TINY * abs(mean) else math.pi / 2
    else:
        phi = 0.5 * math.atan2(-2.0 * ixy, ixx - iyy)
    return mean + radius, mean - radius, phi


def _section(
    shape: str,
    dims: Mapping[str, float],
    pieces: Sequence[_Piece],
    origin: tuple[float, float],
    size: tuple[float, float],
    torsion: tuple[float, str, float, str],
    extra: Mapping[str, float] | None = None,
) -> Section:
    """Assemble a Section from its parts, bounding box (origin, (width, depth)) and torsion data."""
    total = _combine(pieces)
    (x0, y0), (width, depth) = origin, size
    cx, cy = total.cx - x0, total.cy - y0
    i11, i22, phi = _principal(total.Ixx, total.Iyy, total.Ixy)
    j, j_method, zt, zt_method = torsion
    return Section(
        shape=shape,
        dims=dict(dims),
        A=total.A,
        cx=cx,
        cy=cy,
        Ixx=total.Ixx,
        Iyy=total.Iyy,
        Ixy=total.Ixy,
        I11=i11,
        I22=i22,
        phi=phi,
        depth=depth,
        width=width,
        Zx_top=total.Ixx / (depth - cy),
        Zx_bottom=total.Ixx / cy,
        Zy_left=total.Iyy / cx,
        Zy_right=total.Iyy / (width - cx),
        rx=math.sqrt(total.Ixx / total.A),
        ry=math.sqrt(total.Iyy / total.A),
        J=j,
        J_method=j_method,
        Zt=zt,
        Zt_method=zt_method,
        extra=dict(extra or {}),
    )


# --------------------------------------------------------------------------- torsion


def _rect_torsion(b: float, h: float) -> tuple[float, float]:
    """Torsion constant J [m⁴] and modulus Zt [m³] of a solid b × h rectangle.

    With a the longer and c the shorter side (full lengths):
    J = a·c³·[1/3 − 0.21·(c/a)·(1 − c⁴/(12·a⁴))] and
    τ_max = 3T/(a·c²)·[1 + 0.6095 r + 0.8865 r² − 1.8023 r³ + 0.9100 r⁴], r = c/a
    (Roark's Formulas for Stress and Strain, table of torsion of straight bars, solid rectangle).
    """
    a, c = max(b, h), min(b, h)
    r = c / a
    j = a * c**3 * (1 / 3 - 0.21 * r * (1 - r**4 / 12))
    stress_factor = 1 + 0.6095 * r + 0.8865 * r**2 - 1.8023 * r**3 + 0.9100 * r**4
    return j, a * c**2 / (3 * stress_factor)


_J_SQUARE, _ZT_SQUARE = _rect_torsion(1.0, 1.0)
"""J/a⁴ ≈ 0.1408 and Zt/a³ ≈ 0.2078 of a solid square by our own formula: shape factors divide by these."""

_RECT_J = "solid rectangle, Roark: J = a·c³·[1/3 − 0.21·(c/a)·(1 − c⁴/(12a⁴))], a ≥ c; within 0.2%"
_RECT_ZT = "solid rectangle, Roark polynomial fit for τ_max at the middle of the long side; within ~1%"
_OPEN_ZT = "thin-walled open section: τ_max ≈ T·t_max/J; approximate, stress peaks at re-entrant corners"


def _open_torsion(strips: Iterable[tuple[float, float]], what: str) -> tuple[float, str, float, str]:
    """J = Σ b·t³/3 over the (length b, thickness t) strips of a thin-walled open section."""
    strips = list(strips)
    j = sum(b * t**3 / 3 for b, t in strips)
    t_max = max(t for _, t in strips)
    method = f"thin-walled open section: J = Σ b·t³/3 over {what}; good when every wall is slender (b ≫ t)"
    return j, method, j / t_max, _OPEN_ZT


# --------------------------------------------------------------------------- validation


def _expected_dims(shape: str) -> str:
    """The 'expected' phrase listing what a shape needs."""
    names = SHAPES[shape]
    lengths = ", ".join(n for n in names if n not in _MODULI)
    moduli = ", ".join(n for n in names if n in _MODULI)
    text = f"{shape} needs {lengths} (lengths in m)"
    return f"{text} and {moduli} (moduli in Pa)" if moduli else text


def _number(shape: str, name: str, value: object, allow_zero: bool = False) -> float:
    """A dimension as a float, checked to be a finite positive (or, if allowed, zero) number."""
    unit, kind = ("Pa", "modulus") if name in _MODULI else ("m", "length")
    where = f"section {shape}: {name}"
    if isinstance(value, bool) or not isinstance(value, numbers.Real) or not math.isfinite(value):
        raise InputError(where, f"{value!r} is not a finite number", f"a {kind} in {unit}")
    number = float(value)
    if number < 0 or (number == 0 and not allow_zero):
        bound = "≥ 0" if allow_zero else "> 0"
        raise InputError(where, f"{number:g} {unit} is not positive", f"a {kind} {bound} in {unit}")
    return number


def _numbers(shape: str, **values: object) -> dict[str, float]:
    """Check every dimension of a shape; E_core alone may be zero."""
    return {name: _number(shape, name, v, allow_zero=name == "E_core") for name, v in values.items()}


def _less(shape: str, name: str, left: tuple[str, float], right: tuple[str, float], expected: str) -> None:
    """Require left < right, naming both sides in the error."""
    (left_text, left_value), (right_text, right_value) = left, right
    if not left_value < right_value:
        what = f"{left_text} = {left_value:g} m is not less than {right_text} = {right_value:g} m"
        raise InputError(f"section {shape}: {name}", what, expected)


# --------------------------------------------------------------------------- shapes


def rectangle(b: float, h: float) -> Section:
    """Solid rectangle, width b along x and depth h along y [m]."""
    d = _numbers("rectangle", b=b, h=h)
    b, h = d["b"], d["h"]
    j, zt = _rect_torsion(b, h)
    return _section("rectangle", d, [_rect_piece(b, h, 0, 0)], (0, 0), (b, h), (j, _RECT_J, zt, _RECT_ZT))


def round_bar(d: float) -> Section:
    """Solid round bar of diameter d [m]; J = π d⁴/32 and Zt = π d³/16 are exact."""
    dims = _numbers("round", d=d)
    d = dims["d"]
    torsion = (
        math.pi * d**4 / 32,
        "solid circle, exact: J = π·d⁴/32 (polar moment)",
        math.pi * d**3 / 16,
        "solid circle, exact: τ_max = 16T/(π·d³) at the surface",
    )
    return _section("round", dims, [_circle_piece(d, d / 2, d / 2)], (0, 0), (d, d), torsion)


def tube(d: float, t: float) -> Section:
    """Round tube of outside diameter d and wall thickness t [m], t < d/2; J and Zt exact."""
    dims = _numbers("tube", d=d, t=t)
    d, t = dims["d"], dims["t"]
    _less("tube", "t", ("t", t), ("d/2", d / 2), "a wall thinner than half the outside diameter")
    inner = d - 2 * t
    j = math.pi * (d**4 - inner**4) / 32
    torsion = (
        j,
        "circular tube, exact: J = π·(d⁴ − d_i⁴)/32 (polar moment)",
        j / (d / 2),
        "circular tube, exact: τ_max = T·(d/2)/J at the outer surface",
    )
    pieces = [_circle_piece(d, d / 2, d / 2), _circle_piece(inner, d / 2, d / 2, -1.0)]
    return _section("tube", dims, pieces, (0, 0), (d, d), torsion)


def box(b: float, h: float, t: float) -> Section:
    """Rectangular hollow section, outside b × h, uniform wall t [m], 2t < b and 2t < h."""
    dims = _numbers("box", b=b, h=h, t=t)
    b, h, t = dims["b"], dims["h"], dims["t"]
    expected = "walls that leave a hollow: 2t < b and 2t < h"
    _less("box", "t", ("2t", 2 * t), ("b", b), expected)
    _less("box", "t", ("2t", 2 * t), ("h", h), expected)
    mid_area = (b - t) * (h - t)
    mid_perimeter = 2 * ((b - t) + (h - t))
    torsion = (
        4 * mid_area**2 * t / mid_perimeter,
        "thin-walled closed section (Bredt): J = 4·A_m²·t/p_m on the wall centre line; "
        "good for t ≪ b, h, error grows with t/b",
        2 * mid_area * t,
        "thin-walled closed section (Bredt): τ = T/(2·A_m·t); corners raise the peak",
    )
    pieces = [_rect_piece(b, h, 0, 0), _rect_piece(b - 2 * t, h - 2 * t, t, t, -1.0)]
    return _section("box", dims, pieces, (0, 0), (b, h), torsion)


def _flanged_checks(shape: str, b: float, h: float, tf: float, tw: float) -> None:
    """Two flanges tf thick leave room for the web, and the web tw is narrower than b."""
    _less(shape, "tf", ("2tf", 2 * tf), ("h", h), "flanges that leave room for the web: 2tf < h")
    _less(shape, "tw", ("tw", tw), ("b", b), "a web narrower than the flanges: tw < b")


def i_section(b: float, h: float, tf: float, tw: float) -> Section:
    """Doubly symmetric I-section: flange width b, overall depth h, flange tf, web tw [m].

    Sharp corners (root fillets ignored).
    """
    dims = _numbers("i-section", b=b, h=h, tf=tf, tw=tw)
    b, h, tf, tw = dims["b"], dims["h"], dims["tf"], dims["tw"]
    _flanged_checks("i-section", b, h, tf, tw)
    web = h - 2 * tf
    pieces = [
        _rect_piece(b, tf, 0, 0),
        _rect_piece(b, tf, 0, h - tf),
        _rect_piece(tw, web, (b - tw) / 2, tf),
    ]
    torsion = _open_torsion([(b, tf), (b, tf), (web, tw)], "two flanges b × tf and the web (h − 2tf) × tw")
    return _section("i-section", dims, pieces, (0, 0), (b, h), torsion)


def channel(b: float, h: float, tf: float, tw: float) -> Section:
    """Channel: web on the left (x = 0), flanges of width b pointing to +x, depth h [m]."""
    dims = _numbers("channel", b=b, h=h, tf=tf, tw=tw)
    b, h, tf, tw = dims["b"], dims["h"], dims["tf"], dims["tw"]
    _flanged_checks("channel", b, h, tf, tw)
    web = h - 2 * tf
    pieces = [_rect_piece(b, tf, 0, 0), _rect_piece(b, tf, 0, h - tf), _rect_piece(tw, web, 0, tf)]
    torsion = _open_torsion([(b, tf), (b, tf), (web, tw)], "two flanges b × tf and the web (h − 2tf) × tw")
    return _section("channel", dims, pieces, (0, 0), (b, h), torsion)


def angle(b: float, h: float, t: float) -> Section:
    """Angle (L): horizontal leg b along the bottom, vertical leg h up the left, thickness t [m].

    Equal or unequal legs; the product of inertia is negative in this orientation and the
    principal axes are inclined (φ = 45° for equal legs).
    """
    dims = _numbers("angle", b=b, h=h, t=t)
    b, h, t = dims["b"], dims["h"], dims["t"]
    expected = "legs longer than the thickness: t < b and t < h"
    _less("angle", "t", ("t", t), ("b", b), expected)
    _less("angle", "t", ("t", t), ("h", h), expected)
    pieces = [_rect_piece(b, t, 0, 0), _rect_piece(t, h - t, 0, t)]
    torsion = _open_torsion([(b, t), (h - t, t)], "the legs b × t and (h − t) × t")
    return _section("angle", dims, pieces, (0, 0), (b, h), torsion)


def tee(b: float, h: float, tf: float, tw: float) -> Section:
    """Tee: flange b × tf along the top, centred web tw below it, overall depth h [m]."""
    dims = _numbers("tee", b=b, h=h, tf=tf, tw=tw)
    b, h, tf, tw = dims["b"], dims["h"], dims["tf"], dims["tw"]
    _less("tee", "tf", ("tf", tf), ("h", h), "a flange thinner than the overall depth: tf < h")
    _less("tee", "tw", ("tw", tw), ("b", b), "a web narrower than the flange: tw < b")
    pieces = [_rect_piece(b, tf, 0, h - tf), _rect_piece(tw, h - tf, (b - tw) / 2, 0)]
    torsion = _open_torsion([(b, tf), (h - tf, tw)], "the flange b × tf and the web (h − tf) × tw")
    return _section("tee", dims, pieces, (0, 0), (b, h), torsion)


def sandwich(b: float, h: float, t: float, E_face: float, E_core: float) -> Section:
    """Sandwich beam: width b, overall depth h, two faces of thickness t [m]; moduli in Pa.

    The section is face-equivalent: the core counts with weight n = E_core/E_face, so
    ``A`` is EA/E_face and ``Ixx`` is ``EI_per_E_face`` = EI/E_face =
    b·(h³ − c³)/12 + n·b·c³/12 with core depth c = h − 2t, and M/Zx is the face stress.
    Core shear deflection, which matters for short spans and soft cores, is not included.
    ``extra`` holds the real areas ``A_faces``, ``A_core`` [m²] and ``E_core_over_E_face``.
    """
    dims = _numbers("sandwich", b=b, h=h, t=t, E_face=E_face, E_core=E_core)
    b, h, t = dims["b"], dims["h"], dims["t"]
    _less("sandwich", "t", ("2t", 2 * t), ("h", h), "faces that leave room for a core: 2t < h")
    n = dims["E_core"] / dims["E_face"]
    core = h - 2 * t
    pieces = [
        _rect_piece(b, t, 0, 0),
        _rect_piece(b, t, 0, h - t),
        _Piece(n * b * core, b / 2, h / 2, n * b * core**3 / 12, n * core * b**3 / 12, 0.0),
    ]
    j_face, zt_face = _rect_torsion(b, t)
    torsion = (
        2 * j_face,
        "the two faces alone as separate solid rectangles (Roark), in face-material terms; "
        "the core's shear coupling is ignored, so this is a lower bound",
        2 * zt_face,
        "each face carries half the torque as a solid rectangle (Roark); lower bound like J",
    )
    extra = {"A_faces": 2 * b * t, "A_core": b * core, "E_core_over_E_face": n}
    return _section("sandwich", dims, pieces, (0, 0), (b, h), torsion, extra)


# --------------------------------------------------------------------------- composite


def _part_piece(index: int, part: Rect | Polygon) -> tuple[_Piece, np.ndarray]:
    """One composite part as a signed piece, and its corner points for the bounding box."""
    where = f"section composite: part[{index}]"
    if not isinstance(part, Rect | Polygon):
        raise InputError(where, f"{part!r} is not a part", "Rect(b, h, x, y) or Polygon(points)")
    sign = -1.0 if part.hole else 1.0
    if isinstance(part, Rect):
        b = _number("composite", f"part[{index}].b", part.b)
        h = _number("composite", f"part[{index}].h", part.h)
        for name, value in (("x", part.x), ("y", part.y)):
            if isinstance(value, bool) or not isinstance(value, numbers.Real) or not math.isfinite(value):
                raise InputError(f"{where}.{name}", f"{value!r} is not a finite number", "a position in m")
        x, y = float(part.x), float(part.y)
        corners = np.array([(x, y), (x + b, y + h)])
        return _rect_piece(b, h, x, y, sign), corners
    try:
        points = np.asarray(part.points, dtype=float)
    except (TypeError, ValueError):
        points = np.empty(0)
    if points.ndim != 2 or points.shape[1] != 2:
        what = f"{part.points!r} is not a list of (x, y)"
        raise InputError(f"{where}.points", what, "at least 3 (x, y) points in m")
    if len(points) < 3:
        raise InputError(f"{where}.points", f"{len(points)} points", "at least 3 (x, y) points in m")
    if not np.isfinite(points).all():
        raise InputError(f"{where}.points", "a coordinate is not finite", "finite (x, y) points in m")
    x, y = (points - points.mean(axis=0)).T
    area = abs(float((x * np.roll(y, -1) - np.roll(x, -1) * y).sum())) / 2
    if not area > _TINY * float(np.ptp(points, axis=0).max()) ** 2:
        raise InputError(f"{where}.points", "the polygon encloses no area", "corners of a simple polygon")
    return _polygon_piece(points, sign), points


def composite(parts: Sequence[Rect | Polygon]) -> Section:
    """A section built from rectangles and polygons; holes count as negative area.

    Parts are placed in one x-y frame [m]; solid parts must not overlap one another and
    holes must lie inside solid material (checked only against the solid parts' bounding
    box). The centroid is reported from the bottom-left of the solid parts' bounding box.
    J and Zt are NaN: no general closed form exists, so use an FE torsion analysis.
    """
    parts = list(parts)
    if not parts:
        raise InputError("section composite", "no parts given", "at least one solid Rect or Polygon")
    built = [_part_piece(i, part) for i, part in enumerate(parts)]
    solids = [corners for (_, corners), part in zip(built, parts, strict=True) if not part.hole]
    if not solids:
        raise InputError("section composite", "every part is a hole", "at least one solid Rect or Polygon")
    every = np.vstack(solids)
    low, high = every.min(axis=0), every.max(axis=0)
    for i, ((_, corners), part) in enumerate(zip(built, parts, strict=True)):
        span = _TINY * float((high - low).max())
        if part.hole and ((corners < low - span).any() or (corners > high + span).any()):
            raise InputError(
                f"section composite: part[{i}]",
                "the hole reaches outside the solid parts",
                "holes inside solid material",
            )
    pieces = [piece for piece, _ in built]
    net = sum(p.A for p in pieces)
    if not net > 0:
        raise InputError(
            "section composite", f"net area {net:g} m² is not positive", "holes smaller than the solids"
        )
    torsion = (
        math.nan,
        "not computed for composite sections (no general closed form); use an FE torsion analysis",
        math.nan,
        "not computed for composite sections; use an FE torsion analysis",
    )
    size = (float(high[0] - low[0]), float(high[1] - low[1]))
    return _section("composite", {}, pieces, (float(low[0]), float(low[1])), size, torsion)


# --------------------------------------------------------------------------- by name


_BUILDERS: dict[str, Callable[..., Section]] = {
    "rectangle": rectangle,
    "round": round_bar,
    "tube": tube,
    "box": box,
    "i-section": i_section,
    "channel": channel,
    "angle": angle,
    "tee": tee,
    "sandwich": sandwich,
}


def build_section(shape: str, dims: Mapping[str, float]) -> Section:
    """Build a section by shape name from a dict of dimensions (lengths in m, moduli in Pa).

    Raises:
        InputError: unknown shape, unknown, missing, non-positive or inconsistent dimension.
    """
    if shape not in SHAPES:
        raise InputError("section", f"unknown shape {shape!r}", did_you_mean(str(shape), SHAPES))
    needed = SHAPES[shape]
    for name in dims:
        if name not in needed:
            where = f"section {shape}: {name}"
            raise InputError(where, f"unknown dimension {name!r}", did_you_mean(str(name), needed))
    for name in needed:
        if name not in dims:
            raise InputError(f"section {shape}: {name}", "no value given", _expected_dims(shape))
    return _BUILDERS[shape](**{name: dims[name] for name in needed})


def with_dims(shape: str, dims: Mapping[str, float], **changes: float) -> Section:
    """The same shape with some dimensions changed, e.g. ``with_dims("tube", dims, t=0.002)``."""
    return build_section(shape, {**dims, **changes})


def scaled(shape: str, dims: Mapping[str, float], factor: float) -> Section:
    """The shape at fixed proportions with every length × factor (moduli unchanged).

    A scales as factor², I and J as factor⁴, Z and Zt as factor³; shape factors stay put.
    """
    if (
        isinstance(factor, bool)
        or not isinstance(factor, numbers.Real)
        or not (math.isfinite(factor) and factor > 0)
    ):
        raise InputError(
            f"section {shape}: scale factor", f"{factor!r} is not a positive number", "a factor > 0"
        )

    def scale(name: str, value: float) -> float:
        is_length = name not in _MODULI and isinstance(value, numbers.Real) and not isinstance(value, bool)
        return value * factor if is_length else value

    return build_section(shape, {name: scale(name, value) for name, value in dims.items()})

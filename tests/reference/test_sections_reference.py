"""Section properties checked against sectionproperties (FE), AISC tables and a plank.

sectionproperties builds each shape from its own dimension conventions, meshes it and
integrates; for straight-sided shapes its geometric properties are exact, so ours must agree
closely. Circles there are regular polygons, so our exact-circle values are scaled by the
polygon's known area and inertia ratios before comparing.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass

import numpy as np
import pytest
import shapely
from sectionproperties.analysis import Section as FeSection
from sectionproperties.pre.geometry import Geometry
from sectionproperties.pre.library import (
    angle_section,
    channel_section,
    circular_hollow_section,
    circular_section,
    i_section,
    rectangular_hollow_section,
    rectangular_section,
    tee_section,
)
from sectionproperties.pre.pre import Material

from selector.mechanics import sections as s

EXACT = 1e-3
"""Straight-sided shapes: both sides integrate the same polygons exactly; 0.1% is generous."""

CIRCLE_SIDES = 128
"""Circles in the FE model are regular 128-gons (vertices on the circle)."""

J_EXACT = 0.01
"""Round bar and tube: J and Zt formulas are exact; 1% covers the mesh and the 128-gon."""

J_RECTANGLE = 0.01
"""Roark's rectangle formulas for J and Zt; they agree to ~0.2%, 1% allows for the mesh."""

J_THIN_CLOSED = 0.05
"""Bredt's thin-walled formula for a box with b/t = 25: corner effects are O(t/b), a few %."""

J_THIN_OPEN = 0.10
"""Σ b·t³/3 for open sections with walls ~15-30× thinner than long: ignores end and junction
effects, which trade off against each other; within ~10% is what thin-walled theory promises."""

WARPING_MESH = 300
"""Warping meshes: element area A/300 keeps each analysis near half a second."""

INCH = 0.0254  # m, exact by definition (common practice, no source)


def _fe(geometry: Geometry, mesh_size: float = 0.0, warping: bool = False) -> FeSection:
    """Mesh a geometry and run the analyses; mesh_size 0 lets the mesher choose."""
    meshed = geometry.create_mesh(mesh_sizes=[mesh_size])
    section = FeSection(geometry=meshed)
    section.calculate_geometric_properties()
    if warping:
        section.calculate_warping_properties()
    return section


def _polygon_ratios(n: int) -> tuple[float, float]:
    """Area and second-moment ratios of a regular n-gon inscribed in a circle, to the circle.

    A = (n/2)·R²·sin(2π/n) and I = (n/24)·R⁴·sin(2π/n)·(2 + cos(2π/n)), summing n triangles
    about the centre (common practice, no source; also checked below against our shoelace).
    """
    theta = 2 * math.pi / n
    return n * math.sin(theta) / (2 * math.pi), n * math.sin(theta) * (2 + math.cos(theta)) / (6 * math.pi)


def _circle_points(d: float, cx: float, cy: float, n: int) -> list[tuple[float, float]]:
    angles = 2 * math.pi * np.arange(n) / n
    return [(cx + d / 2 * math.cos(a), cy + d / 2 * math.sin(a)) for a in angles]


def _close(ours: float, fe: float, tol: float, scale: float = 0.0) -> bool:
    """Relative agreement, or absolute against `scale` where the FE value is near zero."""
    return abs(ours - fe) <= tol * max(abs(fe), scale)


# --------------------------------------------------------------------------- geometric properties

_COMPOSITE_TRIANGLE = [(0.06, 0.08), (0.12, 0.08), (0.12, 0.11)]
_COMPOSITE_CIRCLE = _circle_points(0.024, 0.085, 0.04, 64)


def _composite_ours() -> s.Section:
    return s.composite(
        [
            s.Rect(0.12, 0.08),
            s.Polygon(_COMPOSITE_TRIANGLE),
            s.Rect(0.03, 0.025, 0.015, 0.02, hole=True),
            s.Polygon(_COMPOSITE_CIRCLE, hole=True),
        ]
    )


def _composite_fe() -> Geometry:
    solid = shapely.union(shapely.box(0, 0, 0.12, 0.08), shapely.Polygon(_COMPOSITE_TRIANGLE))
    holes = shapely.union(shapely.box(0.015, 0.02, 0.045, 0.045), shapely.Polygon(_COMPOSITE_CIRCLE))
    return Geometry(shapely.difference(solid, holes))


@dataclass(frozen=True)
class Case:
    """One shape built both ways; circles carry the FE polygon's area and inertia ratios."""

    name: str
    ours: Callable[[], s.Section]
    fe: Callable[[], Geometry]
    round: bool = False


_AREA_RATIO, _INERTIA_RATIO = _polygon_ratios(CIRCLE_SIDES)

CASES = [
    Case("rectangle", lambda: s.rectangle(0.04, 0.1), lambda: rectangular_section(d=0.1, b=0.04)),
    Case("round", lambda: s.round_bar(0.05), lambda: circular_section(d=0.05, n=CIRCLE_SIDES), round=True),
    Case(
        "tube",
        lambda: s.tube(0.05, 0.004),
        lambda: circular_hollow_section(d=0.05, t=0.004, n=CIRCLE_SIDES),
        round=True,
    ),
    Case(
        "box",
        lambda: s.box(0.1, 0.15, 0.006),
        lambda: rectangular_hollow_section(d=0.15, b=0.1, t=0.006, r_out=0, n_r=1),
    ),
    Case(
        "i-section",
        lambda: s.i_section(0.1, 0.2, 0.008, 0.005),
        lambda: i_section(d=0.2, b=0.1, t_f=0.008, t_w=0.005, r=0, n_r=1),
    ),
    Case(
        "channel",
        lambda: s.channel(0.08, 0.2, 0.01, 0.006),
        lambda: channel_section(d=0.2, b=0.08, t_f=0.01, t_w=0.006, r=0, n_r=1),
    ),
    Case(
        "angle, unequal legs",
        lambda: s.angle(0.15, 0.1, 0.01),
        lambda: angle_section(d=0.1, b=0.15, t=0.01, r_r=0, r_t=0, n_r=1),
    ),
    Case(
        "angle, equal legs",
        lambda: s.angle(0.08, 0.08, 0.008),
        lambda: angle_section(d=0.08, b=0.08, t=0.008, r_r=0, r_t=0, n_r=1),
    ),
    Case(
        "tee",
        lambda: s.tee(0.1, 0.12, 0.01, 0.008),
        lambda: tee_section(d=0.12, b=0.1, t_f=0.01, t_w=0.008, r=0, n_r=1),
    ),
    Case("composite with holes", _composite_ours, _composite_fe),
    Case(
        "128-gon by the shoelace formulas",
        lambda: s.composite([s.Polygon(_circle_points(0.05, 0.025, 0.025, CIRCLE_SIDES))]),
        lambda: circular_section(d=0.05, n=CIRCLE_SIDES),
    ),
]


@pytest.mark.parametrize("case", CASES, ids=lambda c: c.name)
def test_geometric_properties_match_fe(case: Case) -> None:
    ours, geometry = case.ours(), case.fe()
    fe = _fe(geometry)
    k_area, k_inertia = (_AREA_RATIO, _INERTIA_RATIO) if case.round else (1.0, 1.0)
    x_min, _, y_min, _ = geometry.calculate_extents()
    fe_cx, fe_cy = fe.get_c()
    fe_ixx, fe_iyy, fe_ixy = fe.get_ic()
    fe_top, fe_bottom, fe_right, fe_left = fe.get_z()
    size = max(ours.width, ours.depth)
    inertia_scale = math.sqrt(ours.Ixx * ours.Iyy)

    assert _close(ours.A * k_area, fe.get_area(), EXACT)  # sectionproperties FE result
    assert _close(ours.cx, fe_cx - x_min, EXACT, size)  # sectionproperties FE result
    assert _close(ours.cy, fe_cy - y_min, EXACT, size)  # sectionproperties FE result
    assert _close(ours.Ixx * k_inertia, fe_ixx, EXACT)  # sectionproperties FE result
    assert _close(ours.Iyy * k_inertia, fe_iyy, EXACT)  # sectionproperties FE result
    assert _close(ours.Ixy * k_inertia, fe_ixy, EXACT, inertia_scale)  # sectionproperties FE result
    assert _close(ours.Zx_top * k_inertia, fe_top, EXACT)  # sectionproperties FE result
    assert _close(ours.Zx_bottom * k_inertia, fe_bottom, EXACT)  # sectionproperties FE result
    assert _close(ours.Zx * k_inertia, min(fe_top, fe_bottom), EXACT)  # sectionproperties FE result
    assert _close(ours.Zy_left * k_inertia, fe_left, EXACT)  # sectionproperties FE result
    assert _close(ours.Zy_right * k_inertia, fe_right, EXACT)  # sectionproperties FE result


@pytest.mark.parametrize("case", [c for c in CASES if not c.round], ids=lambda c: c.name)
def test_principal_axes_match_fe(case: Case) -> None:
    ours = case.ours()
    fe = _fe(case.fe())
    fe_i11, fe_i22 = fe.get_ip()
    assert _close(ours.I11, fe_i11, EXACT)  # sectionproperties FE result
    assert _close(ours.I22, fe_i22, EXACT)  # sectionproperties FE result
    if not math.isclose(fe_i11, fe_i22, rel_tol=1e-9):
        # an axis is a line: angles 180° apart are the same axis
        turn = (math.degrees(ours.phi) - fe.get_phi()) % 180.0
        assert min(turn, 180.0 - turn) < 0.05  # sectionproperties FE result, degrees


def test_sandwich_matches_modulus_weighted_fe() -> None:
    b, h, t, e_face, e_core = 0.1, 0.05, 0.002, 70e9, 0.7e9
    face = Material("face", e_face, 0.3, 1.0, 1.0, "grey")
    core = Material("core", e_core, 0.3, 1.0, 1.0, "yellow")
    geometry = (
        rectangular_section(d=t, b=b, material=face)
        + rectangular_section(d=h - 2 * t, b=b, material=core).shift_section(y_offset=t)
        + rectangular_section(d=t, b=b, material=face).shift_section(y_offset=h - t)
    )
    fe = _fe(geometry)
    fe_eixx, fe_eiyy, _ = fe.get_eic()
    ours = s.sandwich(b, h, t, e_face, e_core)
    assert _close(ours.A, fe.get_ea() / e_face, EXACT)  # sectionproperties FE result
    assert _close(ours.EI_per_E_face, fe_eixx / e_face, EXACT)  # sectionproperties FE result
    assert _close(ours.Iyy, fe_eiyy / e_face, EXACT)  # sectionproperties FE result
    assert _close(ours.cy, fe.get_c()[1], EXACT, h)  # sectionproperties FE result


# --------------------------------------------------------------------------- torsion (warping analysis)

TORSION_CASES = [
    ("round", lambda: s.round_bar(0.05), lambda: circular_section(d=0.05, n=CIRCLE_SIDES), J_EXACT),
    (
        "tube",
        lambda: s.tube(0.05, 0.004),
        lambda: circular_hollow_section(d=0.05, t=0.004, n=CIRCLE_SIDES),
        J_EXACT,
    ),
    (
        "rectangle 2:1",
        lambda: s.rectangle(0.04, 0.08),
        lambda: rectangular_section(d=0.08, b=0.04),
        J_RECTANGLE,
    ),
    (
        "thin box",
        lambda: s.box(0.1, 0.15, 0.004),
        lambda: rectangular_hollow_section(d=0.15, b=0.1, t=0.004, r_out=0, n_r=1),
        J_THIN_CLOSED,
    ),
    (
        "thin i-section",
        lambda: s.i_section(0.1, 0.2, 0.006, 0.004),
        lambda: i_section(d=0.2, b=0.1, t_f=0.006, t_w=0.004, r=0, n_r=1),
        J_THIN_OPEN,
    ),
    (
        "thin channel",
        lambda: s.channel(0.08, 0.2, 0.006, 0.005),
        lambda: channel_section(d=0.2, b=0.08, t_f=0.006, t_w=0.005, r=0, n_r=1),
        J_THIN_OPEN,
    ),
    (
        "thin angle",
        lambda: s.angle(0.15, 0.1, 0.006),
        lambda: angle_section(d=0.1, b=0.15, t=0.006, r_r=0, r_t=0, n_r=1),
        J_THIN_OPEN,
    ),
    (
        "thin tee",
        lambda: s.tee(0.1, 0.12, 0.006, 0.005),
        lambda: tee_section(d=0.12, b=0.1, t_f=0.006, t_w=0.005, r=0, n_r=1),
        J_THIN_OPEN,
    ),
]


@pytest.mark.slow
@pytest.mark.parametrize(
    ("name", "ours", "geometry", "tol"), TORSION_CASES, ids=[c[0] for c in TORSION_CASES]
)
def test_torsion_constant_matches_fe_warping(
    name: str, ours: Callable[[], s.Section], geometry: Callable[[], Geometry], tol: float
) -> None:
    section = ours()
    fe = _fe(geometry(), section.A / WARPING_MESH, warping=True)
    assert _close(section.J, fe.get_j(), tol)  # sectionproperties FE result (warping analysis)


@pytest.mark.slow
@pytest.mark.parametrize(
    ("ours", "geometry", "tol"),
    [
        (lambda: s.round_bar(0.05), lambda: circular_section(d=0.05, n=CIRCLE_SIDES), J_EXACT),
        (lambda: s.rectangle(0.04, 0.04), lambda: rectangular_section(d=0.04, b=0.04), J_RECTANGLE),
        (lambda: s.rectangle(0.02, 0.2), lambda: rectangular_section(d=0.2, b=0.02), J_RECTANGLE),
    ],
    ids=["round", "square", "rectangle 10:1"],
)
def test_torsion_modulus_matches_fe_shear_stress(
    ours: Callable[[], s.Section], geometry: Callable[[], Geometry], tol: float
) -> None:
    section = ours()
    fe = _fe(geometry(), section.A / WARPING_MESH, warping=True)
    torque = 1.0  # N·m
    tau_max = float(np.max(fe.calculate_stress(mzz=torque).get_stress()[0]["sig_zxy_mzz"]))
    assert _close(section.Zt, torque / tau_max, tol)  # sectionproperties FE result (torsion stress)


# --------------------------------------------------------------------------- rolled shapes and a plank

AISC = 0.03
"""AISC tables include the root fillets that our sharp-cornered I-section leaves out."""


@pytest.mark.parametrize(
    ("name", "d", "bf", "tf", "tw", "area", "ix", "sx"),
    [
        ("W8X31", 8.00, 7.995, 0.435, 0.285, 9.13, 110.0, 27.5),
        ("W12X26", 12.2, 6.49, 0.380, 0.230, 7.65, 204.0, 33.4),
    ],
)
def test_wide_flange_against_aisc(name, d, bf, tf, tw, area, ix, sx) -> None:
    section = s.i_section(bf * INCH, d * INCH, tf * INCH, tw * INCH)
    assert _close(section.A / INCH**2, area, AISC)  # AISC Shapes Database, in², from memory
    assert _close(section.Ixx / INCH**4, ix, AISC)  # AISC Shapes Database, in⁴, from memory
    assert _close(section.Zx / INCH**3, sx, AISC)  # AISC Shapes Database, in³, from memory
    assert area > section.A / INCH**2  # the fillets we leave out only add area


def test_plank_on_edge_and_flat() -> None:
    on_edge = s.rectangle(1.5 * INCH, 5.5 * INCH)
    flat = s.rectangle(5.5 * INCH, 1.5 * INCH)
    # the quoted values are rounded, so each may be off by half a unit in its last digit
    assert on_edge.Ixx / INCH**4 == pytest.approx(20.8, abs=0.05)  # common practice, no source
    assert flat.Ixx / INCH**4 == pytest.approx(1.55, abs=0.005)  # common practice, no source
    assert on_edge.Ixx / flat.Ixx == pytest.approx(13.4, abs=0.05)  # common practice, no source
    assert flat.Iyy == pytest.approx(on_edge.Ixx, rel=1e-12)

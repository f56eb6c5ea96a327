"""Unit checks of the section formulas, their invariants and their error messages."""

from __future__ import annotations

import itertools
import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from selector.errors import InputError, SelectorError
from selector.inputs.properties import FAMILIES
from selector.mechanics import sections as s
from selector.mechanics import shape_limits

TIGHT = 1e-12
"""Two exact routes to the same number differ only by rounding."""


def _same_geometry(a: s.Section, b: s.Section, rel: float = 1e-9) -> None:
    """Assert two sections share area, centroid, bending properties and bounding box."""
    scale = math.sqrt(a.Ixx * a.Iyy)
    size = max(a.width, a.depth)
    assert pytest.approx(b.A, rel=rel) == a.A
    assert a.cx == pytest.approx(b.cx, abs=rel * size)
    assert a.cy == pytest.approx(b.cy, abs=rel * size)
    assert a.Ixx == pytest.approx(b.Ixx, rel=rel)
    assert a.Iyy == pytest.approx(b.Iyy, rel=rel)
    assert a.Ixy == pytest.approx(b.Ixy, abs=rel * scale)
    assert (a.width, a.depth) == pytest.approx((b.width, b.depth), rel=rel)
    assert (a.Zx_top, a.Zx_bottom, a.Zy_left, a.Zy_right) == pytest.approx(
        (b.Zx_top, b.Zx_bottom, b.Zy_left, b.Zy_right), rel=rel
    )


# --------------------------------------------------------------------------- shape factors


def test_solid_square_has_every_shape_factor_one() -> None:
    square = s.rectangle(0.03, 0.03)
    assert square.phi_bending_stiffness == pytest.approx(1.0, rel=TIGHT)  # definition of φ
    assert square.phi_bending_strength == pytest.approx(1.0, rel=TIGHT)  # definition of φ
    assert square.phi_torsion_stiffness == pytest.approx(1.0, rel=TIGHT)  # definition of φ
    assert square.phi_torsion_strength == pytest.approx(1.0, rel=TIGHT)  # definition of φ


def test_square_torsion_constants_match_the_exact_series() -> None:
    a = 0.02
    square = s.rectangle(a, a)
    # J = 0.1406 a⁴ and Zt = 0.208 a³: Timoshenko & Goodier, Theory of Elasticity, torsion of
    # rectangular bars (from memory); Roark's approximations agree to about 0.2%
    assert square.J / a**4 == pytest.approx(0.1406, rel=2e-3)
    assert square.Zt / a**3 == pytest.approx(0.208, rel=2e-3)


def test_thin_strip_torsion_tends_to_b_t_cubed_over_three() -> None:
    b, t = 1.0, 0.001
    strip = s.rectangle(b, t)
    # J → b·t³/3 and τ_max → 3T/(b·t²) as t/b → 0 (Roark, thin rectangle, from memory)
    assert pytest.approx(b * t**3 / 3, rel=1e-3) == strip.J
    assert strip.Zt == pytest.approx(b * t**2 / 3, rel=1e-3)


@pytest.mark.parametrize("ratio", [1.0, 2.0, 5.0, 10.0])
def test_rectangle_shape_factors(ratio: float) -> None:
    b = 0.01
    section = s.rectangle(b, ratio * b)
    # φ_B^e = h/b and φ_B^f = (h/b)^½ for a rectangle: Ashby, Materials Selection in
    # Mechanical Design, table of shape factors (from memory)
    assert section.phi_bending_stiffness == pytest.approx(ratio, rel=TIGHT)
    assert section.phi_bending_strength == pytest.approx(math.sqrt(ratio), rel=TIGHT)


def test_round_bar_shape_factors() -> None:
    bar = s.round_bar(0.02)
    # φ_B^e = 3/π and φ_T^e ≈ 1.14 for a solid circle: Ashby, Materials Selection in
    # Mechanical Design, table of shape factors (from memory; 1.14 uses 7.14, we use 7.10)
    assert bar.phi_bending_stiffness == pytest.approx(3 / math.pi, rel=TIGHT)
    assert bar.phi_torsion_stiffness == pytest.approx(1.14, rel=1e-2)
    assert pytest.approx(math.pi * 0.02**4 / 32, rel=TIGHT) == bar.J  # polar moment, exact
    assert bar.Zt == pytest.approx(math.pi * 0.02**3 / 16, rel=TIGHT)  # τ = 16T/(πd³), exact


def test_tube_shape_factor_grows_with_diameter_over_wall() -> None:
    d = 0.05
    tubes = [s.tube(d, d / ratio) for ratio in (3, 5, 10, 20, 50, 100)]
    for mode in ("bending_stiffness", "bending_strength", "torsion_stiffness", "torsion_strength"):
        values = [getattr(t, f"phi_{mode}") for t in tubes]
        assert all(a < b for a, b in itertools.pairwise(values)), mode
    assert tubes[0].phi_bending_stiffness > s.round_bar(d).phi_bending_stiffness


def test_thin_tube_shape_factor_approaches_thin_wall_formula() -> None:
    r, t = 0.05, 0.0005
    thin = s.tube(2 * r, t)
    # thin-walled tube φ_B^e ≈ 3r/(πt) with r the mean radius: Ashby, Materials Selection
    # in Mechanical Design, table of shape factors (from memory)
    assert thin.phi_bending_stiffness == pytest.approx(3 * (r - t / 2) / (math.pi * t), rel=1e-3)


def test_shape_factors_do_not_change_with_scale() -> None:
    dims = {"b": 0.1, "h": 0.2, "tf": 0.01, "tw": 0.006}
    base = s.build_section("i-section", dims)
    big = s.scaled("i-section", dims, 3.0)
    assert pytest.approx(9 * base.A, rel=TIGHT) == big.A
    assert big.Ixx == pytest.approx(81 * base.Ixx, rel=TIGHT)
    assert big.Zx == pytest.approx(27 * base.Zx, rel=TIGHT)
    assert pytest.approx(81 * base.J, rel=TIGHT) == big.J
    for mode in ("bending_stiffness", "bending_strength", "torsion_stiffness", "torsion_strength"):
        assert getattr(big, f"phi_{mode}") == pytest.approx(getattr(base, f"phi_{mode}"), rel=TIGHT)


def test_scaling_a_sandwich_leaves_its_moduli_alone() -> None:
    dims = {"b": 0.1, "h": 0.05, "t": 0.002, "E_face": 70e9, "E_core": 0.5e9}
    big = s.scaled("sandwich", dims, 2.0)
    assert big.dims == {"b": 0.2, "h": 0.1, "t": 0.004, "E_face": 70e9, "E_core": 0.5e9}


def test_with_dims_changes_one_dimension() -> None:
    dims = {"d": 0.05, "t": 0.004}
    thicker = s.with_dims("tube", dims, t=0.006)
    assert thicker.dims == {"d": 0.05, "t": 0.006}
    assert thicker.A > s.build_section("tube", dims).A
    assert dims == {"d": 0.05, "t": 0.004}


# --------------------------------------------------------------------------- principal axes


def test_equal_leg_angle_principal_axis_is_at_45_degrees() -> None:
    section = s.angle(0.08, 0.08, 0.008)
    assert section.Ixx == pytest.approx(section.Iyy, rel=TIGHT)
    assert section.Ixy < 0  # legs along +x and +y from the heel: Ixy = ∫xy dA < 0
    assert section.phi == pytest.approx(math.pi / 4, rel=TIGHT)  # by symmetry about y = x
    assert pytest.approx(section.Ixx - section.Ixy, rel=TIGHT) == section.I11  # Mohr's circle
    assert pytest.approx(section.Ixx + section.Ixy, rel=TIGHT) == section.I22  # Mohr's circle


def test_unequal_angle_principal_axes_diagonalise_the_inertia() -> None:
    section = s.angle(0.15, 0.1, 0.01)
    assert pytest.approx(section.Ixx + section.Iyy, rel=TIGHT) == section.I11 + section.I22
    assert pytest.approx(section.Ixx * section.Iyy - section.Ixy**2, rel=1e-9) == section.I11 * section.I22
    # turning the L by -phi about its centroid must leave no product of inertia and put
    # the major principal moment on the new x axis
    c, sn = math.cos(-section.phi), math.sin(-section.phi)
    outline = [(0, 0), (0.15, 0), (0.15, 0.01), (0.01, 0.01), (0.01, 0.1), (0, 0.1)]
    turned = [
        (c * (x - section.cx) - sn * (y - section.cy), sn * (x - section.cx) + c * (y - section.cy))
        for x, y in outline
    ]
    rotated = s.composite([s.Polygon(turned)])
    assert rotated.Ixy == pytest.approx(0.0, abs=1e-9 * section.I11)
    assert rotated.Ixx == pytest.approx(section.I11, rel=1e-9)
    assert rotated.Iyy == pytest.approx(section.I22, rel=1e-9)


def test_mirrored_angle_has_the_complementary_principal_angle() -> None:
    wide, tall = s.angle(0.15, 0.1, 0.01), s.angle(0.1, 0.15, 0.01)
    assert wide.phi + tall.phi == pytest.approx(math.pi / 2, rel=TIGHT)
    assert pytest.approx(tall.I11, rel=TIGHT) == wide.I11


def test_symmetric_shapes_have_principal_axes_along_x_and_y() -> None:
    assert s.i_section(0.1, 0.2, 0.01, 0.006).phi == 0.0
    assert s.rectangle(0.2, 0.05).phi == pytest.approx(math.pi / 2)  # wider than deep
    assert s.tee(0.1, 0.1, 0.01, 0.01).Ixy == 0.0


# --------------------------------------------------------------------------- composites


def test_two_stacked_rectangles_equal_one_rectangle() -> None:
    b, h = 0.04, 0.1
    whole = s.rectangle(b, h)
    stacked = s.composite([s.Rect(b, 0.3 * h), s.Rect(b, 0.7 * h, 0, 0.3 * h)])
    side_by_side = s.composite([s.Rect(0.25 * b, h, 1.0, 2.0), s.Rect(0.75 * b, h, 1.0 + 0.25 * b, 2.0)])
    _same_geometry(stacked, whole)
    _same_geometry(side_by_side, whole)


def test_rectangle_with_a_centred_hole_equals_the_box() -> None:
    b, h, t = 0.1, 0.15, 0.006
    cut = s.composite([s.Rect(b, h), s.Rect(b - 2 * t, h - 2 * t, t, t, hole=True)])
    _same_geometry(cut, s.box(b, h, t))


def test_off_centre_hole_moves_the_centroid_away_from_it() -> None:
    plate, hole = s.Rect(0.1, 0.06), s.Rect(0.02, 0.02, 0.06, 0.01, hole=True)
    cut = s.composite([plate, hole])
    area = 0.1 * 0.06 - 0.02 * 0.02
    # first moments: A·c = A_plate·c_plate − A_hole·c_hole (parallel-axis bookkeeping)
    assert pytest.approx(area, rel=TIGHT) == cut.A
    assert cut.cx == pytest.approx((0.006 * 0.05 - 0.0004 * 0.07) / area, rel=TIGHT)
    assert cut.cy == pytest.approx((0.006 * 0.03 - 0.0004 * 0.02) / area, rel=TIGHT)
    ixx = 0.1 * 0.06**3 / 12 + 0.006 * (0.03 - cut.cy) ** 2 - (0.02**4 / 12 + 0.0004 * (0.02 - cut.cy) ** 2)
    assert cut.Ixx == pytest.approx(ixx, rel=TIGHT)
    ixy = -0.0004 * (0.07 - cut.cx) * (0.02 - cut.cy) + 0.006 * (0.05 - cut.cx) * (0.03 - cut.cy)
    assert cut.Ixy == pytest.approx(ixy, rel=1e-9)


def test_polygon_hole_equals_rect_hole_in_either_winding() -> None:
    corners = [(0.06, 0.01), (0.08, 0.01), (0.08, 0.03), (0.06, 0.03)]
    by_rect = s.composite([s.Rect(0.1, 0.06), s.Rect(0.02, 0.02, 0.06, 0.01, hole=True)])
    by_polygon = s.composite([s.Rect(0.1, 0.06), s.Polygon(corners, hole=True)])
    clockwise = s.composite([s.Rect(0.1, 0.06), s.Polygon(corners[::-1], hole=True)])
    _same_geometry(by_polygon, by_rect)
    _same_geometry(clockwise, by_rect)


def test_right_triangle_by_the_shoelace_formulas() -> None:
    b, h = 0.06, 0.09
    triangle = s.composite([s.Polygon([(0, 0), (b, 0), (0, h)])])
    # right triangle, legs on the axes: I = b·h³/36, Ixy = −b²·h²/72 about the centroid
    # (Roark's Formulas for Stress and Strain, properties of plane areas, from memory)
    assert pytest.approx(b * h / 2, rel=TIGHT) == triangle.A
    assert triangle.centroid == pytest.approx((b / 3, h / 3), rel=TIGHT)
    assert triangle.Ixx == pytest.approx(b * h**3 / 36, rel=TIGHT)
    assert triangle.Iyy == pytest.approx(h * b**3 / 36, rel=TIGHT)
    assert triangle.Ixy == pytest.approx(-(b**2) * h**2 / 72, rel=TIGHT)


@settings(max_examples=60, deadline=None)
@given(
    b=st.floats(1e-3, 10.0),
    h=st.floats(1e-3, 10.0),
    x=st.floats(-100.0, 100.0),
    y=st.floats(-100.0, 100.0),
)
def test_rectangle_as_polygon_anywhere_equals_rect(b: float, h: float, x: float, y: float) -> None:
    corners = [(x, y), (x + b, y), (x + b, y + h), (x, y + h)]
    _same_geometry(s.composite([s.Polygon(corners)]), s.rectangle(b, h), rel=1e-6)


def test_composite_has_no_torsion_constant() -> None:
    section = s.composite([s.Rect(0.1, 0.02)])
    assert math.isnan(section.J)
    assert math.isnan(section.Zt)
    assert "not computed" in section.J_method


# --------------------------------------------------------------------------- sandwich


def test_sandwich_without_core_stiffness_is_its_faces() -> None:
    b, h, t = 0.1, 0.05, 0.002
    panel = s.sandwich(b, h, t, E_face=70e9, E_core=0.0)
    faces = s.composite([s.Rect(b, t), s.Rect(b, t, 0, h - t)])
    _same_geometry(panel, faces)
    assert panel.EI_per_E_face == pytest.approx(b * (h**3 - (h - 2 * t) ** 3) / 12, rel=TIGHT)


def test_sandwich_with_core_as_stiff_as_faces_is_solid() -> None:
    panel = s.sandwich(0.1, 0.05, 0.002, E_face=70e9, E_core=70e9)
    _same_geometry(panel, s.rectangle(0.1, 0.05))


def test_sandwich_core_adds_its_modulus_weighted_share() -> None:
    b, h, t, e_face, e_core = 0.1, 0.05, 0.002, 70e9, 0.7e9
    panel = s.sandwich(b, h, t, e_face, e_core)
    core = h - 2 * t
    d = core + t  # distance between the face centre lines
    # D = E_f·b·t³/6 + E_f·b·t·d²/2 + E_c·b·c³/12 (Allen, Analysis and Design of Structural
    # Sandwich Panels, flexural rigidity of a sandwich beam; from memory)
    ei = e_face * b * t**3 / 6 + e_face * b * t * d**2 / 2 + e_core * b * core**3 / 12
    assert panel.EI_per_E_face * e_face == pytest.approx(ei, rel=TIGHT)
    assert panel.extra == pytest.approx(
        {"A_faces": 2 * b * t, "A_core": b * core, "E_core_over_E_face": 0.01}
    )


# --------------------------------------------------------------------------- by name


@pytest.mark.parametrize(
    ("shape", "dims", "direct"),
    [
        ("rectangle", {"b": 0.02, "h": 0.05}, lambda: s.rectangle(0.02, 0.05)),
        ("round", {"d": 0.03}, lambda: s.round_bar(0.03)),
        ("tube", {"d": 0.03, "t": 0.002}, lambda: s.tube(0.03, 0.002)),
        ("box", {"b": 0.05, "h": 0.08, "t": 0.003}, lambda: s.box(0.05, 0.08, 0.003)),
        (
            "i-section",
            {"b": 0.1, "h": 0.2, "tf": 0.01, "tw": 0.006},
            lambda: s.i_section(0.1, 0.2, 0.01, 0.006),
        ),
        (
            "channel",
            {"b": 0.05, "h": 0.1, "tf": 0.006, "tw": 0.005},
            lambda: s.channel(0.05, 0.1, 0.006, 0.005),
        ),
        ("angle", {"b": 0.05, "h": 0.04, "t": 0.005}, lambda: s.angle(0.05, 0.04, 0.005)),
        ("tee", {"b": 0.06, "h": 0.06, "tf": 0.006, "tw": 0.006}, lambda: s.tee(0.06, 0.06, 0.006, 0.006)),
        (
            "sandwich",
            {"b": 0.1, "h": 0.05, "t": 0.002, "E_face": 70e9, "E_core": 0.1e9},
            lambda: s.sandwich(0.1, 0.05, 0.002, 70e9, 0.1e9),
        ),
    ],
)
def test_build_section_by_name(shape: str, dims: dict[str, float], direct) -> None:
    built = s.build_section(shape, dims)
    assert built == direct()
    assert built.shape == shape
    assert set(built.dims) == set(s.SHAPES[shape])
    assert built.Zx == min(built.Zx_top, built.Zx_bottom)
    assert built.rx == pytest.approx(math.sqrt(built.Ixx / built.A), rel=TIGHT)
    assert built.ry == pytest.approx(math.sqrt(built.Iyy / built.A), rel=TIGHT)
    assert built.J > 0 and built.Zt > 0
    assert built.J_method and built.Zt_method


def test_registry_names_every_shape() -> None:
    assert set(s.SHAPES) == {
        "rectangle",
        "round",
        "tube",
        "box",
        "i-section",
        "channel",
        "angle",
        "tee",
        "sandwich",
    }


def test_torsion_methods_say_how_good_they_are() -> None:
    assert "exact" in s.round_bar(0.02).J_method
    assert "exact" in s.tube(0.02, 0.001).J_method
    assert "Bredt" in s.box(0.05, 0.05, 0.002).J_method
    for section in (s.i_section(0.1, 0.2, 0.01, 0.006), s.channel(0.05, 0.1, 0.006, 0.005)):
        assert "thin-walled open section" in section.J_method
    assert "Roark" in s.rectangle(0.02, 0.05).J_method


# --------------------------------------------------------------------------- bad input


VALID = "valid: angle, box, channel, i-section, rectangle, round, sandwich, tee, tube"


@pytest.mark.parametrize(
    ("shape", "dims", "message"),
    [
        (
            "rectangel",
            {"b": 1, "h": 1},
            f"section: unknown shape 'rectangel'; did you mean 'rectangle'? ({VALID})",
        ),
        (
            "hexagon",
            {"b": 1},
            f"section: unknown shape 'hexagon'; expected one of: {VALID.removeprefix('valid: ')}",
        ),
        ("tube", {"d": 0.05}, "section tube: t: no value given; tube needs d, t (lengths in m)"),
        (
            "tube",
            {"d": 0.05, "tt": 0.004},
            "section tube: tt: unknown dimension 'tt'; did you mean 't'? (valid: d, t)",
        ),
        (
            "rectangle",
            {"b": 1, "h": 1, "t": 0.1},
            "section rectangle: t: unknown dimension 't'; expected one of: b, h",
        ),
        (
            "sandwich",
            {"b": 0.1, "h": 0.05, "t": 0.002, "E_face": 70e9},
            "section sandwich: E_core: no value given; sandwich needs b, h, t (lengths in m) "
            "and E_face, E_core (moduli in Pa)",
        ),
        ("rectangle", {"b": 0.0, "h": 1}, "section rectangle: b: 0 m is not positive; a length > 0 in m"),
        ("round", {"d": -0.02}, "section round: d: -0.02 m is not positive; a length > 0 in m"),
        ("round", {"d": "20 mm"}, "section round: d: '20 mm' is not a finite number; a length in m"),
        ("round", {"d": math.inf}, "section round: d: inf is not a finite number; a length in m"),
        ("round", {"d": True}, "section round: d: True is not a finite number; a length in m"),
        (
            "tube",
            {"d": 0.01, "t": 0.005},
            "section tube: t: t = 0.005 m is not less than d/2 = 0.005 m; "
            "a wall thinner than half the outside diameter",
        ),
        (
            "box",
            {"b": 0.04, "h": 0.1, "t": 0.02},
            "section box: t: 2t = 0.04 m is not less than b = 0.04 m; "
            "walls that leave a hollow: 2t < b and 2t < h",
        ),
        (
            "box",
            {"b": 0.1, "h": 0.03, "t": 0.02},
            "section box: t: 2t = 0.04 m is not less than h = 0.03 m; "
            "walls that leave a hollow: 2t < b and 2t < h",
        ),
        (
            "i-section",
            {"b": 0.1, "h": 0.02, "tf": 0.01, "tw": 0.005},
            "section i-section: tf: 2tf = 0.02 m is not less than h = 0.02 m; "
            "flanges that leave room for the web: 2tf < h",
        ),
        (
            "channel",
            {"b": 0.01, "h": 0.1, "tf": 0.005, "tw": 0.012},
            "section channel: tw: tw = 0.012 m is not less than b = 0.01 m; "
            "a web narrower than the flanges: tw < b",
        ),
        (
            "angle",
            {"b": 0.05, "h": 0.004, "t": 0.005},
            "section angle: t: t = 0.005 m is not less than h = 0.004 m; "
            "legs longer than the thickness: t < b and t < h",
        ),
        (
            "tee",
            {"b": 0.05, "h": 0.01, "tf": 0.01, "tw": 0.005},
            "section tee: tf: tf = 0.01 m is not less than h = 0.01 m; "
            "a flange thinner than the overall depth: tf < h",
        ),
        (
            "tee",
            {"b": 0.05, "h": 0.05, "tf": 0.01, "tw": 0.06},
            "section tee: tw: tw = 0.06 m is not less than b = 0.05 m; "
            "a web narrower than the flange: tw < b",
        ),
        (
            "sandwich",
            {"b": 0.1, "h": 0.004, "t": 0.002, "E_face": 70e9, "E_core": 1e8},
            "section sandwich: t: 2t = 0.004 m is not less than h = 0.004 m; "
            "faces that leave room for a core: 2t < h",
        ),
        (
            "sandwich",
            {"b": 0.1, "h": 0.05, "t": 0.002, "E_face": 0, "E_core": 1e8},
            "section sandwich: E_face: 0 Pa is not positive; a modulus > 0 in Pa",
        ),
        (
            "sandwich",
            {"b": 0.1, "h": 0.05, "t": 0.002, "E_face": 70e9, "E_core": -1e8},
            "section sandwich: E_core: -1e+08 Pa is not positive; a modulus ≥ 0 in Pa",
        ),
    ],
)
def test_bad_dimensions_give_exact_messages(shape: str, dims: dict, message: str) -> None:
    with pytest.raises(InputError) as caught:
        s.build_section(shape, dims)
    assert str(caught.value) == message
    assert isinstance(caught.value, SelectorError) and isinstance(caught.value, ValueError)


def test_direct_constructor_reports_like_build_section() -> None:
    with pytest.raises(InputError, match=r"^section tube: t: t = 0\.006 m is not less than d/2 = 0\.005 m; "):
        s.tube(0.01, 0.006)


@pytest.mark.parametrize(
    ("parts", "message"),
    [
        ([], "section composite: no parts given; at least one solid Rect or Polygon"),
        (
            [s.Rect(0.1, 0.1, hole=True)],
            "section composite: every part is a hole; at least one solid Rect or Polygon",
        ),
        ([s.Rect(0.1, -0.1)], "section composite: part[0].h: -0.1 m is not positive; a length > 0 in m"),
        (
            [s.Rect(0.1, 0.1), s.Rect(0.05, 0.05, 0.08, 0.0, hole=True)],
            "section composite: part[1]: the hole reaches outside the solid parts; "
            "holes inside solid material",
        ),
        (
            [s.Rect(0.1, 0.1), s.Polygon([(0, 0), (0.1, 0)])],
            "section composite: part[1].points: 2 points; at least 3 (x, y) points in m",
        ),
        (
            [s.Polygon([(0, 0), (0.1, 0.1), (0.2, 0.2)])],
            "section composite: part[0].points: the polygon encloses no area; corners of a simple polygon",
        ),
        (
            [s.Rect(0.1, 0.1), s.Rect(0.1, 0.1, hole=True)],
            "section composite: net area 0 m² is not positive; holes smaller than the solids",
        ),
        (
            [s.Rect(0.1, 0.1, x=math.nan)],
            "section composite: part[0].x: nan is not a finite number; a position in m",
        ),
        (
            ["a plate"],
            "section composite: part[0]: 'a plate' is not a part; Rect(b, h, x, y) or Polygon(points)",
        ),
    ],
)
def test_bad_composites_give_exact_messages(parts: list, message: str) -> None:
    with pytest.raises(InputError) as caught:
        s.composite(parts)
    assert str(caught.value) == message


def test_bad_scale_factor() -> None:
    with pytest.raises(InputError) as caught:
        s.scaled("round", {"d": 0.02}, 0.0)
    assert str(caught.value) == "section round: scale factor: 0.0 is not a positive number; a factor > 0"


def test_bad_with_dims_names_the_changed_dimension() -> None:
    with pytest.raises(InputError) as caught:
        s.with_dims("tube", {"d": 0.05, "t": 0.004}, wall=0.002)
    assert str(caught.value) == "section tube: wall: unknown dimension 'wall'; expected one of: d, t"


# --------------------------------------------------------------------------- shape limits


def test_every_family_has_a_shape_limit() -> None:
    assert set(shape_limits.FAMILY_LIMITS) == set(FAMILIES)
    for family in FAMILIES:
        for mode in shape_limits.MODES:
            assert shape_limits.max_shape_factor(family, mode) >= 1.0  # a solid square is always possible


def test_shape_limits_from_weaver_and_ashby() -> None:
    limit = shape_limits.max_shape_factor
    # Weaver & Ashby, Prog. Mater. Sci. 41 (1997), maximum practical shape factors (from memory)
    assert limit("metal", "bending_stiffness", group="steel") == 64
    assert limit("metal", "bending_strength", group="steel") == 13
    assert limit("metal", "bending_stiffness", group="aluminium") == 44
    assert limit("metal", "bending_strength", group="aluminium") == 10
    assert limit("composite", "bending_stiffness") == 39
    assert limit("composite", "bending_strength") == 9
    assert limit("polymer", "bending_stiffness") == 12
    assert limit("natural", "bending_strength") == 3


def test_shape_limit_defaults_are_flagged() -> None:
    for family in ("ceramic", "glass", "foam", "elastomer", "mineral"):
        assert not shape_limits.FAMILY_LIMITS[family].from_paper
        assert "default" in shape_limits.FAMILY_LIMITS[family].basis
    assert shape_limits.FAMILY_LIMITS["metal"].from_paper


def test_stiffness_limits_exceed_strength_limits() -> None:
    # bending stiffness rises as φ and strength as φ^½ for thin walls, so the stiffness cap is higher
    for limit in [*shape_limits.FAMILY_LIMITS.values(), *shape_limits.GROUP_LIMITS.values()]:
        assert limit.bending_stiffness > limit.bending_strength


@pytest.mark.parametrize(
    ("args", "message"),
    [
        (
            ("metl", "bending_stiffness"),
            "shape limit: family: unknown family 'metl'; did you mean 'metal'? (valid: ceramic, composite, "
            "elastomer, foam, glass, metal, mineral, natural, polymer)",
        ),
        (
            ("metal", "bending"),
            "shape limit: mode: unknown mode 'bending'; did you mean 'bending_strength'? "
            "(valid: bending_stiffness, bending_strength)",
        ),
        (
            ("metal", "bending_strength", "titanium"),
            "shape limit: group: unknown group 'titanium'; "
            "expected one of: aluminium, frp, polymer, steel, wood",
        ),
    ],
)
def test_bad_shape_limit_queries(args: tuple, message: str) -> None:
    with pytest.raises(InputError) as caught:
        shape_limits.max_shape_factor(*args)
    assert str(caught.value) == message

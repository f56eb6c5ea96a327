"""The sandwich relations, against a beam worked by hand and their limiting cases."""

from __future__ import annotations

import math

import numpy as np
import pytest

from selector.mechanics import sandwich as sw
from selector.mechanics.loadcases import BEAM_CONSTANTS

# Worked by hand (illustrative numbers): aluminium faces E_f = 70 GPa, t_f = 1 mm, on a
# PVC-like foam core E_c = 80 MPa, G_c = 30 MPa, t_c = 20 mm; b = 50 mm, simply supported
# over L = 0.5 m, F = 1 kN at mid-span.
E_F, E_C, G_C = 70e9, 80e6, 30e6
B, T_F, T_C, L, F = 0.05, 1e-3, 20e-3, 0.5, 1000.0
CASE = sw.sandwich_case("simply-supported", "centre")
HAND = 1e-3  # the hand values below carry four significant figures


def test_flexural_rigidity_and_shear_stiffness_by_hand():
    # d = 21 mm; E_f·b·t_f·d²/2 = 70e9·0.05·1e-3·(0.021)²/2 = 771.75 N·m²;
    # faces' own E_f·b·t_f³/6 = 0.5833 N·m²; core E_c·b·t_c³/12 = 80e6·0.05·8e-6/12 = 2.667 N·m²
    # (Allen 1969, ch. 2, eq. for D — from memory).
    assert sw.flexural_rigidity(E_F, 0.0, B, T_F, T_C) == pytest.approx(772.33, rel=HAND)
    assert sw.flexural_rigidity(E_F, E_C, B, T_F, T_C) == pytest.approx(775.00, rel=HAND)
    # S = G_c·b·d²/t_c = 30e6·0.05·4.41e-4/0.02 = 33 075 N (Allen 1969, ch. 2).
    assert sw.shear_stiffness(G_C, B, T_F, T_C) == pytest.approx(33075.0, rel=HAND)


def test_deflection_splits_into_bending_and_shear_by_hand():
    # δ_b = F·L³/(48·D) = 125/(48·772.33) = 3.372 mm; δ_s = F·L/(4·S) = 500/132 300 = 3.779 mm
    # (Zenkert 1995, Table 4.1: B₁ = 48, B₂ = 4 — from memory).
    bending, shear = sw.deflection_parts(CASE, F, L, E_F, 0.0, G_C, B, T_F, T_C)
    assert bending == pytest.approx(3.372e-3, rel=HAND)
    assert shear == pytest.approx(3.779e-3, rel=HAND)


def test_stresses_by_hand():
    # M = F·L/4 = 125 N·m; thin-face σ_f = M/(b·t_f·d) = 125/1.05e-6 = 119.0 MPa; the outer
    # fibre M·E_f·h/(2D) = 125·70e9·0.022/(2·772.33) = 124.6 MPa (Allen 1969, ch. 2).
    assert sw.face_stress(CASE, F, L, E_F, 0.0, B, T_F, T_C) == pytest.approx(124.6e6, rel=HAND)
    assert 125.0 / (B * T_F * (T_C + T_F)) == pytest.approx(119.0e6, rel=HAND)
    # τ = V/(b·d) = 500/(0.05·0.021) = 0.4762 MPa (Allen 1969, ch. 2).
    assert sw.core_shear_stress(CASE, F, B, T_F, T_C) == pytest.approx(0.4762e6, rel=HAND)
    # σ_wr = 0.5·(70e9·80e6·30e6)^(1/3) = 0.5·(1.68e26)^(1/3) = 0.5·551.7 = 275.9 MPa (Allen 1969, ch. 8).
    assert sw.wrinkling_stress(E_F, E_C, G_C) == pytest.approx(275.9e6, rel=HAND)


def test_thin_faces_approach_the_centroid_stress():
    # For t_f ≪ t_c the outer-fibre stress tends to M/(b·t_f·d) (Allen 1969, ch. 2).
    t_f = 1e-6
    exact = sw.face_stress(CASE, F, L, E_F, 0.0, B, t_f, T_C)
    assert exact == pytest.approx(F * L / 4 / (B * t_f * (T_C + t_f)), rel=1e-4)


def test_no_core_is_a_solid_rectangle():
    # Monolithic limit: t_c → 0 leaves a solid of thickness h = 2·t_f, D = E·b·h³/12 and
    # σ = 6M/(b·h²) (any strength-of-materials text; common practice, no source).
    t_f = 3e-3
    h = 2 * t_f
    assert sw.flexural_rigidity(E_F, 0.0, B, t_f, 0.0) == pytest.approx(E_F * B * h**3 / 12, rel=1e-12)
    assert sw.face_stress(CASE, F, L, E_F, 0.0, B, t_f, 0.0) == pytest.approx(6 * F * L / 4 / (B * h**2))


@pytest.mark.parametrize("key", sorted(BEAM_CONSTANTS))
def test_every_beam_case_has_shear_constants(key):
    case = sw.sandwich_case(*key)
    assert case.b1 == BEAM_CONSTANTS[key][0]
    # The shear force at a support is F (cantilever) or F/2 (two supports): statics, no source.
    assert case.c_shear == (1.0 if key[0] == "cantilever" else 2.0)


def test_utilisations_are_one_at_each_limit():
    faces = {"E": np.array(E_F), "allow": np.array(124.6e6)}
    cores = {"E": np.array(E_C), "G": np.array(G_C), "tau": np.array(0.4762e6)}
    loads = {"F": F, "L": L, "b": B, "delta": 7.151e-3, "SF": 1.0}
    util = sw.utilisations(CASE, loads, faces, cores, T_F, T_C)
    assert set(util) == set(sw.MODES)
    for mode in ("stiffness", "face-yield", "core-shear"):
        assert util[mode] == pytest.approx(1.0, rel=2e-3), mode
    assert util["face-wrinkling"] == pytest.approx(124.6 / 275.9, rel=2e-3)


def test_thick_faces_are_flagged():
    assert sw.validity_warnings(5e-3, 10e-3)
    assert not sw.validity_warnings(0.5e-3, 20e-3)
    assert math.isclose(sw.THIN_FACE_RATIO, 5.77)


def test_the_fast_maximum_equals_the_largest_utilisation():
    rng = np.random.default_rng(3)
    faces = {"E": rng.uniform(10e9, 200e9, 50), "allow": rng.uniform(50e6, 900e6, 50)}
    cores = {
        "E": rng.uniform(5e6, 2e9, 50),
        "G": rng.uniform(2e6, 0.5e9, 50),
        "tau": rng.uniform(0.05e6, 5e6, 50),
    }
    loads = {"F": 900.0, "L": 1.1, "b": 0.3, "delta": 4e-3, "SF": 1.7}
    t_f, t_c = rng.uniform(0.2e-3, 5e-3, 50), rng.uniform(3e-3, 80e-3, 50)
    util = sw.utilisations(CASE, loads, faces, cores, t_f, t_c)
    expected = np.max(np.stack(list(util.values())), axis=0)
    assert sw.max_utilisation(CASE, loads, faces, cores, t_f, t_c) == pytest.approx(expected, rel=1e-12)

"""Beam deflections and moments of the load cases against the FE frame library anastruct.

anastruct (PyPI) solves the Euler–Bernoulli frame by the stiffness method; its node
displacements and element moments are the reference. Euler end-condition constants
are checked against the published effective-length factors.
"""

from __future__ import annotations

import math

import pytest
from anastruct import SystemElements

from selector.inputs.spec import spec_from_dict
from selector.mechanics.loadcases import BEAM_CONSTANTS, load_case
from selector.pipeline.selection import select

from ..conftest import make_table

FE_TOLERANCE = 0.005  # within 0.5 % of the FE result
ELEMENTS = 20
E, I_SECOND, L, F = 70e9, 2.0e-7, 1.5, 250.0  # illustrative numbers, SI


def _fe_beam(support: str, load: str, ei: float = E * I_SECOND) -> tuple[float, float]:
    """(largest deflection [m], largest |bending moment| [N·m]) from anastruct."""
    ss = SystemElements(EA=1e15, EI=ei)
    step = L / ELEMENTS
    for i in range(ELEMENTS):
        ss.add_element(location=[[i * step, 0.0], [(i + 1) * step, 0.0]])
    first, last, middle = 1, ELEMENTS + 1, ELEMENTS // 2 + 1
    if support == "cantilever":
        ss.add_support_fixed(node_id=first)
        where = last
    elif support == "simply-supported":
        ss.add_support_hinged(node_id=first)
        ss.add_support_roll(node_id=last, direction="x")
        where = middle
    else:
        ss.add_support_fixed(node_id=first)
        ss.add_support_fixed(node_id=last)
        where = middle
    if load == "uniform":
        for element in range(1, ELEMENTS + 1):
            ss.q_load(q=-F / L, element_id=element)
    else:
        ss.point_load(node_id=where, Fy=-F)
    ss.solve()
    deflection = max(abs(ss.get_node_displacements(node_id=n)["uy"]) for n in range(1, ELEMENTS + 2))
    moments = []
    for element in range(1, ELEMENTS + 1):
        result = ss.get_element_results(element_id=element)
        moments += [abs(result["Mmax"]), abs(result["Mmin"])]
    return deflection, max(moments)


@pytest.mark.parametrize(("support", "load"), sorted(BEAM_CONSTANTS))
def test_deflection_matches_fe(support, load):
    case = load_case("beam", support, load)
    ours = case.responses["deflection"].evaluate({"F": F, "L": L, "E": E, "I": I_SECOND})
    fe, _ = _fe_beam(support, load)
    assert ours == pytest.approx(fe, rel=FE_TOLERANCE)  # anastruct FE result
    # the stiffness constraint of the same case is at its limit when δ_max is the FE deflection
    at_limit = case.utilisation["stiffness"].evaluate({"F": F, "L": L, "E": E, "I": I_SECOND, "delta": fe})
    assert at_limit == pytest.approx(1.0, rel=FE_TOLERANCE)  # anastruct FE result


@pytest.mark.parametrize(("support", "load"), sorted(BEAM_CONSTANTS))
def test_peak_moment_matches_fe(support, load):
    case = load_case("beam", support, load)
    z = 4.0e-6  # section modulus [m³], illustrative
    stress = case.responses["stress"].evaluate({"F": F, "L": L, "Z": z})
    _, fe = _fe_beam(support, load)
    assert stress * z == pytest.approx(fe, rel=FE_TOLERANCE)  # anastruct FE result: M = σ·Z
    # the strength constraint is at its limit when σ_y/SF is the FE peak stress M/Z
    sf = 1.5
    at_limit = case.utilisation["strength"].evaluate(
        {"F": F, "L": L, "Z": z, "SF": sf, "sigma_y": sf * fe / z}
    )
    assert at_limit == pytest.approx(1.0, rel=FE_TOLERANCE)  # anastruct FE result


# Effective-length factors K of the four ideal end conditions: 1, 2, 0.699, 0.5
# (Timoshenko & Gere, Theory of Elastic Stability, 2nd ed., ch. 2 — from memory); n² = 1/K².
@pytest.mark.parametrize(
    ("support", "k"),
    [
        ("pinned-pinned", 1.0),
        ("fixed-free", 2.0),
        ("fixed-pinned", 0.6992),
        ("fixed-fixed", 0.5),
    ],
)
def test_the_column_case_buckles_at_the_euler_load_of_its_effective_length(support, k):
    # F_cr = π²·E·I_min/(K·L)² for the end conditions' effective-length factor K (Timoshenko & Gere,
    # as above): the built load case gives that buckling load, and its buckling utilisation is 1
    # at F = F_cr/SF.
    case = load_case("column", support)
    euler = math.pi**2 * E * I_SECOND / (k * L) ** 2
    values = {"E": E, "Imin": I_SECOND, "L": L}
    assert case.responses["buckling_load"].evaluate(values) == pytest.approx(euler, rel=2e-3)
    sf = 2.0
    at_limit = case.utilisation["buckling"].evaluate(values | {"F": euler / sf, "SF": sf})
    assert at_limit == pytest.approx(1.0, rel=2e-3)


def test_a_sized_cantilever_deflects_by_its_limit_in_fe():
    # End to end: size a tube cantilever for 4 mm, then load the sized tube in anastruct.
    spec = spec_from_dict(
        {
            "part": {
                "function": "beam",
                "support": "cantilever",
                "load": "end",
                "length": "1.5 m",
                "force": "250 N",
            },
            "section": {"shape": "tube", "free": "scale", "d": "40 mm", "t": "2 mm"},
            "constraint": [{"type": "stiffness", "max_deflection": "4 mm"}],
        }
    )
    table = make_table([{"id": "al", "E": (70, 70), "rho": (2700, 2700)}])
    row = select(spec, table).shortlist.iloc[0]
    d, t = row["dimensions"]["d"], row["dimensions"]["t"]
    second_moment = math.pi / 64 * (d**4 - (d - 2 * t) ** 4)  # common practice, no source
    fe, _ = _fe_beam("cantilever", "end", ei=70e9 * second_moment)
    assert fe == pytest.approx(0.004, rel=FE_TOLERANCE)  # anastruct FE result

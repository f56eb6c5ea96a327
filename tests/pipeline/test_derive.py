"""The derivation algebra on hand-checked cases."""

from __future__ import annotations

import math

import pytest

from selector.errors import InputError
from selector.mechanics.monomial import Monomial
from selector.pipeline.derive import derive


def test_beam_mass_coefficient_by_hand():
    # Cantilever, end load, fixed-proportion section: δ = F L³/(3 E k_I A²) at the limit gives
    # A = (F L³/(3 E k_I δ))^½, so m = ρ A L = (F/(3 k_I δ))^½ · L^(5/2) · ρ/E^½ (worked by hand).
    d = derive("beam", "stiffness", "mass", "scale", "cantilever", "end")
    values = {"F": 120.0, "L": 1.8, "delta": 0.004, "k_I": 1 / 12, "E": 70e9, "rho": 2700.0}
    by_hand = math.sqrt(120 / (3 * (1 / 12) * 0.004)) * 1.8**2.5 * 2700 / math.sqrt(70e9)
    assert d.objective_value.evaluate(values) == pytest.approx(by_hand, rel=1e-12)


def test_monomial_solve_and_substitute():
    m = Monomial.of(2, x=2, y=1)
    x = m.solve_for("x", Monomial.of(8, y=1))
    assert x.evaluate({}) == pytest.approx(2.0)
    assert m.substitute("x", x).evaluate({"y": 3}) == pytest.approx(24.0)


@pytest.mark.parametrize(
    ("args", "message"),
    [
        (
            ("beam", "buckling"),
            "constraint.type: 'buckling' does not apply to a beam; one of: stiffness, strength",
        ),
        (
            ("tie", "stiffness", "mass", "wall"),
            "section.free: 'wall' cannot be chosen for a tie; one of: scale",
        ),
        (
            ("beam", "stiffness", "weight"),
            "objective.minimize: 'weight' is not an objective; expected one of:",
        ),
        (("bean", "stiffness"), "part.function: 'bean' is not supported here; did you mean 'beam'?"),
    ],
)
def test_bad_requests_are_one_clear_line(args, message):
    with pytest.raises(InputError) as err:
        derive(*args)
    assert str(err.value).startswith(message)

"""One markup of formulas for pages: indices from their monomials, prose from its plain text."""

from __future__ import annotations

import pytest

from selector.mechanics.monomial import Monomial
from selector.outputs.formula import formula_html, index_pieces, monomial_pieces, pieces_html, text_pieces
from selector.pipeline.derive import SYMBOLS_TEXT, derive

# The indices below are those of Ashby's published index table (Materials Selection in
# Mechanical Design, from memory), written as our page marks them up.
PUBLISHED = [
    (("beam", "stiffness"), "E<sup>1/2</sup>/ρ"),
    (("beam", "strength"), "σ<sub>y</sub><sup>2/3</sup>/ρ"),
    (("tie", "fracture"), "K<sub>IC</sub>/ρ"),
    (("beam", "fatigue"), "σ<sub>e</sub><sup>2/3</sup>/ρ"),
    (("tie", "stiffness", "cost"), "E/(C<sub>m</sub>·ρ)"),
]


@pytest.mark.parametrize(("args", "expected"), PUBLISHED)
def test_a_derived_index_is_marked_up_from_its_monomial(args, expected):
    derivation = derive(*args)
    assert str(pieces_html(index_pieces(derivation))) == expected


@pytest.mark.parametrize(("args", "expected"), PUBLISHED)
def test_the_index_text_reads_back_to_the_same_markup(args, expected):
    # The prose reader and the monomial renderer agree on every index the text renderer writes.
    derivation = derive(*args)
    assert str(formula_html(derivation.index_text)) == expected


def test_a_spring_index_with_two_factors_below_is_bracketed():
    d = derive("spring", "strength")
    assert str(pieces_html(index_pieces(d))) == "σ<sub>y</sub><sup>2</sup>/(E·ρ)"


def test_monomial_pieces_split_heads_subscripts_and_powers():
    m = Monomial.of(K_IC=2) / Monomial.sym("sigma_y")
    assert monomial_pieces(m, SYMBOLS_TEXT) == [
        ("text", "K"),
        ("sub", "IC"),
        ("sup", "2"),
        ("text", "/"),
        ("text", "σ"),
        ("sub", "y"),
    ]
    assert monomial_pieces(Monomial.of(2.0)) == [("text", "1")]


def test_prose_is_escaped_and_only_our_tags_reach_the_page():
    assert str(formula_html("F^(1/2)·L^3/δ_max")) == "F<sup>1/2</sup>·L<sup>3</sup>/δ<sub>max</sub>"
    assert str(formula_html("<b>E</b>^2 & x")) == "&lt;b&gt;E&lt;/b&gt;<sup>2</sup> &amp; x"
    assert text_pieces("no formula here") == [("text", "no formula here")]

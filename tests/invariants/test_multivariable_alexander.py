"""The multivariable Alexander polynomial against recalled values and the one-variable matrix."""

from __future__ import annotations

import random

import pytest

from knotsift.errors import InvariantError
from knotsift.invariants.alexander import _fox_rows, _minor_determinant
from knotsift.invariants.linking import reverse_components
from knotsift.invariants.multivariable_alexander import (
    multivariable_alexander,
    normal_form,
    one_variable_reduction,
    permuted,
    polynomial_text,
)
from knotsift.notations.braid import parse_braid
from knotsift.notations.conway_algebraic import parse_conway_notation
from knotsift.reidemeister import scramble

from ..knots import HOPF, TREFOIL

# Recalled multivariable Alexander polynomials, up to units (from memory): Hopf link 1,
# Whitehead link (t1 - 1)(t2 - 1), Borromean rings (t1 - 1)(t2 - 1)(t3 - 1), and
# T(2,4) 1 + t1 t2 (parallel orientation).
RECALLED = [
    ("Hopf link", HOPF, "1"),
    ("Whitehead link", parse_conway_notation("212"), "t1 t2 - t1 - t2 + 1"),
    ("Borromean rings", parse_braid("1 -2 1 -2 1 -2"),
     "t1 t2 t3 - t1 t2 - t1 t3 + t1 - t2 t3 + t2 + t3 - 1"),
    ("T(2,4)", parse_braid("1 1 1 1"), "t1 t2 + 1"),
]


@pytest.mark.parametrize("name,diagram,text", RECALLED, ids=[r[0] for r in RECALLED])
def test_multivariable_alexander_recalled(name, diagram, text):
    assert polynomial_text(multivariable_alexander(diagram)) == text


def _one_variable_minor(diagram) -> dict[int, int]:
    """(t - 1) Delta(t, ..., t) computed another way: the one-variable Fox matrix minor."""
    rows, n = _fox_rows(diagram)
    coeffs = _minor_determinant(rows, n, "bareiss")
    out = {e: c for e, c in enumerate(coeffs) if c}
    low = min(out)
    out = {e - low: c for e, c in out.items()}
    sign = 1 if out[max(out)] > 0 else -1
    return {e: sign * c for e, c in sorted(out.items())}


@pytest.mark.parametrize("code", ["2", "4", "212", "6", "33", "222", "232", "3112", "2,2,3",
                                  ".2", "2,2,2", ".1", "2,2,2-", "2,2,2+", "21,2,2-", ".-3",
                                  "(2,2)(2,2)"])
def test_one_variable_reduction_matches_fox_matrix(code):
    """Torres (1953): the one-variable link polynomial is (t - 1) Delta(t, ..., t); here it is
    checked against the minor of the one-variable Fox matrix, a separate computation."""
    d = parse_conway_notation(code)
    assert one_variable_reduction(multivariable_alexander(d)) == _one_variable_minor(d)


def test_multivariable_alexander_invariant_under_scrambling():
    """Reidemeister moves and relabelling change only the order of the variables."""
    rng = random.Random(5)
    d = parse_conway_notation("21,2,2")
    want = multivariable_alexander(d)
    for _ in range(5):
        got = multivariable_alexander(scramble(d, 8, rng))
        assert got in (want, permuted(want, (1, 0)))


def test_reversing_a_component_inverts_its_variable():
    """Reversing component 2 replaces t2 by 1/t2, up to units (it inverts that meridian)."""
    d = parse_braid("1 1 1 1 1 1")
    p = multivariable_alexander(d)
    flipped = normal_form({(e[0], -e[1]): c for e, c in p.items()})
    assert multivariable_alexander(reverse_components(d, [1])) == flipped


def test_split_link_has_zero_polynomial():
    assert multivariable_alexander(HOPF.disjoint_union(TREFOIL).disjoint_union(HOPF)) == {}


def test_knot_is_refused_with_a_clear_message():
    with pytest.raises(InvariantError, match="links of two or more components, got 1"):
        multivariable_alexander(TREFOIL)

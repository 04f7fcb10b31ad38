"""Tests of knotsift.invariants.perturbed_alexander (rho_1)."""

from __future__ import annotations

import itertools
import random

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from knotsift import Diagram, InvariantError, Laurent
from knotsift.invariants.alexander import alexander_polynomial
from knotsift.invariants.fingerprint import Fingerprint, fingerprint
from knotsift.invariants.jones import jones_polynomial
from knotsift.invariants.perturbed_alexander import (
    HASH_POINTS,
    LongKnot,
    _face_walks,
    _from_long_knot,
    _Plan,
    _value_at_dense,
    long_knot,
    perturbed_alexander,
    rho_1,
    rho_1_hash,
)
from knotsift.reidemeister import scramble, shuffle_labels

from tests.knots import FIGURE_EIGHT, HOPF, TREFOIL, reversed_diagram
from tests.strategies import braid_closure, knot_diagrams, random_knot_braid

FAST = settings(max_examples=40, deadline=None)

# Cross-check values computed from the published formulas (Bar-Natan and van
# der Veen, "A perturbed-Alexander invariant", Quantum Topology 2024), with
# sigma_i a positive crossing: (braid word, Delta, rho_1).
CROSS_CHECKS = {
    "right-handed trefoil": ([1, 1, 1], "t^-1 - 1 + t", "-t^-2 + 2t^-1 - 2 + 2t - t^2"),
    "left-handed trefoil": ([-1, -1, -1], "t^-1 - 1 + t", "t^-2 - 2t^-1 + 2 - 2t + t^2"),
    "figure-eight": ([1, -2, 1, -2], "-t^-1 + 3 - t", "0"),
    "T(2,5)": ([1] * 5, "t^-2 - t^-1 + 1 - t + t^2",
               "-2t^-4 + 4t^-3 - 5t^-2 + 6t^-1 - 6 + 6t - 5t^2 + 4t^3 - 2t^4"),
    "5_2": ([1, 1, 1, 2, -1, 2], "2t^-1 - 3 + 2t", "-5t^-2 + 14t^-1 - 18 + 14t - 5t^2"),
    "T(3,4)": ([1, 2] * 4, "t^-3 - t^-2 + 1 - t^2 + t^3",
               "-3t^-6 + 6t^-5 - 3t^-4 - 4t^-3 + 5t^-2 + 2t^-1 - 6 + 2t + 5t^2 - 4t^3 - 3t^4 "
               "+ 6t^5 - 3t^6"),
}


@pytest.mark.parametrize("name", sorted(CROSS_CHECKS))
def test_perturbed_alexander_cross_check_values(name):
    """Delta and rho_1 of small braid closures agree with the published formulas' values."""
    word, delta, rho = CROSS_CHECKS[name]
    both = perturbed_alexander(braid_closure(word))
    assert str(both.alexander) == delta
    assert str(both.rho_1) == rho


@pytest.mark.parametrize("name", sorted(CROSS_CHECKS))
def test_rho_1_early_termination_matches_certified(name):
    """The early-terminated interpolation in T + 1/T gives the certified value."""
    d = braid_closure(CROSS_CHECKS[name][0])
    assert rho_1(d, certified=False) == rho_1(d, certified=True)


def test_rho_1_unknot_diagrams():
    """The unknot has rho_1 = 0 in every diagram (Bar-Natan and van der Veen 2024)."""
    rng = random.Random(7)
    assert rho_1(Diagram.unknot()).is_zero()
    for moves in (1, 3, 6, 10):
        d = scramble(Diagram.unknot(), moves, rng)
        if d.number_of_crossings():
            assert rho_1(d).is_zero(), d


@FAST
@given(knot_diagrams(max_strands=4, max_length=9))
def test_rho_1_mirror_negates_and_symmetric(d):
    """A mirror image has -rho_1, and rho_1(1/T) = rho_1(T), both from certified values."""
    value = rho_1(d, certified=True)
    assert rho_1(d.mirror(), certified=True) == -value
    assert value.substitute_power(-1) == value


@FAST
@given(knot_diagrams(max_strands=4, max_length=9))
def test_rho_1_alexander_from_same_matrix(d):
    """Delta from det A equals the Alexander polynomial of the Fox matrix (alexander.py)."""
    assert perturbed_alexander(d, certified=True).alexander == alexander_polynomial(d)


@FAST
@given(knot_diagrams(max_strands=4, max_length=8), st.integers(0, 2**32))
def test_rho_1_invariant_under_reidemeister_moves_and_relabelling(d, seed):
    """Random Reidemeister moves and a relabelling leave rho_1 unchanged."""
    rng = random.Random(seed)
    moved = shuffle_labels(scramble(d, 4, rng), rng)
    assert rho_1(moved) == rho_1(d)


def test_rho_1_orientation_reversal():
    """Reversing the orientation leaves rho_1 unchanged (Bar-Natan and van der Veen 2024)."""
    rng = random.Random(3)
    for _ in range(10):
        d = braid_closure(random_knot_braid(rng, 3, 8))
        assert rho_1(reversed_diagram(d)) == rho_1(d)


def test_rho_1_independent_of_cut_and_outer_face():
    """Every outer face and every cut edge on it give the same rho_1."""
    rng = random.Random(11)
    for _ in range(4):
        d = braid_closure(random_knot_braid(rng, 3, 7))
        expected = rho_1(d)
        walks = _face_walks(d)
        for face, segments in enumerate(walks):
            for edge in {e for e, _, _ in segments}:
                assert perturbed_alexander(d, outer_face=face, cut_edge=edge).rho_1 == expected


def _circulations(d: Diagram, walks) -> list[dict[int, int]]:
    """Changes of rotation numbers round one crossing that keep every face equation."""
    out = []
    for x in d.crossings:
        if len(set(x)) < 4:
            continue
        for signs in itertools.product((1, -1), repeat=4):
            delta = dict(zip(x, signs, strict=True))
            if all(sum(fw * delta.get(e, 0) for e, fw, _ in seg) == 0 for seg in walks):
                out.append(delta)
                break
    return out


def test_rho_1_independent_of_rotation_number_choice():
    """Adding a circulation of the dual graph to the rotation numbers changes nothing."""
    rng = random.Random(5)
    checked = 0
    for _ in range(4):
        d = braid_closure(random_knot_braid(rng, 3, 7))
        expected = rho_1(d)
        walks = _face_walks(d)
        lk = long_knot(d)
        comp = list(d.components()[0])
        cut = comp.index(walks[max(range(len(walks)), key=lambda f: (len(walks[f]), -f))][0][0])
        order = comp[cut:] + comp[:cut]
        for delta in _circulations(d, walks):
            rotation = list(lk.rotation)
            for e, change in delta.items():
                m = order.index(e)
                rotation[m if m else len(rotation) - 1] += 3 * change
            other = LongKnot(lk.crossings, tuple(rotation))
            assert other.rotation != lk.rotation
            assert _from_long_knot(other).rho_1 == expected
            checked += 1
    assert checked


def test_rho_1_woodbury_matches_dense_formula():
    """The n x n evaluation equals the dense inverse of A at random points."""
    rng = random.Random(2)
    p = HASH_POINTS[0][0]
    for _ in range(40):
        d = braid_closure(random_knot_braid(rng, rng.randint(2, 5), rng.randint(3, 12)))
        lk = long_knot(d, outer_face=rng.randrange(len(d.faces())))
        x = rng.randrange(2, p - 1)
        assert _Plan(lk).evaluate(x, p) == _value_at_dense(lk, x, p)


def test_rho_1_separates_5_1_from_10_132():
    """5_1 and 10_132 share Jones (Jones 1987, from memory) but not rho_1."""
    from knotsift.notations.conway_algebraic import parse_conway_notation

    five_one = braid_closure([1] * 5)
    ten = parse_conway_notation("23,3,2-")  # 10_132 (Conway 1970, from memory)
    assert jones_polynomial(ten) in (jones_polynomial(five_one),
                                     jones_polynomial(five_one).mirror())
    assert alexander_polynomial(ten) == alexander_polynomial(five_one)
    assert rho_1(ten) not in (rho_1(five_one), -rho_1(five_one))


def test_rho_1_hash_invariant_and_mirror():
    """The hash is unchanged by moves and negated modulo p by a mirror image."""
    rng = random.Random(9)
    d = braid_closure(random_knot_braid(rng, 3, 11))
    h = rho_1_hash(d, points=4)
    assert rho_1_hash(shuffle_labels(scramble(d, 5, rng), rng), points=4) == h
    mirrored = rho_1_hash(d.mirror(), points=4)
    for (p, x), a, b in zip(HASH_POINTS, h, mirrored, strict=True):
        assert (a + b) % p == 0
        exact = rho_1(d).evaluate(x)
        assert exact % p == a


def test_fingerprint_connected_sum_rho_1():
    """rho_1 of a connected sum from the summands equals the direct computation."""
    rng = random.Random(4)
    for _ in range(3):
        a = braid_closure(random_knot_braid(rng, 3, 5))
        b = braid_closure(random_knot_braid(rng, 2, 5))
        assert fingerprint(a.connected_sum(b)) == fingerprint(a) * fingerprint(b)


def test_rho_1_rejects_links():
    """A link raises InvariantError naming the number of components."""
    with pytest.raises(InvariantError, match="2 components"):
        rho_1(HOPF)


def test_rho_1_figure_eight_and_trefoil_pd():
    """PD codes from the shared test knots give the values of their braid closures."""
    assert rho_1(FIGURE_EIGHT) == Laurent.constant(0)
    assert rho_1(TREFOIL) == rho_1(braid_closure([1, 1, 1]))


def test_fingerprint_beyond_rho_1_limit_keeps_the_hash():
    """Above the exact limit the fingerprint keeps rho_1's hash, equal to the exact one's."""
    from knotsift.identification import identify_diagram
    from knotsift.invariants.fingerprint import RHO_1_UP_TO
    from knotsift.invariants.perturbed_alexander import hash_text, rho_1_hash_of
    from knotsift.simplify import simplify

    d = simplify(braid_closure([1, 2] * 31))  # the torus knot T(3, 31), 62 crossings
    assert d.number_of_crossings() > RHO_1_UP_TO
    fp = fingerprint(d, simplified=True)
    assert fp.rho_1 is None
    exact = perturbed_alexander(d, certified=False)
    assert fp.texts()["rho_1_hash"] == hash_text(rho_1_hash_of(exact.rho_1, exact.alexander))
    assert fp.mirror().texts()["rho_1_hash"] == fingerprint(d.mirror(), True).texts()["rho_1_hash"]
    notes = identify_diagram(d).notes
    assert any("rho_1 was not computed" in n for n in notes)


def test_mirror_hash_text_matches_the_mirror_diagram():
    """The text rule for mirror images gives the mirror diagram's hash text."""
    from knotsift.invariants.perturbed_alexander import hash_text, mirror_hash_text

    d = braid_closure([1, 1, 1, 2, -1, 2])
    assert mirror_hash_text(hash_text(rho_1_hash(d))) == hash_text(rho_1_hash(d.mirror()))
    assert mirror_hash_text("") == ""


@pytest.mark.parametrize("labels", [("8_19", "9_42*"), ("7_4", "5_2", "6_1*"),
                                    ("10_132", "3_1", "8_20")])
def test_displayed_connected_sum_is_computed_from_its_summands(labels):
    """Above CERTIFIED_UP_TO crossings a diagram that displays a split is cut there; the
    result equals the computation on the whole diagram (split=False), and the certified
    one, and the table values multiplied by the connected-sum formula (the test above)."""
    from knotsift.decomposition import decomposing_edges
    from knotsift.invariants.perturbed_alexander import CERTIFIED_UP_TO, perturbed_alexander
    from knotsift.table import open_table

    table = open_table()
    d = Diagram(table.form(labels[0]).pd())
    for label in labels[1:]:
        d = d.connected_sum(Diagram(table.form(label).pd()))
    d = scramble(d, 6, random.Random(" ".join(labels)))
    assert d.number_of_crossings() > CERTIFIED_UP_TO and decomposing_edges(d) is not None
    summed = perturbed_alexander(d)
    assert summed == perturbed_alexander(d, split=False)
    if d.number_of_crossings() <= 26:
        assert summed == perturbed_alexander(d, certified=True)
    product = None
    for label in labels:
        f = table.form(label)
        fp = Fingerprint(1, None, Laurent.parse(f.alexander), f.determinant, f.signature,
                         Laurent.parse(f.rho_1))
        product = fp if product is None else product * fp
    assert (summed.alexander, summed.rho_1) == (product.alexander, product.rho_1)

"""Tests of projecting 3D curves to PD codes: handedness, known types, rigid motions, links."""

from __future__ import annotations

import numpy as np
import pytest
from knotsift.curves.frame import Chain, prepare_chains
from knotsift.curves.projection import project
from knotsift.invariants.fingerprint import fingerprint
from knotsift.invariants.jones import jones_polynomial
from knotsift.laurent import Laurent

from tests.curves.curves import (
    figure_eight,
    hopf_link,
    mirror,
    moved,
    one_maximum_unknot,
    right_torus_knot,
    torus_knot,
    torus_link,
)
from tests.strategies import braid_closure


def units(x, closed=True):
    return prepare_chains([Chain("A", x, closed)]).chains[0].coords


def diagram_of(x, seed=0):
    return project([(units(x), True)], np.random.default_rng(seed)).diagram


def poly(coeffs: dict[int, int]) -> Laurent:
    return Laurent({k: v for k, v in coeffs.items() if v})


def torus_jones(p: int, q: int) -> Laurent:
    """V(T(p,q)) = t^((p-1)(q-1)/2) (1 - t^(p+1) - t^(q+1) + t^(p+q)) / (1 - t^2).

    The positive torus knot; Jones 1987, Ann. of Math. 126, "Hecke algebra
    representations of braid groups and link polynomials" (from memory).  The
    division is exact; done here by long division of integer polynomials.
    """
    num = {0: 1, p + 1: -1, q + 1: -1, p + q: 1}
    # N = (1 - t^2) Q gives N_k = Q_k - Q_(k-2), so Q_k = N_k + Q_(k-2)
    quot: list[int] = []
    for k in range(p + q - 1):
        quot.append(num.get(k, 0) + (quot[k - 2] if k >= 2 else 0))
    shift = (p - 1) * (q - 1) // 2
    return poly({k + shift: c for k, c in enumerate(quot) if c})


def test_torus_jones_formula_matches_braid_closures():
    """The quoted formula agrees with the positive braid closures (sigma_1 ... sigma_{p-1})^q."""
    for p, q in [(2, 3), (2, 5), (2, 7), (3, 4), (3, 5)]:
        word = list(range(1, p)) * q
        assert jones_polynomial(braid_closure(word, p)) == torus_jones(p, q)


def test_standard_torus_form_handedness():
    """With p, q > 0 the standard form is the left-handed trefoil; q -> -q the right-handed.

    Worked out by hand at the crossing s = pi/6 over s = 7pi/6 of T(2,3):
    (v_over x v_under) . z = -12 r R < 0, a negative crossing (CONVENTIONS.md sign rule).
    Right-handed trefoil V = t + t^3 - t^4 (common practice).
    """
    right = Laurent.parse("t + t^3 - t^4")
    assert jones_polynomial(diagram_of(torus_knot(2, 3, 120))) == right.mirror()
    assert jones_polynomial(diagram_of(torus_knot(3, 2, 120))) == right.mirror()
    assert jones_polynomial(diagram_of(right_torus_knot(2, 3, 120))) == right
    assert jones_polynomial(diagram_of(right_torus_knot(3, 2, 120))) == right
    assert jones_polynomial(diagram_of(mirror(torus_knot(2, 3, 120)))) == right


@pytest.mark.parametrize("p, q", [(2, 3), (2, 5), (2, 7), (3, 4), (3, 5)])
@pytest.mark.parametrize("n", [120, 300])
def test_torus_knots_rotated_noisy(p, q, n):
    """T(p,q) at two bead counts, rotated, translated, with noise: the torus-knot fingerprint.

    Torus knots from the standard form; compared with the closure of the
    positive braid (sigma_1 ... sigma_{p-1})^q, which is T(p,q) (common practice).
    """
    rng = np.random.default_rng(1000 * p + q + n)
    expected = fingerprint(braid_closure(list(range(1, p)) * q, p))
    x = moved(right_torus_knot(p, q, n), rng, noise=0.02)
    fp = fingerprint(diagram_of(x, seed=n))
    assert fp == expected
    assert fingerprint(diagram_of(mirror(x), seed=n)) == expected.mirror()


@pytest.mark.parametrize("n", [80, 200, 500])
def test_figure_eight_curve(n):
    """The figure-eight curve: V = t^-2 - t^-1 + 1 - t + t^2, Delta = -t + 3 - t^-1.

    Values of 4_1: common practice.
    """
    rng = np.random.default_rng(n)
    fp = fingerprint(diagram_of(moved(figure_eight(n), rng), seed=n))
    assert fp.jones == Laurent.parse("t^-2 - t^-1 + 1 - t + t^2")
    assert fp.alexander == Laurent.parse("-t^-1 + 3 - t")
    assert fp.signature == 0


def test_projection_direction_does_not_matter():
    """Different seeds (view directions) give different diagrams but the same fingerprint."""
    x = units(moved(right_torus_knot(3, 4, 240), np.random.default_rng(5)))
    fps = set()
    sizes = set()
    for seed in range(6):
        d = project([(x, True)], np.random.default_rng(seed)).diagram
        fps.add(fingerprint(d).key())
        sizes.add(d.number_of_crossings())
    assert len(fps) == 1
    assert len(sizes) > 1  # the diagrams really differ


def test_one_maximum_curve_is_unknot():
    """A rose-shaped shadow lifted with one maximum and one minimum is the unknot (Milnor 1950)."""
    x = moved(one_maximum_unknot(400, loops=6), np.random.default_rng(2), noise=0.0)
    sizes = []
    for seed in range(4):
        d = diagram_of(x, seed)
        sizes.append(d.number_of_crossings())
        assert jones_polynomial(d) == 1
    assert max(sizes) >= 10  # tangled in projection


def test_unit_circle_has_no_crossings():
    """A planar circle projects without crossings: one free loop."""
    s = np.linspace(0, 2 * np.pi, 50, endpoint=False)
    d = diagram_of(np.stack([np.cos(s), np.sin(s), 0 * s], axis=1))
    assert d.number_of_crossings() == 0 and d.free_loops == 1


def test_hopf_link_linking_number_and_jones():
    """Hopf link: linking number +-1 and V = -t^1/2 - t^5/2 or its mirror (common practice)."""
    a, b = hopf_link(80)
    prep = prepare_chains([Chain("A", a, True), Chain("B", b, True)])
    proj = project([(c.coords, True) for c in prep.chains], np.random.default_rng(0))
    lk = proj.linking_number(0, 1)
    assert abs(lk) == 1
    assert proj.diagram.linking_number(*proj.components) == lk
    v = jones_polynomial(proj.diagram)
    positive = Laurent.parse("-t^(1/2) - t^(5/2)")
    assert v == (positive if lk > 0 else positive.mirror())
    # reversing one ring reverses the sign
    rev = project([(prep.chains[0].coords, True), (prep.chains[1].coords[::-1], True)],
                  np.random.default_rng(1))
    assert rev.linking_number(0, 1) == -lk


def test_torus_link_linking_number():
    """The torus link T(2,4) has linking number +-2.

    Rolfsen 1976, "Knots and Links" (from memory).
    """
    a, b = torus_link(2, 160)
    prep = prepare_chains([Chain("A", a, True), Chain("B", b, True)])
    for seed in range(3):
        proj = project([(c.coords, True) for c in prep.chains], np.random.default_rng(seed))
        assert abs(proj.linking_number(0, 1)) == 2


def test_separate_rings_free_loops():
    """Two far-apart circles: linking number 0; a ring without crossings is a free loop."""
    a, b = hopf_link(60)
    b = b + np.array([10.0, 0.0, 0.0])
    prep = prepare_chains([Chain("A", a, True), Chain("B", b, True)])
    proj = project([(c.coords, True) for c in prep.chains], np.random.default_rng(0))
    assert proj.linking_number(0, 1) == 0
    assert proj.diagram.number_of_components() == 2


def test_projection_refuses_open_chains():
    """Only rings project to diagrams; open chains must be closed first."""
    from knotsift.errors import CurveError

    with pytest.raises(CurveError, match="close open chains"):
        project([(units(figure_eight(50)), False)], np.random.default_rng(0))


def test_several_directions_keep_the_fewest_crossings():
    """With k directions the kept projection has the fewest crossings of the k, same type."""
    x = units(moved(right_torus_knot(3, 4, 240), np.random.default_rng(8)))
    singles = []
    rng = np.random.default_rng(4)
    for _ in range(5):
        singles.append(project([(x, True)], rng).diagram)
    best = project([(x, True)], np.random.default_rng(4), directions=5).diagram
    assert best.number_of_crossings() == min(d.number_of_crossings() for d in singles)
    assert fingerprint(best).key() == fingerprint(singles[0]).key()
    again = project([(x, True)], np.random.default_rng(4), directions=5).diagram
    assert again == best


def test_directions_must_be_positive():
    with pytest.raises(ValueError, match="directions"):
        project([(units(figure_eight(50)), True)], np.random.default_rng(0), directions=0)


def test_passages_closer_than_float_resolution_are_ordered_exactly():
    """Two rings cross a long segment 1e-12 apart: the order along it is the true order.

    Ring C is ring B moved by 1e-12 along the segment's direction, so C's
    crossing comes after B's along the segment (common practice: a
    translation moves every crossing with it).
    """
    from knotsift.curves.contact import segment_set
    from knotsift.curves.projection import _crossings

    a = np.array([[0.0, 0, 0], [10, 0, 0], [5, -5, 0]])
    b = np.array([[5.0, -1, 1], [5, 1, 1], [5, 0, 5]])
    c = b + np.array([1e-12, 0, 0])
    segs = segment_set([(a, True), (b, True), (c, True)])
    u = np.array([0.1, 0.2, 1.0])
    found = _crossings(segs, u, 1e-9)
    on_a = []
    for row in found:
        for seg_col, par_col, other_col in ((0, 1, 2), (2, 3, 0)):
            if int(row[seg_col]) == 0:
                on_a.append((row[par_col], int(segs.chain[int(row[other_col])])))
    on_a.sort()
    chains = [ch for _, ch in on_a]
    assert sorted(chains) == [1, 1, 2, 2]
    # along segment 0 (running +x) each crossing of B comes just before C's twin
    first_b = chains.index(1)
    assert chains[first_b + 1] == 2


def test_straight_runs_of_beads_are_not_degenerate():
    """Collinear beads (a square ring, ten beads a side) project at once, without a redraw.

    Segments on one straight line are collinear in every projection, yet
    meet only at shared beads: no direction is degenerate (common practice).
    """
    side = np.linspace(0, 1, 10, endpoint=False)[:, None]
    corners = np.array([[0.0, 0, 0], [1, 0, 0], [1, 1, 0], [0, 1, 0]])
    x = np.concatenate([a + side * (b - a) for a, b in zip(corners, np.roll(corners, -1, 0),
                                                               strict=True)])
    for seed in range(3):
        proj = project([(units(x), True)], np.random.default_rng(seed))
        assert proj.redraws == 0
        assert proj.diagram.number_of_crossings() == 0

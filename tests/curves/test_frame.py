"""Tests of the checks that make coordinates fit for topology (robustness)."""

from __future__ import annotations

import numpy as np
import pytest

from knotsift.curves.contact import check_no_contact
from knotsift.curves.frame import Chain, prepare_chains
from knotsift.errors import CurveError
from tests.curves.curves import right_torus_knot


def ring(n=40):
    return right_torus_knot(2, 3, n)


@pytest.mark.parametrize("value", [np.nan, np.inf, -np.inf])
def test_non_finite_coordinates(value):
    """NaN or infinite coordinates are an error naming the chain and bead."""
    x = ring()
    x[7, 1] = value
    with pytest.raises(CurveError, match="not finite") as info:
        prepare_chains([Chain("B", x, True)], where="run.xyz, frame 3")
    assert "run.xyz, frame 3, chain B, bead 7" in str(info.value)


def test_too_few_beads():
    with pytest.raises(CurveError, match="at least 4 beads, got 3"):
        prepare_chains([Chain("A", ring()[:3], False)])


def test_repeated_beads_are_dropped_with_a_warning():
    """Coincident consecutive beads and a ring's repeated first bead are dropped, with warnings."""
    x = ring()
    x = np.insert(x, 10, x[10], axis=0)
    x = np.concatenate((x, x[:1]))
    prep = prepare_chains([Chain("A", x, True)], where="f.xyz, frame 0")
    assert len(prep.chains[0].coords) == 40
    assert len(prep.warnings) == 2
    assert "beads 11" in prep.warnings[0] and "repeats the first" in prep.warnings[1]
    assert prep.kept[0][10] == 10 and prep.kept[0][11] == 12


def test_repeats_leaving_too_few_beads():
    x = np.array([[0.0, 0, 0], [0, 0, 0], [1, 0, 0], [1, 0, 0], [0, 1, 0]])
    with pytest.raises(CurveError, match="only 3 distinct beads"):
        prepare_chains([Chain("A", x, True)])


def test_all_beads_coincide():
    with pytest.raises(CurveError, match="zero length"):
        prepare_chains([Chain("A", np.ones((6, 3)), True)])


def test_fold_back_is_an_error():
    """Consecutive bonds doubling back (a collinear run reversing) make the chain touch itself."""
    x = np.array([[0.0, 0, 0], [1, 0, 0], [2, 0, 0], [1.5, 0, 0], [1.5, 1, 0], [0, 1, 1]])
    with pytest.raises(CurveError, match="folds back on itself at bead 2"):
        prepare_chains([Chain("A", x, False)])


def test_straight_runs_are_fine():
    """Collinear beads running straight on are harmless."""
    x = np.array([[0.0, 0, 0], [1, 0, 0], [2, 0, 0], [3, 0, 0], [3, 1, 0], [0, 1, 0.5]])
    prep = prepare_chains([Chain("A", x, True)])
    assert len(prep.chains[0].coords) == 6 and not prep.warnings


def test_units_and_offsets_are_removed():
    """Huge or tiny units and a large offset give the same prepared chain (units do not matter)."""
    x = ring()
    base = prepare_chains([Chain("A", x, True)]).chains[0].coords
    for scale, shift in [(1e12, 0.0), (1e-9, 0.0), (1.0, 1e6), (3.7e4, -2e8)]:
        y = prepare_chains([Chain("A", x * scale + shift, True)]).chains[0].coords
        assert np.allclose(y, base, atol=1e-5)


def test_offset_beyond_float_precision():
    """Coordinates 1e12 bond lengths from the origin cannot resolve a bond: an error."""
    with pytest.raises(CurveError, match="cannot resolve a bond"):
        prepare_chains([Chain("A", ring() + 1e12, True)])


def test_self_passage_is_an_error():
    """Two non-adjacent segments that meet: the type is not defined."""
    x = np.array([[0.0, 0, 0], [2, 0, 0], [2, 2, 0], [1, 2, 0], [1, -1, 0], [0, -1, 1]])
    with pytest.raises(CurveError, match="passes through itself") as info:
        check_no_contact([(x, True)], ["A"], where="run.xyz, frame 2")
    assert "beads 0-1" in str(info.value) and "beads 3-4" in str(info.value)


def test_chains_touching_each_other():
    a = np.array([[0.0, 0, 0], [2, 0, 0], [2, 2, 0], [0, 2, 0]])
    b = np.array([[1.0, 1, 0], [1, 1, 1], [3, 3, 1], [3, 3, 0]])
    with pytest.raises(CurveError, match="chains A and B touch"):
        check_no_contact([(a, True), (b, True)], ["A", "B"])

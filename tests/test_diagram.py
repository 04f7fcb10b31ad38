"""Tests of the PD-code diagram model: validation and operations."""

import random

import pytest

from knotsift.diagram import Diagram
from knotsift.errors import DiagramError
from knotsift.reidemeister import shuffle_labels

RIGHT_TREFOIL = [(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)]
FIGURE_EIGHT = [(4, 2, 5, 1), (8, 6, 1, 5), (6, 3, 7, 4), (2, 7, 3, 8)]
HOPF = [(1, 3, 2, 4), (3, 1, 4, 2)]


def test_signs_and_writhe():
    """Right-handed trefoil: three positive crossings; figure-eight: writhe 0 (common practice)."""
    assert Diagram(RIGHT_TREFOIL).signs() == (1, 1, 1)
    assert Diagram(FIGURE_EIGHT).writhe() == 0
    assert Diagram(RIGHT_TREFOIL).mirror().writhe() == -3


def test_components_and_linking_number():
    """The Hopf link has two components with linking number +-1 (common practice)."""
    h = Diagram(HOPF)
    assert h.number_of_components() == 2
    assert abs(h.linking_number(0, 1)) == 1
    assert h.mirror().linking_number(0, 1) == -h.linking_number(0, 1)


def test_unknot_and_free_loops():
    """The empty PD code is the unknot; free loops count as components."""
    assert Diagram.from_pd([]).number_of_components() == 1
    assert Diagram([], free_loops=3).number_of_components() == 3


def test_crossing_change_and_smoothing():
    """Changing a crossing flips its sign; smoothing a knot's crossing gives two components."""
    d = Diagram(RIGHT_TREFOIL)
    c = d.crossing_change(1)
    assert c.signs() == (1, -1, 1)
    assert d.smoothing(0).number_of_components() == 2
    assert Diagram(HOPF).smoothing(0).number_of_components() == 1
    kink = Diagram([(1, 1, 2, 2)])
    assert kink.smoothing(0) == Diagram([], free_loops=2)


def test_connected_sum_is_a_knot():
    """A connected sum of two knot diagrams is a knot diagram with all crossings kept."""
    s = Diagram(RIGHT_TREFOIL).connected_sum(Diagram(FIGURE_EIGHT))
    assert s.number_of_crossings() == 7
    assert s.is_knot()
    assert sorted(s.signs()) == sorted(Diagram(RIGHT_TREFOIL).signs() + Diagram(FIGURE_EIGHT).signs())


def test_alternating():
    """Trefoil and figure-eight diagrams alternate; a changed crossing breaks it."""
    assert Diagram(RIGHT_TREFOIL).is_alternating()
    assert Diagram(FIGURE_EIGHT).is_alternating()
    assert not Diagram(FIGURE_EIGHT).crossing_change(0).is_alternating()


def test_relabelling_keeps_signs():
    """Random renaming and reordering of crossings keeps the multiset of signs ("to rule out
    accidentally-correct behaviour", seeded)."""
    rng = random.Random(7)
    d = Diagram(FIGURE_EIGHT)
    for _ in range(10):
        e = shuffle_labels(d, rng)
        assert sorted(e.signs()) == sorted(d.signs())
        assert e.number_of_components() == 1


def test_faces_count():
    """A connected diagram with n crossings has n + 2 faces (Euler's formula)."""
    assert len(Diagram(RIGHT_TREFOIL).faces()) == 5
    assert len(Diagram(FIGURE_EIGHT).faces()) == 6


@pytest.mark.parametrize("pd, fragment", [
    ([(1, 2, 3)], "exactly 4 labels"),
    ([(1, 2, 3, 4, 5)], "exactly 4 labels"),
    ([(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 7)], "exactly twice"),
    ([(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 5)], "exactly twice"),
    ([(1, 5, 2.5, 4)], "integers"),
    ([(1, "a", 2, 4)], "integers"),
    ([5], "sequence of 4"),
    ([(1, 2, 3, 4), (3, 4, 1, 2)], "not planar"),
    ([(1, 5, 2, 4), (3, 1, 4, 6), (3, 6, 5, 2)], "orientation"),
    ([(1, 5, 2, 4), (3, 1, 4, 6), (2, 3, 6, 5)], "crossing"),
])
def test_invalid_pd_codes(pd, fragment):
    """Malformed PD codes raise DiagramError (a ValueError) naming what is wrong."""
    with pytest.raises(DiagramError) as info:
        Diagram(pd)
    assert fragment in str(info.value)
    assert isinstance(info.value, ValueError)


def test_bad_crossing_index():
    """Operations on a crossing that does not exist raise DiagramError."""
    with pytest.raises(DiagramError):
        Diagram(RIGHT_TREFOIL).crossing_change(3)
    with pytest.raises(DiagramError):
        Diagram(RIGHT_TREFOIL).smoothing(-1)

"""The fast analysis of a PD code against the step-by-step one it stands in for.

A diagram is analysed (labels, orientation, components, planarity) by a fast
pass; when that pass finds a fault, the step-by-step pass runs and names it.
Both must agree on every valid code and raise the same error on every faulty
one.  Relabelling by a one-to-one map and cutting along a decomposing circle
reuse what is known instead of analysing afresh; they must give what a fresh
analysis gives.
"""

import random

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from knotsift.decomposition import decomposing_edges, split_along
from knotsift.diagram import Diagram
from knotsift.errors import DiagramError
from knotsift.reidemeister import scramble

from .strategies import knot_diagrams, link_diagrams

RIGHT_TREFOIL = [(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)]
FIGURE_EIGHT = [(4, 2, 5, 1), (8, 6, 1, 5), (6, 3, 7, 4), (2, 7, 3, 8)]
#: A two-component link whose second component only passes over (its direction is assumed).
OVER_ONLY = [(1, 3, 2, 4), (2, 3, 1, 4)]


def _state(d: Diagram) -> tuple:
    return tuple(getattr(d, k) for k in Diagram.__slots__)


def _strict(crossings, free_loops: int = 0) -> Diagram:
    """A diagram analysed by the step-by-step pass only."""
    d = object.__new__(Diagram)
    d._crossings = tuple(tuple(x) for x in crossings)
    d._free_loops = free_loops
    d._analyse_strict()
    return d


def _error(make) -> str | None:
    try:
        make()
    except DiagramError as exc:
        return str(exc)
    return None


@settings(max_examples=60, deadline=None)
@given(knot_diagrams())
def test_fast_analysis_equals_strict_on_knots(d):
    assert _state(d) == _state(_strict(d.crossings, d.free_loops))


@settings(max_examples=40, deadline=None)
@given(link_diagrams())
def test_fast_analysis_equals_strict_on_links(d):
    assert _state(d) == _state(_strict(d.crossings, d.free_loops))


def test_over_only_component_orientation_is_the_same():
    d = Diagram(OVER_ONLY)
    assert d.assumed_orientation()
    assert _state(d) == _state(_strict(OVER_ONLY))


@settings(max_examples=80, deadline=None)
@given(knot_diagrams(), st.integers(0, 10**6), st.sampled_from(["swap", "rotate", "label"]))
def test_faulty_codes_raise_the_strict_error(d, seed, how):
    """Corrupted codes: the fast pass raises exactly what the step-by-step pass raises."""
    rng = random.Random(seed)
    xs = [list(x) for x in d.crossings]
    if not xs:
        return
    i = rng.randrange(len(xs))
    if how == "swap":  # entries out of counter-clockwise order: non-planar or misoriented
        a, b = rng.sample(range(4), 2)
        xs[i][a], xs[i][b] = xs[i][b], xs[i][a]
    elif how == "rotate":
        k = rng.randrange(1, 4)
        xs[i] = xs[i][k:] + xs[i][:k]
    else:  # a label used three times or once
        labels = sorted({e for x in xs for e in x})
        xs[i][rng.randrange(4)] = rng.choice(labels + [max(labels) + 1])
    expected = _error(lambda: _strict(xs))
    assert _error(lambda: Diagram(xs)) == expected


def test_faulty_code_messages_name_the_fault():
    """Three known faults, each with the step-by-step wording."""
    with pytest.raises(DiagramError, match="edge label 6 must appear exactly twice, found once"):
        Diagram([(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 7, 2)])
    with pytest.raises(DiagramError, match="orientation is inconsistent at edge 7: its two ends "
                                           "at crossings 3 and 2"):
        Diagram([(4, 2, 5, 1), (8, 6, 1, 5), (6, 3, 7, 4), (2, 3, 7, 8)])
    with pytest.raises(DiagramError, match=r"not planar: the part with crossings \[0, 1, 2\] "
                                           "has 3 faces"):
        Diagram([(1, 4, 2, 5), (3, 1, 4, 6), (5, 3, 6, 2)])


@settings(max_examples=60, deadline=None)
@given(st.one_of(knot_diagrams(), link_diagrams()), st.integers(0, 10**6))
def test_relabel_equals_fresh_analysis(d, seed):
    rng = random.Random(seed)
    labels = sorted({e for x in d.crossings for e in x})
    new = rng.sample(range(-3 * len(labels) - 5, 3 * len(labels) + 5), len(labels))
    r = d.relabel(dict(zip(labels, new)))
    assert _state(r) == _state(Diagram(r.crossings, r.free_loops))
    s = d.standard_labels()
    assert _state(s) == _state(Diagram(s.crossings, s.free_loops))


def test_relabel_not_one_to_one_is_checked():
    """Merging two labels is analysed afresh, so the fault is reported."""
    with pytest.raises(DiagramError, match="must appear exactly twice"):
        Diagram(RIGHT_TREFOIL).relabel({1: 2})


def test_relabel_over_only_component():
    d = Diagram(OVER_ONLY)
    r = d.relabel({1: 9, 2: 8, 3: 7, 4: 6})
    assert _state(r) == _state(Diagram(r.crossings))


@pytest.mark.parametrize("seed", range(6))
def test_split_parts_equal_fresh_analysis(seed):
    rng = random.Random(seed)
    a, b = Diagram(RIGHT_TREFOIL), Diagram(FIGURE_EIGHT)
    d = scramble(a.connected_sum(b).connected_sum(a.mirror()), 8, rng)
    cut = decomposing_edges(d)
    if cut is None:
        pytest.skip("no displayed split after scrambling")
    for part in split_along(d, *cut):
        assert _state(part) == _state(Diagram(part.crossings, part.free_loops))

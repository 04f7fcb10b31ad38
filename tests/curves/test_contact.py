"""Tests of self-contact: true meetings are errors, near approaches warnings decided exactly."""

from __future__ import annotations

import numpy as np
import pytest
from knotsift.curves.contact import check_no_contact
from knotsift.curves.frame import Chain, prepare_chains
from knotsift.curves.kmt import kmt_reduce
from knotsift.curves.projection import project
from knotsift.errors import CurveError
from knotsift.invariants.fingerprint import fingerprint

from tests.curves.curves import random_polygon, right_torus_knot


def units(x):
    return prepare_chains([Chain("A", x, True)]).chains[0].coords


def pinched_trefoil(gap: float) -> np.ndarray:
    """A trefoil whose strands at one crossing of the view along z are ``gap`` apart in z.

    Only the heights of the two vertices of one segment change, and its two
    neighbouring segments cross nothing along z, so the view along z still
    shows the same crossings with the same over/under: the curve stays a
    right-handed trefoil (common practice: a diagram fixes the knot type).
    """
    x = units(right_torus_knot(2, 3, 150))
    n = len(x)
    p, q = x, np.roll(x, -1, axis=0)
    i, j = np.triu_indices(n, 2)
    keep = (j + 1) % n != i
    i, j = i[keep], j[keep]
    r, w, d = (q - p)[i, :2], (q - p)[j, :2], (p[j] - p[i])[:, :2]
    den = r[:, 0] * w[:, 1] - r[:, 1] * w[:, 0]
    t = (d[:, 0] * w[:, 1] - d[:, 1] * w[:, 0]) / den
    s = (d[:, 0] * r[:, 1] - d[:, 1] * r[:, 0]) / den
    hit = (t > 0) & (t < 1) & (s > 0) & (s < 1)
    found = list(zip(i[hit].tolist(), j[hit].tolist(), t[hit].tolist(), s[hit].tolist(),
                     strict=True))
    crossers = {k for i, j, _, _ in found for k in (i, j)}
    for i, j, t, s in found:  # noqa: B007 - the crossing found is used below
        if not {(i - 1) % n, (i + 1) % n} & crossers:
            break
    else:  # pragma: no cover - the curve is fixed
        raise AssertionError("no crossing with quiet neighbours")
    zi = p[i, 2] + t * (q[i, 2] - p[i, 2])
    zj = p[j, 2] + s * (q[j, 2] - p[j, 2])
    shift = zj + np.sign(zi - zj) * gap - zi  # keep segment i on the same side of j
    y = x.copy()
    y[i, 2] += shift
    y[(i + 1) % n, 2] += shift
    return y


def test_meeting_segments_are_an_error():
    """Two segments through one common point: the chain passes through itself."""
    x = np.array([[0.0, 0, 0], [2, 0, 0], [2, 2, 0], [1, 2, 0], [1, -1, 0], [0, -1, 1]])
    with pytest.raises(CurveError, match="passes through itself"):
        check_no_contact([(x, True)], ["A"])


def test_near_approach_is_a_warning():
    """Segments 1e-6 apart are resolved by the coordinates: a warning with the distance."""
    x = np.array([[0.0, 0, 0], [2, 0, 0], [2, 2, 0], [1, 2, 0], [1, -1, 1e-6], [0, -1, 1]])
    warnings = check_no_contact([(x, True)], ["A"])
    assert len(warnings) == 1
    assert "near approach" in warnings[0] and "6.7e-07" in warnings[0]
    assert "beads 0-1" in warnings[0] and "beads 3-4" in warnings[0]


@pytest.mark.parametrize("gap", [1e-3, 1e-10, 1e-14])
def test_pinched_crossing_is_decided_exactly(gap):
    """However close the strands come, every view direction gives the trefoil's fingerprint.

    At 1e-14 the heights differ by less than the float filter's bound, so the
    exact rational fallback decides the crossings.
    """
    reference = fingerprint(project([(units(right_torus_knot(2, 3, 150)), True)],
                                    np.random.default_rng(0)).diagram).key()
    y = pinched_trefoil(gap)
    for seed in range(4):
        proj = project([(y, True)], np.random.default_rng(seed))
        assert proj.redraws == 0
        assert fingerprint(proj.diagram).key() == reference


def test_pinched_trefoil_is_identified_with_a_warning(table):
    """A near approach of 1e-8 bond lengths: identified, with the distance in a warning."""
    from knotsift.curves.pipeline import identify_curve

    result = identify_curve(pinched_trefoil(1e-8), table=table)
    assert result.status == "identified" and result.name == "3_1"
    assert any("near approach" in w for w in result.warnings)


def test_random_polygons_have_no_false_contacts():
    """Seeded equilateral random polygons never pass through themselves (a measure-zero event).

    Random polygons are the standard ensemble of ring polymers and meet
    themselves with probability 0 (common practice); every frame must be
    checked and projected without an error.
    """
    rng = np.random.default_rng(2026)
    errors = []
    for n in (300, 600):
        for k in range(2):
            x = units(random_polygon(n, rng))
            try:
                check_no_contact([(x, True)], ["A"])
                project(kmt_reduce([(x, True)]).chains, np.random.default_rng(1), max_redraws=3)
            except CurveError as exc:
                errors.append(f"N={n} #{k}: {exc}")
    assert errors == []


def test_ring_through_itself_is_an_error_in_the_pipeline(table):
    """A trefoil pushed until two strands meet exactly: identify_curve refuses it."""
    from knotsift.curves.pipeline import identify_curve

    x = units(right_torus_knot(2, 3, 150))
    y = x.copy()
    # put a vertex of one strand exactly on a non-adjacent segment of another
    far = int(np.argmax(np.linalg.norm(x - x[0], axis=1)))
    y[0] = (x[far] + x[far + 1]) / 2
    with pytest.raises(CurveError, match="passes through itself"):
        identify_curve(y, table=table)

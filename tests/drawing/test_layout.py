"""The planar layout: every drawing reads back as the diagram it was drawn from."""

from __future__ import annotations

import json
import random

import numpy as np
import pytest

from knotsift import Diagram
from knotsift.drawing.layout import layout_diagram, segment_crossings
from knotsift.drawing.render import svg_text
from knotsift.invariants.fingerprint import fingerprint
from knotsift.reidemeister import scramble
from knotsift.table import open_table

from .readback import diagram_from_drawing, panels_of, signed_gauss


def _read_back(diagram: Diagram, seed: int = 0) -> Diagram:
    (panel,) = panels_of(svg_text([("", layout_diagram(diagram, seed=seed))]))
    return diagram_from_drawing(panel)


def _table_forms():
    return [f for f in open_table().all_forms() if f.pd_code != "[]"]


def test_layout_table_forms_read_back_as_the_same_diagram():
    """Every knot of the shipped table, both chiralities: the drawn picture is the same diagram.

    The read-back sees only the SVG geometry; equal signed Gauss codes mean the
    same diagram on the sphere, crossing signs (so the chirality) included.
    """
    forms = _table_forms()
    assert len(forms) > 500
    for form in forms:
        d = Diagram.from_pd(json.loads(form.pd_code))
        back = _read_back(d)
        assert back.number_of_crossings() == d.number_of_crossings(), form.label
        assert signed_gauss(back) == signed_gauss(d), form.label


@pytest.mark.parametrize("label", ["3_1", "3_1*", "4_1", "5_2*", "7_4", "8_17", "8_19*",
                                   "9_42", "10_132*", "3_1#3_1*"])
def test_layout_read_back_matches_table_fingerprint(label):
    """The invariants of the read-back picture equal the table's stored fingerprint.

    The shipped table's fingerprints are checked at build time against published
    tables (Rolfsen 1976, Appendix C; see reference/).
    """
    form = open_table().form(label)
    back = _read_back(Diagram.from_pd(json.loads(form.pd_code)))
    assert fingerprint(back).key() == form.fingerprint


def _links():
    from knotsift.notations.braid import parse_braid

    trefoil = Diagram([(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)])
    return {
        "Hopf": Diagram([(1, 3, 2, 4), (3, 1, 4, 2)]),
        "(2,4) torus link": parse_braid("s1^4"),
        "Borromean rings": parse_braid("s1 s2^-1 s1 s2^-1 s1 s2^-1"),
        "Whitehead link": parse_braid("s1^2 s2^-1 s1 s2^-1"),
        "three-component chain": parse_braid("s1^2 s2^2"),
        "split trefoil and Hopf": trefoil.disjoint_union(Diagram([(1, 3, 2, 4), (3, 1, 4, 2)])),
        "trefoil and a free circle": Diagram(trefoil.crossings, free_loops=1),
    }


@pytest.mark.parametrize("name", list(_links()))
def test_layout_links_read_back_with_the_same_invariants(name):
    """Links (braid closures as in Birman 1974, "Braids, links and mapping class groups";
    split and free-loop cases): same components, fingerprint and linking numbers."""
    d = _links()[name]
    back = _read_back(d)
    assert back.number_of_components() == d.number_of_components()
    assert fingerprint(back).key() == fingerprint(d).key()
    n = len(d.components())
    mine = sorted(abs(d.linking_number(a, b)) for a in range(n) for b in range(a + 1, n))
    theirs = sorted(abs(back.linking_number(a, b)) for a in range(n) for b in range(a + 1, n))
    assert mine == theirs


def test_layout_scrambled_diagrams_stay_planar():
    """Scrambled diagrams of 30-60 crossings (random Reidemeister moves, seeded) draw planar
    and read back as the same diagram."""
    rng = random.Random(14)
    table = open_table()
    done = 0
    for label in ("3_1", "4_1", "5_2", "6_3", "7_7", "8_20", "9_35", "10_161"):
        d = Diagram.from_pd(json.loads(table.form(label).pd_code))
        big = d
        while big.number_of_crossings() < 30:
            big = scramble(big, 6, rng)
        if big.number_of_crossings() > 60:
            continue
        drawn = layout_diagram(big, seed=done)
        # the layout's own geometry in full precision: deep nests of kinks and bigons are
        # drawn exponentially small by a barycentric layout, below an SVG's rounding
        back = diagram_from_drawing(list(zip(drawn.pieces, drawn.closed)))
        assert signed_gauss(back) == signed_gauss(big), label
        done += 1
    assert done >= 5


def test_layout_is_deterministic_for_a_seed():
    """The same diagram and seed give the same SVG text."""
    d = Diagram.from_pd(json.loads(open_table().form("8_17").pd_code))
    first = svg_text([("", layout_diagram(d, seed=3))])
    assert svg_text([("", layout_diagram(d, seed=3))]) == first


def test_layout_shifted_labels_same_picture():
    """Renaming the edge labels does not change the drawing (labels are not geometry)."""
    d = Diagram([(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)])
    shifted = d.relabel({k: k + 100 for k in range(1, 7)})
    a, b = layout_diagram(d), layout_diagram(shifted)
    assert np.allclose(a.crossings, b.crossings)


def test_segment_crossings_against_brute_force():
    """The grid search finds exactly the pairs an all-pairs test finds (numpy, seeded)."""
    rng = np.random.default_rng(5)
    start = rng.random((300, 2))
    segs = np.stack([start, start + rng.normal(scale=0.05, size=(300, 2))], axis=1)
    found = set(segment_crossings(segs))

    def cross(a, b, c):
        return (b[0] - a[0]) * (c[1] - a[1]) - (b[1] - a[1]) * (c[0] - a[0])

    brute = set()
    for i in range(len(segs)):
        for j in range(i + 1, len(segs)):
            (p, q), (r, s) = segs[i], segs[j]
            if cross(p, q, r) * cross(p, q, s) < 0 and cross(r, s, p) * cross(r, s, q) < 0:
                brute.add((i, j))
    assert brute and found == brute


def test_layout_rejects_a_bad_seed():
    """A seed that is not an integer is a clear error."""
    from knotsift.errors import DiagramError

    with pytest.raises(DiagramError, match="seed"):
        layout_diagram(Diagram([(1, 3, 2, 4), (3, 1, 4, 2)]), seed="x")

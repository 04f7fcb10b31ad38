"""Frames of several rings identified as one link: catenanes, Whitehead link, Borromean rings."""

from __future__ import annotations

import numpy as np
import pytest

from knotsift.curves.frame import Chain, Frame
from knotsift.curves.pipeline import identify_frame

from .curves import (
    borromean_ellipses,
    braid_closure_curves,
    gauss_linking_integral,
    hopf_link,
    random_rotation,
    torus_link,
)

# The n-noded catenane is the torus link T(2, n) (common practice in DNA topology).
CATENANE_NAMES = {2: "2^2_1", 4: "4^2_1", 6: "6^2_1", 8: "8^2_1", 10: "T(2,10)"}


def _moved_rings(rings, rng, noise=0.02):
    """The rings rotated and translated by one rigid motion, then each given Gaussian noise of
    ``noise`` bond lengths."""
    rot, shift = random_rotation(rng), rng.normal(scale=10.0, size=3)
    out = []
    for x in rings:
        bond = np.median(np.linalg.norm(np.roll(x, -1, axis=0) - x, axis=1))
        y = x + rng.normal(scale=noise * bond, size=x.shape)
        out.append(y @ rot.T + shift)
    return out


def _frame(rings) -> Frame:
    return Frame("assay.xyz", 0, [Chain(chr(65 + k), x, True) for k, x in enumerate(rings)])


def _lk(result) -> dict:
    return {(d["a"], d["b"]): d["linking_number"] for d in result.linking}


@pytest.mark.parametrize("nodes", [2, 4, 6, 8, 10])
@pytest.mark.parametrize("beads", [160, 400])
def test_catenanes_named_with_gauss_integral(table, nodes, beads):
    """T(2, n) torus-link curves, moved and noisy: named, and the linking number agrees with
    the Gauss linking integral within 0.01 before rounding."""
    rng = np.random.default_rng(nodes * 1000 + beads)
    a, b = _moved_rings(torus_link(nodes // 2, beads), rng)
    gauss = gauss_linking_integral(a, b)
    r = identify_frame(_frame([a, b]), table=table)
    lk = _lk(r)[("A", "B")]
    assert abs(gauss - lk) < 0.01
    assert abs(lk) == nodes // 2
    assert r.link["status"] == "identified"
    assert r.link["candidates"][0]["name"] == CATENANE_NAMES[nodes]
    assert r.link["invariants"]["linking"] == str(lk)


@pytest.mark.parametrize("nodes", [4, 6])
def test_catenane_orientation_classes_differ(table, nodes):
    """Parallel and antiparallel T(2, n) match different orientation classes of one name."""
    rng = np.random.default_rng(nodes)
    a, b = _moved_rings(torus_link(nodes // 2, 240), rng)
    par = identify_frame(_frame([a, b]), table=table).link
    anti = identify_frame(_frame([a, b[::-1]]), table=table).link
    assert par["candidates"][0]["name"] == anti["candidates"][0]["name"]
    assert par["type"] != anti["type"]
    assert par["invariants"]["jones"] != anti["invariants"]["jones"]


@pytest.mark.parametrize("beads", [150, 400])
def test_whitehead_link_in_3d(table, beads):
    """The closed braid sigma_1^2 sigma_2^-1 sigma_1 sigma_2^-1 drawn on a cylinder is the
    Whitehead link: linking number 0 (Gauss integral too) but not split, and the notes say so."""
    rng = np.random.default_rng(beads)
    rings = _moved_rings(braid_closure_curves([1, 1, -2, 1, -2], 3, beads), rng)
    r = identify_frame(_frame(rings), table=table)
    assert abs(gauss_linking_integral(*rings)) < 0.01
    assert _lk(r)[("A", "B")] == 0
    assert r.link["candidates"][0]["name"] == "5^2_1"
    assert any("not split" in n for n in r.link["notes"])
    assert not any("unlinked" in n and "does not" not in n for n in r.link["notes"])


@pytest.mark.parametrize("beads", [120, 300])
def test_borromean_rings_in_3d(table, beads):
    """Three perpendicular ellipses: the Borromean rings, every pair unlinked, |mu(123)| = 1
    (Milnor 1954), and each pair alone the 2-component unlink."""
    rng = np.random.default_rng(beads + 1)
    rings = _moved_rings(borromean_ellipses(beads), rng)
    r = identify_frame(_frame(rings), table=table)
    for i, j in ((0, 1), (0, 2), (1, 2)):
        assert abs(gauss_linking_integral(rings[i], rings[j])) < 0.01
    assert set(_lk(r).values()) == {0}
    assert r.link["candidates"][0]["name"] == "6^3_2"
    assert abs(r.link["triple_linking_number"]) == 1
    assert {s["type"].split(" ")[0] for s in r.link["sublinks"]} <= {"0^2_1"}
    assert r.link["split_parts"] == [["A", "B", "C"]]
    assert "Borromean rings" in r.to_text()


def test_split_parts_reported(table):
    """A Hopf link and a ring far away: two separate parts, the whole a split union."""
    a, b = hopf_link(100)
    far = a + np.array([40.0, 0, 0])
    r = identify_frame(_frame([a, b, far]), table=table)
    assert sorted(map(sorted, r.link["split_parts"])) == [["A", "B"], ["C"]]
    assert r.link["candidates"][0]["name"] == "2^2_1+0_1"
    types = {tuple(s["rings"]): s["type"] for s in r.link["sublinks"]}
    assert types[("A", "C")].startswith("0^2_1")
    assert types[("A", "B")].startswith("2^2_1")

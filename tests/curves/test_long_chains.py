"""Long chains: composites tied along one chain, one pass per ring, keys invariant under motion.

Known types (see tests/curves/curves.py): the standard torus-knot form and the
figure-eight curve; a connected sum built in 3D is the sum of its parts
(common practice).
"""

import numpy as np
import pytest

from bench.random_polygons import random_polygon
from knotsift.curves import identify_curve
from tests.curves.curves import (connected_sum, figure_eight, moved, right_torus_knot,
                                 torus_knot, with_tails)

# right-handed T(2,3) is 3_1, left-handed is 3_1*, T(2,5) right is 5_1 and T(3,4) right is
# 8_19 in the table's convention (negative signature = reference; CONVENTIONS.md)
PARTS = {
    "3_1": lambda: right_torus_knot(2, 3, 90),
    "3_1*": lambda: torus_knot(2, 3, 90),
    "5_1": lambda: right_torus_knot(2, 5, 120),
    "4_1": lambda: figure_eight(120),
    "8_19": lambda: right_torus_knot(3, 4, 160),
}


def _tied(labels):
    x = PARTS[labels[0]]()
    for lab in labels[1:]:
        x = connected_sum(x, PARTS[lab]())
    return x


def _factors(result):
    return sorted(f["label"] if f["chirality"] in ("same", "mirror") else f["name"]
                  for f in result.factors)


@pytest.mark.parametrize("labels", [["3_1", "4_1", "5_1"], ["3_1", "3_1*", "8_19"],
                                    ["4_1", "3_1", "5_1", "3_1*"]])
def test_ring_of_tied_knots(labels, table):
    """A ring with 3-4 torus knots and figure-eights tied along it, moved and noised, is the
    connected sum of exactly those knots with their chiralities."""
    rng = np.random.default_rng(len(labels))
    r = identify_curve(moved(_tied(labels), rng, noise=0.005), table=table)
    assert r.status == "identified", r.to_text()
    assert _factors(r) == sorted(labels)
    assert r.decomposition in ("diagram", "invariants") and r.primality == "composite"


def test_open_chain_with_tails_of_tied_knots(table):
    """The same sum on an open chain whose ends run far out: the stochastic closure's
    dominant type is the sum."""
    rng = np.random.default_rng(5)
    chain, _ = with_tails(moved(_tied(["3_1", "4_1", "5_1"]), rng, noise=0.005), 80, rng)
    r = identify_curve(chain, closed=False, n_closures=15, table=table)
    assert r.status == "identified", r.to_text()
    assert _factors(r) == ["3_1", "4_1", "5_1"]


def test_random_polygon_key_invariant_under_motion(table):
    """A random equilateral polygon (bench/random_polygons.py, seeded), rotated and
    translated, gets the same label or type key from every view."""
    rng = np.random.default_rng(2)
    x = random_polygon(400, rng)
    seen = set()
    for k in range(3):
        y = moved(x, np.random.default_rng(k), noise=0.0, scale=1.0 + k)
        r = identify_curve(y, seed=k, table=table)
        assert r.status != "error"
        seen.add(r.name or r.type_key)
    assert len(seen) == 1 and None not in seen


def test_ring_path_is_one_pass(table, monkeypatch):
    """The ring path simplifies the projected diagram once and computes its invariants once
    (before, identify_diagram simplified and fingerprinted it a second time)."""
    import knotsift.budget as budget
    import knotsift.curves.knot_type as knot_type
    import knotsift.simplify as simplify_module

    calls = {"simplify": 0, "invariants": 0}
    real_simplify, real_staged = simplify_module.simplify, budget.staged_invariants

    def counting_simplify(d):
        calls["simplify"] += 1
        return real_simplify(d)

    def counting_staged(*a, **k):
        calls["invariants"] += 1
        return real_staged(*a, **k)

    monkeypatch.setattr(simplify_module, "simplify", counting_simplify)
    monkeypatch.setattr(knot_type, "simplify", counting_simplify)
    monkeypatch.setattr(budget, "staged_invariants", counting_staged)
    r = identify_curve(moved(right_torus_knot(2, 5, 150), np.random.default_rng(0)),
                       table=table)
    assert r.name == "5_1"
    assert calls == {"simplify": 1, "invariants": 1}

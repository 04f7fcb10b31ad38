"""The cost budget: cheap invariants first, Jones skipped above its estimate, the wall time."""

import random

import pytest
import sympy

from knotsift import identify
from knotsift.budget import (Budget, JonesOverBudget, TooComplex, item_budget, jones_cost,
                             staged_invariants)
from knotsift.diagram import Diagram
from knotsift.errors import KnotsiftError
from knotsift.invariants.bracket import kauffman_bracket
from knotsift.laurent import Laurent
from knotsift.reidemeister import scramble
from knotsift.table import open_table
from tests.strategies import random_knot_braid, braid_closure, torus_knot

TABLE = open_table()


def _torus_jones(p: int, q: int) -> Laurent:
    """V(T(p,q)) = t^((p-1)(q-1)/2) (1 - t^(p+1) - t^(q+1) + t^(p+q)) / (1 - t^2) for the
    positive torus knot (Jones 1987, Annals of Mathematics 126, Theorem on torus knots),
    divided out with sympy."""
    t = sympy.Symbol("t")
    quo, rem = sympy.div(1 - t ** (p + 1) - t ** (q + 1) + t ** (p + q), 1 - t ** 2, t)
    assert rem == 0
    poly = sympy.Poly(sympy.expand(quo * t ** ((p - 1) * (q - 1) // 2)), t)
    return Laurent({int(m[0]): int(c) for m, c in zip(poly.monoms(), poly.coeffs())})


@pytest.mark.parametrize("p,q", [(2, 11), (2, 13), (3, 7), (4, 5)])
def test_torus_knots_beyond_the_table(p, q):
    """T(2,11), T(2,13), T(3,7), T(4,5): Jones equals the closed formula (Jones 1987), the
    crossing number min(p(q-1), q(p-1)) (Murasugi 1991, Trans. AMS 326) lies inside
    crossing_bounds, and no table knot or sum of table knots is named."""
    r = identify(torus_knot(p, q), table=TABLE)
    assert Laurent.parse(r.invariants["jones"]) == _torus_jones(p, q)
    c = min(p * (q - 1), q * (p - 1))
    lo, hi = r.crossing_bounds
    assert lo <= c <= hi
    assert lo >= 11  # the table is complete through 10 crossings (shipped metadata)
    assert r.status == "not in table" and r.candidates == [] and r.name is None
    assert r.type_key is not None and r.primality == "unknown"
    assert sum(n.startswith("crossing number") for n in r.notes) == 1  # one merged bound


def test_torus_mirror_gets_another_type_key():
    """A chiral knot with signature not 0 and its mirror image get different type keys."""
    d = torus_knot(3, 7)
    assert identify(d, table=TABLE).type_key != identify(d.mirror(), table=TABLE).type_key


def test_jones_skipped_above_budget_with_note():
    """A Jones polynomial estimated above the budget is skipped, the result says so and
    still carries the Alexander polynomial, determinant, signature and type key."""
    d = torus_knot(4, 5)
    with item_budget(Budget(jones_memory=1000, jones="always")):
        r = identify(d, table=TABLE)
    assert r.invariants["jones"] == ""
    assert r.cost["jones"] == "over budget"
    assert any("skipped for cost" in n for n in r.notes)
    t = sympy.Symbol("t")  # torus-knot Alexander polynomial (common practice), via sympy
    delta = sympy.cancel((t ** 20 - 1) * (t - 1) / ((t ** 4 - 1) * (t ** 5 - 1)))
    assert r.invariants["alexander"] and r.invariants["determinant"] == str(
        abs(delta.subs(t, -1)))
    assert r.type_key == identify(d, table=TABLE).type_key  # key independent of Jones


def test_jones_skipped_still_names_by_other_invariants():
    """With Jones skipped, a table knot is named by the other invariants (agrees lists only
    those).  7_4 and 9_2 share Alexander, determinant, signature and homology; rho_1
    (-24t^-2 + ... against -30t^-2 + ..., stored in the table) tells them apart without
    Jones, as Jones does with it."""
    d = Diagram(TABLE.form("7_4").pd())
    with item_budget(Budget(jones="never")):
        r = identify(d, table=TABLE)
    assert r.status == "identified" and r.name == "7_4"
    assert r.candidates[0].agrees == ["alexander", "determinant", "signature", "rho_1",
                                      "homology"]
    assert any("not computed" in n for n in r.notes)
    assert identify(d, table=TABLE).name == "7_4"
    shared = {"alexander": "4t^-1 - 7 + 4t", "determinant": "15", "signature": "-2"}
    assert {f.name for f in TABLE.by_invariants(shared)} >= {"7_4", "9_2"}


def test_live_guard_stops_contraction():
    """The contraction itself stops once its states pass the memory budget."""
    with item_budget(Budget(jones_memory=1)):
        with pytest.raises(JonesOverBudget):
            kauffman_bracket(torus_knot(3, 7))


def test_deadline_gives_too_complex_and_keeps_invariants(monkeypatch):
    """A deadline passing during Jones gives status too complex with the cheap invariants
    kept (the deadline is simulated at the start of the contraction)."""
    import knotsift.invariants.bracket as bracket

    def late(*a, **k):
        raise TooComplex("the wall-time budget of 1 s ran out during the Jones polynomial")

    monkeypatch.setattr(bracket, "kauffman_bracket", late)
    with item_budget(Budget(jones="always")):
        r = identify(torus_knot(2, 11), table=TABLE)
    assert r.status == "too complex"
    assert r.invariants["determinant"] == "11" and r.invariants["jones"] == ""
    assert r.type_key is not None
    assert "kept what was computed: alexander, determinant, signature" in r.notes[-1]


def test_real_deadline_is_clean():
    """A tiny wall-time budget ends in status too complex, not an exception."""
    d = scramble(torus_knot(3, 7), 30, random.Random(0))
    with item_budget(Budget(wall_seconds=1e-9)):
        r = identify(d, table=TABLE)
    assert r.status == "too complex" and "wall-time budget" in r.error


@pytest.mark.parametrize("seed", range(25))
def test_auto_mode_names_as_always(seed):
    """Cheap first (jones="auto") names exactly as computing Jones always does, on scrambled
    table knots and random braid closures (seeded)."""
    rng = random.Random(seed)
    if seed % 2:
        f = rng.choice(TABLE.all_forms())
        d = scramble(Diagram(f.pd()), 10, rng)
    else:
        strands = rng.randint(2, 4)
        d = braid_closure(random_knot_braid(rng, strands, rng.randint(6, 16)), strands)
    with item_budget(Budget(jones="auto", jones_always=0)):
        auto = identify(d, table=TABLE)
    with item_budget(Budget(jones="always")):
        always = identify(d, table=TABLE)
    assert (auto.status, [c.label for c in auto.candidates]) == \
        (always.status, [c.label for c in always.candidates])
    assert auto.type_key == always.type_key


def test_jones_cost_estimate_grows_with_width():
    """The estimate is exponential in the width: T(2,13) is cheap, a wide torus knot costly."""
    cheap, wide = jones_cost(torus_knot(2, 13)), jones_cost(torus_knot(5, 9))
    assert cheap.width < wide.width and cheap.memory < wide.memory
    assert wide.order and sorted(wide.order) == list(range(len(torus_knot(5, 9).crossings)))


def test_budget_rejects_bad_values():
    with pytest.raises(KnotsiftError):
        Budget(jones="sometimes")
    with pytest.raises(KnotsiftError):
        Budget(wall_seconds=-1)


def test_staged_invariants_fill_in_place():
    """Values computed before an interruption stay in the Staged object passed in."""
    from knotsift.budget import Staged

    st = Staged()
    staged_invariants(torus_knot(2, 5), TABLE, Budget(jones="never"), staged=st)
    assert st.values["determinant"] == 5 and "jones" not in st.values

"""Connected sums found from invariants: the exact multiset of factors, with chirality.

The ground truth of every check is the construction: the connected sum of
diagrams of table knots is the connected sum of those knots, and the Jones
and Alexander polynomials multiply while signatures add under connected sum
(common practice).  Polynomial products are checked with sympy, a
general-purpose library, independently of our Laurent arithmetic.
"""

import random

import pytest
import sympy
from knotsift import identify
from knotsift.diagram import Diagram
from knotsift.factorisation import (
    alexander_groupings,
    composite_label,
    exact_quotient,
    factorisations,
)
from knotsift.invariants.fingerprint import fingerprint
from knotsift.laurent import Laurent
from knotsift.reidemeister import scramble
from knotsift.table import open_table

TABLE = open_table()
T = sympy.Symbol("t")


def _sympy(p: Laurent):
    return sum(c * T ** int(e) for e, c in p.terms())


def _sum_diagram(labels, rng):
    d = Diagram(TABLE.form(labels[0]).pd())
    for lab in labels[1:]:
        d = d.connected_sum(Diagram(TABLE.form(lab).pd()))
    return scramble(d, 15, rng)


def _chirality_of(label):
    name = label.rstrip("*")
    if TABLE.knot(name)["amphichiral"]:
        return "amphichiral"
    forms = TABLE.forms_of(name)
    if forms[0].fingerprint == forms[1].fingerprint:
        return "undetermined"
    return "mirror" if label.endswith("*") else "same"


# Sums of 3 to 6 table primes whose factors no other set of table primes imitates in
# every invariant (chosen by hand; any coincidence would show up as "ambiguous").
SUMS = [
    ["3_1", "3_1*", "5_2"],
    ["3_1", "4_1", "6_2*", "7_3"],
    ["3_1*", "5_2", "6_1", "7_6", "8_2*"],
    ["3_1", "3_1", "4_1", "6_2", "6_3", "7_7"],
]


@pytest.mark.parametrize("labels", SUMS, ids=["#".join(s) for s in SUMS])
def test_scrambled_sum_gives_exact_factors(labels):
    """A scrambled connected sum of 3-6 table knots is identified as exactly that multiset,
    each factor with its chirality, and the decomposition says whether the diagram showed it."""
    r = identify(_sum_diagram(labels, random.Random("+".join(labels))), table=TABLE)
    assert r.status == "identified", r.to_text()
    got = sorted((f["name"], f["chirality"]) for f in r.factors)
    want = sorted((lab.rstrip("*"), _chirality_of(lab)) for lab in labels)
    assert got == want
    assert r.primality == "composite"
    assert r.name == r.candidates[0].label
    if r.decomposition == "invariants":  # the scrambled diagram did not display its split
        assert any("consistent evidence, not proof" in n for n in r.notes)
    else:
        assert r.decomposition == "diagram"


def test_mirror_of_sum_mirrors_each_factor():
    """The mirror image of a sum is the sum of the mirror images (common practice)."""
    labels = ["3_1", "4_1", "6_2*", "7_3"]
    d = _sum_diagram(labels, random.Random(3)).mirror()
    r = identify(d, table=TABLE)
    flip = {"same": "mirror", "mirror": "same"}
    assert sorted((f["name"], f["chirality"]) for f in r.factors) == sorted(
        (lab.rstrip("*"), flip.get(_chirality_of(lab), _chirality_of(lab))) for lab in labels)


@pytest.mark.parametrize("seed", range(6))
def test_random_sums_contain_the_truth(seed):
    """Random sums of 3-5 table primes: the true multiset is among the listed factorisations,
    and when only one is listed it is the truth."""
    rng = random.Random(seed)
    primes = [f.label for f in TABLE.all_forms()
              if TABLE.knot(f.name)["kind"] == "prime" and TABLE.knot(f.name)["crossing_number"] <= 8]
    labels = [rng.choice(primes) for _ in range(rng.randint(3, 5))]
    r = identify(_sum_diagram(labels, rng), table=TABLE)
    assert r.status in ("identified", "ambiguous")
    want = sorted((lab.rstrip("*"), _chirality_of(lab)) for lab in labels)
    listed = [sorted((f["name"], f["chirality"]) for f in c.factors) for c in r.candidates
              if c.factors]
    if r.candidates[0].factors is None:  # only possible when the sum is in the table
        assert sum(TABLE.knot(lab.rstrip("*"))["crossing_number"] for lab in labels) <= 10
        return
    assert want in listed
    if r.status == "identified":
        assert listed == [want]


def test_sum_sharing_invariants_is_ambiguous():
    """3_1#9_12: V(9_12) = V(4_1)V(5_2) with equal Alexander polynomials and signatures, so
    from these invariants alone 3_1#9_12 and 3_1#4_1#5_2 are both listed, the truth among
    them; the diagram's own split (and rho_1, which tells 9_12 from 4_1#5_2) then names it."""
    d = _sum_diagram(["3_1", "9_12"], random.Random(1))
    fp = fingerprint(d)
    search = factorisations(TABLE, fp.alexander, fp.determinant, fp.signature, fp.jones)
    found = {"#".join(sorted(f.name for f in fz.factors)) for fz in search.solutions}
    assert {"3_1#9_12", "3_1#4_1#5_2"} <= found
    r = identify(d, table=TABLE)
    assert (r.status, r.name, r.decomposition) == ("identified", "3_1#9_12", "diagram")
    grouping = next(n for n in r.notes if n.startswith("the Alexander polynomial is a product"))
    assert "Δ(4_1)·Δ(5_2) = Δ(9_12)" in grouping


def test_alexander_grouping_checked_with_sympy():
    """Every grouping listed for Delta(10_67) multiplies out to it (sympy), and the one the
    issue names, Delta(10_67) = Delta(6_1) Delta(5_2), is there."""
    a = Laurent.parse(TABLE.form("10_67").alexander)
    groups, complete = alexander_groupings(TABLE, a)
    assert complete and ["5_2", "6_1/9_46"] in groups
    for g in groups:
        prod = sympy.Integer(1)
        for k in g:
            prod *= _sympy(Laurent.parse(TABLE.form(k.split("/")[0]).alexander))
        assert sympy.expand(prod - _sympy(a)) == 0


def test_exact_quotient_against_sympy():
    """Exact division agrees with sympy's polynomial division on random products."""
    rng = random.Random(7)
    for _ in range(50):
        p = Laurent.from_coefficients(rng.randint(-3, 3), [rng.randint(-4, 4) for _ in range(5)]
                                      + [rng.choice((1, -1, 2))])
        q = Laurent.from_coefficients(rng.randint(-3, 3), [rng.randint(-3, 3) for _ in range(3)]
                                      + [rng.choice((1, -1))])
        if p.is_zero() or q.is_zero():
            continue
        assert exact_quotient(p * q, q) == p
        r = p * q + Laurent.monomial(1, 0)
        quo, rem = sympy.div(sympy.expand(_sympy(r) * T ** 20),
                             sympy.expand(_sympy(q) * T ** 10), T)
        expect_exact = rem == 0
        assert (exact_quotient(r, q) is not None) == expect_exact


def test_search_without_jones_lists_more():
    """With Jones skipped the search stands on the rest and may list more sums; the truth is
    always among them, and the Jones-free answer says which invariants took part."""
    fs = [TABLE.form(lab) for lab in ("3_1", "3_1*", "5_2")]
    a = Laurent.constant(1)
    v = Laurent.constant(1)
    for f in fs:
        a, v = a * Laurent.parse(f.alexander), v * Laurent.parse(f.jones)
    det = 3 * 3 * 7
    sig = sum(f.signature for f in fs)
    full = factorisations(TABLE, a, det, sig, v)
    rough = factorisations(TABLE, a, det, sig, None)
    assert [s.label for s in full.solutions] == ["3_1#3_1*#5_2"]
    assert "jones" not in rough.used
    assert {s.label for s in full.solutions} <= {s.label for s in rough.solutions}
    assert len(rough.solutions) > 1


def test_composite_label_orders_factors():
    """Labels list factors by crossing number, then name, the mirror after the reference."""
    r = factorisations(TABLE, *(lambda f: (Laurent.parse(f.alexander) ** 2, f.determinant ** 2,
                                           0, Laurent.parse(f.jones) *
                                           Laurent.parse(f.jones).mirror()))(TABLE.form("3_1")))
    assert composite_label(r.solutions[0].factors) == "3_1#3_1*"


def test_split_seen_in_the_diagram_is_used(monkeypatch):
    """When the diagrammatic decomposition is available, a sum whose parts it returns is
    identified part by part with decomposition "diagram" (the parts are supplied here by
    construction, standing in for knotsift.decomposition)."""
    import sys
    import types

    parts = [Diagram(TABLE.form(lab).pd()) for lab in ("3_1", "5_2*", "6_1")]
    fake = types.ModuleType("knotsift.decomposition")
    fake.connected_sum_factors = lambda d: parts
    monkeypatch.setitem(sys.modules, "knotsift.decomposition", fake)
    whole = parts[0].connected_sum(parts[1]).connected_sum(parts[2])
    r = identify(whole, table=TABLE)
    assert r.status == "identified" and r.decomposition == "diagram"
    assert sorted((f["name"], f["chirality"]) for f in r.factors) == [
        ("3_1", "same"), ("5_2", "mirror"), ("6_1", "same")]
    assert r.name == "3_1#5_2*#6_1"


def test_remembered_searches_equal_fresh_ones_and_are_copies():
    """Searches are remembered per table; the ground truth is a search on an empty memo."""
    v = Laurent.parse("t + t^3 - t^4")
    a = Laurent.parse("t^-1 - 1 + t")
    import knotsift.factorisation as fact

    fact._groupings_memos.clear()
    fact._factorisation_memos.clear()
    fresh = factorisations(TABLE, a * a * a, 27, -6, v * v * v)
    fresh_groups = alexander_groupings(TABLE, a * a)
    again = factorisations(TABLE, a * a * a, 27, -6, v * v * v)
    assert again == fresh and again is not fresh
    assert [s.label for s in again.solutions] == ["3_1#3_1#3_1"]
    again.solutions.clear()
    again.used.append("changed")
    assert factorisations(TABLE, a * a * a, 27, -6, v * v * v) == fresh
    groups, complete = alexander_groupings(TABLE, a * a)
    assert (groups, complete) == fresh_groups and ["3_1", "3_1"] in groups
    groups[0].append("changed")
    groups.append(["changed"])
    assert alexander_groupings(TABLE, a * a) == fresh_groups

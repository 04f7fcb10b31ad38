"""The link table: recalled counts, stored invariants, the name-free enumerator."""

from __future__ import annotations

import csv
from collections import Counter

import pytest

from knotsift.data_build.link_enumeration import (
    enumerate_link_classes,
    oriented_forms,
    unoriented_link_key,
)
from knotsift.data_build.sources import reference_dir
from knotsift.invariants.link_fingerprint import link_fingerprint, oriented_link_fingerprints
from knotsift.notations.conway_algebraic import parse_conway_notation
from knotsift.simplify import simplify


def _recalled_counts() -> dict[tuple[int, int], int]:
    with (reference_dir() / "link_counts.csv").open(encoding="utf-8") as fh:
        return {(int(r["components"]), int(r["crossing_number"])): int(r["prime_links"])
                for r in csv.DictReader(fh)}


def test_prime_link_counts_match_published(link_table):
    """Prime links of 2 and 3 components by crossing number, through 8 crossings: 1, 1, 1, 3,
    8, 16 and 3, 1, 10 (Rolfsen 1976, Knots and Links, Appendix C; from memory)."""
    want = _recalled_counts()
    assert want[(2, 8)] == 16 and want[(3, 8)] == 10
    got = Counter((r["components"], r["crossing_number"]) for r in link_table.links()
                  if r["kind"] == "prime")
    assert dict(got) == want
    assert link_table.metadata["link_complete_through"] == "8"


def test_stored_link_forms_recompute(link_table):
    """Every stored prime-link form's key is what its PD code gives, computed directly."""
    for row in link_table.links():
        if row["kind"] != "prime":
            continue
        for form in link_table.link_forms_of(row["name"]):
            assert link_fingerprint(form.diagram()).key() == form.fingerprint, form.label


def test_every_orientation_and_mirror_stored(link_table):
    """2 components: 4 forms (2 orientation classes x mirror); 3 components: 8."""
    for row in link_table.links():
        forms = link_table.link_forms_of(row["name"])
        assert len(forms) == 2 ** row["components"]
        assert sum(f.is_reference for f in forms) == 1


@pytest.mark.parametrize("code", ["212", "2,2,3-", ".1", "31,2,2-", "(2,2)(2,2)"])
def test_derived_forms_equal_direct(code):
    """Orientation classes and mirrors derived from one Alexander computation (t_k -> 1/t_k,
    Torres symmetry) equal a direct computation of every form."""
    d = simplify(parse_conway_notation(code))
    derived = oriented_link_fingerprints(d, simplified=True)
    for rev, mir, form in oriented_forms(d):
        assert derived[(rev, mir)].key() == link_fingerprint(form).key()


def test_enumerator_through_five_crossings(link_table):
    """The name-free enumerator through 5 crossings finds exactly the Hopf link, T(2,4), the
    Whitehead link, the 3-ring chain and the Hopf link summed with a trefoil."""
    classes = enumerate_link_classes(5)
    names = {}
    for row in link_table.links():
        form = link_table.link_forms_of(row["name"])[0]
        d = form.diagram()
        names[unoriented_link_key(simplify(d))[0]] = row["name"]
    found = sorted((c.min_crossings, names.get(k, "?")) for k, c in classes.items()
                   if c.min_crossings <= 5)
    assert found == [(2, "2^2_1"), (4, "2^2_1#2^2_1"), (4, "4^2_1"), (5, "2^2_1#3_1"),
                     (5, "5^2_1")]

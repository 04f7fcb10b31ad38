"""The shipped table after rho_1: documented coincidences separated, chirality decided."""

from __future__ import annotations

import csv
from dataclasses import replace

from knotsift.data_build.chirality import is_reference_chirality
from knotsift.data_build.sources import reference_dir
from knotsift.laurent import Laurent
from knotsift.table import open_table


def _documented_pairs():
    with open(reference_dir() / "coincidences.csv", newline="") as fh:
        return [row["names"].split() for row in csv.DictReader(fh)]


def test_documented_coincidences_share_old_invariants_but_not_rho_1():
    """Each documented pair (Jones 1987, from memory; one found by the build) still shares
    Jones, Alexander, determinant and signature, and rho_1 tells them apart."""
    table = open_table()
    pairs = _documented_pairs()
    assert len(pairs) == 5
    for a, b in pairs:
        fa = next(f for f in table.forms_of(a) if f.is_reference)
        fbs = table.forms_of(b)
        same = [f for f in fbs if (f.jones, f.alexander, f.determinant, f.signature)
                == (fa.jones, fa.alexander, fa.determinant, fa.signature)]
        assert same, (a, b)
        assert all(f.rho_1 != fa.rho_1 for f in fbs), (a, b)
        assert not table.by_fingerprint(fa.fingerprint)[1:], (a, b)


def test_every_chiral_table_knot_has_a_chirality_basis():
    """rho_1 = 0 exactly for the amphichiral entries, so no chiral knot is left 'none'."""
    table = open_table()
    for knot in table.knots():
        forms = table.forms_of(knot["name"])
        zero = all(Laurent.parse(f.rho_1).is_zero() for f in forms)
        assert zero == bool(knot["amphichiral"]), knot["name"]
        assert knot["chirality_basis"] != "none", knot["name"]


def test_rho_1_step_keeps_every_earlier_reference_choice():
    """Where the rule without rho_1 decides, the rule with rho_1 decides the same way."""
    from knotsift.diagram import Diagram
    from knotsift.invariants.fingerprint import fingerprint

    table = open_table()
    decided = 0
    for form in table.all_forms():
        if form.components != 1 or form.name == "0_1":
            continue
        fp = fingerprint(Diagram.from_pd(form.pd()), simplified=True)
        before = is_reference_chirality(replace(fp, rho_1=None))
        if before is not None:
            assert is_reference_chirality(fp) == before, form.label
            decided += 1
    assert decided > 400

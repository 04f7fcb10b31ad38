"""Identification of scrambled diagrams against the shipped reference table."""

import json
import random

import pytest

from knotsift import identify
from knotsift.diagram import Diagram
from knotsift.reidemeister import scramble
from knotsift.table import MIRROR_MARK, open_table

TABLE = open_table()
PRIMES = [k["name"] for k in TABLE.knots() if k["kind"] == "prime"]
COMPOSITES = [k["name"] for k in TABLE.knots() if k["kind"] == "composite"]


def _form(label):
    f = TABLE.form(label)
    return Diagram(f.pd())


def _expected(name, mirrored):
    knot = TABLE.knot(name)
    if knot["amphichiral"]:
        return "amphichiral"
    forms = TABLE.forms_of(name)
    if forms[0].fingerprint == forms[1].fingerprint:
        return "undetermined"
    return "mirror" if mirrored else "same"


@pytest.mark.parametrize("name", PRIMES + COMPOSITES)
def test_scrambled_entries_are_identified(name):
    """Each table knot, scrambled by 20 random Reidemeister moves and relabelled, and its
    mirror image, is identified with its name and chirality (seeded per knot)."""
    rng = random.Random(f"scramble {name}")
    ref = next(f for f in TABLE.forms_of(name) if f.is_reference)
    d = Diagram(ref.pd())
    for mirrored, diagram in ((False, d), (True, d.mirror())):
        scrambled = scramble(diagram, 20, rng)
        assert scrambled.number_of_crossings() > diagram.number_of_crossings()
        result = identify(scrambled, table=TABLE)
        forms = TABLE.forms_of(name)
        mirror_form = next((f for f in forms if not f.is_reference), ref)
        key = mirror_form.fingerprint if mirrored else ref.fingerprint
        shared = {TABLE.form(label).name for label in TABLE.coincidence("fingerprint", key)}
        if len(shared) > 1:
            # a coincidence recorded in the table: every computed invariant agrees
            assert result.status == "ambiguous"
            assert {c.name for c in result.candidates} == shared
            continue
        assert result.status == "identified", (name, mirrored, result.to_text())
        cand = result.candidates[0]
        assert cand.name == name
        assert cand.chirality == _expected(name, mirrored)


def test_figure_eight_is_amphichiral():
    """4_1 equals its mirror image (common practice; Rolfsen 1976)."""
    r = identify("DT: 4 6 8 2", table=TABLE)
    assert r.name == "4_1"
    assert r.candidates[0].chirality == "amphichiral"


def test_trefoils_told_apart_by_jones():
    """The two trefoils have V(t) = t + t^3 - t^4 and its mirror (Jones 1985)."""
    right = identify("s1^3", table=TABLE)
    left = identify("s1^-3", table=TABLE)
    assert right.name == "3_1" and left.name == "3_1" + MIRROR_MARK
    assert right.invariants["jones"] == "t + t^3 - t^4"
    assert left.invariants["jones"] == "-t^-4 + t^-3 + t^-1"


def test_granny_and_square_told_apart():
    """Granny 3_1#3_1 and square 3_1#3_1* share Alexander polynomial and determinant but not
    the Jones polynomial or the signature (common practice)."""
    t = Diagram([(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)])
    granny = identify(t.connected_sum(t), table=TABLE)
    square = identify(t.connected_sum(t.mirror()), table=TABLE)
    assert granny.name == "3_1#3_1"
    assert square.name == "3_1#3_1*"
    assert square.candidates[0].chirality == "amphichiral"
    assert granny.invariants["alexander"] == square.invariants["alexander"]
    assert granny.invariants["jones"] != square.invariants["jones"]


def test_uncertain_crossings_give_a_distribution():
    """Two uncertain crossings of a trefoil: 4 resolutions, 3 unknots and 1 trefoil (an
    unknotting-number-one fact of the trade: changing any one crossing of the standard
    trefoil diagram unknots it)."""
    r = identify("(1,5,2,4)? (3,1,4,6)? (5,3,6,2)", table=TABLE)
    got = {x["result"]: x["count"] for x in r.resolutions}
    assert got == {"0_1": 3, "3_1": 1}
    assert r.status == "ambiguous"


def test_too_many_uncertain_crossings():
    """More than 12 uncertain crossings is refused with a clear error."""
    from knotsift.errors import DiagramError

    t = Diagram([(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)])
    big = t
    for _ in range(4):
        big = big.connected_sum(t)
    from knotsift.notations.pd import write_pd

    text = write_pd(big, uncertain=range(13))
    with pytest.raises(DiagramError, match="at most 12"):
        identify(text, table=TABLE)


def test_neighbours_of_the_trefoil():
    """One crossing change of the standard trefoil diagram gives the unknot."""
    r = identify("4 6 2", table=TABLE, neighbours=True)
    assert r.neighbours == [{"result": "0_1", "crossings": [0, 1, 2]}]


def test_json_schema():
    """The JSON fields documented in the README are present with the documented types."""
    r = identify("4 8 10 2 6", table=TABLE).to_dict()
    json.dumps(r)
    assert set(r) >= {"status", "name", "candidates", "invariants", "separation", "notes",
                      "crossings", "resolutions", "neighbours", "error", "schema_version"}
    assert r["status"] in ("identified", "ambiguous", "not in table", "error")
    c = r["candidates"][0]
    assert set(c) >= {"name", "label", "chirality", "agrees", "crossing_number"}
    assert c["chirality"] in ("same", "mirror", "amphichiral", "undetermined")
    assert set(r["invariants"]) == {"components", "jones", "alexander", "determinant",
                                    "signature", "rho_1", "homology", "rho_1_hash"}
    assert r["separation"]["jones"]["count"] >= 1


def test_link_goes_to_the_link_table():
    """A 2-component link is identified against the link table, with its invariants."""
    r = identify("[[1,3,2,4],[3,1,4,2]]", table=TABLE)
    assert r.name == "2^2_1"
    assert r.invariants["jones"] == "-t^(1/2) - t^(5/2)"


def test_four_component_link_is_not_in_table():
    """A chain of four rings is reported with its invariants and a note on the table's range."""
    r = identify("braid: 1 1 2 2 3 3", table=TABLE)
    assert r.status == "not in table"
    assert any("4-component link" in n for n in r.notes)


def test_unknot_note():
    """The basis of an unknot verdict is visible: a kink simplifies to the trivial diagram
    (Reidemeister I; common practice), which proves it; a diagram that keeps crossings gets
    the unknot only as evidence from its invariants."""
    r = identify(Diagram([(1, 1, 2, 2)]), table=TABLE)
    assert r.name == "0_1" and r.candidates[0].basis == "trivial diagram"
    assert r.notes[0].startswith("proof:") and "proven" in r.to_text()
    assert r.to_dict()["candidates"][0]["basis"] == "trivial diagram"


def test_unknot_from_invariants_only_is_evidence(monkeypatch):
    """When simplification leaves crossings, V = 1 is evidence only, and the result says so."""
    import knotsift.simplify

    monkeypatch.setattr(knotsift.simplify, "simplify", lambda d: d)
    r = identify(Diagram([(1, 1, 2, 2)]), table=TABLE)
    assert r.name == "0_1" and r.candidates[0].basis == "invariants"
    assert r.notes[0].startswith("evidence only")
    assert any("not proven" in n for n in r.notes)
    assert "evidence, not proof" in r.to_text()


# -- what identification remembers ------------------------------------------------
# Identification remembers, per table, the staged invariants of a simplified
# diagram, the answers for the parts of split diagrams and the separation of
# invariant values (bounded memos).  The ground truth is the same question
# answered with every memo empty.
def _clear_memos():
    import knotsift.factorisation as fact
    import knotsift.identification as ident

    for memo in (ident._staged_memo, ident._part_memo, ident._separation_memo,
                 fact._groupings_memos, fact._factorisation_memos):
        memo.clear()


def _sum_of(labels, seed):
    d = _form(labels[0])
    for label in labels[1:]:
        d = d.connected_sum(_form(label))
    return scramble(d, 10, random.Random(seed))


@pytest.mark.parametrize("labels", [("3_1", "4_1", "4_1"), ("3_1*", "8_20"), ("5_2", "6_1*"),
                                    ("7_4", "3_1*", "3_1")])
def test_remembered_answers_equal_fresh_ones(labels):
    from knotsift.identification import identify_diagram

    d = _sum_of(labels, " ".join(labels))
    _clear_memos()
    fresh = identify_diagram(d, TABLE).to_dict()
    again = identify_diagram(d, TABLE).to_dict()  # every memo answers now
    mirrored = identify_diagram(d.mirror(), TABLE).to_dict()
    _clear_memos()
    assert again == fresh
    assert identify_diagram(d.mirror(), TABLE).to_dict() == mirrored
    assert fresh["decomposition"] == "diagram" and fresh["status"] == "identified"
    expected = sorted(TABLE.form(label).name for label in labels)
    assert sorted(f["name"] for f in fresh["factors"]) == expected


def test_part_answers_are_what_identify_says_of_the_part():
    from knotsift.decomposition import connected_sum_factors
    from knotsift.identification import _part_factors, identify_diagram

    d = _sum_of(("3_1", "4_1", "5_2*"), 3)
    parts = connected_sum_factors(d)
    assert len(parts) == 3
    _clear_memos()
    for part in parts:
        r = identify_diagram(part, TABLE)
        c = r.candidates[0]
        assert r.status == "identified" and c.kind == "prime"
        want = [{"name": c.name, "label": c.label, "chirality": c.chirality}]
        assert _part_factors(part, TABLE) == want
        got = _part_factors(part, TABLE)  # from the memo, a copy
        got[0]["name"] = "changed"
        assert _part_factors(part, TABLE) == want


def test_parts_are_not_simplified_again_because_simplify_is_idempotent():
    """Parts of a split are taken as they come from connected_sum_factors (simplified);
    that is only the same as simplifying them again when simplify is idempotent."""
    from knotsift.decomposition import connected_sum_factors
    from knotsift.simplify import simplify

    rng = random.Random(11)
    checked = 0
    for label in [f.label for f in TABLE.all_forms()][::9]:
        d = scramble(_form(label).connected_sum(_form("3_1")), 15, rng)
        s = simplify(d)
        assert simplify(s) == s
        for part in connected_sum_factors(s):
            assert simplify(part) == part
            checked += 1
    assert checked > 60


def test_memos_stay_within_their_size(monkeypatch):
    import knotsift.identification as ident
    from knotsift.identification import identify_diagram

    monkeypatch.setattr(ident, "STAGED_MEMO_SIZE", 3)
    monkeypatch.setattr(ident, "PART_MEMO_SIZE", 2)
    monkeypatch.setattr(ident, "SEPARATION_MEMO_SIZE", 2)
    _clear_memos()
    rng = random.Random(5)
    for label in ("3_1", "4_1", "5_1", "5_2", "6_1", "6_2"):  # sums beyond the table
        d = scramble(_form(label).connected_sum(_form("8_20")), 6, rng)
        assert identify_diagram(d, TABLE).status == "identified"
    assert len(ident._staged_memo[TABLE]) <= 3
    assert len(ident._part_memo[TABLE]) <= 2
    assert len(ident._separation_memo[TABLE]) <= 2
    _clear_memos()


def test_separation_handed_out_is_a_copy():
    from knotsift.identification import identify_diagram

    d = _form("4_1")
    first = identify_diagram(d, TABLE)
    first.separation["determinant"]["labels"].append("changed")
    first.separation["jones"]["others_separated_by"].clear()
    assert identify_diagram(d, TABLE).to_dict()["separation"] != first.separation
    _clear_memos()
    assert identify_diagram(d, TABLE).separation == identify_diagram(d, TABLE).separation


def test_separation_note_when_many_forms_share_a_value(monkeypatch):
    # More than 25 other forms share the Alexander polynomial, and one of the first 25 is
    # the candidate's own mirror form: the note must still say what separates the others
    # (this raised KeyError when the note looked only at the first 25 forms' rows).
    from knotsift import identification as ident
    from knotsift.identification import identify_diagram
    from knotsift.invariants.fingerprint import fingerprint

    d = _form("3_1")
    cand = identify_diagram(d, TABLE).candidates[0]
    fp = fingerprint(d)
    real = TABLE.by_invariant
    mirror = [f for f in TABLE.forms_of(cand.name) if f.label != cand.label]
    strangers = [f for f in TABLE.all_forms()
                 if f.name != cand.name and f.jones != fp.texts()["jones"]][:30]

    def crowded(inv, value):
        return mirror + strangers if inv == "alexander" else real(inv, value)

    monkeypatch.setattr(TABLE, "by_invariant", crowded)
    _clear_memos()
    out, notes = ident._separation_of(fp.texts(), TABLE, [cand], fp.key())
    assert mirror and out["alexander"]["count"] == len(mirror) + 30
    note = [n for n in notes if n.startswith("the Alexander polynomial alone")]
    assert len(note) == 1 and "the Jones polynomial" in note[0].split(";")[1]
    _clear_memos()

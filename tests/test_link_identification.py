"""Typed links identified against the link table: names, orientation classes, notes, errors."""

from __future__ import annotations

import random

import pytest

from knotsift import Diagram
from knotsift.errors import DiagramError, InvariantError
from knotsift.identification import identify
from knotsift.invariants.alexander import alexander_polynomial
from knotsift.invariants.linking import reverse_components
from knotsift.reidemeister import scramble, shuffle_labels
from knotsift.table import MIRROR_MARK, REVERSED_MARK

from .knots import HOPF, TREFOIL


def _expected_label(form, flip: set[int], m: int) -> str:
    """The label after reversing components ``flip`` (0-based) of a stored form."""
    total = {int(k) - 1 for k in form.reversed.split(",") if k} ^ flip
    if 0 in total:  # reversing every component changes no invariant: keep component 1
        total = set(range(m)) - total
    rev = (REVERSED_MARK + "".join(str(k + 1) for k in sorted(total))) if total else ""
    return form.name + rev + (MIRROR_MARK if form.mirrored else "")


def test_every_table_link_found_scrambled_and_reoriented(link_table):
    """Each table link, in a random stored form, scrambled by Reidemeister moves, relabelled
    and with random components reversed, gets its name and the right orientation class."""
    rng = random.Random(20)
    for row in link_table.links():
        if row["crossing_number"] > 8:
            continue
        form = rng.choice(link_table.link_forms_of(row["name"]))
        d = form.diagram()
        m = d.number_of_components()
        flip = {k for k in range(m) if rng.random() < 0.5}
        if d.number_of_crossings():
            d = shuffle_labels(scramble(reverse_components(d, flip), 5, rng), rng)
        r = identify(d, table=link_table)
        assert r.status == "identified", (row["name"], r.notes)
        assert r.candidates[0].name == row["name"]
        if d.number_of_crossings():
            assert _expected_label(form, flip, m) in r.link["matched_forms"], row["name"]


@pytest.mark.parametrize("code,name,alias", [
    ("PD[X[1,3,2,4], X[3,1,4,2]]", "2^2_1", "Hopf link"),
    ("braid: 1 1 1 1", "4^2_1", "Solomon link"),
    ("conway: 212", "5^2_1", "Whitehead link"),
    ("braid: 1 -2 1 -2 1 -2", "6^3_2", "Borromean rings"),
    ("braid: 1 1 1 1 1 1 1 1 1 1", "T(2,10)", "10-noded catenane"),
])
def test_named_links_with_aliases(link_table, code, name, alias):
    r = identify(code, table=link_table)
    assert r.candidates[0].name == name
    assert alias in r.candidates[0].aliases


def test_hopf_orientation_classes(link_table):
    """The two orientations of the Hopf link are mirror images of each other here."""
    pos = identify(HOPF, table=link_table)
    neg = identify(reverse_components(HOPF, [1]), table=link_table)
    assert pos.link["linking_matrix"][0][1] == 1 and neg.link["linking_matrix"][0][1] == -1
    assert pos.invariants["jones"] == "-t^(1/2) - t^(5/2)"
    assert set(pos.link["matched_forms"]) != set(neg.link["matched_forms"])


def test_whitehead_notes_zero_linking_not_split(link_table):
    """Linking number 0 is never read as unlinked: the Whitehead link's notes say not split."""
    r = identify("conway: 212", table=link_table)
    assert r.link["linking_matrix"] == [[0, 0], [0, 0]]
    assert any("not split" in n and "determinant is 8" in n for n in r.notes)
    text = r.to_text()
    assert "linking numbers: 1-2: 0" in text


def test_borromean_notes_and_sublinks(link_table):
    r = identify("braid: 1 -2 1 -2 1 -2", table=link_table)
    assert abs(r.link["triple_linking_number"]) == 1
    assert all(s["type"].startswith("0^2_1") for s in r.link["sublinks"])
    assert any("triple linking number" in n for n in r.notes)


def test_split_union_identified(link_table):
    r = identify(HOPF.disjoint_union(Diagram.unknot()), table=link_table)
    assert r.candidates[0].name == "2^2_1+0_1"
    assert any(n.startswith("split") for n in r.notes)


def test_link_beyond_table(link_table):
    """The torus link T(3,6), 3 components and 12 crossings, is not in the table and the notes
    say what the table holds."""
    r = identify("braid: 1 2 1 2 1 2 1 2 1 2 1 2", table=link_table)
    assert r.status == "not in table" and r.invariants["components"] == "3"
    assert any("link table lists every prime link of 3 components" in n for n in r.notes)


def test_link_where_knot_required_and_reverse(link_table):
    """A link code where a knot is required, and a knot code where a link is, say so clearly."""
    with pytest.raises(DiagramError, match="a knot .one component. is required here, but the "
                                           "pd input describes a 2-component link"):
        identify("PD[X[1,3,2,4], X[3,1,4,2]]", expect="knot", table=link_table)
    with pytest.raises(DiagramError, match="a link of two or more components is required here, "
                                           "but the input describes a knot"):
        identify(TREFOIL, expect="link", table=link_table)
    with pytest.raises(InvariantError, match="for knots only, got a diagram with 2 components"):
        alexander_polynomial(HOPF)


def test_cli_expect_flag(link_table, capsys):
    from knotsift.cli import main

    code = main(["identify", "--expect", "knot", "PD[X[1,3,2,4], X[3,1,4,2]]"])
    err = capsys.readouterr()
    assert code != 0
    assert "a knot (one component) is required here" in err.out + err.err
    assert main(["identify", "braid: 1 1 1 1"]) == 0
    assert "4^2_1" in capsys.readouterr().out


def test_cli_show_link(link_table, capsys):
    """`knotsift show` finds a link by name or alias and lists its forms; an unknown link name
    is not matched loosely to a knot."""
    from knotsift.cli import main

    assert main(["show", "Whitehead link"]) == 0
    out = capsys.readouterr().out
    assert out.startswith("5^2_1") and "5^2_1~2*" in out
    assert main(["show", "9^2_1"]) == 1
    assert "no link named '9^2_1'" in capsys.readouterr().err


def test_many_components_keyed_without_every_order(link_table):
    """A closed braid of many strands (13 components) is keyed without trying every order of
    its components, and reported as beyond the link table."""
    r = identify("braid: 1 1 3 3 5 5 7 7 9 9 11 11 13", table=link_table)
    assert r.status == "not in table" and r.invariants["components"] == "13"
    assert r.invariants["linking"].startswith("sorted ")

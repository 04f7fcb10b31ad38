"""Tests of knotsift.notations.dt."""

import itertools
import random

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from known_knots import (
    DETERMINANTS,
    DT_CODES,
    JONES,
    NAMES,
    RIGHT_TREFOIL,
    determinant,
    expected_jones,
    jones,
    same_up_to_mirror,
)

from knotsift.diagram import Diagram
from knotsift.errors import DiagramError, NotationError
from knotsift.notations.dt import dt_entries, parse_dt, write_dt


@pytest.mark.parametrize("name", NAMES)
def test_parse_dt_known_knots(name):
    """DT codes of the knots through seven crossings give their Jones polynomial and determinant.

    DT codes from memory (Dowker and Thistlethwaite 1983); Jones polynomials
    and determinants from memory (Rolfsen 1976 table), compared up to mirror
    image because a DT code does not fix chirality.
    """
    d = parse_dt(DT_CODES[name])
    assert d.number_of_crossings() == len(DT_CODES[name].split())
    assert d.is_knot()
    assert determinant(d) == DETERMINANTS[name]
    if name in JONES:
        assert same_up_to_mirror(jones(d), expected_jones(name))


@pytest.mark.parametrize("name", NAMES)
def test_parse_dt_all_positive_is_alternating(name):
    """An all-positive DT code gives an alternating diagram (Dowker and Thistlethwaite 1983)."""
    assert parse_dt(DT_CODES[name]).is_alternating()


def test_parse_dt_chirality_rule_trefoil():
    """The documented rule: 4 6 2 is the right-handed trefoil, -4 -6 -2 the left-handed one.

    Jones of the right-handed trefoil: common practice (CONVENTIONS.md).
    """
    assert jones(parse_dt("4 6 2")) == RIGHT_TREFOIL
    assert jones(parse_dt("-4 -6 -2")) == RIGHT_TREFOIL.mirror()


@pytest.mark.parametrize("name", ["5_1", "5_2", "7_1"])
def test_parse_dt_chirality_rule_positive_knots(name):
    """Reduced alternating diagrams of these knots have crossings of one sign, so the rule gives
    the positive knot (Jones from memory)."""
    d = parse_dt(DT_CODES[name])
    assert set(d.signs()) == {1}
    assert jones(d) == expected_jones(name)


def test_parse_dt_first_crossing_sign_follows_first_entry():
    """The crossing at label 1 has the sign of the first entry (the module's rule)."""
    for code in DT_CODES.values():
        entries = [int(x) for x in code.split()]
        for flip in (1, -1):
            d = parse_dt([flip * entries[0]] + entries[1:])
            assert d.signs()[0] == flip


@pytest.mark.parametrize("name,k", [("4_1", 0), ("5_2", 3), ("6_2", 5), ("7_7", 2)])
def test_parse_dt_sign_flip_is_crossing_change(name, k):
    """Negating entry k changes over/under at crossing k and nothing else (the DT convention)."""
    entries = dt_entries(DT_CODES[name])
    flipped = list(entries)
    flipped[k] = -flipped[k]
    d, e = parse_dt(entries), parse_dt(flipped)
    assert e.signs() == tuple(-s if i == k else s for i, s in enumerate(d.signs()))
    assert jones(e) == jones(d.crossing_change(k))


def test_parse_dt_trefoil_with_one_crossing_changed_is_unknot():
    """Changing one crossing of the trefoil's diagram unknots it (common practice)."""
    assert jones(parse_dt("-4 6 2")) == jones(Diagram.unknot())


@pytest.mark.parametrize("text", ["4 6 2", "[4, 6, 2]", "4,6,2", "DT: 4 6 2", "dt[4 6 2]",
                                  "(4, 6, 2)", "  4\t6\n2 ", "+4 +6 +2"])
def test_parse_dt_text_forms(text):
    """All accepted spellings give the same diagram."""
    assert parse_dt(text) == parse_dt([4, 6, 2])


def test_parse_dt_empty_code_is_unknot():
    assert parse_dt("[]") == Diagram.unknot()
    assert parse_dt([]) == Diagram.unknot()


def test_parse_dt_kinks():
    """Codes with nugatory crossings are drawn and give the unknot (common practice)."""
    for code in ("2", "4 2", "2 4", "8 6 4 2"):
        d = parse_dt(code)
        assert jones(d) == jones(Diagram.unknot())


def _realisable_by_search(entries):
    """Some choice of crossing signs gives a planar diagram (checked by Diagram's Euler test)."""
    n = len(entries)
    walk = [None] * (2 * n)
    for k, a in enumerate(entries):
        walk[2 * k] = (k, a > 0)
        walk[abs(a) - 1] = (k, a < 0)
    ends = {}
    for label, (c, over) in enumerate(walk, start=1):
        ends.setdefault(c, {})["over" if over else "under"] = (
            (label - 2) % (2 * n) + 1, label)  # (edge in, edge out)
    for signs in itertools.product((1, -1), repeat=n):
        quads = []
        for c in range(n):
            (ui, uo), (oi, oo) = ends[c]["under"], ends[c]["over"]
            quads.append((ui, oo, uo, oi) if signs[c] > 0 else (ui, oi, uo, oo))
        try:
            Diagram(quads)
            return True
        except DiagramError:
            continue
    return False


def test_parse_dt_realisability_agrees_with_search():
    """parse_dt refuses exactly the 5-crossing codes no sign choice can draw in the plane.

    Independent check: try all 2^5 sign choices and Diagram's own planarity test.
    """
    refused = 0
    for perm in itertools.permutations([2, 4, 6, 8, 10]):
        try:
            parse_dt(list(perm))
            drawn = True
        except NotationError as err:
            assert "not realisable" in str(err)
            drawn = False
            refused += 1
        assert drawn == _realisable_by_search(list(perm)), perm
    assert refused > 0


@pytest.mark.parametrize("name", NAMES)
def test_write_dt_round_trip(name):
    """write_dt then parse_dt gives back the same knot and the same crossing signs."""
    d = parse_dt(DT_CODES[name])
    for diagram in (d, d.mirror()):
        back = parse_dt(write_dt(diagram))
        assert jones(back) == jones(diagram)
        assert sorted(back.signs()) == sorted(diagram.signs())


def test_write_dt_round_trip_non_alternating():
    """Round trip of codes with random sign flips (seeded), including their mirror images."""
    rng = random.Random(1983)
    for name in ("6_2", "7_4", "7_6"):
        entries = dt_entries(DT_CODES[name])
        for _ in range(4):
            flipped = [a if rng.random() < 0.6 else -a for a in entries]
            d = parse_dt(flipped)
            assert jones(parse_dt(write_dt(d))) == jones(d)
            assert jones(parse_dt(write_dt(d.mirror()))) == jones(d.mirror())


def test_write_dt_relabelled_diagram():
    """Relabelling the edges of a diagram at random does not change the code's knot."""
    rng = random.Random(7)
    d = parse_dt(DT_CODES["7_7"])
    labels = sorted({e for x in d.crossings for e in x})
    shuffled = labels[:]
    rng.shuffle(shuffled)
    relabelled = d.relabel(dict(zip(labels, [10 * s for s in shuffled], strict=True)))
    assert jones(parse_dt(write_dt(relabelled))) == jones(d)


def test_write_dt_unknot():
    assert write_dt(Diagram.unknot()) == "[]"


@pytest.mark.parametrize("text,fragment", [
    ("4 6 3", "non-zero even integer for odd label 5"),
    ("4 6 6", "even label 6 appears twice"),
    ("4 6 8", "out of range"),
    ("4 x 2", "unexpected character 'x'"),
    ("[4 6 2", "never closed"),
    ("4 6 2]", "unexpected character ']'"),
    ("[4 6 2] 8", "after the closing bracket"),
    ("0 2", "non-zero even integer for odd label 1"),
    ("", "empty text"),
    ("4 - 6 2", "expected digits after '-'"),
    ("4 6 8 10 2", "not realisable"),
    ("4 6 2 10 12 8", "connected sum"),
])
def test_parse_dt_malformed(text, fragment):
    """Bad DT codes raise NotationError naming what was expected and where."""
    with pytest.raises(NotationError) as info:
        parse_dt(text)
    assert fragment in str(info.value)


def test_parse_dt_malformed_positions():
    """Errors name the entry and the character position."""
    with pytest.raises(NotationError) as info:
        parse_dt("4 6 7")
    assert info.value.where == "entry 2 (position 5)"
    with pytest.raises(NotationError) as info:
        parse_dt([4, 6, 2.0])
    assert "entry 2" in str(info.value)


def test_write_dt_refuses_links():
    from knotsift.notations.braid import parse_braid

    with pytest.raises(NotationError, match="2 components"):
        write_dt(parse_braid("s1^2"))


def test_write_dt_refuses_connected_sums():
    """A connected sum has no DT code that fixes the knot (the granny and square knots share
    their unsigned code; common practice)."""
    granny = parse_dt("4 6 2").connected_sum(parse_dt("4 6 2"))
    with pytest.raises(NotationError, match="DT code of this diagram does not determine"):
        write_dt(granny)


def test_parse_dt_rule_passes_over_kinks():
    """A kink at label 1 does not decide the chirality: 2 6 8 4 is the right-handed trefoil with
    a kink in front, whatever the kink's sign (Jones: common practice)."""
    assert jones(parse_dt("2 6 8 4")) == RIGHT_TREFOIL
    assert jones(parse_dt("-2 6 8 4")) == RIGHT_TREFOIL
    assert jones(parse_dt("2 -6 -8 -4")) == RIGHT_TREFOIL.mirror()


@settings(max_examples=60, deadline=None)
@given(st.permutations([2, 4, 6, 8, 10, 12, 14]).flatmap(
    lambda p: st.tuples(st.just(p), st.lists(st.booleans(), min_size=7, max_size=7))))
def test_write_dt_round_trip_random_codes(code_and_flips):
    """Any code that parse_dt accepts (kinks included) survives write_dt and parse_dt."""
    perm, flips = code_and_flips
    code = [-a if f else a for a, f in zip(perm, flips, strict=True)]
    try:
        d = parse_dt(code)
    except NotationError as err:
        assert "not realisable" in str(err) or "connected sum" in str(err)
        return
    try:
        text = write_dt(d)
    except NotationError as err:
        assert "does not determine" in str(err)
        return
    assert jones(parse_dt(text)) == jones(d)

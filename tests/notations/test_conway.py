"""Tests of knotsift.notations.conway."""

import itertools
from collections import defaultdict

import pytest
from known_knots import (
    CONWAY,
    DETERMINANTS,
    DT_CODES,
    JONES,
    NAMES,
    POSITIVE_HOPF,
    RIGHT_TREFOIL,
    determinant,
    expected_jones,
    jones,
    same_up_to_mirror,
)

from knotsift.diagram import Diagram
from knotsift.errors import NotationError
from knotsift.notations.conway import parse_rational, rational_entries, rational_fraction
from knotsift.notations.dt import parse_dt


@pytest.mark.parametrize("name", NAMES)
def test_parse_rational_known_knots(name):
    """Conway notation from Rolfsen 1976 Appendix C (from memory) gives the knot: Jones from
    memory (up to mirror), determinant from memory equal to the numerator p (common practice
    for 2-bridge knots), a reduced alternating diagram, and the knot of the DT code."""
    d = parse_rational(CONWAY[name])
    p, _ = rational_fraction(CONWAY[name])
    assert d.is_knot()
    assert d.is_alternating()
    assert d.number_of_crossings() == int(name.split("_")[0])
    assert determinant(d) == DETERMINANTS[name] == p
    assert same_up_to_mirror(jones(d), jones(parse_dt(DT_CODES[name])))
    if name in JONES:
        assert same_up_to_mirror(jones(d), expected_jones(name))


def test_parse_rational_chirality():
    """The stated chirality: "3" is the right-handed trefoil, "5" the positive cinquefoil, "-3"
    the left-handed trefoil (Jones: common practice and from memory)."""
    assert jones(parse_rational("3")) == RIGHT_TREFOIL
    assert jones(parse_rational("-3")) == RIGHT_TREFOIL.mirror()
    assert jones(parse_rational("5")) == expected_jones("5_1")


def test_parse_rational_links():
    """An even numerator gives a two-component link; "2" is the positive Hopf link."""
    assert jones(parse_rational("2")) == POSITIVE_HOPF
    assert jones(parse_rational("1 1")) == POSITIVE_HOPF
    for code in ("4", "2 1 2", "2 2 2", "3 1 1 2"):
        p, _ = rational_fraction(code)
        assert p % 2 == 0
        assert parse_rational(code).number_of_components() == 2


def test_parse_rational_degenerate():
    """Zero entries: [0] is the two-component unlink, [a, 0] the unknot (common practice:
    continued fractions)."""
    assert parse_rational("0") == Diagram([], free_loops=2)
    assert jones(parse_rational("3 0")) == jones(Diagram.unknot())
    assert jones(parse_rational("0 2 3")) == jones(parse_rational("3"))
    assert jones(parse_rational("1")) == jones(Diagram.unknot())


@pytest.mark.parametrize("text", ["2112", "2 1 1 2", "[2 1 1 2]", "[2, 1, 1, 2]", "[2112]",
                                  "Conway: 2112", " 2  1 1\t2 "])
def test_rational_entries_forms(text):
    assert rational_entries(text) == [2, 1, 1, 2]


def test_rational_entries_signed_and_long():
    assert rational_entries("3 -2") == [3, -2]
    assert rational_entries("+12") == [12]
    assert rational_entries("2 12") == [2, 12]
    assert rational_entries((4, 2)) == [4, 2]


@pytest.mark.parametrize("entries,expected", [
    ("3", (3, 1)), ("2 2", (5, 2)), ("3 2", (7, 3)), ("2 1 1 2", (13, 5)), ("0", (0, 1)),
    ("1", (1, 0)), ("-3", (3, 2)), ("2", (2, 1)),
])
def test_rational_fraction_values(entries, expected):
    """p/q = an + 1/(... + 1/a1) reduced to 0 <= q < p (Conway 1970's fraction; values worked by
    hand)."""
    assert rational_fraction(entries) == expected


def _small_codes():
    """All codes with entries in -3..3 (no zeros), up to three entries, at most 7 crossings."""
    values = [-3, -2, -1, 1, 2, 3]
    for n in (1, 2, 3):
        for entries in itertools.product(values, repeat=n):
            if sum(abs(a) for a in entries) <= 7:
                yield list(entries)


def test_rational_fraction_schubert_classification():
    """Knots with the same p and q' = q^(+-1) mod p have equal Jones polynomials, and with
    q' = -q^(+-1) mirrored ones (Schubert 1956); checked over all small codes."""
    classes = defaultdict(list)
    for entries in _small_codes():
        p, q = rational_fraction(entries)
        if p % 2 == 1 and p > 1:
            key = (p, min(q, pow(q, -1, p)))
            classes[key].append(jones(parse_rational(entries)))
    assert len(classes) > 10
    mirrored = 0
    for (p, q), polys in classes.items():
        assert all(v == polys[0] for v in polys), (p, q)
        mirror = (p, min(p - q, pow(p - q, -1, p)))
        if mirror in classes and mirror != (p, q):
            assert classes[mirror][0] == polys[0].mirror(), (p, q)
            mirrored += 1
    assert mirrored > 10
    assert sum(len(v) > 1 for v in classes.values()) > 10


def test_rational_fraction_of_even_rewrite():
    """[a1, ..., an] and [1, a1 - 1, ..., an] are the same fraction (common practice:
    continued fractions)."""
    for entries in _small_codes():
        rewritten = [1, entries[0] - 1] + entries[1:]
        assert rational_fraction(entries) == rational_fraction(rewritten)


def test_parse_rational_crossing_count():
    """Positive entries give sum(a_i) crossings."""
    for entries in _small_codes():
        if all(a > 0 for a in entries):
            assert parse_rational(entries).number_of_crossings() == sum(entries)


@pytest.mark.parametrize("text,fragment", [
    ("3,3,2", "not tangle sums"),
    ("8*", "polyhedra"),
    ("", "expected at least one entry"),
    ("[3 2", "'[' is never closed"),
    ("3 x", "unexpected character 'x'"),
    ("-", "expected digits after '-'"),
    ("[3] 2", "after the closing bracket"),
    ("Conway:", "expected at least one entry"),
])
def test_rational_entries_malformed(text, fragment):
    """Bad Conway notation raises NotationError with the position."""
    with pytest.raises(NotationError) as info:
        parse_rational(text)
    assert fragment in str(info.value)


def test_rational_entries_malformed_where():
    with pytest.raises(NotationError) as info:
        rational_entries("3 2,1")
    assert info.value.where == "position 4"
    with pytest.raises(NotationError, match="expected an integer"):
        rational_entries([3, "2"])
    with pytest.raises(NotationError, match="at least one entry"):
        rational_entries([])

"""Tests of knotsift.notations.gauss."""

import pytest
from hypothesis import HealthCheck, assume, given, settings
from hypothesis import strategies as st
from known_knots import (
    DT_CODES,
    FIGURE_EIGHT,
    NAMES,
    POSITIVE_HOPF,
    RIGHT_TREFOIL,
    UNLINK2,
    jones,
)

from knotsift.diagram import Diagram
from knotsift.errors import NotationError
from knotsift.notations.braid import parse_braid
from knotsift.notations.conway import parse_rational
from knotsift.notations.dt import parse_dt
from knotsift.notations.gauss import parse_gauss, parse_gauss_with_uncertain, write_gauss

UNKNOT = jones(Diagram.unknot())
TREFOIL = "O1+ U2+ O3+ U1+ O2+ U3+"
LEFT_TREFOIL = "O1- U2- O3- U1- O2- U3-"


@pytest.mark.parametrize("text,expected", [
    (TREFOIL, RIGHT_TREFOIL),
    (LEFT_TREFOIL, RIGHT_TREFOIL.mirror()),
    ("U1- O2- U3- O1- U2- O3-", RIGHT_TREFOIL.mirror()),
    ("O1+ U2+ | U1+ O2+", POSITIVE_HOPF),
    ("O1- U2- | U1- O2-", POSITIVE_HOPF.mirror()),
    ("O1+ O2- | U1+ U2-", UNLINK2),
    ("O1+ U1+", UNKNOT),
    ("()", UNKNOT),
    ("() | ()", UNLINK2),
])
def test_parse_gauss_known(text, expected):
    """Signed Gauss codes of small knots and links (Jones values: common practice)."""
    assert jones(parse_gauss(text)) == expected


def test_parse_gauss_figure_eight_signed_and_unsigned():
    """The figure-eight's Gauss code (common practice: it alternates O/U through four crossings)
    gives the figure-eight with or without signs; the signs read back are kept as given."""
    unsigned = "O1 U2 O3 U4 O2 U1 O4 U3"
    d = parse_gauss(unsigned)
    assert jones(d) == FIGURE_EIGHT
    assert sorted(d.signs()) == [-1, -1, 1, 1]  # amphichiral, writhe 0 (common practice)
    entries = unsigned.split()
    signed = " ".join(e + ("+" if d.signs()[int(e[1:]) - 1] > 0 else "-") for e in entries)
    e = parse_gauss(signed)
    assert e.signs() == d.signs()
    assert jones(e) == FIGURE_EIGHT


@pytest.mark.parametrize("text", [
    "1 -2 3 -1 2 -3",
    "O1 U2 O3 U1 O2 U3",
    "[1, -2, 3, -1, 2, -3]",
    "Gauss: 1 -2 3 -1 2 -3",
    "-1 3 -2 1 -3 2 ; + + +",
    "O1+ U2+ O3+ U1+ O2+ U3+",
    "o1+ u2+ o3+ u1+ o2+ u3+",
])
def test_parse_gauss_trefoil_forms(text):
    """Every spelling of the right-handed trefoil gives it (unsigned: the mirror rule makes the
    first crossing positive when it is first passed over)."""
    assert jones(parse_gauss(text)) == RIGHT_TREFOIL


def test_parse_gauss_signs_keyword():
    """signs= is the same as a sign list after ';'."""
    assert parse_gauss("-1 3 -2 1 -3 2", signs="- - -") == parse_gauss("-1 3 -2 1 -3 2 ; - - -")
    assert parse_gauss("-1 3 -2 1 -3 2", signs=[-1, -1, -1]) == parse_gauss(
        "-1 3 -2 1 -3 2 ; -1 -1 -1")


def test_parse_gauss_sequences():
    """Sequences of integers are read like the integer text form."""
    assert parse_gauss([1, -2, 3, -1, 2, -3]) == parse_gauss("1 -2 3 -1 2 -3")
    assert jones(parse_gauss([[1, -2], [2, -1]], signs=[1, 1])) == POSITIVE_HOPF


@pytest.mark.parametrize("text", [
    "O1+ U2+ | U1+ O2+",
    "O1+ U2+\nU1+ O2+",
    "(O1+ U2+) (U1+ O2+)",
    "[[1, -2], [-1, 2]] ; + +",
])
def test_parse_gauss_component_separators(text):
    assert jones(parse_gauss(text)) == POSITIVE_HOPF


def test_parse_gauss_connected_sums_with_signs():
    """Signed codes fix connected sums: granny = V(3_1)^2, square = V(3_1) V(3_1 mirror)
    (Jones is multiplicative under connected sum: common practice)."""
    granny = parse_gauss("O1+ U2+ O3+ U1+ O2+ U3+ O4+ U5+ O6+ U4+ O5+ U6+")
    square = parse_gauss("O1+ U2+ O3+ U1+ O2+ U3+ O4- U5- O6- U4- O5- U6-")
    assert jones(granny) == RIGHT_TREFOIL * RIGHT_TREFOIL
    assert jones(square) == RIGHT_TREFOIL * RIGHT_TREFOIL.mirror()


def test_parse_gauss_unsigned_connected_sum_refused():
    """Without signs the granny and square knots have the same code, so it is refused."""
    with pytest.raises(NotationError, match="does not determine the knot"):
        parse_gauss("O1 U2 O3 U1 O2 U3 O4 U5 O6 U4 O5 U6")


def test_parse_gauss_unsigned_split_parts_each_follow_rule():
    """In a split diagram each part follows the mirror rule on its own."""
    d = parse_gauss("O1 U2 O3 U1 O2 U3 | O4 U5 O6 U4 O5 U6")
    assert d.number_of_components() == 2
    assert set(d.signs()) == {1}


@pytest.mark.parametrize("text,unsure", [
    ("O1+ U2+ O3+? U1+ O2+ U3+", [2]),
    ("O1+? U2+ O3+ U1+? O2+ U3+", [0]),
    ("O1+ U2+? O3+ U1+ O2+ U3+?", [1, 2]),
    ("1 -2? 3 -1 2 -3", [1]),
    (TREFOIL, []),
])
def test_parse_gauss_with_uncertain(text, unsure):
    """'?' on either occurrence marks the crossing; indices are diagram crossing indices."""
    d, marked = parse_gauss_with_uncertain(text)
    assert marked == unsure
    assert jones(d) == RIGHT_TREFOIL


@pytest.mark.parametrize("name", NAMES)
def test_write_gauss_round_trip_knots(name):
    """parse_gauss(write_gauss(d)) has the same signs crossing by crossing and the same Jones."""
    d = parse_dt(DT_CODES[name])
    back = parse_gauss(write_gauss(d))
    assert back.signs() == d.signs()
    assert jones(back) == jones(d)


@pytest.mark.parametrize("diagram", [
    parse_braid("s1^2"), parse_braid("s1^-4"), parse_braid("s1 s2 s1 s2"),
    parse_rational("2 1 2"), parse_braid("s1^3", strands=3),
    parse_dt("4 6 2").connected_sum(parse_dt("-4 -6 -2")),
], ids=["hopf", "torus-4-2", "torus-link-3", "rational-8-3", "trefoil-and-loop", "square"])
def test_write_gauss_round_trip_links(diagram):
    """Round trip of links, free loops and composite knots."""
    back = parse_gauss(write_gauss(diagram))
    assert back.signs() == diagram.signs()
    assert back.number_of_components() == diagram.number_of_components()
    assert jones(back) == jones(diagram)


@settings(max_examples=40, deadline=None)
@given(st.lists(st.sampled_from([1, 2, 3, -1, -2, -3]), min_size=1, max_size=9))
def test_write_gauss_round_trip_braid_closures(word):
    """Closures of random braid words survive the round trip (signs and Jones)."""
    d = parse_braid(word, strands=4)
    back = parse_gauss(write_gauss(d))
    assert back.signs() == d.signs()
    assert back.number_of_components() == d.number_of_components()
    assert jones(back) == jones(d)


@settings(max_examples=30, deadline=None, suppress_health_check=[HealthCheck.filter_too_much])
@given(st.lists(st.sampled_from([1, 2, -1, -2]), min_size=2, max_size=5))
def test_parse_gauss_unsigned_matches_signed_up_to_mirror(word):
    """Dropping the signs of a small knot's code gives the knot or its mirror image."""
    d = parse_braid(word, strands=3)
    assume(d.is_knot())
    unsigned = " ".join(e.rstrip("+-") for e in write_gauss(d).split())
    assert jones(parse_gauss(unsigned)) in (jones(d), jones(d).mirror())


@pytest.mark.parametrize("text,fragment", [
    ("O1+ U2+ O3+ U1+ O2+", "crossing 3 appears 1 time"),
    ("O1+ U1+ O1+ U1+", "crossing 1 appears 4 times"),
    ("O1+ U1-", "crossing 1 has sign + at component 0, entry 0"),
    ("O1+ O1+", "crossing 1 is over at both occurrences"),
    ("O1+ U2 O2+ U1+", "U2 has no crossing sign"),
    ("O1+ -1", "signed integer"),
    ("Ox U1", "expected a crossing number after 'O'"),
    ("O1+ U1+ ; + ", "both on the entries and as a separate list"),
    ("1 -1 ; + -", "expected 1 crossing signs"),
    ("1 -1 ; + ; -", "second ';'"),
    ("[O1+ U1+", "never closed"),
    ("O1+ U1+ ]", "unbalanced bracket ']'"),
    ("O1+ U1+ | W2", "unexpected character 'W'"),
    ("? O1 U1", "'?' does not follow an entry"),
    ("O0+ U0+", "crossing numbers must be positive"),
    ("", "empty text"),
    ("1 - 2", "expected a crossing number after the sign '-'"),
    ("1 -1 ; x", "expected a crossing sign"),
    ("O1+ O2+ U1+ U2+", "not realisable"),
    ("O1+ O2+ | U1+ U2+", "not realisable in the plane"),
    ("1 2 -1 -2", "not realisable"),
    ("O1 U2 [O2 U1]", "beside a bracketed component"),
])
def test_parse_gauss_malformed(text, fragment):
    """Bad Gauss codes raise NotationError naming the crossing, component or position."""
    with pytest.raises(NotationError) as info:
        parse_gauss(text)
    assert fragment in str(info.value)


def test_parse_gauss_malformed_where():
    """The error keeps the place: crossing number or character position."""
    with pytest.raises(NotationError) as info:
        parse_gauss("O1+ U2+ O3+ U1+ O2+ U4+")
    assert info.value.where == "crossing 3"
    with pytest.raises(NotationError) as info:
        parse_gauss("O1+ U1+ | W2")
    assert info.value.where == "position 11"
    with pytest.raises(NotationError, match="signs must be"):
        parse_gauss("1 -1", signs=[2])
    with pytest.raises(NotationError, match="non-zero integer"):
        parse_gauss([1, 0])

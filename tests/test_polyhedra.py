"""Tests of knotsift.polyhedra: Conway's basic polyhedra and tangle substitution."""

import csv
from pathlib import Path

import pytest

from knotsift.invariants.jones import jones_polynomial
from knotsift.laurent import Laurent
from knotsift.polyhedra import BASIC_POLYHEDRA, Polyhedron, basic_polyhedron
from knotsift.tangle import integer_tangle, rational_tangle
from tests.strategies import braid_closure

REFERENCE = Path(__file__).resolve().parents[1] / "reference"


def recalled(name: str) -> dict:
    """The row of reference/alexander.csv (all values from memory)."""
    with open(REFERENCE / "alexander.csv", encoding="utf-8") as f:
        return next(r for r in csv.DictReader(f) if r["name"] == name)


def determinant(d) -> int:
    """|V(-1)| (common practice: the determinant of a knot)."""
    value = jones_polynomial(d).evaluate(-1)
    return abs(round(value.real if isinstance(value, complex) else value))


def alexander_coefficients(d) -> str:
    alexander = pytest.importorskip("knotsift.invariants.alexander")
    return " ".join(str(c) for c in alexander.alexander_polynomial(d).coefficient_list())


@pytest.mark.parametrize("name,vertices", [("1*", 1), ("6*", 6), ("8*", 8), ("9*", 9),
                                           ("10*", 10), ("10**", 10), ("10***", 10)])
def test_basic_polyhedron_shape(name, vertices):
    """Each polyhedron is 4-valent with the stated number of vertices and no bigon face.

    Basic polyhedra have no regions with two vertices (Conway 1970).
    """
    p = basic_polyhedron(name)
    assert p.number_of_vertices() == vertices
    d = p.substitute()
    assert d.number_of_crossings() == vertices
    assert d.is_alternating()
    if name != "1*":
        assert min(len(face) for face in d.faces()) >= 3
        for v in range(1, vertices + 1):
            assert len(p.neighbours(v)) == 4  # no loops, no double edges


@pytest.mark.parametrize("name,components", [("6*", 3), ("10**", 2), ("10***", 4)])
def test_basic_polyhedron_links(name, components):
    """6* filled with 1 is the Borromean rings (Conway 1970); 10** and 10*** give links.

    No prime knot through 10 crossings is on 10** or 10*** (Rolfsen 1976,
    Appendix C; from memory), so their alternating fillings are links.
    """
    assert basic_polyhedron(name).substitute().number_of_components() == components


def test_six_star_is_borromean_rings():
    """Jones polynomial of the Borromean rings (from memory; it is amphichiral)."""
    expected = Laurent.parse("-t^3 + 3t^2 - 2t + 4 - 2t^-1 + 3t^-2 - t^-3")
    assert jones_polynomial(basic_polyhedron("6*").substitute()) == expected


@pytest.mark.parametrize("name,n", [("6*", 3), ("8*", 4), ("10*", 5)])
def test_antiprisms_are_closed_three_braids(name, n):
    """6*, 8* and 10* filled with 1 are the closures of (s1 S2)^n, n = 3, 4, 5.

    The Borromean rings, 8_18 and 10_123 as closed 3-braids (from memory).
    Built independently by tests/strategies.braid_closure.
    """
    word = [1, -2] * n
    v = jones_polynomial(basic_polyhedron(name).substitute())
    w = jones_polynomial(braid_closure(word))
    assert v in (w, w.mirror())


@pytest.mark.parametrize("name,knot", [("8*", "8_18"), ("9*", "9_40"), ("10*", "10_123")])
def test_alternating_filling_determinant_and_alexander(name, knot):
    """8* is 8_18 (det 45), 9* is 9_40 (det 75), 10* is 10_123 (Conway 1970; from memory).

    Determinant and Alexander polynomial from reference/alexander.csv (from
    memory).  For 10_123 the table's 121 is used; a value of 75 was also
    recalled, but 121 agrees with the recalled polynomial and with the closed
    braid (s1 S2)^5 (whose determinant is L_10 - 2 = 121, from memory).
    """
    d = basic_polyhedron(name).substitute()
    row = recalled(knot)
    assert d.is_knot()
    assert determinant(d) == int(row["determinant"])
    assert alexander_coefficients(d) == row["alexander"]


def test_eight_star_and_ten_star_are_amphichiral():
    """8_18 and 10_123 are amphichiral (reference/amphichiral.csv; from memory)."""
    for name in ("8*", "10*"):
        v = jones_polynomial(basic_polyhedron(name).substitute())
        assert v == v.mirror()


def test_substitute_counts_crossings_and_matches_mapping():
    """Substitution adds the tangles' crossings; a mapping and a sequence agree."""
    p = basic_polyhedron("6*")
    two, three = integer_tangle(2), rational_tangle([2, 1])
    by_list = p.substitute([None, two, three])
    by_map = p.substitute({2: two, 3: three})
    assert by_list.number_of_crossings() == 6 - 2 + 2 + 3
    assert jones_polynomial(by_list) == jones_polynomial(by_map)


@pytest.mark.parametrize("entries", [[3], [2, 2], [3, 1, 2], [2, 1, 1, 2]])
def test_one_star_is_numerator_closure(entries):
    """1*a is the numerator closure of a (Conway 1970)."""
    t = rational_tangle(entries)
    v = jones_polynomial(basic_polyhedron("1*").substitute([t]))
    assert v == jones_polynomial(t.numerator())


def test_six_star_numbering():
    """The documented numbering of 6*: 1-2-3 a triangle; 2, 4 and 3, 5 and 1, 6 opposite."""
    p = basic_polyhedron("6*")
    assert {2, 3} <= p.neighbours(1) and 3 in p.neighbours(2)
    for a, b in ((2, 4), (3, 5), (1, 6)):
        assert b not in p.neighbours(a)
    for a, b in ((2, 3), (3, 4), (4, 5), (5, 2)):
        assert b in p.neighbours(a)
    assert [v for v in range(1, 7) if p.is_reflected(v)] == [3, 5]


def test_eight_star_numbering():
    """The documented zigzag numbering of 8*: k touches k + 1, 1 touches 3, 1 and 5 apart."""
    p = basic_polyhedron("8*")
    for k in range(1, 9):
        assert k % 8 + 1 in p.neighbours(k)
    assert 3 in p.neighbours(1) and 5 not in p.neighbours(1)
    assert [v for v in range(1, 9) if p.is_reflected(v)] == [2, 4, 6, 8]


@pytest.mark.parametrize("name", sorted(BASIC_POLYHEDRA))
def test_reflected_vertex_keeps_one_alternating(name):
    """The tangle 1 equals its reflection 10, so every frame keeps the filling alternating."""
    p = basic_polyhedron(name)
    d = p.substitute([integer_tangle(1)] * p.number_of_vertices())
    assert d.is_alternating()


def test_polyhedron_errors():
    """Too many tangles, a bad vertex number, an unknown name, a bad edge list all raise."""
    p = basic_polyhedron("6*")
    with pytest.raises(ValueError, match="6 vertices"):
        p.substitute([None] * 7)
    with pytest.raises(ValueError, match="vertex must be"):
        p.substitute({7: integer_tangle(2)})
    with pytest.raises(KeyError, match="no basic polyhedron"):
        basic_polyhedron("7*")
    with pytest.raises(ValueError, match="2 ends"):
        Polyhedron("bad", [(1, 2, 3, 4)])

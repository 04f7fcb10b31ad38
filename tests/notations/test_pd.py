"""Tests of knotsift.notations.pd."""

import json
import random

import pytest
from known_knots import DT_CODES, NAMES, RIGHT_TREFOIL, jones

from knotsift.diagram import Diagram
from knotsift.errors import DiagramError, NotationError
from knotsift.notations.braid import parse_braid
from knotsift.notations.dt import parse_dt
from knotsift.notations.pd import parse_pd, parse_pd_with_uncertain, write_pd

# The right-handed trefoil (common practice: the PD code of CONVENTIONS.md's convention).
TREFOIL = [(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)]


@pytest.mark.parametrize("text", [
    "[[1, 5, 2, 4], [3, 1, 4, 6], [5, 3, 6, 2]]",
    "[[1,5,2,4],[3,1,4,6],[5,3,6,2]]",
    " [\n [1, 5, 2, 4],\n [3, 1, 4, 6],\n [5, 3, 6, 2]\n] ",
    "PD[X[1,5,2,4], X[3,1,4,6], X[5,3,6,2]]",
    "pd[x[1, 5, 2, 4] x[3, 1, 4, 6] x[5, 3, 6, 2]]",
    "X[1,5,2,4], X[3,1,4,6], X[5,3,6,2]",
    "(1,5,2,4) (3,1,4,6) (5,3,6,2)",
    "(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)",
    "[(1,5,2,4), (3,1,4,6), (5,3,6,2)]",
])
def test_parse_pd_forms(text):
    """Every spelling gives the same diagram, the right-handed trefoil (Jones: common practice)."""
    d = parse_pd(text)
    assert d == Diagram(TREFOIL)
    assert jones(d) == RIGHT_TREFOIL


def test_parse_pd_unknot():
    assert parse_pd("[]") == Diagram.unknot()
    assert parse_pd("PD[]") == Diagram.unknot()


@pytest.mark.parametrize("text,unsure", [
    ('[[1, 5, 2, 4, "?"], [3, 1, 4, 6], [5, 3, 6, 2, "?"]]', [0, 2]),
    ("(1,5,2,4) (3,1,4,6)? (5,3,6,2)", [1]),
    ("(1,5,2,4) ? (3,1,4,6) (5,3,6,2)?", [0, 2]),
    ("PD[X[1,5,2,4], X[3,1,4,6]?, X[5,3,6,2]]", [1]),
    ("[[1, 5, 2, 4], [3, 1, 4, 6], [5, 3, 6, 2]]", []),
])
def test_parse_pd_with_uncertain(text, unsure):
    """The '?' marker flags crossings by index; the diagram is unchanged by it."""
    d, marked = parse_pd_with_uncertain(text)
    assert marked == unsure
    assert d == Diagram(TREFOIL)


@pytest.mark.parametrize("name", NAMES)
def test_write_pd_round_trip(name):
    d = parse_dt(DT_CODES[name])
    assert parse_pd(write_pd(d)) == d


def test_write_pd_round_trip_uncertain():
    d = Diagram(TREFOIL)
    text = write_pd(d, uncertain=[2, 0])
    assert json.loads(text)[2][-1] == "?"
    assert parse_pd_with_uncertain(text) == (d, [0, 2])


def test_write_pd_unknot_and_links():
    assert write_pd(Diagram.unknot()) == "[]"
    hopf = parse_braid("s1^2")
    assert parse_pd(write_pd(hopf)) == hopf


def test_parse_pd_relabelled():
    """Relabelling edges at random (seeded) keeps the knot."""
    rng = random.Random(1976)
    d = parse_dt(DT_CODES["7_4"])
    labels = sorted({e for x in d.crossings for e in x})
    new = rng.sample(range(100, 200), len(labels))
    mapping = dict(zip(labels, new, strict=True))
    text = " ".join("(" + ",".join(str(mapping[e]) for e in x) + ")" for x in d.crossings)
    assert jones(parse_pd(text)) == jones(d)


@pytest.mark.parametrize("text,fragment,where", [
    ("[[1,5,2,4],[3,1,4,6],[5,3,6]]", "expected an array of 4 integer labels", "crossing 2"),
    ("[[1,5,2,4],[3,1,4,6],[5,3,6,2.0]]", "found [5, 3, 6, 2.0]", "crossing 2"),
    ("[[true,5,2,4]]", "4 integer labels", "crossing 0"),
    ('[[1,5,2,4,"!"]]', 'optionally followed by "?"', "crossing 0"),
    ("[[1,5,2,4],[3,1,4,6],[5,3,6,2]", "not valid JSON", "position 31"),
    ("[[1,5,2,4]] x", "not valid JSON", "position 13"),
    ("PD[X[1,5,2,4], X[3,1,4,6], X[5,3,6,2]", "expected ']' closing the PD code", "position 38"),
    ("(1,5,2,4) (3,1,4,6) (5,3,6 2)", "expected ',' after label 3 of 4",
     "crossing 2, position 28"),
    ("(1,5,2,4) (3,1,4,6) (5,3,6,x)", "expected an integer label", "crossing 2, position 28"),
    ("(1,5,2,4,7)", "expected ')' after the 4th label", "crossing 0, position 9"),
    ("X(1,5,2,4)", "expected '[' after X", "crossing 0, position 2"),
    ("PD(1,5,2,4)", "expected '[' after PD", "position 3"),
    ("(1,5,2,4)) ", "expected 'X[' or '(' starting a crossing", "crossing 1, position 10"),
    ("{\"pd\": 1}", "expected 'X[' or '('", "crossing 0, position 1"),
    ("", "empty text", None),
])
def test_parse_pd_malformed(text, fragment, where):
    """Syntax errors raise NotationError with the crossing and the position."""
    with pytest.raises(NotationError) as info:
        parse_pd(text)
    assert fragment in str(info.value)
    assert info.value.where == where


@pytest.mark.parametrize("text,fragment", [
    ("[[1,5,2,4],[3,1,4,6],[5,3,6,7]]", "edge label 2 must appear exactly twice"),
    ("[[1,3,2,4],[4,1,3,2]]", "not planar"),
    ("[[1,2,3,4],[1,2,3,4]]", "orientation is inconsistent"),
])
def test_parse_pd_invalid_diagram(text, fragment):
    """Diagram validation errors propagate as DiagramError."""
    with pytest.raises(DiagramError) as info:
        parse_pd(text)
    assert fragment in str(info.value)


def test_parse_pd_not_text():
    with pytest.raises(NotationError, match="expected text, got list"):
        parse_pd([[1, 5, 2, 4]])


def test_write_pd_refuses():
    """A PD code cannot show free loops beside crossings; bad uncertain indices are refused."""
    with pytest.raises(NotationError, match="free loop"):
        write_pd(parse_braid("s1^3", strands=3))
    with pytest.raises(NotationError, match="uncertain crossing index must be 0..2"):
        write_pd(Diagram(TREFOIL), uncertain=[3])

"""Tests of knotsift.notations.detect and of agreement between the notations."""

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from known_knots import (
    BRAIDS,
    CONWAY,
    DT_CODES,
    NAMES,
    RIGHT_TREFOIL,
    jones,
    same_up_to_mirror,
)

import knotsift.notations as notations
from knotsift.diagram import Diagram
from knotsift.errors import DiagramError, NotationError
from knotsift.notations import (
    NOTATIONS,
    detect_notation,
    parse_any,
    parse_any_with_uncertain,
    parse_braid,
    parse_dt,
    parse_gauss,
    parse_pd,
    parse_rational,
    write_braid,
    write_dt,
    write_gauss,
    write_pd,
)


@pytest.mark.parametrize("text,notation", [
    ("PD[X[1,5,2,4], X[3,1,4,6], X[5,3,6,2]]", "pd"),
    ("[[1,5,2,4],[3,1,4,6],[5,3,6,2]]", "pd"),
    ('[[1,5,2,4,"?"],[3,1,4,6],[5,3,6,2]]', "pd"),
    ("(1,5,2,4) (3,1,4,6)? (5,3,6,2)", "pd"),
    ("X[1,5,2,4] X[3,1,4,6] X[5,3,6,2]", "pd"),
    ("[]", "pd"),
    ("(1,5,2,4)\n(3,1,4,6)\n(5,3,6,2)", "pd"),
    ("4 6 2", "dt"),
    ("[4, -6, 2]", "dt"),
    ("DT: 4 8 10 2 6", "dt"),
    ("dt[4 6 2]", "dt"),
    ("O1+ U2+ O3+ U1+ O2+ U3+", "gauss"),
    ("o1 u2 o3 u1 o2 u3", "gauss"),
    ("-1 3 -2 1 -3 2", "gauss"),
    ("-1 3 -2 1 -3 2 ; + + +", "gauss"),
    ("[[1, -2], [2, -1]]", "gauss"),
    ("1 -2\n2 -1", "gauss"),
    ("()", "gauss"),
    ("Gauss: 1 -2 3 -1 2 -3", "gauss"),
    ("1 1 1", "braid"),
    ("1 -2 1 -2", "braid"),
    ("s1^3 s2^-1 s1", "braid"),
    ("(s1 s2)^3", "braid"),
    ("aaaB", "braid"),
    ("σ1 σ1 σ1", "braid"),
    ("braid: 2 4", "braid"),
    ("2 4 6", "dt"),
    ("2 4 4", "braid"),
    ("3", "conway"),
    ("2112", "conway"),
    ("[2112]", "conway"),
    ("Conway: 3 2", "conway"),
    ("3 2", "braid"),
])
def test_detect_notation(text, notation):
    """The documented detection rules."""
    assert detect_notation(text) == notation


@pytest.mark.parametrize("name", NAMES)
def test_parse_any_cross_notation_agreement(name):
    """The same knot written as DT code, Conway notation, braid word, Gauss code and PD code
    (tables from memory) gives one Jones polynomial up to mirror image; detection picks the
    notation."""
    reference = jones(parse_dt(DT_CODES[name]))
    texts = ["DT: " + DT_CODES[name], "Conway: " + CONWAY[name]]
    if name in BRAIDS:
        texts.append(BRAIDS[name])
    d = parse_dt(DT_CODES[name])
    texts += [write_gauss(d), write_pd(d)]
    for text in texts:
        assert same_up_to_mirror(jones(parse_any(text)), reference), text


@pytest.mark.parametrize("name", NAMES)
def test_parse_any_written_forms_keep_chirality(name):
    """What the writers produce is read back by detection as the same oriented knot."""
    d = parse_rational(CONWAY[name])
    for text in (write_pd(d), write_gauss(d), "DT: " + write_dt(d)):
        assert jones(parse_any(text)) == jones(d), text


def test_parse_any_braid_writer():
    word = [1, 1, 1, -2, 1, -2]
    for style in ("sigma", "letters", "list"):
        assert parse_any(write_braid(word, style=style)) == parse_braid(word)


@pytest.mark.parametrize("text,notation", [
    ("4 6 2", "dt"), ("1 1 1", "braid"), ("3", "conway"), ("1 -2 3 -1 2 -3", "gauss"),
    ("[[1,5,2,4],[3,1,4,6],[5,3,6,2]]", "pd"),
])
def test_parse_any_matches_direct_parser(text, notation):
    from knotsift.notations.conway_algebraic import parse_conway_notation
    direct = {"pd": parse_pd, "dt": parse_dt, "gauss": parse_gauss, "braid": parse_braid,
              "conway": parse_conway_notation}[notation]
    assert parse_any(text) == direct(text)
    assert parse_any(text, notation=notation) == direct(text)


def test_parse_any_notation_override():
    """An explicit notation skips detection: "3 2" as Conway notation is 5_2 (from memory:
    determinant 7)."""
    d = parse_any("3 2", notation="conway")
    assert d.number_of_crossings() == 5 and d.is_knot()
    assert parse_any("3 2", notation="CONWAY") == d
    assert parse_any("Conway: 3 2", notation="conway") == d
    assert parse_any("3", notation="braid").free_loops == 2


def test_parse_any_with_uncertain():
    d, unsure = parse_any_with_uncertain("(1,5,2,4) (3,1,4,6) (5,3,6,2)?")
    assert unsure == [2] and jones(d) == RIGHT_TREFOIL
    d, unsure = parse_any_with_uncertain("O1+ U2+? O3+ U1+ O2+ U3+")
    assert unsure == [1] and jones(d) == RIGHT_TREFOIL
    assert parse_any_with_uncertain("4 6 2") == (parse_dt("4 6 2"), [])


def test_parse_any_unknot_forms():
    for text in ("[]", "()", "1", "Conway: 1", "braid: "):
        assert jones(parse_any(text)) == jones(Diagram.unknot()), text


@pytest.mark.parametrize("text,notation,fragment", [
    ("4 6 2", "dowker", "unknown notation 'dowker'; expected one of pd, dt, gauss, braid, conway"),
    ("4 6 2", 3, "unknown notation 3"),
    ("", None, "empty text"),
    ("   ", None, "empty text"),
    ("#!", None, "cannot tell the notation: unexpected '#'"),
    ("4 6 3", "dt", "odd label 5"),
])
def test_parse_any_malformed(text, notation, fragment):
    with pytest.raises(NotationError) as info:
        parse_any(text, notation=notation)
    assert fragment in str(info.value)


def test_detect_notation_not_text():
    with pytest.raises(NotationError, match="expected text, got list"):
        detect_notation([4, 6, 2])


def test_package_exports():
    """The package re-exports every public name of its modules."""
    assert set(NOTATIONS) == {"pd", "dt", "gauss", "braid", "conway"}
    for name in notations.__all__:
        assert callable(getattr(notations, name)) or name == "NOTATIONS"


_ALPHABET = st.sampled_from(list("0123456789-+ ,[](){}|;?OUouXxsSaBb^_\n:\"") +
                            ["PD", "DT", "Gauss:", "X[", "s1", "O1+", "U1-", "\u2212", "σ"])


@settings(max_examples=300, deadline=None)
@given(st.lists(_ALPHABET, max_size=16).map("".join))
def test_parsers_raise_only_notation_errors(text):
    """Whatever the text, the parsers return a diagram or raise NotationError/DiagramError."""
    for parse in (parse_any, parse_pd, parse_dt, parse_gauss, parse_braid, parse_rational):
        try:
            assert isinstance(parse(text), Diagram)
        except (NotationError, DiagramError):
            pass


@pytest.mark.parametrize("parse,text,fragment", [
    (parse_gauss, "(" * 50 + ")" * 50, "nested more than 8 deep"),
    (parse_pd, "[" * 5000 + "]" * 5000, "nested too deeply"),
    (parse_braid, "s123456789", "too large"),
    (parse_braid, [10 ** 20], "too large"),
    (parse_rational, [10 ** 20], "more than 100000 crossings"),
])
def test_parsers_refuse_huge_input(parse, text, fragment):
    with pytest.raises(NotationError) as info:
        parse(text)
    assert fragment in str(info.value)


@pytest.mark.parametrize("text", [".2.20", "8*", "3:2:2", "8*20.20", "-20:-20:-20"])
def test_detect_algebraic_conway(text):
    """Conway's polyhedral and algebraic forms are recognised by their '*', '.' or ':'."""
    assert detect_notation(text) == "conway"

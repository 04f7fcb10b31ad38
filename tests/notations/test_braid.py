"""Tests of knotsift.notations.braid."""

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from known_knots import (
    BRAIDS,
    DETERMINANTS,
    DT_CODES,
    JONES,
    POSITIVE_HOPF,
    RIGHT_TREFOIL,
    UNLINK2,
    determinant,
    expected_jones,
    jones,
    same_up_to_mirror,
)

from knotsift.diagram import Diagram
from knotsift.errors import NotationError
from knotsift.notations.braid import braid_word, parse_braid, write_braid
from knotsift.notations.dt import parse_dt

words = st.lists(st.sampled_from([1, 2, 3, -1, -2, -3]), min_size=0, max_size=8)


def test_parse_braid_trefoil_is_right_handed():
    """sigma_1^3 closes to the right-handed trefoil (the module's convention; Jones of the
    right-handed trefoil: common practice)."""
    assert jones(parse_braid("s1^3")) == RIGHT_TREFOIL
    assert jones(parse_braid([-1, -1, -1])) == RIGHT_TREFOIL.mirror()
    assert parse_braid("s1^3").signs() == (1, 1, 1)


def test_parse_braid_hopf_link():
    """sigma_1^2 closes to the positive Hopf link (common practice)."""
    d = parse_braid("s1^2")
    assert d.number_of_components() == 2
    assert d.linking_number(0, 1) == 1
    assert jones(d) == POSITIVE_HOPF


@pytest.mark.parametrize("name", sorted(BRAIDS))
def test_parse_braid_known_knots(name):
    """Braid words from memory give the knot of the DT code (up to mirror) and the Jones
    polynomial and determinant from memory."""
    d = parse_braid(BRAIDS[name])
    assert d.is_knot()
    assert same_up_to_mirror(jones(d), jones(parse_dt(DT_CODES[name])))
    assert determinant(d) == DETERMINANTS[name]
    if name in JONES:
        assert same_up_to_mirror(jones(d), expected_jones(name))


@pytest.mark.parametrize("text", [
    "s1^3 s2^-1 s1", "aaaBa", "[1, 1, 1, -2, 1]", "1 1 1 -2 1", "σ1^3 σ2^{-1} σ1",
    "s_1 s_1 s_1 S2 s1", "(s1)^3 s2^(-1) s1", "braid: 1,1,1,-2,1", "a^3 B a",
    "(s1 s1 s1 S2 s1)^1", "1 1 1 −2 1",
])
def test_braid_word_forms(text):
    """All spellings give the same word."""
    assert braid_word(text) == [1, 1, 1, -2, 1]


def test_braid_word_group_powers():
    """A group power repeats the group; a negative one is the inverse braid."""
    assert braid_word("(s1 s2)^3") == [1, 2] * 3
    assert braid_word("(1 -2)^-2") == [2, -1, 2, -1]
    assert braid_word("") == []


def test_parse_braid_free_strands():
    """Strands without crossings are free loops: V(L and a split circle) = -(t^1/2 + t^-1/2) V(L)
    (common practice)."""
    d = parse_braid("s1^3", strands=3)
    assert d.free_loops == 1
    assert jones(d) == RIGHT_TREFOIL * UNLINK2
    assert parse_braid("", strands=2) == Diagram([], free_loops=2)
    assert parse_braid("s2 s2").free_loops == 1


def _cycles(word, strands):
    perm = list(range(strands + 1))
    for g in word:
        i = abs(g)
        perm[i], perm[i + 1] = perm[i + 1], perm[i]
    seen, count = set(), 0
    for p in range(1, strands + 1):
        if p not in seen:
            count += 1
            while p not in seen:
                seen.add(p)
                p = perm[p]
    return count


@settings(max_examples=60, deadline=None)
@given(words)
def test_parse_braid_components_and_writhe(word):
    """Components = cycles of the braid's permutation; writhe = exponent sum (common practice)."""
    d = parse_braid(word, strands=4)
    assert d.number_of_components() == _cycles(word, 4)
    assert d.writhe() == sum(1 if g > 0 else -1 for g in word)


@settings(max_examples=40, deadline=None)
@given(words.filter(bool), st.integers(min_value=0, max_value=7))
def test_parse_braid_conjugation_invariance(word, shift):
    """Cyclically permuting the word gives the same link (Markov's theorem, common practice)."""
    k = shift % len(word)
    assert jones(parse_braid(word[k:] + word[:k], strands=4)) == jones(parse_braid(word, strands=4))


@settings(max_examples=40, deadline=None)
@given(words, st.sampled_from([1, -1]))
def test_parse_braid_stabilisation_invariance(word, sign):
    """Adding sigma_4^(+-1) on a fifth strand gives the same link (Markov's theorem, common
    practice)."""
    assert jones(parse_braid(word + [4 * sign], strands=5)) == jones(parse_braid(word, strands=4))


@settings(max_examples=40, deadline=None)
@given(words.filter(bool), st.sampled_from(["sigma", "list", "letters"]))
def test_write_braid_round_trip(word, style):
    assert braid_word(write_braid(word, style=style)) == word


def test_write_braid_examples():
    assert write_braid([1, 1, 1, -2, 1]) == "s1^3 s2^-1 s1"
    assert write_braid([-3, -3]) == "s3^-2"
    assert write_braid([1, -2], style="letters") == "aB"
    assert write_braid([1, -2], style="list") == "[1, -2]"


@pytest.mark.parametrize("text,fragment", [
    ("s0", "generator 0 does not exist"),
    ("1 0 1", "generator 0 does not exist"),
    ("s1^", "expected an integer exponent after '^'"),
    ("s1^x", "expected an integer exponent after '^'"),
    ("(1 2", "'(' is never closed"),
    ("1 2)", "')' without a matching '('"),
    ("[1 2", "'[' is never closed"),
    ("1 $ 2", "unexpected character '$'"),
    ("1 ^2", "unexpected character '^'"),
    ("[1] 2", "after the closing bracket"),
    ("s_", "expected a generator number after 's_'"),
    ("- 1", "expected a generator number after '-'"),
    ("s1^100001", "more than 100000 crossings"),
])
def test_braid_word_malformed(text, fragment):
    """Bad braid words raise NotationError with the token and position."""
    with pytest.raises(NotationError) as info:
        braid_word(text)
    assert fragment in str(info.value)


def test_braid_word_malformed_where():
    with pytest.raises(NotationError) as info:
        braid_word("1 2 $")
    assert info.value.where == "token 2, position 5"


@pytest.mark.parametrize("word,strands,fragment", [
    ([1, 2], 2, "expected 3 to 100000 strands"),
    ([1], "2", "expected 2 to 100000 strands"),
    ([1, 1.5], None, "non-zero integer generator"),
    ([True], None, "non-zero integer generator"),
    (42, None, "expected text or a sequence"),
])
def test_parse_braid_malformed_arguments(word, strands, fragment):
    with pytest.raises(NotationError) as info:
        parse_braid(word, strands=strands)
    assert fragment in str(info.value)


def test_write_braid_bad_style():
    with pytest.raises(NotationError, match="unknown style"):
        write_braid([1], style="roman")
    with pytest.raises(NotationError, match="sigma_26"):
        write_braid([27], style="letters")

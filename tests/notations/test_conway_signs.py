"""Signed entries in Conway's notation: a minus written against an entry is that entry's sign.

Each signed notation is checked against a rational tangle built independently
of the parser: the test computes the continued fraction ``an + 1/(... + 1/a1)``
itself (with :class:`fractions.Fraction`), rewrites it as Schubert's normal
form ``b(p, q)`` and builds the 4-plat of the all-positive continued fraction
of ``p/q`` (Euclid's algorithm) with :func:`knotsift.notations.conway.parse_rational`,
a construction separate from the tangle algebra behind ``parse_conway_notation``.

Facts used: the fraction of Conway's notation ``a1 a2 ... an`` is
``an + 1/(a(n-1) + ... + 1/a1)`` (Conway 1970 notation conventions, from
memory); the determinant of the 2-bridge knot ``b(p, q)`` is ``p``, and
``b(p, q)`` equals ``b(p, q')`` exactly when ``q' = q^(+1 or -1) mod p``, its
mirror image being ``b(p, -q)`` (Schubert 1956, "Knoten mit zwei Brücken").
"""

from fractions import Fraction

import pytest

from knotsift.invariants.jones import jones_polynomial
from knotsift.notations.conway import parse_rational
from knotsift.notations.conway_algebraic import parse_conway_notation


def signed_entries(text: str) -> list[int]:
    """The entries of a spaced, signed run, read by the test itself (no parser involved)."""
    return [int(t.replace("\u2212", "-")) for t in text.split()]


def schubert_form(entries: list[int]) -> tuple[int, int]:
    """(p, q) with 0 < q < p of the fraction an + 1/(... + 1/a1) (Schubert 1956)."""
    f = Fraction(entries[0])
    for a in entries[1:]:
        f = a + 1 / f
    p = abs(f.numerator)
    return p, (f.denominator if f > 0 else -f.denominator) % p


def positive_entries(p: int, q: int) -> list[int]:
    """All-positive Conway entries a1 ... an of p/q, by Euclid's algorithm."""
    out = []
    while q:
        out.append(p // q)
        p, q = q, p % q
    return out[::-1]


# Negative entries at every position: first, middle, last, several, all.
SIGNED = [
    "-2 3", "2 -3", "-1 -1 -1", "-3 2", "3 -2", "-3 -2", "-2 1 3", "3 1 -2", "-3 1 2",
    "-2 -1 -3", "-4 3", "4 -3", "-5 2", "-2 2 3", "2 2 -3", "3 -3 2", "-3 1 3",
    "3 -1 3", "3 1 -3", "-3 -3 -3", "4 -1 -3", "-7 2", "\u22122 5",
    "-1 2 -3 4 -5",
]


@pytest.mark.parametrize("text", SIGNED)
def test_signed_conway_matches_schubert_normal_form(text):
    """Determinant = numerator p, and the knot (chirality included) is b(p, q) built as the
    positive continued fraction of p/q (Schubert 1956; Conway 1970 conventions, from memory)."""
    p, q = schubert_form(signed_entries(text))
    assert p % 2 == 1 and p > 1, "the list holds knots, not links or the unknot"
    d = parse_conway_notation(text)
    v = jones_polynomial(d)
    assert d.is_knot()
    assert abs(round(v.evaluate(-1).real if isinstance(v.evaluate(-1), complex)
                     else v.evaluate(-1))) == p
    reference = jones_polynomial(parse_rational(positive_entries(p, q)))
    inverse = jones_polynomial(parse_rational(positive_entries(p, pow(q, -1, p))))
    assert reference == inverse  # b(p, q) = b(p, q^-1): the check can tell knots apart
    assert v == reference
    mirror = jones_polynomial(parse_rational(positive_entries(p, p - q)))
    if mirror != reference:  # a chiral knot: the wrong sign reading would show here
        assert v != mirror


def test_leading_minus_is_the_first_entrys_sign():
    """'-2 3' is '(-2) 3' (fraction 3 - 1/2 = 5/2, the figure-eight knot, determinant 5), not
    '-(2 3)' (the mirror of 5_2, determinant 7); '2 -3' is its mirror (Schubert 1956)."""
    v = jones_polynomial(parse_conway_notation("-2 3"))
    assert v == jones_polynomial(parse_conway_notation("(-2) 3"))
    assert v == jones_polynomial(parse_conway_notation("2 -3")).mirror()
    assert abs(v.evaluate(-1)) == 5
    assert abs(jones_polynomial(parse_conway_notation("- 2 3")).evaluate(-1)) == 7


def test_all_negative_run_is_the_mirror():
    """'-1 -1 -1' is the mirror image of '1 1 1' (fraction -3/2 against 3/2); both are
    trefoils, and -3/2 = b(3, 1) is the knot of '3' (Schubert 1956: 2 = -1 mod 3)."""
    v = jones_polynomial(parse_conway_notation("-1 -1 -1"))
    assert v == jones_polynomial(parse_conway_notation("1 1 1")).mirror()
    assert v != v.mirror()
    assert v == jones_polynomial(parse_conway_notation("3"))
    assert jones_polynomial(parse_conway_notation("-3")) == v.mirror()

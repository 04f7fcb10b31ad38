"""Tests of knotsift.tangle: Conway's tangle operations and rational tangles."""

import itertools
import random
from fractions import Fraction

import pytest

from knotsift.errors import DiagramError
from knotsift.invariants.jones import jones_polynomial
from knotsift.laurent import Laurent
from knotsift.tangle import (
    Tangle,
    continued_fraction,
    fraction_entries,
    integer_tangle,
    ramification,
    rational_tangle,
    tangle_from_fraction,
)

# Jones polynomials of the rational knots, one chirality each, compared up to
# t -> 1/t (from memory; the right-handed trefoil is common practice).
RATIONAL_JONES = {
    "3_1": ([3], "t + t^3 - t^4"),
    "4_1": ([2, 2], "t^-2 - t^-1 + 1 - t + t^2"),
    "5_1": ([5], "t^2 + t^4 - t^5 + t^6 - t^7"),
    "5_2": ([3, 2], "t - t^2 + 2t^3 - t^4 + t^5 - t^6"),
    "6_1": ([4, 2], "t^-4 - t^-3 + t^-2 - 2t^-1 + 2 - t + t^2"),
    "6_2": ([3, 1, 2], "t^-1 - 1 + 2t - 2t^2 + 2t^3 - 2t^4 + t^5"),
    "6_3": ([2, 1, 1, 2], "-t^-3 + 2t^-2 - 2t^-1 + 3 - 2t + 2t^2 - t^3"),
    "7_1": ([7], "t^3 + t^5 - t^6 + t^7 - t^8 + t^9 - t^10"),
    "7_2": ([5, 2], "-t^-8 + t^-7 - t^-6 + 2t^-5 - 2t^-4 + 2t^-3 - t^-2 + t^-1"),
    "7_3": ([4, 3], "t^2 - t^3 + 2t^4 - 2t^5 + 3t^6 - 2t^7 + t^8 - t^9"),
    "7_4": ([3, 1, 3], "t - 2t^2 + 3t^3 - 2t^4 + 3t^5 - 2t^6 + t^7 - t^8"),
}

# Determinants of the rational knots through 7 crossings (Rolfsen 1976, Appendix C; from memory).
RATIONAL_DETERMINANTS = {
    "3": 3, "22": 5, "5": 5, "32": 7, "42": 9, "312": 11, "2112": 13, "7": 7, "52": 11,
    "43": 13, "313": 15, "322": 17, "2212": 19, "21112": 21,
}


def jones(d) -> Laurent:
    return jones_polynomial(d)


def determinant(d) -> int:
    """|V(-1)| (common practice: the determinant of a knot)."""
    value = jones(d).evaluate(-1)
    return abs(round(value.real if isinstance(value, complex) else value))


def compositions(total: int):
    """All sequences of positive digits with the given sum."""
    for k in range(1, total + 1):
        for parts in itertools.product(range(1, total + 1), repeat=k):
            if sum(parts) == total:
                yield list(parts)


SMALL_RATIONALS = [e for n in range(1, 8) for e in compositions(n)]


def test_integer_tangle_three_is_right_handed_trefoil():
    """N(3) is the right-handed trefoil, t + t^3 - t^4, with three positive crossings.

    The module's stated sign convention; the Jones polynomial of the right-handed
    trefoil is common practice.
    """
    d = integer_tangle(3).numerator()
    assert jones(d) == Laurent.parse("t + t^3 - t^4")
    assert d.signs() == (1, 1, 1)
    assert jones(integer_tangle(-3).numerator()) == Laurent.parse("t^-1 + t^-3 - t^-4")


@pytest.mark.parametrize("name", sorted(RATIONAL_JONES))
def test_rational_tangle_numerator_jones(name):
    """The numerator closure of a1...an is the rational knot of Conway's table (Conway 1970).

    Jones polynomials from memory, compared up to mirror image.
    """
    entries, expected = RATIONAL_JONES[name]
    d = rational_tangle(entries).numerator()
    v, w = jones(d), Laurent.parse(expected)
    assert d.is_knot()
    assert v in (w, w.mirror())


@pytest.mark.parametrize("code", sorted(RATIONAL_DETERMINANTS))
def test_rational_tangle_determinant_table(code):
    """Determinants of the rational knots through 7 crossings (Rolfsen 1976; from memory)."""
    d = rational_tangle([int(c) for c in code]).numerator()
    assert d.number_of_crossings() == sum(int(c) for c in code)
    assert determinant(d) == RATIONAL_DETERMINANTS[code]


@pytest.mark.parametrize("entries", SMALL_RATIONALS, ids=lambda e: "".join(map(str, e)))
def test_rational_tangle_determinant_is_numerator(entries):
    """The rational knot of fraction p/q has determinant p (Schubert 1956; common practice)."""
    f = continued_fraction(entries)
    d = rational_tangle(entries).numerator()
    if f.numerator % 2 == 0:
        assert d.number_of_components() == 2
        return
    assert d.is_knot()
    assert determinant(d) == f.numerator


@pytest.mark.parametrize("entries", SMALL_RATIONALS, ids=lambda e: "".join(map(str, e)))
def test_rational_tangle_positive_entries_alternate(entries):
    """Positive entries give an alternating diagram (Conway 1970; common practice)."""
    d = rational_tangle(entries).numerator()
    if d.number_of_crossings() > 1:
        assert d.is_alternating()


@pytest.mark.parametrize("entries,fraction", [
    ([2, 1, 1, 2], Fraction(13, 5)),  # 6_3 (Conway 1970, from memory)
    ([3, 1, 2], Fraction(11, 4)),  # 6_2
    ([4, 2], Fraction(9, 4)),  # 6_1
    ([3, 2], Fraction(7, 3)),  # 5_2
    ([2, 2], Fraction(5, 2)),  # 4_1
    ([2, 0], Fraction(1, 2)),  # a trailing 0 reflects (Conway 1970)
    ([2, 1, 0], Fraction(2, 3)),
])
def test_continued_fraction_conway_order(entries, fraction):
    """a1 a2 ... an has fraction an + 1/(a(n-1) + ... + 1/a1) (Conway 1970)."""
    assert continued_fraction(entries) == fraction


def test_continued_fraction_infinity():
    """The tangle 0 has fraction 0 and its reflection 0 0 is infinity, 1/0 (Conway 1970)."""
    assert continued_fraction([0]) == 0
    assert continued_fraction([0, 0]) is None  # 0 reflected is infinity


@pytest.mark.parametrize("f", [Fraction(p, q) for p in range(-9, 10) for q in range(1, 7)
                               if Fraction(p, q).denominator == q])
def test_fraction_entries_round_trip(f):
    """The shortest entries of a fraction give it back, all of one sign (common practice)."""
    entries = fraction_entries(f)
    assert continued_fraction(entries) == f
    assert all(a >= 0 for a in entries) or all(a <= 0 for a in entries)
    t = tangle_from_fraction(f)
    assert t.number_of_crossings() == sum(abs(a) for a in entries)


def same_quad(q, r) -> bool:
    """Quads are equal up to starting at the other end of the under-strand."""
    return tuple(r) in (tuple(q), tuple(q[2:]) + tuple(q[:2]))


# Rational tangles with an odd denominator, so that the denominator closure is a knot.
ODD_DENOMINATORS = [[3, 2], [2, 1, 1, 2], [5, 2], [2, 1, 2]]


@pytest.mark.parametrize("entries", ODD_DENOMINATORS)
def test_reflection_is_an_involution_that_swaps_closures(entries):
    """(a0)0 = a, and N(a0) is the mirror of D(a): a0 is a reflection (Conway 1970)."""
    t = rational_tangle(entries)
    twice = t.reflection().reflection()
    assert twice.crossings == t.crossings and twice.ends == t.ends
    assert t.denominator().is_knot()
    assert jones(t.reflection().numerator()) == jones(t.denominator()).mirror()


@pytest.mark.parametrize("entries", ODD_DENOMINATORS)
def test_rotation_quarter_turn(entries):
    """Four quarter turns are the identity; N of the turned tangle is D (a plane rotation)."""
    t = rational_tangle(entries)
    r = t
    for _ in range(4):
        r = r.rotation()
    assert r.ends == t.ends
    assert jones(t.rotation().numerator()) == jones(t.denominator())


@pytest.mark.parametrize("entries", [[3], [3, 2], [2, 1, 1, 2], [3, 1, 3]])
def test_mirror_inverts_jones(entries):
    """-a has the mirror closure: V(t) -> V(1/t) (common practice)."""
    t = rational_tangle(entries)
    assert jones((-t).numerator()) == jones(t.numerator()).mirror()
    back = t.mirror().mirror()
    assert all(same_quad(q, r) for q, r in zip(back.crossings, t.crossings, strict=True))


def test_zero_and_infinity_closures():
    """N(0) and D(infinity) are the 2-component unlink, D(0) and N(infinity) the unknot.

    Fractions 0/1 and 1/0 (Conway 1970; common practice).
    """
    assert Tangle.zero().numerator().number_of_components() == 2
    assert Tangle.zero().denominator().number_of_components() == 1
    assert Tangle.infinity().numerator().number_of_components() == 1
    assert Tangle.infinity().denominator().number_of_components() == 2
    twice = Tangle.infinity() + Tangle.infinity()  # infinity plus infinity leaves a circle
    assert twice.free_loops == 1 and twice.numerator().number_of_components() == 2


@pytest.mark.parametrize("entries,n", [([2, 2], 1), ([3, 2], -2), ([2, 1, 1, 2], 2), ([3], 0),
                                       ([4, 3], -1)])
def test_sum_with_integer_adds_to_fraction(entries, n):
    """F(a + n) = F(a) + n for a rational tangle a (Conway 1970), seen in the determinant."""
    t = rational_tangle(entries) + integer_tangle(n)
    f = continued_fraction(entries) + n
    d = t.numerator()
    assert d.is_knot()
    assert determinant(d) == abs(f.numerator)


def test_sum_with_zero_is_identity():
    """a + 0 = a (Conway 1970)."""
    t = rational_tangle([3, 1, 2])
    assert jones((t + Tangle.zero()).numerator()) == jones(t.numerator())
    assert jones((Tangle.zero() + t).numerator()) == jones(t.numerator())


def test_product_is_reflection_plus():
    """ab = a0 + b (Conway 1970)."""
    a, b = rational_tangle([2, 1]), rational_tangle([3])
    assert jones((a * b).numerator()) == jones((a.reflection() + b).numerator())
    assert (a * b).number_of_crossings() == 6


@pytest.mark.parametrize("p,q,r", [(3, 3, 2), (3, 3, -2), (5, 3, -2), (3, 3, 3), (4, 3, 3),
                                   (-3, 5, 7), (3, 5, 7), (2, 3, 5), (1, 1, 1)])
def test_ramification_pretzel_determinant(p, q, r):
    """The ramification p,q,r closes to P(p, q, r), determinant |pq + qr + rp| (common practice)."""
    t = ramification([integer_tangle(p), integer_tangle(q), integer_tangle(r)])
    d = t.numerator()
    assert d.number_of_crossings() == abs(p) + abs(q) + abs(r)
    if d.is_knot():
        assert determinant(d) == abs(p * q + q * r + r * p)


def test_tangle_relabel_invariance():
    """Relabelling the edges of a tangle and reordering its crossings keeps the closure's Jones.

    Seeded shuffle to rule out accidentally-correct behaviour (common practice).
    """
    rng = random.Random(1970)
    t = rational_tangle([2, 1, 1, 2])
    labels = sorted(t.labels())
    for _ in range(5):
        image = rng.sample(range(100, 200), len(labels))
        m = dict(zip(labels, image, strict=True))
        quads = [tuple(m[e] for e in q) for q in t.crossings]
        rng.shuffle(quads)
        u = Tangle(quads, [m[e] for e in t.ends])
        assert jones(u.numerator()) == jones(t.numerator())


def test_tangle_validation():
    """A label must appear exactly twice among crossings and ends; quads have 4 labels."""
    with pytest.raises(DiagramError, match="exactly twice"):
        Tangle([(1, 2, 3, 4)], (1, 2, 3, 5))
    with pytest.raises(DiagramError, match="4 integer labels"):
        Tangle([(1, 2, 3)], (1, 2, 3, 3))
    with pytest.raises(DiagramError, match="end labels"):
        Tangle([], (1, 1, 2))
    with pytest.raises(ValueError):
        integer_tangle(1).end("north")

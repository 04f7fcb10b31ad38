"""Tests of the exact Laurent polynomial type."""

from fractions import Fraction

import pytest
import sympy
from hypothesis import given
from hypothesis import strategies as st

from knotsift.errors import PolynomialError
from knotsift.laurent import Laurent

terms = st.dictionaries(
    st.integers(-12, 12).map(lambda k: Fraction(k, 2)), st.integers(-50, 50), max_size=8)


@given(terms)
def test_canonical_text_round_trip(t):
    """Parsing the canonical text gives back the same polynomial."""
    p = Laurent(t)
    assert Laurent.parse(str(p)) == p
    assert hash(Laurent.parse(str(p))) == hash(p)


@given(terms, terms)
def test_product_matches_sympy(a, b):
    """Multiplication agrees with sympy's expansion (a general-purpose reference library)."""
    x = sympy.Symbol("x")  # x = t^(1/2)
    pa, pb = Laurent(a), Laurent(b)

    def to_sympy(p):
        return sum(c * x ** int(2 * e) for e, c in p.terms())

    expected = sympy.expand(to_sympy(pa) * to_sympy(pb))
    assert sympy.expand(to_sympy(pa * pb) - expected) == 0


@given(terms, terms)
def test_sum_and_difference(a, b):
    """p + q - q == p and p - p == 0."""
    p, q = Laurent(a), Laurent(b)
    assert (p + q) - q == p
    assert (p - p).is_zero()


@given(terms)
def test_mirror_is_an_involution(t):
    """t -> 1/t twice is the identity, and mirror reverses the exponents."""
    p = Laurent(t)
    assert p.mirror().mirror() == p
    if not p.is_zero():
        assert p.mirror().max_exponent == -p.min_exponent


@pytest.mark.parametrize("text, expected", [
    ("t + t^3 - t^4", {1: 1, 3: 1, 4: -1}),
    ("2*t**3 - 1", {3: 2, 0: -1}),
    ("1/t - 1 + t", {-1: 1, 0: -1, 1: 1}),
    ("-t^(1/2) - t^(5/2)", {Fraction(1, 2): -1, Fraction(5, 2): -1}),
    ("t^-2 - t^-1 + 1 - t + t^2", {-2: 1, -1: -1, 0: 1, 1: -1, 2: 1}),
    ("3t^1/2", {Fraction(1, 2): 3}),
    ("  t  ^ 2 +t", {2: 1, 1: 1}),
    ("0", {}),
])
def test_parse_variants(text, expected):
    """Common ways of typing a polynomial parse to the same value."""
    assert Laurent.parse(text) == Laurent(expected)


@pytest.mark.parametrize("text, fragment", [
    ("", "empty"),
    ("t +", "position"),
    ("t ++ x", "position"),
    ("t t", "unexpected character"),
    ("t^(1/3)", "halves"),
    ("t^", "exponent"),
    ("__import__('os')", "position 1"),
    ("1.5t", "position"),
    ("t^(2", "')'"),
    ("3/x", "after '/'"),
])
def test_parse_errors(text, fragment):
    """Malformed text gives a PolynomialError naming the place, never evaluation."""
    with pytest.raises(PolynomialError) as info:
        Laurent.parse(text)
    assert fragment in str(info.value)


def test_invalid_terms_rejected():
    """Exponents finer than halves and non-integer coefficients are refused."""
    with pytest.raises(PolynomialError):
        Laurent({Fraction(1, 3): 1})
    with pytest.raises(PolynomialError):
        Laurent({1: 0.5})


def test_text_forms():
    """Readable, canonical and LaTeX forms of the right-handed trefoil's V (common practice)."""
    v = Laurent({1: 1, 3: 1, 4: -1})
    assert str(v) == "t + t^3 - t^4"
    assert v.to_text(descending=True) == "-t^4 + t^3 + t"
    assert v.latex() == "-t^{4} + t^{3} + t"
    assert Laurent({Fraction(-3, 2): 2}).latex() == "2t^{-3/2}"
    assert str(Laurent()) == "0"


def test_evaluate_and_span():
    """Evaluation, span and symmetry of the figure-eight polynomial -t^-1 + 3 - t."""
    a = Laurent.parse("-t^-1 + 3 - t")
    assert a.evaluate(1) == 1
    assert a.evaluate(-1) == 5
    assert a.span() == 2
    assert a.is_symmetric()
    assert not Laurent.parse("t + t^3 - t^4").is_symmetric()
    assert Laurent.parse("t^2").substitute_power(-2) == Laurent.parse("t^-4")


# -- canonical text read directly -------------------------------------------------
# Laurent.parse reads the canonical text (the table's own) without the general
# scanner; the general parser, polynomial_text.parse_laurent_terms, is the
# reference for both paths.
def _general(text: str, variable: str = "t") -> Laurent:
    from knotsift.polynomial_text import parse_laurent_terms

    return Laurent(parse_laurent_terms(text, variable))


@given(terms)
def test_canonical_text_read_directly_equals_general_parser(t):
    from knotsift.laurent import _parse_canonical

    p = Laurent(t)
    for variable in ("t", "q", "x"):
        text = p.to_text(variable)
        assert _parse_canonical(text, variable) == _general(text, variable) == p


@pytest.mark.parametrize("text", [
    "t^1", "+t", "1 +  t", "t^(2/2)", "02", "t^01", "1 + -t", "2*t", "t + t", "0 + t", "1t",
    "t^+1", "- t", "t^-0", "t^(--1/2)", "2 t", "t**2", "1/t", "t^(1/2)+1", "3 + 2t^2 - t",
    "t^(-1/2) - 2 + t^(1/2)",
])
def test_other_texts_read_as_the_general_parser_reads_them(text):
    from knotsift.laurent import _parse_canonical

    fast = _parse_canonical(text, "t")
    assert fast is None or fast.to_text() == text
    assert Laurent.parse(text) == _general(text)


@pytest.mark.parametrize("text", ["", "-", "²", "t^²", "t +", "2 ^ t", "t^(1/3)"])
def test_malformed_texts_still_raise(text):
    with pytest.raises(PolynomialError):
        Laurent.parse(text)


def test_every_table_polynomial_is_read_directly():
    """The table stores canonical text, so no table polynomial needs the general scanner."""
    from knotsift.laurent import _parse_canonical
    from knotsift.table import open_table

    texts = [x for f in open_table().all_forms() for x in (f.jones, f.alexander, f.rho_1)]
    assert len(texts) > 1000
    for text in texts:
        assert _parse_canonical(text, "t") == _general(text)

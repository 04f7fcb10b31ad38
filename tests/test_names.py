"""Name look-up (knotsift.names, ``knotsift show``): exact matches, refusals, guesses.

A look-up must never answer with a knot other than the one named: names the
table lacks are refused with the reason, fuzzy matches are marked as guesses.
"""

from __future__ import annotations

import json

import pytest

from knotsift.cli import main
from knotsift.diagram import Diagram
from knotsift.errors import TableError
from knotsift.identification import identify
from knotsift.laurent import Laurent
from knotsift.names import resolve_name
from knotsift.table import open_table


@pytest.fixture(scope="module")
def table():
    return open_table()


def torus_jones(p: int, q: int) -> Laurent:
    """V(T(p,q)) = t^((p-1)(q-1)/2) (1 - t^(p+1) - t^(q+1) + t^(p+q)) / (1 - t^2) for the
    positive torus knot (Jones 1987, from memory), by exact polynomial division."""
    num = [0] * (p + q + 1)
    for e, c in ((0, 1), (p + 1, -1), (q + 1, -1), (p + q, 1)):
        num[e] += c
    quo = [0] * (p + q - 1)  # dividing by 1 - t^2, lowest power first
    for k in range(len(quo)):
        quo[k] = num[k] + (quo[k - 2] if k >= 2 else 0)
    shift = (p - 1) * (q - 1) // 2
    return Laurent({k + shift: c for k, c in enumerate(quo) if c})


def form_of(found, table):
    forms = table.forms_of(found.match.name)
    if len(forms) == 1:
        return forms[0]
    return next(f for f in forms if f.is_reference != found.match.mirrored)


EXACT = [
    # query, table name, mirror image of the reference form
    ("3_1", "3_1", False),
    ("7-4", "7_4", False),
    ("74", "7_4", False),
    ("10132", "10_132", False),
    ("figure eight", "4_1", False),
    ("Figure-Eight", "4_1", False),
    ("trefoil", "3_1", False),
    ("3_1*", "3_1", True),
    ("3_1 mirror", "3_1", True),
    ("mirror image of 5_2", "5_2", True),
    ("T(2,3)", "3_1", False),
    ("T(3,2)", "3_1", False),
    ("T(2,-3)", "3_1", True),
    ("t(3, 4)", "8_19", False),
    ("4_1#3_1", "3_1#4_1", False),
    ("3_1 # 3_1*", "3_1#3_1*", False),
    ("3_1*#3_1*", "3_1#3_1", True),
    ("granny knot", "3_1#3_1", False),
    ("trefoil knot", "3_1", False),  # a trailing "knot" or leading "the" is not a typo
    ("the stevedore knot", "6_1", False),
    ("perko", "10_161", False),
]


@pytest.mark.parametrize("query,name,mirrored", EXACT)
def test_exact_names_aliases_and_variants(query, name, mirrored, table):
    """Names, aliases, digit variants, torus notation and sums match exactly (no guess)."""
    found = resolve_name(query, table)
    assert found.match is not None and not found.match.guess, found.reason
    assert (found.match.name, found.match.mirrored) == (name, mirrored)


@pytest.mark.parametrize("query,p,q,mirrored", [
    ("right-handed trefoil", 2, 3, False), ("left-handed trefoil", 2, 3, True),
    ("right handed cinquefoil", 2, 5, False), ("positive T(2,5)", 2, 5, False),
    ("left handed T(2,7)", 2, 7, True), ("right-handed T(3,4)", 3, 4, False),
    ("negative T(3,5)", 3, 5, True),
])
def test_handedness_of_torus_knots(query, p, q, mirrored, table):
    """Right-handed means the positive torus knot, whose Jones polynomial is the closed
    formula (Jones 1987, from memory); left-handed its mirror, V(1/t).  The right-handed
    trefoil has V = t + t^3 - t^4 and signature -2 (the project's convention, README)."""
    found = resolve_name(query, table)
    assert found.match is not None and found.match.mirrored == mirrored, found.reason
    v = Laurent.parse(form_of(found, table).jones)
    expected = torus_jones(p, q)
    assert v == (expected.mirror() if mirrored else expected)
    assert found.notes  # the reading of the handedness word is stated
    if (p, q) == (2, 3):
        assert str(v) == ("-t^-4 + t^-3 + t^-1" if mirrored else "t + t^3 - t^4")
        assert form_of(found, table).signature == (2 if mirrored else -2)


@pytest.mark.parametrize("query,negative_signature", [
    ("positive 5_2", True), ("negative 5_2", False), ("right-handed 7_2", True),
    ("left-handed 9_2", False)])
def test_handedness_of_positive_twist_knots(query, negative_signature, table):
    """Twist knots 5_2, 7_2, 9_2 have a positive diagram; the positive form has negative
    signature (positive knots have negative signature: Przytycki 1989, from memory) and its
    table diagram has only positive crossings (checked here from the stored PD code)."""
    found = resolve_name(query, table)
    assert found.match is not None, found.reason
    form = form_of(found, table)
    assert (form.signature < 0) == negative_signature
    signs = set(Diagram(form.pd()).signs())
    assert signs == ({1} if negative_signature else {-1})


def test_handedness_refused_or_explained(table):
    """A knot without a one-signed table diagram is refused with the reason; an amphichiral
    knot is shown with the remark that both hands are the same knot."""
    found = resolve_name("left-handed 6_1", table)
    assert found.match is None and "both signs" in found.reason
    found = resolve_name("left handed figure eight", table)
    assert found.match.name == "4_1" and "amphichiral" in found.notes[0]
    for both in ("right-handed T(2,-3)", "right-handed 3_1 mirror"):  # contradictory asks
        found = resolve_name(both, table)
        assert found.match is None and "at once" in found.reason


@pytest.mark.parametrize("query,words", [
    ("3_2", "no knot 3_2"),
    ("8_22", "no knot 8_22"),
    ("10_166", "no knot 10_166"),
    ("0_2", "fewer than 3"),
    ("11n42", "not in the shipped table"),
    ("K11n42", "not in the shipped table"),
    ("11a_1", "not in the shipped table"),
    ("11n_42", "not in the shipped table"),
    ("12_3", "through 10"),
    ("32", "no knot 3_2"),
    ("T(2,11)", "crossing number is 11"),
    ("T(2,4)", "not a knot"),
    ("6_1#5_1", "not in the shipped table"),
    ("left-handed", "only a chirality"),
])
def test_names_outside_the_table_are_refused(query, words, table):
    """Never a neighbour: the issue's 3_2, 8_22 and 11n42 printed 10_132, 8_2 and 10_142.
    Counts per crossing number (1, 21, 165 for 3, 8, 10) are Rolfsen's table (from memory);
    T(2,q) has crossing number q (min(p(q-1), q(p-1)), from memory)."""
    found = resolve_name(query, table)
    assert found.match is None and not found.suggestions
    assert words in found.reason, found.reason


def test_unknown_words_get_suggestions_or_a_marked_guess(table):
    """A typo with one clear candidate is a guess, marked; gibberish gets nothing."""
    found = resolve_name("figure-eigth", table)
    assert found.match.guess and found.match.name == "4_1"
    found = resolve_name("xyzzy", table)
    assert found.match is None
    with pytest.raises(TableError):
        resolve_name("  ", table)


def run(capsys, *argv):
    code = main(list(argv))
    out, err = capsys.readouterr()
    return code, out, err


@pytest.mark.parametrize("query", ["3_2", "8_22", "11n42"])
def test_show_refuses_names_outside_the_table(capsys, query):
    """The issue's exact inputs: exit code 1, nothing on standard output, the reason."""
    code, out, err = run(capsys, "show", query)
    assert code == 1 and out == ""
    assert "not in the shipped table" in err or "no knot" in err


def test_show_did_you_mean(capsys):
    """Several similar names: a "did you mean" list, exit code 1, no entry printed."""
    code, out, err = run(capsys, "show", "figure 8")
    assert code == 1 and out == "" and "did you mean" in err and "4_1" in err
    code, out, _ = run(capsys, "show", "figure 8", "--json")
    data = json.loads(out)
    assert code == 1 and data["found"] is False and "4_1" in data["did_you_mean"]


def test_show_left_handed_trefoil(capsys):
    """The issue's input printed the right-handed trefoil; it is the mirror form 3_1*."""
    code, out, _ = run(capsys, "show", "left-handed trefoil")
    assert code == 0 and out.startswith("3_1*")
    assert "-t^-4 + t^-3 + t^-1" in out and "note: left-handed" in out


@pytest.mark.parametrize("name", ["10_48", "10_71", "10_91", "10_104"])
def test_show_and_identify_agree_on_chirality(capsys, name, table):
    """Chiral knots whose invariants here equal their mirror's: both say undetermined."""
    code, out, _ = run(capsys, "show", name, "--json")
    info = json.loads(out)
    ref = next(f for f in table.forms_of(name) if f.is_reference)
    result = identify(Diagram(ref.pd()), table=table)
    assert result.candidates[0].name == name
    assert info["chirality"] == result.candidates[0].chirality == "undetermined"
    code, out, _ = run(capsys, "show", "3_1*", "--json")
    assert json.loads(out)["chirality"] == "mirror"

"""Drawing the shadow of an unsigned code: our interlacement rule against networkx's embedding.

Unsigned DT and Gauss codes fix the crossing signs through a planar drawing
of their shadow (knotsift.notations.gauss._shadow_signs).  The drawing comes
from the interlacement of the code; networkx's general planar embedding
(``_embedding_turns``, kept for shadows with parts of several components and
for codes the rule cannot draw) is the outside check here: networkx is a
general-purpose graph library.

A shadow cut by two edges into pieces can be drawn with each piece turned
over; the signs in such a piece depend on the drawing chosen, so there the
signs are compared up to turning the piece over, and exactly wherever the
drawing is unique.
"""

import random

import pytest

from knotsift.data_build.build import construct
from knotsift.data_build.sources import read_sources
from knotsift.errors import NotationError
from knotsift.notations import gauss
from knotsift.notations.dt import _walk, parse_dt, write_dt
from knotsift.notations.gauss import parse_gauss, write_gauss
from knotsift.reidemeister import scramble


def _reference(monkeypatch, call):
    """``call()`` with the interlacement rule switched off, so that networkx draws every shadow."""
    with monkeypatch.context() as m:
        m.setattr(gauss, "_interlacement_turns", lambda comps: None)
        return call()


def _outcome(call):
    """The result of ``call()``, or the message of the NotationError it raises."""
    try:
        return call()
    except NotationError as err:
        return f"error: {err}"


def _drawn_by_rule(comps) -> bool:
    """Whether the interlacement rule itself gives a planar drawing (no fallback needed)."""
    turn = gauss._interlacement_turns(comps)
    if turn is None:
        return False
    first = gauss._first_passages(comps)
    drawn = {c: turn[c] * (1 if comps[k][j][1] else -1) for c, (k, j) in first.items()}
    return gauss._nonplanar_part(gauss._quads(comps, drawn, sorted(first))) is None


def _interlaced_classes(word: list[int]) -> list[set[int]]:
    """Classes of crossings joined by interlacing (written here independently of the module)."""
    where: dict[int, list[int]] = {}
    for i, c in enumerate(word):
        where.setdefault(c, []).append(i)
    parent = {c: c for c in where}

    def find(c):
        while parent[c] != c:
            c = parent[c]
        return c

    for a, (a1, a2) in where.items():
        for b, (b1, b2) in where.items():
            if (a1 < b1 < a2) != (a1 < b2 < a2):
                parent[find(a)] = find(b)
    classes: dict[int, set[int]] = {}
    for c in where:
        classes.setdefault(find(c), set()).add(c)
    return list(classes.values())


def _compare_knot_shadow(monkeypatch, comps):
    """Signs of one closed curve: equal to networkx's up to turning over pieces, and exactly
    where the drawing is unique (the class of the crossing that fixes the mirror image)."""
    loose = gauss._loose_crossings(comps, "test", cuts=[])
    ours = gauss._shadow_signs(comps, "test", loose)
    theirs = _reference(monkeypatch, lambda: gauss._shadow_signs(comps, "test", loose))
    assert _drawn_by_rule(comps)
    word = [c for c, _ in comps[0]]
    anchor = next((c for c in word if c not in loose), word[0])
    for group in _interlaced_classes(word):
        same = all(ours[c] == theirs[c] for c in group)
        if anchor in group:
            assert same, (comps, group)
        else:
            assert same or all(ours[c] == -theirs[c] for c in group), (comps, group)
    return ours == theirs


def test_table_dt_codes_match_networkx(monkeypatch):
    """Every knot of the shipped table, as the DT code of its construction diagram and of its
    mirror image, and every recalled DT code of reference/prime_knots.csv: the same diagram
    (or the same error) as with networkx's embedding, drawn by the rule itself."""
    checked = 0
    for entry in read_sources().primes:
        diagram = construct(entry)[0]
        for d in (diagram, diagram.mirror()):
            code = write_dt(d)
            assert parse_dt(code) == _reference(monkeypatch, lambda c=code: parse_dt(c)), entry.name
            assert _drawn_by_rule([_walk([int(a) for a in code.split()])])
            checked += 1
        recalled = entry.dt_code
        if recalled:
            assert _outcome(lambda c=recalled: parse_dt(c)) == _reference(
                monkeypatch, lambda c=recalled: _outcome(lambda: parse_dt(c))), entry.name
    assert checked == 2 * 249  # the prime knots through 10 crossings (Rolfsen 1976: 249)


def test_random_dt_codes_match_networkx(monkeypatch):
    """Random DT codes of up to 12 crossings (seeded): realisable exactly when networkx finds an
    embedding, with the same signs up to turning pieces over, and the same error otherwise."""
    rng = random.Random(20261203)
    realisable = refused = same = 0
    for _ in range(800):
        n = rng.randint(1, 12)
        code = [a if rng.random() < 0.7 else -a for a in rng.sample(range(2, 2 * n + 1, 2), n)]
        walk = _walk(code)
        if _drawn_by_rule([walk]):
            realisable += 1
            same += _compare_knot_shadow(monkeypatch, [walk])
            continue
        # the rule draws nothing: networkx must find no embedding either, same message
        refused += 1
        theirs = _reference(monkeypatch, lambda w=walk: _outcome(
            lambda: gauss._shadow_signs([w], "DT code")))
        assert theirs.startswith("error: DT code is not realisable"), code
        if refused <= 40:
            assert _outcome(lambda w=walk: gauss._shadow_signs([w], "DT code")) == theirs
    assert realisable > 150 and refused > 150
    # the rule's choice for pieces that may turn over is networkx's nearly always
    assert same > 0.95 * realisable


def _unsigned_walk(diagram):
    """The unsigned Gauss code of a knot diagram, as (crossing, over) pairs along the knot."""
    text = write_gauss(diagram).replace("+", "").replace("-", "")
    return [(int(w[1:]), w[0] == "O") for w in text.split()]


@pytest.mark.parametrize("seed", range(6))
def test_scrambled_table_knots_match_networkx(monkeypatch, seed):
    """Table knots scrambled by Reidemeister moves (up to about 40 crossings, kinks and bigons
    included): signs equal to networkx's up to turning pieces over."""
    rng = random.Random(seed)
    primes = read_sources().primes
    for entry in rng.sample(primes, 8):
        d = scramble(construct(entry)[0], 12, rng)
        if d.number_of_components() != 1 or not d.crossings:
            continue
        _compare_knot_shadow(monkeypatch, [_unsigned_walk(d)])


def test_split_gauss_parts_use_the_rule(monkeypatch):
    """A Gauss code of two separate knots is drawn part by part by the rule, as networkx does."""
    code = "1 -2 3 -1 2 -3 | -4 5 -6 7 -8 4 -5 6 -7 8"  # trefoil and 5_1
    comps = [[(abs(int(x)), int(x) > 0) for x in part.split()] for part in code.split("|")]
    assert _drawn_by_rule(comps)
    assert parse_gauss(code) == _reference(monkeypatch, lambda: parse_gauss(code))


def test_linked_gauss_components_use_networkx(monkeypatch):
    """Components that cross each other are left to networkx's embedding (not the rule)."""
    code = "1 -2 3 -4 | -1 2 -3 4"  # a 4-crossing two-component shadow
    comps = [[(abs(int(x)), int(x) > 0) for x in part.split()] for part in code.split("|")]
    assert gauss._interlacement_turns(comps) is None
    assert parse_gauss(code) == _reference(monkeypatch, lambda: parse_gauss(code))


def test_non_realisable_code_error_unchanged():
    """A code without a planar shadow gets the usual error (checked by exhaustive search in
    test_dt.py); the message names the shadow."""
    with pytest.raises(NotationError, match="not realisable: its shadow"):
        parse_dt("4 8 2 10 6")

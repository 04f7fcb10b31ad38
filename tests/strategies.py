"""Shared test builders and hypothesis strategies (random braid closures, scrambles)."""

from __future__ import annotations

import random

from hypothesis import strategies as st

from knotsift.diagram import Diagram


def braid_closure(word: list[int], strands: int | None = None) -> Diagram:
    """Closure of an Artin braid word (sigma_i for i > 0 positive, -i its inverse).

    Built independently of knotsift.notations so the tests of the invariants do
    not depend on the notation parsers.
    """
    strands = strands or (max((abs(g) for g in word), default=0) + 1)
    labels = list(range(1, strands + 1))
    top = list(labels)
    nxt = strands + 1
    quads = []
    for g in word:
        i = abs(g) - 1
        a, b = labels[i], labels[i + 1]
        c, d = nxt, nxt + 1
        nxt += 2
        # a top-left, b top-right, c bottom-left, d bottom-right; strands a->d, b->c
        quads.append((a, c, d, b) if g > 0 else (b, a, c, d))
        labels[i], labels[i + 1] = c, d
    close = dict(zip(labels, top))
    used = {e for q in quads for e in q}
    free = sum(1 for k in range(strands) if labels[k] == top[k] and top[k] not in used)
    quads = [tuple(close.get(e, e) for e in q) for q in quads]
    return Diagram(quads, free)


def braid_permutation_is_cycle(word: list[int], strands: int) -> bool:
    perm = list(range(strands))
    for g in word:
        i = abs(g) - 1
        perm[i], perm[i + 1] = perm[i + 1], perm[i]
    seen, k, count = set(), 0, 0
    while k not in seen:
        seen.add(k)
        k = perm[k]
        count += 1
    return count == strands


@st.composite
def braid_words(draw, min_strands: int = 2, max_strands: int = 4, max_length: int = 10,
                knots_only: bool = False):
    """(word, strands) with every generator used at least once when possible."""
    strands = draw(st.integers(min_strands, max_strands))
    gens = st.integers(1, strands - 1).flatmap(lambda i: st.sampled_from([i, -i]))
    word = draw(st.lists(gens, min_size=strands - 1, max_size=max_length))
    if knots_only:
        from hypothesis import assume
        assume(braid_permutation_is_cycle(word, strands))
    return word, strands


def random_knot_braid(rng: random.Random, strands: int, length: int) -> list[int]:
    """A random braid word whose closure is a knot (one component).

    A knot needs a permutation that is one cycle, so the word length must have
    the parity of ``strands - 1``; ``length`` is raised by one when it has not.
    """
    if (length - strands + 1) % 2:
        length += 1
    while True:
        word = [rng.choice([1, -1]) * rng.randint(1, strands - 1) for _ in range(length)]
        if braid_permutation_is_cycle(word, strands) and all(
                any(abs(g) == i for g in word) for i in range(1, strands)):
            return word


# -- knots and links for the invariant tests (Alexander, determinant, signature) ------
def braid_permutation(word: list[int], strands: int) -> list[int]:
    """perm[p]: the position at the start of the braid of the strand at position p at its end."""
    pos = list(range(strands))
    for g in word:
        i = abs(g) - 1
        pos[i], pos[i + 1] = pos[i + 1], pos[i]
    return pos


def close_to_knot(word: list[int], strands: int, signs: tuple[int, ...] = ()) -> list[int]:
    """``word`` followed by generators that make its closure a knot.

    Each added generator transposes two neighbouring positions lying in
    different cycles of the braid permutation, which merges those cycles.  The
    added generators take their signs from ``signs`` in turn (default +1).
    """
    word = list(word)
    k = 0
    while True:
        perm = braid_permutation(word, strands)
        cycle = [-1] * strands
        for start in range(strands):
            p = start
            while cycle[p] < 0:
                cycle[p] = start
                p = perm[p]
        p = next((p for p in range(strands - 1) if cycle[p] != cycle[p + 1]), None)
        if p is None:
            return word
        word.append((signs[k % len(signs)] if signs else 1) * (p + 1))
        k += 1


def plat_closure(word: list[int], strands: int) -> Diagram:
    """The plat closure of a braid: caps join positions (0, 1), (2, 3), ... at both ends.

    Strands run both ways, so the components are oriented by
    :meth:`Diagram.from_planar_crossings`.  sigma_i makes the strand coming
    from position i - 1 (0-based) pass over.
    """
    if strands % 2:
        raise ValueError("a plat needs an even number of strands")
    cur = [1 + p // 2 for p in range(strands)]  # the bottom caps
    label = strands // 2 + 1
    quads = []
    for g in word:
        i = abs(g) - 1
        a, b = cur[i], cur[i + 1]  # south-west, south-east
        left, right = label, label + 1  # north-west, north-east
        label += 2
        # counter-clockwise from the south-west: a, b, right, left; a -> right over for g > 0
        quads.append((b, right, left, a) if g > 0 else (a, b, right, left))
        cur[i], cur[i + 1] = left, right
    rename: dict[int, int] = {}
    free = 0
    for p in range(0, strands, 2):  # the top caps
        if cur[p] == cur[p + 1]:
            free += 1
        else:
            rename[cur[p + 1]] = cur[p]

    def find(e: int) -> int:
        while e in rename:
            e = rename[e]
        return e

    quads = [tuple(find(e) for e in q) for q in quads]
    return Diagram.from_planar_crossings(quads, free_loops=free)


def continued_fraction(terms):
    """[a1, a2, ..., ak] = a1 + 1 / (a2 + 1 / (... + 1 / ak)), a Fraction."""
    from fractions import Fraction

    value = Fraction(terms[-1])
    for a in reversed(terms[:-1]):
        value = a + 1 / value
    return value


def rational_knot(terms) -> Diagram:
    """The alternating 4-plat of the rational knot or link with Conway notation ``terms``.

    The plat of sigma_2^a1 sigma_1^-a2 sigma_2^a3 ... with an odd number of
    twist boxes (a notation of even length ending in a_k is rewritten to end
    in a_k - 1, 1); ``sum(terms)`` crossings, and determinant the numerator of
    :func:`continued_fraction` (Schubert 1956, "Knoten mit zwei Brücken").
    """
    terms = list(terms)
    if len(terms) % 2 == 0:
        if terms[-1] > 1:
            terms[-1:] = [terms[-1] - 1, 1]
        else:  # [..., b, 1] = [..., b + 1]
            terms.pop()
            terms[-1] += 1
    word: list[int] = []
    for k, a in enumerate(terms):
        word += [2] * a if k % 2 == 0 else [-1] * a
    return plat_closure(word, 4)


def torus_knot(p: int, q: int) -> Diagram:
    """The positive torus knot or link T(p, q): the closure of (sigma_1 ... sigma_{p-1})^q."""
    return braid_closure(list(range(1, p)) * q, p)


@st.composite
def knot_braid_words(draw, min_strands: int = 2, max_strands: int = 5, max_length: int = 12):
    """(word, strands) whose closure is a knot: a random word, then :func:`close_to_knot`."""
    strands = draw(st.integers(min_strands, max_strands))
    gens = st.integers(1, strands - 1).flatmap(lambda i: st.sampled_from([i, -i]))
    word = draw(st.lists(gens, max_size=max_length))
    signs = draw(st.lists(st.sampled_from((1, -1)), min_size=1, max_size=strands))
    return close_to_knot(word, strands, tuple(signs)), strands


def knot_diagrams(min_strands: int = 2, max_strands: int = 5, max_length: int = 12):
    """Closures of random braids made into knots (up to max_length + max_strands - 1 crossings)."""
    return knot_braid_words(min_strands, max_strands, max_length).map(
        lambda ws: braid_closure(*ws))


@st.composite
def link_diagrams(draw, min_strands: int = 2, max_strands: int = 5, max_length: int = 12):
    """Closures of random braids: knots, links, split links, free loops."""
    strands = draw(st.integers(min_strands, max_strands))
    gens = st.integers(1, strands - 1).flatmap(lambda i: st.sampled_from([i, -i]))
    word = draw(st.lists(gens, min_size=1, max_size=max_length))
    return braid_closure(word, strands)


@st.composite
def plat_diagrams(draw, max_length: int = 12):
    """Plat closures of random braids on 4 or 6 strands (strands run both ways)."""
    strands = draw(st.sampled_from((4, 6)))
    gens = st.integers(1, strands - 1).flatmap(lambda i: st.sampled_from([i, -i]))
    word = draw(st.lists(gens, min_size=1, max_size=max_length))
    return plat_closure(word, strands)

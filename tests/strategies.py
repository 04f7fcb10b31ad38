"""Shared test builders and hypothesis strategies (random braid closures, scrambles)."""

from __future__ import annotations

import random

from hypothesis import strategies as st

from identify.diagram import Diagram


def braid_closure(word: list[int], strands: int | None = None) -> Diagram:
    """Closure of an Artin braid word (sigma_i for i > 0 positive, -i its inverse).

    Built independently of identify.notations so the tests of the invariants do
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

"""The Kauffman bracket by contraction of a planar tangle.

Crossings are added one at a time in an order that keeps the open boundary
small; the partial state sum is kept as a map from the boundary matching (how
the open edges are joined through the processed part) to a polynomial in A.
A matching is a short ``bytes`` key (entry i is the position joined with
position i), and what one crossing does to a matching depends only on where
the edges it closes lead, so that is worked out once per step and pattern.

Every state value after k crossings is A^-k Q(A^2) (each crossing brings A or
A^-1, each loop d = -A^2 - A^-2: the parity of the exponent is fixed), and Q is
packed into one Python integer (Kronecker substitution A^2 = 2^bits with
balanced digits).  Adding, the A-smoothing's factor and a loop are then a few
big-integer operations on numbers a third of the size that A itself would need.

The crossing order is greedy (close the most open edges next), best of
several starts; the search keeps candidates in heaps and abandons a start once
it costs more than the best so far.
"""

from __future__ import annotations

import random
from heapq import heappop, heappush
from operator import itemgetter
from typing import Sequence

from ..budget import bracket_progress, packed_state_bytes
from ..diagram import Diagram
from ..errors import InvariantError
from ..laurent import Laurent

__all__ = ["kauffman_bracket", "contraction_order", "contraction_width"]


def _order_graph(crossings: Sequence[tuple[int, int, int, int]]
                 ) -> tuple[list[tuple[int, ...]], list[list[int]]]:
    """Each crossing's edges as indices 0..m-1 (a kink's own edge left out), and their crossings."""
    index: dict[int, int] = {}
    ends: list[tuple[int, ...]] = []
    for x in crossings:
        ends.append(tuple(index.setdefault(e, len(index)) for e in dict.fromkeys(x)
                          if x.count(e) == 1))
    where: list[list[int]] = [[] for _ in index]
    for i, x in enumerate(crossings):
        for e in x:
            if x.count(e) == 1:
                where[index[e]].append(i)
    return ends, where


def _score_order(ends: list[tuple[int, ...]], where: list[list[int]], start: int,
                 bound: int | None = None) -> tuple[list[int], int, int] | None:
    """Greedy order from ``start``: always add the crossing that closes the most open edges.

    Ties go to the smallest crossing index.  Returns None as soon as the cost
    exceeds ``bound`` (the cost only grows, so such an order cannot win).
    Candidates wait in one heap per count of open edges (1 to 4), with stale
    entries dropped when popped, so a step costs O(log n) instead of a scan of
    every candidate.
    """
    n = len(ends)
    open_count = [0] * n  # number of entries of crossing i whose edge is open
    done = [False] * n
    is_open = [False] * len(where)
    buckets: list[list[int]] = [[] for _ in range(5)]
    order = []
    width = widest = total = 0
    pending = start
    for _ in range(n):
        best = pending
        pending = -1
        if best < 0:
            for count in (4, 3, 2, 1):
                heap = buckets[count]
                while heap and (done[heap[0]] or open_count[heap[0]] != count):
                    heappop(heap)
                if heap:
                    best = heappop(heap)
                    break
            else:
                best = done.index(False)
        done[best] = True
        order.append(best)
        for e in ends[best]:
            if is_open[e]:
                is_open[e] = False
                width -= 1
            else:
                is_open[e] = True
                width += 1
                for j in where[e]:
                    if not done[j]:
                        c = open_count[j] = open_count[j] + 1
                        heappush(buckets[c], j)
        if width > widest:
            widest = width
        total += 1 << (width if width < 60 else 60)
        if bound is not None and total > bound:
            return None
    return order, widest, total


def contraction_order(diagram: Diagram, tries: int = 40, seed: int = 0) -> list[int]:
    """A crossing order with a small open boundary (best of several greedy starts)."""
    xs = diagram.crossings
    n = len(xs)
    if n == 0:
        return []
    rng = random.Random(seed)
    starts = list(range(n)) if n <= tries else rng.sample(range(n), tries)
    ends, where = _order_graph(xs)
    best = None
    for s in starts:
        found = _score_order(ends, where, s, None if best is None else best[0][0])
        if found is None:
            continue
        order, widest, total = found
        key = (total, widest)
        if best is None or key < best[0]:
            best = (key, order)
    return best[1]


def boundary_widths(diagram: Diagram, order: Sequence[int]) -> list[int]:
    """The number of open edges after each crossing of ``order`` is added."""
    seen: set[int] = set()
    width = 0
    out = []
    for i in order:
        x = diagram.crossings[i]
        for e in set(x):
            if x.count(e) == 2:
                continue
            if e in seen:
                width -= 1
            else:
                seen.add(e)
                width += 1
        out.append(width)
    return out


def contraction_width(diagram: Diagram, order: Sequence[int] | None = None) -> int:
    """Largest number of open edges along the contraction order."""
    order = contraction_order(diagram) if order is None else order
    return max(boundary_widths(diagram, order), default=0)


def _decode(value: int, bits: int) -> list[int]:
    """Balanced base-2^bits digits of a packed integer, lowest first."""
    base = 1 << bits
    half = base >> 1
    mask = base - 1
    out = []
    while value:
        c = value & mask
        if c >= half:
            c -= base
        out.append(c)
        value = (value - c) >> bits
    return out


def _divide_by_loop(coeffs: dict[int, int]) -> dict[int, int]:
    """Exact division of a polynomial in A by d = -A^2 - A^-2."""
    # p = d q  <=>  -A^2 p = (A^4 + 1) q ; divide by A^4 + 1 from the top.
    p = {k + 2: -c for k, c in coeffs.items() if c}
    q: dict[int, int] = {}
    while p:
        top = max(p)
        c = p.pop(top)
        if c == 0:
            continue
        q[top - 4] = c
        p[top - 4] = p.get(top - 4, 0) - c
        if p[top - 4] == 0:
            del p[top - 4]
        if top - 4 < min(coeffs, default=0) - 16:
            raise ArithmeticError("bracket not divisible by the loop value")
    return q


def _step_plan(x: tuple[int, int, int, int], bnd: list[int]) -> tuple:
    """What adding crossing ``x`` to the open boundary ``bnd`` does, independent of the state.

    Returns the new boundary, the slices of the old key kept (positions of the
    edges that stay open), the positions of the edges ``x`` closes, and, per
    crossing corner, its kind: ``("open", new index)``, ``("self", twin corner)``
    or ``("close", old position)``.
    """
    index = {e: i for i, e in enumerate(bnd)}
    kinds: list[tuple[str, int]] = []
    closing: list[int] = []
    new_open: list[int] = []
    for p, e in enumerate(x):
        if e in index:
            kinds.append(("close", index[e]))
            closing.append(index[e])
        elif x.count(e) == 2:
            twin = next(q for q in range(4) if q != p and x[q] == e)
            kinds.append(("self", twin))
        else:
            kinds.append(("open", len(new_open)))
            new_open.append(e)
    closed = set(closing)
    kept = [i for i in range(len(bnd)) if i not in closed]
    new_bnd = [bnd[i] for i in kept]
    n_kept = len(kept)
    kinds = [(k, v + n_kept) if k == "open" else (k, v) for k, v in kinds]
    cuts = sorted(closed)
    slices, lo = [], 0
    for c in cuts:
        if c > lo:
            slices.append((lo, c))
        lo = c + 1
    if lo < len(bnd):
        slices.append((lo, len(bnd)))
    renumber = bytearray(256)
    for new, old in enumerate(kept):
        renumber[old] = new
    return (new_bnd + new_open, slices, closing, kinds, bytes(renumber), len(new_open))


def _smoothing_recipe(kinds: list, closing_partners: dict[int, int], smooth: tuple,
                      renumber: bytes) -> tuple[int, list[tuple[int, int]]]:
    """Loops closed and new pairings made by one smoothing, given where closing edges lead.

    ``closing_partners`` maps each closed boundary position to its partner in
    the old key.  A pairing joins two new-key positions: a new open edge, or
    the surviving partner of a closed edge.
    """
    corner_of = {v: p for p, (k, v) in enumerate(kinds) if k == "close"}
    visited = [False] * 4
    pairs: list[tuple[int, int]] = []

    def leave(p: int) -> int | None:
        """Walk out of corner ``p`` along the boundary; the new position reached, or None."""
        k, v = kinds[p]
        if k == "open":
            return v
        if k == "self":
            return -1 - v               # re-enter at the twin corner
        partner = closing_partners[v]
        if partner in closing_partners:
            return -1 - corner_of[partner]
        return renumber[partner]

    def walk(p: int) -> int | None:
        """From corner ``p`` through the crossing and on, to an end (new position) or None."""
        while True:
            visited[p] = True
            q = smooth[p]
            visited[q] = True
            out = leave(q)
            if out >= 0:
                return out
            p = -1 - out
            if visited[p]:
                return None

    ends = {}
    for p in range(4):
        if visited[p]:
            continue
        first = leave(p)
        if first is None or first < 0:
            continue
        ends[p] = (first, walk(p))
    for a, b in ends.values():
        pairs.append((a, b))
    loops = 0
    for p in range(4):
        if not visited[p]:
            loops += 1
            q = p
            while True:
                visited[q] = True
                r = smooth[q]
                visited[r] = True
                q = -1 - leave(r)
                if visited[q]:
                    break
    return loops, pairs


def kauffman_bracket(diagram: Diagram, order: Sequence[int] | None = None) -> Laurent:
    """The Kauffman bracket <D> in the variable A, normalised so that <O> = 1.

    Parameters
    ----------
    diagram : Diagram
    order : sequence of int, optional
        Order in which to add crossings (default: :func:`contraction_order`).

    Returns
    -------
    Laurent
        The bracket as a Laurent polynomial in A (exponents are integers).

    Notes
    -----
    <crossing> = A <A-smoothing> + A^-1 <B-smoothing>; for a PD crossing
    (a, b, c, d) the A-smoothing joins a with b and c with d (common practice).
    The cost is about n * C(w) big-integer operations for n crossings and
    open-boundary width w, where C(w) is the number of non-crossing matchings
    of w points, instead of the 2^n of the state sum.

    Examples
    --------
    >>> hopf = Diagram([(1, 3, 2, 4), (3, 1, 4, 2)])
    >>> kauffman_bracket(hopf).to_text("A")
    '-A^-4 - A^4'
    """
    xs = diagram.crossings
    n = len(xs)
    free = diagram.free_loops
    if n == 0:
        # d^(free - 1)
        result = Laurent.constant(1)
        d = Laurent({2: -1, -2: -1})
        for _ in range(max(free - 1, 0)):
            result = result * d
        return result
    order = contraction_order(diagram) if order is None else list(order)
    # Every state after k crossings is A^-k Q(A^2): a smoothing's A^+1 is one
    # digit up in B = A^2 and its A^-1 costs nothing; a loop multiplies Q by
    # -(B + B^-1).  Q is packed with B = 2^bits, balanced digits, and an offset
    # of n + 2 digits for the B^-1 of up to n + 1 loops.
    bits = 2 * n + 8
    offset = n + 2
    one = 1 << (bits * offset)

    state_bytes = packed_state_bytes(n)
    # A state is the matching of the open boundary made by the processed part,
    # as bytes: key[i] is the position paired with position i.
    bnd: list[int] = []
    states: dict[bytes, int] = {b"": one}
    smoothings = (((1, 0, 3, 2), True), ((3, 2, 1, 0), False))
    for ci in order:
        x = xs[ci]
        bnd2, slices, closing, kinds, renumber, n_open = _step_plan(x, bnd)
        if len(bnd2) > 255:
            raise InvariantError(f"the contraction's open boundary reaches {len(bnd2)} edges "
                                 "(more than 255): the Kauffman bracket is out of reach",
                                 value=len(bnd2))
        tail = bytes(n_open)
        pick = itemgetter(*closing) if closing else (lambda key: ())
        recipes: dict = {}
        new_states: dict[bytes, int] = {}
        get = new_states.get
        for key, value in states.items():
            partners = pick(key)
            recipe = recipes.get(partners)
            if recipe is None:
                where = dict(zip(closing, partners if len(closing) != 1 else (partners,),
                                 strict=True))
                recipe = recipes[partners] = tuple(
                    _smoothing_recipe(kinds, where, smooth, renumber) + (up,)
                    for smooth, up in smoothings)
            base = bytearray(b"".join([key[a:b] for a, b in slices])).translate(renumber)
            base += tail
            for loops, pairs, up in recipe:
                new = bytearray(base)
                for a, b in pairs:
                    new[a] = b
                    new[b] = a
                v = value << bits if up else value
                for _ in range(loops):
                    v = -(v << bits) - (v >> bits)
                k = bytes(new)
                new_states[k] = get(k, 0) + v
        states = {k: v for k, v in new_states.items() if v}
        bnd = bnd2
        if not states:
            return Laurent.constant(0)
        bracket_progress(len(states), state_bytes)  # stops past the memory or time budget
    value = states.get(b"", 0)
    digits = _decode(value, bits)
    coeffs = {2 * (k - offset) - n: c for k, c in enumerate(digits) if c}
    d = Laurent({2: -1, -2: -1})
    bracket = Laurent(_divide_by_loop(coeffs))
    for _ in range(free):
        bracket = bracket * d
    return bracket

"""The Kauffman bracket kernel as it was before the byte-key rewrite, kept for bench/ only.

bench/bench_kernels.py runs it side by side with knotsift.invariants.bracket in
one run, so that the speed-up is a ratio measured on the same machine at the
same moment, and checks that both give identical orders and brackets.
"""

from __future__ import annotations

import random
from typing import Sequence

from knotsift.diagram import Diagram
from knotsift.laurent import Laurent

__all__ = ["kauffman_bracket", "contraction_order", "contraction_width"]


def _score_order(crossings: Sequence[tuple[int, int, int, int]], start: int,
                 rng: random.Random | None) -> tuple[list[int], int, int]:
    """Greedy order from ``start``: always add the crossing that closes the most open edges."""
    n = len(crossings)
    where: dict[int, list[int]] = {}
    for i, x in enumerate(crossings):
        for e in x:
            where.setdefault(e, []).append(i)
    open_count = [0] * n  # number of entries of crossing i whose edge is open
    done = [False] * n
    is_open: dict[int, bool] = {}
    order = []
    width = 0
    widest = 0
    total = 0
    candidates = {start}
    for _ in range(n):
        if candidates:
            best = max(candidates, key=lambda i: (2 * open_count[i] - 4, -i))
        else:
            best = next(i for i in range(n) if not done[i])
        candidates.discard(best)
        done[best] = True
        order.append(best)
        x = crossings[best]
        for e in set(x):
            occ = x.count(e)
            if occ == 2:
                continue
            if is_open.get(e):
                is_open[e] = False
                width -= 1
            else:
                is_open[e] = True
                width += 1
                for j in where[e]:
                    if not done[j]:
                        open_count[j] += 1
                        candidates.add(j)
        widest = max(widest, width)
        total += 1 << min(width, 60)
    return order, widest, total


def contraction_order(diagram: Diagram, tries: int = 40, seed: int = 0) -> list[int]:
    """A crossing order with a small open boundary (best of several greedy starts)."""
    xs = diagram.crossings
    n = len(xs)
    if n == 0:
        return []
    rng = random.Random(seed)
    starts = list(range(n)) if n <= tries else rng.sample(range(n), tries)
    best = None
    for s in starts:
        order, widest, total = _score_order(xs, s, rng)
        key = (total, widest)
        if best is None or key < best[0]:
            best = (key, order)
    return best[1]


def contraction_width(diagram: Diagram, order: Sequence[int] | None = None) -> int:
    """Largest number of open edges along the contraction order."""
    order = contraction_order(diagram) if order is None else order
    seen: set[int] = set()
    width = widest = 0
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
        widest = max(widest, width)
    return widest


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
    max_loops = n + 1
    bits = 2 * n + 8
    offset = n + 2 * max_loops + 2  # keeps every exponent of A non-negative
    one = 1 << (bits * offset)
    shift2 = 2 * bits

    bnd: list[int] = []
    states: dict[tuple, int] = {(): one}
    processed: set[int] = set()
    for ci in order:
        x = xs[ci]
        pos_in_bnd = set(bnd)
        kind = []  # per position: 'close', 'self', 'open'
        for p, e in enumerate(x):
            if e in pos_in_bnd:
                kind.append("close")
            elif x.count(e) == 2:
                kind.append("self")
            else:
                kind.append("open")
        twin = {}
        for p in range(4):
            if kind[p] == "self":
                twin[p] = next(q for q in range(4) if q != p and x[q] == x[p])
        pos_of_label = {x[p]: p for p in range(4) if kind[p] == "close"}
        closing = set(pos_of_label)
        new_open = [x[p] for p in range(4) if kind[p] == "open"]
        bnd2 = [e for e in bnd if e not in closing] + new_open
        untouched = [e for e in bnd if e not in closing]
        new_states: dict[tuple, int] = {}
        for smooth, up in (((1, 0, 3, 2), True), ((3, 2, 1, 0), False)):
            # smooth[p] = position joined with p by this smoothing
            for key, value in states.items():
                partner = dict(zip(bnd, key))
                newp: dict[int, int] = {}
                visited = [False] * 4

                def walk(p: int) -> int:
                    """Follow from position p (entering the crossing side) to an endpoint label."""
                    while True:
                        visited[p] = True
                        q = smooth[p]
                        visited[q] = True
                        k = kind[q]
                        if k == "open":
                            return x[q]
                        if k == "self":
                            p = twin[q]
                            continue
                        u = partner[x[q]]
                        if u in closing:
                            p = pos_of_label[u]
                            continue
                        return u

                # endpoints: new open positions and untouched labels joined to closing ones
                for p in range(4):
                    if kind[p] == "open" and not visited[p]:
                        end = walk(p)
                        newp[x[p]] = end
                        newp[end] = x[p]
                for u in untouched:
                    if u in newp:
                        continue
                    v = partner[u]
                    if v in closing:
                        end = walk(pos_of_label[v])
                        newp[u] = end
                        newp[end] = u
                loops = 0
                for p in range(4):
                    if not visited[p]:
                        loops += 1
                        q = p
                        while not visited[q]:
                            visited[q] = True
                            r = smooth[q]
                            visited[r] = True
                            if kind[r] == "self":
                                q = twin[r]
                            else:
                                q = pos_of_label[partner[x[r]]]
                v = value << bits if up else value >> bits
                for _ in range(loops):
                    v = -(v << shift2) - (v >> shift2)
                newkey = tuple(newp[e] if e in newp else partner[e] for e in bnd2)
                new_states[newkey] = new_states.get(newkey, 0) + v
        states = {k: v for k, v in new_states.items() if v}
        bnd = bnd2
        processed.add(ci)
        if not states:
            return Laurent.constant(0)
    value = states.get((), 0)
    digits = _decode(value, bits)
    coeffs = {k - offset: c for k, c in enumerate(digits) if c}
    d = Laurent({2: -1, -2: -1})
    bracket = Laurent(_divide_by_loop(coeffs))
    for _ in range(free):
        bracket = bracket * d
    return bracket

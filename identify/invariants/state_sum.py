"""The plain 2^n state sum of the Kauffman bracket: a slow test oracle."""

from __future__ import annotations

from ..diagram import Diagram
from ..errors import InvariantError
from ..laurent import Laurent
from .jones import jones_from_bracket

__all__ = ["bracket_by_states", "jones_by_states"]

MAX_CROSSINGS = 20


def bracket_by_states(diagram: Diagram) -> Laurent:
    """<D> summed over all 2^n smoothings (for diagrams of at most 20 crossings)."""
    xs = diagram.crossings
    n = len(xs)
    if n > MAX_CROSSINGS:
        raise InvariantError(f"the state sum is limited to {MAX_CROSSINGS} crossings, got {n}")
    labels = sorted({e for x in xs for e in x})
    index = {e: k for k, e in enumerate(labels)}
    counts: dict[tuple[int, int], int] = {}
    for state in range(1 << n):
        parent = list(range(len(labels)))

        def find(u: int) -> int:
            while parent[u] != u:
                parent[u] = parent[parent[u]]
                u = parent[u]
            return u

        a_count = 0
        for i, (a, b, c, d) in enumerate(xs):
            if state >> i & 1:
                pairs = ((a, d), (b, c))
            else:
                pairs = ((a, b), (c, d))
                a_count += 1
            for u, v in pairs:
                ru, rv = find(index[u]), find(index[v])
                if ru != rv:
                    parent[ru] = rv
        loops = len({find(k) for k in range(len(labels))}) + diagram.free_loops
        key = (a_count - (n - a_count), loops)
        counts[key] = counts.get(key, 0) + 1
    d = Laurent({2: -1, -2: -1})
    total = Laurent()
    for (power, loops), mult in counts.items():
        total = total + Laurent({power: mult}) * d ** (loops - 1)
    return total


def jones_by_states(diagram: Diagram) -> Laurent:
    """The Jones polynomial from :func:`bracket_by_states`."""
    return jones_from_bracket(bracket_by_states(diagram), diagram.writhe())

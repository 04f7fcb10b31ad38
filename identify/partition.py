"""Partitions of labels into classes (union-find), used wherever edges or crossings merge."""

from __future__ import annotations

from typing import Hashable, Iterable

__all__ = ["Partition"]


class Partition:
    """Disjoint classes of hashable items with path-halving union-find.

    Items join the partition on first use.  ``join(u, v)`` makes ``v``'s
    representative the representative of the merged class, or the smaller one
    with ``to_smaller=True``; callers that relabel edges rely on which one is kept.

    Examples
    --------
    >>> p = Partition()
    >>> p.join(1, 2); p.join(3, 2)
    >>> p.find(1) == p.find(3), p.find(4)
    (True, 4)
    """

    __slots__ = ("_parent",)

    def __init__(self, items: Iterable[Hashable] = ()):
        self._parent: dict = {u: u for u in items}

    def find(self, u):
        parent = self._parent
        parent.setdefault(u, u)
        while parent[u] != u:
            parent[u] = parent[parent[u]]
            u = parent[u]
        return u

    def join(self, u, v, to_smaller: bool = False) -> None:
        ru, rv = self.find(u), self.find(v)
        if ru == rv:
            return
        if to_smaller:
            ru, rv = max(ru, rv), min(ru, rv)
        self._parent[ru] = rv

    def __contains__(self, u) -> bool:
        return u in self._parent

    def items(self) -> list:
        return list(self._parent)

    def classes(self) -> dict:
        """Representative -> members, for every item seen."""
        out: dict = {}
        for u in self._parent:
            out.setdefault(self.find(u), []).append(u)
        return out

"""A mutable PD code for simplification: local moves in O(1), validation once at the end.

:class:`~knotsift.diagram.Diagram` validates a whole PD code when it is
built, which is right for input but makes a sequence of small moves cost
O(n) each.  The working code keeps the crossings by id, the two ends
(darts) of every edge label and the sign of every crossing, and changes
them in place; :meth:`WorkingCode.diagram` validates the result once.
"""

from __future__ import annotations

from .diagram import Diagram
from .partition import Partition

__all__ = ["WorkingCode", "flipped"]


def flipped(x: tuple[int, int, int, int], sign: int) -> tuple[int, int, int, int]:
    """A crossing seen after turning its part of the diagram over (same sign)."""
    a, b, c, d = x
    return (d, c, b, a) if sign > 0 else (b, a, d, c)


class WorkingCode:
    """A mutable PD code: crossings by id, the two darts of each label, crossing signs."""

    __slots__ = ("xs", "sign", "where", "loops", "top", "next_id")

    def __init__(self, diagram: Diagram):
        self.xs: dict[int, list[int]] = {i: list(x) for i, x in enumerate(diagram.crossings)}
        self.sign = dict(enumerate(diagram.signs()))
        self.where: dict[int, list[tuple[int, int]]] = {}
        for i, x in self.xs.items():
            for p, e in enumerate(x):
                self.where.setdefault(e, []).append((i, p))
        self.loops = diagram.free_loops
        self.top = max(self.where, default=0, key=abs)
        self.top = abs(self.top)
        self.next_id = len(self.xs)

    def fresh(self) -> int:
        """An edge label not used before."""
        self.top += 1
        return self.top

    def add(self, x: list[int], sign: int) -> int:
        """Add a crossing (its labels' other ends are the caller's business); its id."""
        c = self.next_id
        self.next_id += 1
        self.xs[c] = list(x)
        self.sign[c] = sign
        for p, e in enumerate(x):
            self.where.setdefault(e, []).append((c, p))
        return c

    def relabel_dart(self, c: int, p: int, label: int) -> None:
        """Give the dart ``(c, p)`` the label ``label``."""
        ds = self.where[self.xs[c][p]]
        ds.remove((c, p))
        if not ds:
            del self.where[self.xs[c][p]]
        self.xs[c][p] = label
        self.where.setdefault(label, []).append((c, p))

    def is_outgoing(self, c: int, p: int) -> bool:
        """True when the edge at entry ``p`` leaves crossing ``c``."""
        if p % 2 == 0:
            return p == 2
        return (p == 1) == (self.sign[c] > 0)  # positive: the over-strand runs 3 -> 1

    def other(self, i: int, p: int) -> tuple[int, int]:
        a, b = self.where[self.xs[i][p]]
        return b if a == (i, p) else a

    def remove(self, drop: set[int], pairs: list[tuple[int, int]]) -> set[int]:
        """Delete crossings ``drop`` and join the labels in ``pairs``; the crossings touched."""
        gone = set()
        for c in drop:
            for p, e in enumerate(self.xs[c]):
                self.where[e].remove((c, p))
                gone.add(e)
            del self.xs[c]
            del self.sign[c]
        merged = Partition()
        for u, v in pairs:
            merged.join(u, v)
        touched: set[int] = set()
        for members in merged.classes().values():
            darts = [d for m in members for d in self.where.pop(m, ())]
            if not darts:
                self.loops += 1
                continue
            if len(darts) != 2:  # pragma: no cover - a broken move, never expected
                raise AssertionError(f"joined labels {members} keep {len(darts)} ends")
            rep = min(members)
            for c, p in darts:
                self.xs[c][p] = rep
                touched.add(c)
            self.where[rep] = darts
        for e in gone:
            if not self.where.get(e, True):
                del self.where[e]
        return touched

    def kink_at(self, c: int) -> list[tuple[int, int]] | None:
        x = self.xs[c]
        for p in range(4):
            if x[p] == x[(p + 1) % 4]:
                return [(x[(p + 2) % 4], x[p]), (x[(p + 3) % 4], x[p])]
        return None

    def bigon_at(self, c: int) -> tuple[int, list[tuple[int, int]]] | None:
        x = self.xs[c]
        for p in range(4):
            d, q = self.other(c, (p + 1) % 4)
            if d == c or self.other(d, (q + 1) % 4) != (c, p):
                continue
            if (p + 1) % 2 != q % 2:
                continue  # a clasp, not one strand over the other twice
            y = self.xs[d]
            e1, e2 = x[(p + 1) % 4], y[(q + 1) % 4]
            return d, [(x[(p + 3) % 4], e1), (e1, y[(q + 2) % 4]),
                       (y[(q + 3) % 4], e2), (e2, x[(p + 2) % 4])]
        return None

    def install(self, ids: list[int], crossings: list) -> None:
        """Replace the crossings ``ids`` by ``crossings`` (the same set of outer labels)."""
        for c in ids:
            for p, e in enumerate(self.xs[c]):
                ds = self.where[e]
                ds.remove((c, p))
                if not ds:
                    del self.where[e]
        for c, x in zip(ids, crossings, strict=True):
            self.xs[c] = list(x)
            for p, e in enumerate(x):
                self.where.setdefault(e, []).append((c, p))

    def has_local_move(self, crossings) -> bool:
        return any(c in self.xs and (self.kink_at(c) or self.bigon_at(c)) for c in crossings)

    def reduce_locally(self, todo: list[int]) -> None:
        """Remove kinks and bigons at the crossings in ``todo`` and wherever moves open new ones."""
        while todo:
            c = todo.pop()
            if c not in self.xs:
                continue
            pairs = self.kink_at(c)
            if pairs is not None:
                todo.extend(self.remove({c}, pairs))
                continue
            found = self.bigon_at(c)
            if found is not None:
                d, pairs = found
                todo.extend(self.remove({c, d}, pairs))

    def face_of_corner(self) -> dict[tuple[int, int], int]:
        out: dict[tuple[int, int], int] = {}
        f = 0
        for i in self.xs:
            for p in range(4):
                d = (i, p)
                if d in out:
                    continue
                while d not in out:
                    out[d] = f
                    d = self.other(d[0], (d[1] + 1) % 4)
                f += 1
        return out

    def remove_one_nugatory(self) -> set[int] | None:
        """Untwist one nugatory crossing (turning one side over); the crossings touched."""
        if not self.xs:
            return None
        face = self.face_of_corner()
        for i, x in self.xs.items():
            for k in (0, 1):
                if face[(i, k)] != face[(i, k + 2)]:
                    continue
                side: set[int] = set()
                stack = [self.other(i, (k + 1) % 4)[0], self.other(i, (k + 2) % 4)[0]]
                while stack:
                    j = stack.pop()
                    if j == i or j in side:
                        continue
                    side.add(j)
                    stack.extend(self.other(j, p)[0] for p in range(4))
                for j in side:
                    old = self.xs[j]
                    for p, e in enumerate(old):
                        self.where[e].remove((j, p))
                    new = list(flipped(tuple(old), self.sign[j]))
                    self.xs[j] = new
                    for p, e in enumerate(new):
                        self.where[e].append((j, p))
                pairs = [(x[(k + 1) % 4], x[(k + 3) % 4]), (x[(k + 2) % 4], x[k])]
                return self.remove({i}, pairs)
        return None

    def sides(self, face: dict[tuple[int, int], int]) -> dict[int, tuple[int, int]]:
        """For each label, (face on its right, face on its left) along its direction."""
        out = {}
        for i, x in self.xs.items():
            for p, label in enumerate(x):
                if self.is_outgoing(i, p):
                    out[label] = (face[(i, (p - 1) % 4)], face[(i, p)])
        return out

    def r3_triangles(self, face: dict[tuple[int, int], int]) -> list[list[tuple[int, int]]]:
        """Triangular faces where Reidemeister III applies, as lists of corners.

        The same rule as :func:`knotsift.reidemeister.r3_triangles`.
        """
        from .reidemeister import is_r3_triangle

        corners: dict[int, list[tuple[int, int]]] = {}
        for corner, f in face.items():
            corners.setdefault(f, []).append(corner)
        out = []
        for f in sorted(corners):
            cs = corners[f]
            if len(cs) != 3:
                continue
            # put the corners in the order of the face walk
            (c1, k1) = cs[0]
            walk = [(c1, k1)]
            for _ in range(2):
                c, k = walk[-1]
                walk.append(self.other(c, (k + 1) % 4))
            if set(walk) == set(cs) and is_r3_triangle(self.xs, walk):
                out.append(walk)
        return out

    def r3_opening(self) -> set[int] | None:
        """Make one Reidemeister III move that opens a kink or bigon; the crossings, or None."""
        from .reidemeister import r3_crossings

        face = self.face_of_corner()
        for corners in self.r3_triangles(face):
            ids = [c for c, _ in corners]
            old = [list(self.xs[c]) for c in ids]
            fresh = (self.top + 1, self.top + 2, self.top + 3)
            self.install(ids, r3_crossings(self.xs, corners, fresh))
            if self.has_local_move(ids):
                self.top += 3
                return set(ids)
            self.install(ids, old)
        return None

    def diagram(self) -> Diagram:
        return Diagram([tuple(x) for x in self.xs.values()], self.loops)

"""Oriented knot and link diagrams held as PD codes.

A crossing is a 4-tuple of edge labels listed counter-clockwise from the
incoming under-strand, so the under-strand runs from entry 0 to entry 2.  The
crossing is positive when the over-strand runs from entry 3 to entry 1 and
negative when it runs from entry 1 to entry 3 (common practice).  Edge
directions follow from the under-strands, propagated along each component; a
component that never passes under runs from its smallest label towards the
smaller of that label's two neighbours (see
:meth:`Diagram.assumed_orientation`).  Such a component has linking number 0
with the rest, so reversing it changes crossing signs but none of the
invariants computed here.
"""

from __future__ import annotations

from typing import Iterable, Sequence

from .errors import DiagramError
from .partition import Partition

__all__ = ["Diagram", "join_edges"]

Crossing = tuple[int, int, int, int]
Dart = tuple[int, int]  # (crossing index, position 0..3)


class Diagram:
    """An oriented knot or link diagram (a validated PD code).

    Parameters
    ----------
    crossings : sequence of 4-sequences of int
        The PD code.  An empty sequence with ``free_loops=1`` is the unknot.
    free_loops : int, optional
        Number of extra components drawn as circles without crossings, split
        from the rest of the diagram (they arise from smoothings).

    Raises
    ------
    DiagramError
        If a crossing does not have four integer labels, a label does not
        appear exactly twice, the orientations are inconsistent, or the code
        is not planar.  The message names the crossing or label at fault.

    Examples
    --------
    >>> trefoil = Diagram([(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)])
    >>> trefoil.signs()
    (1, 1, 1)
    >>> trefoil.writhe()
    3
    >>> trefoil.mirror().writhe()
    -3
    """

    __slots__ = ("_crossings", "_free_loops", "_darts", "_incoming", "_signs", "_components",
                 "_assumed")

    def __init__(self, crossings: Iterable[Sequence[int]], free_loops: int = 0):
        checked = []
        for i, x in enumerate(crossings):
            try:
                entries = tuple(x)
            except TypeError:
                raise DiagramError(
                    f"a crossing must be a sequence of 4 integer labels, got {x!r}",
                    value=x, where=f"crossing {i}") from None
            if len(entries) != 4:
                raise DiagramError(
                    f"a crossing needs exactly 4 labels, got {len(entries)}: {list(entries)!r}",
                    value=x, where=f"crossing {i}")
            for e in entries:
                if isinstance(e, bool) or not isinstance(e, int):
                    raise DiagramError(
                        f"labels must be integers, got {e!r}", value=e, where=f"crossing {i}")
            checked.append(entries)
        if isinstance(free_loops, bool) or not isinstance(free_loops, int) or free_loops < 0:
            raise DiagramError(f"free_loops must be a non-negative integer, got {free_loops!r}",
                               value=free_loops)
        self._crossings: tuple[Crossing, ...] = tuple(checked)
        self._free_loops = free_loops
        self._analyse()

    @classmethod
    def _trusted(cls, crossings: Iterable[tuple[int, int, int, int]],
                 free_loops: int = 0) -> "Diagram":
        """A diagram from a code built inside knotsift from a valid one, e.g. cut along a circle.

        The crossings must be 4-tuples of int forming a planar code (the
        caller's construction guarantees it); labels and orientations are
        still analysed, and checked, but planarity is not.
        """
        self = object.__new__(cls)
        self._crossings = tuple(crossings)
        self._free_loops = free_loops
        self._analyse(planar_known=True)
        return self

    @classmethod
    def unknot(cls) -> "Diagram":
        """The circle with no crossings."""
        return cls([], free_loops=1)

    @classmethod
    def from_pd(cls, pd: Iterable[Sequence[int]]) -> "Diagram":
        """A diagram from a PD code; the empty code is the unknot."""
        pd = list(pd)
        return cls(pd, free_loops=0 if pd else 1)

    @classmethod
    def from_planar_crossings(cls, quads: Iterable[Sequence[int]],
                              heads: dict[int, int] | None = None,
                              free_loops: int = 0) -> "Diagram":
        """A diagram from crossings whose under-strand direction is not yet known.

        Each quad lists its four edge labels counter-clockwise with the
        under-strand at entries 0 and 2, in either direction.  Every component
        is then oriented and each quad rotated to start at its incoming
        under-strand.

        Parameters
        ----------
        quads : iterable of 4-sequences of int
        heads : dict, optional
            ``{label: crossing index}``: the crossing each listed edge runs
            into.  One entry per component fixes its direction; components not
            listed run from their smallest label towards the smaller of its two
            neighbouring labels (so labels 1, 2, 3, ... increase along travel).
        free_loops : int, optional

        Raises
        ------
        DiagramError
            When a label does not appear exactly twice.
        """
        quads = [tuple(q) for q in quads]
        for i, q in enumerate(quads):
            if len(q) != 4:
                raise DiagramError(f"a crossing needs exactly 4 labels, got {list(q)!r}",
                                   value=q, where=f"crossing {i}")
        darts: dict[int, list[Dart]] = {}
        for i, q in enumerate(quads):
            for p, e in enumerate(q):
                darts.setdefault(e, []).append((i, p))
        for e, ds in darts.items():
            if len(ds) != 2:
                raise DiagramError(f"edge label {e} must appear exactly twice, found {len(ds)}",
                                   value=e, where=f"label {e}")
        heads = dict(heads or {})
        incoming: dict[Dart, bool] = {}
        for start in sorted(darts, key=lambda e: (e not in heads, e)):
            if (darts[start][0] in incoming) or (darts[start][1] in incoming):
                continue
            a, b = darts[start]
            if start in heads:
                head = a if a[0] == heads[start] else b
                if head[0] != heads[start]:
                    raise DiagramError(f"edge {start} does not end at crossing {heads[start]}",
                                       value=start)
            else:
                na = quads[a[0]][(a[1] + 2) % 4]
                nb = quads[b[0]][(b[1] + 2) % 4]
                head = a if na <= nb else b
            # walk the component from `head`, marking darts
            d = head
            while d not in incoming:
                incoming[d] = True
                i, p = d
                out = (i, (p + 2) % 4)
                incoming[out] = False
                e = quads[i][out[1]]
                x, y = darts[e]
                d = y if x == out else x
        result = []
        for i, q in enumerate(quads):
            if incoming[(i, 0)]:
                result.append(q)
            else:
                result.append((q[2], q[3], q[0], q[1]))
        return cls(result, free_loops)

    def faces(self) -> list[list[tuple[int, int]]]:
        """The faces of the diagram, each a cycle of corners ``(crossing, k)``.

        Corner ``k`` of a crossing is the region between its entries ``k`` and
        ``k + 1`` (mod 4), counter-clockwise.
        """
        seen: set[Dart] = set()
        faces = []
        for i in range(len(self._crossings)):
            for p in range(4):
                if (i, p) in seen:
                    continue
                face = []
                d = (i, p)
                while d not in seen:
                    seen.add(d)
                    face.append(d)
                    j, q = self.other_end(*((d[0], (d[1] + 1) % 4)))
                    d = (j, q)
                faces.append(face)
        return faces

    # -- analysis of the code ---------------------------------------------
    # The checks run twice over: a fast pass that only detects a fault, and, when
    # it finds one, the original step-by-step pass that names it (the message
    # and the fault reported are those of the step-by-step pass).
    def _analyse(self, planar_known: bool = False) -> None:
        xs = self._crossings
        darts: dict[int, list[Dart]] = {}
        for i, x in enumerate(xs):
            for p, label in enumerate(x):
                ds = darts.get(label)
                if ds is None:
                    darts[label] = [(i, p)]
                else:
                    ds.append((i, p))
        for ds in darts.values():
            if len(ds) != 2:
                return self._analyse_strict()
        incoming: dict[Dart, bool] = {}
        stack: list[Dart] = []
        for i in range(len(xs)):
            incoming[(i, 0)] = True
            incoming[(i, 2)] = False
            stack.append((i, 0))
            stack.append((i, 2))
        assumed: list[int] = []
        while True:
            while stack:
                d = stack.pop()
                inc = incoming[d]
                i, p = d
                a, b = darts[xs[i][p]]
                for o in (b if a == d else a, (i, (p + 2) % 4)):
                    known = incoming.get(o)
                    if known is None:
                        incoming[o] = not inc
                        stack.append(o)
                    elif known == inc:
                        return self._analyse_strict()
            free = [d for ds in darts.values() for d in ds if d not in incoming]
            if not free:
                break
            label, tail = _assumed_tail(xs, darts, free)
            incoming[tail] = False
            stack.append(tail)
            assumed.append(label)
        self._set_analysis(darts, incoming, assumed)
        if not planar_known and not self._is_planar():
            self._check_planar()

    def _set_analysis(self, darts: dict[int, list[Dart]], incoming: dict[Dart, bool],
                      assumed: list[int]) -> None:
        """Keep the darts and orientation found; derive signs and components from them."""
        xs = self._crossings
        self._darts = darts
        self._incoming = incoming
        self._signs = tuple(1 if incoming[(i, 3)] else -1 for i in range(len(xs)))
        # components as cyclic lists of labels in the direction of travel
        seen: set[int] = set()
        comps: list[tuple[int, ...]] = []
        for start in sorted(darts):
            if start in seen:
                continue
            comp = []
            label = start
            while label not in seen:
                seen.add(label)
                comp.append(label)
                a, b = darts[label]
                i, p = a if incoming[a] else b
                label = xs[i][(p + 2) % 4]
            comps.append(tuple(comp))
        self._components = tuple(comps)
        self._assumed = tuple(
            k for k, comp in enumerate(comps) if any(a in comp for a in assumed))

    def _is_planar(self) -> bool:
        """Euler's formula (faces = crossings + 2) on every connected part of the code."""
        xs = self._crossings
        n = len(xs)
        if not n:
            return True
        darts = self._darts
        # darts as integers 4 i + p; partner[d] is the dart at the edge's other end
        partner = [0] * (4 * n)
        for (i, p), (j, q) in darts.values():
            partner[4 * i + p] = 4 * j + q
            partner[4 * j + q] = 4 * i + p
        part = [-1] * n
        parts = 0
        for s in range(n):
            if part[s] >= 0:
                continue
            part[s] = parts
            todo = [s]
            while todo:
                i = todo.pop()
                for d in range(4 * i, 4 * i + 4):
                    j = partner[d] >> 2
                    if part[j] < 0:
                        part[j] = parts
                        todo.append(j)
            parts += 1
        faces = [0] * parts
        seen = bytearray(4 * n)
        for d0 in range(4 * n):
            if seen[d0]:
                continue
            d = d0
            while not seen[d]:
                seen[d] = 1
                d = partner[d]
                d = (d & ~3) | ((d + 1) & 3)
            faces[part[d0 >> 2]] += 1
        crossings = [0] * parts
        for k in part:
            crossings[k] += 1
        return all(f == v + 2 for f, v in zip(faces, crossings))

    def _analyse_strict(self) -> None:
        xs = self._crossings
        darts: dict[int, list[Dart]] = {}
        for i, x in enumerate(xs):
            for p, label in enumerate(x):
                darts.setdefault(label, []).append((i, p))
        for label, ds in darts.items():
            if len(ds) != 2:
                where = ", ".join(f"crossing {i}" for i, _ in ds)
                times = "once" if len(ds) == 1 else f"{len(ds)} times"
                raise DiagramError(
                    f"edge label {label} must appear exactly twice, found {times} ({where})",
                    value=label, where=f"label {label}")
        self._darts = darts
        # incoming[(i, p)] is True when the edge at that dart enters crossing i.
        incoming: dict[Dart, bool] = {}

        def other(d: Dart) -> Dart:
            a, b = darts[xs[d[0]][d[1]]]
            return b if a == d else a

        def assign(d: Dart, inc: bool, why: str) -> list[Dart]:
            known = incoming.get(d)
            if known is None:
                incoming[d] = inc
                return [d]
            if known != inc:
                label = xs[d[0]][d[1]]
                raise DiagramError(
                    f"orientation is inconsistent at edge {label}: {why}; "
                    f"under-strands must run from entry 1 to entry 3 along each component",
                    value=label, where=f"crossing {d[0]}")
            return []

        stack: list[Dart] = []
        for i in range(len(xs)):
            stack += assign((i, 0), True, "it is an incoming under-strand here")
            stack += assign((i, 2), False, "it is an outgoing under-strand here")
        assumed: list[int] = []
        while True:
            while stack:
                d = stack.pop()
                inc = incoming[d]
                o = other(d)
                stack += assign(o, not inc, f"its two ends at crossings {d[0]} and {o[0]} "
                                            "both point into (or out of) a crossing")
                # the strand through a crossing keeps its direction
                i, p = d
                stack += assign((i, (p + 2) % 4), not inc,
                                f"the strand through crossing {i} reverses")
            free = [d for ds in darts.values() for d in ds if d not in incoming]
            if not free:
                break
            label, tail = _assumed_tail(xs, darts, free)
            stack += assign(tail, False, "assumed orientation")
            assumed.append(label)
        self._set_analysis(darts, incoming, assumed)
        self._check_planar()

    def _check_planar(self) -> None:
        xs = self._crossings
        if not xs:
            return
        darts = self._darts

        def across(d: Dart) -> Dart:
            a, b = darts[xs[d[0]][d[1]]]
            return b if a == d else a

        seen: set[Dart] = set()
        faces_of: dict[int, int] = {}
        # connected components of the 4-valent graph
        parts = Partition(range(len(xs)))
        find = parts.find
        for (i, _), (j, _) in darts.values():
            parts.join(i, j)
        for i in range(len(xs)):
            for p in range(4):
                d = (i, p)
                if d in seen:
                    continue
                while d not in seen:
                    seen.add(d)
                    j, q = across(d)
                    d = (j, (q + 1) % 4)
                root = find(i)
                faces_of[root] = faces_of.get(root, 0) + 1
        for root in sorted(set(find(i) for i in range(len(xs)))):
            members = [i for i in range(len(xs)) if find(i) == root]
            v = len(members)
            f = faces_of.get(root, 0)
            if f != v + 2:
                raise DiagramError(
                    f"PD code is not planar: the part with crossings {members[:12]}"
                    f"{'...' if len(members) > 12 else ''} has {f} faces, but a planar diagram "
                    f"with {v} crossings has {v + 2} (Euler's formula); check that every "
                    "crossing is listed counter-clockwise",
                    value=[xs[i] for i in members], where=f"crossing {members[0]}")

    # -- basic queries ----------------------------------------------------
    @property
    def crossings(self) -> tuple[Crossing, ...]:
        return self._crossings

    @property
    def free_loops(self) -> int:
        return self._free_loops

    def pd_code(self) -> list[list[int]]:
        """The PD code as a list of 4-lists (JSON-ready)."""
        return [list(x) for x in self._crossings]

    def number_of_crossings(self) -> int:
        return len(self._crossings)

    def number_of_components(self) -> int:
        return len(self._components) + self._free_loops

    def is_knot(self) -> bool:
        return self.number_of_components() == 1

    def components(self) -> tuple[tuple[int, ...], ...]:
        """Edge labels of each component with crossings, in the direction of travel."""
        return self._components

    def assumed_orientation(self) -> tuple[int, ...]:
        """Indices of components whose direction the PD code left open (no under-passage)."""
        return self._assumed

    def signs(self) -> tuple[int, ...]:
        """Sign (+1 right-handed, -1 left-handed) of each crossing."""
        return self._signs

    def writhe(self) -> int:
        return sum(self._signs)

    def is_incoming(self, crossing: int, position: int) -> bool:
        """True when the edge at this entry of the crossing points into it."""
        return self._incoming[(crossing, position)]

    def other_end(self, crossing: int, position: int) -> tuple[int, int]:
        """The (crossing, position) at the other end of the edge at this entry."""
        a, b = self._darts[self._crossings[crossing][position]]
        return b if a == (crossing, position) else a

    def component_of_label(self) -> dict[int, int]:
        return {label: k for k, comp in enumerate(self._components) for label in comp}

    def is_alternating(self) -> bool:
        """True when every component alternates over and under along its length."""
        for comp in self._components:
            pattern = []
            for label in comp:
                i, p = next(d for d in self._darts[label] if self._incoming[d])
                pattern.append(p % 2)  # 0: passes under, 1: passes over
            n = len(pattern)
            if any(pattern[k] == pattern[(k + 1) % n] for k in range(n)):
                return False
        return True

    def linking_number(self, a: int, b: int) -> int:
        """Linking number of components ``a`` and ``b`` (half the sum of their mutual signs)."""
        comp = self.component_of_label()
        total = 0
        for i, x in enumerate(self._crossings):
            pair = {comp[x[0]], comp[x[1]]}
            if pair == {a, b} and a != b:
                total += self._signs[i]
        return total // 2

    # -- operations -------------------------------------------------------
    def relabel(self, mapping: dict[int, int]) -> "Diagram":
        """Rename edge labels through ``mapping`` (labels not in it keep their names)."""
        get = mapping.get
        crossings = [tuple(get(e, e) for e in x) for x in self._crossings]
        renamed = {label: get(label, label) for label in self._darts}
        if self._assumed or len(set(renamed.values())) != len(renamed) or any(
                isinstance(v, bool) or not isinstance(v, int) for v in renamed.values()):
            return Diagram(crossings, self._free_loops)  # analysed afresh
        # a one-to-one renaming keeps every orientation (none depends on label order
        # here) and planarity; only the components' order and starting labels change
        new = object.__new__(Diagram)
        new._crossings = tuple(crossings)
        new._free_loops = self._free_loops
        new._darts = {renamed[label]: list(ds) for label, ds in self._darts.items()}
        new._incoming = self._incoming
        new._signs = self._signs
        comps = []
        for comp in self._components:
            labels = [renamed[label] for label in comp]
            k = labels.index(min(labels))
            comps.append(tuple(labels[k:] + labels[:k]))
        new._components = tuple(sorted(comps))
        new._assumed = ()
        return new

    def standard_labels(self) -> "Diagram":
        """Relabel edges 1, 2, 3, ... along each component in the direction of travel."""
        mapping = {}
        n = 1
        for comp in self._components:
            for label in comp:
                mapping[label] = n
                n += 1
        return self.relabel(mapping)

    def _changed(self, i: int) -> Crossing:
        a, b, c, d = self._crossings[i]
        if self._signs[i] > 0:  # over runs d -> b: d becomes the incoming under-strand
            return (d, a, b, c)
        return (b, c, d, a)  # over runs b -> d

    def crossing_change(self, i: int) -> "Diagram":
        """Swap over and under at crossing ``i`` (L+ <-> L- of the skein relation)."""
        self._check_index(i)
        xs = list(self._crossings)
        xs[i] = self._changed(i)
        return Diagram(xs, self._free_loops)

    def mirror(self) -> "Diagram":
        """The mirror image: every crossing changed."""
        return Diagram([self._changed(i) for i in range(len(self._crossings))],
                       self._free_loops)

    def smoothing(self, i: int) -> "Diagram":
        """The oriented smoothing at crossing ``i`` (L0 of the skein relation)."""
        self._check_index(i)
        a, b, c, d = self._crossings[i]
        if self._signs[i] > 0:
            pairs = ((a, b), (d, c))
        else:
            pairs = ((a, d), (b, c))
        return join_edges(self._crossings, {i}, pairs, self._free_loops)

    def connected_sum(self, other: "Diagram", edge: int | None = None,
                      other_edge: int | None = None) -> "Diagram":
        """Connected sum, cutting ``edge`` here and ``other_edge`` there (defaults: smallest labels).

        The orientations are joined consistently.  Summing with a crossing-free
        unknot returns a copy of the other diagram.
        """
        if not other._crossings:
            return Diagram(self._crossings, self._free_loops + max(other._free_loops - 1, 0))
        if not self._crossings:
            return Diagram(other._crossings, other._free_loops + max(self._free_loops - 1, 0))
        e1 = min(self._darts) if edge is None else edge
        e2 = min(other._darts) if other_edge is None else other_edge
        for diag, e in ((self, e1), (other, e2)):
            if e not in diag._darts:
                raise DiagramError(f"no edge labelled {e} in the diagram", value=e)
        offset = max(abs(e) for e in self._darts) + 1 - min(other._darts)
        theirs = [list(e + offset for e in x) for x in other._crossings]
        mine = [list(x) for x in self._crossings]
        h1 = next(d for d in self._darts[e1] if self._incoming[d])
        h2 = next(d for d in other._darts[e2] if other._incoming[d])
        mine[h1[0]][h1[1]] = e2 + offset
        theirs[h2[0]][h2[1]] = e1
        return Diagram([tuple(x) for x in mine + theirs], self._free_loops + other._free_loops)

    def disjoint_union(self, other: "Diagram") -> "Diagram":
        """The split union of two diagrams side by side."""
        if not self._darts:
            return Diagram(other._crossings, self._free_loops + other._free_loops)
        offset = max(abs(e) for e in self._darts) + 1 - min(other._darts, default=0)
        theirs = [tuple(e + offset for e in x) for x in other._crossings]
        return Diagram(list(self._crossings) + theirs, self._free_loops + other._free_loops)

    def _check_index(self, i: int) -> None:
        if isinstance(i, bool) or not isinstance(i, int) or not 0 <= i < len(self._crossings):
            raise DiagramError(
                f"crossing index must be 0..{len(self._crossings) - 1}, got {i!r}", value=i)

    # -- dunder -----------------------------------------------------------
    def __eq__(self, other):
        if not isinstance(other, Diagram):
            return NotImplemented
        return self._crossings == other._crossings and self._free_loops == other._free_loops

    def __hash__(self):
        return hash((self._crossings, self._free_loops))

    def __len__(self) -> int:
        return len(self._crossings)

    def __repr__(self) -> str:
        extra = f", free_loops={self._free_loops}" if self._free_loops else ""
        return f"Diagram({[list(x) for x in self._crossings]!r}{extra})"


def _assumed_tail(xs, darts: dict[int, list[Dart]], free: list[Dart]) -> tuple[int, Dart]:
    """For a component that never passes under: the edge that orients it and its outgoing dart.

    The component is oriented by its labels: its smallest free label runs into
    the dart whose continuation has the smaller label, so that consecutive
    labels increase along the travel; the edge leaves the other dart's crossing.
    """
    d0 = min(free, key=lambda d: xs[d[0]][d[1]])
    label = xs[d0[0]][d0[1]]
    first, second = darts[label]
    nxt_a = xs[first[0]][(first[1] + 2) % 4]
    nxt_b = xs[second[0]][(second[1] + 2) % 4]
    return label, (second if nxt_a <= nxt_b else first)


def join_edges(crossings: Sequence[Sequence[int]], drop: set[int],
               pairs: Iterable[tuple[int, int]], free_loops: int) -> Diagram:
    """Delete the crossings ``drop`` and join the edge labels in ``pairs`` into single edges.

    A chain of joined labels that no remaining crossing uses is a closed circle
    and becomes a free loop.  Used by smoothings and by simplification.
    """
    pairs = list(pairs)
    merged = Partition()
    for u, v in pairs:
        merged.join(u, v)
    rest = [tuple(x) for k, x in enumerate(crossings) if k not in drop]
    used: dict[int, int] = {}
    for x in rest:
        for e in x:
            if e in merged:
                r = merged.find(e)
                used[r] = used.get(r, 0) + 1
    roots = {merged.find(u) for pair in pairs for u in pair}
    loops = sum(1 for r in roots if used.get(r, 0) == 0)
    new = [tuple(merged.find(e) if e in merged else e for e in x) for x in rest]
    return Diagram(new, free_loops + loops)

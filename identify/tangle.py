"""Four-ended tangle diagrams and Conway's operations on them.

A tangle sits in a box with its four ends at the corners NW, NE, SW and SE.
Its crossings are counter-clockwise quads of edge labels whose under-strand
is at entries 0 and 2; the direction of travel is left open and fixed only
when a closure makes a :class:`~knotsift.diagram.Diagram` (through
:meth:`Diagram.from_planar_crossings`).

Conventions (Conway 1970; Kauffman and Lambropoulou 2004):

* The integer tangle ``n`` is a row of ``|n|`` horizontal half-twists.  In the
  tangle ``1`` the strand from NW to SE passes over the strand from SW to NE;
  ``-1`` is its mirror.  With this choice the numerator closure of ``3`` is
  the right-handed trefoil (Jones ``t + t^3 - t^4``), the same chirality as
  :func:`knotsift.notations.conway.parse_rational`.
* ``0`` joins NW-NE and SW-SE; ``infinity`` joins NW-SW and NE-SE.
* ``a + b`` puts ``b`` to the right of ``a`` (NE of ``a`` to NW of ``b``,
  SE of ``a`` to SW of ``b``).
* ``a0`` (:meth:`Tangle.reflection`) is ``a`` reflected in its NW-SE
  diagonal; over and under are kept, so a rational tangle of fraction ``F``
  becomes one of fraction ``1/F``.
* ``ab`` (:meth:`Tangle.product`) is ``a0 + b``, so the digit string
  ``a1 a2 ... an`` is ``((a1 a2) a3) ... an`` with fraction
  ``an + 1/(a(n-1) + ... + 1/a1)``: ``2112`` is ``13/5``.
* ``-a`` (:meth:`Tangle.mirror`) changes every crossing (fraction ``-F``).
* The ramification ``a,b,c`` (:func:`ramification`) is ``a0 + b0 + c0``.
* The numerator closure joins NW-NE and SW-SE, the denominator closure NW-SW
  and NE-SE; the knot of a tangle is its numerator closure, so
  ``numerator(rational_tangle([2, 2]))`` is the figure-eight knot.

A label appears exactly twice among the quads and the four ends; a label at
two ends is a strand without crossings.
"""

from __future__ import annotations

from fractions import Fraction
from typing import Iterable, Sequence

from .diagram import Diagram
from .errors import DiagramError
from .partition import Partition

__all__ = [
    "Tangle",
    "CORNERS",
    "integer_tangle",
    "rational_tangle",
    "tangle_from_fraction",
    "continued_fraction",
    "fraction_entries",
    "ramification",
]

CORNERS = ("nw", "ne", "sw", "se")

Quad = tuple[int, int, int, int]


def _glue(quads: Sequence[Quad], ends: Sequence[int], pairs: Iterable[tuple[int, int]],
          loops: int) -> tuple[list[Quad], list[int], int]:
    """Join labels in ``pairs``; return the quads and kept ends renamed, and the loop count.

    A class of joined labels that no quad and no kept end uses any more is a
    closed loop without crossings.
    """
    m = Partition()
    labels = {e for q in quads for e in q} | set(ends)
    for a, b in pairs:
        labels.update((a, b))
        m.join(a, b, to_smaller=True)
    new_quads = [tuple(m.find(e) for e in q) for q in quads]
    new_ends = [m.find(e) for e in ends]
    used = {e for q in new_quads for e in q} | set(new_ends)
    roots = {m.find(e) for e in labels}
    return new_quads, new_ends, loops + len(roots - used)


def _to_diagram(quads: Sequence[Quad], loops: int) -> Diagram:
    """A diagram from glued quads: labels renamed 1, 2, ... along the components."""
    if not quads:
        return Diagram([], free_loops=loops)
    rename: dict[int, int] = {}
    for q in quads:
        for e in q:
            rename.setdefault(e, len(rename) + 1)
    d = Diagram.from_planar_crossings([tuple(rename[e] for e in q) for q in quads],
                                      free_loops=loops)
    return d.standard_labels()


class Tangle:
    """A four-ended tangle diagram.

    Parameters
    ----------
    crossings : sequence of 4-sequences of int
        Counter-clockwise quads with the under-strand at entries 0 and 2.
    ends : 4-sequence of int
        The labels of the edges reaching the corners NW, NE, SW, SE.
    free_loops : int, optional
        Closed loops without crossings inside the box.

    Raises
    ------
    DiagramError
        When a quad does not have four integer labels or a label does not
        appear exactly twice among the quads and the ends.

    Examples
    --------
    >>> t = integer_tangle(3)
    >>> t.number_of_crossings()
    3
    >>> t.numerator().number_of_components()
    1
    >>> integer_tangle(2).numerator().number_of_components()
    2
    """

    __slots__ = ("_crossings", "_ends", "_free_loops")

    def __init__(self, crossings: Iterable[Sequence[int]], ends: Sequence[int],
                 free_loops: int = 0):
        quads = []
        for i, q in enumerate(crossings):
            q = tuple(q)
            if len(q) != 4 or any(isinstance(e, bool) or not isinstance(e, int) for e in q):
                raise DiagramError(f"a tangle crossing needs 4 integer labels, got {q!r}",
                                   value=q, where=f"crossing {i}")
            quads.append(q)
        ends = tuple(ends)
        if len(ends) != 4 or any(isinstance(e, bool) or not isinstance(e, int) for e in ends):
            raise DiagramError(f"a tangle needs 4 integer end labels (NW, NE, SW, SE), "
                               f"got {ends!r}", value=ends)
        if isinstance(free_loops, bool) or not isinstance(free_loops, int) or free_loops < 0:
            raise DiagramError(f"free_loops must be a non-negative integer, got {free_loops!r}",
                               value=free_loops)
        count: dict[int, int] = {}
        for e in [e for q in quads for e in q] + list(ends):
            count[e] = count.get(e, 0) + 1
        bad = sorted(e for e, c in count.items() if c != 2)
        if bad:
            raise DiagramError(f"edge label {bad[0]} must appear exactly twice among the "
                               f"crossings and ends, found {count[bad[0]]}", value=bad[0],
                               where=f"label {bad[0]}")
        self._crossings: tuple[Quad, ...] = tuple(quads)
        self._ends: tuple[int, int, int, int] = ends  # type: ignore[assignment]
        self._free_loops = free_loops

    @classmethod
    def _new(cls, crossings, ends, free_loops=0) -> "Tangle":
        """Trusted constructor: no validation."""
        t = object.__new__(cls)
        t._crossings = tuple(tuple(q) for q in crossings)
        t._ends = tuple(ends)
        t._free_loops = free_loops
        return t

    # -- the elementary tangles ----------------------------------------------
    @classmethod
    def zero(cls) -> "Tangle":
        """The tangle 0: arcs NW-NE and SW-SE."""
        return cls._new((), (1, 1, 2, 2))

    @classmethod
    def infinity(cls) -> "Tangle":
        """The tangle infinity: arcs NW-SW and NE-SE."""
        return cls._new((), (1, 2, 1, 2))

    # -- queries --------------------------------------------------------------
    @property
    def crossings(self) -> tuple[Quad, ...]:
        return self._crossings

    @property
    def ends(self) -> tuple[int, int, int, int]:
        """Labels at NW, NE, SW, SE."""
        return self._ends

    @property
    def free_loops(self) -> int:
        return self._free_loops

    def end(self, corner: str) -> int:
        """The label at ``corner`` (one of ``"nw"``, ``"ne"``, ``"sw"``, ``"se"``)."""
        try:
            return self._ends[CORNERS.index(corner)]
        except ValueError:
            raise ValueError(f"corner must be one of {CORNERS}, got {corner!r}") from None

    def number_of_crossings(self) -> int:
        return len(self._crossings)

    def labels(self) -> set[int]:
        return {e for q in self._crossings for e in q} | set(self._ends)

    def _shifted(self, offset: int) -> "Tangle":
        return Tangle._new([tuple(e + offset for e in q) for q in self._crossings],
                           [e + offset for e in self._ends], self._free_loops)

    # -- Conway's operations --------------------------------------------------
    def __add__(self, other: "Tangle") -> "Tangle":
        """Tangle sum: ``other`` to the right, NE-NW and SE-SW joined."""
        if not isinstance(other, Tangle):
            return NotImplemented
        b = other._shifted(max(self.labels()) + 1 - min(other.labels()))
        nw, ne, sw, se = self._ends
        bnw, bne, bsw, bse = b._ends
        quads, ends, loops = _glue(self._crossings + b._crossings, (nw, sw, bne, bse),
                                   ((ne, bnw), (se, bsw)), self._free_loops + b._free_loops)
        return Tangle._new(quads, (ends[0], ends[2], ends[1], ends[3]), loops)

    def reflection(self) -> "Tangle":
        """Conway's ``a0``: the mirror image in the NW-SE diagonal (fraction ``F -> 1/F``).

        The plane is reflected, over and under are kept, so each quad is read
        in the reverse order and the ends NE and SW change places.
        """
        nw, ne, sw, se = self._ends
        return Tangle._new([(a, d, c, b) for a, b, c, d in self._crossings],
                           (nw, sw, ne, se), self._free_loops)

    def rotation(self) -> "Tangle":
        """A quarter turn counter-clockwise (fraction ``F -> -1/F`` for rational tangles)."""
        nw, ne, sw, se = self._ends
        # the end at NE moves to NW, NW to SW, SW to SE, SE to NE
        return Tangle._new(self._crossings, (ne, se, nw, sw), self._free_loops)

    def mirror(self) -> "Tangle":
        """Conway's ``-a``: every crossing changed (fraction ``F -> -F``)."""
        return Tangle._new([(b, c, d, a) for a, b, c, d in self._crossings], self._ends,
                           self._free_loops)

    def __neg__(self) -> "Tangle":
        return self.mirror()

    def product(self, other: "Tangle") -> "Tangle":
        """Conway's product ``ab = a0 + b`` (for rational tangles ``F(b) + 1/F(a)``)."""
        return self.reflection() + other

    def __mul__(self, other: "Tangle") -> "Tangle":
        if not isinstance(other, Tangle):
            return NotImplemented
        return self.product(other)

    def numerator(self) -> Diagram:
        """The numerator closure N(a): NW joined to NE and SW to SE."""
        nw, ne, sw, se = self._ends
        quads, _, loops = _glue(self._crossings, (), ((nw, ne), (sw, se)), self._free_loops)
        return _to_diagram(quads, loops)

    def denominator(self) -> Diagram:
        """The denominator closure D(a): NW joined to SW and NE to SE."""
        nw, ne, sw, se = self._ends
        quads, _, loops = _glue(self._crossings, (), ((nw, sw), (ne, se)), self._free_loops)
        return _to_diagram(quads, loops)

    def __repr__(self) -> str:
        extra = f", free_loops={self._free_loops}" if self._free_loops else ""
        return (f"Tangle({[list(q) for q in self._crossings]!r}, "
                f"ends={list(self._ends)!r}{extra})")


def integer_tangle(n: int) -> Tangle:
    """The integer tangle ``n``: ``|n|`` horizontal half-twists in a row.

    In ``1`` the strand NW-SE passes over the strand SW-NE (see the module
    docstring); ``-n`` is the mirror of ``n`` and ``0`` is :meth:`Tangle.zero`.

    Examples
    --------
    >>> from knotsift.invariants.jones import jones_polynomial
    >>> str(jones_polynomial(integer_tangle(3).numerator()))
    't + t^3 - t^4'
    """
    if isinstance(n, bool) or not isinstance(n, int):
        raise TypeError(f"an integer tangle needs an int, got {n!r}")
    from .limits import check_at_most

    check_at_most("crossings", abs(n), "the number of twists of an integer tangle")
    if n == 0:
        return Tangle.zero()
    # crossing k has NW = top k, SW = bottom k, SE = bottom k+1, NE = top k+1
    top = [2 * k + 1 for k in range(abs(n) + 1)]
    bottom = [2 * k + 2 for k in range(abs(n) + 1)]
    quads = []
    for k in range(abs(n)):
        nw, sw, se, ne = top[k], bottom[k], bottom[k + 1], top[k + 1]
        if n > 0:  # over-strand NW-SE: the under-strand SW-NE sits at entries 0 and 2
            quads.append((sw, se, ne, nw))
        else:
            quads.append((nw, sw, se, ne))
    return Tangle._new(quads, (top[0], top[-1], bottom[0], bottom[-1]))


def continued_fraction(entries: Sequence[int]) -> Fraction | None:
    """Conway's fraction ``an + 1/(a(n-1) + ... + 1/a1)`` of the rational tangle ``a1 ... an``.

    Returns ``None`` for the fraction ``1/0``, the tangle infinity (``[0, 0]``:
    the tangle 0 reflected).

    Examples
    --------
    >>> continued_fraction([2, 1, 1, 2])
    Fraction(13, 5)
    >>> continued_fraction([2, 0])
    Fraction(1, 2)
    """
    num, den = 1, 0  # the fraction 1/0 before any entry
    for a in entries:
        num, den = a * num + den, num
    if den == 0:
        return None
    return Fraction(num, den)


def fraction_entries(f: Fraction | int) -> list[int]:
    """The shortest Conway entries of the rational tangle with fraction ``f``.

    All entries have the sign of ``f``; a fraction of absolute value below 1
    ends in the entry 0 (``1/2 -> [2, 0]``, ``-2/3 -> [-2, -1, 0]``).  The
    tangle has ``sum(|entries|)`` crossings, the fewest possible
    (Kauffman and Lambropoulou 2004).

    Examples
    --------
    >>> fraction_entries(Fraction(13, 5))
    [2, 1, 1, 2]
    >>> fraction_entries(Fraction(-1, 2))
    [-2, 0]
    """
    f = Fraction(f)
    sign = -1 if f < 0 else 1
    f = abs(f)
    terms = []  # f = c0 + 1/(c1 + 1/(c2 + ...))
    while True:
        c = f.numerator // f.denominator
        terms.append(c)
        f -= c
        if f == 0:
            break
        f = 1 / f
    return [sign * c for c in reversed(terms)]


def rational_tangle(entries: Sequence[int]) -> Tangle:
    """The rational tangle ``a1 a2 ... an`` = ``((a1 a2) a3) ... an`` (Conway 1970).

    Parameters
    ----------
    entries : sequence of int
        Conway's entries, first to last; ``[2, 1, 1, 2]`` is the tangle of
        the knot 6_3, ``[2, 0]`` is ``2`` reflected.

    Examples
    --------
    >>> rational_tangle([2, 1, 1, 2]).number_of_crossings()
    6
    """
    entries = list(entries)
    if not entries:
        raise ValueError("a rational tangle needs at least one entry")
    t = integer_tangle(entries[0])
    for a in entries[1:]:
        t = t.product(integer_tangle(a))
    return t


def tangle_from_fraction(f: Fraction | int | None) -> Tangle:
    """The rational tangle of fraction ``f`` with the fewest crossings (``None``: infinity)."""
    if f is None:
        return Tangle.infinity()
    return rational_tangle(fraction_entries(f))


def ramification(tangles: Sequence[Tangle]) -> Tangle:
    """Conway's ``a,b,...,c`` = ``a0 + b0 + ... + c0``.

    With vertical twists ``p0, q0, r0`` this is the pretzel tangle, whose
    numerator closure is the pretzel knot P(p, q, r).
    """
    tangles = list(tangles)
    if not tangles:
        raise ValueError("a ramification needs at least one tangle")
    total = tangles[0].reflection()
    for t in tangles[1:]:
        total = total + t.reflection()
    return total

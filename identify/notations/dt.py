"""Dowker-Thistlethwaite codes of knot diagrams.

Walk along the knot and number the crossings met 1, 2, ..., 2n; every
crossing receives one odd and one even number.  The DT code lists, for the
odd numbers 1, 3, ..., 2n - 1 in turn, the even number met at the same
crossing (common practice).  The even number is written positive when the
strand passes over at the odd number and under at the even one, negative
otherwise; so an alternating diagram has an all-positive code and changing a
sign changes over and under at that crossing.

A DT code fixes the shadow up to reflection of the plane, not the mirror
image.  Our rule: **the crossing at number 1 is positive when the first entry
is positive and negative when it is negative** (equivalently, the strand at
the even partner crosses the strand at 1 from its right to its left).  So
``4 6 2`` is the right-handed trefoil (Jones ``t + t^3 - t^4``) and
``-4 -6 -2`` the left-handed one.  The rule is read on the shadow, so
changing the sign of any entry changes only that crossing.  When crossing 1
lies in a piece of one or two crossings that two edges cut off from the rest
(a kink, say), such a piece can be turned over without changing the knot,
so the rule is read instead at the first crossing along the knot outside all
such pieces: it is positive when first met passing over.  :func:`write_dt`
starts its walk where this rule gives back the diagram's own chirality.

Only knots are supported.  A code whose shadow is a connected sum of pieces
of three or more crossings is refused, since each piece could be drawn
either way round and the knot type would not be determined.
"""

from __future__ import annotations

from typing import Sequence

from ..diagram import Diagram
from ..errors import NotationError
from .gauss import _build, _loose_crossings, _shadow_signs

__all__ = ["parse_dt", "write_dt", "dt_entries", "dt_drawings", "MAX_FLIPS"]

#: A shadow with more two-edge cuts than this is refused by :func:`dt_drawings`
#: (2^MAX_FLIPS drawings).
MAX_FLIPS = 6

_DIGITS = "0123456789"
_MINUS = "-\u2212"


def _tokens(text: str) -> list[tuple[int, int]]:
    """Signed integers of a DT text with their (1-based) character positions."""
    i = 0
    n = len(text)
    while i < n and text[i].isspace():
        i += 1
    if text[i:i + 2].lower() == "dt":
        i += 2
        while i < n and text[i] in " \t":
            i += 1
        if i < n and text[i] == ":":
            i += 1
    opened = None
    closed = False
    out = []
    while i < n:
        ch = text[i]
        if ch.isspace() or ch == ",":
            i += 1
        elif ch in "[(" and opened is None and not out:
            opened = (ch, i)
            i += 1
        elif opened is not None and not closed and ch == {"[": "]", "(": ")"}[opened[0]]:
            closed = True
            i += 1
        elif closed:
            raise NotationError(
                f"DT code: unexpected {ch!r} after the closing bracket; "
                "expected the end of the code", value=text, where=f"position {i + 1}")
        elif ch in _DIGITS or ch in "+" + _MINUS:
            start = i
            if ch in "+" + _MINUS:
                i += 1
            j = i
            while j < n and text[j] in _DIGITS:
                j += 1
            if j == i:
                raise NotationError(
                    f"DT code: expected digits after {ch!r}, found "
                    f"{text[i] if i < n else 'end of text'!r}", value=text,
                    where=f"position {start + 1}")
            value = int(text[i:j])
            out.append((-value if ch in _MINUS else value, start + 1))
            i = j
        else:
            raise NotationError(
                f"DT code: unexpected character {ch!r}; expected signed "
                "even integers separated by spaces or commas", value=text,
                where=f"position {i + 1}")
    if opened is not None and not closed:
        raise NotationError(
            f"DT code: bracket {opened[0]!r} is never closed",
            value=text, where=f"position {opened[1] + 1}")
    if not out and opened is None:
        raise NotationError("DT code: empty text; expected signed even integers such as '4 6 2'"
                            " (write '[]' for the unknot)", value=text)
    return out


def dt_entries(code: str | Sequence[int]) -> list[int]:
    """The checked entries of a DT code.

    Parameters
    ----------
    code : str or sequence of int
        ``"4 6 2"``, ``"[4, 6, 2]"``, ``"4,6,2"``, ``"DT: 4 8 10 2 6"`` or a list.

    Raises
    ------
    NotationError
        When an entry is not a non-zero even integer, or the absolute values
        are not 2, 4, ..., 2n each once (the message names the entry).

    Examples
    --------
    >>> dt_entries("DT: 4 8 10 2 6")
    [4, 8, 10, 2, 6]
    """
    if isinstance(code, str):
        tokens = _tokens(code)
    else:
        try:
            items = list(code)
        except TypeError:
            raise NotationError(f"DT code: expected text or a sequence of integers, got "
                                f"{type(code).__name__}", value=code) from None
        tokens = []
        for k, x in enumerate(items):
            if isinstance(x, bool) or not isinstance(x, int):
                raise NotationError(f"DT code: expected an integer, found {x!r}", value=x,
                                    where=f"entry {k}")
            tokens.append((x, 0))
    n = len(tokens)
    first_at: dict[int, int] = {}
    for k, (x, pos) in enumerate(tokens):
        place = f"entry {k}" + (f" (position {pos})" if pos else "")
        if x == 0 or x % 2:
            raise NotationError(
                f"DT code: expected a non-zero even integer for odd label {2 * k + 1}, found {x}",
                value=x, where=place)
        if abs(x) > 2 * n:
            raise NotationError(
                f"DT code: {x} is out of range; a code of {n} entries uses the even labels "
                f"2..{2 * n}", value=x, where=place)
        if abs(x) in first_at:
            raise NotationError(
                f"DT code: even label {abs(x)} appears twice (entries {first_at[abs(x)]} and {k});"
                f" expected each of 2..{2 * n} once", value=x, where=place)
        first_at[abs(x)] = k
    return [x for x, _ in tokens]


def _walk(entries: list[int]) -> list[tuple[int, bool]]:
    """(crossing, over) at each label 1..2n; crossing k+1 holds odd label 2k+1."""
    walk: list[tuple[int, bool] | None] = [None] * (2 * len(entries))
    for k, a in enumerate(entries):
        walk[2 * k] = (k + 1, a > 0)
        walk[abs(a) - 1] = (k + 1, a < 0)
    return walk  # type: ignore[return-value]


def parse_dt(code: str | Sequence[int]) -> Diagram:
    """The knot diagram of a DT code.

    Parameters
    ----------
    code : str or sequence of int
        The even partners of the odd labels 1, 3, ..., 2n - 1, as text
        (``"4 6 2"``, ``"[4, 6, 2]"``, ``"4,6,2"``, ``"DT: 4 8 10 2 6"``) or a
        sequence.  The empty code ``[]`` is the unknot.

    Returns
    -------
    Diagram
        Crossing ``k`` holds labels ``2k + 1`` and ``|a_k|``; edges are
        labelled 1..2n along the knot (edge ``l`` leaves label ``l``).  Its
        chirality follows the rule of the module docstring.

    Raises
    ------
    NotationError
        On a syntax error or a bad entry (with its position), when the code is
        not realisable in the plane, or when it describes a connected sum.

    Examples
    --------
    >>> parse_dt("4 6 2").signs()
    (1, 1, 1)
    >>> parse_dt([-4, -6, -2]).writhe()
    -3

    Notes
    -----
    The shadow is drawn from the interlacing of the code's loops and checked
    by counting faces; both steps and the connected-sum check are quadratic
    in the crossings.

    References
    ----------
    C. H. Dowker and M. B. Thistlethwaite, "Classification of knot
    projections", Topology Appl. 16 (1983).
    """
    entries = dt_entries(code)
    if not entries:
        return Diagram.unknot()
    walk = _walk(entries)
    loose = _loose_crossings([walk], "DT code", name=lambda c: f"odd label {2 * c - 1}")
    signs = _shadow_signs([walk], "DT code", loose)
    return _build([walk], signs, 0, "DT code")


def dt_drawings(code: str | Sequence[int]) -> tuple[list[Diagram], list[int]]:
    """Every knot diagram a DT code may stand for, and the sizes of the pieces that flip.

    A DT code fixes its shadow only up to turning over each piece that two
    edges cut off from the rest (which mirrors that piece).  Pieces of one or
    two crossings are harmless (:func:`parse_dt`); for each piece of three or
    more, both ways round are drawn, the chirality rule fixing the piece that
    holds the crossing it is read at.

    Returns
    -------
    (list of Diagram, list of int)
        One diagram when the shadow has no such cut (the diagram of
        :func:`parse_dt`); otherwise ``2^k`` diagrams for ``k`` pieces, the
        first with the first crossing met in each piece turned as the anchor
        crossing is (see :func:`knotsift.notations.gauss._interlacement_turns`),
        and the crossing counts of the ``k`` pieces.

    Raises
    ------
    NotationError
        As :func:`parse_dt`, except for the connected-sum refusal; and when
        more than ``MAX_FLIPS`` pieces could flip.

    Examples
    --------
    >>> drawings, pieces = dt_drawings("4 6 2 10 12 8")  # two trefoils in a row
    >>> len(drawings), pieces
    (2, [3])
    """
    entries = dt_entries(code)
    if not entries:
        return [Diagram.unknot()], []
    walk = _walk(entries)
    cuts: list[frozenset[int]] = []
    loose = _loose_crossings([walk], "DT code", name=lambda c: f"odd label {2 * c - 1}",
                             cuts=cuts)
    signs = _shadow_signs([walk], "DT code", loose)
    anchor = next((c for c, _ in walk if c not in loose), walk[0][0])
    pieces = sorted({frozenset(set(signs) - cut) if anchor in cut else cut for cut in cuts},
                    key=lambda p: (len(p), sorted(p)))
    if len(pieces) > MAX_FLIPS:
        raise NotationError(f"DT code: its shadow has {len(pieces)} pieces that may each be "
                            f"drawn either way round; at most {MAX_FLIPS} are tried "
                            f"(2^{MAX_FLIPS} drawings); give a PD code instead", value=code)
    drawings = []
    for mask in range(1 << len(pieces)):
        flipped: set[int] = set()
        for bit, piece in enumerate(pieces):
            if mask >> bit & 1:
                flipped ^= piece
        drawings.append(_build([walk], {c: -s if c in flipped else s
                                        for c, s in signs.items()}, 0, "DT code"))
    return drawings, [len(p) for p in pieces]


def write_dt(diagram: Diagram) -> str:
    """The DT code of a knot diagram, read so that :func:`parse_dt` gives it back.

    Raises
    ------
    NotationError
        For links, or when the code would not determine the knot (a
        connected sum of pieces of three or more crossings).

    Examples
    --------
    >>> write_dt(Diagram([(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)]))
    '4 6 2'
    """
    if diagram.number_of_components() != 1:
        raise NotationError(
            f"DT codes describe knots; this diagram has {diagram.number_of_components()} "
            "components", value=diagram)
    if not diagram.crossings:
        return "[]"
    head: dict[int, tuple[int, int]] = {}
    for i, x in enumerate(diagram.crossings):
        for p, label in enumerate(x):
            if diagram.is_incoming(i, p):
                head[label] = (i, p)
    visits = [(head[label][0], head[label][1] != 0) for label in diagram.components()[0]]
    loose = _loose_crossings([visits], "the DT code of this diagram")
    signs = diagram.signs()
    # start where the chirality rule of parse_dt reads the diagram's own mirror image
    c = next((c for c, _ in visits if c not in loose), visits[0][0])
    start = next(j for j, (d, over) in enumerate(visits) if d == c and (signs[c] > 0) == over)
    visits = visits[start:] + visits[:start]
    where: dict[int, list[int]] = {}
    for label, (c, _) in enumerate(visits, start=1):
        where.setdefault(c, []).append(label)
    partner = {}
    for c, (a, b) in where.items():
        if (a + b) % 2 == 0:
            raise NotationError(f"crossing {c} is met at labels {a} and {b} of equal parity; "
                                "the diagram is not planar", value=c, where=f"crossing {c}")
        odd, even = (a, b) if a % 2 else (b, a)
        partner[odd] = even if visits[odd - 1][1] else -even
    return " ".join(str(partner[odd]) for odd in range(1, 2 * len(diagram.crossings), 2))

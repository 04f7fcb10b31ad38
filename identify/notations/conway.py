"""Rational (2-bridge) knots and links from Conway's continued fractions.

Conway notation ``a1 a2 ... an`` of a rational knot (Rolfsen 1976,
Appendix C) names the rational tangle with fraction
``an + 1/(a(n-1) + ... + 1/a1)``; the knot is its closure.  Entries may be
written spaced (``"2 1 1 2"``, ``"[2, 1, 1, 2]"``, ``"3 -2"``) or, when all are
single digits, as one digit string (``"2112"`` or ``"[2112]"``, as the
tables do).  A lone unsigned multi-digit token is always read digit by
digit; write ``+12`` for one twist region of twelve crossings.  An odd
numerator gives a knot, an even one a two-component link.

The diagram is the 4-plat: four strands, capped in pairs (1, 2) and (3, 4)
at both ends, with twist regions ``sigma_2^a1 sigma_1^-a2 sigma_2^a3 ...``
from the bottom (an even number of entries is first rewritten with the same
fraction, ``[a1, ..., an] -> [1, a1 - 1, ..., an]``).  Positive entries give
an alternating diagram.

Chirality: with positive entries the first twist region is a positive
(right-handed) twist, so ``"3"`` is the right-handed trefoil (Jones
``t + t^3 - t^4``) and ``"5"`` the positive cinquefoil.  Links are oriented so
that both strands run upwards through the first twist region, so ``"2"`` is
the positive Hopf link.
"""

from __future__ import annotations

from typing import Sequence

from ..diagram import Diagram
from ..errors import NotationError
from .gauss import _diagram_from_quads

__all__ = ["parse_rational", "rational_entries", "rational_fraction"]

_DIGITS = "0123456789"
_MINUS = "-\u2212"
_MAX_CROSSINGS = 100_000


def rational_entries(code: str | Sequence[int]) -> list[int]:
    """The entries of a Conway continued fraction.

    Parameters
    ----------
    code : str or sequence of int
        ``"3"``, ``"2 2"``, ``"[2 1 1 2]"``, ``"2112"``, ``"[3, -2]"``,
        optionally after ``Conway:``; or a sequence of integers.

    Raises
    ------
    NotationError
        On an unexpected character (with its position), on no entries, or on
        Conway notation of non-rational knots (``"3,3,2"`` is a pretzel-type
        tangle sum, ``8*`` a polyhedron): only continued fractions are read.

    Examples
    --------
    >>> rational_entries("2112")
    [2, 1, 1, 2]
    >>> rational_entries("[3, -2]")
    [3, -2]
    """
    if not isinstance(code, str):
        try:
            items = list(code)
        except TypeError:
            raise NotationError(f"Conway notation: expected text or a sequence of integers, "
                                f"got {type(code).__name__}", value=code) from None
        for k, x in enumerate(items):
            if isinstance(x, bool) or not isinstance(x, int):
                raise NotationError(f"Conway notation: expected an integer, found {x!r}",
                                    value=x, where=f"entry {k}")
        if not items:
            raise NotationError("Conway notation: expected at least one entry, found none",
                                value=code)
        return list(items)
    text = code
    i = 0
    while i < len(text) and text[i].isspace():
        i += 1
    if text[i:i + 6].lower() == "conway":
        i += 6
        while i < len(text) and text[i] in " \t":
            i += 1
        if i < len(text) and text[i] == ":":
            i += 1
    body_start = i
    bracket = None
    closed = False
    tokens: list[tuple[str, int]] = []
    while i < len(text):
        ch = text[i]
        if ch.isspace():
            i += 1
        elif ch == "," and bracket is not None:
            i += 1
        elif ch == "[" and bracket is None and not tokens:
            bracket = i
            i += 1
        elif ch == "]" and bracket is not None and not closed:
            closed = True
            i += 1
        elif closed:
            raise NotationError(f"Conway notation: unexpected {ch!r} after the closing "
                                "bracket; expected the end", value=text,
                                where=f"position {i + 1}")
        elif ch in _DIGITS or ch in "+" + _MINUS:
            j = i + (ch not in _DIGITS)
            k = j
            while k < len(text) and text[k] in _DIGITS:
                k += 1
            if k == j:
                raise NotationError(f"Conway notation: expected digits after {ch!r}, found "
                                    f"{text[j:j + 1] or 'end of text'!r}", value=text,
                                    where=f"position {i + 1}")
            tokens.append((text[i:k], i))
            i = k
        else:
            hint = ""
            if ch in ",*.":
                hint = ("; only rational knots (continued fractions such as '2 1 1 2') are "
                        "read, not tangle sums ('3,3,2') or polyhedra ('8*', '.1')")
            raise NotationError(f"Conway notation: unexpected character {ch!r}; expected "
                                f"integers separated by spaces{hint}", value=text,
                                where=f"position {i + 1}")
    if bracket is not None and not closed:
        raise NotationError("Conway notation: '[' is never closed", value=text,
                            where=f"position {bracket + 1}")
    if not tokens:
        raise NotationError("Conway notation: expected at least one entry such as '3' or "
                            "'2 1 1 2', found none", value=text, where=f"position {body_start + 1}")
    if len(tokens) == 1 and tokens[0][0][0] in _DIGITS:
        return [int(d) for d in tokens[0][0]]  # a digit string as the tables write it
    out = []
    for t, _ in tokens:
        value = int(t.lstrip("+" + _MINUS))
        out.append(-value if t[0] in _MINUS else value)
    return out


def _convergent(entries: Sequence[int]) -> tuple[int, int]:
    """Numerator and denominator of an + 1/(a(n-1) + ... + 1/a1), never dividing."""
    num, den = 1, 0  # the fraction 1/0 before any entry
    for a in entries:
        num, den = a * num + den, num
    return num, den


def rational_fraction(entries: str | Sequence[int]) -> tuple[int, int]:
    """Schubert's normal form ``(p, q)`` of the 2-bridge knot or link of a Conway fraction.

    Parameters
    ----------
    entries : str or sequence of int
        The Conway continued fraction (see :func:`rational_entries`).

    Returns
    -------
    (int, int)
        ``p >= 0`` and ``0 <= q < p`` with ``p/q`` congruent to the fraction
        ``an + 1/(... + 1/a1)``.  The unknot is ``(1, 0)``, the
        two-component unlink ``(0, 1)``.  The knot or link is ``b(p, q)`` in
        the orientation of :func:`parse_rational`; its mirror is
        ``b(p, p - q)``.

    Notes
    -----
    Schubert (1956): ``b(p, q)`` and ``b(p', q')`` are equal (as unoriented
    knots, without mirroring) exactly when ``p = p'`` and
    ``q' = q^(+1 or -1) mod p``.

    Examples
    --------
    >>> rational_fraction("2 1 1 2")
    (13, 5)
    >>> rational_fraction([3, 2])
    (7, 3)

    References
    ----------
    H. Schubert, "Knoten mit zwei Brücken", Math. Z. 65 (1956).
    """
    num, den = _convergent(rational_entries(entries))
    if num == 0:
        return 0, 1
    p = abs(num)
    if p == 1:
        return 1, 0
    q = (den if num > 0 else -den) % p
    return p, q


def _normalised(entries: list[int]) -> list[int]:
    """Entries of the same fraction with an odd count and a non-zero first entry.

    ``[0, a, rest]`` equals ``[rest]``; an inner zero merges its neighbours;
    an even count becomes ``[1, a1 - 1, a2, ...]``.  ``[]`` is the unknot and
    ``[0]`` the two-component unlink.
    """
    e = list(entries)
    if len(e) % 2 == 0:
        e = [1, e[0] - 1] + e[1:]
    while True:
        if len(e) >= 2 and e[0] == 0:
            e = e[2:]
            continue
        inner = next((k for k in range(1, len(e) - 1) if e[k] == 0), None)
        if inner is not None:
            e[inner - 1:inner + 2] = [e[inner - 1] + e[inner + 1]]
            continue
        return e


def parse_rational(code: str | Sequence[int]) -> Diagram:
    """The 4-plat diagram of the rational knot or link of a Conway continued fraction.

    Parameters
    ----------
    code : str or sequence of int
        Conway notation (see :func:`rational_entries`); negative entries are
        allowed.

    Returns
    -------
    Diagram
        ``|a1| + ... + |an|`` crossings (after the rewriting of the module
        docstring, which keeps this count for positive entries); a knot when
        the numerator of the fraction is odd, a two-component link when it is
        even.

    Raises
    ------
    NotationError
        On malformed notation.

    Examples
    --------
    >>> from knotsift.invariants.jones import jones_polynomial
    >>> str(jones_polynomial(parse_rational("3")))
    't + t^3 - t^4'
    >>> str(jones_polynomial(parse_rational("2 2")))
    't^-2 - t^-1 + 1 - t + t^2'

    References
    ----------
    J. H. Conway, "An enumeration of knots and links, and some of their
    algebraic properties" (1970); D. Rolfsen, "Knots and Links" (1976),
    Appendix C.
    """
    raw = rational_entries(code)
    if sum(abs(a) for a in raw) > _MAX_CROSSINGS:
        raise NotationError(f"Conway notation: more than {_MAX_CROSSINGS} crossings; expected "
                            "smaller entries", value=raw)
    entries = _normalised(raw)
    if not entries:
        return Diagram.unknot()
    parent: dict[int, int] = {}

    def find(a: int) -> int:
        parent.setdefault(a, a)
        while parent[a] != a:
            parent[a] = parent[parent[a]]
            a = parent[a]
        return a

    cup_left, cup_right = 1, 2  # the cups joining strands (1, 2) and (3, 4) at the bottom
    cur = [0, cup_left, cup_left, cup_right, cup_right]
    fresh = 3
    quads: list[list[int]] = []
    for k, a in enumerate(entries):
        i, box_sign = (2, 1) if k % 2 == 0 else (1, -1)
        sign = box_sign if a > 0 else -box_sign
        for _ in range(abs(a)):
            left, right = cur[i], cur[i + 1]
            top_left, top_right = fresh, fresh + 1
            fresh += 2
            if sign > 0:
                quads.append([right, top_right, top_left, left])
            else:
                quads.append([left, right, top_right, top_left])
            cur[i], cur[i + 1] = top_left, top_right
    for a, b in ((cur[1], cur[2]), (cur[3], cur[4])):  # the caps at the top
        ra, rb = find(a), find(b)
        if ra != rb:
            parent[ra] = rb
    quads = [[find(e) for e in q] for q in quads]
    used = {e for q in quads for e in q}
    free = len({find(e) for e in range(1, fresh)} - used)
    if not quads:
        return Diagram([], free_loops=free)
    heads = {}
    p, _ = _convergent(raw)
    cups = (cup_left, cup_right) if p % 2 == 0 else (cup_left,)
    for cup in cups:
        # both strands run upwards into the first crossing (at positions 2 and 3)
        e = find(cup)
        ends = [k for k, q in enumerate(quads) for x in q if x == e]
        if ends and ends[0] == 0 and len(set(ends)) == 2:
            heads[e] = 0
    return _diagram_from_quads(quads, heads, free, "rational diagram")

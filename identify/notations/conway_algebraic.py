"""Conway's notation in full (rational, algebraic and polyhedral knots) read into diagrams.

The strings are those of Conway (1970) and Rolfsen (1976, Appendix C):
``"2112"``, ``"3,3,2-"``, ``"(3,2)(21,2)"``, ``".2.20"``, ``"8*20::20"``,
``"-20:-20:-20"``.  The text is read by a hand-written tokenizer and a
recursive-descent parser; it is never evaluated.

Grammar
-------
::

    notation    := polyhedral | vertex-list
    polyhedral  := NUMBER "*"+ [vertex-list]          8*   10**   8*20.20   9*.20
    vertex-list := slot (("." | ":") slot)*           one slot alone: an algebraic knot
    slot        := [tangle]                           empty: the tangle 1
    tangle      := product ("," product)* [signs]     a comma list is a ramification
    signs       := ("+" | "-")+                       only after a comma list
    product     := factor (["-"] factor)*             juxtaposition, left to right
    factor      := "-" factor | "(" tangle ")" | run
    run         := ENTRY (whitespace ENTRY)*
    ENTRY       := ["-"] DIGIT+

Meaning (tangle operations of :mod:`knotsift.tangle`):

* A run of one unspaced token is read digit by digit: ``2112`` is the
  rational tangle ``2 1 1 2`` (the tables never need an entry above 9).  With
  spaces, each token is one entry and may have several digits or a sign:
  ``"2 1 1 2"``, ``"12 3"``, ``"3 -2"``.  A ``0`` entry is the tangle 0, so a
  trailing ``0`` reflects: ``20`` is ``2 0``, fraction 1/2.
* Juxtaposition is Conway's product ``ab = a0 + b``, left to right; entries
  of a run continue the chain, so ``(3,2)21`` is ``((3,2) 2) 1``.
* ``-`` before a factor mirrors that factor only: ``-20`` is ``-(20)``,
  ``(3,2)-(21,2)`` is the product of ``(3,2)`` and ``-(21,2)``; ``-21`` is the
  chain ``-2 -1`` (its mirror).  In a spaced run a minus written against an
  entry is that entry's sign wherever it stands: ``-2 3`` is ``(-2) 3``, the
  same as ``2 -3`` up to the mirror of the whole, and ``-1 -1 -1`` is the
  chain of three ``-1`` (the left-handed trefoil).  A minus followed by a
  space mirrors the run after it: ``- 2 3`` is ``-(2 3)``.
* ``a,b,...,c`` is the ramification ``a0 + b0 + ... + c0``; ``3,3,2`` is the
  pretzel knot P(3, 3, 2).
* Trailing signs add the tangle ``+1`` or ``-1`` per sign at the end of a
  comma list (``3,3,2-`` is P(3, 3, -2), ``3,3,2++`` adds ``2``).  When the
  last entry is rational it is merged with the extra twists into the rational
  tangle of the same fraction with fewest crossings, ``20 + (-1) = (-2)0``,
  so the diagram has the table's crossing number (8 for ``3,3,2-``).
* An algebraic notation (one slot) is the numerator closure of its tangle:
  the knot ``3`` is the numerator closure of the tangle 3.
* A vertex list with a separator and no polyhedron is on ``6*``.  Slot ``k``
  goes to vertex ``k`` of the polyhedron (:mod:`knotsift.polyhedra`), an
  empty slot and every vertex after the last slot hold the tangle 1; more
  slots than vertices is an error.
* The colon: on ``6*`` it stands for ``0.`` (``a:b`` is ``a0.b``, so
  ``2:2:20`` is ``20.20.20``); on every other polyhedron it stands for
  ``.1.``, a skipped vertex holding 1 (``8*2:.2`` is ``8*2.1.1.2``).

Validation
----------
The reading of the colon, the vertex order and the way each tangle is turned
at each vertex (see :mod:`knotsift.polyhedra`) could not be looked up; they
were chosen by building every polyhedral row of ``reference/prime_knots.csv``
and comparing determinants with ``reference/alexander.csv`` (all recalled
from memory), keeping the choice that agrees with the most rows:

* ``6*``: all 720 vertex orders times all 64 choices of frames, with the
  colon read as a plain separator, as ``.1.``, or as a separator that
  reflects the tangle after it, before it, or both (``.1.1.`` only with
  equal frames).  ``0.`` (reflect before) agrees on 39 of 48 rows, including
  all nine rows of 8 and 9 crossings, whose Alexander polynomials agree too;
  the best choice is unique up to the symmetries of the octahedron (and the
  frame of vertex 6, which no row uses).  ``.1.`` cannot work on ``6*``:
  ``2:2:20`` (9_39, det 55) needs its tangles round a triangle, ``.2.2.2``
  (9_38, det 57) needs vertices 2 and 4 opposite, and if 1, 3, 5 is a
  triangle so is 2, 4, 6.
* ``8*``: ``0.`` cannot work, since ``8*2:20`` would be ``8*20.20``, another
  knot of the table.  ``.1.`` with the zigzag order and reflected even
  vertices agrees on 10 of 14 rows (over all orders of vertices 2..5 and all
  frames; one other order ties, failing 10_117 instead of 10_165).
* ``9*``: 3 of 3 rows; ``10*``: 1 of 1.

Independently, 19 of the 20 amphichiral knots of
``reference/amphichiral.csv`` get a symmetric Jones polynomial (not 10_109).
The rows that disagree are all among the doubtful rows of
``reference/README.md``; ``tests/notations/test_conway_algebraic.py`` lists
them with reasons.

Examples
--------
>>> d = parse_conway_notation("2112")
>>> d.number_of_crossings(), d.is_knot()
(6, True)
>>> parse_conway_notation("3,3,2-").number_of_crossings()
8
>>> parse_conway_notation(".2.20").is_alternating()
True

References
----------
J. H. Conway, "An enumeration of knots and links, and some of their
algebraic properties" (1970).  D. Rolfsen, "Knots and Links" (1976),
Appendix C.  L. H. Kauffman and S. Lambropoulou, "On the classification of
rational tangles" (2004).
"""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction

from ..diagram import Diagram
from ..errors import NotationError
from ..polyhedra import BASIC_POLYHEDRA, basic_polyhedron
from ..tangle import (
    Tangle,
    continued_fraction,
    integer_tangle,
    ramification,
    tangle_from_fraction,
)

__all__ = ["parse_conway_notation", "conway_tangle", "conway_vertex_tangles",
           "rational_chain"]

_MINUS = "-\u2212"
_SYMBOLS = {"(": "(", ")": ")", ",": ",", ".": ".", ":": ":", "*": "*", "+": "+"}


@dataclass(frozen=True)
class _Token:
    kind: str  # "num", "-", "+", "(", ")", ",", ".", ":", "*", "end"
    text: str
    pos: int  # 0-based
    space_before: bool


def _describe(tok: _Token) -> str:
    return "the end of the text" if tok.kind == "end" else repr(tok.text)


class _Parser:
    def __init__(self, text: str):
        self.text = text
        self.tokens = self._tokenize(text)
        self.i = 0

    # -- tokens -----------------------------------------------------------
    def _error(self, message: str, pos: int) -> NotationError:
        return NotationError(f"Conway notation: {message}", value=self.text,
                             where=f"position {pos + 1}")

    def _tokenize(self, text: str) -> list[_Token]:
        tokens = []
        i, space = 0, False
        while i < len(text):
            ch = text[i]
            if ch.isspace():
                space = True
                i += 1
                continue
            if ch in "0123456789":
                j = i
                while j < len(text) and text[j] in "0123456789":
                    j += 1
                tokens.append(_Token("num", text[i:j], i, space))
                i = j
            elif ch in _MINUS:
                tokens.append(_Token("-", ch, i, space))
                i += 1
            elif ch in _SYMBOLS:
                tokens.append(_Token(_SYMBOLS[ch], ch, i, space))
                i += 1
            else:
                raise self._error(
                    f"unexpected character {ch!r}; expected digits, '(', ')', ',', '.', ':', "
                    "'*', '+' or '-'", i)
            space = False
        tokens.append(_Token("end", "", len(text), space))
        return tokens

    def peek(self, k: int = 0) -> _Token:
        return self.tokens[min(self.i + k, len(self.tokens) - 1)]

    def take(self) -> _Token:
        tok = self.peek()
        self.i += 1
        return tok

    # -- grammar ----------------------------------------------------------
    def notation(self) -> tuple[str | None, list[_Slot | None], list[tuple[str, int]]]:
        """(polyhedron name or None, slots, separators with their positions)."""
        first = self.peek()
        if first.kind == "end":
            raise self._error("expected a knot such as '3', '3,3,2' or '8*', found nothing",
                              first.pos)
        name = None
        if first.kind == "num" and self.peek(1).kind == "*" and not self.peek(1).space_before:
            self.take()
            stars = ""
            while self.peek().kind == "*" and not self.peek().space_before:
                stars += self.take().text
            name = first.text + stars
            if name not in BASIC_POLYHEDRA:
                raise self._error(f"unknown basic polyhedron {name!r}; known: "
                                  f"{', '.join(BASIC_POLYHEDRA)}", first.pos)
        slots, seps = self.vertex_list(allow_empty=name is not None)
        end = self.peek()
        if end.kind != "end":
            hint = ""
            if end.kind == "*":
                hint = "; '*' follows the number of vertices of a polyhedron, as in '8*'"
            elif end.kind == ")":
                hint = "; this ')' has no matching '('"
            raise self._error(f"unexpected {_describe(end)}; expected the end of the notation"
                              f"{hint}", end.pos)
        return name, slots, seps

    def vertex_list(self, allow_empty: bool
                    ) -> tuple[list[_Slot | None], list[tuple[str, int]]]:
        slots = [self.slot()]
        seps = []
        while self.peek().kind in (".", ":"):
            sep = self.take()
            seps.append((sep.kind, sep.pos))
            slots.append(self.slot())
        if not seps and slots[0] is None and not allow_empty:
            tok = self.peek()
            raise self._error(f"expected a tangle such as '3' or '(3,2)', found {_describe(tok)}",
                              tok.pos)
        return slots, seps

    def slot(self) -> _Slot | None:
        if self.peek().kind in (".", ":", "end"):
            return None
        return self.tangle()

    def _starts_factor(self, k: int = 0) -> bool:
        return self.peek(k).kind in ("num", "(", "-")

    def tangle(self) -> _Slot:
        start = self.peek()
        items = [self.product()]
        while self.peek().kind == ",":
            comma = self.take()
            if not self._starts_factor():
                raise self._error(f"expected a tangle after ',', found {_describe(self.peek())}",
                                  self.peek().pos if self.peek().kind != "end" else comma.pos + 1)
            items.append(self.product())
        extra = 0
        sign_tok = None
        while self.peek().kind in ("+", "-"):
            sign_tok = sign_tok or self.peek()
            extra += 1 if self.take().kind == "+" else -1
        if sign_tok is not None:
            if len(items) < 2:
                raise self._error(f"a trailing {sign_tok.text!r} adds a tangle to a comma list "
                                  f"and must end one, as in '3,3,2{sign_tok.text}'", sign_tok.pos)
            if self._starts_factor() or self.peek().kind in ("+", ","):
                tok = self.peek()
                raise self._error(f"unexpected {_describe(tok)} after the trailing signs, "
                                  "which must end the comma list", tok.pos)
        if len(items) == 1:
            return items[0]
        return _Slot.ramify(items, extra, start.pos)

    def product(self) -> _Slot:
        acc = self.factor()
        while True:
            tok = self.peek()
            if tok.kind in ("num", "("):
                acc = acc.times(self.factor())
            elif tok.kind == "-" and self._starts_factor(1) and self.peek(1).kind != "-":
                acc = acc.times(self.factor())
            else:
                return acc

    def _run_continues(self, k: int) -> bool:
        """Whether the token at offset ``k`` continues a spaced run (a spaced ``3`` or ``-3``)."""
        tok = self.peek(k)
        if tok.kind == "num":
            return tok.space_before
        return (tok.kind == "-" and tok.space_before and self.peek(k + 1).kind == "num"
                and not self.peek(k + 1).space_before)

    def factor(self) -> _Slot:
        tok = self.peek()
        if (tok.kind == "-" and self.peek(1).kind == "num" and not self.peek(1).space_before
                and self._run_continues(2)):
            self.take()  # '-2 3': the sign of the first entry of a spaced run, as in '3 -2'
            return self.run(first_sign=-1)
        if tok.kind == "-":
            self.take()
            if not self._starts_factor():
                raise self._error(f"expected a tangle after '-', found {_describe(self.peek())}",
                                  self.peek().pos)
            return self.factor().mirror()
        if tok.kind == "(":
            self.take()
            if self.peek().kind == ")":
                raise self._error("empty parentheses; expected a tangle inside", tok.pos)
            if not self._starts_factor():
                raise self._error(f"expected a tangle after '(', found {_describe(self.peek())}",
                                  self.peek().pos)
            inner = self.tangle()
            close = self.peek()
            if close.kind != ")":
                raise self._error(f"'(' is never closed: expected ')', found "
                                  f"{_describe(close)}", tok.pos)
            self.take()
            return _Slot(inner.tangle, None)
        if tok.kind == "num":
            return self.run()
        raise self._error(f"expected a tangle (digits, '(' or '-'), found {_describe(tok)}",
                          tok.pos)

    def run(self, first_sign: int = 1) -> _Slot:
        """A rational run: digits of one token, or space-separated (signed) entries."""
        first = self.take()
        entries: list[tuple[str, int]] = [("-" + first.text if first_sign < 0 else first.text,
                                           first.pos)]
        while self._run_continues(0):
            tok = self.peek()
            if tok.kind == "num":
                entries.append((self.take().text, tok.pos))
            else:
                self.take()
                entries.append(("-" + self.take().text, tok.pos))
        if len(entries) == 1:
            values = [int(d) for d in first.text]
        else:
            values = [int(t) for t, _ in entries]
        return _Slot.rational(values)


@dataclass(frozen=True)
class _Slot:
    """A parsed tangle, with its Conway entries while it is a rational chain."""

    tangle: Tangle
    entries: tuple[int, ...] | None

    @staticmethod
    def rational(values: list[int]) -> "_Slot":
        t = integer_tangle(values[0])
        for a in values[1:]:
            t = t.product(integer_tangle(a))
        return _Slot(t, tuple(values))

    def times(self, other: "_Slot") -> "_Slot":
        """Conway's product; the entries of a run continue the chain one by one."""
        if other.entries is None:
            return _Slot(self.tangle.product(other.tangle), None)
        t = self.tangle
        for a in other.entries:
            t = t.product(integer_tangle(a))
        return _Slot(t, None if self.entries is None else self.entries + other.entries)

    def mirror(self) -> "_Slot":
        entries = None if self.entries is None else tuple(-a for a in self.entries)
        return _Slot(self.tangle.mirror(), entries)

    @staticmethod
    def ramify(items: list["_Slot"], extra: int, pos: int) -> "_Slot":
        last = items[-1]
        if extra and last.entries is not None:
            f = continued_fraction(last.entries)
            if f is not None and f != 0:
                merged = tangle_from_fraction(1 / Fraction(f) + extra)
                body = ramification([s.tangle for s in items[:-1]])
                return _Slot(body + merged, None)
        t = ramification([s.tangle for s in items])
        if extra:
            t = t + integer_tangle(extra)
        return _Slot(t, None)


def _vertex_tangles(name: str, slots: list[_Slot | None], seps: list[tuple[str, int]],
                    text: str) -> list[Tangle | None]:
    """Tangles per vertex after the reading of the colon (see the module docstring)."""
    n = basic_polyhedron(name).number_of_vertices()
    out: list[Tangle | None] = [None if slots[0] is None else slots[0].tangle]
    for (sep, pos), slot in zip(seps, slots[1:], strict=True):
        if sep == ":":
            if name == "6*":
                if out[-1] is not None:
                    out[-1] = out[-1].reflection()  # 'a:' is 'a0.'
            else:
                out.append(None)  # ':' is '.1.'
        out.append(None if slot is None else slot.tangle)
        if len(out) > n:
            raise NotationError(f"Conway notation: {name} has {n} "
                                f"{'vertex' if n == 1 else 'vertices'}, but this "
                                f"{sep!r} starts a tangle for vertex {len(out)}", value=text,
                                where=f"position {pos + 1}")
    return out


def rational_chain(text: str) -> list[int] | None:
    """The continued-fraction entries of a notation that is one rational chain, else None.

    ``"2312"``, ``"2 3 1 2"``, ``"-2 3"`` and ``"(-2) 3"`` are chains (their
    knots are 2-bridge); ``"3,3,2"``, ``".2.20"`` and ``"8*"`` are not.  The
    entries are those the diagram of :func:`parse_conway_notation` is built
    from, so the fraction ``an + 1/(... + 1/a1)`` is that knot's.

    Raises
    ------
    NotationError
        On malformed notation.

    Examples
    --------
    >>> rational_chain("2312"), rational_chain("-2 3"), rational_chain("3,3,2")
    ([2, 3, 1, 2], [-2, 3], None)
    """
    if not isinstance(text, str):
        raise NotationError(f"Conway notation: expected text, got {type(text).__name__}",
                            value=text)
    name, slots, seps = _Parser(text).notation()
    if name is not None or seps or slots[0] is None or slots[0].entries is None:
        return None
    return list(slots[0].entries)


def conway_vertex_tangles(text: str) -> tuple[str, list[Tangle | None]]:
    """The basic polyhedron of a notation and the tangle at each of its vertices.

    An algebraic notation (no separator and no polyhedron) is ``("1*",
    [tangle])``.  ``None`` stands for the tangle 1.

    Raises
    ------
    NotationError
        On malformed notation, with the position of the fault.

    Examples
    --------
    >>> name, tangles = conway_vertex_tangles(".2.20")
    >>> name, len(tangles), tangles[0] is None
    ('6*', 3, True)
    """
    if not isinstance(text, str):
        raise NotationError(f"Conway notation: expected text, got {type(text).__name__}",
                            value=text)
    parser = _Parser(text)
    name, slots, seps = parser.notation()
    if name is None:
        name = "6*" if seps else "1*"
    return name, _vertex_tangles(name, slots, seps, text)


def conway_tangle(text: str) -> Tangle:
    """The tangle of an algebraic notation such as ``"2112"``, ``"3,3,2-"`` or ``"(3,2)(21,2)"``.

    Raises
    ------
    NotationError
        On malformed notation, or for a polyhedral notation (which names a
        knot, not a tangle).

    Examples
    --------
    >>> conway_tangle("3,3,2").number_of_crossings()
    8
    """
    name, tangles = conway_vertex_tangles(text)
    if name != "1*":
        raise NotationError(f"Conway notation: {text!r} is a knot on the polyhedron {name}, "
                            "not an algebraic tangle", value=text)
    return tangles[0] if tangles[0] is not None else integer_tangle(1)


def parse_conway_notation(text: str) -> Diagram:
    """The diagram of a knot or link written in Conway's notation.

    Parameters
    ----------
    text : str
        Conway's notation as in Conway 1970 and Rolfsen 1976, Appendix C
        (the grammar is in the module docstring).

    Returns
    -------
    Diagram
        For the table's notations, a diagram with the knot's crossing number
        of crossings, alternating when the notation has no minus sign.

    Raises
    ------
    NotationError
        On malformed notation: the message gives the reason and ``where`` the
        1-based character position.

    Examples
    --------
    >>> from knotsift.invariants.jones import jones_polynomial
    >>> str(jones_polynomial(parse_conway_notation("3")))
    't + t^3 - t^4'
    >>> parse_conway_notation("8*").number_of_crossings()
    8
    """
    name, tangles = conway_vertex_tangles(text)
    if name == "1*":
        t = tangles[0] if tangles[0] is not None else integer_tangle(1)
        return t.numerator()
    return basic_polyhedron(name).substitute(tangles)

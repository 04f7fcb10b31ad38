"""PD codes as text: JSON arrays, ``PD[X[...], ...]`` and lists of 4-tuples.

Three spellings of the same PD code (common practice for the crossings:
labels counter-clockwise from the incoming under-strand) are read:

* JSON: ``[[1, 5, 2, 4], [3, 1, 4, 6], [5, 3, 6, 2]]``;
* ``PD[X[1, 5, 2, 4], X[3, 1, 4, 6], X[5, 3, 6, 2]]`` (the ``PD[...]`` around
  the crossings may be left out);
* 4-tuples separated by spaces or commas: ``(1,5,2,4) (3,1,4,6) (5,3,6,2)``,
  optionally inside ``[...]``.

Uncertain crossings (a marker of this project, for imperfect micrographs
whose over/under was not clearly seen): a fifth entry ``"?"`` in the JSON form
(``[1, 5, 2, 4, "?"]``), or a ``?`` straight after the crossing in the other
forms (``(1,5,2,4)?``, ``X[1,5,2,4]?``).  The empty code ``[]`` is the unknot.
"""

from __future__ import annotations

import json
from typing import Iterable

from ..diagram import Diagram
from ..errors import NotationError

__all__ = ["parse_pd", "parse_pd_with_uncertain", "write_pd"]

_DIGITS = "0123456789"
_MINUS = "-\u2212"


def _from_json(text: str) -> tuple[list[tuple[int, ...]], list[int]]:
    try:
        data = json.loads(text)
    except json.JSONDecodeError as err:
        raise NotationError(
            f"PD code is not valid JSON: {err.msg} (line {err.lineno}, column {err.colno}); "
            "expected an array of 4-integer arrays", value=text,
            where=f"position {err.pos + 1}") from None
    except RecursionError:
        raise NotationError("PD code is nested too deeply; expected an array of 4-integer "
                            "arrays", value=text) from None
    if not isinstance(data, list):
        raise NotationError(f"PD code: expected a JSON array of crossings, found "
                            f"{type(data).__name__}", value=data)
    crossings, uncertain = [], []
    for i, x in enumerate(data):
        ok = isinstance(x, list) and (len(x) == 4 or (len(x) == 5 and x[4] == "?"))
        labels = x[:4] if ok else []
        if ok and all(isinstance(e, int) and not isinstance(e, bool) for e in labels):
            crossings.append(tuple(labels))
            if len(x) == 5:
                uncertain.append(i)
            continue
        shown = json.dumps(x) if not isinstance(x, float) or x == x else repr(x)
        raise NotationError(
            f"PD code: expected an array of 4 integer labels, optionally followed "
            f"by \"?\", found {shown[:60]}", value=x, where=f"crossing {i}")
    return crossings, uncertain


class _Scanner:
    """Hand-written scanner for the ``PD[X[...]]`` and tuple forms."""

    def __init__(self, text: str):
        self.text = text
        self.pos = 0

    def skip(self, chars: str = " \t\r\n") -> None:
        while self.pos < len(self.text) and self.text[self.pos] in chars:
            self.pos += 1

    def peek(self) -> str:
        return self.text[self.pos] if self.pos < len(self.text) else ""

    def fail(self, expected: str, crossing: int | None = None) -> NotationError:
        found = repr(self.text[self.pos]) if self.pos < len(self.text) else "end of text"
        where = f"position {self.pos + 1}"
        if crossing is not None:
            where = f"crossing {crossing}, {where}"
        return NotationError(f"PD code: expected {expected}, found {found}", value=self.text,
                             where=where)

    def integer(self, crossing: int) -> int:
        self.skip()
        start = self.pos
        if self.peek() and self.peek() in "+" + _MINUS:
            self.pos += 1
        digits = self.pos
        while self.peek() and self.peek() in _DIGITS:
            self.pos += 1
        if self.pos == digits:
            self.pos = start
            raise self.fail("an integer label", crossing)
        value = int(self.text[digits:self.pos])
        return -value if self.text[start] in _MINUS else value


def _from_text(text: str) -> tuple[list[tuple[int, ...]], list[int]]:
    s = _Scanner(text)
    s.skip()
    wrapped = False
    if s.text[s.pos:s.pos + 2].upper() == "PD":
        s.pos += 2
        s.skip()
        if s.peek() != "[":
            raise s.fail("'[' after PD")
        s.pos += 1
        wrapped = True
    elif s.peek() == "[":
        s.pos += 1
        wrapped = True
    crossings: list[tuple[int, ...]] = []
    uncertain: list[int] = []
    while True:
        s.skip(" \t\r\n,")
        ch = s.peek()
        if wrapped and ch == "]":
            s.pos += 1
            break
        if not ch:
            if wrapped:
                raise s.fail("']' closing the PD code")
            break
        k = len(crossings)
        if ch in "Xx":
            s.pos += 1
            s.skip()
            if s.peek() != "[":
                raise s.fail("'[' after X", k)
            close = "]"
        elif ch == "(":
            close = ")"
        else:
            raise s.fail("'X[' or '(' starting a crossing", k)
        s.pos += 1
        labels = []
        for j in range(4):
            labels.append(s.integer(k))
            s.skip()
            if j < 3:
                if s.peek() != ",":
                    raise s.fail(f"',' after label {j + 1} of 4", k)
                s.pos += 1
        if s.peek() != close:
            raise s.fail(f"{close!r} after the 4th label", k)
        s.pos += 1
        s.skip(" \t")
        if s.peek() == "?":
            uncertain.append(k)
            s.pos += 1
        crossings.append(tuple(labels))
    s.skip()
    if s.pos < len(s.text):
        raise s.fail("the end of the PD code")
    return crossings, uncertain


def _read(text: str) -> tuple[list[tuple[int, ...]], list[int]]:
    if not isinstance(text, str):
        raise NotationError(f"PD code: expected text, got {type(text).__name__}", value=text)
    body = text.strip()
    if not body:
        raise NotationError("PD code: empty text; expected crossings such as "
                            "'[[1, 5, 2, 4], [3, 1, 4, 6], [5, 3, 6, 2]]' ('[]' is the unknot)",
                            value=text)
    if body[0] == "[" and body[1:].lstrip()[:1] in ("[", "]"):
        return _from_json(body)
    return _from_text(text)


def parse_pd(text: str) -> Diagram:
    """The diagram of a PD code written as text.

    Parameters
    ----------
    text : str
        A PD code in one of the forms of the module docstring.

    Returns
    -------
    Diagram
        The crossings in the order written; ``[]`` gives the unknot.

    Raises
    ------
    NotationError
        On a syntax error, with the position and the crossing.
    DiagramError
        When the crossings do not form a valid planar diagram (a label not
        used twice, inconsistent orientation, not planar).

    Examples
    --------
    >>> parse_pd("PD[X[1,5,2,4], X[3,1,4,6], X[5,3,6,2]]").signs()
    (1, 1, 1)
    >>> parse_pd("[[1, 5, 2, 4], [3, 1, 4, 6], [5, 3, 6, 2]]").writhe()
    3
    """
    return parse_pd_with_uncertain(text)[0]


def parse_pd_with_uncertain(text: str) -> tuple[Diagram, list[int]]:
    """The diagram of a PD code and the indices of its crossings marked uncertain.

    Examples
    --------
    >>> diagram, unsure = parse_pd_with_uncertain("(1,5,2,4) (3,1,4,6)? (5,3,6,2)")
    >>> unsure
    [1]
    >>> parse_pd_with_uncertain('[[1, 5, 2, 4, "?"], [3, 1, 4, 6], [5, 3, 6, 2]]')[1]
    [0]
    """
    crossings, uncertain = _read(text)
    return Diagram.from_pd(crossings), uncertain


def write_pd(diagram: Diagram, uncertain: Iterable[int] = ()) -> str:
    """The PD code of a diagram as JSON text, ``"?"`` after uncertain crossings.

    Raises
    ------
    NotationError
        When the diagram has free loops beside its crossings (a PD code
        cannot show them), or an uncertain index is not a crossing.

    Examples
    --------
    >>> write_pd(Diagram([(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)]), uncertain=[2])
    '[[1, 5, 2, 4], [3, 1, 4, 6], [5, 3, 6, 2, "?"]]'
    """
    n = diagram.number_of_crossings()
    if diagram.free_loops and (n or diagram.free_loops > 1):
        raise NotationError(
            f"a PD code cannot show {diagram.free_loops} free loop(s) beside {n} crossings; "
            "expected a diagram whose every component has a crossing (or the unknot)",
            value=diagram)
    marked = set()
    for i in uncertain:
        if isinstance(i, bool) or not isinstance(i, int) or not 0 <= i < n:
            raise NotationError(f"uncertain crossing index must be 0..{n - 1}, got {i!r}",
                                value=i)
        marked.add(i)
    rows = []
    for i, x in enumerate(diagram.crossings):
        row = list(x) + (["?"] if i in marked else [])
        rows.append(row)
    return json.dumps(rows)

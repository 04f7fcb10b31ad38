"""Telling the notation of a knot written as text, and parsing it.

:func:`detect_notation` applies these rules in order:

1. A leading name ``PD``, ``DT``, ``Gauss``, ``braid`` or ``Conway`` followed
   by ``:`` (or, for ``PD`` and ``DT``, by ``[``) names the notation.
2. An entry ``O<n>`` or ``U<n>``: ``"gauss"``.
3. ``X[`` anywhere, text starting with ``[(`` or ``[[`` (without ``^``), or
   integers in parentheses ``(1,5,2,4) ...``: ``"pd"``, unless its integers
   pair up as a Gauss code (rule 6c), as in ``[[1, -2], [2, -1]]``.
4. A ``|``, a ``;``, or several non-empty lines: ``"gauss"``.
5. Any other letter, ``^`` or ``(``: ``"braid"`` (``s1^3 s2^-1``, ``aaaB``).
6. Integers only (spaces, commas, one pair of brackets):

   a. one unsigned digit string such as ``3`` or ``2112``: ``"conway"``
      (as does any text of digits, ``,+-()`` with a ``*``, ``.`` or ``:``, the
      algebraic and polyhedral forms such as ``.2.20``, ``8*20`` or ``3:2:2``);
   b. non-zero even numbers whose absolute values are 2, 4, ..., 2n: ``"dt"``;
   c. every absolute value twice, once positive and once negative: ``"gauss"``;
   d. anything else: ``"braid"``.

Text of brackets only is the unknot: ``[]`` as a PD code, ``()`` as a Gauss
code.  Spaced Conway notation such as ``3 2`` reads as a braid by rule 6d; write
``Conway: 3 2`` or pass ``notation="conway"``.

Readings that are not clear-cut (rule 5 for words of letters beyond ``e``,
rules 6c and 6d) get a note from :func:`detection_note` saying what was
chosen and how to force another; :func:`reading_of` tells named, given and
detected notations apart for the result.
"""

from __future__ import annotations

from typing import Callable

from ..diagram import Diagram
from ..errors import NotationError
from .braid import parse_braid
from .conway_algebraic import parse_conway_notation
from .dt import parse_dt
from .gauss import parse_gauss_with_uncertain
from .pd import parse_pd_with_uncertain

__all__ = ["NOTATIONS", "detect_notation", "detection_note", "parse_any",
           "parse_any_with_uncertain", "reading_of"]

_FORCE = ("to choose the reading, start the text with 'PD:', 'DT:', 'Gauss:', 'braid:' or "
          "'Conway:' (or pass --notation / notation=)")

NOTATIONS = ("pd", "dt", "gauss", "braid", "conway")

_DIGITS = "0123456789"
_MINUS = "-\u2212"


def _named(text: str) -> tuple[str, str] | None:
    """(notation, rest of the text) when the text starts with a notation's name."""
    body = text.lstrip()
    lower = body.lower()
    for name in ("gauss code", "gauss", "conway", "braid", "pd", "dt"):
        if lower.startswith(name):
            rest = body[len(name):].lstrip(" \t")
            key = name.split()[0]
            if rest.startswith(":"):
                return key, rest[1:]
            if rest.startswith("[") and key in ("pd", "dt"):
                return key, body
    return None


def _integers(text: str) -> list[int] | None:
    """The integers of a text made only of integers and separators, else None."""
    out = []
    i = 0
    while i < len(text):
        ch = text[i]
        if ch.isspace() or ch in ",[]()?":  # '?' marks an uncertain crossing
            i += 1
            continue
        j = i + 1 if ch in "+" + _MINUS else i
        k = j
        while k < len(text) and text[k] in _DIGITS:
            k += 1
        if k == j:
            return None
        value = int(text[j:k])
        out.append(-value if ch in _MINUS else value)
        i = k
    return out


def _pairs_up(numbers: list[int]) -> bool:
    """Every absolute value exactly twice, once positive and once negative."""
    seen: dict[int, list[int]] = {}
    for x in numbers:
        seen.setdefault(abs(x), []).append(x)
    return bool(numbers) and 0 not in seen and all(
        len(v) == 2 and v[0] == -v[1] for v in seen.values())


def _is_dt(numbers: list[int]) -> bool:
    n = len(numbers)
    return n > 0 and all(x != 0 and x % 2 == 0 for x in numbers) and \
        sorted(abs(x) for x in numbers) == list(range(2, 2 * n + 1, 2))


def detect_notation(text: str) -> str:
    """The notation a knot is written in, by the rules of the module docstring.

    Parameters
    ----------
    text : str

    Returns
    -------
    str
        One of ``"pd"``, ``"dt"``, ``"gauss"``, ``"braid"``, ``"conway"``.

    Raises
    ------
    NotationError
        For empty text or text that fits none of the rules.

    Examples
    --------
    >>> detect_notation("PD[X[1,5,2,4], X[3,1,4,6], X[5,3,6,2]]")
    'pd'
    >>> detect_notation("4 6 2"), detect_notation("1 1 1"), detect_notation("2112")
    ('dt', 'braid', 'conway')
    >>> detect_notation("O1+ U2+ O3+ U1+ O2+ U3+")
    'gauss'
    """
    if not isinstance(text, str):
        raise NotationError(f"expected text, got {type(text).__name__}", value=text)
    body = text.strip()
    if not body:
        raise NotationError("empty text; expected a knot in one of the notations "
                            f"{', '.join(NOTATIONS)}", value=text)
    named = _named(body)
    if named:
        return named[0]
    squeezed_body = "".join(body.split())
    if any(ch in squeezed_body for ch in "*.:") and all(
            ch in _DIGITS + ",.:*+-()" for ch in squeezed_body):
        return "conway"  # the algebraic and polyhedral forms: .2.20, 8*20, 3:2:2
    for i, ch in enumerate(body[:-1]):
        if ch in "OoUu" and body[i + 1] in _DIGITS and (i == 0 or not body[i - 1].isalpha()):
            return "gauss"
    numbers = _integers(body)
    squeezed = "".join(body.split())
    if numbers == []:  # brackets only: the unknot, "[]" as a PD code, "()" as a Gauss code
        return "pd" if squeezed == "[]" else "gauss"
    has_x = "X[" in squeezed.upper()
    if has_x or (numbers is not None and squeezed.startswith("(")) or (
            "^" not in body and squeezed.startswith(("[(", "[["))):
        if numbers is not None and _pairs_up(numbers):
            return "gauss"
        return "pd"
    if any(ch in body for ch in "|;") or sum(1 for line in body.splitlines() if line.strip()) > 1:
        return "gauss"
    if numbers is None:
        if any(ch.isalpha() for ch in body) or "^" in body or "(" in body:
            return "braid"
        bad = next((i for i, ch in enumerate(body)
                    if not (ch.isspace() or ch in ",[]()?+" + _MINUS + _DIGITS)), 0)
        raise NotationError(
            f"cannot tell the notation: unexpected {body[bad]!r}; expected one of "
            f"{', '.join(NOTATIONS)}", value=text, where=f"position {text.find(body) + bad + 1}")
    inner = body[1:-1].strip() if body.startswith("[") and body.endswith("]") else body
    if inner and all(ch in _DIGITS for ch in inner):
        return "conway"
    if _is_dt(numbers):
        return "dt"
    if _pairs_up(numbers):
        return "gauss"
    return "braid"


def detection_note(text: str, notation: str) -> str | None:
    """Why a detected reading may not be the one meant, and how to force another.

    None when the detection is clear-cut: a named notation, PD and Gauss
    codes with their own marks (``X[``, ``O1+``), DT codes, or Conway's
    digit strings and algebraic forms.  A note when integers alone were read
    as a braid word or as a Gauss code, or when letters alone were read as a
    braid word with generators beyond sigma_5 (``hello`` is a braid on 16
    strands).

    Examples
    --------
    >>> detection_note("4 6 2 2", "braid").startswith("read as a braid word")
    True
    >>> detection_note("DT: 4 6 2", "dt") is None
    True
    """
    if not isinstance(text, str) or _named(text):
        return None
    body = text.strip()
    numbers = _integers(body)
    if notation == "braid" and numbers:
        why = ("read as a braid word (integer i is sigma_i, -i its inverse): these integers "
               "are neither a DT code (2, 4, ..., 2n, each once) nor a Gauss code (each "
               "number once positive and once negative); spaced Conway notation such as "
               "'3 2' reads this way too")
        if all(x != 0 and x % 2 == 0 for x in numbers):
            why += ("; all of them are even, as in a DT code, so a mistyped DT code is "
                    "likely")
        return f"{why}; {_FORCE}"
    letters = body.replace(" ", "")
    top = max((ord(ch.lower()) - ord("a") + 1 for ch in letters if ch.isalpha()), default=0)
    if notation == "braid" and letters.isalpha() and top > 5:
        return (f"read as a braid word in letters (a = sigma_1, b = sigma_2, ..., capitals "
                f"the inverses): generators up to sigma_{top}, a braid on {top + 1} strands; "
                f"{_FORCE}")
    if notation == "gauss" and numbers and not any(ch in body for ch in "|;\n"):
        return ("read as a Gauss code, because each number appears once positive and once "
                f"negative; {_FORCE}")
    return None


def reading_of(text, given: str | None, used: str) -> tuple[str, str | None]:
    """How the notation of an input was settled, and a note when the detection is unsure.

    Returns
    -------
    (str, str or None)
        ``"given"`` (passed by the caller), ``"named"`` (the text starts
        with the notation's name) or ``"detected"``; and
        :func:`detection_note` for detected readings.
    """
    if given is not None:
        return "given", None
    if isinstance(text, str) and _named(text):
        return "named", None
    return "detected", detection_note(text, used)


def _pd(text: str) -> tuple[Diagram, list[int]]:
    return parse_pd_with_uncertain(text)


def _plain(parse: Callable[[str], Diagram]) -> Callable[[str], tuple[Diagram, list[int]]]:
    return lambda text: (parse(text), [])


_PARSERS: dict[str, Callable[[str], tuple[Diagram, list[int]]]] = {
    "pd": _pd,
    "dt": _plain(parse_dt),
    "gauss": parse_gauss_with_uncertain,
    "braid": _plain(parse_braid),
    "conway": _plain(parse_conway_notation),
}


def parse_any_with_uncertain(text: str, notation: str | None = None
                             ) -> tuple[Diagram, list[int]]:
    """The diagram of a knot in any notation, and the indices of its uncertain crossings.

    Parameters
    ----------
    text : str
    notation : {"pd", "dt", "gauss", "braid", "conway"}, optional
        Skip detection and read the text in this notation.

    Returns
    -------
    (Diagram, list of int)
        Uncertain crossings exist only in PD and Gauss codes; for the other
        notations the list is empty.

    Raises
    ------
    NotationError
        For an unknown notation name (listing the known ones) or bad text.

    Examples
    --------
    >>> diagram, unsure = parse_any_with_uncertain("(1,5,2,4)? (3,1,4,6) (5,3,6,2)")
    >>> diagram.writhe(), unsure
    (3, [0])
    """
    if notation is None:
        notation = detect_notation(text)
    elif not isinstance(notation, str) or notation.lower() not in _PARSERS:
        raise NotationError(f"unknown notation {notation!r}; expected one of "
                            f"{', '.join(NOTATIONS)}", value=notation)
    notation = notation.lower()
    named = _named(text) if isinstance(text, str) else None
    if named and named[0] == notation:
        text = named[1]
    return _PARSERS[notation](text)


def parse_any(text: str, notation: str | None = None) -> Diagram:
    """The diagram of a knot in any notation (see :func:`detect_notation`).

    Examples
    --------
    >>> from knotsift.invariants.jones import jones_polynomial
    >>> str(jones_polynomial(parse_any("DT: 4 6 8 2")))
    't^-2 - t^-1 + 1 - t + t^2'
    >>> parse_any("s1^3", notation="braid").writhe()
    3
    """
    return parse_any_with_uncertain(text, notation)[0]

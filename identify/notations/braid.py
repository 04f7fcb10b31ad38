"""Artin braid words and the diagrams of their closures.

Generator ``sigma_i`` (``i >= 1``) crosses the strands at positions ``i`` and
``i + 1``.  With the strands running upwards, ``sigma_i`` takes the strand
from the lower left over to the upper right, so it is a positive
(right-handed) crossing; ``sigma_i^-1`` is negative.  The closure of
``sigma_1^3`` on two strands is the right-handed trefoil.  In the closure
every strand keeps running upwards (the closing arcs go round on the right),
which fixes the orientation of every component.

Words are read from text in any of these forms, which may be mixed:

* integers ``1 -2 1 -2`` or ``[1, 1, 1]`` (``-i`` is ``sigma_i^-1``);
* ``s1^3 s2^-1 s1`` (also ``σ1``, ``s_1``, ``s1^{-1}``; ``S2`` is ``s2^-1``);
* letters ``aaaB``: ``a`` is ``sigma_1``, ``b`` is ``sigma_2``, ...; capitals
  are the inverses.

An exponent ``^k`` may follow any generator or a parenthesised group,
``(s1 s2)^3``; a negative power of a group is the inverse braid.  Strands that carry no crossing
become free unknotted components of the closure (``free_loops``).
"""

from __future__ import annotations

from typing import Sequence

from ..diagram import Diagram
from ..errors import NotationError
from .gauss import _diagram_from_quads

__all__ = ["parse_braid", "braid_word", "write_braid"]

_DIGITS = "0123456789"
_MINUS = "-\u2212"
_MAX_CROSSINGS = 100_000


def _integer(text: str, i: int) -> tuple[int, int] | None:
    """A signed integer at ``i`` (``-1``, ``{-1}``, ``(-1)``): (value, next index) or None."""
    close = None
    j = i
    if j < len(text) and text[j] in "{(":
        close = "}" if text[j] == "{" else ")"
        j += 1
    sign = 1
    if j < len(text) and text[j] in "+" + _MINUS:
        sign = -1 if text[j] in _MINUS else 1
        j += 1
    k = j
    while k < len(text) and text[k] in _DIGITS:
        k += 1
    if k == j:
        return None
    value = sign * int(text[j:k])
    if close:
        if k >= len(text) or text[k] != close:
            return None
        k += 1
    return value, k


def braid_word(word: str | Sequence[int]) -> list[int]:
    """The braid word as a list of non-zero integers (``-i`` for ``sigma_i^-1``).

    Parameters
    ----------
    word : str or sequence of int
        Text in any form of the module docstring, or a sequence of integers.

    Raises
    ------
    NotationError
        On a syntax error or a zero generator, with the position and token.

    Examples
    --------
    >>> braid_word("s1^3 s2^-1 s1")
    [1, 1, 1, -2, 1]
    >>> braid_word("aaaB")
    [1, 1, 1, -2]
    """
    if not isinstance(word, str):
        try:
            items = list(word)
        except TypeError:
            raise NotationError(f"braid word: expected text or a sequence of integers, got "
                                f"{type(word).__name__}", value=word) from None
        for k, x in enumerate(items):
            if isinstance(x, bool) or not isinstance(x, int) or x == 0:
                raise NotationError(f"braid word: expected a non-zero integer generator, "
                                    f"found {x!r}", value=x, where=f"token {k}")
            if abs(x) >= _MAX_CROSSINGS:
                raise NotationError(f"braid word: generator index {abs(x)} is too large; "
                                    f"expected at most {_MAX_CROSSINGS - 1}", value=x,
                                    where=f"token {k}")
        if len(items) > _MAX_CROSSINGS:
            raise NotationError(f"braid word: more than {_MAX_CROSSINGS} crossings; expected a "
                                "shorter word", value=len(items))
        return list(items)
    text = word
    i = 0
    while i < len(text) and text[i].isspace():
        i += 1
    if text[i:i + 5].lower() == "braid":
        i += 5
        while i < len(text) and text[i] in " \t":
            i += 1
        if i < len(text) and text[i] == ":":
            i += 1
    stack: list[tuple[list[int], int]] = [([], -1)]  # (generators, position of its '(')
    wrapped = None
    token = 0
    while i < len(text):
        ch = text[i]
        start = i
        out = stack[-1][0]
        if ch.isspace() or ch == ",":
            i += 1
            continue
        if ch == "[" and wrapped is None and token == 0 and len(stack) == 1:
            wrapped = i
            i += 1
            continue
        if ch == "]" and wrapped is not None and len(stack) == 1:
            rest = text[i + 1:].strip()
            if rest:
                raise NotationError(
                    f"braid word: unexpected text {rest[:10]!r} after the closing bracket; "
                    "expected the end of the word", value=text, where=f"position {i + 2}")
            wrapped = None
            i = len(text)
            break
        if ch == "(":
            stack.append(([], i))
            i += 1
            continue
        where = f"token {token}, position {start + 1}"
        if ch == ")":
            if len(stack) == 1:
                raise NotationError("braid word: ')' without a matching '('", value=text,
                                    where=where)
            group, _ = stack.pop()
            out = stack[-1][0]
            gens = group
            i += 1
        elif ch in "sSσΣ" and i + 1 < len(text) and (text[i + 1] in _DIGITS or
                                                     text[i + 1] == "_"):
            j = i + 1 + (text[i + 1] == "_")
            k = j
            while k < len(text) and text[k] in _DIGITS:
                k += 1
            if k == j:
                raise NotationError(f"braid word: expected a generator number after "
                                    f"{text[i:j]!r}, found {text[j:j + 1] or 'end of text'!r}",
                                    value=text, where=where)
            gens = [int(text[j:k]) * (-1 if ch in "SΣ" else 1)]
            i = k
        elif ch in _DIGITS or ch in "+" + _MINUS:
            got = _integer(text, i)
            if got is None:
                raise NotationError(f"braid word: expected a generator number after {ch!r}, "
                                    f"found {text[i + 1:i + 2] or 'end of text'!r}",
                                    value=text, where=where)
            gens, i = [got[0]], got[1]
        elif "a" <= ch <= "z" or "A" <= ch <= "Z":
            gen = ord(ch.lower()) - ord("a") + 1
            gens = [gen if ch.islower() else -gen]
            i += 1
        else:
            raise NotationError(
                f"braid word: unexpected character {ch!r}; expected generators such as '1', "
                "'-2', 's1^3' or letters 'aB'", value=text, where=where)
        if any(abs(g) >= _MAX_CROSSINGS for g in gens):
            raise NotationError(f"braid word: generator index {max(abs(g) for g in gens)} is "
                                f"too large; expected at most {_MAX_CROSSINGS - 1}", value=text,
                                where=where)
        if 0 in gens:
            raise NotationError("braid word: generator 0 does not exist; expected an index "
                                ">= 1 (sigma_1 crosses strands 1 and 2)", value=text,
                                where=where)
        power = 1
        if i < len(text) and text[i] == "^":
            got = _integer(text, i + 1)
            if got is None:
                raise NotationError(f"braid word: expected an integer exponent after '^', "
                                    f"found {text[i + 1:i + 2] or 'end of text'!r}",
                                    value=text, where=f"token {token}, position {i + 2}")
            power, i = got
        if abs(power) * len(gens) + len(out) > _MAX_CROSSINGS:
            raise NotationError(f"braid word: more than {_MAX_CROSSINGS} crossings; expected a "
                                "shorter word", value=text, where=where)
        from ..limits import check_at_most

        check_at_most("crossings", abs(power) * len(gens) + len(out),
                      "the number of crossings of the braid word", where=where)
        if power < 0:  # the inverse: reversed, each generator inverted
            gens = [-g for g in reversed(gens)]
        out += gens * abs(power)
        token += 1
    if len(stack) > 1:
        raise NotationError("braid word: '(' is never closed", value=text,
                            where=f"position {stack[-1][1] + 1}")
    if wrapped is not None:
        raise NotationError("braid word: '[' is never closed", value=text,
                            where=f"position {wrapped + 1}")
    out = stack[0][0]
    return out


def parse_braid(word: str | Sequence[int], strands: int | None = None) -> Diagram:
    """The diagram of the closure of a braid word.

    Parameters
    ----------
    word : str or sequence of int
        The braid word (see :func:`braid_word`).
    strands : int, optional
        Number of strands; at least ``max |i| + 1``, which is the default.

    Returns
    -------
    Diagram
        One crossing per letter, in order; strands without crossings are
        free loops.

    Raises
    ------
    NotationError
        On a bad word, or when ``strands`` is too small for the generators.

    Examples
    --------
    >>> from knotsift.invariants.jones import jones_polynomial
    >>> str(jones_polynomial(parse_braid("s1^3")))
    't + t^3 - t^4'
    >>> parse_braid([1, -2, 1, -2]).writhe()
    0

    Notes
    -----
    Linear in the length of the word.
    """
    gens = braid_word(word)
    needed = max((abs(g) for g in gens), default=0) + 1
    if strands is None:
        strands = needed
    elif isinstance(strands, bool) or not isinstance(strands, int) or not \
            needed <= strands <= _MAX_CROSSINGS:
        raise NotationError(
            f"braid: expected {needed} to {_MAX_CROSSINGS} strands for generators up to "
            f"sigma_{needed - 1}, got strands={strands!r}", value=strands)
    # labels: strand position p starts with label p at the bottom of the braid
    cur = list(range(strands + 1))  # cur[p] for p = 1..strands; cur[0] unused
    fresh = strands + 1
    quads: list[list[int]] = []
    for g in gens:
        i = abs(g)
        left, right = cur[i], cur[i + 1]
        top_left, top_right = fresh, fresh + 1
        fresh += 2
        if g > 0:  # over-strand from lower left to upper right
            quads.append([right, top_right, top_left, left])
        else:      # over-strand from lower right to upper left
            quads.append([left, right, top_right, top_left])
        cur[i], cur[i + 1] = top_left, top_right
    # the closing arc at position p joins the top label back to the bottom label p
    rename = {cur[p]: p for p in range(1, strands + 1) if cur[p] != p}
    quads = [[rename.get(e, e) for e in q] for q in quads]
    free = sum(1 for p in range(1, strands + 1) if cur[p] == p)
    if not quads:
        return Diagram([], free_loops=free)
    ends: dict[int, set[int]] = {}
    for k, q in enumerate(quads):
        for e in q:
            ends.setdefault(e, set()).add(k)
    heads = {}
    for k, g in enumerate(gens):
        q = quads[k]
        for e in ((q[3], q[0]) if g > 0 else (q[0], q[1])):  # the two strands entering
            if len(ends[e]) == 2:
                heads[e] = k
    return _diagram_from_quads(quads, heads, free, "braid closure")


def write_braid(word: Sequence[int] | str, style: str = "sigma") -> str:
    """A braid word as text.

    Parameters
    ----------
    word : sequence of int or str
    style : {"sigma", "list", "letters"}
        ``"sigma"``: ``s1^3 s2^-1 s1`` (runs of one generator as powers);
        ``"list"``: ``[1, 1, 1, -2, 1]``; ``"letters"``: ``aaaBa`` (up to 26
        generators).

    Examples
    --------
    >>> write_braid([1, 1, 1, -2, 1])
    's1^3 s2^-1 s1'
    >>> write_braid([1, 1, 1, -2, 1], style="letters")
    'aaaBa'
    """
    gens = braid_word(word)
    if style == "list":
        return "[" + ", ".join(str(g) for g in gens) + "]"
    if style == "letters":
        if any(abs(g) > 26 for g in gens):
            raise NotationError("braid word: letters reach only sigma_26; use style='sigma'",
                                value=gens)
        return "".join(chr(ord("a") + g - 1) if g > 0 else chr(ord("A") - g - 1) for g in gens)
    if style != "sigma":
        raise NotationError(f"braid word: unknown style {style!r}; expected 'sigma', 'list' or "
                            "'letters'", value=style)
    runs: list[list[int]] = []
    for g in gens:
        if runs and runs[-1][0] == g:
            runs[-1][1] += 1
        else:
            runs.append([g, 1])
    parts = []
    for g, n in runs:
        power = n if g > 0 else -n
        parts.append(f"s{abs(g)}" + ("" if power == 1 else f"^{power}"))
    return " ".join(parts)

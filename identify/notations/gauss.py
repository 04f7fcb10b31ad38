"""Gauss codes: the crossings met along each component, with over/under and sign.

Text syntax (our own, built on the usual letters):

* Signed entries ``O1+ U2- ...``: ``O`` (over) or ``U`` (under), the crossing
  number and the crossing sign.  All entries carry a sign or none does.
* Integer entries ``-1 3 -2 1 -3 2``: a positive number passes over that
  crossing, a negative one under it.  Crossing signs may follow a semicolon,
  one per crossing in increasing crossing number: ``1 -2 3 -1 2 -3 ; + + +``
  (or be passed as ``signs=``).
* Components are separated by ``|``, by line breaks outside brackets, or
  written as bracket groups: ``[[1, -2], [2, -1]]``.  An empty group ``()``
  is a circle without crossings.  The whole text may start with ``Gauss:``.
* A ``?`` straight after an entry (``O1+?``) flags a crossing whose over/under
  was not clearly seen; either occurrence may carry it.

With crossing signs the code fixes the diagram: together with which strand is
over, the sign fixes the counter-clockwise order of the four edges at each
crossing, hence the whole planar drawing.  Without signs the drawing of the
shadow is read off the interlacing of the code (:func:`_interlacement_turns`;
a general planar embedding by networkx for parts of several components) and
its mirror image is fixed by the rule of :func:`parse_gauss` (shared with
:mod:`knotsift.notations.dt`).

Crossing ``k`` of the resulting diagram is the crossing with the ``k``-th
smallest number in the code.
"""

from __future__ import annotations

from typing import NamedTuple, Sequence

from ..diagram import Diagram
from ..errors import NotationError

__all__ = ["parse_gauss", "parse_gauss_with_uncertain", "write_gauss"]

_DIGITS = "0123456789"
_MINUS = "-\u2212"
_MAX_DEPTH = 8


class _Visit(NamedTuple):
    """One passage of a component through a crossing."""

    crossing: int
    over: bool
    sign: int | None  # +1, -1 or None when the code carries no signs
    uncertain: bool
    where: str  # "component 0, entry 3 (position 12)"


# -- text -----------------------------------------------------------------

class _Entry(NamedTuple):
    crossing: int
    over: bool
    sign: int | None
    uncertain: bool
    lettered: bool
    pos: int


class _Group(NamedTuple):
    children: list
    pos: int
    bracketed: bool


def _strip_prefix(text: str) -> int:
    """Index after an optional leading ``Gauss:`` / ``Gauss code:``."""
    i = 0
    while i < len(text) and text[i].isspace():
        i += 1
    for word in ("gauss code", "gauss"):
        if text[i:i + len(word)].lower() == word:
            j = i + len(word)
            while j < len(text) and text[j] in " \t":
                j += 1
            if j < len(text) and text[j] == ":":
                j += 1
            return j
    return i


def _read_number(text: str, i: int) -> int:
    """Index after the run of ASCII digits starting at ``i``."""
    while i < len(text) and text[i] in _DIGITS:
        i += 1
    return i


def _shown(text: str, i: int) -> str:
    return repr(text[i]) if i < len(text) else "end of text"


def _parse_tree(text: str, start: int, stop: int) -> _Group:
    """Scan ``text[start:stop]`` into nested groups of entries and bars."""
    root = _Group([], start, False)
    stack = [(root, "")]
    i = start
    while i < stop:
        ch = text[i]
        group = stack[-1][0]
        if ch in " \t\r,":
            i += 1
        elif ch == "\n":
            if len(stack) == 1:
                group.children.append("|")
            i += 1
        elif ch == "|":
            group.children.append("|")
            i += 1
        elif ch in "[(":
            if len(stack) > _MAX_DEPTH:
                raise NotationError(
                    f"Gauss code: brackets nested more than {_MAX_DEPTH} deep; expected at most "
                    "a list of components", value=text, where=f"position {i + 1}")
            sub = _Group([], i, True)
            group.children.append(sub)
            stack.append((sub, "]" if ch == "[" else ")"))
            i += 1
        elif ch in "])":
            if len(stack) == 1 or stack[-1][1] != ch:
                expected = repr(stack[-1][1]) if len(stack) > 1 else "no closing bracket"
                raise NotationError(
                    f"Gauss code: unbalanced bracket {ch!r}; expected "
                    f"{expected}", value=text, where=f"position {i + 1}")
            stack.pop()
            i += 1
        elif ch in "OoUu":
            j = _read_number(text, i + 1)
            if j == i + 1:
                raise NotationError(
                    f"Gauss code: expected a crossing number after {ch!r}, "
                    f"found {_shown(text, i + 1)}", value=text, where=f"position {i + 2}")
            crossing = int(text[i + 1:j])
            sign = None
            if j < stop and text[j] in "+" + _MINUS:
                sign = 1 if text[j] == "+" else -1
                j += 1
            uncertain = j < stop and text[j] == "?"
            j += uncertain
            group.children.append(_Entry(crossing, ch in "Oo", sign, uncertain, True, i))
            i = j
        elif ch in _DIGITS or ch in "+" + _MINUS:
            j = i + 1 if ch in "+" + _MINUS else i
            k = _read_number(text, j)
            if k == j:
                raise NotationError(
                    f"Gauss code: expected a crossing number after the sign {ch!r}, "
                    f"found {_shown(text, j)}; crossing signs go after ';' or in the "
                    "signed form 'O1+'", value=text, where=f"position {i + 1}")
            crossing = int(text[j:k])
            uncertain = k < stop and text[k] == "?"
            k += uncertain
            group.children.append(
                _Entry(crossing, ch not in _MINUS, None, uncertain, False, i))
            i = k
        elif ch == "?":
            raise NotationError(
                "Gauss code: '?' does not follow an entry; expected it "
                "straight after one, as in 'O1+?'", value=text, where=f"position {i + 1}")
        else:
            raise NotationError(
                f"Gauss code: unexpected character {ch!r}; expected "
                "entries such as 'O1+', 'U2-' or '-3', separators ' ', ',', '|' or brackets",
                value=text, where=f"position {i + 1}")
    if len(stack) > 1:
        opened = stack[-1][0].pos
        raise NotationError(
            f"Gauss code: this bracket is never closed; expected "
            f"{stack[-1][1]!r} before the end of the text", value=text,
            where=f"position {opened + 1}")
    return root


def _components_of(group: _Group) -> list[list[_Entry]]:
    """Flatten a scanned group into components (lists of entries).

    Bars split a group into pieces; a piece is either a run of entries (one
    component) or bracketed groups (flattened in turn).  A bracketed group
    with nothing in it is a circle without crossings.
    """
    if group.bracketed and not group.children:
        return [[]]
    pieces: list[list] = [[]]
    for c in group.children:
        if isinstance(c, str):
            pieces.append([])
        else:
            pieces[-1].append(c)
    out: list[list[_Entry]] = []
    for piece in pieces:
        subgroups = [c for c in piece if isinstance(c, _Group)]
        entries = [c for c in piece if isinstance(c, _Entry)]
        if subgroups and entries:
            raise NotationError(
                "Gauss code: entry stands beside a bracketed "
                "component; expected components separated by '|' or each in its own brackets",
                value=entries[0], where=f"position {entries[0].pos + 1}")
        for sub in subgroups:
            out += _components_of(sub)
        if entries:
            out.append(entries)
    return out


def _parse_signs(text: str, start: int, stop: int) -> tuple[list[int], list[int]]:
    """Signs after ';': '+', '-', '+1', '-1' separated by spaces or commas."""
    signs, places = [], []
    i = start
    while i < stop:
        ch = text[i]
        if ch in " \t\r\n,[]()":
            i += 1
            continue
        if ch in "+" + _MINUS:
            j = i + 1
            if j < stop and text[j] == "1":
                j += 1
            signs.append(1 if ch == "+" else -1)
            places.append(i)
            i = j
            continue
        raise NotationError(
            f"Gauss code: expected a crossing sign '+' or '-' of the sign "
            f"list, found {ch!r}", value=text, where=f"position {i + 1}")
    return signs, places


def _entries_from_sequence(code: Sequence) -> list[list[_Entry]]:
    """Components from a sequence of ints or a sequence of sequences of ints."""
    items = list(code)
    nested = bool(items) and all(not isinstance(x, int) for x in items)
    comps = items if nested else [items]
    out = []
    for k, comp in enumerate(comps):
        try:
            comp = list(comp)
        except TypeError:
            raise NotationError(
                f"Gauss code: component {k} must be a sequence of integers, got {comp!r}",
                value=comp, where=f"component {k}") from None
        entries = []
        for j, x in enumerate(comp):
            if isinstance(x, bool) or not isinstance(x, int) or x == 0:
                raise NotationError(
                    f"Gauss code: expected a non-zero integer (positive = over, negative = "
                    f"under), found {x!r}", value=x, where=f"component {k}, entry {j}")
            entries.append(_Entry(abs(x), x > 0, None, False, False, -1))
        out.append(entries)
    return out


def _visits(code, signs) -> tuple[list[list[_Visit]], list[int] | None]:
    """Read the code into components of visits and a per-crossing sign list (or None)."""
    sign_list = None
    if isinstance(code, str):
        text = code
        begin = _strip_prefix(text)
        semi = text.find(";", begin)
        stop = len(text) if semi < 0 else semi
        if semi >= 0:
            if text.find(";", semi + 1) >= 0:
                second = text.find(";", semi + 1)
                raise NotationError(
                    "Gauss code: found a second ';'; expected one ';' "
                    "before the list of crossing signs", value=text,
                    where=f"position {second + 1}")
            sign_list, _ = _parse_signs(text, semi + 1, len(text))
        if not text[begin:stop].strip():
            raise NotationError(
                "Gauss code: empty text; expected entries such as 'O1+ U2+ ...' "
                "(write '()' for a circle without crossings)", value=text)
        comps = _components_of(_parse_tree(text, begin, stop))
    else:
        try:
            comps = _entries_from_sequence(code)
        except TypeError:
            raise NotationError(
                f"Gauss code: expected text or a sequence of integers, got "
                f"{type(code).__name__}", value=code) from None
    if signs is not None:
        if sign_list is not None:
            raise NotationError(
                "Gauss code: crossing signs given twice (after ';' and as signs=); expected one",
                value=signs)
        if isinstance(signs, str):
            sign_list, _ = _parse_signs(signs, 0, len(signs))
        else:
            try:
                signs = list(signs)
            except TypeError:
                raise NotationError(f"Gauss code: signs must be text or a sequence of +1/-1, "
                                    f"got {type(signs).__name__}", value=signs) from None
            sign_list = []
            for j, s in enumerate(signs):
                if s not in (1, -1) or isinstance(s, bool):
                    raise NotationError(
                        f"Gauss code: crossing signs must be +1 or -1, found {s!r} at sign {j}",
                        value=s, where=f"sign {j}")
                sign_list.append(int(s))
    entries = [e for comp in comps for e in comp]
    if entries:
        first = entries[0]
        for e in entries:
            if e.lettered != first.lettered:
                kind = "an O/U entry" if e.lettered else "a signed integer"
                raise NotationError(
                    f"Gauss code: {kind} in a code that began with "
                    f"{'O/U entries' if first.lettered else 'signed integers'}; expected one form",
                    value=e, where=f"position {e.pos + 1}")
        signed = [e for e in entries if e.sign is not None]
        if signed and len(signed) != len(entries):
            bare = next(e for e in entries if e.sign is None)
            raise NotationError(
                f"Gauss code: entry {'OU'[not bare.over]}{bare.crossing} "
                "has no crossing sign but other entries do; expected a sign "
                "('+' or '-') after every entry or after none", value=bare,
                where=f"position {bare.pos + 1}")
        if signed and sign_list is not None:
            raise NotationError(
                "Gauss code: crossing signs given both on the entries and as a separate list; "
                "expected one of the two", value=code)
    out = []
    for k, comp in enumerate(comps):
        row = []
        for j, e in enumerate(comp):
            place = f"component {k}, entry {j}" + (f" (position {e.pos + 1})" if e.pos >= 0
                                                   else "")
            if e.crossing < 1:
                raise NotationError(
                    f"Gauss code: crossing numbers must be positive, found {e.crossing}",
                    value=e.crossing, where=place)
            row.append(_Visit(e.crossing, e.over, e.sign, e.uncertain, place))
        out.append(row)
    return out, sign_list


def _check_pairs(comps: list[list[_Visit]], sign_list: list[int] | None,
                 what: str) -> dict[int, int] | None:
    """Each crossing twice, once over and once under, one sign; returns the signs if known."""
    seen: dict[int, list[_Visit]] = {}
    for comp in comps:
        for v in comp:
            seen.setdefault(v.crossing, []).append(v)
    for c in sorted(seen):
        vs = seen[c]
        if len(vs) != 2:
            places = "; ".join(v.where for v in vs)
            raise NotationError(
                f"{what}: crossing {c} appears {len(vs)} time{'s' if len(vs) != 1 else ''} "
                f"({places}); expected exactly twice, once over and once under",
                value=c, where=f"crossing {c}")
        a, b = vs
        if a.over == b.over:
            word = "over" if a.over else "under"
            raise NotationError(
                f"{what}: crossing {c} is {word} at both occurrences ({a.where}; {b.where}); "
                "expected once over and once under", value=c, where=f"crossing {c}")
        if a.sign != b.sign:
            raise NotationError(
                f"{what}: crossing {c} has sign {'+' if a.sign > 0 else '-'} at {a.where} but "
                f"{'+' if b.sign > 0 else '-'} at {b.where}; expected the same sign at both "
                "occurrences", value=c, where=f"crossing {c}")
    if sign_list is not None:
        if len(sign_list) != len(seen):
            raise NotationError(
                f"{what}: expected {len(seen)} crossing signs (one per crossing, in increasing "
                f"crossing number), found {len(sign_list)}", value=sign_list)
        return dict(zip(sorted(seen), sign_list, strict=True))
    if seen and next(iter(seen.values()))[0].sign is not None:
        return {c: vs[0].sign for c, vs in seen.items()}
    return None


# -- building the diagram -----------------------------------------------------

def _edge_labels(comps: Sequence[Sequence[tuple[int, bool]]]):
    """Label edges 1, 2, ... along the components; (in, out) label of every visit."""
    labels = {}
    n = 1
    for k, comp in enumerate(comps):
        m = len(comp)
        for j in range(m):
            labels[(k, j)] = (n + (j - 1) % m, n + j)
        n += m
    return labels


def _shadow_parts(comps: Sequence[Sequence[tuple[int, bool]]]) -> dict[int, int]:
    """Connected part (a representative crossing) of every crossing of the shadow."""
    parent: dict[int, int] = {}

    def find(a: int) -> int:
        parent.setdefault(a, a)
        while parent[a] != a:
            parent[a] = parent[parent[a]]
            a = parent[a]
        return a

    for comp in comps:
        for j, (c, _) in enumerate(comp):
            d = comp[(j + 1) % len(comp)][0]
            ra, rb = find(c), find(d)
            if ra != rb:
                parent[ra] = rb
    return {c: find(c) for c in parent}


def _nonplanar_part(quads: Sequence[Sequence[int]]) -> tuple[list[int], int] | None:
    """A part whose rotation system is not planar (its quad indices and face count), or None.

    Euler's formula per connected part: ``v`` crossings give ``v + 2`` faces.
    """
    darts: dict[int, list[tuple[int, int]]] = {}
    for i, q in enumerate(quads):
        for p, e in enumerate(q):
            darts.setdefault(e, []).append((i, p))
    parent = list(range(len(quads)))

    def find(a: int) -> int:
        while parent[a] != a:
            parent[a] = parent[parent[a]]
            a = parent[a]
        return a

    for (i, _), (j, _) in darts.values():
        ri, rj = find(i), find(j)
        if ri != rj:
            parent[ri] = rj
    seen = set()
    faces: dict[int, int] = {}
    for i in range(len(quads)):
        for p in range(4):
            if (i, p) in seen:
                continue
            d = (i, p)
            while d not in seen:
                seen.add(d)
                a, b = darts[quads[d[0]][d[1]]]
                j, q = b if a == d else a
                d = (j, (q + 1) % 4)
            faces[find(i)] = faces.get(find(i), 0) + 1
    for root in sorted(set(find(i) for i in range(len(quads)))):
        members = [i for i in range(len(quads)) if find(i) == root]
        if faces[root] != len(members) + 2:
            return members, faces[root]
    return None


def _face_count_check(quads: list[tuple[int, int, int, int]], ids: list[int], what: str) -> None:
    """Raise unless the rotation system of ``quads`` is planar (Euler's formula per part)."""
    bad = _nonplanar_part(quads)
    if bad is not None:
        members, f = [ids[i] for i in bad[0]], bad[1]
        v = len(members)
        genus = (v + 2 - f) // 2
        raise NotationError(
            f"{what} is not realisable in the plane: with these over/under passages and "
            f"crossing signs the part with crossings {members[:12]}"
            f"{'...' if len(members) > 12 else ''} has {f} faces where a planar drawing "
            f"of {v} crossings has {v + 2} (it would need a surface of genus {genus}); "
            "check the crossing signs", value=members, where=f"crossing {members[0]}")


def _quads(comps: Sequence[Sequence[tuple[int, bool]]], signs: dict[int, int],
           ids: list[int]) -> list[tuple[int, int, int, int]]:
    """The PD quad of every crossing in ``ids`` (edges labelled by :func:`_edge_labels`)."""
    labels = _edge_labels(comps)
    under: dict[int, tuple[int, int]] = {}
    over: dict[int, tuple[int, int]] = {}
    for k, comp in enumerate(comps):
        for j, (c, is_over) in enumerate(comp):
            (over if is_over else under)[c] = labels[(k, j)]
    quads = []
    for c in ids:
        (ui, uo), (oi, oo) = under[c], over[c]
        # positive: the over-strand runs from entry 3 to entry 1 (common practice)
        quads.append((ui, oo, uo, oi) if signs[c] > 0 else (ui, oi, uo, oo))
    return quads


def _build(comps: Sequence[Sequence[tuple[int, bool]]], signs: dict[int, int],
           free_loops: int, what: str) -> Diagram:
    """The diagram of a code whose crossing signs are known.

    ``comps`` lists, per component, ``(crossing, over)`` in the order of travel.
    Edges are labelled 1, 2, ... along each component, which is also how
    :class:`Diagram` orients a component that never passes under (it runs
    towards the smaller neighbour of its smallest label); a component of two
    over-passages is started so that this rule's tie-break (the crossing
    listed first) agrees with its travel.
    """
    ids = sorted(signs)
    index = {c: i for i, c in enumerate(ids)}
    comps = [list(comp) for comp in comps]
    for k, comp in enumerate(comps):
        if len(comp) == 2 and comp[0][1] and comp[1][1] and \
                index[comp[0][0]] < index[comp[1][0]]:
            comps[k] = comp[::-1]
    quads = _quads(comps, signs, ids)
    _face_count_check(quads, ids, what)
    diagram = Diagram(quads, free_loops=free_loops)
    if diagram.signs() != tuple(signs[c] for c in ids):  # pragma: no cover - a safeguard
        raise NotationError(f"{what}: internal error, the diagram lost its orientation",
                            value=comps)
    return diagram


def _diagram_from_quads(quads: Sequence[Sequence[int]], heads: dict[int, int],
                        free_loops: int, what: str) -> Diagram:
    """A diagram from counter-clockwise quads (under-strand at entries 0 and 2, either way).

    Components are oriented as in :meth:`Diagram.from_planar_crossings`
    (``heads`` maps a label to the crossing it runs into); unlike a PD code
    built directly, the orientation is kept also for components that never
    pass under.  Crossing ``i`` of the result is quad ``i``.
    """
    darts: dict[int, list[tuple[int, int]]] = {}
    for i, q in enumerate(quads):
        for p, e in enumerate(q):
            darts.setdefault(e, []).append((i, p))
    seen: set[tuple[int, int]] = set()
    comps: list[list[tuple[int, bool]]] = []
    entry: dict[int, dict[bool, int]] = {}
    for start in sorted(darts, key=lambda e: (e not in heads, e)):
        a, b = darts[start]
        if a in seen or b in seen:
            continue
        if start in heads:
            d = a if a[0] == heads[start] else b
        else:
            d = a if quads[a[0]][(a[1] + 2) % 4] <= quads[b[0]][(b[1] + 2) % 4] else b
        comp = []
        while d not in seen:
            i, p = d
            out = (i, (p + 2) % 4)
            seen.update((d, out))
            comp.append((i, p % 2 == 1))
            entry.setdefault(i, {})[p % 2 == 1] = p
            x, y = darts[quads[i][out[1]]]
            d = y if x == out else x
        comps.append(comp)
    # positive when the over-strand enters just clockwise of the incoming under-strand
    signs = {i: 1 if (e[False], e[True]) in ((0, 3), (2, 1)) else -1 for i, e in entry.items()}
    return _build(comps, signs, free_loops, what)


def _interlacement_turns(comps: Sequence[Sequence[tuple[int, bool]]]) -> dict[int, int] | None:
    """Turns of the crossings of a shadow read off its interlacement, or None.

    The turn of a crossing is +1 when the strand of its second passage
    crosses the strand of its first passage from the first's right to its
    left, -1 otherwise.  Two crossings ``a``, ``b`` of one closed curve are
    interlaced when exactly one passage through ``b`` lies between the two
    passages through ``a``.  For interlaced ``a`` and ``b`` met first at
    positions ``a1`` and ``b1`` along the curve, with ``m`` crossings
    interlaced with both, the rule is ``turn(a) turn(b) = -(-1)^(m + b1 - a1)``.
    The turns are spread from the first crossing met in each class of
    interlaced crossings, which is given turn +1; classes not interlaced
    with each other (pieces that two edges cut off, kinks) may be turned
    over independently, and giving each first crossing turn +1 is also what
    networkx's embedding nearly always does.

    None when a connected part of the shadow has two or more components (the
    caller then uses a general planar embedding).  The turns are not checked
    here: for a code without a planar drawing they give a non-planar one,
    which the caller's face count refuses.

    Notes
    -----
    Quadratic in the crossings (bit sets of interlaced crossings): about
    0.1 ms against 13 ms for networkx's embedding on codes of 8 to 12
    crossings, and it spares the import of networkx (0.3 s).  The rule was read off networkx's planar embeddings
    of random realisable DT codes and held on every one compared:
    ``tests/notations/test_shadow.py`` checks it on the table's knots,
    random codes and scrambled diagrams.  It is not proved here, so its
    drawing is always checked by the face count, and the embedding takes
    over where the check fails.

    References
    ----------
    C. H. Dowker and M. B. Thistlethwaite, "Classification of knot
    projections", Topology Appl. 16 (1983): realisability and the crossing
    orientations of a code decided from the interlacing of its loops.
    """
    parts = _shadow_parts(comps)
    if len({parts[comp[0][0]] for comp in comps}) != len(comps):
        return None
    turn: dict[int, int] = {}
    for comp in comps:
        order = list(dict.fromkeys(c for c, _ in comp))
        bit = {c: 1 << i for i, c in enumerate(order)}
        where: dict[int, list[int]] = {}
        prefix = [0]  # prefix[i]: the crossings met an odd number of times before position i
        for i, (c, _) in enumerate(comp):
            where.setdefault(c, []).append(i)
            prefix.append(prefix[-1] ^ bit[c])
        interlaced = {c: prefix[b] ^ prefix[a + 1] for c, (a, b) in where.items()}
        for root in order:
            if root in turn:
                continue
            turn[root] = 1
            todo = [root]
            while todo:
                a = todo.pop()
                mask = interlaced[a]
                while mask:
                    low = mask & -mask
                    mask ^= low
                    b = order[low.bit_length() - 1]
                    if b in turn:
                        continue
                    common = (interlaced[a] & interlaced[b]).bit_count()
                    gap = abs(where[b][0] - where[a][0])
                    turn[b] = turn[a] * (1 if (common + gap) % 2 else -1)
                    todo.append(b)
    return turn


def _embedding_turns(comps: Sequence[Sequence[tuple[int, bool]]], what: str) -> dict[int, int]:
    """Turns of the crossings from a general planar embedding (networkx); raise if none.

    Each crossing becomes a wheel (four corners in a cycle around a centre,
    rigid up to reflection) so that the two strands through it stay opposite;
    every edge of the diagram joins an exit corner to an entry corner through
    a midpoint.  The first passage through a crossing enters at corner 0 and
    leaves at corner 2, the second enters at 1 and leaves at 3.
    """
    import networkx as nx

    first = _first_passages(comps)
    graph = nx.Graph()
    for c in first:
        for p in range(4):
            graph.add_edge(("corner", c, p), ("corner", c, (p + 1) % 4))
            graph.add_edge(("centre", c), ("corner", c, p))
    labels = _edge_labels(comps)
    for k, comp in enumerate(comps):
        m = len(comp)
        for j, (c, _) in enumerate(comp):
            d = comp[(j + 1) % m][0]
            leave = 2 if first[c] == (k, j) else 3
            enter = 0 if first[d] == (k, (j + 1) % m) else 1
            mid = ("edge", labels[(k, j)][1])
            graph.add_edge(("corner", c, leave), mid)
            graph.add_edge(mid, ("corner", d, enter))
    planar, embedding = nx.check_planarity(graph)
    if not planar:
        raise NotationError(
            f"{what} is not realisable: its shadow (the curve with crossings but without "
            "over/under) has no drawing in the plane with the strands crossing at every "
            "crossing", value=comps)
    turn = {}
    for c in first:
        cw = [p for (_, _, p) in embedding.neighbors_cw_order(("centre", c))]
        at = cw.index(0)
        # counter-clockwise after corner 0 comes corner 1 (+1) or corner 3 (-1)
        turn[c] = 1 if cw[(at - 1) % 4] == 1 else -1
    return turn


def _first_passages(comps: Sequence[Sequence[tuple[int, bool]]]) -> dict[int, tuple[int, int]]:
    """(component, position) of the first passage through every crossing."""
    first: dict[int, tuple[int, int]] = {}
    for k, comp in enumerate(comps):
        for j, (c, _) in enumerate(comp):
            first.setdefault(c, (k, j))
    return first


def _shadow_signs(comps: Sequence[Sequence[tuple[int, bool]]], what: str,
                  loose: set[int] = frozenset()) -> dict[int, int]:
    """Crossing signs from a planar drawing of the shadow, mirror fixed by the module's rule.

    The drawing comes from :func:`_interlacement_turns` when every connected
    part of the shadow is one closed curve and the face count accepts it;
    otherwise from a general planar embedding (:func:`_embedding_turns`,
    which also gives the error for a shadow without a planar drawing).
    ``loose`` crossings (see :func:`_loose_crossings`) are not used to fix
    the mirror.
    """
    first = _first_passages(comps)
    turn = _interlacement_turns(comps)
    if turn is not None:
        ids = sorted(first)
        drawn = {c: turn[c] * (1 if comps[k][j][1] else -1) for c, (k, j) in first.items()}
        if _nonplanar_part(_quads(comps, drawn, ids)) is not None:
            turn = None
    if turn is None:
        turn = _embedding_turns(comps, what)
    parts = _shadow_parts(comps)
    fixed: dict[int, int] = {}
    for c in [c for comp in comps for c, _ in comp if c not in loose] + list(first):
        # the mirror rule: at the first crossing met in each part (passing over the
        # loose ones), the second strand crosses the first from its right to its left
        fixed.setdefault(parts[c], turn[c])
    signs = {}
    for c, (k, j) in first.items():
        first_over = comps[k][j][1]
        signs[c] = turn[c] * fixed[parts[c]] * (1 if first_over else -1)
    return signs


def _bridges(nodes: list[int], edges: list[tuple[int, int]], skip: int) -> list[int]:
    """Indices of the bridges of a multigraph after removing edge ``skip``."""
    adj: dict[int, list[tuple[int, int]]] = {v: [] for v in nodes}
    for eid, (u, v) in enumerate(edges):
        if eid != skip:
            adj[u].append((v, eid))
            adj[v].append((u, eid))
    disc: dict[int, int] = {}
    low: dict[int, int] = {}
    found = []
    clock = 0
    for root in nodes:
        if root in disc:
            continue
        disc[root] = low[root] = clock
        clock += 1
        stack = [(root, -1, iter(adj[root]))]
        while stack:
            node, via, it = stack[-1]
            for nb, eid in it:
                if eid == via:
                    continue
                if nb in disc:
                    low[node] = min(low[node], disc[nb])
                else:
                    disc[nb] = low[nb] = clock
                    clock += 1
                    stack.append((nb, eid, iter(adj[nb])))
                    break
            else:
                stack.pop()
                if stack:
                    parent = stack[-1][0]
                    low[parent] = min(low[parent], low[node])
                    if low[node] > disc[parent]:
                        found.append(via)
    return found


def _loose_crossings(comps: Sequence[Sequence[tuple[int, bool]]], what: str,
                     name=lambda c: f"crossing {c}", cuts: list | None = None) -> set[int]:
    """Crossings of pieces that can be turned over without changing the knot; raise if a
    piece that matters can.

    A shadow cut by two edges into pieces of at least three crossings each is
    a connected sum; each piece can be turned over independently, which
    mirrors it, so the code does not determine the knot.  A piece of one or
    two crossings (a kink, say) is harmless, since a knotted arc needs at
    least three crossings (common practice); its crossings are returned so
    that the mirror rule is read elsewhere.

    With a list ``cuts``, a cut into two pieces of three or more crossings is
    not refused: the smaller piece's crossings are appended to ``cuts`` (as
    a frozenset) for the caller to try both ways round.
    """
    edges = []
    for comp in comps:
        for j, (c, _) in enumerate(comp):
            edges.append((c, comp[(j + 1) % len(comp)][0]))
    nodes = sorted({c for comp in comps for c, _ in comp})
    parts = _shadow_parts(comps)
    loose: set[int] = set()
    for e in range(len(edges)):
        for f in _bridges(nodes, edges, e):
            if f < e:
                continue
            adj: dict[int, list[int]] = {v: [] for v in nodes}
            for eid, (u, v) in enumerate(edges):
                if eid not in (e, f):
                    adj[u].append(v)
                    adj[v].append(u)
            start = edges[f][0]
            side = {start}
            todo = [start]
            while todo:
                for nb in adj[todo.pop()]:
                    if nb not in side:
                        side.add(nb)
                        todo.append(nb)
            rest = {v for v in nodes if parts[v] == parts[start]} - side
            if min(len(side), len(rest)) >= 3 and cuts is not None:
                cuts.append(frozenset(side if len(side) <= len(rest) else rest))
                continue
            if min(len(side), len(rest)) >= 3:
                raise NotationError(
                    f"{what} does not determine the knot: its shadow is cut by two edges into "
                    f"pieces of {len(side)} and {len(rest)} crossings (a connected sum), and "
                    "each piece may be drawn either way round, which mirrors it; give a signed "
                    "Gauss code or a PD code instead", value=sorted(side), where=name(min(side)))
            loose |= side if len(side) <= len(rest) else rest
    return loose


def _diagram(code, signs, what: str = "Gauss code") -> tuple[Diagram, list[int]]:
    comps, sign_list = _visits(code, signs)
    known = _check_pairs(comps, sign_list, what)
    free = sum(1 for comp in comps if not comp)
    shape = [[(v.crossing, v.over) for v in comp] for comp in comps if comp]
    if known is None and not shape:
        known = {}
    if known is None:
        known = _shadow_signs(shape, what, _loose_crossings(shape, what))
    diagram = _build(shape, known, free, what)
    ids = sorted(known)
    marked = {v.crossing for comp in comps for v in comp if v.uncertain}
    return diagram, [i for i, c in enumerate(ids) if c in marked]


def parse_gauss(code: str | Sequence, signs: str | Sequence[int] | None = None) -> Diagram:
    """The diagram of a Gauss code.

    Parameters
    ----------
    code : str or sequence
        Text in the syntax of the module docstring, or a sequence of non-zero
        integers (one component; positive = over) or of such sequences.
    signs : str or sequence of int, optional
        Crossing signs (``"+ - +"`` or ``[1, -1, 1]``), one per crossing in
        increasing crossing number, for codes whose entries carry no sign.

    Returns
    -------
    Diagram
        Crossing ``k`` is the crossing with the ``k``-th smallest number.
        Components are labelled 1, 2, ... along the direction of travel.

    Raises
    ------
    NotationError
        On a syntax error (with its position), when a crossing does not appear
        exactly twice, once over and once under with one sign (naming the
        crossing and the components), or when the code has no planar drawing.

    Examples
    --------
    >>> parse_gauss("O1+ U2+ O3+ U1+ O2+ U3+").signs()
    (1, 1, 1)
    >>> parse_gauss("-1 2 -3 1 -2 3 ; - - -").writhe()
    -3

    Notes
    -----
    Without signs the shadow is drawn from the interlacing of the code
    (quadratic time; networkx's planarity test when components cross each
    other) and the mirror image is fixed by this rule: at the first crossing met in
    each connected part of the shadow, the second strand through it crosses
    the first from the first strand's right to its left (so the crossing is
    positive when the first passage is over).  Crossings in pieces of one or
    two crossings that two edges cut off from the rest (kinks) are passed
    over when looking for that first crossing, since turning such a piece
    over does not change the knot.  Unsigned codes whose shadow is
    a connected sum of pieces of three or more crossings are refused, since
    the knot type then depends on the drawing.
    """
    return _diagram(code, signs)[0]


def parse_gauss_with_uncertain(code: str | Sequence, signs: str | Sequence[int] | None = None
                               ) -> tuple[Diagram, list[int]]:
    """The diagram of a Gauss code and the indices of its crossings marked ``?``.

    Examples
    --------
    >>> diagram, unsure = parse_gauss_with_uncertain("O1+ U2+ O3+? U1+ O2+ U3+")
    >>> unsure
    [2]
    """
    return _diagram(code, signs)


def write_gauss(diagram: Diagram) -> str:
    """The signed Gauss code of a diagram (crossing ``k`` is numbered ``k + 1``).

    Components are written in the order of :meth:`Diagram.components`,
    separated by ``" | "``, each from its smallest edge label; free loops are
    written ``()``.

    Examples
    --------
    >>> write_gauss(Diagram([(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)]))
    'U1+ O3+ U2+ O1+ U3+ O2+'
    """
    head: dict[int, tuple[int, int]] = {}
    for i, x in enumerate(diagram.crossings):
        for p, label in enumerate(x):
            if diagram.is_incoming(i, p):
                head[label] = (i, p)
    signs = diagram.signs()
    parts = []
    for comp in diagram.components():
        words = []
        for label in comp:
            i, p = head[label]
            words.append(f"{'U' if p == 0 else 'O'}{i + 1}{'+' if signs[i] > 0 else '-'}")
        parts.append(" ".join(words))
    parts += ["()"] * diagram.free_loops
    return " | ".join(parts)

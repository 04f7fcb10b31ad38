"""Finding a table entry by a typed name, without ever answering with a different knot.

:func:`resolve_name` reads a query in this order:

1. Words about chirality are taken off first: ``mirror``, ``mirror image``,
   a trailing ``*``, and the handedness words ``left-handed`` /
   ``right-handed`` / ``positive`` / ``negative`` (see :func:`handed_form`).
2. An exact name (``7_4``), an alias (``figure eight``, ``T(2,5)``; with or
   without a leading "the" or a trailing "knot"), a digit
   variant (``7-4``, ``7.4``, ``74``), a torus knot ``T(p,q)`` in any order and
   sign, or a connected sum (``3_1 # 4_1``, summands in any order) is an
   exact match.
3. A name in Alexander-Briggs form that the table does not hold (``3_2``,
   ``8_22``, ``11_3``), a name in the numbering schemes for knots of 11 or
   more crossings (``11a_1``, ``11n42``, ``K11n42``) and a digit string with
   no reading in the table are refused as "not in the shipped table", with
   the reason; they never fall through to a similar-looking name.
4. Other words are compared with the names and aliases (rapidfuzz).  One
   clear candidate (score at least ``GUESS_SCORE`` and ``GUESS_LEAD`` ahead
   of the next knot) is returned as a guess, marked as such; otherwise the
   candidates are suggestions ("did you mean") and nothing is shown.

Handedness, in the project's convention (README, "Chirality"): a knot is
*positive* when it has a diagram whose crossings are all positive, and then
"right-handed" means positive and "left-handed" negative.  Positive knots
have negative signature (Przytycki 1989, from memory), so the right-handed
trefoil is the table's reference form ``3_1`` with V = t + t^3 - t^4 and
signature -2.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field
from math import gcd

from .errors import TableError
from .table import MIRROR_MARK, ReferenceTable

__all__ = ["find_name", "resolve_name", "handed_form", "NameMatch", "NameLookup",
           "GUESS_SCORE", "GUESS_LEAD"]

#: Lowest rapidfuzz score of a fuzzy candidate shown at all.
SUGGEST_SCORE = 60.0
#: A fuzzy candidate is shown as a guess only with at least this score ...
GUESS_SCORE = 90.0
#: ... and at least this many points ahead of the next knot's best score.
GUESS_LEAD = 10.0

_MIRROR_WORDS = ("mirror image of", "mirror image", "mirror of", "mirrored", "mirror",
                 "reflected")
_HAND_WORDS = {
    "right-handed": "positive", "right handed": "positive", "righthanded": "positive",
    "right": "positive", "positive": "positive",
    "left-handed": "negative", "left handed": "negative", "lefthanded": "negative",
    "left": "negative", "negative": "negative",
}


@dataclass
class NameMatch:
    """One table entry a query names.

    Attributes
    ----------
    name : str
        The table name (without the mirror mark).
    mirrored : bool
        The query asks for the mirror image of the reference form.
    how : str
        How it matched ("name", "alias 'trefoil'", "guess: similar to ...").
    score : float
        100 for exact matches, the rapidfuzz score otherwise.
    guess : bool
        True for a fuzzy match: the query did not name this entry.
    """

    name: str
    mirrored: bool
    how: str
    score: float = 100.0
    guess: bool = False


@dataclass
class NameLookup:
    """What a query names: a match, a guess, suggestions, or the reason there is none.

    Attributes
    ----------
    query : str
    match : NameMatch or None
        The entry to show: an exact match, or a single confident guess
        (``match.guess`` is then True).
    suggestions : list of NameMatch
        Fuzzy candidates when none is confident ("did you mean").
    reason : str or None
        Why nothing is shown (not in the table, a refused handedness word).
    notes : list of str
        How chirality words were read.
    """

    query: str
    match: NameMatch | None = None
    suggestions: list[NameMatch] = field(default_factory=list)
    reason: str | None = None
    notes: list[str] = field(default_factory=list)


def _strip_words(text: str, words) -> tuple[str, str | None]:
    """The text without one of ``words`` at its start or end, and the word taken off."""
    for w in sorted(words, key=len, reverse=True):
        if text == w:
            return "", w
        if text.startswith(w + " "):
            return text[len(w) + 1:].strip(), w
        if text.endswith(" " + w):
            return text[:-len(w) - 1].strip(), w
    return text, None


def _canonical_digits(text: str, names: set[str]) -> tuple[str | None, str | None]:
    """('7-4' -> '7_4', None); an Alexander-Briggs-like text not in the table -> (None, form).

    The second value is the name the text spells when the table lacks it, so
    it is refused instead of matched fuzzily.
    """
    m = re.fullmatch(r"(\d{1,2})\s*[-_.,/ ]\s*(\d{1,3})", text)
    if m:
        cand = f"{int(m.group(1))}_{int(m.group(2))}"
        return (cand, None) if cand in names else (None, cand)
    if re.fullmatch(r"\d{2,5}", text):
        readings = [f"{int(text[:k])}_{int(text[k:])}" for k in (1, 2) if k < len(text)]
        found = [c for c in readings if c in names]
        if len(found) == 1:
            return found[0], None
        return None, " or ".join(readings)
    return None, None


def _torus(text: str) -> tuple[str, bool] | None:
    """'T(3,2)', 't(2, -3)' -> ('T(2,3)', mirrored); None when the text is not T(p,q)."""
    m = re.fullmatch(r"t\s*\(\s*(-?\d+)\s*,\s*(-?\d+)\s*\)", text)
    if not m:
        return None
    p, q = int(m.group(1)), int(m.group(2))
    a, b = sorted((abs(p), abs(q)))
    return f"T({a},{b})", p * q < 0


def _summands(label: str) -> tuple[tuple[str, bool], ...] | None:
    """'3_1*#5_1' -> (('3_1', True), ('5_1', False)) sorted; None when not a '#' list."""
    parts = [p.strip() for p in label.split("#")]
    if len(parts) < 2 or not all(parts):
        return None
    out = []
    for p in parts:
        mirrored = p.endswith(MIRROR_MARK)
        out.append((p.rstrip(MIRROR_MARK).strip(), mirrored))
    return tuple(sorted(out))


def _composite(text: str, table: ReferenceTable) -> tuple[str, bool] | None | str:
    """The (name, mirrored) of a typed connected sum, or a reason when the table lacks it."""
    want = _summands(text)
    if want is None:
        return None
    amphichiral = {}
    for prime, _ in want:
        knot = table.knot(prime)
        if knot is None:
            return (f"{prime!r} is not a prime knot of the shipped table, so the sum "
                    f"{text!r} is not in it either")
        amphichiral[prime] = bool(knot["amphichiral"])
    key = tuple(sorted((p, m and not amphichiral[p]) for p, m in want))
    for knot in table.knots():
        if "#" not in knot["name"]:
            continue
        for form in table.forms_of(knot["name"]):
            have = _summands(form.label)
            if have is None:
                continue
            have = tuple(sorted((p, m and not amphichiral.get(p, False)) for p, m in have))
            if have == key:
                return knot["name"], not form.is_reference
    total = sum(table.knot(p)["crossing_number"] for p, _ in want)
    complete = table.metadata.get("complete_through", "?")
    return (f"the connected sum {text!r} is not in the shipped table, which lists sums "
            f"through {complete} crossings (this one has {total})")


def _other_scheme(text: str, original: str) -> str | None:
    """The reason a name from another numbering scheme is not in the table, else None."""
    m = re.fullmatch(r"k?\s*(\d{1,2})\s*([an])\s*_?\s*(\d+)", text)
    if m:
        c = int(m.group(1))
        kind = "alternating" if m.group(2) == "a" else "non-alternating"
        return (f"{original!r} is a name in the numbering of {kind} knots by crossing number "
                f"({c} crossings); the shipped table uses Alexander-Briggs names in Rolfsen's "
                "numbering (like 7_4) and lists knots through 10 crossings, so this knot is "
                "not in the shipped table under that name"
                + ("" if c <= 10 else f" (it has {c} crossings)"))
    return None


def _missing_name(form: str, table: ReferenceTable) -> str:
    """Why an Alexander-Briggs-like name is not in the table."""
    first = form.split(" or ")[0]
    c = int(first.split("_")[0])
    complete = int(table.metadata.get("complete_through", "10") or 10)
    if " or " in form:
        return (f"neither {form} is a knot of the shipped table; write the name with an "
                "underscore, such as 7_4")
    if c > complete:
        return (f"{form} is not in the shipped table: it lists knots through {complete} "
                f"crossings, and {form} has {c}")
    count = sum(1 for k in table.knots() if k["crossing_number"] == c and "#" not in k["name"])
    if c < 3:
        return f"there is no knot {form}: no non-trivial knot has fewer than 3 crossings"
    listed = f"only {c}_1" if count == 1 else f"{c}_1 to {c}_{count}"
    return (f"there is no knot {form} in the shipped table: it lists {count} prime "
            f"knot{'s' if count != 1 else ''} with {c} crossings, {listed} "
            "(Alexander-Briggs names in Rolfsen's numbering)")


def handed_form(name: str, hand: str, table: ReferenceTable) -> tuple[bool | None, str]:
    """Which form of ``name`` a handedness word means: (mirrored, explanation).

    Parameters
    ----------
    name : str
        A table name.
    hand : {"positive", "negative"}
        "positive" for right-handed, "negative" for left-handed.

    Returns
    -------
    (bool or None, str)
        ``mirrored`` is False for the table's reference form, True for its
        mirror, None when the word is refused (the explanation says why).

    Notes
    -----
    The positive form is the one with a diagram whose crossings are all
    positive: the table's own diagram when it is positive or negative
    throughout; for a torus knot ``T(p, q)`` the closure of a positive braid,
    which has negative signature (Rudolph 1982 and Przytycki 1989, from
    memory).  Other knots are refused: this module does not decide whether a
    knot is positive from a diagram of mixed signs.
    """
    from .diagram import Diagram

    knot = table.knot(name)
    label = {"positive": "right-handed (positive)", "negative": "left-handed (negative)"}[hand]
    if knot["amphichiral"]:
        return False, (f"{name} is amphichiral: its left- and right-handed forms are the same "
                       "knot")
    ref = next(f for f in table.forms_of(name) if f.is_reference)
    signs = set(Diagram(ref.pd()).signs())
    positive_is_mirror = None
    basis = ""
    if signs == {1}:
        positive_is_mirror, basis = False, "the table's diagram of it has only positive crossings"
    elif signs == {-1}:
        positive_is_mirror, basis = True, ("the table's diagram of it has only negative "
                                           "crossings, so its mirror image is positive")
    elif any(a.startswith("T(") for a in knot["aliases"].split(";")):
        positive_is_mirror = ref.signature > 0
        basis = ("a positive torus knot (closure of a positive braid) has negative "
                 "signature")
    if positive_is_mirror is None:
        return None, (f"'{label}' is not defined for {name} here: the table's diagram of it "
                      "has crossings of both signs, and this tool does not decide whether "
                      f"{name} has a positive diagram; ask for {name} (the table's reference "
                      f"form, signature {ref.signature}) or {name}{MIRROR_MARK}")
    mirrored = positive_is_mirror if hand == "positive" else not positive_is_mirror
    shown = f"{name}{MIRROR_MARK}" if mirrored else name
    return mirrored, (f"{label} {name} is {shown} ({basis}; convention: right-handed = "
                      "positive, whose signature is negative, as for the right-handed trefoil "
                      "3_1 with V = t + t^3 - t^4 and signature -2)")


def resolve_name(query: str, table: ReferenceTable, limit: int = 5) -> NameLookup:
    """What a typed name refers to in the table (see the module docstring).

    Raises
    ------
    TableError
        For an empty query.

    Examples
    --------
    >>> from knotsift.table import open_table
    >>> found = resolve_name("left-handed trefoil", open_table())
    >>> found.match.name, found.match.mirrored
    ('3_1', True)
    >>> resolve_name("8_22", open_table()).match is None
    True
    """
    text = " ".join(str(query).strip().lower().split())
    if not text:
        raise TableError("empty knot name", value=query)
    out = NameLookup(query=query)
    mirrored = False
    if text.endswith(MIRROR_MARK) and "#" not in text:
        mirrored, text = True, text[:-1].strip()
    text, word = _strip_words(text, _MIRROR_WORDS)
    if word:
        mirrored = not mirrored
    text, hand_word = _strip_words(text, _HAND_WORDS)
    hand = _HAND_WORDS.get(hand_word) if hand_word else None
    if not text:
        out.reason = f"{query!r} names no knot, only a chirality"
        return out

    match = _exact(text, table, str(query).strip())
    if isinstance(match, str):
        out.reason = match
        return out
    if match is None:
        guess, suggestions = _fuzzy(text, table, limit)
        if guess is None:
            out.suggestions = [NameMatch(s.name, mirrored, s.how, s.score, True)
                               for s in suggestions]
            out.reason = f"no table entry is named {query!r}"
            return out
        match = guess
    match.mirrored ^= mirrored
    if hand is not None:
        form, why = handed_form(match.name, hand, table)
        if form is None:
            out.reason = why
            return out
        if match.mirrored and table.knot(match.name)["amphichiral"] == 0:
            out.reason = (f"{query!r} asks for a handedness and a mirror image at once; ask "
                          f"for {match.name} or {match.name}{MIRROR_MARK}")
            return out
        match.mirrored = form
        out.notes.append(why)
    out.match = match
    return out


def _exact(text: str, table: ReferenceTable, query: str) -> NameMatch | str | None:
    """An exact match, a reason the text names nothing in the table, or None (try fuzzy)."""
    pairs = table.names_and_aliases()
    names = {name for _, name in pairs}
    lowered = {n.lower(): n for n in names}
    squeezed = re.sub(r"\s*([(),#])\s*", r"\1", text)
    if squeezed in lowered:
        return NameMatch(lowered[squeezed], False, "name")
    # 'trefoil knot', 'the trefoil' and 'perko' name the aliases 'trefoil' and 'perko knot'
    bare = re.sub(r"^the\s+", "", text)
    variants = {text, squeezed, bare, re.sub(r"\s+knot$", "", bare), bare + " knot"}
    for alias, name in pairs:
        if alias.lower() in variants:
            return NameMatch(name, False, f"alias {alias!r}")
    torus = _torus(squeezed)
    if torus is not None:
        alias, mirrored = torus
        for a, name in pairs:
            if a == alias:
                return NameMatch(name, mirrored, f"torus knot {alias}")
        p, q = map(int, alias[2:-1].split(","))
        if p < 2 or gcd(p, q) != 1:
            return f"{alias} is not a knot (a torus knot T(p,q) needs 2 <= p < q, coprime)"
        c = min(p * (q - 1), q * (p - 1))
        return (f"the torus knot {alias} is not in the shipped table: its crossing number is "
                f"{c} (min(p(q-1), q(p-1)), from memory), above the table's "
                f"{table.metadata.get('complete_through', '10')}")
    if "#" in squeezed:
        found = _composite(squeezed, table)
        if isinstance(found, tuple):
            return NameMatch(found[0], found[1], "connected sum")
        return found
    digits, missing = _canonical_digits(text, names)
    if digits:
        return NameMatch(digits, False, "name variant")
    if missing:
        return _missing_name(missing, table)
    other = _other_scheme(squeezed, query)
    if other:
        return other
    if re.fullmatch(r"[\d\s_.,/*+-]+", text):
        return f"{text!r} is not a name of the shipped table"
    return None


def _fuzzy(text: str, table: ReferenceTable, limit: int
           ) -> tuple[NameMatch | None, list[NameMatch]]:
    """(a confident guess or None, suggestions best first)."""
    from rapidfuzz import fuzz, process

    pairs = table.names_and_aliases()
    choices = [a.lower() for a, _ in pairs]
    ranked = process.extract(text, choices, scorer=fuzz.WRatio, limit=limit * 4)
    out: list[NameMatch] = []
    seen: set[str] = set()
    for _, score, idx in ranked:
        name = pairs[idx][1]
        if name in seen or score < SUGGEST_SCORE:
            continue
        seen.add(name)
        out.append(NameMatch(name, False, f"similar to {pairs[idx][0]!r}", float(score), True))
    out = out[:limit]
    if out and out[0].score >= GUESS_SCORE and (
            len(out) == 1 or out[0].score - out[1].score >= GUESS_LEAD):
        best = out[0]
        return NameMatch(best.name, False, best.how, best.score, True), out
    return None, out


def find_name(query: str, table: ReferenceTable, limit: int = 5) -> list[NameMatch]:
    """Table entries a typed name refers to, best first (see :func:`resolve_name`).

    An exact match or a single confident guess gives one entry; otherwise the
    suggestions (possibly none).  Handedness words that are refused give no
    entry.
    """
    found = resolve_name(query, table, limit)
    if found.match is not None:
        return [found.match]
    return found.suggestions

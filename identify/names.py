"""Finding a table entry by name, tolerant of typos and variants ("figure eight", "7-4", "74")."""

from __future__ import annotations

import re

from .errors import TableError
from .table import MIRROR_MARK, ReferenceTable

__all__ = ["find_name", "NameMatch"]

_MIRROR_WORDS = ("mirror image", "mirror", "mirrored", "reflected")


class NameMatch(tuple):
    """(name, mirrored, how, score)."""

    @property
    def name(self) -> str:
        return self[0]

    @property
    def mirrored(self) -> bool:
        return self[1]

    @property
    def how(self) -> str:
        return self[2]


def _canonical_digits(text: str, names: set[str]) -> str | None:
    """'7-4', '7.4', '7 4', '7_4', '74', '10132' -> an Alexander-Briggs name in the table."""
    m = re.fullmatch(r"(\d{1,2})\s*[-_.,/ ]\s*(\d{1,3})", text)
    if m:
        cand = f"{int(m.group(1))}_{int(m.group(2))}"
        return cand if cand in names else None
    if re.fullmatch(r"\d{2,5}", text):
        found = [f"{text[:k]}_{int(text[k:])}" for k in (1, 2) if k < len(text)]
        found = [c for c in found if c in names and not c.startswith("0")]
        if len(found) == 1:
            return found[0]
    return None


def find_name(query: str, table: ReferenceTable, limit: int = 5) -> list[NameMatch]:
    """Table entries matching a typed name, best first.

    Exact names, aliases and digit variants match at once; otherwise rapidfuzz
    ranks names and aliases by similarity.  A trailing or leading "mirror" (or
    the mirror mark ``*``) asks for the mirror image.

    Raises
    ------
    TableError
        For an empty query.
    """
    text = " ".join(query.strip().lower().split())
    if not text:
        raise TableError("empty knot name", value=query)
    mirrored = False
    if text.endswith(MIRROR_MARK):
        mirrored, text = True, text[:-1].strip()
    for w in _MIRROR_WORDS:
        if text.endswith(" " + w) or text.startswith(w + " "):
            mirrored = True
            text = text[:-len(w) - 1] if text.endswith(" " + w) else text[len(w) + 1:]
            text = text.replace(" of ", " ").strip()
            break
    pairs = table.names_and_aliases()
    names = {name for _, name in pairs}
    lowered = {n.lower(): n for n in names}
    if text in lowered:
        return [NameMatch((lowered[text], mirrored, "name", 100.0))]
    for alias, name in pairs:
        if alias.lower() == text:
            return [NameMatch((name, mirrored, f"alias {alias!r}", 100.0))]
    digits = _canonical_digits(text, names)
    if digits:
        return [NameMatch((digits, mirrored, "name variant", 100.0))]
    from rapidfuzz import fuzz, process

    choices = [a.lower() for a, _ in pairs]
    ranked = process.extract(text, choices, scorer=fuzz.WRatio, limit=limit * 3)
    out, seen = [], set()
    for choice, score, idx in ranked:
        name = pairs[idx][1]
        if name in seen or score < 60:
            continue
        seen.add(name)
        out.append(NameMatch((name, mirrored, f"similar to {pairs[idx][0]!r}", float(score))))
        if len(out) == limit:
            break
    return out

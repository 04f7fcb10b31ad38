"""2-bridge (rational) input settles what the invariants leave open.

A rational knot given as Conway's continued fraction is the 2-bridge knot
``b(p, q)`` of its fraction ``p/q``.  Two facts then decide between table
knots that share every computed invariant:

* 2-bridge knots are prime (Schubert 1956), so no connected sum is the input;
* ``b(p, q)`` and ``b(p', q')`` are the same knot up to mirror image exactly
  when ``p = p'`` and ``q' = +-q^(+-1) mod p`` (Schubert 1956), so a table
  knot whose Conway notation is a continued fraction of another class is not
  the input either.

A table knot whose Conway notation (Conway 1970, Rolfsen 1976 Appendix C)
is not a continued fraction is ruled out too: those tables write every
2-bridge knot as a continued fraction (from memory), so such a knot is not
2-bridge.
"""

from __future__ import annotations

from .result import IdentifyResult
from .table import ReferenceTable

__all__ = ["input_fraction", "table_fraction", "same_two_bridge", "settle_two_bridge"]


def input_fraction(text: str) -> tuple[int, int] | None:
    """Schubert's ``(p, q)`` of Conway text that is one rational chain, else None."""
    from .errors import NotationError
    from .notations.conway import rational_fraction
    from .notations.conway_algebraic import rational_chain

    body = text.strip()
    if body[:6].lower() == "conway":
        body = body[6:].lstrip(" \t")
        body = body[1:] if body.startswith(":") else body
    try:
        entries = rational_chain(body)
    except NotationError:
        return None
    return rational_fraction(entries) if entries else None


def table_fraction(knot: dict) -> tuple[int, int] | None:
    """``(p, q)`` of a table knot built from a continued fraction (``conway: 2312``), else None."""
    construction = knot.get("construction") or ""
    if not construction.startswith("conway:"):
        return None
    return input_fraction(construction[len("conway:"):])


def same_two_bridge(a: tuple[int, int], b: tuple[int, int]) -> bool:
    """Schubert (1956): b(p, q) = b(p', q') up to mirror iff p = p', q' = +-q^(+-1) mod p.

    Examples
    --------
    >>> same_two_bridge((5, 2), (5, 3)), same_two_bridge((7, 3), (7, 2))
    (True, False)
    """
    (p, q), (p2, q2) = a, b
    if p != p2:
        return False
    if p == 1:
        return True
    inverse = pow(q, -1, p)
    return q2 % p in {q % p, -q % p, inverse, -inverse % p}


def settle_two_bridge(result: IdentifyResult, text: str, table: ReferenceTable) -> None:
    """Drop candidates a rational input rules out, saying why (in place).

    Only an ambiguous result of Conway text that is one continued fraction is
    changed; every dropped candidate gets its reason in the notes.
    """
    if result.status != "ambiguous" or result.resolutions or not isinstance(text, str):
        return
    fraction = input_fraction(text)
    if fraction is None:
        return
    p, q = fraction
    kept, reasons = [], []
    for c in result.candidates:
        knot = table.knot(c.name)
        shown = c.label if c.chirality in ("same", "mirror") else c.name
        if "#" in c.name or knot["kind"] != "prime":
            reasons.append(f"{shown} is composite, and 2-bridge knots are prime")
            continue
        theirs = table_fraction(knot)
        if theirs is None:
            reasons.append(f"{shown} is not 2-bridge (the table writes it "
                           f"{knot['construction'].removeprefix('conway: ')!r}, not as a "
                           "continued fraction)")
        elif not same_two_bridge(fraction, theirs):
            reasons.append(f"{shown} is b({theirs[0]}, {theirs[1]}), another 2-bridge knot")
        else:
            kept.append(c)
    if not reasons or not kept:
        return
    result.candidates = kept
    if len(kept) == 1:
        result.status = "identified"
        result.notes = [n for n in result.notes if not n.startswith("several table knots")]
    result.notes.insert(0, (
        f"the input is the rational (2-bridge) knot b({p}, {q}) of its continued fraction; "
        "2-bridge knots are prime and b(p, q) is fixed by p and q up to q -> +-q^(+-1) mod p "
        "(Schubert 1956), which rules out: " + "; ".join(reasons)))

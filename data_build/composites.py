"""Composite knots: connected sums of table primes up to a total crossing number.

The crossing number of a connected sum is the sum of the summands' for the
alternating summands that occur through 10 crossings (Kauffman 1987, Murasugi
1987, Thistlethwaite 1987: reduced alternating diagrams are minimal, and a sum
of reduced alternating diagrams is one).
"""

from __future__ import annotations

from dataclasses import dataclass
from itertools import combinations_with_replacement

from knotsift.diagram import Diagram
from knotsift.invariants.fingerprint import Fingerprint
from knotsift.table import MIRROR_MARK

__all__ = ["Summand", "composite_sums", "summand_label"]


@dataclass(frozen=True)
class Summand:
    name: str
    crossing_number: int
    mirrored: bool

    @property
    def label(self) -> str:
        return self.name + (MIRROR_MARK if self.mirrored else "")


def summand_label(summands: tuple[Summand, ...]) -> str:
    return "#".join(s.label for s in summands)


def composite_sums(primes: list[tuple[str, int, bool, int]], max_crossings: int):
    """Every connected sum of at least two primes with total crossings <= max_crossings.

    Parameters
    ----------
    primes : list of (name, crossing_number, amphichiral, sort_order)

    Yields
    ------
    tuple of Summand
        Sorted summands, one representative per knot type up to mirror image:
        the image and its mirror give the same composite knot pair, yielded once.
    """
    order = {name: k for name, _, _, k in primes}
    prime_info = [(n, c, a) for n, c, a, _ in primes if c > 0]

    def choices(entry):
        name, c, amphi = entry
        return [Summand(name, c, False)] if amphi else [Summand(name, c, False),
                                                        Summand(name, c, True)]

    all_summands = [s for e in prime_info for s in choices(e)]
    key = lambda s: (order[s.name], s.mirrored)  # noqa: E731
    all_summands.sort(key=key)
    amphichiral = {n for n, _, a in prime_info if a}
    seen: set[tuple] = set()
    for size in range(2, max_crossings // 3 + 1):
        for combo in combinations_with_replacement(all_summands, size):
            if sum(s.crossing_number for s in combo) > max_crossings:
                continue
            combo = tuple(sorted(combo, key=key))
            mirror = tuple(sorted(mirror_of(combo, amphichiral), key=key))
            canon = min(combo, mirror, key=lambda t: [key(s) for s in t])
            if canon in seen:
                continue
            seen.add(canon)
            yield canon


def mirror_of(summands: tuple[Summand, ...], amphichiral: set[str]) -> tuple[Summand, ...]:
    return tuple(Summand(s.name, s.crossing_number, (not s.mirrored) and s.name not in amphichiral)
                 for s in summands)


def sum_fingerprint(prints: list[Fingerprint]) -> Fingerprint:
    out = prints[0]
    for p in prints[1:]:
        out = out * p
    return out


def sum_diagram(diagrams: list[Diagram]) -> Diagram:
    out = diagrams[0]
    for d in diagrams[1:]:
        out = out.connected_sum(d)
    return out

"""Gaps in protein chains: the knot type with the gap bridged, and with the pieces apart.

A structure often lacks residues that were not resolved.  Joining the two
C-alphas on either side of such a gap by a straight segment (the bridge) is
one guess at the missing segment, and it can tie a knot that is not there,
or lose one that is.  The rule (documented in the README):

1. A gap is a C-alpha to C-alpha distance above the break distance (4.2
   Angstrom by default; consecutive C-alphas of a peptide are about 3.8
   Angstrom apart, common practice).
2. The chain is identified with every gap bridged, as before.
3. The chain is cut at every gap, and each piece is identified on its own
   as an open chain, with the same closure, closures and seed.  A piece of
   fewer than 4 beads has at most 2 segments; closed by at most 3 more it
   is a polygon of at most 5 edges, and every knotted polygon has at least 6
   edges (the stick number of the trefoil is 6; from memory), so such a
   piece is unknotted.
4. The two answers agree when the bridged chain is unknotted and every
   piece is, or when exactly one piece is knotted and the bridged chain has
   that same type.  Otherwise the chain's status becomes
   ``depends on missing segment`` and the result gives both answers: the
   type then depends on where the missing residues run, which the file does
   not say.  When some piece cannot be identified the bridged answer stands,
   with a warning that it was not confirmed.

The comparison is also recorded in the result's ``curve.gaps`` field.
"""

from __future__ import annotations

from typing import Callable

import numpy as np

from .frame import MIN_BEADS, Chain

__all__ = ["DEPENDS", "weigh_gaps", "answer_of"]

#: Status of a chain whose knot type changes with what fills its gaps.
DEPENDS = "depends on missing segment"
UNKNOT = "0_1"


def answer_of(result) -> str:
    """A short answer of a result: the knot's label, or its status."""
    if result.status == "identified" and result.name:
        return result.name
    if result.status == "ambiguous" and result.candidates:
        return "ambiguous (" + " or ".join(c.label for c in result.candidates) + ")"
    if result.status == "error":
        return f"error ({result.error})"
    return result.status


def weigh_gaps(result, chain: Chain, gaps: list[tuple[int, float]],
               identify_piece: Callable[[Chain], object]) -> None:
    """Identify the pieces of a chain cut at its gaps and compare them with ``result``.

    Parameters
    ----------
    result : CurveResult
        The bridged chain's result; changed in place (status, notes,
        warnings, ``gaps``).
    chain : Chain
        The chain as read (open).
    gaps : list of (bead, distance)
        A gap between ``bead`` and ``bead + 1``.
    identify_piece : callable
        Identifies one open piece (a Chain) and returns its CurveResult.
    """
    cuts = sorted({int(k) for k, _ in gaps})
    bounds = [0] + [k + 1 for k in cuts] + [len(chain.coords)]
    pieces = []
    for a, b in zip(bounds[:-1], bounds[1:], strict=True):
        if b - a < MIN_BEADS:
            pieces.append({"start": a, "end": b - 1, "beads": b - a, "answer": UNKNOT,
                           "why": "fewer than 4 beads: too short to be knotted"})
            continue
        piece = Chain(f"{chain.id}[{a}-{b - 1}]", np.asarray(chain.coords)[a:b], False)
        r = identify_piece(piece)
        pieces.append({"start": a, "end": b - 1, "beads": b - a, "answer": answer_of(r)})
    bridged = answer_of(result)
    answers = [p["answer"] for p in pieces]
    readable = all(not a.startswith(("error", "ambiguous")) and a not in
                   ("undetermined", "not in table") for a in answers)
    knotted = [a for a in answers if a != UNKNOT]
    agree = (bridged == UNKNOT and not knotted) or knotted == [bridged]
    shown_gaps = ", ".join(f"beads {k}-{k + 1} ({d:.1f} A)" for k, d in gaps)
    shown_pieces = "; ".join(f"beads {p['start']}-{p['end']}: {p['answer']}" for p in pieces)
    result.gaps = {"gaps": [{"beads": [int(k), int(k) + 1], "distance": float(d)}
                            for k, d in gaps],
                   "bridged": bridged, "pieces": pieces,
                   "agree": bool(agree) if readable else None}
    if not readable:
        result.warnings.append(f"gaps at {shown_gaps}: the pieces apart could not all be "
                               f"identified ({shown_pieces}); the bridged answer {bridged} is "
                               "not confirmed by them")
    elif agree:
        result.notes.append(f"gaps at {shown_gaps}: bridged by straight segments the chain is "
                            f"{bridged}, and the pieces apart agree ({shown_pieces})")
    else:
        result.status = DEPENDS
        result.notes.insert(0, f"the knot type depends on the missing segment(s) at "
                               f"{shown_gaps}: bridged by straight segments the chain is "
                               f"{bridged}; its pieces apart, as open chains, are "
                               f"{shown_pieces}")

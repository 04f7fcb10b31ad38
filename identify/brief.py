"""One line per item, for long batches (``--brief``).

Each line has three fields separated by tabs: where the item is (input
label, or file, frame and chain), its status, and its answer (the knot's
label, the candidates when ambiguous, both answers when a gap decides, or
the error).  A chain with warnings gets `` (N warnings)`` after its answer.
"""

from __future__ import annotations

__all__ = ["brief_line", "brief_lines"]


def _answer(r) -> str:
    if r.status == "error":
        return r.error or ""
    if r.status == "identified" and r.name:
        return r.name
    if r.status == "ambiguous" and r.candidates:
        return " or ".join(c.label for c in r.candidates)
    gaps = getattr(r, "gaps", None)
    if gaps and r.status == "depends on missing segment":
        pieces = " + ".join(p["answer"] for p in gaps["pieces"])
        return f"bridged {gaps['bridged']}; pieces {pieces}"
    spectrum = getattr(r, "spectrum", None)
    if r.status == "undetermined" and spectrum:
        return ", ".join(f"{s['type']} {s['fraction']:.0%}" for s in spectrum[:3])
    return "-"


def brief_line(result, where: str | None = None) -> str:
    """One tab-separated line for one result (IdentifyResult or CurveResult).

    Examples
    --------
    >>> from knotsift.result import IdentifyResult
    >>> brief_line(IdentifyResult(status="error", error="bad code", source="input"))
    'input\\terror\\tbad code'
    """
    answer = _answer(result)
    n = len(getattr(result, "warnings", []) or [])
    if n:
        answer += f" ({n} warning{'s' if n > 1 else ''})"
    return f"{where or result.source}\t{result.status}\t{answer}".replace("\n", " ")


def brief_lines(item) -> list[str]:
    """Lines for a result, or for every chain of a frame result (a frame error is one line)."""
    chains = getattr(item, "chains", None)
    if chains is None or not hasattr(item, "linking"):
        return [brief_line(item)]
    head = f"{item.source}, frame {item.frame}" if item.source else f"frame {item.frame}"
    if item.error is not None:
        return [f"{head}\terror\t{item.error}".replace("\n", " ")]
    return [brief_line(c, f"{head}, chain {c.chain}") for c in chains]

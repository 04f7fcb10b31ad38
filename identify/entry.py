"""A table entry as a person reads it: invariants, a PD code, aliases, confusions."""

from __future__ import annotations

from .table import ReferenceTable

__all__ = ["describe_entry", "entry_text"]

_INVS = ("jones", "alexander", "determinant", "signature")


def _chirality(knot: dict, form, forms: list) -> str:
    """The chirality word identify would print for this form (result.CHIRALITIES).

    A chiral knot whose two forms share every stored invariant is
    "undetermined", as :func:`knotsift.identification.identify` says of it.
    """
    if knot["amphichiral"]:
        return "amphichiral"
    if len(forms) < 2 or len({f.fingerprint for f in forms}) < 2:
        return "undetermined"
    return "mirror" if not form.is_reference else "same"


def describe_entry(name: str, mirrored: bool, table: ReferenceTable) -> dict:
    """Everything the table knows about one knot, in the requested chirality."""
    knot = table.knot(name)
    forms = table.forms_of(name)
    if mirrored and len(forms) > 1:
        form = next(f for f in forms if not f.is_reference)
    else:
        form = next(f for f in forms if f.is_reference)
    confused = {}
    for inv in _INVS:
        value = str(getattr(form, inv))
        confused[inv] = sorted({f.label for f in table.by_invariant(inv, value)
                                if f.name != name})
    return {
        "name": name,
        "label": form.label,
        "kind": knot["kind"],
        "chirality": _chirality(knot, form, forms),
        "chirality_basis": knot["chirality_basis"],
        "crossing_number": knot["crossing_number"],
        "alternating": bool(knot["alternating"]),
        "summands": knot["summands"],
        "aliases": [a.strip() for a in knot["aliases"].split(";") if a.strip()],
        "invariants": {inv: str(getattr(form, inv)) for inv in _INVS},
        "pd_code": form.pd(),
        "construction": knot["construction"],
        "source": knot["source"],
        "provenance": knot["provenance"],
        "shares_value_with": confused,
    }


def entry_text(info: dict) -> str:
    chir = {"amphichiral": "amphichiral", "mirror": "mirror image of the reference diagram",
            "same": "reference diagram",
            "undetermined": "chiral, but these invariants do not tell it from its mirror "
                            "image"}[info["chirality"]]
    lines = []
    if info.get("guess"):
        lines.append(f"guess: no entry is named {info['query']!r}; the closest is shown "
                     f"({info['matched_by']})")
    lines += [f"{info['label']}  ({info['kind']}, {info['crossing_number']} crossings, "
             f"{'alternating' if info['alternating'] else 'non-alternating'}; {chir})"]
    if info["aliases"]:
        lines.append(f"  also known as: {', '.join(info['aliases'])}")
    if info["summands"]:
        lines.append(f"  summands: {info['summands']}")
    for inv in _INVS:
        lines.append(f"  {inv:<12} {info['invariants'][inv]}")
    lines.append(f"  chirality seen by: {info['chirality_basis']}")
    lines.append(f"  construction: {info['construction']}  (source: {info['source']}; "
                 f"{info['provenance']})")
    lines.append(f"  PD code: {info['pd_code']}")
    for inv in _INVS:
        others = info["shares_value_with"][inv]
        if others and inv in ("jones", "alexander"):
            shown = ", ".join(others[:10]) + (f" and {len(others) - 10} more"
                                              if len(others) > 10 else "")
            lines.append(f"  same {inv} as: {shown}")
    for note in info.get("notes", []):
        lines.append(f"  note: {note}")
    return "\n".join(lines)

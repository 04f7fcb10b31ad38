"""A link table entry as a person reads it: its forms, invariants and aliases."""

from __future__ import annotations

from .table import ReferenceTable

__all__ = ["find_link", "describe_link", "link_entry_text"]


def _norm(text: str) -> str:
    return " ".join(text.lower().replace("-", " ").split())


def find_link(query: str, table: ReferenceTable) -> str | None:
    """The link whose name or alias equals ``query`` (case and spacing ignored), or None."""
    q = _norm(query)
    for row in table.links():
        names = [row["name"]] + [a.strip() for a in row["aliases"].split(";") if a.strip()]
        if any(_norm(n) == q for n in names):
            return row["name"]
    return None


def describe_link(name: str, table: ReferenceTable) -> dict:
    """Everything the table knows about one link, with every orientation class and mirror."""
    row = table.link(name)
    forms = table.link_forms_of(name)
    return {
        "name": name, "kind": row["kind"], "components": row["components"],
        "crossing_number": row["crossing_number"], "alternating": bool(row["alternating"]),
        "name_confidence": row["name_confidence"], "summands": row["summands"],
        "aliases": [a.strip() for a in row["aliases"].split(";") if a.strip()],
        "construction": row["construction"], "source": row["source"],
        "provenance": row["provenance"],
        "forms": [{"label": f.label, "reversed": f.reversed, "mirrored": f.mirrored,
                   "jones": f.jones, "linking": f.linking, "alexander": f.alexander,
                   "determinant": f.determinant, "signature": f.signature,
                   "triple": f.triple, "pd_code": f.pd(), "free_loops": f.free_loops}
                  for f in forms],
    }


def link_entry_text(info: dict) -> str:
    head = (f"{info['name']}  ({info['kind']} link of {info['components']} components, "
            f"{info['crossing_number']} crossings"
            f"{', alternating' if info['alternating'] else ''})")
    lines = [head]
    if info["aliases"]:
        lines.append("  also known as: " + ", ".join(info["aliases"]))
    if info["name_confidence"] == "uncertain":
        lines.append("  the index in this name is recalled with low confidence "
                     "(reference/README.md, links)")
    lines.append(f"  construction: {info['construction']}  (source: {info['source']}; "
                 f"{info['provenance']})")
    ref = info["forms"][0]
    lines.append(f"  multivariable alexander  {ref['alexander']}")
    lines.append(f"  determinant  {ref['determinant']}")
    for f in info["forms"]:
        lines.append(f"  {f['label']:<14} linking {f['linking'] or '-':<8} signature "
                     f"{f['signature']:>3}  jones {f['jones']}")
    return "\n".join(lines)

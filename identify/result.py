"""The result of identifying one input: candidates, invariants and notes.

``IdentifyResult.to_dict()`` is the documented JSON schema (README, "JSON
output"); ``to_text()`` is the readable report.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from .display import ResultValues
from .errors import KnotsiftError

__all__ = ["Candidate", "IdentifyResult", "STATUSES", "CHIRALITIES", "PRIMALITIES",
           "DECOMPOSITIONS", "JSON_SCHEMA_VERSION"]

JSON_SCHEMA_VERSION = 2
#: "too complex": the item's wall-time budget ran out (what was computed is kept).
STATUSES = ("identified", "ambiguous", "not in table", "too complex", "error")
#: "per factor": a connected sum found from invariants; each factor has its own chirality.
CHIRALITIES = ("same", "mirror", "amphichiral", "undetermined", "per factor")
#: Values of ``IdentifyResult.primality``.
PRIMALITIES = ("prime", "composite", "unknot", "unknown")
#: Values of ``IdentifyResult.decomposition``: how a connected sum was seen.
DECOMPOSITIONS = ("diagram", "invariants")


def _notation_words(notation: str, how: str) -> str:
    """'DT code (detected)', 'braid word (named in the text)', '3D coordinates'."""
    names = {"pd": "PD code", "dt": "DT code", "gauss": "Gauss code", "braid": "braid word",
             "conway": "Conway notation", "diagram": "a diagram object"}
    shown = names.get(notation, notation)
    why = {"detected": "detected", "named": "named in the text",
           "given": "as requested"}.get(how)
    return f"{shown} ({why})" if why else shown


@dataclass
class Candidate:
    """One table knot consistent with the input."""

    name: str
    label: str
    chirality: str
    agrees: list[str]
    crossing_number: int
    kind: str
    aliases: list[str] = field(default_factory=list)
    factors: list[dict] | None = None

    @property
    def shown(self) -> str:
        """The label when chirality is known (per factor for sums), else the name."""
        if self.chirality in ("same", "mirror", "per factor"):
            return self.label
        return self.name
    #: What the verdict rests on: "invariants" (a match: evidence), or for the
    #: unknot "trivial diagram" (the diagram simplified to no crossings: proof).
    basis: str = "invariants"

    def to_dict(self) -> dict:
        return {
            "basis": self.basis,
            "name": self.name,
            "label": self.label,
            "chirality": self.chirality,
            "agrees": list(self.agrees),
            "crossing_number": self.crossing_number,
            "kind": self.kind,
            "aliases": list(self.aliases),
            "factors": None if self.factors is None else [dict(f) for f in self.factors],
        }


@dataclass
class IdentifyResult(ResultValues):
    """What could be said about one input diagram.

    ``invariant_values`` gives the invariants as values (Laurent, int), and
    Jupyter shows the result as a small table (see :mod:`knotsift.display`).
    """

    status: str
    candidates: list[Candidate] = field(default_factory=list)
    invariants: dict[str, str] = field(default_factory=dict)
    separation: dict[str, dict] = field(default_factory=dict)
    notes: list[str] = field(default_factory=list)
    source: str = ""
    notation: str = ""
    notation_how: str = ""
    crossings_input: int | None = None
    crossings_simplified: int | None = None
    resolutions: list[dict] | None = None
    neighbours: list[dict] | None = None
    error: str | None = None
    link: dict | None = None
    type_key: str | None = None
    crossing_bounds: list[int | None] | None = None
    primality: str | None = None
    factors: list[dict] | None = None
    decomposition: str | None = None
    remainder: dict | None = None
    cost: dict = field(default_factory=dict)
    #: What the resolutions range over, for the text report.
    resolved_over: str = "the uncertain crossings"
    #: The diagram that was identified (not part of the JSON); drawn by :meth:`draw`.
    diagram: object = field(default=None, repr=False, compare=False)

    @property
    def name(self) -> str | None:
        """The identified knot's label (with the mirror mark), or None."""
        if self.status == "identified" and self.candidates:
            return self.candidates[0].shown
        return None

    def to_dict(self) -> dict:
        return {
            "schema_version": JSON_SCHEMA_VERSION,
            "source": self.source,
            "notation": self.notation,
            "notation_how": self.notation_how,
            "status": self.status,
            "name": self.name,
            "candidates": [c.to_dict() for c in self.candidates],
            "invariants": dict(self.invariants),
            "separation": self.separation,
            "crossings": {"input": self.crossings_input, "simplified": self.crossings_simplified},
            "resolutions": self.resolutions,
            "neighbours": self.neighbours,
            "notes": list(self.notes),
            "error": self.error,
            "link": self.link,
            "type_key": self.type_key,
            "crossing_bounds": None if self.crossing_bounds is None
            else list(self.crossing_bounds),
            "primality": self.primality,
            "factors": None if self.factors is None else [dict(f) for f in self.factors],
            "decomposition": self.decomposition,
            "remainder": self.remainder,
            "cost": dict(self.cost),
        }

    def to_text(self) -> str:
        lines = []
        head = f"{self.source}: " if self.source else ""
        if self.status == "error":
            return f"{head}error: {self.error}"
        if self.status == "identified":
            c = self.candidates[0]
            chir = {
                "same": "same chirality as the table's reference diagram",
                "mirror": "mirror image of the table's reference diagram",
                "amphichiral": "amphichiral (equal to its mirror image)",
                "undetermined": "chirality undetermined by these invariants",
                "per factor": "connected sum found from the invariants (chirality per "
                              "factor)",
            }[c.chirality]
            alias = f" ({', '.join(c.aliases)})" if c.aliases else ""
            shown = c.shown
            if c.name == "0_1":
                chir = {"trivial diagram": "proven, the diagram simplifies to no crossings",
                        "invariants": "by its invariants only (evidence, not proof)"}.get(
                            c.basis, chir)
            lines.append(f"{head}{shown}{alias}: {chir}")
        elif self.status == "ambiguous" and self.resolutions:
            shown = ", ".join(f"{r['result']} ({r['fraction']:.0%})" for r in self.resolutions)
            lines.append(f"{head}ambiguous over {self.resolved_over}: {shown}")
        elif self.status == "ambiguous":
            names = ", ".join(c.shown for c in self.candidates)
            lines.append(f"{head}ambiguous: {names}")
        elif self.status == "too complex":
            lines.append(f"{head}too complex: {self.error}")
        else:
            lines.append(f"{head}not in the table")
        if self.type_key and self.status != "identified":
            kind = f", {self.primality}" if self.primality not in (None, "unknown") else ""
            lines.append(f"  type key: {self.type_key}{kind}")
        if self.crossing_bounds is not None:
            lo, hi = self.crossing_bounds
            if lo is not None and lo == hi:
                lines.append(f"  crossing number: {lo}")
            else:
                lines.append(f"  crossing number: {lo if lo is not None else '?'} to "
                             f"{hi if hi is not None else '?'}")
        if self.notation:
            lines.append(f"  read as: {_notation_words(self.notation, self.notation_how)}")
        if self.crossings_input is not None:
            lines.append(f"  crossings: {self.crossings_input} in the input, "
                         f"{self.crossings_simplified} after simplification")
        for key in ("jones", "alexander", "determinant", "signature", "rho_1", "homology"):
            if self.invariants.get(key):
                label = {"jones": "Jones V(t)", "alexander": "Alexander", "determinant":
                         "determinant", "signature": "signature", "rho_1": "rho_1",
                         "homology": "H1(cover)"}[key]
                sep = self.separation.get(key)
                share = f"   [{sep['count']} table entr{'y' if sep['count'] == 1 else 'ies'}]" \
                    if sep else ""
                lines.append(f"  {label:<11} {self.invariants[key]}{share}")
        if self.link:
            lines.extend(_link_lines(self.link, self.invariants))
        if self.resolutions:
            lines.append(f"  resolutions of {self.resolved_over}:")
            for r in self.resolutions:
                lines.append(f"    {r['fraction']:6.1%}  {r['result']}  ({r['count']} of "
                             f"{r['total']})")
        if self.neighbours:
            lines.append("  one crossing change away:")
            for n in self.neighbours:
                lines.append(f"    {n['result']}  (crossings {', '.join(map(str, n['crossings']))})")
        for note in self.notes:
            lines.append(f"  note: {note}")
        return "\n".join(lines)

    # -- pictures ---------------------------------------------------------------
    def draw(self, path=None, *, simplified: bool = False, seed: int = 0, **options):
        """Draw the identified diagram: a matplotlib ``Figure``, or a file when ``path`` is given.

        ``options`` are those of :func:`knotsift.drawing.figures.draw_diagram`
        (``arrows``, ``signs``, ``labels``, ``title``).

        Raises
        ------
        DrawingError
            When the result holds no diagram (an error, or a row read back from a file).
        """
        from .drawing.figures import draw_diagram
        from .drawing.render import DrawingError

        if self.diagram is None:
            raise DrawingError("this result holds no diagram to draw (an error, or a result "
                               "read back from a file)")
        options.setdefault("title", self.name or self.status)
        return draw_diagram(self.diagram, path, simplified=simplified, seed=seed, **options)

    def _repr_svg_(self) -> str | None:
        """The diagram as SVG, so that a notebook shows the result as a picture."""
        if self.diagram is None:
            return None
        from .drawing.layout import layout_diagram
        from .drawing.render import svg_text

        text = svg_text([(self.name or self.status, layout_diagram(self.diagram))])
        return text[text.index("<svg"):]

    def _repr_html_(self) -> str:
        """The table of values (:class:`knotsift.display.ResultValues`) and the drawn diagram."""
        table = ResultValues._repr_html_(self)
        try:
            svg = self._repr_svg_()
        except KnotsiftError:  # a diagram that cannot be drawn still leaves the table
            svg = None
        return table + (f'<div style="max-width:18em">{svg}</div>' if svg else "")

def _link_lines(link: dict, invariants: dict) -> list[str]:
    """The link section of the readable report (components numbered from 1)."""
    m = link["components"]
    lines = [f"  components: {m}; types: {', '.join(link['component_types'])}"]
    lk = link["linking_matrix"]
    pairs = [f"{a + 1}-{b + 1}: {lk[a][b]}" for a in range(m) for b in range(a + 1, m)]
    lines.append("  linking numbers: " + ", ".join(pairs))
    if link.get("triple_linking_number") is not None:
        lines.append(f"  triple linking number mu(123): {link['triple_linking_number']}")
    for text in link.get("orientation", []):
        lines.append(f"  orientation class {text}")
    for s in link.get("sublinks", []):
        a, b = s["components"]
        lines.append(f"  components {a + 1} and {b + 1} alone: {s['type']}")
    return lines

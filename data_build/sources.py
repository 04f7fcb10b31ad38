"""Reading the human-readable name source in reference/ (recalled published tables)."""

from __future__ import annotations

import csv
from dataclasses import dataclass, field
from importlib import resources
from pathlib import Path

from knotsift.errors import TableError
from knotsift.laurent import Laurent

__all__ = ["PrimeEntry", "ReferenceSources", "read_sources", "reference_dir"]


@dataclass
class PrimeEntry:
    """One named prime knot as the name source gives it."""

    name: str
    crossing_number: int
    conway: str
    dt_code: str
    alternating: bool
    source: str
    provenance: str
    aliases: list[str] = field(default_factory=list)
    line: int = 0
    correction: str = ""   # why the construction differs from the recalled one, if it does

    @property
    def index(self) -> int:
        return int(self.name.split("_")[1])


@dataclass
class ReferenceSources:
    primes: list[PrimeEntry]
    alexander: dict[str, Laurent]        # recalled Alexander polynomials (may be incomplete)
    determinant: dict[str, int]          # recalled determinants
    amphichiral: set[str]                # recalled amphichiral knots
    jones: dict[str, Laurent]            # recalled Jones polynomials (through 8 crossings)
    signature: dict[str, tuple[int, str]]  # recalled (signature, "signed" | "abs")
    discrepancies: dict[str, dict[str, str]]  # name -> {check: explanation}
    coincidences: list[frozenset[str]]   # documented groups sharing every invariant
    directory: Path


def reference_dir() -> Path:
    """The reference/ folder: the source checkout's, or the installed package's copy."""
    return Path(str(resources.files("knotsift.reference")))


def _rows(path: Path) -> list[tuple[int, dict[str, str]]]:
    if not path.is_file():
        raise TableError(f"name source file missing: {path}", value=str(path))
    with path.open(newline="", encoding="utf-8") as fh:
        reader = csv.DictReader(fh)
        return [(k + 2, row) for k, row in enumerate(reader)]


def _coefficients(text: str, where: str) -> Laurent:
    parts = text.split()
    try:
        coeffs = [int(p) for p in parts]
    except ValueError:
        raise TableError(f"{where}: expected integer coefficients, got {text!r}") from None
    if len(coeffs) % 2 == 0:
        raise TableError(f"{where}: a symmetric Alexander polynomial has an odd number of "
                         f"coefficients, got {len(coeffs)}")
    g = len(coeffs) // 2
    return Laurent.from_coefficients(-g, coeffs)


def read_sources(directory: Path | None = None) -> ReferenceSources:
    """Read every file of the name source; malformed rows raise TableError with file and line."""
    d = directory or reference_dir()
    aliases: dict[str, list[str]] = {}
    for line, row in _rows(d / "aliases.csv"):
        aliases.setdefault(row["name"], []).append(row["alias"])
    primes = []
    for line, row in _rows(d / "prime_knots.csv"):
        try:
            primes.append(PrimeEntry(
                name=row["name"], crossing_number=int(row["crossing_number"]),
                conway=row["conway"].strip(), dt_code=row["dt_code"].strip(),
                alternating=row["alternating"].strip() == "yes", source=row["source"],
                provenance=row["provenance"], aliases=aliases.get(row["name"], []), line=line))
        except (KeyError, ValueError) as exc:
            raise TableError(f"{d / 'prime_knots.csv'}, line {line}: bad row ({exc})") from None
    corrections_file = d / "corrections.csv"
    if corrections_file.is_file():
        by_name = {p.name: p for p in primes}
        for line, row in _rows(corrections_file):
            entry = by_name.get(row["name"])
            if entry is None or row["field"] != "conway" or entry.conway != row["recalled"]:
                raise TableError(f"{corrections_file}, line {line}: the correction does not "
                                 f"match a recalled Conway notation ({row['name']}, "
                                 f"{row['recalled']!r})")
            entry.conway = row["corrected"]
            entry.correction = row["reason"]
    alexander, determinant = {}, {}
    for line, row in _rows(d / "alexander.csv"):
        where = f"{d / 'alexander.csv'}, line {line}"
        if row["alexander"].strip():
            alexander[row["name"]] = _coefficients(row["alexander"], where)
        determinant[row["name"]] = int(row["determinant"])
    jones = {}
    for line, row in _rows(d / "jones.csv"):
        coeffs = [int(c) for c in row["coefficients"].split()]
        jones[row["name"]] = Laurent.from_coefficients(int(row["min_exponent"]), coeffs)
    signature = {}
    for line, row in _rows(d / "signature.csv"):
        if row["signature"].strip():
            signature[row["name"]] = (int(row["signature"]), row.get("convention", "signed"))
    amphichiral = {row["name"] for _, row in _rows(d / "amphichiral.csv")}
    discrepancies: dict[str, dict[str, str]] = {}
    if (d / "discrepancies.csv").is_file():
        for _, row in _rows(d / "discrepancies.csv"):
            discrepancies.setdefault(row["name"], {})[row["check"]] = row["explanation"]
    coincidences = []
    if (d / "coincidences.csv").is_file():
        coincidences = [frozenset(row["names"].split()) for _, row in
                        _rows(d / "coincidences.csv")]
    return ReferenceSources(primes, alexander, determinant, amphichiral, jones, signature,
                            discrepancies, coincidences, d)

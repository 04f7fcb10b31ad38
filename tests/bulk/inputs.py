"""Inputs for the bulk tests: scrambled diagrams of table knots, and a known mixed batch."""

from __future__ import annotations

import csv
import json
import random
from pathlib import Path

from knotsift import Diagram
from knotsift.reidemeister import scramble
from knotsift.table import open_table

__all__ = ["write_scrambled", "write_mixed", "MIXED", "comparable", "BAD_CODES",
           "agrees_with_expected"]

#: Codes that cannot be read or are not a diagram: each must become an error row.
BAD_CODES = ["[[1,2,3]]", "DT: 4 6 9", "[[1,5,2,4],[3,1,4,6]]", "O1+ U2+"]

# A mixed batch with a known composition.  DT codes of 3_1 and 4_1: Dowker and
# Thistlethwaite 1983, "Classification of knot projections" (from memory); the
# closure of the one-crossing 2-braid s1 is the unknot (common practice).
MIXED = [("trefoil", "DT: 4 6 2")] * 3 + [("figure-eight", "DT: 4 6 8 2")] * 2 + \
    [("unknot", "braid: s1")] * 5 + [("unreadable", "DT: 4 6 9")]


def _diagram_of(form) -> Diagram:
    pd = form.pd()
    return Diagram([tuple(x) for x in pd]) if pd else Diagram([], 1)


def write_scrambled(path: Path, *, copies: int = 2, moves: int = 8, seed: int = 2024,
                    max_crossings: int = 8, bad: bool = True, limit: int | None = None
                    ) -> list[dict]:
    """A CSV (label, code, expected) of table knots through ``max_crossings`` after random
    Reidemeister moves and relabelling; returns its rows.  The expected knot is the
    table form the diagram was made from."""
    table = open_table()
    rng = random.Random(seed)
    forms = [f for f in table.all_forms()
             if table.knot(f.name)["crossing_number"] <= max_crossings]
    rows = []
    for k in range(copies):
        for f in forms:
            d = scramble(_diagram_of(f), moves, rng)
            code = json.dumps([list(x) for x in d.crossings], separators=(",", ":"))
            rows.append({"label": f"{f.label}/{k}", "code": code, "expected": f.label})
    if limit is not None:
        rows = rows[:limit]
    if bad:
        rows += [{"label": f"bad/{i}", "code": c, "expected": ""} for i, c in enumerate(BAD_CODES)]
    with open(path, "w", newline="", encoding="utf-8") as fh:
        w = csv.DictWriter(fh, ["label", "code", "expected"])
        w.writeheader()
        w.writerows(rows)
    return rows


def write_mixed(path: Path) -> Path:
    """The batch MIXED in the line format of ``knotsift identify --file``."""
    path.write_text("# a known mixed batch\n" + "".join(f"{label}\t{code}\n"
                                                       for label, code in MIXED))
    return path


def comparable(df) -> list[dict]:
    """Rows sorted by key, timing columns dropped, missing values as None, numbers as int."""
    import numpy as np

    from knotsift.bulk.rows import TIMING_COLUMNS

    df = df.drop(columns=list(TIMING_COLUMNS)).sort_values("key").reset_index(drop=True)
    df = df.astype(object).where(df.notna(), None)
    return [{k: int(v) if isinstance(v, np.integer) else v for k, v in rec.items()}
            for rec in df.to_dict(orient="records")]


def agrees_with_expected(status: str, knot, candidates, expected: str) -> bool:
    """The row names the knot its diagram was made from: as the identified knot, or among
    the candidates when the table holds knots these invariants cannot tell apart."""
    if status == "identified":
        return knot == expected
    return status == "ambiguous" and expected in str(candidates).split(" or ")

"""Classify outputs for the report tests, written through the real sinks.

The rows are made up to exercise every section of the report (several
lengths, knot types, mirrors, errors); they check the report's layout, never
any science.
"""

from __future__ import annotations

import random

from knotsift.bulk.rows import COLUMN_NAMES
from knotsift.bulk.sinks import open_sink

_TYPES = [("0_1", "0_1", "same"), ("3_1", "3_1", "same"), ("3_1*", "3_1", "mirror"),
          ("4_1", "4_1", "amphichiral"), ("5_2", "5_2", "same"), ("3_1#3_1", "3_1#3_1", "same")]


def write_run(out, rows: int = 300, seed: int = 7, lengths=(100, 200, 400)) -> list[dict]:
    """Write ``rows`` made-up trajectory rows (some errors) to the classify output ``out``."""
    rng = random.Random(seed)
    records = []
    for k in range(rows):
        n = lengths[k % len(lengths)]
        base = {c: None for c in COLUMN_NAMES}
        base.update(key=f"run_N{n}.xyz:{k}:0", source=f"run_N{n}.xyz", frame=k, chain=0,
                    kind="frame", n_beads=n, closure=None, seconds=rng.random() / 10)
        if k % 50 == 49:
            base.update(status="error", error=f"frame {k}, chain 0: beads 3 and 4 overlap "
                                              "<check the input>")
        else:
            p_unknot = 2.718281828 ** (-n / 300)
            if rng.random() < p_unknot:
                knot, ktype, chir = _TYPES[0]
            else:
                knot, ktype, chir = rng.choice(_TYPES[1:])
            base.update(status="identified", knot=knot, knot_type=ktype, chirality=chir,
                        candidates=knot, components=1, crossings_input=rng.randrange(3, 60),
                        crossings_simplified=rng.randrange(0, 9), determinant=1,
                        signature=0)
        records.append(base)
    sink = open_sink(out)
    try:
        sink.prepare({"closure": "stochastic", "n_closures": 100, "seed": seed,
                      "made_up": "report test"})
        for start in range(0, len(records), 200):
            sink.write(records[start:start + 200])
    finally:
        sink.close()
    return records

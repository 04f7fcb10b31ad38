"""Benchmark: all invariants of every prime knot in the table, from a diagram of each.

Also times one exact lookup in the table (median of many).

    python bench/bench_table_invariants.py
"""

from __future__ import annotations

import statistics
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from knotsift.diagram import Diagram  # noqa: E402
from knotsift.invariants.fingerprint import fingerprint  # noqa: E402
from knotsift.table import open_table  # noqa: E402


def main() -> None:
    table = open_table()
    primes = [k["name"] for k in table.knots() if k["kind"] == "prime"]
    diagrams = [Diagram(next(f for f in table.forms_of(n) if f.is_reference).pd())
                for n in primes]
    t0 = time.perf_counter()
    keys = [fingerprint(d).key() for d in diagrams]
    total = time.perf_counter() - t0
    by_size: dict[int, list[float]] = {}
    for d in diagrams[-40:]:
        t1 = time.perf_counter()
        fingerprint(d)
        by_size.setdefault(len(d), []).append(time.perf_counter() - t1)
    print(f"all invariants of {len(primes)} prime knots: {total:.2f} s "
          f"({1000 * total / len(primes):.1f} ms each)")
    for n, ts in sorted(by_size.items()):
        print(f"  {n} crossings: median {1000 * statistics.median(ts):.1f} ms")
    lookups = []
    for k in keys * 4:
        t1 = time.perf_counter()
        table.by_fingerprint(k)
        lookups.append(time.perf_counter() - t1)
    print(f"exact lookup: median {1e6 * statistics.median(lookups):.0f} us over {len(lookups)}")


if __name__ == "__main__":
    main()

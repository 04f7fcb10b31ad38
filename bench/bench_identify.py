"""Benchmark: identification end to end, in-process and as a whole command.

* a 30-crossing diagram (a table knot scrambled by random Reidemeister moves)
  identified end to end: median over several diagrams;
* `knotsift identify` on a small diagram as a separate process: median wall time.

    python bench/bench_identify.py
"""

from __future__ import annotations

import random
import statistics
import subprocess
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from knotsift import identify  # noqa: E402
from knotsift.diagram import Diagram  # noqa: E402
from knotsift.reidemeister import scramble  # noqa: E402
from knotsift.table import open_table  # noqa: E402


def main() -> None:
    table = open_table()
    rng = random.Random(30)
    names = ["7_4", "8_17", "9_40", "10_123", "3_1#7_2", "10_145", "9_46", "10_161"]
    times, sizes = [], []
    for name in names:
        ref = next(f for f in table.forms_of(name) if f.is_reference)
        d = Diagram(ref.pd())
        while d.number_of_crossings() < 30:
            d = scramble(d, 2, rng)
        sizes.append(d.number_of_crossings())
        t0 = time.perf_counter()
        r = identify(d, table=table)
        times.append(time.perf_counter() - t0)
        assert r.candidates and r.candidates[0].name == name, (name, r.status)
    print(f"identify, {min(sizes)}-{max(sizes)} crossings: median {statistics.median(times):.3f} s,"
          f" slowest {max(times):.3f} s over {len(times)} diagrams")
    walls = []
    for _ in range(7):
        t0 = time.perf_counter()
        subprocess.run([sys.executable, "-m", "knotsift", "identify", "4 6 2"], check=True,
                       capture_output=True)
        walls.append(time.perf_counter() - t0)
    print(f"`knotsift identify '4 6 2'` as a process: median {statistics.median(walls):.3f} s")


if __name__ == "__main__":
    main()

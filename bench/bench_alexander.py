"""Benchmark: the Alexander polynomial of large knot diagrams.

Builds random knot diagrams of about 50, 100 and 200 crossings (closures of
random braid words on 5 to 8 strands, checked to be knots, not simplified)
and a connected sum of small random knots with 200 crossings, runs
:func:`alexander_polynomial` 5 times on each and prints the median seconds
(the first, cold call, which imports numpy and finds the primes, is printed
apart).  The target is under 1 s at 200 crossings.

    python bench/bench_alexander.py
"""

from __future__ import annotations

import random
import statistics
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from knotsift.diagram import Diagram  # noqa: E402
from knotsift.invariants.alexander import alexander_polynomial  # noqa: E402
from tests.strategies import braid_closure, random_knot_braid  # noqa: E402


def median_time(fn, arg, repeats: int = 5) -> float:
    times = []
    for _ in range(repeats):
        t0 = time.perf_counter()
        fn(arg)
        times.append(time.perf_counter() - t0)
    return statistics.median(times)


def connected_sum_of_small_knots(rng: random.Random, crossings: int) -> Diagram:
    total = Diagram.unknot()
    while total.number_of_crossings() < crossings:
        strands = rng.randint(2, 4)
        total = total.connected_sum(braid_closure(random_knot_braid(rng, strands, 7), strands))
    return total


def main() -> None:
    rng = random.Random(20261202)
    t0 = time.perf_counter()
    alexander_polynomial(braid_closure(random_knot_braid(rng, 5, 30), 5))
    print(f"cold first call (30 crossings): {time.perf_counter() - t0:.3f} s")
    print("crossings strands  span  median_s (5 runs)")
    for n, strands in ((50, 5), (100, 6), (200, 5), (200, 7), (200, 8)):
        d = braid_closure(random_knot_braid(rng, strands, n), strands)
        assert d.is_knot()
        span = alexander_polynomial(d).span()
        print(f"{d.number_of_crossings():9d} {strands:7d} {int(span):5d}  "
              f"{median_time(alexander_polynomial, d):8.4f}")
    d = connected_sum_of_small_knots(rng, 200)
    span = alexander_polynomial(d).span()
    print(f"{d.number_of_crossings():9d}   (sum) {int(span):5d}  "
          f"{median_time(alexander_polynomial, d):8.4f}")


if __name__ == "__main__":
    main()

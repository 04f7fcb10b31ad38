"""Benchmark: the Jones polynomial by tangle contraction against the plain state sum.

Prints median seconds for random knot diagrams of 16, 40 and 80 crossings
(closures of random braid words, not simplified) and the ratio of the state
sum to the contraction at 16 crossings, all measured in this one run.

    python bench/bench_jones.py
"""

from __future__ import annotations

import random
import statistics
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from knotsift.invariants.bracket import contraction_width  # noqa: E402
from knotsift.invariants.jones import jones_polynomial  # noqa: E402
from knotsift.invariants.state_sum import jones_by_states  # noqa: E402
from tests.strategies import braid_closure, random_knot_braid  # noqa: E402


def median_time(fn, arg, repeats: int) -> float:
    times = []
    for _ in range(repeats):
        t0 = time.perf_counter()
        fn(arg)
        times.append(time.perf_counter() - t0)
    return statistics.median(times)


def main() -> None:
    rng = random.Random(20261201)
    print("crossings strands width  contraction_s  state_sum_s")
    d16 = braid_closure(random_knot_braid(rng, 4, 16), 4)
    fast16 = median_time(jones_polynomial, d16, 7)
    slow16 = median_time(jones_by_states, d16, 1)
    print(f"{16:9d} {4:7d} {contraction_width(d16):5d}  {fast16:13.4f}  {slow16:11.3f}")
    print(f"state sum / contraction at 16 crossings: {slow16 / fast16:.0f}x")
    for n, strands in ((40, 5), (40, 8), (80, 6), (80, 10)):
        times = []
        widths = []
        for _ in range(5):
            d = braid_closure(random_knot_braid(rng, strands, n), strands)
            widths.append(contraction_width(d))
            times.append(median_time(jones_polynomial, d, 1))
        print(f"{n:9d} {strands:7d} {max(widths):5d}  {statistics.median(times):13.4f}  "
              f"(median of 5 diagrams; slowest {max(times):.4f})")


def projected_polygons(target: int, count: int, seed: int) -> list:
    """Unsimplified diagrams of random equilateral polygons with about ``target`` crossings."""
    import numpy as np

    from bench.random_polygons import random_polygon
    from knotsift.curves.projection import curve_diagram

    rng = np.random.default_rng(seed)
    found = []
    beads = max(20, int(2.2 * target ** 0.75))
    while len(found) < count:
        d = curve_diagram([(random_polygon(beads, rng), True)], seed=rng)
        n = d.number_of_crossings()
        if abs(n - target) <= target // 10:
            found.append(d)
        elif n < target:
            beads += 2
        else:
            beads = max(10, beads - 2)
    return found


def polygon_section() -> None:
    print("projected random equilateral polygons (not simplified):")
    for target in (40, 80):
        times, widths, sizes = [], [], []
        for d in projected_polygons(target, 5, seed=target):
            widths.append(contraction_width(d))
            sizes.append(d.number_of_crossings())
            times.append(median_time(jones_polynomial, d, 1))
        print(f"  ~{target} crossings ({min(sizes)}-{max(sizes)}), width <= {max(widths)}: "
              f"median {statistics.median(times):.3f} s, slowest {max(times):.3f} s")


if __name__ == "__main__":
    main()
    polygon_section()

"""Benchmark: the knotted-core search (``knotsift curve --core``), end to end.

Prints, all measured in this one run on this machine:

1. an open chain of 720 beads (a T(2,5) knot of 320 beads with two tails of
   200 beads) with 100 stochastic closures, with and without ``--core``,
   median seconds (target with the core: < 5 s);
2. a ring of about 1,000 beads (a T(2,5) knot of 300 beads, two tails of 250
   beads and a straight bridge joining their far ends) with the core search
   (target < 5 s).

The knots are made from the torus knot T(2,5) with Gaussian noise of 0.1
bond lengths; inputs come from fixed seeds and are invented, for timing only.

    python bench/bench_core.py            # about a minute
"""

from __future__ import annotations

import argparse
import statistics
import sys
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from knotsift.curves import identify_curve  # noqa: E402
from knotsift.table import open_table  # noqa: E402
from tests.curves.curves import moved, right_torus_knot, with_tails  # noqa: E402


def median_time(fn, repeats: int) -> tuple[float, object]:
    times, out = [], None
    for _ in range(repeats):
        t0 = time.perf_counter()
        out = fn()
        times.append(time.perf_counter() - t0)
    return statistics.median(times), out


def open_chain(knot: int, tail: int, seed: int) -> tuple[np.ndarray, tuple[int, int]]:
    """A noisy T(2,5) of ``knot`` beads, opened, with two tails of ``tail`` beads."""
    rng = np.random.default_rng(seed)
    return with_tails(moved(right_torus_knot(2, 5, knot), rng, noise=0.1), tail, rng)


def bridged_ring(knot: int, tail: int, seed: int) -> tuple[np.ndarray, tuple[int, int]]:
    """The open chain closed into a ring by a straight bridge of unit bonds between its ends."""
    x, span = open_chain(knot, tail, seed)
    bond = float(np.median(np.linalg.norm(np.diff(x, axis=0), axis=1)))
    gap = np.linalg.norm(x[0] - x[-1])
    k = max(1, int(gap / bond))
    t = np.linspace(0, 1, k + 1)[1:-1, None]
    return np.concatenate((x, x[-1] + t * (x[0] - x[-1]))), span


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--repeats", type=int, default=3)
    args = ap.parse_args()
    table = open_table()
    identify_curve(right_torus_knot(2, 3, 60), table=table)  # warm up imports and caches

    print("1. open chain, 100 stochastic closures")
    x, span = open_chain(320, 200, 7)
    t_plain, r = median_time(lambda: identify_curve(x, closed=False, table=table),
                             args.repeats)
    t_core, r = median_time(lambda: identify_curve(x, closed=False, localise=True,
                                                   table=table), args.repeats)
    c = r.core or {}
    ok = "meets" if t_core < 5 else "MISSES"
    print(f"  {len(x)} beads: without core {t_plain:.2f} s, with core {t_core:.2f} s median "
          f"({ok} target < 5 s); {r.name}; core {c.get('start')}..{c.get('end')} "
          f"({c.get('beads')} beads, {c.get('evaluations')} subchains judged); "
          f"knot placed at {span[0]}..{span[1]}")

    print("2. ring with the core search (arcs closed stochastically, 100 closures)")
    y, span = bridged_ring(300, 250, 8)
    t_ring, r = median_time(lambda: identify_curve(y, closed=True, localise=True,
                                                   table=table), args.repeats)
    c = r.core or {}
    ok = "meets" if t_ring < 5 else "MISSES"
    print(f"  {len(y)} beads: {t_ring:.2f} s median ({ok} target < 5 s); {r.name}; core "
          f"{c.get('start')}..{c.get('end')} ({c.get('beads')} beads, {c.get('evaluations')} "
          f"subchains judged); knot placed at {span[0]}..{span[1]}")


if __name__ == "__main__":
    main()

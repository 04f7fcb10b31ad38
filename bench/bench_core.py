"""Benchmark: the knotted-core search (``knotsift curve --core``), end to end.

Prints, all measured in this one run on this machine:

1. an open chain of 720 beads (a T(2,5) knot of 320 beads with two tails of
   200 beads) with 100 stochastic closures, with and without ``--core``,
   median seconds (target with the core: < 5 s);
2. a ring of about 1,000 beads (a T(2,5) knot of 300 beads, two tails of 280
   beads and a straight bridge joining their far ends) with the core search
   (target < 5 s).

The knots are made from the torus knot T(2,5) with Gaussian noise of 0.1
bond lengths; inputs come from fixed seeds and are invented, for timing only.

Wall-clock and CPU seconds are both printed: on a shared machine the wall
clock grows with the load, the CPU time of this process much less.

    python bench/bench_core.py            # about a minute
    python bench/bench_core.py --compare  # also the search without scouting (minutes)
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


def median_time(fn, repeats: int) -> tuple[float, float, object]:
    """Median wall-clock and median CPU seconds of this process (the CPU time hardly moves
    when other programs share the machine; the wall clock does)."""
    times, cpu, out = [], [], None
    for _ in range(repeats):
        t0, c0 = time.perf_counter(), time.process_time()
        out = fn()
        times.append(time.perf_counter() - t0)
        cpu.append(time.process_time() - c0)
    return statistics.median(times), statistics.median(cpu), out


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


def verdict(seconds: float, r, span: tuple[int, int]) -> str:
    """Target met or missed, the type, the core found and where the knot was placed."""
    c = r.core or {}
    ok = "meets" if seconds < 5 else "MISSES"
    return (f"{ok} target < 5 s; {r.name}; core {c.get('start')}..{c.get('end')} "
            f"({c.get('beads')} beads, {c.get('evaluations')} subchains judged); knot placed "
            f"at {span[0]}..{span[1]}")


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--repeats", type=int, default=3)
    ap.add_argument("--compare", action="store_true",
                    help="also time the search without scouting (every subchain judged with "
                         "all closures), once, for the ratio (slow)")
    args = ap.parse_args()
    table = open_table()
    identify_curve(right_torus_knot(2, 3, 60), table=table)  # warm up imports and caches

    print("1. open chain, 100 stochastic closures")
    x, span = open_chain(320, 200, 7)
    t_plain, c_plain, r = median_time(lambda: identify_curve(x, closed=False, table=table),
                                      args.repeats)
    t_core, c_core, r = median_time(lambda: identify_curve(x, closed=False, localise=True,
                                                           table=table), args.repeats)
    print(f"  {len(x)} beads: without core {t_plain:.2f} s (CPU {c_plain:.2f} s), with core "
          f"{t_core:.2f} s (CPU {c_core:.2f} s) median; {verdict(t_core, r, span)}")

    if args.compare:
        import knotsift.curves.localisation as loc

        saved = loc.SCOUT_CLOSURES
        loc.SCOUT_CLOSURES = 10**9  # no scouting: the plain bisection with all closures
        try:
            t_full, c_full, r_full = median_time(
                lambda: identify_curve(x, closed=False, localise=True, table=table), 1)
        finally:
            loc.SCOUT_CLOSURES = saved
        f = r_full.core or {}
        print(f"  without scouting: {t_full:.2f} s (CPU {c_full:.2f} s), core "
              f"{f.get('start')}..{f.get('end')} ({f.get('beads')} beads); CPU ratio "
              f"{c_full / c_core:.1f}x")

    print("2. ring with the core search (arcs closed stochastically, 100 closures)")
    y, span = bridged_ring(300, 280, 8)
    t_ring, c_ring, r = median_time(lambda: identify_curve(y, closed=True, localise=True,
                                                           table=table), args.repeats)
    print(f"  {len(y)} beads: {t_ring:.2f} s (CPU {c_ring:.2f} s) median; "
          f"{verdict(t_ring, r, span)}")


if __name__ == "__main__":
    main()

"""Benchmark: identifying knots in 3D coordinates (knotsift.curves), end to end.

Prints, all measured in this one run on this machine:

1. a ring of 1,000 beads identified end to end, median seconds (target < 0.2 s);
2. a ring of 10,000 beads (target < 3 s);
3. cost against N from 250 to 4,000 with the fitted exponent (target <= about 1.5);
4. an open chain of 300 beads with 100 stochastic closures (target < 5 s);
5. the speed-up over the plain pipeline (no KMT reduction, no simplification:
   the raw projection straight to the invariants) on a crumpled ring of 400
   beads, both paths on the same input (target >= 50x).

The rings are knotted ring polymers made from the torus knot T(2,5) with
Gaussian noise (0.3 bond lengths: thermal wiggle; 2 bond lengths: crumpled),
and equilateral random polygons (bench/random_polygons.py).  Inputs are
generated from fixed seeds; the data are invented, for timing only.

    python bench/bench_curves.py            # about a minute
    python bench/bench_curves.py --polygon  # also the plain path on a random polygon (minutes)
"""

from __future__ import annotations

import argparse
import statistics
import sys
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))
sys.path.insert(0, str(Path(__file__).resolve().parent))

from random_polygons import random_polygon  # noqa: E402

from knotsift.curves import identify_curve  # noqa: E402
from knotsift.curves.contact import check_no_contact  # noqa: E402
from knotsift.curves.frame import Chain, prepare_chains  # noqa: E402
from knotsift.curves.knot_type import polygon_type  # noqa: E402
from knotsift.identification import match_fingerprint  # noqa: E402
from knotsift.table import open_table  # noqa: E402
from tests.curves.curves import moved, right_torus_knot, with_tails  # noqa: E402


def median_time(fn, repeats: int) -> tuple[float, object]:
    times, out = [], None
    for _ in range(repeats):
        t0 = time.perf_counter()
        out = fn()
        times.append(time.perf_counter() - t0)
    return statistics.median(times), out


def knotted_ring(n: int, noise: float, seed: int) -> np.ndarray:
    """T(2,5) with Gaussian noise: the first seed from ``seed`` whose ring does not touch itself."""
    from knotsift.errors import CurveError

    while True:
        x = moved(right_torus_knot(2, 5, n), np.random.default_rng(seed), noise=noise)
        try:
            check_no_contact([(prepare_chains([Chain("A", x, True)]).chains[0].coords, True)],
                             ["A"])
            return x
        except CurveError:
            seed += 1_000_003


def geometry_only(x: np.ndarray) -> int:
    """Checks, KMT reduction and one projection (what the 3D part adds to the core)."""
    from knotsift.curves.kmt import kmt_reduce
    from knotsift.curves.projection import project

    prep = prepare_chains([Chain("A", x, True)])
    y = prep.chains[0].coords
    check_no_contact([(y, True)], ["A"])
    red = kmt_reduce([(y, True)])
    project(red.chains, np.random.default_rng(0))
    return red.number_of_vertices()


def plain_identify(x: np.ndarray, table) -> str:
    """The plain path: checks, then the unreduced projection straight to the invariants."""
    prep = prepare_chains([Chain("A", x, True)])
    y = prep.chains[0].coords
    check_no_contact([(y, True)], ["A"])
    typed = polygon_type([(y, True)], np.random.default_rng([0, 0]), reduce=False,
                         simplified=False)
    status, cands = match_fingerprint(typed.fingerprint, table)
    return cands[0].label if cands else status


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--polygon", action="store_true",
                    help="also time the plain path on a 400-bead random polygon (minutes)")
    args = ap.parse_args()
    table = open_table()
    identify_curve(knotted_ring(200, 0.3, 0), table=table)  # warm up imports and caches

    print("1-2. rings end to end (identify_curve: checks, KMT, projection, invariants, table)")
    print(f"{'ring':<34}{'beads':>7}{'median_s':>10}{'after_KMT':>10}  result")
    for label, n, make, reps, target in [
        ("knotted ring, thermal noise", 1000, lambda: knotted_ring(1000, 0.3, 1), 9, 0.2),
        ("equilateral random polygon", 1000,
         lambda: random_polygon(1000, np.random.default_rng(2), sweeps=5), 5, 0.2),
        ("knotted ring, thermal noise", 10000, lambda: knotted_ring(10000, 0.3, 3), 3, 3.0),
    ]:
        x = make()
        t, r = median_time(lambda x=x: identify_curve(x, table=table), reps)
        ok = "meets" if t < target else "MISSES"
        print(f"{label:<34}{n:>7}{t:>10.3f}{r.geometry['vertices_reduced']:>10}  "
              f"{r.name or r.status}   ({ok} target < {target} s)")

    print("\n3. cost against N (knotted ring, thermal noise; median of 5)")
    ns = [250, 500, 1000, 2000, 4000]
    ts = []
    for n in ns:
        x = knotted_ring(n, 0.3, n)
        t, r = median_time(lambda x=x: identify_curve(x, table=table), 5)
        ts.append(t)
        print(f"  N = {n:>5}: {t:.4f} s  ({r.geometry['vertices_reduced']} vertices after KMT)")
    slope, _ = np.polyfit(np.log(ns), np.log(ts), 1)
    print(f"  fitted exponent: time ~ N^{slope:.2f}  (target <= about 1.5)")
    print("  geometry only (checks, KMT, projection; no invariants) on crumpled rings "
          "(noise 2 bonds), median of 3:")
    gs = []
    for n in ns:
        x = knotted_ring(n, 2.0, n)
        t, red = median_time(lambda x=x: geometry_only(x), 3)
        gs.append(t)
        print(f"  N = {n:>5}: {t:.4f} s  ({red} vertices after KMT)")
    slope, _ = np.polyfit(np.log(ns), np.log(gs), 1)
    print(f"  fitted exponent of the geometry: time ~ N^{slope:.2f}")

    print("\n4. open chain of 300 beads, 100 stochastic closures (trefoil core, tails)")
    rng = np.random.default_rng(4)
    chain, _ = with_tails(moved(right_torus_knot(2, 3, 201), rng, noise=0.1), 50, rng)
    t, r = median_time(lambda: identify_curve(chain, closed=False, n_closures=100, seed=0,
                                              table=table), 3)
    spec = ", ".join(f"{s['type']} {s['count']}" for s in r.spectrum)
    print(f"  {len(chain)} beads: {t:.3f} s median; {r.name or r.status}; closures: {spec}; "
          f"{r.geometry['closures_reused']} reused the reduced chain  (target < 5 s)")

    print("\n5. speed-up over the plain path (no KMT, no simplification), same input, N = 400")
    cases = [("crumpled knotted ring (noise 2 bonds)", knotted_ring(400, 2.0, 5))]
    if args.polygon:
        cases.append(("equilateral random polygon",
                      random_polygon(400, np.random.default_rng(0), sweeps=5)))
    for label, x in cases:
        t_fast, r = median_time(lambda x=x: identify_curve(x, table=table), 7)
        t_plain, name = median_time(lambda x=x: plain_identify(x, table),
                                     1 if args.polygon else 3)
        y = prepare_chains([Chain("A", x, True)]).chains[0].coords
        raw = polygon_type([(y, True)], np.random.default_rng([0, 0]), reduce=False,
                           simplified=False, with_fingerprint=False).crossings
        same = "same" if name == (r.name or r.status) else f"DIFFERENT ({name})"
        print(f"  {label}: reduced {t_fast:.4f} s ({r.geometry['crossings_projected']} "
              f"crossings), plain {t_plain:.3f} s ({raw} crossings): speed-up "
              f"{t_plain / t_fast:.0f}x (target >= 50x); result {r.name}, plain: {same}")


if __name__ == "__main__":
    main()

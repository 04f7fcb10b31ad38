"""Benchmark (slow, not a CI test): the unknotted fraction of equilateral random polygons.

For each N, random equilateral polygons (bench/random_polygons.py, crankshaft
moves) are identified, and the fraction that is the unknot is compared with
the law P(unknot) ~ exp(-N / N0).  Published value for equilateral random
polygons: N0 about 265 (Deguchi and Tsurusaki 1997, Phys. Rev. E 55,
"Universality of random knotting"; the value is from memory).  The fitted N0
is reported with its standard error (weighted least squares on
log P, binomial errors); polygons whose strands touch (contact) or whose
diagrams exceed the crossing limit are counted apart.

    python bench/bench_random_polygons.py [--samples 200] [--sizes 50,100,200,300,400]
"""

from __future__ import annotations

import argparse
import sys
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))
sys.path.insert(0, str(Path(__file__).resolve().parent))

from random_polygons import random_polygon  # noqa: E402

from knotsift.curves.contact import check_no_contact  # noqa: E402
from knotsift.curves.frame import Chain, prepare_chains  # noqa: E402
from knotsift.curves.kmt import kmt_reduce  # noqa: E402
from knotsift.curves.knot_type import polygon_type  # noqa: E402
from knotsift.errors import CurveError  # noqa: E402

N0_PUBLISHED = 265  # Deguchi and Tsurusaki 1997 (from memory)


def is_unknot(x: np.ndarray, rng: np.random.Generator) -> bool:
    y = prepare_chains([Chain("A", x, True)]).chains[0].coords
    check_no_contact([(y, True)], ["A"])
    if kmt_reduce([(y, True)]).number_of_vertices() == 3:
        return True  # a triangle: certainly the unknot
    fp = polygon_type([(y, True)], rng).fingerprint
    return fp.components == 1 and fp.jones == 1


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--samples", type=int, default=200, help="polygons per size")
    ap.add_argument("--sizes", default="50,100,200,300,400", help="comma-separated N")
    ap.add_argument("--seed", type=int, default=1)
    args = ap.parse_args()
    sizes = [int(s) for s in args.sizes.split(",")]
    rng = np.random.default_rng(args.seed)
    print(f"{'N':>5} {'samples':>8} {'unknots':>8} {'P(unknot)':>10} {'stderr':>8} "
          f"{'skipped':>8} {'seconds':>8}")
    ns, ps, ws = [], [], []
    for n in sizes:
        t0 = time.perf_counter()
        unknots = used = skipped = 0
        for _ in range(args.samples):
            x = random_polygon(n, rng, sweeps=5)
            try:
                unknots += is_unknot(x, rng)
                used += 1
            except CurveError:
                skipped += 1
        p = unknots / used
        err = np.sqrt(p * (1 - p) / used)
        print(f"{n:>5} {used:>8} {unknots:>8} {p:>10.3f} {err:>8.3f} {skipped:>8} "
              f"{time.perf_counter() - t0:>8.1f}")
        if 0 < unknots < used:
            ns.append(n)
            ps.append(p)
            ws.append(unknots * (used - unknots) / used)  # 1 / var(log p) ~ n p / (1 - p)
    if len(ns) >= 2:
        # log P = a - N / N0, weighted by the inverse variance of log P
        A = np.stack([np.ones(len(ns)), -np.asarray(ns, dtype=float)], axis=1)
        W = np.diag(ws)
        cov = np.linalg.inv(A.T @ W @ A)
        a, b = cov @ A.T @ W @ np.log(ps)
        n0 = 1 / b
        n0_err = np.sqrt(cov[1, 1]) / b ** 2
        print(f"\nfit P(unknot) = exp({a:.3f} - N / N0): N0 = {n0:.0f} +- {n0_err:.0f} "
              f"(published, equilateral random polygons: about {N0_PUBLISHED}, from memory)")


if __name__ == "__main__":
    main()

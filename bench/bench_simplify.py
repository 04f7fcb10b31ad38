"""Benchmark (slow, not a CI test): crossings of random polygons before and after simplification.

Seeded equilateral random polygons (bench/random_polygons.py) are reduced
(KMT) and projected; the diagram is then simplified four ways, side by side
on the same diagram:

* ``before``: the simplification as it was (one move at a time, each move
  building and validating a whole new diagram);
* ``effort 0``: the same moves (nugatory crossings, Reidemeister II) on the
  mutable working code, validated once;
* ``effort 1`` (the default): also strand rerouting and R3 moves that open
  reductions;
* ``effort 3``: also two rounds of the seeded randomised search.

It also counts self-contact errors and near approaches (segments closer than
1e-4 bond lengths, an error before and a warning now), and the connected-sum
factors that the effort-1 diagram displays (knotsift.decomposition).

The lower bound is the span of the Jones polynomial (a knot's crossing
number is at least the span, Kauffman 1987, Murasugi 1987, Thistlethwaite
1987; from memory), computed only for diagrams of at most ``--jones-max``
crossings.  Run it with memory capped, e.g.

    prlimit --as=6000000000 -- python bench/bench_simplify.py [--frames 10] [--sizes 300,1000,2000]
"""

from __future__ import annotations

import argparse
import statistics
import sys
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parent))

from knotsift.curves.contact import check_no_contact  # noqa: E402
from knotsift.curves.frame import Chain, prepare_chains  # noqa: E402
from knotsift.curves.kmt import kmt_reduce  # noqa: E402
from knotsift.curves.projection import project  # noqa: E402
from knotsift.decomposition import connected_sum_factors  # noqa: E402
from knotsift.diagram import Diagram  # noqa: E402
from knotsift.errors import CurveError  # noqa: E402
from knotsift.simplify import remove_bigon, remove_nugatory, simplify  # noqa: E402
from random_polygons import random_polygon  # noqa: E402


def simplify_as_before(diagram: Diagram) -> Diagram:
    """The earlier simplification: one move at a time on validated diagrams."""
    current = diagram
    while True:
        nxt = remove_nugatory(current)
        if nxt is None:
            nxt = remove_bigon(current)
        if nxt is None:
            break
        current = nxt
    if current.number_of_crossings() == 0:
        return Diagram([], current.free_loops)
    return current.standard_labels()


def timed(f, *args, **kw):
    t = time.perf_counter()
    out = f(*args, **kw)
    return out, time.perf_counter() - t


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--frames", type=int, default=10, help="polygons per size")
    ap.add_argument("--sizes", default="300,1000,2000", help="comma-separated N")
    ap.add_argument("--seed", type=int, default=2026, help="seed of the polygons")
    ap.add_argument("--directions", type=int, default=1, help="projection directions tried")
    ap.add_argument("--jones-max", type=int, default=40,
                    help="compute the Jones span bound up to this many crossings")
    ap.add_argument("--memory-gb", type=float, default=6.0,
                    help="address-space cap of this process (Jones can grow fast)")
    args = ap.parse_args()
    try:
        import resource

        cap = int(args.memory_gb * 1e9)
        soft, hard = resource.getrlimit(resource.RLIMIT_AS)
        if soft == resource.RLIM_INFINITY or soft > cap:
            resource.setrlimit(resource.RLIMIT_AS, (cap, hard))
    except (ImportError, ValueError, OSError):  # not on this platform: use prlimit
        pass
    from knotsift.invariants.jones import jones_polynomial

    print(f"{'N':>6} {'projected':>9} {'before':>7} {'eff0':>6} {'eff1':>6} {'eff3':>6} "
          f"{'bound':>6} {'t_before':>9} {'t_eff0':>8} {'t_eff1':>8} {'t_eff3':>8}   (medians; "
          "times in s per frame)")
    for n in (int(v) for v in args.sizes.split(",")):
        rng = np.random.default_rng([args.seed, n])
        rows = []
        same = True
        contact_errors = near_frames = 0
        for k in range(args.frames):
            x = random_polygon(n, rng)
            y = prepare_chains([Chain("A", x, True)]).chains[0].coords
            try:
                near_frames += bool(check_no_contact([(y, True)], ["A"]))
            except CurveError:
                contact_errors += 1
                continue
            red = kmt_reduce([(y, True)]).chains
            d = project(red, np.random.default_rng([args.seed, n, k]),
                        directions=args.directions).diagram
            old, t_old = timed(simplify_as_before, d)
            e0, t0 = timed(simplify, d, effort=0)
            e1, t1 = timed(simplify, d, effort=1)
            e3, t3 = timed(simplify, d, effort=3, seed=k)
            factors, t_f = timed(connected_sum_factors, e1)
            same &= old.number_of_crossings() == e0.number_of_crossings()
            bound = None
            if e3.number_of_crossings() <= args.jones_max:
                v = jones_polynomial(e3)
                if e3.number_of_crossings() <= args.jones_max // 2:
                    same &= v == jones_polynomial(old) == jones_polynomial(e1)
                bound = int(v.span()) if e3.is_knot() else None
            rows.append((d.number_of_crossings(), old.number_of_crossings(),
                         e0.number_of_crossings(), e1.number_of_crossings(),
                         e3.number_of_crossings(), bound, t_old, t0, t1, t3,
                         len(factors), t_f))
        med = [statistics.median(r[c] for r in rows) for c in range(5)]
        bounds = [r[5] for r in rows if r[5] is not None]
        times = [statistics.median(r[c] for r in rows) for c in range(6, 10)]
        b = f"{statistics.median(bounds):6.0f}" if bounds else f"{'-':>6}"
        print(f"{n:6d} {med[0]:9.0f} {med[1]:7.0f} {med[2]:6.0f} {med[3]:6.0f} {med[4]:6.0f} {b} "
              f"{times[0]:9.3f} {times[1]:8.3f} {times[2]:8.3f} {times[3]:8.3f}"
              f"   bound on {len(bounds)}/{len(rows)}; effort-0 counts and Jones agree: {same}")
        print(f"{'':6} self-contact errors: {contact_errors}/{args.frames}; frames with a near "
              f"approach under 1e-4 (an error before, a warning now): {near_frames}/{args.frames}")
        nf = [r[10] for r in rows]
        tf = statistics.median(r[11] for r in rows)
        print(f"{'':6} factors displayed after effort 1: median {statistics.median(nf):.0f}, "
              f"max {max(nf)}; time {tf:.3f} s")
        gaps = [r[4] - r[5] for r in rows if r[5] is not None]
        if gaps:
            print(f"{'':6} effort 3 above the bound: median {statistics.median(gaps):.0f}, "
                  f"max {max(gaps)}, at the bound on {sum(g == 0 for g in gaps)}/{len(gaps)}")


if __name__ == "__main__":
    main()

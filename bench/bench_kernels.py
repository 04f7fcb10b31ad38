"""Benchmark: the Kauffman-bracket kernels against their previous versions, in one run.

The speed set is seeded: simplified diagrams of random equilateral polygons of
300 and 1,000 beads (the 3D path: KMT reduction, projection, simplification)
and closures of random braids of 40-120 crossings.  For each kind it prints
the CPU seconds of the crossing-order search and of the bracket contraction,
previous (bench/legacy_bracket.py) and current, and checks that the orders and
brackets are identical.

    python bench/bench_kernels.py
"""

from __future__ import annotations

import random
import sys
import time
from collections import defaultdict
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

import numpy as np  # noqa: E402
from knotsift.curves.kmt import kmt_reduce  # noqa: E402
from knotsift.curves.projection import curve_diagram  # noqa: E402
from knotsift.invariants.bracket import contraction_order, contraction_width, kauffman_bracket  # noqa: E402,E501
from knotsift.simplify import simplify  # noqa: E402

from bench import legacy_bracket as legacy  # noqa: E402
from bench.random_polygons import random_polygon  # noqa: E402
from tests.strategies import braid_closure, random_knot_braid  # noqa: E402


def speed_set(seed: int = 5) -> list[tuple[str, object]]:
    """(kind, diagram) pairs: simplified random polygons and random braid closures."""
    rng = np.random.default_rng(seed)
    out = []
    for beads, count in ((300, 12), (1000, 16)):
        for _ in range(count):
            x = kmt_reduce([(random_polygon(beads, rng), True)]).chains[0][0]
            d = simplify(curve_diagram([(x, True)], seed=rng))
            if d.number_of_crossings() >= 3:
                out.append((f"polygon {beads}", d))
    r = random.Random(7)
    for n, strands in ((40, 5), (80, 6), (80, 10), (120, 8)):
        for _ in range(4):
            out.append((f"braid {n}x{strands}", braid_closure(random_knot_braid(r, strands, n),
                                                              strands)))
    return out


def cpu(fn, *args):
    t0 = time.process_time()
    value = fn(*args)
    return value, time.process_time() - t0


def main() -> None:
    rows = defaultdict(lambda: [0, 0.0, 0.0, 0.0, 0.0, 0, 0])
    for kind, d in speed_set():
        old_order, t_old_order = cpu(legacy.contraction_order, d)
        new_order, t_new_order = cpu(contraction_order, d)
        if old_order != new_order:
            raise SystemExit(f"{kind}: the crossing orders differ")
        old_b, t_old_b = cpu(legacy.kauffman_bracket, d, old_order)
        new_b, t_new_b = cpu(kauffman_bracket, d, new_order)
        if old_b != new_b:
            raise SystemExit(f"{kind}: the brackets differ")
        r = rows[kind]
        r[0] += 1
        r[1] += t_old_order
        r[2] += t_new_order
        r[3] += t_old_b
        r[4] += t_new_b
        r[5] = max(r[5], d.number_of_crossings())
        r[6] = max(r[6], contraction_width(d, new_order))
    print("identical orders and brackets on every diagram; CPU seconds summed per kind")
    print(f"{'kind':16s} {'n':>3s} {'max x':>5s} {'width':>5s}  {'order old':>9s} {'new':>7s} "
          f"{'ratio':>6s}  {'bracket old':>11s} {'new':>7s} {'ratio':>6s}  {'Jones ratio':>11s}")
    tot = [0.0] * 4
    for kind, (m, oo, no, ob, nb, size, width) in rows.items():
        tot = [tot[0] + oo, tot[1] + no, tot[2] + ob, tot[3] + nb]
        print(f"{kind:16s} {m:3d} {size:5d} {width:5d}  {oo:9.3f} {no:7.3f} {oo / no:5.1f}x  "
              f"{ob:11.3f} {nb:7.3f} {ob / nb:5.1f}x  {(oo + ob) / (no + nb):10.1f}x")
    print(f"{'all':16s} {'':3s} {'':5s} {'':5s}  {tot[0]:9.3f} {tot[1]:7.3f} "
          f"{tot[0] / tot[1]:5.1f}x  {tot[2]:11.3f} {tot[3]:7.3f} {tot[2] / tot[3]:5.1f}x  "
          f"{(tot[0] + tot[2]) / (tot[1] + tot[3]):10.1f}x")


if __name__ == "__main__":
    main()

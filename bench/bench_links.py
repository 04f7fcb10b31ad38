"""Benchmark: frames of several rings identified as one link, and the link table build.

Prints, all measured in this one run on this machine:

1. a frame of 3 rings of 1,000 beads each (the Borromean rings as three
   perpendicular ellipses, with noise), identified as a link end to end:
   median seconds (target < 1 s);
2. the same for a 3-ring chain (two linked pairs) and for a 6-noded catenane
   plus a free ring;
3. the share of that time spent on the whole-link step (the link fingerprint
   and the two-ring sublinks) against the rings typed one by one;
4. with ``--build``: the link part of the table build, with its name-free
   enumerator (target < 5 minutes).

The rings are generated from fixed seeds; the data are invented, for timing only.

    python bench/bench_links.py            # about a minute
    python bench/bench_links.py --build    # also the link table build (minutes)
"""

from __future__ import annotations

import argparse
import statistics
import sys
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from knotsift.curves.frame import Chain, Frame  # noqa: E402
from knotsift.curves.pipeline import identify_frame  # noqa: E402
from knotsift.table import open_table  # noqa: E402


def borromean(n: int, rng) -> list[np.ndarray]:
    s = np.linspace(0, 2 * np.pi, n, endpoint=False)
    c, d, z = 2 * np.cos(s), np.sin(s), np.zeros(n)
    rings = [np.stack([c, d, z], 1), np.stack([z, c, d], 1), np.stack([d, z, c], 1)]
    return [x + rng.normal(scale=0.002, size=x.shape) for x in rings]


def chain3(n: int, rng) -> list[np.ndarray]:
    s = np.linspace(0, 2 * np.pi, n, endpoint=False)
    a = np.stack([0.8 * np.cos(s), 0.8 * np.sin(s), 0 * s], 1)
    b = np.stack([1 + np.cos(s), 0 * s, np.sin(s)], 1)
    c = np.stack([2 + 0.8 * np.cos(s), 0.8 * np.sin(s), 0 * s], 1)
    return [x + rng.normal(scale=0.002, size=x.shape) for x in (a, b, c)]


def catenane_and_ring(n: int, rng) -> list[np.ndarray]:
    s = np.linspace(0, 2 * np.pi, n, endpoint=False)
    out = []
    for k in range(2):
        th = 3 * s + k * np.pi
        rho = 2 + np.cos(th)
        out.append(np.stack([rho * np.cos(s), rho * np.sin(s), np.sin(th)], 1))
    out.append(np.stack([np.cos(s) + 20, np.sin(s), 0 * s], 1))
    return [x + rng.normal(scale=0.002, size=x.shape) for x in out]


def timed(rings, table, repeats: int, linking: bool = True) -> tuple[float, object]:
    frame = Frame("bench", 0, [Chain(chr(65 + k), x, True) for k, x in enumerate(rings)])
    times, result = [], None
    for _ in range(repeats):
        t = time.perf_counter()
        result = identify_frame(frame, table=table, linking=linking)
        times.append(time.perf_counter() - t)
    return statistics.median(times), result


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--repeats", type=int, default=7)
    ap.add_argument("--build", action="store_true", help="also time the link table build")
    args = ap.parse_args()
    table = open_table()
    rng = np.random.default_rng(7)
    timed(borromean(200, rng), table, 1)  # warm-up: imports, table
    for name, make in (("Borromean rings", borromean), ("3-ring chain", chain3),
                       ("6-noded catenane + free ring", catenane_and_ring)):
        rings = make(1000, rng)
        whole, r = timed(rings, table, args.repeats)
        alone, _ = timed(rings, table, args.repeats, linking=False)
        print(f"{name}: 3 rings x 1000 beads identified as one link, median {whole:.3f} s "
              f"over {args.repeats} (target < 1 s); rings typed alone {alone:.3f} s, whole-link "
              f"step {whole - alone:.3f} s; result {r.link['type']}")
    if args.build:
        from knotsift.data_build.build import construct
        from knotsift.data_build.links import build_links
        from knotsift.data_build.sources import read_sources, reference_dir
        from knotsift.simplify import simplify

        src = read_sources()
        knots = {}
        for e in src.primes:
            if e.crossing_number <= 6:
                d = simplify(construct(e)[0])
                knots[e.name] = (d, e.name in src.amphichiral, e.crossing_number)
        t = time.perf_counter()
        b = build_links(knots, reference_dir(), 8)
        print(f"link table build with the enumerator: {time.perf_counter() - t:.1f} s "
              f"(target < 300 s); {len(b.links)} links, {len(b.form_rows)} forms, "
              f"problems: {len(b.problems)}")


if __name__ == "__main__":
    main()

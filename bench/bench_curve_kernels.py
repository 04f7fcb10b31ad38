"""Benchmark: the numpy and the compiled kernels of the 3D curve path, side by side in one run.

For random equilateral rings (bench/random_polygons.py, seeded) of 200, 1,000
and 5,000 beads, each frame is put through the per-frame geometry twice, once
with ``KNOTSIFT_NO_COMPILED=1`` (numpy) and once with ``KNOTSIFT_COMPILED=1``: the self-contact
check, the KMT reduction, the projection (3 directions), and the whole frame
(``identify_curve``, which adds simplification and the invariants).  It prints
the median CPU milliseconds of each stage, their ratio, and checks that the
outputs are identical (kept vertices, contact pairs and distances, crossings,
signs and PD code, the identified name).

    python bench/bench_curve_kernels.py [--frames N] [--sizes 200,1000,5000]

The compiled kernels are loaded (or compiled) before timing; what a fresh
process pays for that is printed first.
"""

from __future__ import annotations

import argparse
import os
import statistics
import subprocess
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

import numpy as np  # noqa: E402

from bench.random_polygons import random_polygon  # noqa: E402

SWITCH = "KNOTSIFT_NO_COMPILED"
FORCE = "KNOTSIFT_COMPILED"

_FRESH = """
import time
t0 = time.process_time()
import numba  # noqa: F401
t1 = time.process_time()
from knotsift.curves.segments import compiled_geometry
compiled_geometry()  # imports the kernels and calls each once (cached machine code)
t2 = time.process_time()
print(f"{t1 - t0:.3f} {t2 - t1:.3f}")
"""


def fresh_process_cost() -> tuple[float, float]:
    """CPU seconds of ``import numba`` and of loading the cached kernels, in a new process."""
    env = {k: v for k, v in os.environ.items() if k not in (SWITCH, "PYTHONDONTWRITEBYTECODE")}
    env[FORCE] = "1"
    out = subprocess.run([sys.executable, "-c", _FRESH], capture_output=True, text=True,
                         env=env, check=True).stdout.split()
    return float(out[0]), float(out[1])


def run_stages(x: np.ndarray, k: int, table, compiled: bool) -> tuple[dict, dict]:
    """CPU seconds of each stage for one frame, and the outputs to compare."""
    from knotsift.curves.contact import check_no_contact, closest_contacts, segment_set
    from knotsift.curves.frame import Chain, prepare_chains
    from knotsift.curves.kmt import KMT_TOL, kmt_reduce
    from knotsift.curves.pipeline import identify_curve
    from knotsift.curves.projection import PROJECTION_TOL, project

    os.environ[SWITCH if not compiled else FORCE] = "1"
    try:
        clock = time.process_time
        prep = prepare_chains([Chain("A", x, True)])
        y = prep.chains[0].coords
        t0 = clock()
        check_no_contact([(y, True)], ["A"], prep.kept)
        t1 = clock()
        red = kmt_reduce([(y, True)], tol=KMT_TOL)
        t2 = clock()
        proj = project(red.chains, np.random.default_rng([k, 0]), tol=PROJECTION_TOL,
                       directions=3)
        t3 = clock()
        result = identify_curve(x, seed=k, table=table, source="bench")
        t4 = clock()
        contacts = closest_contacts(segment_set([(y, True)]), 0.5)
    finally:
        os.environ.pop(SWITCH, None)
        os.environ.pop(FORCE, None)
    times = {"contact": t1 - t0, "kmt": t2 - t1, "projection": t3 - t2, "frame": t4 - t3}
    outputs = {"kept": red.kept[0].tolist(), "contacts": [a.tolist() for a in contacts],
               "crossings": proj.crossings.tolist(), "signs": proj.signs.tolist(),
               "pd": proj.diagram.pd_code(), "status": result.status,
               "names": [c.name for c in result.candidates]}
    return times, outputs


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--frames", type=int, default=20, help="frames per size (default 20)")
    ap.add_argument("--sizes", default="200,1000,5000",
                    help="comma-separated ring sizes in beads (default 200,1000,5000)")
    args = ap.parse_args(argv)
    from knotsift.curves.segments import compiled_geometry
    from knotsift.table import open_table

    os.environ[FORCE] = "1"
    if compiled_geometry() is None:
        print("numba is not available: nothing to compare")
        return 1
    t0 = time.process_time()
    run_stages(random_polygon(60, np.random.default_rng(0)), 0, open_table(), True)
    print(f"warm-up in this process (load or compile): {time.process_time() - t0:.2f} CPU s")
    imp, first = fresh_process_cost()
    print(f"fresh process: import numba {imp:.2f} CPU s, then loading the cached kernels "
          f"{first:.2f} CPU s")
    table = open_table()
    stages = ("contact", "kmt", "projection", "frame")
    print(f"\n{'beads':>6} {'stage':>11} {'numpy ms':>9} {'compiled ms':>12} {'ratio':>6}")
    mismatches = 0
    for n in [int(s) for s in args.sizes.split(",")]:
        rows = {s: ([], []) for s in stages}
        for k in range(args.frames):
            x = random_polygon(n, np.random.default_rng([1, n, k]), sweeps=10)
            t_np, out_np = run_stages(x, k, table, False)
            t_c, out_c = run_stages(x, k, table, True)
            for s in stages:
                rows[s][0].append(t_np[s])
                rows[s][1].append(t_c[s])
            if out_np != out_c:
                mismatches += 1
                print(f"  MISMATCH at {n} beads, frame {k}: "
                      + ", ".join(key for key in out_np if out_np[key] != out_c[key]))
        for s in stages:
            a = 1000 * statistics.median(rows[s][0])
            b = 1000 * statistics.median(rows[s][1])
            print(f"{n:>6} {s:>11} {a:>9.2f} {b:>12.2f} {a / max(b, 1e-9):>6.1f}")
    print(f"\noutputs identical on every frame: {'yes' if mismatches == 0 else 'NO'}")
    return 1 if mismatches else 0


if __name__ == "__main__":
    sys.exit(main())

"""Bulk classification: frames per second on 1 and 2 workers, memory on a long run, Dask overhead.

Run from the repository root::

    python3 bench/bench_bulk.py                 # the full figures (about 10 minutes on 2 cores)
    python3 bench/bench_bulk.py --frames 1000 --long 10000   # a quick look

What is measured, all in one run on this machine:

1. ``--frames`` ring frames of 200 beads (closed Gaussian random walks, the
   mean step subtracted so each closes; deterministic seed), one XYZ file,
   classified into SQLite by ``knotsift.bulk.classify`` with 1 worker (in
   this process) and with 2 worker processes: frames per second and their
   ratio.
2. Peak resident memory of a ``knotsift classify`` process over ``--long``
   items, in a subprocess of its own: the parent's peak (VmHWM) and an
   upper bound on the largest worker's (ru_maxrss of the children).  The
   item is a cheap one (a one-crossing braid word, the unknot) so that
   100,000 items take minutes; what grows with the input, if anything, is
   the streaming, the chunk writes and the done-set, which are the same for
   every item type.
3. The Dask path (a ``LocalCluster`` of 2 worker processes, started inside
   the timing) against 2 local processes on the first ``--dask-frames``
   frames.
"""

from __future__ import annotations

import argparse
import json
import os
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

REPO = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(REPO))


def random_walk_rings(n_frames: int, beads: int, seed: int):
    """Closed Gaussian random walks: steps N(0, 1) minus their mean, so the walk returns."""
    rng = np.random.default_rng(seed)
    for _ in range(n_frames):
        steps = rng.normal(size=(beads, 3))
        steps -= steps.mean(axis=0)
        yield np.cumsum(steps, axis=0)


def write_rings(path: Path, n_frames: int, beads: int = 200, seed: int = 20261201) -> Path:
    with open(path, "w") as fh:
        for k, x in enumerate(random_walk_rings(n_frames, beads, seed)):
            fh.write(f"{beads}\nring {k}\n")
            fh.write("".join(f"C {a:.6f} {b:.6f} {c:.6f}\n" for a, b, c in x))
    return path


def _cpu() -> float:
    """CPU seconds of this process and of its waited-for children (the workers)."""
    import resource

    me = resource.getrusage(resource.RUSAGE_SELF)
    kids = resource.getrusage(resource.RUSAGE_CHILDREN)
    return me.ru_utime + me.ru_stime + kids.ru_utime + kids.ru_stime


def timed_run(src: Path, out: Path, **kw) -> tuple[float, object]:
    """Wall time and report of one run; report.cores is the CPU time it got per wall second
    (below the worker count when other processes share the machine)."""
    from knotsift.bulk.runner import classify

    start, cpu = time.perf_counter(), _cpu()
    report = classify([src], out, progress=False, **kw)
    wall = time.perf_counter() - start
    report.cores = (_cpu() - cpu) / wall
    return wall, report


# The parent's peak is VmHWM of its own address space: ru_maxrss would also count the
# forked image of the process that started it (Linux keeps the maximum across exec).
# The workers' figure is ru_maxrss of the waited-for children: an upper bound.
_MEMORY_PROBE = """
import json, resource, sys
from knotsift.cli import main
code = main(sys.argv[1:])
hwm = next(int(line.split()[1]) for line in open("/proc/self/status")
           if line.startswith("VmHWM"))
kids = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss
print(json.dumps({"exit": code, "parent_kib": hwm, "largest_worker_kib": kids}))
"""


def memory_run(tmp: Path, n_items: int, workers: int) -> dict:
    src = tmp / f"long{n_items}.txt"
    with open(src, "w") as fh:
        for _ in range(n_items):
            fh.write("braid: s1\n")
    out = tmp / f"long{n_items}.sqlite"
    env = dict(os.environ, PYTHONPATH=str(REPO))
    start = time.perf_counter()
    proc = subprocess.run([sys.executable, "-c", _MEMORY_PROBE, "classify", str(src), "--out",
                           str(out), "--workers", str(workers), "--quiet", "--json"],
                          capture_output=True, text=True, env=env, check=False)
    elapsed = time.perf_counter() - start
    lines = proc.stdout.strip().splitlines()
    probe = json.loads(lines[-1])
    report = json.loads("\n".join(lines[:-1]))
    probe.update(seconds=elapsed, written=report["written"], failed=report["failed"])
    return probe


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--frames", type=int, default=10_000, help="ring frames (default 10000)")
    ap.add_argument("--long", type=int, default=100_000,
                    help="items of the memory run (default 100000)")
    ap.add_argument("--dask-frames", type=int, default=2_000,
                    help="frames of the Dask comparison (default 2000)")
    ap.add_argument("--chunk", type=int, default=200, help="chunk size (default 200)")
    args = ap.parse_args()

    from knotsift.bulk.summary import knot_spectrum, read_results

    print(f"{os.cpu_count()} cores; load average before: "
          f"{', '.join(f'{x:.2f}' for x in os.getloadavg())} (other processes skew the ratios)")
    with tempfile.TemporaryDirectory(prefix="bench-bulk-") as d:
        tmp = Path(d)
        t0 = time.perf_counter()
        src = write_rings(tmp / "rings.xyz", args.frames)
        print(f"wrote {args.frames} ring frames of 200 beads ({src.stat().st_size / 1e6:.0f} MB "
              f"XYZ) in {time.perf_counter() - t0:.1f}s")

        t1, r1 = timed_run(src, tmp / "w1.sqlite", workers=1, chunk=args.chunk)
        t2, r2 = timed_run(src, tmp / "w2.sqlite", workers=2, chunk=args.chunk)
        rate1, rate2 = r1.written / t1, r2.written / t2
        print(f"1 worker  : {r1.written} rows in {t1:7.1f}s  {rate1:7.1f} frames/s "
              f"({r1.failed} failed; {r1.cores:.2f} cores obtained)")
        print(f"2 workers : {r2.written} rows in {t2:7.1f}s  {rate2:7.1f} frames/s "
              f"({r2.failed} failed; {r2.cores:.2f} cores obtained)")
        print(f"ratio 2/1 workers: {rate2 / rate1:.2f}x (target >= 1.7x); per CPU second "
              f"obtained: {(rate2 / r2.cores) / (rate1 / r1.cores):.2f} of the 1-worker "
              "throughput (1.00 = no parallel overhead)")
        spec = knot_spectrum(read_results(tmp / "w1.sqlite"), mirrors="merge")
        top = ", ".join(f"{r.type} {r.fraction:.1%}" for r in
                        spec.sort_values("count", ascending=False).head(5).itertuples())
        print(f"spectrum of the rings: {top}")

        n = min(args.dask_frames, args.frames)
        small = tmp / "small.xyz"
        write_rings(small, n)
        tp, rp = timed_run(small, tmp / "p.sqlite", workers=2, chunk=args.chunk)
        td, rd = timed_run(small, tmp / "d.sqlite", workers=2, dask="local", chunk=args.chunk)
        print(f"{n} frames, 2 local processes : {tp:6.1f}s  ({rp.written / tp:.1f} frames/s)")
        print(f"{n} frames, Dask LocalCluster(2): {td:6.1f}s  ({rd.written / td:.1f} frames/s), "
              f"overhead {td / tp - 1:+.0%} (cluster start-up included)")

        m = memory_run(tmp, args.long, workers=2)
        print(f"memory, {m['written']} one-crossing braid items on 2 workers in "
              f"{m['seconds']:.0f}s: parent peak RSS {m['parent_kib'] / 1024:.0f} MB, "
              f"largest worker {m['largest_worker_kib'] / 1024:.0f} MB (target < 500 MB)")
        m2 = memory_run(tmp, max(1, args.long // 10), workers=2)
        print(f"memory, {m2['written']} items: parent peak RSS {m2['parent_kib'] / 1024:.0f} "
              f"MB (flat if close to the figure above)")
    print(f"load average after: {', '.join(f'{x:.2f}' for x in os.getloadavg())}")


if __name__ == "__main__":
    main()

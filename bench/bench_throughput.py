"""Benchmark (slow, not a CI test): CPU and wall time per ring frame, new path against old.

Random equilateral rings of 200 and 1,000 beads (bench/random_polygons.py,
seeded) go through ``identify_curve`` in worker processes, the current
knotsift (with the compiled 3D kernels loaded before the first frame, as
``classify`` does, and again with ``KNOTSIFT_NO_COMPILED=1``) and (with
``--old DIR``, see bench/bench_long_chains.py) an older one, alternating by
size in one run, since the machine is shared and noisy.
It prints the CPU and wall seconds per frame (median and mean), the ratio
old / new, and the projected wall time of a million 1,000-bead frames on 2
cores and on 64 Dask workers (mean wall per frame x 10^6 / workers, assuming
perfect scaling: a lower bound).  It also times ``knotsift identify "DT: 4 6
2"`` as a whole process (median of 7 runs, after one warm-up run that also
writes the bytecode); ``--startup-only`` times only that.

    python bench/bench_throughput.py [--frames 60] [--old DIR] [--startup-only]
"""

from __future__ import annotations

import argparse
import os
import statistics
import subprocess
import sys
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))

from bench_long_chains import run_worker  # noqa: E402


def _summary(rows: list[dict]) -> dict:
    ok = [r for r in rows if r.get("cpu") == r.get("cpu")]
    cpu = [r["cpu"] for r in ok]
    wall = [r["wall"] for r in ok]
    return {"frames": len(rows), "cpu_median": statistics.median(cpu),
            "cpu_mean": statistics.fmean(cpu), "wall_median": statistics.median(wall),
            "wall_mean": statistics.fmean(wall), "capped": len(rows) - len(ok) + sum(
                r.get("status") in ("capped", "out of memory", "worker died") for r in ok)}


def _startup(old: str | None) -> float:
    env = dict(os.environ)
    if old:
        env["PYTHONPATH"] = old + os.pathsep + env.get("PYTHONPATH", "")
    env.pop("PYTHONDONTWRITEBYTECODE", None)  # an installed package has its bytecode
    subprocess.run([sys.executable, "-m", "knotsift", "identify", "DT: 4 6 2"], env=env,
                   capture_output=True, check=True)
    times = []
    for _ in range(7):
        t = time.perf_counter()
        subprocess.run([sys.executable, "-m", "knotsift", "identify", "DT: 4 6 2"], env=env,
                       capture_output=True, check=True)
        times.append(time.perf_counter() - t)
    return statistics.median(times)


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--frames", type=int, default=60, help="frames per size and path")
    ap.add_argument("--seed", type=int, default=1)
    ap.add_argument("--old", metavar="DIR", help="folder holding an older knotsift package")
    ap.add_argument("--old-seconds", type=float, default=60.0, help="cap per old frame")
    ap.add_argument("--startup-only", action="store_true",
                    help="time only the start-up of 'knotsift identify' (new and old in turn)")
    args = ap.parse_args(argv)
    if args.startup_only:
        for _ in range(3):
            print(f"knotsift identify 'DT: 4 6 2' as a process: {_startup(None):.3f} s wall "
                  "median" + (f" (old {_startup(args.old):.3f} s)" if args.old else ""),
                  flush=True)
        return 0
    for n in (200, 1000):
        new = _summary(run_worker(n, args.frames, args.seed, None, None, None)[0])
        plain = _summary(run_worker(n, args.frames, args.seed, None, None, None,
                                    env_extra={"KNOTSIFT_NO_COMPILED": "1"})[0])
        line = (f"N={n:>5} new: cpu median {new['cpu_median']:.3f} s, mean "
                f"{new['cpu_mean']:.3f} s; wall median {new['wall_median']:.3f} s, mean "
                f"{new['wall_mean']:.3f} s | new without numba: cpu median "
                f"{plain['cpu_median']:.3f} s, mean {plain['cpu_mean']:.3f} s")
        if args.old:
            old = _summary(run_worker(n, args.frames, args.seed, args.old, args.old_seconds,
                                      5_000_000_000)[0])
            line += (f" | old: cpu median {old['cpu_median']:.3f} s, mean "
                     f"{old['cpu_mean']:.3f} s ({old['capped']} capped or failed) | old/new "
                     f"cpu mean {old['cpu_mean'] / new['cpu_mean']:.2f}x")
        print(line, flush=True)
        if n == 1000:
            for workers in (2, 64):
                hours = new["wall_mean"] * 1e6 / workers / 3600
                print(f"  a million {n}-bead frames on {workers} workers: about {hours:.1f} h "
                      "(perfect scaling assumed)")
    print(f"knotsift identify 'DT: 4 6 2' as a process: {_startup(None):.3f} s wall median"
          + (f" (old {_startup(args.old):.3f} s)" if args.old else ""))
    return 0


if __name__ == "__main__":
    sys.exit(main())

"""Benchmark (slow, not a CI test): long random rings, status by status, time and memory.

Random equilateral polygons (bench/random_polygons.py, crankshaft moves,
seeded) of N = 300, 1,000, 2,000, 5,000 and 10,000 beads are identified as
rings, each N in a worker process of its own, so that the worker's peak
memory (maximum resident set) is measured.  For each N it prints:

* the fraction of frames by status, and of frames with a definite answer
  (a table name, a sum of table knots, or a type key with bounds);
* the simplified crossings against the crossing-number lower bound (medians);
* the time per frame: p50, p99, max (wall and CPU);
* the peak memory of the worker.

``--no-contact-check`` skips the self-contact check in the workers: random
polygons are phantom chains, and near approaches taken for self-contacts
would otherwise end many long frames as errors before any invariant.

With ``--old DIR`` the same frames also go through an older knotsift (the
package folder under DIR, made e.g. with ``git archive <commit> identify | tar
-x -C DIR`` and ``ln -s identify DIR/knotsift``), side by side in the same run,
capped (``--old-max-n``, ``--old-seconds`` per frame, 5 GB per worker) since it
could take minutes and tens of gigabytes per frame.

    python bench/bench_long_chains.py [--sizes 300,1000,2000,5000,10000]
        [--frames 20,20,10,5,3] [--old DIR]
"""

from __future__ import annotations

import argparse
import json
import os
import resource
import statistics
import subprocess
import sys
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent


def _sweeps(n: int) -> int:
    """Crankshaft sweeps per polygon: 10 up to 2,000 beads, 3 above (generation time)."""
    return 10 if n <= 2000 else 3


def worker(n: int, frames: int, seed: int, seconds_cap: float | None,
           contact_check: bool = True) -> None:
    """Identify ``frames`` random rings of ``n`` beads; print one JSON line per frame."""
    import signal

    import numpy as np

    sys.path.insert(0, str(HERE))
    from random_polygons import random_polygon

    from knotsift.curves import identify_curve
    from knotsift.errors import KnotsiftError
    from knotsift.table import open_table

    table = open_table()
    try:  # the compiled 3D kernels, as a long run has them (not in older versions)
        from knotsift.curves.segments import preload_compiled

        preload_compiled()
    except ImportError:
        pass
    if not contact_check:  # phantom polygons: measure the invariant path past near approaches
        import knotsift.curves.pipeline as pipeline

        pipeline.check_no_contact = lambda *a, **k: []

    class Cap(Exception):
        pass

    def alarm(*_):
        raise Cap()

    signal.signal(signal.SIGALRM, alarm)
    for k in range(frames):
        x = random_polygon(n, np.random.default_rng([seed, n, k]), sweeps=_sweeps(n))
        wall, cpu = time.perf_counter(), time.process_time()
        row = {"n": n, "frame": k}
        try:
            if seconds_cap:
                signal.alarm(int(seconds_cap))
            r = identify_curve(x, seed=k, table=table, source="bench")
            signal.alarm(0)
            d = r.to_dict()
            row.update(status=d["status"], name=d["name"], type_key=d.get("type_key"),
                       bounds=d.get("crossing_bounds"), error=d.get("error"),
                       simplified=d["curve"]["geometry"].get("crossings_simplified"),
                       jones=(d.get("cost") or {}).get("jones"))
        except Cap:
            row.update(status="capped", error=f"over {seconds_cap:g} s")
        except MemoryError:
            signal.alarm(0)
            row.update(status="out of memory", error="over the worker's memory cap")
        except KnotsiftError as exc:  # e.g. a near approach taken for a self-contact
            signal.alarm(0)
            row.update(status="error", error=str(exc)[:200])
        row.update(wall=time.perf_counter() - wall, cpu=time.process_time() - cpu,
                   rss_gb=resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1e6)
        print(json.dumps(row), flush=True)


def run_worker(n: int, frames: int, seed: int, old: str | None, seconds_cap: float | None,
               memory_cap: int | None, contact_check: bool = True,
               env_extra: dict | None = None) -> tuple[list[dict], float]:
    """Run one worker process; its rows and its peak memory in GB."""
    env = dict(os.environ, **(env_extra or {}))
    if old:
        env["PYTHONPATH"] = old + os.pathsep + env.get("PYTHONPATH", "")
    cmd = [sys.executable, str(Path(__file__).resolve()), "--worker", str(n), str(frames),
           str(seed), str(seconds_cap or 0), "1" if contact_check else "0"]

    def limit():
        if memory_cap:
            resource.setrlimit(resource.RLIMIT_AS, (memory_cap, memory_cap))

    proc = subprocess.run(cmd, env=env, capture_output=True, text=True, preexec_fn=limit)
    rows = [json.loads(line) for line in proc.stdout.splitlines() if line.startswith("{")]
    if proc.returncode and len(rows) < frames:
        rows.append({"n": n, "frame": len(rows), "status": "worker died",
                     "error": proc.stderr.strip().splitlines()[-1:] or ["?"],
                     "wall": float("nan"), "cpu": float("nan")})
    return rows, max((r.get("rss_gb", 0.0) for r in rows), default=float("nan"))


def _pct(values: list[float], q: float) -> float:
    v = sorted(x for x in values if x == x)
    if not v:
        return float("nan")
    return v[min(len(v) - 1, int(round(q * (len(v) - 1))))]


def definite(row: dict) -> bool:
    """A table name, a sum of table knots, or a type key with crossing bounds."""
    if row.get("status") in ("identified", "ambiguous"):
        return True
    return bool(row.get("type_key")) and bool(row.get("bounds"))


def report(label: str, n: int, rows: list[dict], peak_gb: float) -> dict:
    total = len(rows)
    by: dict[str, int] = {}
    for r in rows:
        by[r["status"]] = by.get(r["status"], 0) + 1
    lows = [r["bounds"][0] for r in rows if r.get("bounds") and r["bounds"][0] is not None]
    simp = [r["simplified"] for r in rows if r.get("simplified") is not None]
    jones = {}
    for r in rows:
        if r.get("jones"):
            jones[r["jones"]] = jones.get(r["jones"], 0) + 1
    out = {
        "path": label, "n": n, "frames": total,
        "status": {k: round(v / total, 3) for k, v in sorted(by.items())},
        "definite": round(sum(definite(r) for r in rows) / total, 3),
        "median_simplified": statistics.median(simp) if simp else None,
        "median_lower_bound": statistics.median(lows) if lows else None,
        "wall_p50": _pct([r["wall"] for r in rows], 0.5),
        "wall_p99": _pct([r["wall"] for r in rows], 0.99),
        "wall_max": _pct([r["wall"] for r in rows], 1.0),
        "cpu_p50": _pct([r["cpu"] for r in rows], 0.5),
        "peak_gb": round(peak_gb, 3),
        "jones": jones,
    }
    print(f"{label:>4} N={n:>6} frames={total:>3} definite={out['definite']:.0%} "
          f"status={out['status']} simplified/lower={out['median_simplified']}/"
          f"{out['median_lower_bound']} wall p50/p99/max={out['wall_p50']:.2f}/"
          f"{out['wall_p99']:.2f}/{out['wall_max']:.2f} s cpu p50={out['cpu_p50']:.2f} s "
          f"peak={out['peak_gb']:.2f} GB jones={jones}", flush=True)
    return out


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--sizes", default="300,1000,2000,5000,10000")
    ap.add_argument("--frames", default="20,20,10,5,3", help="frames per size")
    ap.add_argument("--seed", type=int, default=0)
    ap.add_argument("--old", metavar="DIR", help="folder holding an older knotsift package")
    ap.add_argument("--old-max-n", type=int, default=2000, help="largest N run on the old path")
    ap.add_argument("--old-seconds", type=float, default=60.0, help="cap per old frame")
    ap.add_argument("--json", metavar="FILE", help="also write the figures as JSON")
    ap.add_argument("--no-contact-check", action="store_true",
                    help="skip the self-contact check (random polygons are phantom chains: "
                         "near approaches then do not end a frame as an error)")
    ap.add_argument("--worker", nargs=5, help=argparse.SUPPRESS)
    args = ap.parse_args(argv)
    if args.worker:
        n, frames, seed, cap, contact = args.worker
        worker(int(n), int(frames), int(seed), float(cap) or None, contact == "1")
        return 0
    sizes = [int(s) for s in args.sizes.split(",")]
    counts = [int(s) for s in args.frames.split(",")]
    counts += [counts[-1]] * (len(sizes) - len(counts))
    figures = []
    for n, frames in zip(sizes, counts):
        check = not args.no_contact_check
        rows, peak = run_worker(n, frames, args.seed, None, None, None, check)
        figures.append(report("new", n, rows, peak))
        if args.old and n <= args.old_max_n:
            rows, peak = run_worker(n, frames, args.seed, args.old, args.old_seconds,
                                    5_000_000_000, check)
            figures.append(report("old", n, rows, peak))
    if args.json:
        Path(args.json).write_text(json.dumps(figures, indent=2))
    return 0


if __name__ == "__main__":
    sys.exit(main())

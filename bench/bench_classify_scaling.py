"""Benchmark (slow, not a CI test): ``knotsift classify`` on 1 and on 2 workers, whole process.

Seeded equilateral random rings (bench/random_polygons.py) of 200 and 1,000
beads are written as one XYZ trajectory per size into a temporary folder: a
crankshaft chain burnt in for a few sweeps, then one frame every ``--moves``
further crankshaft moves, like the frames of a simulation.  Each file is
classified into SQLite by ``knotsift classify`` run as a whole process (start-up,
reading, workers, writing all included) with default options and
``--workers 1`` or ``--workers 2``, alternating, ``--repeats`` times, side by
side in one run, since the machine is shared and noisy.  For each run it
prints frames per second, and the CPU seconds of the parent process and of its
worker processes (``getrusage`` in the process itself: ``RUSAGE_SELF`` and
``RUSAGE_CHILDREN``).  The ratio is the median 2-worker rate over the median
1-worker rate.

``--cheap-ms 0,10`` adds runs whose per-item work is replaced by a busy loop
of that many CPU milliseconds (the rest of the path is real: the XYZ reader,
the pool, the rows, the SQLite writes), so that the overhead per item
outside the identification is visible: at 0 ms the rate is the ceiling of the
parent, at 10 ms it is an item as cheap as the per-frame goal of issue 16.

``--old DIR_OR_REF`` runs an older knotsift alongside (a folder holding the
package as ``knotsift``, or a git ref, which is unpacked with ``git archive``
into a temporary folder).

    python bench/bench_classify_scaling.py [--frames 500] [--sizes 200,1000]
        [--repeats 2] [--cheap-ms 0,10] [--old main]
"""

from __future__ import annotations

import argparse
import json
import os
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent
REPO = HERE.parent

#: Environment variable read by :func:`cheap_one` (CPU milliseconds per item).
CHEAP_VAR = "KNOTSIFT_BENCH_CHEAP_MS"

# Runs knotsift's command line in this process and prints the CPU time of the
# process itself and of its waited-for children (the workers) as the last line.
_PROBE = """
import json, os, resource, sys
if os.environ.get({var!r}):
    import bench_classify_scaling
    bench_classify_scaling.use_cheap_work()
from knotsift.cli import main
code = main(sys.argv[1:])
me = resource.getrusage(resource.RUSAGE_SELF)
kids = resource.getrusage(resource.RUSAGE_CHILDREN)
print(json.dumps({{"exit": code, "parent_cpu": me.ru_utime + me.ru_stime,
                  "children_cpu": kids.ru_utime + kids.ru_stime}}))
""".format(var=CHEAP_VAR)


def cheap_one(item, options):
    """Per-item work of the cheap variant: a busy loop, then rows as classify would give."""
    from knotsift.bulk.rows import error_rows

    spin = float(os.environ.get(CHEAP_VAR, "0") or 0) / 1000.0
    end = time.process_time() + spin
    while time.process_time() < end:
        pass
    rows = error_rows(item, "")
    for r in rows:
        r.update(status="not in table", error=None, seconds=spin)
    return rows


def _cheap_chunk(items, options):
    return [row for item in items for row in cheap_one(item, options)]


def use_cheap_work() -> None:
    """Replace the per-item work of knotsift.bulk (1 worker and pool) by :func:`cheap_one`."""
    import knotsift.bulk.runner as runner

    runner.classify_one = cheap_one
    runner.classify_chunk = _cheap_chunk


def write_frames(path: Path, frames: int, beads: int, seed: int, moves: int,
                 burn_sweeps: int = 3) -> Path:
    """One XYZ trajectory of ``frames`` equilateral rings, ``moves`` crankshaft moves apart."""
    import numpy as np

    sys.path.insert(0, str(HERE))
    from random_polygons import crankshaft, random_polygon

    rng = np.random.default_rng([seed, beads])
    x = random_polygon(beads, rng, sweeps=burn_sweeps)
    tmp = path.with_suffix(".part")
    with open(tmp, "w") as fh:
        for k in range(frames):
            if k:
                x = crankshaft(x, moves, rng)
            fh.write(f"{beads}\nring {k}\n")
            fh.write("".join(f"C {a:.6f} {b:.6f} {c:.6f}\n" for a, b, c in x))
    tmp.rename(path)
    return path


def old_package(spec: str, tmp: Path) -> str:
    """A folder holding an older knotsift: ``spec`` itself, or a git ref unpacked into tmp."""
    if Path(spec).is_dir():
        return str(Path(spec).resolve())
    dest = tmp / "old"
    dest.mkdir()
    archive = subprocess.run(["git", "archive", spec, "identify"], cwd=REPO,
                             capture_output=True, check=True).stdout
    subprocess.run(["tar", "-x", "-C", str(dest)], input=archive, check=True)
    (dest / "knotsift").symlink_to("identify")
    return str(dest)


def run_classify(xyz: Path, out: Path, workers: int, old: str | None = None,
                 cheap_ms: float | None = None) -> dict:
    """One whole ``knotsift classify`` process: wall, frames, parent and children CPU."""
    if out.exists():
        out.unlink()
    env = dict(os.environ)
    env.pop("PYTHONDONTWRITEBYTECODE", None)   # a real install has compiled bytecode
    path = [str(HERE)] + ([old] if old else [])
    env["PYTHONPATH"] = os.pathsep.join(path[::-1] + [env.get("PYTHONPATH", "")]).rstrip(
        os.pathsep)
    if cheap_ms is not None:
        env[CHEAP_VAR] = str(cheap_ms)
    else:
        env.pop(CHEAP_VAR, None)
    cmd = [sys.executable, "-c", _PROBE, "classify", str(xyz), "--out", str(out),
           "--workers", str(workers), "--quiet", "--json"]
    start = time.perf_counter()
    proc = subprocess.Popen(cmd, env=env, stdout=subprocess.PIPE, stderr=subprocess.PIPE,
                            text=True)
    sched: dict[int, tuple] = {}
    while proc.poll() is None:
        _sample(proc.pid, sched)
        time.sleep(0.05)
    stdout, stderr = proc.communicate()
    wall = time.perf_counter() - start
    lines = stdout.strip().splitlines()
    if proc.returncode or not lines:
        raise RuntimeError(f"classify failed ({proc.returncode}): {stderr[-2000:]}")
    probe = json.loads(lines[-1])
    report = json.loads("\n".join(lines[:-1]))
    kids = [v for k, v in sched.items() if k != proc.pid and v is not None]
    return {"wall": wall, "frames": report["written"], "failed": report["failed"],
            "counts": report["counts"], "parent_cpu": probe["parent_cpu"],
            "children_cpu": probe["children_cpu"],
            "workers_idle": sum(max(0.0, (last - first) - run - queued)
                                for first, last, run, queued in kids),
            "workers_queued": sum(v[3] for v in kids)}


def _sample(pid: int, sched: dict) -> None:
    """Note (first seen, last seen, seconds on a CPU, seconds waiting for one) of ``pid`` and
    its children, from /proc/PID/schedstat (Linux); a worker's remaining time is idle."""
    try:
        with open(f"/proc/{pid}/task/{pid}/children") as fh:
            pids = [pid] + [int(k) for k in fh.read().split()]
    except OSError:
        return
    now = time.monotonic()
    for k in pids:
        if k in sched and sched[k] is None:
            continue
        try:
            with open(f"/proc/{k}/cmdline", "rb") as fh:
                if b"resource_tracker" in fh.read():   # a helper of spawn, not a worker
                    sched[k] = None
                    continue
        except OSError:
            continue
        try:
            with open(f"/proc/{k}/schedstat") as fh:
                run, queued = (int(v) / 1e9 for v in fh.read().split()[:2])
        except (OSError, ValueError):
            continue
        first = (sched.get(k) or (now,))[0]
        sched[k] = (first, now, run, queued)


def _line(label: str, runs: list[dict]) -> dict:
    rate = statistics.median(r["frames"] / r["wall"] for r in runs)
    parent = statistics.median(r["parent_cpu"] for r in runs)
    kids = statistics.median(r["children_cpu"] for r in runs)
    wall = statistics.median(r["wall"] for r in runs)
    cores = statistics.median((r["parent_cpu"] + r["children_cpu"]) / r["wall"] for r in runs)
    each = ", ".join(f"{r['frames'] / r['wall']:.1f}" for r in runs)
    idle = statistics.median(r["workers_idle"] for r in runs)
    queued = statistics.median(r["workers_queued"] for r in runs)
    print(f"  {label:<18} {rate:7.1f} frames/s  wall {wall:6.1f}s  parent CPU {parent:6.1f}s "
          f"({parent / wall:4.0%} of a core)  workers CPU {kids:6.1f}s  cores obtained "
          f"{cores:.2f}  [{each}]" + (f"\n  {'':<18} workers idle {idle:5.1f}s, waiting for a "
                                      f"CPU {queued:5.1f}s (taken by other processes)"
                                      if idle or queued else ""), flush=True)
    return {"rate": rate, "parent": parent, "children": kids, "wall": wall, "cores": cores}


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--frames", type=int, default=500)
    ap.add_argument("--sizes", default="200,1000")
    ap.add_argument("--repeats", type=int, default=2)
    ap.add_argument("--moves", type=int, default=100, help="crankshaft moves between frames")
    ap.add_argument("--seed", type=int, default=16)
    ap.add_argument("--cheap-ms", default="", help="comma-separated CPU ms of the cheap variant")
    ap.add_argument("--no-real", action="store_true", help="only the cheap variant")
    ap.add_argument("--old", metavar="DIR_OR_REF", help="an older knotsift to run alongside")
    ap.add_argument("--cache", metavar="DIR", help="keep the XYZ files here between runs")
    args = ap.parse_args(argv)

    sizes = [int(s) for s in args.sizes.split(",") if s]
    cheap = [float(s) for s in args.cheap_ms.split(",") if s]
    print(f"{os.cpu_count()} cores; load average before: "
          f"{', '.join(f'{x:.2f}' for x in os.getloadavg())} (other processes skew the ratios)",
          flush=True)
    with tempfile.TemporaryDirectory(prefix="bench-scaling-") as d:
        tmp = Path(d)
        files = Path(args.cache) if args.cache else tmp
        files.mkdir(parents=True, exist_ok=True)
        paths = {"new": None}
        if args.old:
            paths["old"] = old_package(args.old, tmp)
        summary = []
        for beads in sizes:
            xyz = files / f"rings-{beads}-{args.frames}-{args.seed}-{args.moves}.xyz"
            if not xyz.exists():
                t = time.perf_counter()
                write_frames(xyz, args.frames, beads, args.seed, args.moves)
                print(f"wrote {args.frames} frames of {beads} beads in "
                      f"{time.perf_counter() - t:.0f}s", flush=True)
            variants = [] if args.no_real else [None]
            variants += cheap
            for ms in variants:
                kind = "real work" if ms is None else f"cheap work {ms:g} ms/item"
                print(f"{beads} beads, {args.frames} frames, {kind}:", flush=True)
                runs: dict = {}
                for _ in range(args.repeats):
                    for name, old in paths.items():
                        for workers in (1, 2):
                            r = run_classify(xyz, tmp / "out.sqlite", workers, old, ms)
                            runs.setdefault((name, workers), []).append(r)
                for name in paths:
                    one = _line(f"{name}, 1 worker", runs[(name, 1)])
                    two = _line(f"{name}, 2 workers", runs[(name, 2)])
                    ratio = two["rate"] / one["rate"]
                    per_cpu = (two["rate"] / two["cores"]) / (one["rate"] / one["cores"])
                    print(f"  {name}: ratio 2/1 workers {ratio:.2f}x (goal >= 1.8x); frames per "
                          f"CPU second on 2 workers {per_cpu:.2f} of 1 worker's (1.00: no "
                          f"parallel overhead); parent share of all CPU on 2 workers "
                          f"{two['parent'] / (two['parent'] + two['children']):.0%}",
                          flush=True)
                    summary.append((beads, kind, name, one, two, ratio, per_cpu))
        print("\nsummary (frames/s, median of the repeats; cores obtained in brackets):")
        for beads, kind, name, one, two, ratio, per_cpu in summary:
            print(f"  {beads:>5} beads  {kind:<24} {name:<4} 1 worker {one['rate']:7.1f} "
                  f"({one['cores']:.2f})  2 workers {two['rate']:7.1f} ({two['cores']:.2f})  "
                  f"ratio {ratio:.2f}x  per CPU second {per_cpu:.2f}")
    print(f"load average after: {', '.join(f'{x:.2f}' for x in os.getloadavg())}")
    return 0


if __name__ == "__main__":
    sys.exit(main())

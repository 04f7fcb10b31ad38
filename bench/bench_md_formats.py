"""Benchmark: reading MD trajectories through MDAnalysis against the plain XYZ path.

Prints, all measured side by side in this one run on this machine:

1. reading only: seconds per frame of a 1,000-bead ring trajectory of 1,000
   frames written as XYZ, DCD and XTC (with a PDB topology), and the ratio of
   each MD format to XYZ;
2. end to end (read, unwrap, identify) per frame over the first ``--frames``
   frames, the three formats interleaved, and the ratios (target: MD formats
   add no more than 20% per frame over XYZ);
3. ``knotsift identify "DT: 4 6 2"`` as a whole process, median wall time over
   ``--runs`` runs (target < 0.3 s with the light core; give the command of a
   light-core install with ``--knotsift PATH``).

The trajectory is invented for timing: a right-handed trefoil ring of 1,000
beads with Gaussian noise of 0.05 bond lengths per frame, fixed seed.

    python bench/bench_md_formats.py                 # a few minutes
    python bench/bench_md_formats.py --frames 50 --knotsift /path/to/light/bin/knotsift
"""

from __future__ import annotations

import argparse
import shutil
import statistics
import subprocess
import sys
import tempfile
import time
import warnings
from pathlib import Path

import numpy as np


def ring_frames(n_beads: int, n_frames: int, seed: int = 0):
    rng = np.random.default_rng(seed)
    s = np.linspace(0, 2 * np.pi, n_beads, endpoint=False)
    rho = 2 + np.cos(-3 * s)
    base = 10 * np.stack([rho * np.cos(2 * s), rho * np.sin(2 * s), np.sin(-3 * s)], axis=1)
    bond = np.median(np.linalg.norm(np.diff(base, axis=0), axis=1))
    for _ in range(n_frames):
        yield (base + rng.normal(0, 0.05 * bond, base.shape) + 40).astype(np.float32)


def write_all(folder: Path, n_beads: int, n_frames: int) -> dict[str, tuple]:
    import MDAnalysis as mda

    from knotsift.curves.pdb import write_pdb
    from knotsift.curves.xyz import write_xyz

    xyz = folder / "ring.xyz"
    write_xyz(xyz, ring_frames(n_beads, n_frames), precision=3)
    top = folder / "ring.pdb"
    write_pdb(top, [next(ring_frames(n_beads, 1))])
    u = mda.Universe(str(top))
    out = {"xyz": (xyz, {})}
    for ext in ("dcd", "xtc"):
        path = folder / f"ring.{ext}"
        with mda.Writer(str(path), n_atoms=n_beads) as w:
            for x in ring_frames(n_beads, n_frames):
                u.atoms.positions = x
                w.write(u.atoms)
        out[ext] = (path, {"topology": str(top), "select": "all", "closed": True})
    return out


def read_only(path, options) -> float:
    from knotsift.curves.formats import read_frames

    t = time.perf_counter()
    n = 0
    for fr in read_frames(path, **options):
        n += len(fr.chains)
    return (time.perf_counter() - t) / max(n, 1)


def end_to_end(path, options, frames: int, table) -> float:
    from knotsift.curves.pipeline import identify_file

    t = time.perf_counter()
    n = sum(1 for _ in identify_file(path, frames=f"0:{frames}", table=table, **options))
    return (time.perf_counter() - t) / n


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--beads", type=int, default=1000)
    ap.add_argument("--length", type=int, default=1000, help="frames written")
    ap.add_argument("--frames", type=int, default=100, help="frames identified end to end")
    ap.add_argument("--rounds", type=int, default=3)
    ap.add_argument("--runs", type=int, default=15)
    ap.add_argument("--knotsift", default=shutil.which("knotsift") or "knotsift")
    args = ap.parse_args()
    warnings.filterwarnings("ignore")
    from knotsift.table import open_table

    table = open_table()
    folder = Path(tempfile.mkdtemp(prefix="bench_md_"))
    try:
        files = write_all(folder, args.beads, args.length)
        print(f"trajectory: {args.beads} beads x {args.length} frames; sizes "
              + ", ".join(f"{k} {p.stat().st_size / 1e6:.1f} MB" for k, (p, _) in files.items()))
        reads = {k: [] for k in files}
        e2e = {k: [] for k in files}
        for _ in range(args.rounds):  # interleaved, so that noise hits every format alike
            for k, (p, o) in files.items():
                reads[k].append(read_only(p, o))
                e2e[k].append(end_to_end(p, o, args.frames, table))
        base_r = statistics.median(reads["xyz"])
        base_e = statistics.median(e2e["xyz"])
        print("reading only, per frame (median of rounds):")
        for k in files:
            m = statistics.median(reads[k])
            print(f"  {k:4s} {m * 1e3:8.3f} ms   ratio to xyz {m / base_r:5.2f}")
        print(f"end to end over {args.frames} frames, per frame:")
        for k in files:
            m = statistics.median(e2e[k])
            print(f"  {k:4s} {m * 1e3:8.1f} ms   ratio to xyz {m / base_e:5.3f}   "
                  f"(target <= 1.20)")
    finally:
        shutil.rmtree(folder, ignore_errors=True)
    import resource

    times, cpu = [], []
    for _ in range(args.runs):
        before = resource.getrusage(resource.RUSAGE_CHILDREN)
        t = time.perf_counter()
        subprocess.run([args.knotsift, "identify", "DT: 4 6 2"], check=True,
                       stdout=subprocess.DEVNULL)
        times.append(time.perf_counter() - t)
        after = resource.getrusage(resource.RUSAGE_CHILDREN)
        cpu.append(after.ru_utime + after.ru_stime - before.ru_utime - before.ru_stime)
    print(f"{args.knotsift} identify 'DT: 4 6 2': median wall {statistics.median(times):.3f} s, "
          f"median CPU {statistics.median(cpu):.3f} s over {args.runs} runs (target < 0.3 s "
          f"wall; the CPU time shows the cost apart from waiting on a busy machine)")


if __name__ == "__main__":
    sys.exit(main())

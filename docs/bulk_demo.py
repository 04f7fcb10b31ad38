"""The figures of the README's "Bulk classification" section, from invented demo inputs.

Run from the repository root (about a minute on 2 cores)::

    python3 docs/bulk_demo.py

1. The shipped demo trajectory (``identify/demo/phantom_ring_run.xyz``, a
   phantom ring started as a trefoil) and the shipped micrograph batch are
   classified; the trajectory's spectrum is drawn as
   ``docs/bulk_demo_trajectory.png``.
2. Rings of N = 50 ... 400 beads, closed Gaussian random walks (an invented
   ensemble, one XYZ file per length, fixed seeds), are classified and
   summarised by length: ``docs/bulk_spectrum.png`` and
   ``docs/bulk_punknot.png``.
"""

from __future__ import annotations

import subprocess
import sys
import tempfile
from pathlib import Path

import numpy as np

DOCS = Path(__file__).resolve().parent
REPO = DOCS.parent
sys.path.insert(0, str(REPO))
LENGTHS = (50, 100, 200, 300, 400)
RINGS_PER_LENGTH = 300


def write_rings(path: Path, beads: int, n: int, seed: int) -> None:
    rng = np.random.default_rng(seed)
    with open(path, "w") as fh:
        for k in range(n):
            steps = rng.normal(size=(beads, 3))
            steps -= steps.mean(axis=0)  # the walk returns to its start: a ring
            x = np.cumsum(steps, axis=0)
            fh.write(f"{beads}\nring {k}\n")
            fh.write("".join(f"C {a:.5f} {b:.5f} {c:.5f}\n" for a, b, c in x))


def knotsift(*args: str) -> None:
    print("$ knotsift " + " ".join(args))
    subprocess.run([sys.executable, "-m", "knotsift", *args], check=False, cwd=REPO)


def main() -> None:
    from knotsift.demo import demo_path
    from knotsift.demo.ring_polymer import demo_xyz_path

    with tempfile.TemporaryDirectory(prefix="knotsift-demo-") as d:
        tmp = Path(d)
        run = str(tmp / "demo_run.sqlite")
        knotsift("classify", str(demo_xyz_path()), "--out", run)
        knotsift("summarise", run, "--plot", str(DOCS / "bulk_demo_trajectory.png"))
        micrographs = str(tmp / "micrographs.csv")
        knotsift("classify", str(demo_path()), "--out", micrographs)
        knotsift("summarise", micrographs)
        files = []
        for N in LENGTHS:
            path = tmp / f"rings_N{N:03d}.xyz"
            write_rings(path, N, RINGS_PER_LENGTH, seed=N)
            files.append(str(path))
        out = str(tmp / "rings.sqlite")
        knotsift("classify", *files, "--out", out, "--quiet")
        knotsift("summarise", out, "--by", "n_beads", "--mirrors", "merge", "--log",
                 "--plot", str(DOCS / "bulk_spectrum.png"),
                 "--plot-length", str(DOCS / "bulk_punknot.png"))


if __name__ == "__main__":
    main()

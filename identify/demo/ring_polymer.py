"""The 3D demo: a short trajectory of a knotted ring polymer (an invented scenario).

A fictional group runs a Monte Carlo simulation of a 120-bead ring polymer
without excluded volume (a "phantom" chain), started from a trefoil knot.
Crankshaft moves (rotating the beads between two others about the axis
through them) keep every bond length, but strands may pass through each
other, so the knot type changes along the run.  Every 60 moves a frame is
written to a multi-frame XYZ file.  The data are invented for the demo and
never used as a check.

Regenerate the shipped file with ``python -m knotsift.demo.ring_polymer``;
the run is seeded, so the file comes out the same every time.
"""

from __future__ import annotations

from importlib import resources
from pathlib import Path

import numpy as np

__all__ = ["demo_xyz_path", "generate", "BEADS", "FRAMES"]

BEADS = 120
FRAMES = 24
MOVES_PER_FRAME = 60
SEED = 20261201
FILE_NAME = "phantom_ring_run.xyz"


def demo_xyz_path() -> Path:
    """The shipped demo trajectory (multi-frame XYZ)."""
    return Path(str(resources.files("knotsift.demo") / FILE_NAME))


def _start() -> np.ndarray:
    """A trefoil of BEADS beads with unit bonds (the torus-knot form, scaled)."""
    s = np.linspace(0, 2 * np.pi, BEADS, endpoint=False)
    r = 2 + np.cos(3 * s)
    x = np.stack([r * np.cos(2 * s), r * np.sin(2 * s), -np.sin(3 * s)], axis=1)
    bond = np.linalg.norm(np.roll(x, -1, axis=0) - x, axis=1).mean()
    return x / bond


def _crankshaft(x: np.ndarray, rng: np.random.Generator) -> None:
    n = len(x)
    i = int(rng.integers(n))
    span = int(rng.integers(2, 12))
    j = (i + span) % n
    axis = x[j] - x[i]
    length = np.linalg.norm(axis)
    if length < 1e-9:
        return
    k = axis / length
    angle = rng.uniform(-np.pi, np.pi)
    idx = (i + 1 + np.arange(span - 1)) % n
    v = x[idx] - x[i]
    c, s = np.cos(angle), np.sin(angle)
    x[idx] = (x[i] + v * c + np.cross(k, v) * s + np.outer(v @ k, k) * (1 - c))


def generate(path: str | Path | None = None) -> Path:
    """Write the demo trajectory (deterministic) and return its path."""
    path = Path(path) if path is not None else Path(__file__).with_name(FILE_NAME)
    rng = np.random.default_rng(SEED)
    x = _start()
    with open(path, "w", encoding="utf-8") as fh:
        for frame in range(FRAMES):
            if frame:
                for _ in range(MOVES_PER_FRAME):
                    _crankshaft(x, rng)
            fh.write(f"{BEADS}\nphantom ring polymer, Monte Carlo step "
                     f"{frame * MOVES_PER_FRAME} (invented demo data)\n")
            for a, b, c in x:
                fh.write(f"C {a:.5f} {b:.5f} {c:.5f}\n")
    return path


if __name__ == "__main__":
    print(generate())

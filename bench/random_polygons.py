"""Equilateral random polygons by crankshaft moves (shared by the 3D benchmarks).

Starting from a regular planar polygon, each move rotates the beads strictly
between two random beads about the axis through those two by a uniform
random angle.  Bond lengths are kept exactly; the chain of moves is ergodic
on equilateral polygons and samples them uniformly in the long run ("polygonal
folds": Millett 1994, J. Knot Theory Ramifications 3, "Knotting of regular
polygons in 3-space"; from memory).  Strands pass through each other freely
(a phantom polygon).
"""

from __future__ import annotations

import numpy as np


def regular_polygon(n: int) -> np.ndarray:
    s = np.linspace(0, 2 * np.pi, n, endpoint=False)
    x = np.stack([np.cos(s), np.sin(s), np.zeros(n)], axis=1)
    return x / np.linalg.norm(x[1] - x[0])


def crankshaft(x: np.ndarray, moves: int, rng: np.random.Generator) -> np.ndarray:
    """Apply ``moves`` crankshaft rotations (in place) and return the polygon."""
    n = len(x)
    for _ in range(moves):
        i, j = sorted(rng.choice(n, 2, replace=False))
        if j - i < 2:
            continue
        if rng.random() < 0.5:  # rotate the inner or the outer arc
            idx = np.arange(i + 1, j)
        else:
            idx = np.concatenate((np.arange(j + 1, n), np.arange(0, i)))
            if idx.size == 0:
                continue
        axis = x[j] - x[i]
        length = np.linalg.norm(axis)
        if length < 1e-12:
            continue
        k = axis / length
        angle = rng.uniform(0, 2 * np.pi)
        v = x[idx] - x[i]
        c, s = np.cos(angle), np.sin(angle)
        x[idx] = x[i] + v * c + np.cross(k, v) * s + np.outer(v @ k, k) * (1 - c)
    return x


def random_polygon(n: int, rng: np.random.Generator, sweeps: int = 10) -> np.ndarray:
    """An equilateral random polygon of ``n`` unit bonds (``sweeps * n`` crankshaft moves)."""
    return crankshaft(regular_polygon(n), sweeps * n, rng)

"""Curves of known type for the 3D tests, and the moves that must not change the type.

Sources of the known types (named again beside each check):

* torus knots T(p, q): x = (R + r cos(q s)) cos(p s), y = (R + r cos(q s)) sin(p s),
  z = r sin(q s), a standard form.  Worked out here (tests/curves/test_projection.py):
  with p, q > 0 this form is the *left-handed* (negative) torus knot under the
  crossing convention of CONVENTIONS.md; z -> -z (i.e. q -> -q) gives the
  right-handed one, the closure of the positive braid (sigma_1 ... sigma_{p-1})^q.
* the figure-eight curve x = (2 + cos 2s) cos 3s, y = (2 + cos 2s) sin 3s,
  z = sin 4s (common practice);
* a curve with one height maximum and one minimum is unknotted (Milnor 1950,
  Ann. of Math. 52, "On the total curvature of knots"; from memory);
* two round circles through each other's centres form the Hopf link (common practice).
"""

from __future__ import annotations

import numpy as np

__all__ = [
    "torus_knot",
    "right_torus_knot",
    "figure_eight",
    "random_rotation",
    "moved",
    "mirror",
    "connected_sum",
    "with_tails",
    "one_maximum_unknot",
    "hopf_link",
    "torus_link",
    "unit_bonds",
    "random_polygon",
]


def random_polygon(n: int, rng: np.random.Generator, sweeps: int = 1) -> np.ndarray:
    """A seeded equilateral random polygon from the benchmarks' exact sampler.

    The sampler lives in bench/random_polygons.py (crankshaft moves keep every
    bond length; Millett 1994, from memory) and is loaded from there, so tests
    and benchmarks share one ensemble.
    """
    import importlib.util
    from pathlib import Path

    path = Path(__file__).resolve().parents[2] / "bench" / "random_polygons.py"
    spec = importlib.util.spec_from_file_location("random_polygons", path)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module.random_polygon(n, rng, sweeps=sweeps)


def torus_knot(p: int, q: int, n: int, R: float = 2.0, r: float = 1.0) -> np.ndarray:
    """The standard torus-knot form with ``n`` beads (left-handed for p, q > 0, see above)."""
    s = np.linspace(0, 2 * np.pi, n, endpoint=False)
    rho = R + r * np.cos(q * s)
    return np.stack([rho * np.cos(p * s), rho * np.sin(p * s), r * np.sin(q * s)], axis=1)


def right_torus_knot(p: int, q: int, n: int) -> np.ndarray:
    """The right-handed (positive) torus knot: the standard form with q -> -q."""
    return torus_knot(p, -q, n)


def figure_eight(n: int) -> np.ndarray:
    """x = (2 + cos 2s) cos 3s, y = (2 + cos 2s) sin 3s, z = sin 4s (common practice)."""
    s = np.linspace(0, 2 * np.pi, n, endpoint=False)
    rho = 2 + np.cos(2 * s)
    return np.stack([rho * np.cos(3 * s), rho * np.sin(3 * s), np.sin(4 * s)], axis=1)


def random_rotation(rng: np.random.Generator) -> np.ndarray:
    """A rotation matrix (det +1) from the QR decomposition of a Gaussian matrix."""
    q, r = np.linalg.qr(rng.standard_normal((3, 3)))
    q = q * np.sign(np.diag(r))
    if np.linalg.det(q) < 0:
        q[:, 0] = -q[:, 0]
    return q


def unit_bonds(x: np.ndarray, closed: bool = True) -> float:
    nxt = np.roll(x, -1, axis=0) if closed else x[1:]
    prev = x if closed else x[:-1]
    return float(np.median(np.linalg.norm(nxt - prev, axis=1)))


def moved(x: np.ndarray, rng: np.random.Generator, noise: float = 0.02, scale: float = 1.0,
          shift: float = 10.0, closed: bool = True) -> np.ndarray:
    """Rotated, scaled, translated, with Gaussian noise of ``noise`` bond lengths."""
    bond = unit_bonds(x, closed)
    y = x + rng.normal(scale=noise * bond, size=x.shape)
    return scale * (y @ random_rotation(rng).T) + rng.normal(scale=shift, size=3)


def mirror(x: np.ndarray) -> np.ndarray:
    """The mirror image in the plane z = 0."""
    return x * np.array([1.0, 1.0, -1.0])


def _cut_at(x: np.ndarray, k: int) -> np.ndarray:
    """The ring opened by removing bead k: from bead k+1 round to bead k-1."""
    return np.concatenate((x[k + 1:], x[:k]))


def connected_sum(x1: np.ndarray, x2: np.ndarray, gap: float = 1.0) -> np.ndarray:
    """A connected sum built in 3D: x2 placed beyond x1 along +x, joined by two bridges.

    Each ring is opened at its extreme bead towards the other (on the convex
    hull), and the ends are joined across the gap, keeping both orientations.
    """
    bond = max(unit_bonds(x1), unit_bonds(x2))
    x2 = x2 - np.array([x2[:, 0].min() - x1[:, 0].max() - gap * 10 * bond, 0.0, 0.0])
    a = _cut_at(x1, int(np.argmax(x1[:, 0])))
    b = _cut_at(x2, int(np.argmin(x2[:, 0])))
    n_bridge = 10
    t = np.linspace(0, 1, n_bridge + 2)[1:-1, None]
    there = a[-1] + t * (b[0] - a[-1])
    back = b[-1] + t * (a[0] - b[-1])
    return np.concatenate((a, there, b, back))


def with_tails(x: np.ndarray, tail: int, rng: np.random.Generator, spread: float = 0.3
               ) -> tuple[np.ndarray, tuple[int, int]]:
    """An open chain: the ring opened at its bead of largest x, both ends run out along +x.

    Returns the chain and the index range (first, last) of the former ring's beads.
    """
    bond = unit_bonds(x)
    k = int(np.argmax(x[:, 0]))
    core = _cut_at(x, k)
    first, last = core[0], core[-1]
    up = 1.0 if last[1] >= first[1] else -1.0
    steps = np.arange(1, tail + 1)[:, None] * bond
    wiggle = rng.normal(scale=0.05 * bond, size=(tail, 3))
    out_last = last + steps * np.array([1.0, up * spread, 0.0]) / np.hypot(1, spread) + wiggle
    out_first = first + steps * np.array([1.0, -up * spread, 0.0]) / np.hypot(1, spread)
    out_first = (out_first + rng.normal(scale=0.05 * bond, size=(tail, 3)))[::-1]
    chain = np.concatenate((out_first, core, out_last))
    return chain, (tail, tail + len(core) - 1)


def one_maximum_unknot(n: int, loops: int = 4) -> np.ndarray:
    """A tangled ring with one height maximum and one minimum, hence unknotted (Milnor 1950).

    Its shadow is a rose with many self-crossings; the height rises along it
    and a straight segment comes back down.
    """
    m = n - 10
    th = np.linspace(0, 2 * np.pi * 0.97, m)
    rho = 2 + np.cos((loops + 1) * th)
    up = np.stack([rho * np.cos(loops * th), rho * np.sin(loops * th), 0.4 * th / np.pi],
                  axis=1)
    t = np.linspace(0, 1, 12)[1:-1, None]
    down = up[-1] + t * (up[0] - up[-1])
    return np.concatenate((up, down))


def hopf_link(n: int) -> tuple[np.ndarray, np.ndarray]:
    """Two unit circles, each through the other's centre (the Hopf link)."""
    s = np.linspace(0, 2 * np.pi, n, endpoint=False)
    a = np.stack([np.cos(s), np.sin(s), np.zeros(n)], axis=1)
    b = np.stack([1 + np.cos(s), np.zeros(n), np.sin(s)], axis=1)
    return a, b


def torus_link(m: int, n: int, R: float = 2.0, r: float = 1.0) -> tuple[np.ndarray, np.ndarray]:
    """The torus link T(2, 2m) in the standard form: two (1, m) curves, half a turn apart."""
    s = np.linspace(0, 2 * np.pi, n, endpoint=False)
    out = []
    for k in range(2):
        th = m * s + k * np.pi
        rho = R + r * np.cos(th)
        out.append(np.stack([rho * np.cos(s), rho * np.sin(s), r * np.sin(th)], axis=1))
    return out[0], out[1]

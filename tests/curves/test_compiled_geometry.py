"""The compiled curve kernels give exactly the numpy path's results, and stay optional.

Equality, not closeness: the compiled kernels evaluate the same expressions in
the same order (no reassociation, no fused multiply-add), so every kept
vertex, contact distance, crossing and sign must be bit for bit the same.
Then knot types cannot differ either.
"""

from __future__ import annotations

import os
import subprocess
import sys

import numpy as np
import pytest

from knotsift.curves import segments
from knotsift.curves.contact import closest_contacts, segment_set
from knotsift.curves.frame import Chain, prepare_chains
from knotsift.curves.kmt import kmt_reduce
from knotsift.curves.projection import _crossings, project
from knotsift.curves.segments import compiled_geometry, near_pairs
from tests.curves.curves import random_polygon

pytest.importorskip("numba")


def both(monkeypatch, fn, *args, **kwargs):
    """``fn(*args)`` on the numpy path, then on the compiled path."""
    out = []
    for var in ("KNOTSIFT_NO_COMPILED", "KNOTSIFT_COMPILED"):
        with monkeypatch.context() as m:
            m.delenv("KNOTSIFT_NO_COMPILED", raising=False)
            m.delenv("KNOTSIFT_COMPILED", raising=False)
            m.setenv(var, "1")
            assert (compiled_geometry() is None) == (var == "KNOTSIFT_NO_COMPILED")
            out.append(fn(*args, **kwargs))
    return out


def units(chains):
    prep = prepare_chains([Chain(str(k), x, closed) for k, (x, closed) in enumerate(chains)])
    return [(c.coords, c.closed) for c in prep.chains]


def frames():
    """Seeded frames: rings and open chains of 50 to 3,000 beads, alone and several together."""
    rng = np.random.default_rng(2026)
    out = []
    for n in (50, 80, 120, 200, 300, 500, 800, 1500, 3000):
        for closed in (True, False):
            x = random_polygon(n, rng, sweeps=4)
            out.append((f"{n} {'ring' if closed else 'open'}", units([(x, closed)])))
    for k in range(4):  # several chains of one frame, overlapping in space
        chains = [(random_polygon(int(n), rng, sweeps=3) + rng.normal(0, 2, 3), bool(c))
                  for n, c in zip(rng.integers(40, 260, 3), rng.random(3) < 0.7, strict=True)]
        out.append((f"frame {k}", units(chains)))
    return out


FRAMES = frames()


@pytest.mark.parametrize("name, chains", FRAMES, ids=[f[0] for f in FRAMES])
def test_kmt_reduce_compiled_keeps_the_same_vertices(monkeypatch, name, chains):
    """Kept vertices, passes and the recorded triangles are identical on both paths."""
    a, b = both(monkeypatch, kmt_reduce, chains, record=True)
    assert len(a.kept) == len(b.kept)
    for ka, kb in zip(a.kept, b.kept, strict=True):
        assert np.array_equal(ka, kb)
    assert a.passes == b.passes
    assert np.array_equal(a.triangles, b.triangles)
    assert np.array_equal(a.triangle_ids, b.triangle_ids)
    assert a.triangles.shape[0] > 0


@pytest.mark.parametrize("passes", [1, 2, 5])
def test_kmt_reduce_compiled_stops_after_max_passes(monkeypatch, passes):
    """``max_passes`` cuts both paths at the same vertex set."""
    chains = FRAMES[6][1]
    a, b = both(monkeypatch, kmt_reduce, chains, max_passes=passes)
    assert np.array_equal(a.kept[0], b.kept[0])


@pytest.mark.parametrize("name, chains", FRAMES[::2], ids=[f[0] for f in FRAMES[::2]])
def test_closest_contacts_compiled_identical(monkeypatch, name, chains):
    """Contact pairs, their distances and their order are identical (a wide tolerance, many pairs)."""
    segs = segment_set(chains)
    a, b = both(monkeypatch, closest_contacts, segs, 0.6)
    assert a[0].size > 0
    for x, y in zip(a, b, strict=True):
        assert np.array_equal(x, y)


@pytest.mark.parametrize("beads", [60, 250, 700])
def test_projection_compiled_identical(monkeypatch, beads):
    """Crossings, signs and the PD code agree, unreduced rings included (more than 600 segments)."""
    rng = np.random.default_rng(beads)
    for k in range(3):
        chains = units([(random_polygon(beads, rng, sweeps=3), True)])
        a, b = both(monkeypatch, lambda: project(chains, np.random.default_rng(k), directions=3))
        assert np.array_equal(a.crossings, b.crossings)
        assert np.array_equal(a.signs, b.signs)
        assert np.array_equal(a.direction, b.direction)
        assert a.diagram.pd_code() == b.diagram.pd_code()
        segs = segment_set(chains)
        u = np.array([0.3, -0.5, 0.8]) / np.linalg.norm([0.3, -0.5, 0.8])
        fa, fb = both(monkeypatch, _crossings, segs, u, 1e-9)
        assert np.array_equal(fa, fb)


def test_projection_compiled_rejects_end_on_segments(monkeypatch):
    """A segment seen exactly end-on makes both paths reject the direction."""
    x = np.array([[0.0, 0, 0], [0, 0, 1], [1, 0, 1], [1, 1, 0.5], [0.2, 1, 0]])
    segs = segment_set([(x, True)])
    assert both(monkeypatch, _crossings, segs, np.array([0.0, 0.0, 1.0]), 1e-9) == [None, None]


@pytest.mark.parametrize("dim", [2, 3])
def test_overlapping_pairs_equal_near_pairs(dim):
    """The compiled box search lists exactly near_pairs' pairs, long boxes included."""
    from knotsift.curves import compiled_geometry as kernels

    rng = np.random.default_rng(dim)
    for n_a, n_b in ((150, 400), (900, 700)):
        lo_a = rng.uniform(0, 30, (n_a, dim))
        hi_a = lo_a + rng.exponential(0.8, (n_a, dim))
        hi_a[:5] += 25  # a few long boxes, compared with everything
        lo_b = rng.uniform(0, 30, (n_b, dim))
        hi_b = lo_b + rng.exponential(0.8, (n_b, dim))
        for self_pairs in (True, False):
            b_lo, b_hi = (lo_a, hi_a) if self_pairs else (lo_b, hi_b)
            start, j = kernels.overlapping_pairs(lo_a, hi_a, b_lo, b_hi, self_pairs)
            i = np.repeat(np.arange(n_a), np.diff(start))
            ref = near_pairs(lo_a, hi_a) if self_pairs else near_pairs(lo_a, hi_a, lo_b, hi_b)
            assert np.array_equal(i, ref[0]) and np.array_equal(j, ref[1])
            assert i.size > 0


def test_compiled_geometry_switches(monkeypatch):
    """numpy until the numpy kernels have cost about a load, then compiled (loaded aside)."""
    monkeypatch.delenv("KNOTSIFT_COMPILED", raising=False)
    monkeypatch.setenv("KNOTSIFT_NO_COMPILED", "1")
    monkeypatch.setattr(segments, "_state", {"pid": None})
    monkeypatch.setattr(segments, "_numpy_seconds", [10.0])
    assert compiled_geometry() is None
    monkeypatch.delenv("KNOTSIFT_NO_COMPILED")
    monkeypatch.setattr(segments, "_numpy_seconds", [0.0])
    assert compiled_geometry() is None
    assert segments._state["thread"] is None  # nothing loaded below the threshold
    monkeypatch.setattr(segments, "_numpy_seconds", [10.0])
    first = compiled_geometry()  # starts loading in the background
    thread = segments._state["thread"]
    assert thread is not None
    thread.join(timeout=600)
    assert first is None or first is compiled_geometry()
    assert compiled_geometry() is not None


def test_diagram_input_does_not_import_numba():
    """Identifying a DT code never loads numba (no curves on that path)."""
    code = ("import sys\nfrom knotsift.cli import main\nrc = main(['identify', 'DT: 4 6 2'])\n"
            "print(rc, 'numba' in sys.modules)")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                         check=True).stdout.split()
    assert out[-2:] == ["0", "False"]


@pytest.mark.skipif(sys.platform != "linux", reason="fork start (classify's Linux path)")
def test_forked_child_keeps_kernels_loaded_by_the_parent():
    """classify's parent loads the kernels before forking; a child uses them at once."""
    code = (
        "import os, sys\n"
        "os.environ.pop('KNOTSIFT_COMPILED', None)\n"
        "from knotsift.curves import segments\n"
        "assert segments.compiled_geometry() is None\n"   # below the switch: numpy
        "assert segments.preload_compiled()\n"
        "pid = os.fork()\n"
        "if pid == 0:\n"
        "    ok = segments.compiled_geometry() is not None and segments._state['thread'] is None\n"
        "    os._exit(0 if ok else 3)\n"
        "_, status = os.waitpid(pid, 0)\n"
        "print(os.waitstatus_to_exitcode(status))\n")
    env = {k: v for k, v in os.environ.items() if k not in ("KNOTSIFT_COMPILED",
                                                            "KNOTSIFT_NO_COMPILED")}
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                         env=env, timeout=900)
    assert out.returncode == 0, out.stderr[-2000:]
    assert out.stdout.split()[-1] == "0"


def test_preload_respects_the_off_switch(monkeypatch):
    from knotsift.curves import segments

    monkeypatch.setenv("KNOTSIFT_NO_COMPILED", "1")
    assert segments.preload_compiled() is False
    assert segments.compiled_geometry() is None

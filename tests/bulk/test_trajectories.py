"""Trajectories through knotsift.curves: torus knots, open chains, linked rings, bad frames."""

from __future__ import annotations

import json

import numpy as np
import pytest

from knotsift.bulk.rows import ClassifyOptions
from knotsift.bulk.runner import classify
from knotsift.bulk.summary import knot_spectrum, read_results
from knotsift.curves import identify_curve, identify_frame, read_frames
from knotsift.curves.xyz import write_xyz

from .inputs import comparable

# Torus knots T(p, q) and their names in Rolfsen's table: T(2, n) = n_1,
# T(3, 4) = 8_19, T(3, 5) = 10_124 (Rolfsen 1976, "Knots and Links", ch. 3 and
# Appendix C; from memory).  The project's table stores one image of each as
# the reference; the parametrisation below draws one fixed chirality.
TORUS = [((2, 3), "3_1"), ((2, 5), "5_1"), ((3, 4), "8_19"), ((2, 7), "7_1"),
         ((3, 5), "10_124")]


def torus_knot(p: int, q: int, n: int = 240, rng=None) -> np.ndarray:
    """The torus knot T(p, q) on a torus of radii 2 and 1, as n beads; rotated and jiggled
    when an rng is given (a rigid motion and noise far below the bead spacing)."""
    s = np.linspace(0, 2 * np.pi, n, endpoint=False)
    r = 2 + np.cos(q * s)
    x = np.stack([r * np.cos(p * s), r * np.sin(p * s), np.sin(q * s)], axis=1)
    if rng is not None:
        a, _ = np.linalg.qr(rng.normal(size=(3, 3)))
        x = x @ a.T * 3.7 + rng.normal(size=3) + rng.normal(scale=1e-3, size=x.shape)
    return x


def _circle(centre, normal_axis: int, n: int = 60) -> np.ndarray:
    s = np.linspace(0, 2 * np.pi, n, endpoint=False)
    c, d = np.cos(s), np.sin(s)
    pts = {2: np.stack([c, d, 0 * s], 1), 1: np.stack([c, 0 * s, d], 1)}[normal_axis]
    return pts + np.asarray(centre, dtype=float)


@pytest.fixture(scope="module")
def ring_file(tmp_path_factory):
    """An XYZ trajectory: torus knots (plain and moved), a circle, a frame with an
    unreadable number and a ring that folds back through itself."""
    rng = np.random.default_rng(11)
    frames = [torus_knot(p, q) for (p, q), _ in TORUS]
    frames += [torus_knot(p, q, rng=rng) for (p, q), _ in TORUS]
    frames.append(_circle((0, 0, 0), 2))
    folded = torus_knot(2, 3, 60)
    folded[10] = folded[8] + 0.5 * (folded[9] - folded[8])  # bond 9-10 runs back along 8-9
    frames.append(folded)
    path = tmp_path_factory.mktemp("traj") / "rings.xyz"
    write_xyz(path, frames)
    lines = path.read_text().splitlines()
    start = sum(len(f) + 2 for f in frames[:3])  # corrupt one bead line of frame 3
    lines[start + 5] = "C 1.0 not-a-number 2.0"
    path.write_text("\n".join(lines) + "\n")
    return path


def test_classify_rings_equals_identify_frame(ring_file, tmp_path):
    """Each ring's row equals knotsift.curves' own answer frame by frame, names the torus
    knot it was drawn as, and the corrupt and self-passing frames are error rows."""
    out = tmp_path / "r.sqlite"
    report = classify([ring_file], out, workers=1, chunk=3, progress=False)
    assert report.failed == 2 and report.total == 12
    rows = {r["frame"]: r for r in comparable(read_results(out))}
    one_by_one = {}
    for fr in read_frames(ring_file, errors="yield"):
        if hasattr(fr, "chains"):
            one_by_one[fr.index] = identify_frame(fr).chains[0]
    for k, (_, name) in enumerate(TORUS * 2):
        row = rows[k]
        if k == 3:
            assert row["status"] == "error" and "not-a-number" in row["error"]
            continue
        r = one_by_one[k]
        assert (row["status"], row["knot"], row["knot_type"]) == (r.status, r.name, name), k
        assert row["jones"] == r.invariants["jones"] and row["n_beads"] == 240
    assert rows[10]["knot"] == "0_1"
    assert rows[11]["status"] == "error" and "folds back on itself" in rows[11]["error"]
    spec = knot_spectrum(read_results(out), mirrors="merge")
    assert dict(zip(spec["type"], spec["count"], strict=True)) == {
        "0_1": 1, "3_1": 2, "5_1": 2, "7_1": 1, "8_19": 2, "10_124": 2}  # frame 3 (7_1) is bad


def test_classify_rings_processes_equal_serial(ring_file, tmp_path):
    """Two worker processes give the serial rows on a trajectory."""
    a = classify([ring_file], tmp_path / "a.csv", workers=1, chunk=2, progress=False)
    b = classify([ring_file], tmp_path / "b.parquet", workers=2, chunk=2, progress=False)
    assert (a.failed, b.failed) == (2, 2)
    assert comparable(read_results(tmp_path / "a.csv")) == \
        comparable(read_results(tmp_path / "b.parquet"))


@pytest.mark.parametrize("closure, n", [("direct", 1), ("stochastic", 15)])
def test_classify_open_chains_equal_identify_curve(tmp_path, closure, n):
    """Open torus-knot chains with a gap: rows equal identify_curve's, with the spectrum."""
    chains = [torus_knot(p, q, 200)[:188] for (p, q), _ in TORUS[:3]]
    path = tmp_path / "open.xyz"
    write_xyz(path, chains)
    out = tmp_path / "r.csv"
    opts = ClassifyOptions(closed=False, closure=closure, n_closures=n, seed=3)
    classify([path], out, workers=1, progress=False, options=opts)
    rows = comparable(read_results(out))
    for row, x in zip(sorted(rows, key=lambda r: r["frame"]), chains, strict=True):
        r = identify_curve(x, closed=False, closure=closure, n_closures=n, seed=3)
        assert (row["status"], row["knot"], row["closure"]) == (r.status, r.name, closure)
        spectrum = json.loads(row["closure_spectrum"])
        assert [(s["type"], s["count"]) for s in spectrum] == \
            [(s["type"], s["count"]) for s in r.spectrum]
        assert sum(s["count"] for s in spectrum) == n


def test_classify_linked_rings_records_linking_numbers(tmp_path):
    """Two rings of a Hopf link have linking number +-1, two apart rings 0 (common practice);
    each ring alone is an unknot."""
    hopf = np.concatenate([_circle((0, 0, 0), 2), _circle((1, 0, 0), 1)])
    apart = np.concatenate([_circle((0, 0, 0), 2), _circle((5, 0, 0), 1)])
    path = tmp_path / "pairs.xyz"
    write_xyz(path, [hopf, apart])
    out = tmp_path / "r.csv"
    classify([path], out, workers=1, progress=False,
             options=ClassifyOptions(beads_per_chain=60))
    rows = comparable(read_results(out))
    assert len(rows) == 4 and {r["knot"] for r in rows} == {"0_1"}
    links = {(r["frame"], r["label"]): json.loads(r["linking"]) for r in rows}
    assert abs(links[(0, "A")]["B"]) == 1 and links[(0, "A")]["B"] == links[(0, "B")]["A"]
    assert links[(1, "A")] == {"B": 0}


def test_many_chains_without_numba_say_how_to_get_the_compiled_kernels(ring_file, tmp_path,
                                                                        monkeypatch):
    import knotsift.bulk.runner as runner

    monkeypatch.delenv("KNOTSIFT_NO_COMPILED", raising=False)
    monkeypatch.setattr(runner, "SLOW_PATH_NOTE_CHAINS", 1)
    monkeypatch.setattr(runner, "_compiled_installed", lambda: False)
    report = classify([ring_file], tmp_path / "a.csv", workers=1, progress=False)
    assert any('knotsift[fast]' in n for n in report.notes)
    monkeypatch.setattr(runner, "_compiled_installed", lambda: True)
    again = classify([ring_file], tmp_path / "b.csv", workers=1, progress=False)
    assert not any('knotsift[fast]' in n for n in again.notes)


def test_compiled_installed_follows_numba_and_the_off_switch(monkeypatch):
    import importlib.util

    import knotsift.bulk.runner as runner

    monkeypatch.delenv("KNOTSIFT_NO_COMPILED", raising=False)
    assert runner._compiled_installed() == (importlib.util.find_spec("numba") is not None)
    monkeypatch.setenv("KNOTSIFT_NO_COMPILED", "1")
    assert runner._compiled_installed()


def test_serial_run_of_many_frames_loads_the_compiled_kernels_first(ring_file, tmp_path,
                                                                     monkeypatch):
    import knotsift.bulk.runner as runner
    import knotsift.curves.segments as segments

    calls = []
    monkeypatch.setattr(segments, "preload_compiled", lambda: calls.append(1) or False)
    monkeypatch.setattr(runner, "SERIAL_PRELOAD_FRAMES", 10**6)
    classify([ring_file], tmp_path / "a.csv", workers=1, progress=False)
    assert calls == []   # a short run does not pay the load
    monkeypatch.setattr(runner, "SERIAL_PRELOAD_FRAMES", 1)
    classify([ring_file], tmp_path / "b.csv", workers=1, progress=False)
    assert calls == [1]

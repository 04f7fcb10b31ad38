"""kill -9 in the middle of a real ``knotsift classify`` run, then the same command again."""

from __future__ import annotations

import json
import os
import signal
import sqlite3
import subprocess
import sys
import time
from pathlib import Path

import pytest

from knotsift.bulk.resume import item_key, pending, split_key
from knotsift.bulk.runner import classify
from knotsift.bulk.sources import iter_items
from knotsift.bulk.summary import read_results

from .inputs import agrees_with_expected, write_scrambled

REPO = Path(__file__).resolve().parents[2]


def _committed_rows(out: Path) -> int:
    if out.suffix == ".csv":
        manifest = out.with_name(out.name + ".manifest")
        if not manifest.exists():
            return 0
        lines = manifest.read_text().splitlines()[1:]
        return sum(json.loads(line).get("rows", 0) for line in lines if line.endswith("}"))
    if out.suffix == ".parquet":
        import pyarrow.parquet as pq

        return sum(pq.ParquetFile(p).metadata.num_rows for p in out.glob("part-*.parquet"))
    if not out.exists():
        return 0
    try:
        with sqlite3.connect(out, timeout=0.2) as db:
            return db.execute("SELECT count(*) FROM classifications").fetchone()[0]
    except sqlite3.OperationalError:
        return 0


@pytest.mark.parametrize("name", ["r.csv", "r.sqlite", "r.parquet"])
def test_classify_kill9_then_rerun_has_every_row_once(tmp_path, name):
    """SIGKILL to the classify process group after some chunks are committed; the same
    command run again ends with every item exactly once, and the right knots."""
    src = tmp_path / "batch.csv"
    inputs = write_scrambled(src, copies=5, moves=16, seed=7, limit=300)
    out = tmp_path / name
    cmd = [sys.executable, "-m", "knotsift", "classify", str(src), "--out", str(out),
           "--workers", "2", "--chunk", "10", "--quiet"]
    env = dict(os.environ, PYTHONPATH=str(REPO) + os.pathsep + os.environ.get("PYTHONPATH", ""))
    proc = subprocess.Popen(cmd, cwd=tmp_path, env=env, start_new_session=True,
                            stdout=subprocess.DEVNULL, stderr=subprocess.PIPE)
    deadline = time.monotonic() + 120
    while _committed_rows(out) < 40 and proc.poll() is None and time.monotonic() < deadline:
        time.sleep(0.02)
    assert proc.poll() is None, "the run ended before it could be killed: make it longer"
    os.killpg(proc.pid, signal.SIGKILL)
    assert proc.wait(timeout=30) == -signal.SIGKILL
    proc.stderr.close()
    before = len(read_results(out))
    assert 40 <= before < len(inputs)

    again = subprocess.run(cmd, cwd=tmp_path, env=env, capture_output=True, text=True,
                           timeout=300)
    assert again.returncode == 1, again.stderr  # the 4 unreadable codes failed
    got = read_results(out)
    keys = {item.key for item in iter_items([src])}
    assert got["key"].is_unique
    assert set(got["key"]) == keys and len(got) == len(inputs)
    expected = {r["label"]: r["expected"] for r in inputs}
    ok = got[got["status"] != "error"]
    assert all(agrees_with_expected(r.status, r.knot, r.candidates, expected[r.label])
               for r in ok.itertuples())
    assert sorted(got.loc[got["status"] == "error", "label"]) == \
        sorted(r["label"] for r in inputs if not r["expected"])
    assert f"{len(inputs) - before} written" in again.stdout
    assert f"{before} already there" in again.stdout


def test_pending_skips_done_and_repeated_keys(tmp_path):
    """pending() drops items already done (counting their status) and repeats of a key."""
    from collections import Counter

    src = tmp_path / "c.txt"
    src.write_text("4 6 2\n4 6 8 2\n")
    items = list(iter_items([src])) * 2
    done = {items[0].key: "identified"}
    statuses: Counter = Counter()
    left = list(pending(items, done, statuses))
    assert [i.frame for i in left] == [2]
    assert statuses == Counter({"identified": 1, "_skipped": 1})   # counted once, like new items


def test_item_key_round_trip_with_colons():
    """Keys split back into source, frame and chain even when the path has colons."""
    assert split_key(item_key("C:/data/a:b.xyz", 7, 2)) == ("C:/data/a:b.xyz", 7, 2)


def test_resume_same_file_by_another_path_spelling(tmp_path, monkeypatch):
    """The same code file given relative, absolute and through a symbolic link is one input:
    the later runs write nothing and the output keeps one row per code."""
    from .inputs import MIXED, write_mixed

    (tmp_path / "data").mkdir()
    src = write_mixed(tmp_path / "data" / "codes.txt")
    (tmp_path / "link").symlink_to(tmp_path / "data")
    out = tmp_path / "out.sqlite"
    monkeypatch.chdir(tmp_path)
    first = classify(["data/codes.txt"], out, workers=1, progress=False)
    again = classify([str(src.resolve()), "link/codes.txt", "./data/../data/codes.txt"], out,
                     workers=1, progress=False)
    assert first.written == len(MIXED)
    assert again.written == 0 and again.skipped == len(MIXED)
    assert len(read_results(out)) == len(MIXED)


@pytest.mark.parametrize("labelled", [True, False])
def test_resume_after_a_row_is_inserted(tmp_path, labelled):
    """A code inserted in the middle of a code table between runs is classified, and no other
    row is classified again or lost (keys come from labels or content, not line numbers)."""
    codes = ["DT: 4 6 2", "DT: 4 6 8 2", "DT: 6 8 10 2 4", "s1^5", "DT: 4 8 10 2 6"]

    def table(rows):
        head = "label,code\n" if labelled else "code\n"
        return head + "".join((f"k{n},{c}\n" if labelled else f"{c}\n") for n, c in rows)
    src = tmp_path / "codes.csv"
    src.write_text(table(list(enumerate(codes))))
    out = tmp_path / "out.csv"
    first = classify([src], out, workers=1, progress=False)
    first_keys = set(read_results(out)["key"])
    rows = list(enumerate(codes))
    rows.insert(2, (99, "s1 s2^-1 s1 s2^-1"))     # the figure-eight knot, new
    src.write_text(table(rows))
    second = classify([src], out, workers=1, progress=False)
    got = read_results(out)
    assert first.written == 5 and second.written == 1 and second.skipped == 5
    assert len(got) == 6 and got["key"].is_unique
    new = got[~got["key"].isin(first_keys)]
    assert len(new) == 1 and new["knot"].iloc[0] == "4_1" and new["frame"].iloc[0] == 4
    assert (new["label"].iloc[0] == "k99") if labelled else new["label"].isna().all()
    assert any("changed since the last run" in n for n in second.notes)


def test_resume_refuses_a_changed_trajectory_unless_forced(tmp_path):
    """Frames appended to a trajectory are resumed; a trajectory edited in place is refused
    (frames are keyed by index) unless force is given."""
    import numpy as np

    from knotsift.bulk.resume import InputChangedError
    from knotsift.curves.xyz import write_xyz

    t = np.linspace(0, 2 * np.pi, 40, endpoint=False)
    ring = np.c_[np.cos(t), np.sin(t), 0 * t]
    src = tmp_path / "traj.xyz"
    write_xyz(src, [ring, ring * 2])
    out = tmp_path / "out.parquet"
    assert classify([src], out, workers=1, progress=False).written == 2
    with open(src, "a") as fh:                        # a frame appended: resumed
        fh.write(src.read_text().split("\n", 1)[0] + "\nmore\n" +
                 "".join(f"C {x} {y} {z}\n" for x, y, z in ring * 3))
    grown = classify([src], out, workers=1, progress=False)
    assert grown.written == 1 and any("grew" in n for n in grown.notes)
    write_xyz(src, [ring * 5, ring, ring])           # edited in place
    with pytest.raises(InputChangedError, match="--force"):
        classify([src], out, workers=1, progress=False)
    forced = classify([src], out, workers=1, progress=False, force=True)
    assert forced.written == 0 and any("--force" in n for n in forced.notes)

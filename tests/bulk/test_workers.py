"""The worker pool: a poison item never blocks a batch, tasks start small, workers die with
their parent."""

from __future__ import annotations

import os
import signal
import subprocess
import sys
import textwrap
import time

import pytest

from knotsift.bulk.sources import Item
from knotsift.bulk.workers import (TARGET_TASK_SECONDS, run_pool, set_parent_death_signal,
                                   start_method, task_size)

from . import poison


def _items(n: int, poison_at: int | None = None) -> list[Item]:
    return [Item(f"batch:{k}:0", "batch", k, 0, "code",
                 "poison" if k == poison_at else f"code {k}") for k in range(n)]


def _run(work, items, **kw):
    written: list[list[dict]] = []
    opts = dict(workers=2, chunk=50, item_seconds=2.0, memory_mb=4096)
    opts.update(kw)
    run_pool(iter(items), None, work, written.append, poison.fail_rows, **opts)
    return [r for block in written for r in block]


@pytest.mark.parametrize("work, reason", [
    (poison.hangs, "item_seconds"),
    (poison.dies, "killed by signal 9"),
    (poison.exits, "exited with code 3"),
])
def test_run_pool_poison_item_is_given_up_and_the_batch_finishes(work, reason):
    """A batch of 200 with one item that hangs, is killed or exits ends with 200 rows, the
    poison one an error saying why (after a retry alone), every other one done once."""
    rows = _run(work, _items(200, poison_at=137), item_seconds=1.0)
    keys = [r["key"] for r in rows]
    assert len(rows) == 200 and len(set(keys)) == 200
    bad = [r for r in rows if r["status"] == "error"]
    assert [r["key"] for r in bad] == ["batch:137:0"]
    assert reason in bad[0]["error"] and "twice" in bad[0]["error"]


def test_run_pool_memory_cap_fails_the_item_only():
    """Under the address-space cap an item asking for 8 GB fails alone with the limit named."""
    rows = _run(poison.eats_memory, _items(30, poison_at=5), memory_mb=1024)
    assert len(rows) == 30
    bad = [r for r in rows if r["status"] == "error"]
    assert [r["key"] for r in bad] == ["batch:5:0"]
    assert "worker_memory_mb = 1024" in bad[0]["error"]


def test_run_pool_writes_whole_items_within_chunk():
    """No write holds more than ``chunk`` rows, and every item is written exactly once."""
    written: list[list[dict]] = []
    run_pool(iter(_items(120)), None, poison.slow, written.append, poison.fail_rows,
             workers=2, chunk=16, item_seconds=5, memory_mb=4096, flush_seconds=0.05)
    assert max(len(b) for b in written) <= 16
    assert sorted(r["key"] for b in written for r in b) == sorted(i.key for i in _items(120))


def test_task_size_starts_at_one_and_grows_to_the_chunk():
    """The first task of each worker holds one item (every worker busy at once); later tasks
    aim at about TARGET_TASK_SECONDS of work and never pass the chunk."""
    assert TARGET_TASK_SECONDS == 0.5
    assert task_size(None, 2, 200) == 1
    assert task_size(0.5, 2, 200) == 1
    assert task_size(30.0, 2, 200) == 15
    assert task_size(1e6, 2, 200) == 200


@pytest.mark.skipif(not sys.platform.startswith("linux"), reason="prctl is Linux only")
def test_set_parent_death_signal_on_linux():
    """On Linux the kernel accepts the request."""
    code = ("from knotsift.bulk.workers import set_parent_death_signal as s; "
            "import sys; sys.exit(0 if s() else 1)")
    assert subprocess.run([sys.executable, "-c", code]).returncode == 0
    assert callable(set_parent_death_signal)


def _children(pid: int) -> set[int]:
    """Every descendant of ``pid`` still alive (from /proc)."""
    kids: dict[int, list[int]] = {}
    for entry in os.listdir("/proc"):
        if not entry.isdigit():
            continue
        try:
            with open(f"/proc/{entry}/stat") as fh:
                fields = fh.read().rsplit(")", 1)[1].split()
        except OSError:
            continue
        if fields[0] != "Z":
            kids.setdefault(int(fields[1]), []).append(int(entry))
    found, todo = set(), [pid]
    while todo:
        for c in kids.get(todo.pop(), []):
            found.add(c)
            todo.append(c)
    return found


@pytest.mark.skipif(not os.path.isdir("/proc"), reason="needs /proc")
@pytest.mark.parametrize("sig", [signal.SIGKILL, signal.SIGTERM])
def test_classify_killed_parent_leaves_no_worker(tmp_path, sig):
    """Killing the classify process alone (not its group) with SIGKILL or SIGTERM leaves no
    worker process behind; after SIGTERM it exits 143 and what it wrote can be resumed."""
    codes = tmp_path / "codes.txt"
    codes.write_text("".join(f"s1^{21 + 2 * k}\n" for k in range(40)))
    out = tmp_path / "out.sqlite"
    proc = subprocess.Popen([sys.executable, "-m", "knotsift", "classify", str(codes), "-o",
                             str(out), "--workers", "2", "-q"],
                            stdout=subprocess.PIPE, stderr=subprocess.PIPE,
                            start_new_session=True)
    deadline = time.monotonic() + 60
    while len(_children(proc.pid)) < 2 and time.monotonic() < deadline:
        time.sleep(0.1)
    workers = _children(proc.pid)
    assert len(workers) >= 2, "the workers never started"
    time.sleep(1.0)
    os.kill(proc.pid, sig)
    code = proc.wait(30)
    deadline = time.monotonic() + 10
    alive = workers
    while alive and time.monotonic() < deadline:
        alive = {p for p in alive if os.path.exists(f"/proc/{p}") and
                 open(f"/proc/{p}/stat").read().rsplit(")", 1)[1].split()[0] != "Z"}
        time.sleep(0.1)
    assert not alive
    if sig == signal.SIGTERM:
        assert code == 143, proc.stderr.read().decode()
        again = subprocess.run([sys.executable, "-m", "knotsift", "classify", str(codes), "-o",
                                str(out), "--workers", "2", "-q", "--json"],
                               capture_output=True, text=True, timeout=300)
        assert again.returncode == 0, again.stderr
        assert '"total": 40' in again.stdout
    else:
        assert code == -signal.SIGKILL


_WARM_UP = """
import json, os, sys
sys.path.insert(0, {root!r})
from knotsift.bulk.sources import Item
from knotsift.bulk.workers import run_pool, start_method
from tests.bulk import poison
out = {{"method": start_method(4096), "parent": os.getpid()}}
for method in (None, "spawn"):
    poison.WARMED["pid"] = None
    items = [Item(f"w:{{k}}:0", "w", k, 0, "code", "c") for k in range(12)]
    written = []
    run_pool(iter(items), None, poison.reports_warm_up, written.append, poison.fail_rows,
             workers=2, chunk=4, item_seconds=30, memory_mb=4096, preload=poison.warm,
             method=method)
    rows = [r for b in written for r in b]
    out[str(method)] = {{"rows": len(rows), "warmed_by": sorted({{r["warmed_by"] or 0 for r in rows}}),
                         "workers": sorted({{r["worker"] for r in rows}}),
                         "parent_warmed": poison.WARMED["pid"]}}
print(json.dumps(out))
"""


def _script(text: str) -> str:
    """Run a script in a fresh interpreter (a parent with one thread and a small address
    space, as ``knotsift classify``); its last line of output."""
    root = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
    done = subprocess.run([sys.executable, "-c", text.format(root=root)],
                          capture_output=True, text=True, timeout=120)
    assert done.returncode == 0, done.stderr[-2000:]
    return done.stdout.strip().splitlines()[-1]


@pytest.mark.skipif(not sys.platform.startswith("linux"), reason="workers fork on Linux only")
def test_run_pool_forks_workers_after_the_warm_up():
    """On Linux, from a one-thread parent, the warm-up runs once, in the parent, and every
    worker inherits it; with ``spawn`` it is not run and the workers start cold."""
    import json

    out = json.loads(_script(_WARM_UP))
    assert out["method"] == "fork"
    forked, spawned = out["None"], out["spawn"]
    assert forked["rows"] == 12 and forked["warmed_by"] == [out["parent"]]
    assert forked["parent_warmed"] == out["parent"]
    assert out["parent"] not in forked["workers"] and len(forked["workers"]) == 2
    assert spawned["rows"] == 12 and spawned["warmed_by"] == [0]
    assert spawned["parent_warmed"] is None


def test_start_method_falls_back_to_spawn_for_a_big_or_threaded_parent():
    """A parent whose address space is over half the workers' cap, or with a second thread,
    does not fork (a forked worker would start over its cap, or with a lock held for ever)."""
    import threading

    assert start_method(1) == "spawn"
    stop = threading.Event()
    t = threading.Thread(target=stop.wait)
    t.start()
    try:
        assert start_method(1 << 20) == "spawn"
    finally:
        stop.set()
        t.join()


_BIG_ITEMS = """
import sys
sys.path.insert(0, {root!r})
from knotsift.bulk.sources import Item
from knotsift.bulk.workers import run_pool
from tests.bulk import poison
items = [Item(f"big:{{k}}:0", "big", k, 0, "code", "x" * 100_000) for k in range(200)]
written = []
run_pool(iter(items), None, poison.echo_size, written.append, poison.fail_rows, workers=2,
         chunk=40, item_seconds=60, memory_mb=4096)
rows = [r for b in written for r in b]
assert sorted(r["key"] for r in rows) == sorted(i.key for i in items), len(rows)
assert {{r["size"] for r in rows}} == {{100_000}}
print("ok")
"""


def test_run_pool_tasks_sent_ahead_never_block_on_big_items():
    """Tasks of big items (100 kB each, tasks of megabytes, far above a socket's buffer) are
    sent ahead to workers that are busy sending big rows back: the run ends, with every item
    once (without the worker's receiving thread both sides would block on a full buffer)."""
    assert _script(_BIG_ITEMS) == "ok"

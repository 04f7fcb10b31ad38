"""One writer per output: a second classify on a locked output is refused (exit 4) and the
output stays exact; a lock left by a dead process is taken over."""

from __future__ import annotations

import os
import signal
import subprocess
import sys
import time

import pytest

from knotsift.bulk.lock import OutputLockedError, lock_output
from knotsift.bulk.runner import classify
from knotsift.bulk.sinks import open_sink
from knotsift.bulk.summary import read_results

from .inputs import write_mixed

SINKS = ["out.csv", "out.parquet", "out.sqlite"]


@pytest.mark.parametrize("name", SINKS)
def test_second_writer_is_refused_and_output_stays_exact(tmp_path, name):
    """While one run holds the output, a second run is refused before writing anything."""
    src = write_mixed(tmp_path / "codes.txt")
    out = tmp_path / name
    first = classify([src], out, workers=1, progress=False)
    before = read_results(out)
    held = lock_output(open_sink(out))
    try:
        with pytest.raises(OutputLockedError, match="one run per output") as err:
            classify([src], out, workers=1, progress=False)
        assert f"process {os.getpid()}" in str(err.value)
    finally:
        held.release()
    after = read_results(out)
    assert len(after) == len(before) == first.total and after["key"].is_unique
    again = classify([src], out, workers=1, progress=False)   # released: resumable again
    assert again.written == 0 and again.skipped == first.total


@pytest.mark.parametrize("name", SINKS)
def test_concurrent_command_line_runs(tmp_path, name):
    """Two classify commands started together on one output: one writes, the other exits 4
    naming the output; the output holds every item exactly once."""
    src = tmp_path / "codes.txt"
    src.write_text("".join(f"s1^{3 + 2 * k}\n" for k in range(30)))
    out = tmp_path / name
    cmd = [sys.executable, "-m", "knotsift", "classify", str(src), "-o", str(out), "-q",
           "--workers", "1"]
    first = subprocess.Popen(cmd, stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
    lock = out.with_name(out.name + ".lock")
    deadline = time.monotonic() + 60
    while not lock.exists() and first.poll() is None and time.monotonic() < deadline:
        time.sleep(0.02)
    second = subprocess.run(cmd, capture_output=True, text=True, timeout=120)
    assert first.wait(120) == 0, first.stderr.read()
    if first.returncode == 0 and not lock.exists() and second.returncode == 0:
        pytest.skip("the first run ended before the second started (machine too fast)")
    assert second.returncode == 4, second.stderr
    assert "being written by" in second.stderr and str(out) in second.stderr
    assert "Traceback" not in second.stderr
    rows = read_results(out)
    assert len(rows) == 30 and rows["key"].is_unique


def test_stale_lock_of_a_killed_run_is_taken_over(tmp_path):
    """A process holding the lock is killed with SIGKILL; the next run takes the lock over."""
    src = write_mixed(tmp_path / "codes.txt")
    out = tmp_path / "out.sqlite"
    code = ("import sys, time; from knotsift.bulk.lock import lock_output; "
            "from knotsift.bulk.sinks import open_sink; "
            f"lock_output(open_sink({str(out)!r})); print('held', flush=True); time.sleep(600)")
    holder = subprocess.Popen([sys.executable, "-c", code], stdout=subprocess.PIPE, text=True)
    assert holder.stdout.readline().strip() == "held"
    with pytest.raises(OutputLockedError, match=f"process {holder.pid}"):
        classify([src], out, workers=1, progress=False)
    os.kill(holder.pid, signal.SIGKILL)
    holder.wait(10)
    assert out.with_name(out.name + ".lock").exists()   # left behind by the dead owner
    report = classify([src], out, workers=1, progress=False)
    assert report.written == report.total > 0
    assert not out.with_name(out.name + ".lock").exists()

"""Every hostile input of the corpus ends cleanly: a documented exit code, a clear message,
no traceback, within the time limit and under the memory cap.

Each command runs in a process of its own, forked from one warm process that has already
imported knotsift (forkrun.py), a few at a time, under an address-space cap (``RLIMIT_AS``)
and killed at the time limit; the peak resident memory of each is read back from the kernel
with ``wait4``.  The whole corpus runs once per session (a module fixture).
"""

from __future__ import annotations

import sys
import tempfile
from pathlib import Path

import pytest

from .cases import CASES, Case

#: Documented limits of one hostile command: wall seconds, address space and peak memory.
TIME_LIMIT = 90.0
ADDRESS_SPACE = 6 << 30
PEAK_MEMORY = 1536 << 20
_EXIT_CODES = {0, 1, 2, 3, 4}


def _prepare(case: Case, folder: Path) -> None:
    for name, data in case.files.items():
        path = folder / name
        path.parent.mkdir(parents=True, exist_ok=True)
        if callable(data):
            data(path)
        else:
            path.write_bytes(data)


@pytest.fixture(scope="module")
def outcomes() -> dict[str, dict]:
    return run_corpus(CASES)


def run_corpus(cases: list[Case]) -> dict[str, dict]:
    """Run the cases through forkrun.py: each command forked from one warm process."""
    import json
    import subprocess

    jobs, folders = [], []
    for case in cases:
        folder = Path(tempfile.mkdtemp(prefix="hostile-"))
        _prepare(case, folder)
        stdin = folder / ".stdin"
        stdin.write_bytes(case.stdin or b"")
        env = {"OPENBLAS_NUM_THREADS": "1", "KNOTSIFT_LIMITS": ""}
        env.update(case.env)
        jobs.append({"argv": case.argv, "cwd": str(folder), "env": env, "stdin": str(stdin),
                     "stdout": str(folder / ".stdout"), "stderr": str(folder / ".stderr")})
        folders.append(folder)
    runner = Path(__file__).with_name("forkrun.py")
    done = subprocess.run([sys.executable, str(runner), "3", str(TIME_LIMIT),
                           str(ADDRESS_SPACE)], input=json.dumps(jobs), capture_output=True,
                          text=True, timeout=60 + 4 * TIME_LIMIT + 5 * len(cases))
    assert done.returncode == 0, done.stderr[-3000:]
    results = json.loads(done.stdout)
    out = {}
    for case, folder, got in zip(cases, folders, results, strict=True):
        got["stdout"] = (folder / ".stdout").read_text(errors="replace")
        got["stderr"] = (folder / ".stderr").read_text(errors="replace")
        got["folder"] = folder
        out[case.name] = got
    return out


def test_corpus_is_large_and_names_are_unique():
    """At least 120 hostile inputs, each named once, across every command."""
    assert len(CASES) >= 120
    assert len({c.name for c in CASES}) == len(CASES)
    commands = {c.argv[0] for c in CASES}
    assert {"identify", "lookup", "show", "curve", "classify", "summarise"} <= commands


@pytest.mark.parametrize("case", CASES, ids=[c.name for c in CASES])
def test_hostile_input_ends_cleanly(case, outcomes):
    """The documented exit code, the expected message, no traceback, within the limits."""
    got = outcomes[case.name]
    text = got["stdout"] + got["stderr"]
    assert got["seconds"] < TIME_LIMIT, f"ran {got['seconds']:.1f}s (killed)"
    assert got["code"] in _EXIT_CODES, text[-2000:]
    assert got["code"] in case.codes, f"exit {got['code']}: {text[-2000:]}"
    assert "Traceback" not in text and "internal error" not in text, text[-3000:]
    if got["code"] != 0:
        assert got["stderr"].strip() or "failed" in got["stdout"], "no message"
    assert case.expect in text, text[-2000:]
    assert got["peak"] < PEAK_MEMORY, f"peak {got['peak'] >> 20} MiB"
    for name in case.absent:
        assert not (got["folder"] / name).exists(), f"{name} was created"

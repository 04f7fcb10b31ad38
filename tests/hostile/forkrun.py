"""Run many ``knotsift`` command lines fast: each in its own forked child of one warm process.

Used by test_corpus.py.  Reads a JSON list of jobs on standard input (argv, cwd, env,
stdin/stdout/stderr paths), runs up to ``--parallel`` at a time, each child under an
address-space cap and killed at the time limit, and prints a JSON list of results (exit
code, seconds, peak resident bytes from wait4).  Forking from a process that has already
imported knotsift and its libraries keeps each command's start-up to milliseconds; every
command still runs in a process of its own.
"""

from __future__ import annotations

import json
import os
import resource
import signal
import sys
import time


def _child(job: dict, address_space: int) -> None:
    try:
        resource.setrlimit(resource.RLIMIT_AS, (address_space, address_space))
        os.chdir(job["cwd"])
        os.environ.update(job["env"])
        for fd, (path, mode) in enumerate([(job["stdin"], os.O_RDONLY),
                                           (job["stdout"], os.O_WRONLY | os.O_CREAT),
                                           (job["stderr"], os.O_WRONLY | os.O_CREAT)]):
            os.dup2(os.open(path, mode, 0o644), fd)
        sys.stdin = open(0, closefd=False)
        sys.stdout = open(1, "w", closefd=False)
        sys.stderr = open(2, "w", closefd=False)
        import knotsift.limits as limits
        from knotsift.cli import main

        limits._current = None   # read KNOTSIFT_LIMITS of this command
        try:
            code = main(job["argv"])
        except SystemExit as exc:
            code = exc.code if isinstance(exc.code, int) else (0 if exc.code is None else 2)
        sys.stdout.flush()
        sys.stderr.flush()
    except BaseException:   # noqa: BLE001 - a traceback is what the corpus looks for
        import traceback

        traceback.print_exc()
        sys.stderr.flush()
        code = 99
    os._exit(code)


def main() -> None:
    parallel = int(sys.argv[1])
    limit = float(sys.argv[2])
    address_space = int(sys.argv[3])
    jobs = json.load(sys.stdin)
    import numpy  # noqa: F401  warm imports shared by every child
    import pandas  # noqa: F401
    import sqlalchemy  # noqa: F401

    import knotsift.bulk.commands  # noqa: F401
    import knotsift.cli  # noqa: F401
    import knotsift.identification  # noqa: F401

    results: list[dict | None] = [None] * len(jobs)
    running: dict[int, tuple[int, float]] = {}
    todo = list(range(len(jobs)))
    while todo or running:
        while todo and len(running) < parallel:
            k = todo.pop(0)
            pid = os.fork()
            if pid == 0:
                _child(jobs[k], address_space)
            running[pid] = (k, time.monotonic())
        pid, status, usage = os.wait4(-1, os.WNOHANG)
        if pid == 0:
            now = time.monotonic()
            for p, (k, start) in running.items():
                if now - start > limit:
                    try:
                        os.kill(p, signal.SIGKILL)
                    except ProcessLookupError:
                        pass
            time.sleep(0.01)
            continue
        k, start = running.pop(pid)
        results[k] = {"code": os.waitstatus_to_exitcode(status),
                      "seconds": time.monotonic() - start, "peak": usage.ru_maxrss << 10}
    json.dump(results, sys.stdout)


if __name__ == "__main__":
    main()

"""Local worker processes with hard per-item limits, poison-item isolation and adaptive tasks.

Each worker is a child process.  On Linux it is forked from the parent after
the parent has imported and warmed up the classification path once
(``preload``), so a worker starts in milliseconds with every module loaded;
elsewhere (or from a parent where forking is unsafe, see
:func:`start_method`) it is started with ``spawn`` and imports what it needs
itself.  Each worker

* dies with its parent: on Linux the kernel sends it SIGKILL when the parent
  ends (``PR_SET_PDEATHSIG``), and on every system a watchdog thread ends it
  within a second of the parent disappearing, so a ``classify`` killed with
  ``kill -9`` leaves no worker behind;
* runs under an address-space cap (``RLIMIT_AS`` = the limit
  ``worker_memory_mb``), so an item that would exhaust the machine fails
  inside its own worker instead;
* reports the start of every item and the rows of every finished item, so the
  parent knows which item a dying or stuck worker was on, and keeps the rows
  of the items it finished before.

An item running past ``item_seconds`` (wall clock) has its worker ended.  An
item whose worker dies or runs over is retried once, alone, first thing in a
fresh worker; if that fails too, it becomes an error row saying why, and the
run goes on.  A poison item therefore never blocks a batch.

Tasks are sized adaptively: the first tasks hold one item each, so every
worker has work at once, and later tasks grow towards about
:data:`TARGET_TASK_SECONDS` of work at the rate the workers measure, never
beyond the ``chunk`` given by the user.  Each worker holds
:data:`TASKS_AHEAD` tasks: it starts the next one the moment it finishes one,
while the parent reads the input, writes rows or answers another worker, so
the parent's own work overlaps the workers' instead of stalling them.  Tasks
stay short so that the last one, when only one worker is still busy, is short
too.
"""

from __future__ import annotations

import itertools
import math
import os
import queue
import signal
import sys
import threading
import time
from collections import deque
from collections.abc import Callable, Iterator
from dataclasses import dataclass, field

__all__ = ["run_pool", "task_size", "start_method", "TARGET_TASK_SECONDS", "TASKS_AHEAD",
           "set_parent_death_signal"]

#: Aimed duration of one task once the rate of items is known (seconds).
TARGET_TASK_SECONDS = 0.5
#: Tasks held by one worker at a time: the one it runs and the next, already sent.
TASKS_AHEAD = 2
#: Longest wait for a worker to take a task sent ahead (seconds).  A worker
#: thread always takes it at once, unless the worker is stuck in one long call
#: that holds the interpreter; that worker is then ended and its item retried
#: alone, so the parent never waits on it for longer.
SEND_SECONDS = 10
_PR_SET_PDEATHSIG = 1


def set_parent_death_signal(sig: int = signal.SIGKILL) -> bool:
    """Ask the Linux kernel to send ``sig`` to this process when its parent ends.

    Returns False where this is not available (not Linux); the watchdog
    thread of :func:`_worker_main` covers those systems.
    """
    if not sys.platform.startswith("linux"):
        return False
    try:
        import ctypes

        libc = ctypes.CDLL(None, use_errno=True)
        return libc.prctl(_PR_SET_PDEATHSIG, int(sig), 0, 0, 0) == 0
    except (OSError, AttributeError):
        return False


def _watch_parent(parent: int) -> None:
    while True:
        if os.getppid() != parent:
            os._exit(1)
        time.sleep(0.5)


def _limit_send(conn, seconds: float) -> None:
    """Make a send on ``conn`` (a socket) fail after ``seconds`` instead of blocking."""
    import socket
    import struct

    try:
        sock = socket.socket(fileno=os.dup(conn.fileno()))
        try:
            sock.setsockopt(socket.SOL_SOCKET, socket.SO_SNDTIMEO,
                            struct.pack("ll", int(seconds), 0))
        finally:
            sock.close()   # the option stays with the socket, not with this descriptor
    except (OSError, AttributeError, struct.error):
        pass


def _cap_memory(megabytes: int) -> None:
    try:
        import resource

        cap = int(megabytes) << 20
        soft, hard = resource.getrlimit(resource.RLIMIT_AS)
        if hard != resource.RLIM_INFINITY:
            cap = min(cap, hard)
        resource.setrlimit(resource.RLIMIT_AS, (cap, hard))
    except (ImportError, ValueError, OSError):  # not on this system: the wall clock still holds
        pass


def _worker_main(conn, parent: int, limits_env: str, memory_mb: int, work) -> None:
    """The loop of one worker: receive a task, report each item's start and rows."""
    set_parent_death_signal()
    signal.signal(signal.SIGINT, signal.SIG_IGN)     # the parent decides when to stop
    signal.signal(signal.SIGTERM, signal.SIG_DFL)
    if os.getppid() != parent:                      # the parent died while we started
        os._exit(1)
    threading.Thread(target=_watch_parent, args=(parent,), daemon=True).start()
    from ..limits import ENV_VAR

    if limits_env:
        os.environ[ENV_VAR] = limits_env
    from ..table import open_table

    open_table.cache_clear()   # an SQLite connection is not carried across a fork
    inbox: queue.SimpleQueue = queue.SimpleQueue()

    def receive() -> None:   # always drained, so the parent never blocks sending a task
        while True:
            try:
                message = conn.recv()
            except (EOFError, OSError):
                message = None
            inbox.put(message)
            if message is None:
                return

    threading.Thread(target=receive, daemon=True).start()
    _cap_memory(memory_mb)   # after the threads' stacks are mapped
    while True:
        message = inbox.get()
        if message is None:
            return
        task_id, items, options = message
        began = time.perf_counter()
        for i, item in enumerate(items):
            conn.send(("start", task_id, i))
            try:
                rows = work(item, options)
            except MemoryError:
                rows = None
            if rows is None:
                conn.send(("memory", task_id, i))
                continue
            conn.send(("rows", task_id, i, rows))
        conn.send(("done", task_id, time.perf_counter() - began))


def start_method(memory_mb: int | None = None) -> str:
    """``fork`` where it is safe (workers inherit the warmed-up parent), else ``spawn``.

    Forking needs Linux (it is unsafe on macOS and missing on Windows), a
    parent with no Python thread but the main one (a lock held by another
    thread at the fork would stay locked in the child for ever; native
    threads of numerical libraries, which guard their locks across a fork,
    are not counted), and a parent whose address space is under half of
    ``memory_mb``, since a forked worker starts with the parent's and its cap
    counts it.

    Examples
    --------
    >>> start_method() in ("fork", "spawn")
    True
    """
    if not sys.platform.startswith("linux"):
        return "spawn"
    try:
        if threading.active_count() != 1:
            return "spawn"
        if memory_mb is not None:
            with open("/proc/self/statm") as fh:
                size = int(fh.read().split()[0]) * os.sysconf("SC_PAGE_SIZE")
            if size > (int(memory_mb) << 20) // 2:
                return "spawn"
    except (OSError, ValueError):
        return "spawn"
    return "fork"


def task_size(rate: float | None, workers: int, chunk: int) -> int:
    """Items for the next task: 1 until a rate is known, then about TARGET_TASK_SECONDS of work.

    Parameters
    ----------
    rate : float or None
        Items per second of one worker, measured so far.
    workers : int
    chunk : int
        The largest task (``--chunk``).

    Examples
    --------
    >>> task_size(None, 2, 200), task_size(10.0, 2, 200), task_size(1000.0, 2, 200)
    (1, 5, 200)
    """
    if not rate or rate <= 0:
        return 1
    return max(1, min(chunk, int(math.ceil(rate * TARGET_TASK_SECONDS))))


def _death(w: "_Worker") -> str:
    """Why a worker ended, from its exit code."""
    w.process.join(5)
    code = w.process.exitcode
    if code is None:
        return "the worker process stopped answering"
    if code < 0:
        return (f"the worker process was killed by signal {-code}"
                + (" (possibly out of memory)" if code == -signal.SIGKILL else ""))
    return f"the worker process exited with code {code}"


@dataclass
class _Task:
    id: int
    items: list
    attempt: int = 1
    rows: dict = field(default_factory=dict)   # index -> rows
    current: int | None = None
    started: float = 0.0


@dataclass
class _Worker:
    process: object
    conn: object
    tasks: deque = field(default_factory=deque)   # sent, in the order the worker runs them
    broken: str | None = None   # why it must be ended (a send that timed out)

    @property
    def task(self) -> _Task | None:
        """The task the worker is running (or will run next)."""
        return self.tasks[0] if self.tasks else None


def run_pool(items: Iterator, options, work: Callable, write: Callable[[list], None],
             fail_rows: Callable[[object, str], list], workers: int, chunk: int,
             item_seconds: float, memory_mb: int, flush_seconds: float = 2.0,
             stop: Callable[[], bool] | None = None,
             preload: Callable[[object], None] | None = None,
             method: str | None = None) -> None:
    """Classify ``items`` on ``workers`` local processes; write rows as they are ready.

    Parameters
    ----------
    items : iterator
        The items still to do (read lazily).
    options
        Passed to ``work`` with each item.
    work : callable
        ``work(item, options) -> list of rows``, run in the workers (importable,
        picklable).
    write : callable
        Receives a list of whole items' rows; called from this process only.
    fail_rows : callable
        ``fail_rows(item, reason) -> rows`` for an item given up.
    workers, chunk : int
        Number of processes; largest task.
    item_seconds : float
        Hard wall-clock limit of one item.
    memory_mb : int
        Address-space cap of each worker.
    flush_seconds : float
        Rows are written at least this often (and whenever ``chunk`` are waiting).
    stop : callable, optional
        Polled between events; when it returns True the pool stops.
    preload : callable, optional
        ``preload(first_item)``, run once in this process before the workers
        are forked, to import and warm up what ``work`` needs (its errors are
        ignored: the workers then do it themselves).  Not run with ``spawn``.
    method : str, optional
        ``fork`` or ``spawn`` (default: :func:`start_method`).

    Notes
    -----
    On return (or on an exception, KeyboardInterrupt included) every worker
    has been ended.  Rows written are always rows of whole items.
    """
    import multiprocessing
    from multiprocessing.connection import wait

    from ..errors import KnotsiftError
    from ..limits import ENV_VAR

    ctx = None
    limits_env = os.environ.get(ENV_VAR, "")
    parent = os.getpid()
    pool: list[_Worker] = []
    retry: deque[_Task] = deque()
    source = iter(items)
    exhausted = False
    next_id = 0
    buffer: list[list] = []   # the rows of whole items, one list per item
    waiting = [0]              # rows in buffer
    last_flush = time.monotonic()
    done_items = 0
    busy_seconds = 0.0         # the workers' own time on finished tasks
    deaths = [0]   # worker deaths with no item started: a broken start, not a poison item

    def start_worker() -> _Worker:
        mine, theirs = ctx.Pipe()
        if method == "fork":   # buffered output must not be written again by the child
            for stream in (sys.stdout, sys.stderr):
                try:
                    stream.flush()
                except (AttributeError, OSError, ValueError):
                    pass
        p = ctx.Process(target=_worker_main, args=(theirs, parent, limits_env, memory_mb, work),
                        daemon=True)
        p.start()
        theirs.close()
        if sys.platform.startswith("linux"):
            _limit_send(mine, SEND_SECONDS)
        return _Worker(p, mine)

    def flush(force: bool = False) -> None:
        nonlocal buffer, last_flush
        if buffer and (force or waiting[0] >= chunk
                       or time.monotonic() - last_flush >= flush_seconds):
            while buffer:   # blocks of whole items, at most chunk rows (at least one item)
                block: list = []
                while buffer and (not block or len(block) + len(buffer[0]) <= chunk):
                    block.extend(buffer.pop(0))
                waiting[0] -= len(block)
                write(block)
            last_flush = time.monotonic()

    def keep(rows: list) -> None:
        buffer.append(rows)
        waiting[0] += len(rows)

    def next_task() -> _Task | None:
        nonlocal exhausted
        if retry:
            return retry.popleft()
        if exhausted:
            return None
        rate = done_items / busy_seconds if busy_seconds > 0 and done_items else None
        size = task_size(rate, workers, chunk)
        block = []
        for item in source:
            block.append(item)
            if len(block) >= size:
                break
        if not block:
            exhausted = True
            return None
        return _Task(0, block)

    def give(w: _Worker) -> None:
        """Fill the worker up to TASKS_AHEAD tasks (a retried item runs alone)."""
        nonlocal next_id
        while len(w.tasks) < TASKS_AHEAD and w.broken is None:
            if w.tasks and w.tasks[-1].attempt >= 2:
                return   # a suspect item is retried alone: nothing is sent behind it
            if retry and retry[0].attempt >= 2 and w.tasks:
                return   # ... and first thing in a fresh worker
            task = next_task()
            if task is None:
                return
            next_id += 1
            task.id = next_id
            task.current, task.started = None, time.monotonic()
            w.tasks.append(task)
            try:
                w.conn.send((task.id, task.items, options))
            except (BlockingIOError, TimeoutError):
                w.broken = (f"the worker did not take its next task for {SEND_SECONDS} s "
                            "(stuck in one long call) and was ended")
                return
            except OSError:   # the worker just ended: its sentinel reports it, its tasks
                return        # (this one included) are given to another worker then

    def end(w: _Worker) -> None:
        try:
            if w.process.is_alive():
                w.process.kill()
            w.process.join(5)
        finally:
            w.conn.close()

    def lost(w: _Worker, reason: str) -> None:
        """The worker died or was ended: keep finished items, retry or give up the current."""
        tasks = list(w.tasks)
        w.tasks.clear()
        end(w)
        pool.remove(w)
        if not tasks:
            return
        task, queued = tasks[0], tasks[1:]
        kept = [task.rows[i] for i in sorted(task.rows)]
        for rows in kept:
            keep(rows)
        rest = [task.items[i] for i in range(len(task.items)) if i not in task.rows]
        suspect = task.current if task.current is not None and task.current not in task.rows \
            else None
        if suspect is not None:
            item = task.items[suspect]
            rest.remove(item)
            if task.attempt >= 2:
                keep(fail_rows(item, f"{reason}, twice (once alone); the item was "
                                              "given up"))
            else:
                retry.append(_Task(0, [item], attempt=2))
        else:
            deaths[0] += 1
            if deaths[0] > 5 * workers:
                raise KnotsiftError(f"worker processes keep ending before they start an "
                                    f"item ({reason}); the rows written so far are kept")
        if rest:
            retry.append(_Task(0, rest, attempt=task.attempt if len(rest) == 1 and
                               suspect is None else 1))
        for t in queued:   # sent but never started: they go to another worker as they were
            retry.append(_Task(0, t.items, attempt=t.attempt))
        flush()

    def handle(w: _Worker, msg: tuple, now: float) -> bool:
        """One message of a worker; True when one of its tasks ended (room for the next)."""
        nonlocal done_items, busy_seconds
        task = next((t for t in w.tasks if t.id == msg[1]), None)
        if task is None:
            return False
        if msg[0] == "start":
            task.current, task.started = msg[2], now
        elif msg[0] == "rows":
            task.rows[msg[2]] = msg[3]
            task.current = None
        elif msg[0] == "memory":
            item = task.items[msg[2]]
            task.rows[msg[2]] = fail_rows(
                item, f"out of memory: the item needs more than the limit "
                      f"worker_memory_mb = {memory_mb}")
            task.current = None
        elif msg[0] == "done":
            for i in sorted(task.rows):
                keep(task.rows[i])
            done_items += len(task.items)
            busy_seconds += msg[2]
            w.tasks.remove(task)
            return True
        return False

    def replace(w: _Worker, reason: str) -> None:
        lost(w, reason)
        pool.append(start_worker())
        give(pool[-1])

    try:
        first = next(source, None)
        if first is None:
            return
        source = itertools.chain((first,), source)
        if preload is not None and (method or start_method(memory_mb)) == "fork":
            try:
                preload(first)
            except Exception:  # noqa: BLE001 - only a warm-up: each worker does it again
                pass
        method = method or start_method(memory_mb)   # again: the warm-up may start threads
        ctx = multiprocessing.get_context(method)
        for _ in range(workers):
            pool.append(start_worker())
        for w in pool:
            give(w)
        while True:
            if stop is not None and stop():
                break
            active = [w for w in pool if w.tasks]
            if not active and exhausted and not retry:
                break
            if not active:
                for w in pool:
                    give(w)
                if not any(w.tasks for w in pool):
                    if exhausted and not retry:
                        break
                    continue
            waitables = {}
            for w in pool:
                waitables[w.conn] = w
                waitables[w.process.sentinel] = w
            ready = wait(list(waitables), timeout=0.25)
            now = time.monotonic()
            for obj in ready:
                w = waitables[obj]
                if w not in pool:
                    continue
                if obj is w.process.sentinel and not w.conn.poll():
                    replace(w, _death(w))
                    continue
                while w in pool and w.conn.poll():   # every message waiting, in order
                    try:
                        msg = w.conn.recv()
                    except (EOFError, OSError):
                        replace(w, _death(w))
                        break
                    if handle(w, msg, now):
                        give(w)
            for w in list(pool):
                task = w.task
                if w.broken is not None:
                    replace(w, w.broken)
                elif task is not None and task.current is not None and \
                        now - task.started > item_seconds:
                    replace(w, f"the item ran past the hard limit item_seconds = "
                               f"{item_seconds:g} s and its worker was ended")
            if not exhausted or retry:
                for w in pool:   # a worker left short (a retry ran alone) is filled again
                    if len(w.tasks) < TASKS_AHEAD:
                        give(w)
            flush()
        flush(force=True)
    except BaseException:
        try:   # the rows of whole items already back are kept
            flush(force=True)
        finally:
            raise
    finally:
        for w in pool:
            try:
                w.conn.send(None)
            except (OSError, ValueError):
                pass
        deadline = time.monotonic() + 2
        for w in pool:
            w.process.join(max(0.0, deadline - time.monotonic()))
            if w.process.is_alive():
                w.process.kill()
                w.process.join(2)
            w.conn.close()

"""Running a classification: stream items in chunks to workers, write each chunk as it returns.

Items are read lazily and sent in chunks of ``chunk`` items; at most a few
chunks per worker are in flight, so memory stays flat however long the input.
Workers are local processes by default (all cores), or the workers of a Dask
distributed cluster (a scheduler address, or ``"local"`` for a
``LocalCluster`` on this machine).  Each returned chunk is written to the sink
in one transaction, in the order the chunks finish; already written items are
skipped (:mod:`knotsift.bulk.resume`).
"""

from __future__ import annotations

import itertools
import os
import time
from collections import Counter
from collections.abc import Iterable, Iterator
from dataclasses import dataclass, field

from ..errors import KnotsiftError
from .resume import ResumeError, compare_inputs, pending
from .rows import ClassifyOptions, classify_chunk, classify_item, error_rows, warm_up
from .sources import iter_items

__all__ = ["classify", "RunReport", "chunked", "default_workers", "classify_one",
           "classify_chunk_limited", "Terminated"]


class Terminated(KeyboardInterrupt):
    """Raised in the main thread when the process receives SIGTERM (handled like Ctrl-C)."""

STATUS_ORDER = ("identified", "ambiguous", "not in table", "undetermined",
                "depends on missing segment", "error")


@dataclass
class RunReport:
    """What a run did, over all items of its inputs (those written now and those found done)."""

    out: str
    total: int = 0
    written: int = 0
    skipped: int = 0
    counts: dict[str, int] = field(default_factory=dict)
    seconds: float = 0.0
    workers: int = 1
    backend: str = "serial"
    interrupted: bool = False
    signal: str | None = None
    notes: list[str] = field(default_factory=list)

    @property
    def failed(self) -> int:
        """Items whose row has status ``error``."""
        return self.counts.get("error", 0)

    def to_dict(self) -> dict:
        return {"out": self.out, "total": self.total, "written": self.written,
                "skipped": self.skipped, "failed": self.failed, "counts": dict(self.counts),
                "seconds": round(self.seconds, 3), "workers": self.workers,
                "backend": self.backend, "interrupted": self.interrupted,
                "signal": self.signal, "notes": list(self.notes),
                "rate": round(self.written / self.seconds, 3) if self.seconds > 0 else None}

    def text(self) -> str:
        counts = ", ".join(f"{self.counts.get(s, 0)} {s}" for s in STATUS_ORDER
                           if s != "depends on missing segment" or self.counts.get(s))
        rate = f" ({self.written / self.seconds:.1f}/s)" if self.seconds > 0 and self.written \
            else ""
        lines = [f"classified {self.total} items: {counts}",
                 f"  {self.written} written to {self.out} in {self.seconds:.1f}s{rate} "
                 f"on {self.workers} {self.backend} worker{'s' if self.workers != 1 else ''}; "
                 f"{self.skipped} already there",
                 f"  {self.failed} failed" + (" (their rows hold the error)" if self.failed
                                              else "")]
        lines.extend(f"  note: {n}" for n in self.notes)
        if self.interrupted:
            lines.append("  interrupted: run the same command again to continue")
        return "\n".join(lines)


def default_workers() -> int:
    """All cores this process may use."""
    try:
        return len(os.sched_getaffinity(0))
    except AttributeError:  # not on Linux
        return os.cpu_count() or 1


def chunked(items: Iterable, size: int) -> Iterator[list]:
    """Consecutive lists of ``size`` items (the last may be shorter), drawn lazily.

    Examples
    --------
    >>> list(chunked(range(5), 2))
    [[0, 1], [2, 3], [4]]
    """
    if size < 1:
        raise ValueError(f"chunk size must be at least 1, got {size}")
    it = iter(items)
    while True:
        block = list(itertools.islice(it, size))
        if not block:
            return
        yield block


#: A serial run whose first chunk holds at least this many 3D frames loads the
#: compiled kernels before it starts (as the worker pool's parent always does).
SERIAL_PRELOAD_FRAMES = 20


def _run_serial(chunks, options, write):
    for i, block in enumerate(chunks):
        if i == 0 and sum(getattr(it, "kind", "") == "frame" for it in block) \
                >= SERIAL_PRELOAD_FRAMES:
            from ..curves.segments import preload_compiled

            preload_compiled()
        write(classify_chunk(block, options))


def classify_one(item, options: ClassifyOptions) -> list[dict] | None:
    """The rows of one item in a worker process; None when it ran out of memory."""
    rows = classify_item(item, options)
    if any((r.get("error") or "").startswith("internal error: MemoryError") for r in rows):
        return None
    return rows


def _run_processes(items, options, write, workers: int, chunk: int):
    from ..limits import current
    from .workers import run_pool

    lim = current()
    run_pool(items, options, classify_one, write, error_rows, workers=workers, chunk=chunk,
             item_seconds=lim.item_seconds, memory_mb=lim.worker_memory_mb,
             preload=lambda first: warm_up(first, options))


def classify_chunk_limited(items: list, options: ClassifyOptions, limits: dict) -> list[dict]:
    """:func:`classify_chunk` under the given limits (for Dask workers, which do not share
    this process's environment)."""
    from ..limits import Limits, set_limits

    set_limits(Limits(**limits), export=False)
    return classify_chunk(items, options)


def _run_dask(chunks, options, write, workers: int, address: str):
    from ..extras import require

    require("dask.distributed", "bulk", "running on Dask (--dask)")
    from dask.distributed import Client, LocalCluster, as_completed

    from ..limits import current

    cluster = None
    if address == "local":
        cluster = LocalCluster(n_workers=workers, threads_per_worker=1, processes=True,
                               dashboard_address=None)
        client = Client(cluster)
    else:
        try:
            client = Client(address, timeout=30)
        except (OSError, TimeoutError) as exc:
            raise ResumeError(f"cannot reach the Dask scheduler at {address}: {exc}",
                              value=address) from None
    try:
        n = max(1, len(client.scheduler_info().get("workers", {})) or workers)
        limit = 2 * n
        queue = as_completed()
        blocks: dict = {}
        limits = current().to_dict()

        def submit(block, attempt=1):
            future = client.submit(classify_chunk_limited, block, options, limits, pure=False)
            blocks[future.key] = (block, attempt)
            queue.add(future)

        def collect(future):
            block, attempt = blocks.pop(future.key)
            try:
                write(future.result())
            except Exception as exc:  # noqa: BLE001 - a worker died: retry each item alone once
                if attempt >= 2:
                    write(error_rows(block[0], f"the Dask task failed twice, once alone "
                                               f"({type(exc).__name__}: {exc})"))
                    return
                for item in block:
                    submit([item], attempt=2)

        in_flight = 0
        for block in chunks:
            submit(block)
            in_flight += 1
            while in_flight >= limit:
                collect(next(queue))
                in_flight -= 1
        for future in queue:
            collect(future)
    finally:
        client.close()
        if cluster is not None:
            cluster.close()


class _Signals:
    """SIGINT and SIGTERM during a run: raised in the main thread, but never inside a write.

    Used as a context manager around the run; :meth:`deferred` wraps each
    write, and a signal arriving during it is raised as soon as it ends.
    """

    def __init__(self):
        self._writing = False
        self._pending: KeyboardInterrupt | None = None
        self._saved: dict = {}

    def _handler(self, signum, frame):
        import signal

        exc = Terminated() if signum == signal.SIGTERM else KeyboardInterrupt()
        if self._writing:
            self._pending = self._pending or exc
            return
        raise exc

    def __enter__(self):
        import signal
        import threading

        if threading.current_thread() is threading.main_thread():
            for sig in (signal.SIGINT, signal.SIGTERM):
                self._saved[sig] = signal.signal(sig, self._handler)
        return self

    def __exit__(self, *exc):
        import signal

        for sig, old in self._saved.items():
            signal.signal(sig, old)
        return False

    def deferred(self):
        signals = self

        class _Writing:
            def __enter__(self):
                signals._writing = True

            def __exit__(self, *exc):
                signals._writing = False
                if signals._pending is not None and exc[0] is None:
                    pending_exc, signals._pending = signals._pending, None
                    raise pending_exc
                return False

        return _Writing()


def classify(inputs: Iterable[str | os.PathLike], out: str | os.PathLike, *,
             fmt: str = "auto", codes_column: str = "code", label_column: str = "label",
             options: ClassifyOptions | None = None, workers: int | None = None,
             dask: str | None = None, chunk: int = 200, progress: bool | None = None,
             table_name: str = "classifications", force: bool = False) -> RunReport:
    """Classify every item of the inputs into ``out``, resuming what is already there.

    Parameters
    ----------
    inputs : paths
        Code tables or lists, or trajectories (see :func:`knotsift.bulk.sources.iter_items`).
    out : path or URL
        ``*.csv``, ``*.parquet``, ``*.sqlite``/``*.db`` or a database URL
        (see :func:`knotsift.bulk.sinks.open_sink`).
    fmt, codes_column, label_column
        How to read the inputs.
    options : ClassifyOptions
        Notation, closure of open chains, table.
    workers : int, optional
        Worker processes (default: all cores); 1 runs in this process.
    dask : str, optional
        A Dask scheduler address, or ``"local"`` for a local cluster of ``workers``
        processes.
    chunk : int
        Items per chunk: the unit of work and of each committed write.
    progress : bool, optional
        Show a progress line (default: when standard error is a terminal).
    force : bool
        Resume even when a trajectory changed since the run began
        (see :func:`knotsift.bulk.resume.compare_inputs`).

    Returns
    -------
    RunReport
        Counts of rows over all items of the inputs (written now or found done);
        ``failed`` of them are errors.

    Raises
    ------
    KnotsiftError
        Before any work, for missing inputs, a missing table, or an output that
        cannot be opened or was written with other options.
    """
    from ..table import open_table
    from .lock import lock_output
    from .sinks import open_sink
    from .sources import input_plan

    options = options or ClassifyOptions()
    workers = workers or default_workers()
    if workers < 1:
        raise KnotsiftError(f"workers must be at least 1, got {workers}", value=workers)
    from ..limits import check_at_most

    check_at_most("closures", options.n_closures, "--closures")
    if options.seed < 0:
        raise KnotsiftError(f"the seed must be 0 or more, got {options.seed}",
                            value=options.seed)
    open_table(options.table)   # fail before any work when the table is missing
    read = dict(fmt=fmt, codes_column=codes_column, label_column=label_column,
                closed=options.closed, beads_per_chain=options.beads_per_chain,
                reader=options.reader_options())
    inputs = list(inputs)
    items = iter_items(inputs, **read)
    sink = open_sink(out, table_name)
    lock = lock_output(sink, table_name)   # one writer per output, released at the end
    try:
        try:
            sink.prepare(options.to_dict())
            done = sink.done()
            record, notes = compare_inputs(sink.stored_inputs(),
                                           input_plan(inputs, fmt, codes_column), force)
            sink.record_inputs(record)
        except OSError as exc:
            raise ResumeError(f"cannot use the output {sink.where}: {exc.strerror or exc}",
                              where=str(sink.where)) from None
        report = _run(inputs, read, sink, done, options, workers, dask, chunk, progress)
        report.notes = list(notes) + report.notes
        return report
    finally:
        lock.release()


#: Seconds the progress display may spend counting the input before the run;
#: past that it shows the count and rate without a total (a million frames
#: would otherwise be read twice).
COUNT_SECONDS = 2.0


#: A run of at least this many 3D chains without numba says how to get the compiled kernels.
SLOW_PATH_NOTE_CHAINS = 100


def _compiled_installed() -> bool:
    from ..curves.segments import compiled_installed

    return compiled_installed()


def _count_rows(inputs, read, done) -> int | None:
    """Rows still to do, for the progress total; None when counting takes too long."""
    import time

    stop = time.monotonic() + COUNT_SECONDS
    total = 0
    for it in iter_items(inputs, **read):
        if it.key not in done:
            total += it.n_rows
        if time.monotonic() > stop:
            return None
    return total


def _run(inputs, read, sink, done, options, workers, dask, chunk, progress) -> RunReport:
    import sys

    from ..progress import Progress

    items = iter_items(inputs, **read)
    report = RunReport(out=str(sink.where), workers=workers,
                       backend="dask" if dask else ("process" if workers > 1 else "serial"))
    show = sys.stderr.isatty() if progress is None else progress
    total = _count_rows(inputs, read, done) if show else None
    bar = Progress(total, label="classify", enabled=show)
    statuses: Counter = Counter()

    signals = _Signals()
    chains = [0]   # rows of 3D chains written

    def write(rows: list[dict]) -> None:
        with signals.deferred():   # a chunk is written whole before a signal is acted on
            try:
                sink.write(rows)
            except OSError as exc:
                raise ResumeError(f"cannot write to {sink.where}: {exc.strerror or exc}; the "
                                  "chunks written before are kept", where=str(sink.where)
                                  ) from None
            report.written += len(rows)
            chains[0] += sum(1 for r in rows if r.get("n_beads"))
            statuses.update(r["status"] for r in rows)
            failed = statuses["error"]
            bar.update(len(rows), detail=f"{failed} failed" if failed else "")

    todo = pending(items, done, statuses)
    start = time.monotonic()
    try:
        with signals:
            if dask:
                _run_dask(chunked(todo, chunk), options, write, workers, dask)
            elif workers == 1:
                _run_serial(chunked(todo, chunk), options, write)
            else:
                _run_processes(todo, options, write, workers, chunk)
    except KeyboardInterrupt as exc:
        report.interrupted = True
        report.signal = "SIGTERM" if isinstance(exc, Terminated) else "SIGINT"
    finally:
        report.seconds = time.monotonic() - start
        bar.close()
        sink.close()
    report.skipped = statuses.pop("_skipped", 0)
    if chains[0] >= SLOW_PATH_NOTE_CHAINS and not _compiled_installed():
        report.notes.append(f"{chains[0]} chains ran on the numpy 3D kernels: installing the "
                            'compiled ones (pip install "knotsift[fast]", numba) makes such '
                            "frames about 2 to 5 times faster, with identical results")
    report.counts = {s: statuses.get(s, 0) for s in STATUS_ORDER}
    report.total = report.written + report.skipped
    return report

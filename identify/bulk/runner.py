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
from .resume import ResumeError, pending
from .rows import ClassifyOptions, classify_chunk
from .sources import iter_items

__all__ = ["classify", "RunReport", "chunked", "default_workers"]

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

    @property
    def failed(self) -> int:
        """Items whose row has status ``error``."""
        return self.counts.get("error", 0)

    def to_dict(self) -> dict:
        return {"out": self.out, "total": self.total, "written": self.written,
                "skipped": self.skipped, "failed": self.failed, "counts": dict(self.counts),
                "seconds": round(self.seconds, 3), "workers": self.workers,
                "backend": self.backend, "interrupted": self.interrupted,
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


def _worker_start() -> None:
    """Each worker process opens the reference table itself, on first use."""
    from ..table import open_table

    open_table.cache_clear()


def _run_serial(chunks, options, write):
    for block in chunks:
        write(classify_chunk(block, options))


def _run_processes(chunks, options, write, workers: int):
    import multiprocessing
    from concurrent.futures import FIRST_COMPLETED, ProcessPoolExecutor, wait
    from concurrent.futures.process import BrokenProcessPool

    ctx = multiprocessing.get_context("spawn")   # no inherited state (open tables, threads)
    limit = 2 * workers
    pool = ProcessPoolExecutor(workers, mp_context=ctx, initializer=_worker_start)
    running: set = set()
    try:
        for block in chunks:
            running.add(pool.submit(classify_chunk, block, options))
            if len(running) >= limit:
                finished, running = wait(running, return_when=FIRST_COMPLETED)
                for f in finished:
                    write(f.result())
        while running:
            finished, running = wait(running, return_when=FIRST_COMPLETED)
            for f in finished:
                write(f.result())
    except BrokenProcessPool:
        raise KnotsiftError("a worker process died (killed, or out of memory); the chunks "
                            "already written are kept: run the same command again to "
                            "continue") from None
    finally:
        pool.shutdown(wait=not running, cancel_futures=True)


def _run_dask(chunks, options, write, workers: int, address: str):
    from ..extras import require

    require("dask.distributed", "bulk", "running on Dask (--dask)")
    from dask.distributed import Client, LocalCluster, as_completed

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
        in_flight = 0
        for block in chunks:
            queue.add(client.submit(classify_chunk, block, options, pure=False))
            in_flight += 1
            while in_flight >= limit:
                write(next(queue).result())
                in_flight -= 1
        for future in queue:
            write(future.result())
    finally:
        client.close()
        if cluster is not None:
            cluster.close()


def classify(inputs: Iterable[str | os.PathLike], out: str | os.PathLike, *,
             fmt: str = "auto", codes_column: str = "code", label_column: str = "label",
             options: ClassifyOptions | None = None, workers: int | None = None,
             dask: str | None = None, chunk: int = 200, progress: bool | None = None,
             table_name: str = "classifications") -> RunReport:
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
    import sys

    from ..progress import Progress
    from ..table import open_table
    from .sinks import open_sink

    options = options or ClassifyOptions()
    workers = workers or default_workers()
    if workers < 1:
        raise KnotsiftError(f"workers must be at least 1, got {workers}", value=workers)
    open_table(options.table)   # fail before any work when the table is missing
    read = dict(fmt=fmt, codes_column=codes_column, label_column=label_column,
                closed=options.closed, beads_per_chain=options.beads_per_chain,
                reader=options.reader_options())
    items = iter_items(inputs, **read)
    sink = open_sink(out, table_name)
    sink.prepare(options.to_dict())
    done = sink.done()
    report = RunReport(out=str(sink.where), workers=workers,
                       backend="dask" if dask else ("process" if workers > 1 else "serial"))
    show = sys.stderr.isatty() if progress is None else progress
    total = None
    if show:
        total = sum(it.n_rows for it in iter_items(inputs, **read) if it.key not in done)
    bar = Progress(total, label="classify", enabled=show)
    statuses: Counter = Counter()

    def write(rows: list[dict]) -> None:
        sink.write(rows)
        report.written += len(rows)
        statuses.update(r["status"] for r in rows)
        failed = statuses["error"]
        bar.update(len(rows), detail=f"{failed} failed" if failed else "")

    chunks = chunked(pending(items, done, statuses), chunk)
    start = time.monotonic()
    try:
        if dask:
            _run_dask(chunks, options, write, workers, dask)
        elif workers == 1:
            _run_serial(chunks, options, write)
        else:
            _run_processes(chunks, options, write, workers)
    except KeyboardInterrupt:
        report.interrupted = True
    finally:
        report.seconds = time.monotonic() - start
        bar.close()
        sink.close()
    report.skipped = statuses.pop("_skipped", 0)
    report.counts = {s: statuses.get(s, 0) for s in STATUS_ORDER}
    report.total = report.written + report.skipped
    return report

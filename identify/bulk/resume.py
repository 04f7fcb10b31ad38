"""Resuming an interrupted run: item keys, the done-set, and skipping what is done.

A run writes its rows in chunks, each chunk committed whole or not at all
(:mod:`knotsift.bulk.sinks`).  Every row carries the deterministic key of its
item, ``file:frame:chain``: the file is the input's real path; the frame is a
trajectory frame's index, or for a row of a code table ``label=...`` (its
label) or ``code=...`` (a hash of its code and other columns).  Running the same command again reads the keys
already in the output (the done-set) and classifies only the others, so after
an interruption at any point, even ``kill -9``, the output ends with every item
exactly once.

The options that change a row (notation, closure, table) are stored with the
output at its first run; a later run with other options is refused rather
than mixing two kinds of rows in one table.

Each run also records its inputs (real path, size, modification time and a
content hash, :func:`input_record`).  On resuming, an input is compared with
its record (:func:`compare_inputs`):

* unchanged (same size and time, or same content): resumed;
* grown, with its recorded content as its beginning (frames appended to a
  trajectory): resumed, the new items classified;
* otherwise changed: a code table is resumed (its keys come from each row's
  label or content, so only new or edited rows are classified, and a note
  says so); a trajectory is refused, since its frames are keyed by index and
  the rows of two versions would mix, unless ``force`` is given.
"""

from __future__ import annotations

import hashlib
import os
from collections import Counter
from collections.abc import Iterable, Iterator
from typing import TYPE_CHECKING

from ..errors import KnotsiftError

if TYPE_CHECKING:
    from .sources import Item

__all__ = ["item_key", "split_key", "pending", "check_options", "ResumeError",
           "InputChangedError", "input_record", "compare_inputs"]


class ResumeError(KnotsiftError, RuntimeError):
    """The output cannot be resumed: other options, or a file not written by knotsift."""


class InputChangedError(ResumeError):
    """An input changed since the run began in a way that would make its keys mix versions."""


def item_key(source: str, frame: int | str, chain: int) -> str:
    """The key of one item: ``source:frame:chain``.

    Examples
    --------
    >>> item_key("runs/a.xyz", 12, 0)
    'runs/a.xyz:12:0'
    >>> split_key(item_key("c:/x.csv", 3, 1))
    ('c:/x.csv', 3, 1)
    """
    frame = frame if isinstance(frame, str) else int(frame)
    return f"{source}:{frame}:{int(chain)}"


def split_key(key: str) -> tuple[str, int | str, int]:
    """Inverse of :func:`item_key` (the source may itself contain colons).

    The frame is an int for trajectories, the ``label=...``/``code=...`` text for
    rows of code tables.
    """
    source, frame, chain = key.rsplit(":", 2)
    return source, int(frame) if frame.lstrip("-").isdigit() else frame, int(chain)


def pending(items: Iterable[Item], done: dict[str, str], statuses: Counter
            ) -> Iterator[Item]:
    """The items whose rows are not in ``done``, each once.

    ``done`` maps the keys already written to their status; the statuses of
    the rows of skipped items are counted into ``statuses``, so that a resumed
    run can report on all its items.  Yielded keys are added to ``done``
    (with status ``""``): an item given twice is classified once.  The rows of
    one item are written in one chunk, so they are all done or none is.
    """
    for item in items:
        keys = item.keys
        found = [done.get(k) for k in keys]
        if found[0] is not None:
            for k, status in zip(keys, found):
                if status:
                    statuses[status] += 1
                    statuses["_skipped"] += 1
                    done[k] = ""   # counted once, however often the item is given
            continue
        for k in keys:
            done[k] = ""
        yield item


def check_options(stored: dict | None, current: dict, where: str) -> None:
    """Refuse to resume an output made with other options.

    Raises
    ------
    ResumeError
        Naming the options that differ.
    """
    if stored is None:
        return
    differ = sorted(k for k in set(stored) | set(current) if stored.get(k) != current.get(k))
    if differ:
        shown = "; ".join(f"{k}: {stored.get(k)!r} there, {current.get(k)!r} now"
                          for k in differ)
        raise ResumeError(f"{where} was written with other options ({shown}); resume with the "
                          "same options or write to a new --out", value=differ, where=where)


def _hash(path, size: int | None = None) -> str:
    """blake2b of the file's first ``size`` bytes (all of it when None)."""
    h = hashlib.blake2b(digest_size=16)
    left = size
    with open(path, "rb") as fh:
        while left is None or left > 0:
            block = fh.read(1 << 20 if left is None else min(1 << 20, left))
            if not block:
                break
            h.update(block)
            if left is not None:
                left -= len(block)
    return h.hexdigest()


def input_record(path) -> dict:
    """What identifies the content of an input: size, modification time and content hash."""
    st = os.stat(path)
    return {"size": st.st_size, "mtime_ns": st.st_mtime_ns, "hash": _hash(path)}


def compare_inputs(stored: dict, plan: list, force: bool = False) -> tuple[dict, list[str]]:
    """Check the inputs against the record of earlier runs (rules in the module docstring).

    Parameters
    ----------
    stored : dict
        Real path -> :func:`input_record`, as stored with the output.
    plan : list of (path, format)
        The inputs of this run (:func:`knotsift.bulk.sources.input_plan`).
    force : bool
        Resume a changed trajectory anyway.

    Returns
    -------
    (dict, list of str)
        The updated record to store, and notes for the user.

    Raises
    ------
    InputChangedError
        When a trajectory changed other than by growing, without ``force``.
    """
    record = dict(stored)
    notes = []
    for path, fmt in plan:
        real = os.path.realpath(path)
        st = os.stat(path)
        old = stored.get(real)
        if old is None:
            record[real] = input_record(path)
            continue
        if old.get("size") == st.st_size and old.get("mtime_ns") == st.st_mtime_ns:
            continue
        size = int(old.get("size", -1))
        grew = 0 <= size <= st.st_size and _hash(path, size) == old.get("hash")
        record[real] = input_record(path)
        if grew:
            if st.st_size > size:
                notes.append(f"{path} grew since the last run ({size} -> {st.st_size} bytes, "
                             "the old content unchanged): the new items are classified")
            continue
        if fmt == "codes":
            notes.append(f"{path} changed since the last run: rows are keyed by label or "
                         "content, so only new or edited rows are classified (rows of "
                         "removed or edited lines stay in the output)")
        elif force:
            notes.append(f"{path} changed since the last run; resumed anyway (--force): "
                         "frames are keyed by index, rows of both versions may mix")
        else:
            raise InputChangedError(
                f"{path} changed since the run began (was {size} bytes, now {st.st_size}, "
                "and its old content is not its beginning): trajectory frames are keyed by "
                "index, so resuming would mix rows of two versions; write to a new --out, or "
                "give --force to resume anyway", value=real, where=str(path))
    return record, notes

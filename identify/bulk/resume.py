"""Resuming an interrupted run: item keys, the done-set, and skipping what is done.

A run writes its rows in chunks, each chunk committed whole or not at all
(:mod:`knotsift.bulk.sinks`).  Every row carries the deterministic key of its
item, ``source:frame:chain``.  Running the same command again reads the keys
already in the output (the done-set) and classifies only the others, so after
an interruption at any point, even ``kill -9``, the output ends with every item
exactly once.

The options that change a row (notation, closure, table) are stored with the
output at its first run; a later run with other options is refused rather
than mixing two kinds of rows in one table.
"""

from __future__ import annotations

from collections import Counter
from collections.abc import Iterable, Iterator
from typing import TYPE_CHECKING

from ..errors import KnotsiftError

if TYPE_CHECKING:
    from .sources import Item

__all__ = ["item_key", "split_key", "pending", "check_options", "ResumeError"]


class ResumeError(KnotsiftError, RuntimeError):
    """The output cannot be resumed: other options, or a file not written by knotsift."""


def item_key(source: str, frame: int, chain: int) -> str:
    """The key of one item: ``source:frame:chain``.

    Examples
    --------
    >>> item_key("runs/a.xyz", 12, 0)
    'runs/a.xyz:12:0'
    >>> split_key(item_key("c:/x.csv", 3, 1))
    ('c:/x.csv', 3, 1)
    """
    return f"{source}:{int(frame)}:{int(chain)}"


def split_key(key: str) -> tuple[str, int, int]:
    """Inverse of :func:`item_key` (the source may itself contain colons)."""
    source, frame, chain = key.rsplit(":", 2)
    return source, int(frame), int(chain)


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
            for status in found:
                if status:
                    statuses[status] += 1
                    statuses["_skipped"] += 1
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

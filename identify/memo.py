"""Bounded memos of answers derived from the reference table, for million-frame runs.

The reference table is opened read-only and immutable, so an answer derived
from it and from exact values (the invariants of a PD code, a polynomial)
never changes and may be kept.  A memo keeps the most recently used answers,
at most a fixed number, so memory stays bounded however many frames a run
has.  Only dictionary operations that are atomic in CPython are used: callers
in several threads at worst compute an answer twice.
"""

from __future__ import annotations

import weakref
from collections import OrderedDict
from typing import Callable, Hashable

__all__ = ["recall", "memo_for"]

_MISSING = object()


def memo_for(memos: "weakref.WeakKeyDictionary", table) -> OrderedDict:
    """The memo of ``table`` in ``memos`` (one per table object, dropped with it)."""
    memo = memos.get(table)
    if memo is None:
        memo = memos.setdefault(table, OrderedDict())
    return memo


def recall(memo: OrderedDict, key: Hashable, size: int, compute: Callable[[], object]):
    """``memo[key]``, computed by ``compute()`` and kept when missing.

    The least recently used answers are dropped past ``size`` entries.  An
    exception from ``compute`` (for example the wall-time budget running out)
    propagates and nothing is kept.  Callers copy what they hand out when the
    answer is mutable.
    """
    found = memo.pop(key, _MISSING)
    if found is _MISSING:
        found = compute()
    memo[key] = found
    while len(memo) > size:
        try:
            memo.popitem(last=False)
        except KeyError:  # emptied meanwhile by another thread
            break
    return found

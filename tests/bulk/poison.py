"""Work functions for the worker-pool tests: importable by spawned workers.

Each classifies the item ``"poison"`` badly in one way (hangs, dies, runs out
of memory) and every other item quickly, as a one-row result echoing its key.
"""

from __future__ import annotations

import os
import signal
import time


def _row(item, status="identified", error=None):
    return [{"key": item.key, "status": status, "error": error}]


def hangs(item, options):
    if item.payload == "poison":
        time.sleep(3600)
    return _row(item)


def dies(item, options):
    if item.payload == "poison":
        os.kill(os.getpid(), signal.SIGKILL)
    return _row(item)


def exits(item, options):
    if item.payload == "poison":
        os._exit(3)
    return _row(item)


def eats_memory(item, options):
    if item.payload == "poison":
        try:
            _ = bytearray(8 << 30)   # far above the cap given in the test
        except MemoryError:
            return None
    return _row(item)


def slow(item, options):
    time.sleep(0.01)
    return _row(item)


def fail_rows(item, reason):
    return _row(item, "error", reason)


#: Set by :func:`warm` in the process that runs it (the parent, before forking).
WARMED = {"pid": None}


def warm(first_item):
    WARMED["pid"] = os.getpid()


def reports_warm_up(item, options):
    """A row saying which process warmed up the worker running it (None: none did)."""
    return [{"key": item.key, "status": "identified", "error": None,
             "warmed_by": WARMED["pid"], "worker": os.getpid()}]


def echo_size(item, options):
    """A big row per item at once, whatever the payload's size (a big frame, quickly done)."""
    return [{"key": item.key, "status": "identified", "error": None,
             "size": len(item.payload), "padding": "y" * 20_000}]

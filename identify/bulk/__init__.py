"""Bulk classification: many diagrams and many frames, in parallel, resumable, into tables.

The path of the data: input files -> items (:mod:`.sources`) -> one row per
item (:mod:`.rows`) -> chunks written transactionally (:mod:`.sinks`), skipping
what is already there (:mod:`.resume`), run on local processes or Dask
(:mod:`.runner`) -> knot spectrum and fits (:mod:`.summary`) -> figures
(:mod:`.plots`).
"""

from __future__ import annotations

from importlib import import_module

__all__ = [
    "classify",
    "RunReport",
    "Item",
    "iter_items",
    "classify_item",
    "COLUMNS",
    "knot_spectrum",
    "unknot_fit",
    "wilson_interval",
]

# Loaded on first use, so that the command line starts without them.
_WHERE = {"classify": "runner", "RunReport": "runner", "Item": "sources",
          "iter_items": "sources", "classify_item": "rows", "COLUMNS": "rows",
          "knot_spectrum": "summary", "unknot_fit": "summary", "wilson_interval": "summary"}


def __getattr__(name: str):
    if name in _WHERE:
        return getattr(import_module(f".{_WHERE[name]}", __name__), name)
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")

"""Bulk classification: many diagrams and many frames, in parallel, resumable, into tables.

The path of the data: input files -> items (:mod:`.sources`) -> one row per
item (:mod:`.rows`) -> chunks written transactionally (:mod:`.sinks`), skipping
what is already there (:mod:`.resume`), run on local processes or Dask
(:mod:`.runner`) -> knot spectrum and fits (:mod:`.summary`) -> figures
(:mod:`.plots`).
"""

from __future__ import annotations

from .rows import COLUMNS, classify_item
from .runner import RunReport, classify
from .sources import Item, iter_items
from .summary import knot_spectrum, unknot_fit, wilson_interval

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

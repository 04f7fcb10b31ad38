"""A progress line for long runs: items done, rate, time left.

Shown on a terminal only (or when forced); quiet otherwise, so logs and pipes
stay clean.
"""

from __future__ import annotations

import sys
import time
from typing import TextIO

__all__ = ["Progress"]


class Progress:
    """Report progress of ``total`` items on one self-overwriting line.

    Parameters
    ----------
    total : int or None
        Number of items, if known.
    label : str
    stream : file, default sys.stderr
    enabled : bool, optional
        Default: only when ``stream`` is a terminal.
    """

    def __init__(self, total: int | None, label: str = "", stream: TextIO | None = None,
                 enabled: bool | None = None, every: float = 0.2):
        self.total = total
        self.label = label
        self.stream = stream or sys.stderr
        self.enabled = self.stream.isatty() if enabled is None else enabled
        self.done = 0
        self.start = time.monotonic()
        self._last = 0.0
        self.every = every

    def update(self, n: int = 1, detail: str = "") -> None:
        self.done += n
        if not self.enabled:
            return
        now = time.monotonic()
        if now - self._last < self.every and (self.total is None or self.done < self.total):
            return
        self._last = now
        elapsed = max(now - self.start, 1e-9)
        rate = self.done / elapsed
        parts = [f"{self.label} {self.done}" + (f"/{self.total}" if self.total else "")]
        parts.append(f"{rate:.1f}/s")
        if self.total and rate > 0:
            left = (self.total - self.done) / rate
            parts.append(f"{left:.0f}s left")
        if detail:
            parts.append(detail)
        self.stream.write("\r" + "  ".join(parts)[:100].ljust(100))
        self.stream.flush()

    def close(self) -> None:
        if self.enabled:
            elapsed = time.monotonic() - self.start
            self.stream.write(f"\r{self.label} {self.done} done in {elapsed:.1f}s".ljust(100)
                              + "\n")
            self.stream.flush()

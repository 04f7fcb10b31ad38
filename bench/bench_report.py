"""Benchmark: the HTML report of a 10,000-row classify output.

Writes 10,000 made-up trajectory rows (three lengths, a few types, some
errors) through the CSV sink, then builds the report 3 times and prints the
median seconds and the file size, beside a 1,000-row report for the ratio.
The targets are under 30 s and under 20 MB at 10,000 rows.

    python bench/bench_report.py
"""

from __future__ import annotations

import statistics
import sys
import tempfile
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from knotsift.drawing.report import write_report  # noqa: E402
from tests.drawing.runs import write_run  # noqa: E402


def main() -> None:
    with tempfile.TemporaryDirectory() as tmp:
        results = {}
        for rows in (1_000, 10_000):
            out = Path(tmp) / f"run{rows}.csv"
            write_run(out, rows=rows)
            write_report(out, Path(tmp) / "warm.html")            # imports, table, fonts
            times = []
            for _ in range(3):
                t0 = time.perf_counter()
                html = write_report(out, Path(tmp) / f"report{rows}.html")
                times.append(time.perf_counter() - t0)
            results[rows] = (statistics.median(times), html.stat().st_size)
        base = results[1_000][0]
        for rows, (sec, size) in results.items():
            print(f"{rows:6d} rows: {sec:.2f} s (x{sec / base:.1f}), {size / 1e6:.2f} MB")


if __name__ == "__main__":
    main()

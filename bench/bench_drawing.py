"""Benchmark: drawing large diagrams (layout, geometric check and SVG text).

Random knot diagrams of about 25, 50 and 100 crossings (closures of random
braid words, seeded, not simplified) are laid out and written as SVG 3 times
each; the median seconds are printed with the ratio to the smallest.  The
target is under 2 s at 100 crossings.

    python bench/bench_drawing.py
"""

from __future__ import annotations

import random
import statistics
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from knotsift.drawing.layout import layout_diagram  # noqa: E402
from knotsift.drawing.render import svg_text  # noqa: E402
from tests.strategies import braid_closure, random_knot_braid  # noqa: E402


def draw(diagram) -> int:
    return len(svg_text([("", layout_diagram(diagram))]))


def main() -> None:
    rng = random.Random(2026)
    draw(braid_closure(random_knot_braid(rng, 4, 12)))      # warm-up: imports
    base = None
    for length, strands in ((25, 4), (50, 5), (100, 5)):
        d = braid_closure(random_knot_braid(rng, strands, length))
        times = []
        for _ in range(3):
            t0 = time.perf_counter()
            size = draw(d)
            times.append(time.perf_counter() - t0)
        med = statistics.median(times)
        base = base or med
        print(f"{d.number_of_crossings():4d} crossings: {med:.3f} s  (x{med / base:.1f}), "
              f"SVG {size / 1024:.0f} KiB")


if __name__ == "__main__":
    main()

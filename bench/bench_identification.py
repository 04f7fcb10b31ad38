"""Benchmark (slow, not a CI test): the identification step, new path against old, same inputs.

``identify_diagram`` (fingerprint -> table lookups -> connected sums ->
result and notes) is timed on its own, given each diagram and its simplified
form, so the geometry and the simplification are the same for both paths:

* ``rings200`` / ``rings1000``: seeded random equilateral rings
  (bench/random_polygons.py) of 200 and 1,000 beads, through KMT, projection
  and ``simplify`` (done once, here, with the current knotsift);
* ``table``: every knot form of the shipped table (each chirality), its PD
  code scrambled by seeded random Reidemeister moves and simplified.

Each set goes through a worker process of the current knotsift and one of an
older knotsift (``--old DIR``: the package folder under DIR, made e.g. with
``git archive main identify | tar -x -C DIR`` and ``ln -s identify
DIR/knotsift``), alternately, ``--rounds`` times; an item's time is its
least CPU time over the rounds (the machine is shared and noisy).  The first
item of each worker also pays the once-per-process costs (opening the table,
first uses); it is reported apart as "first".

It prints, per set, the median and mean CPU milliseconds per item, old and
new and their ratio, and how many results (``to_dict()``, the whole JSON
answer) are identical; any difference is listed and makes the exit code 1.

    python bench/bench_identification.py --old DIR [--frames 40] [--rounds 2]
"""

from __future__ import annotations

import argparse
import json
import os
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent


def _ring_inputs(n: int, frames: int) -> list[dict]:
    """Diagram and simplified diagram of ``frames`` seeded random rings of ``n`` beads."""
    import numpy as np

    sys.path.insert(0, str(HERE))
    from random_polygons import random_polygon

    from knotsift.curves.frame import Chain, prepare_chains
    from knotsift.curves.kmt import KMT_TOL, kmt_reduce
    from knotsift.curves.projection import PROJECTION_TOL, project
    from knotsift.simplify import simplify

    out = []
    for k in range(frames):
        x = random_polygon(n, np.random.default_rng([1, n, k]), sweeps=10)
        y = prepare_chains([Chain("A", x, True)]).chains[0].coords
        reduced = kmt_reduce([(y, True)], tol=KMT_TOL).chains
        d = project(reduced, np.random.default_rng([k, 0]), tol=PROJECTION_TOL,
                    directions=3).diagram
        out.append(_item(f"ring {n} #{k}", d, simplify(d)))
    return out


def _table_inputs(moves: int) -> list[dict]:
    """Every knot form of the table, scrambled (seeded) and simplified."""
    import random

    from knotsift.diagram import Diagram
    from knotsift.reidemeister import scramble
    from knotsift.simplify import simplify
    from knotsift.table import open_table

    out = []
    for k, form in enumerate(open_table().all_forms()):
        pd = form.pd()
        d = scramble(Diagram(pd, free_loops=0 if pd else 1), moves, random.Random(k))
        out.append(_item(form.label, d, simplify(d)))
    return out


def _item(label: str, d, s) -> dict:
    return {"label": label, "pd": d.pd_code(), "loops": d.free_loops,
            "simple": s.pd_code(), "simple_loops": s.free_loops}


def worker(path: str) -> None:
    """Identify every item of the JSON file ``path``; one JSON line per item."""
    from knotsift.diagram import Diagram
    from knotsift.identification import identify_diagram
    from knotsift.table import open_table

    items = json.loads(Path(path).read_text())
    cpu = time.process_time()
    table = open_table()
    opened = time.process_time() - cpu
    for k, it in enumerate(items):
        d = Diagram(it["pd"], it["loops"])
        s = Diagram(it["simple"], it["simple_loops"])
        cpu = time.process_time()
        r = identify_diagram(d, table, simplified=s)
        used = time.process_time() - cpu + (opened if k == 0 else 0.0)
        print(json.dumps({"k": k, "cpu": used, "result": r.to_dict()}), flush=True)


def _run(path: str, old: str | None) -> list[dict]:
    env = dict(os.environ)
    if old:
        env["PYTHONPATH"] = old + os.pathsep + env.get("PYTHONPATH", "")
    proc = subprocess.run([sys.executable, str(Path(__file__).resolve()), "--worker", path],
                          env=env, capture_output=True, text=True)
    if proc.returncode:
        raise SystemExit(f"worker failed ({'old' if old else 'new'}):\n{proc.stderr[-3000:]}")
    return [json.loads(line) for line in proc.stdout.splitlines() if line.startswith("{")]


def compare(name: str, items: list[dict], old: str, rounds: int) -> bool:
    """Run one set on both paths; print the figures; True when every result is identical."""
    with tempfile.NamedTemporaryFile("w", suffix=".json", delete=False) as fh:
        json.dump(items, fh)
    try:
        best = {"old": [float("inf")] * len(items), "new": [float("inf")] * len(items)}
        results = {}
        for _ in range(rounds):
            for which, where in (("old", old), ("new", None)):
                rows = _run(fh.name, where)
                results[which] = [r["result"] for r in rows]
                for r in rows:
                    best[which][r["k"]] = min(best[which][r["k"]], r["cpu"])
    finally:
        os.unlink(fh.name)
    same = [a == b for a, b in zip(results["old"], results["new"])]
    ms = {k: [1000 * t for t in v] for k, v in best.items()}

    def fig(v):
        rest = v[1:] or v
        return statistics.median(rest), statistics.fmean(rest), v[0]

    (om, oa, of), (nm, na, nf) = fig(ms["old"]), fig(ms["new"])
    print(f"{name:10s} {len(items):4d} items  median ms old {om:7.2f} new {nm:7.2f} "
          f"(x{om / nm:5.2f})  mean old {oa:7.2f} new {na:7.2f} (x{oa / na:5.2f})  "
          f"first old {of:7.1f} new {nf:7.1f}  identical {sum(same)}/{len(same)}")
    for it, ok, a, b in zip(items, same, results["old"], results["new"]):
        if not ok:
            keys = [k for k in a if a[k] != b.get(k)]
            print(f"  DIFFERENT {it['label']}: {keys}: old {[a[k] for k in keys]!s:.300} "
                  f"new {[b[k] for k in keys]!s:.300}")
    return all(same)


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--old", metavar="DIR",
                    help="folder holding the older knotsift package (see the module doc)")
    ap.add_argument("--frames", type=int, default=40, help="ring frames per size")
    ap.add_argument("--rounds", type=int, default=2, help="runs per path; least time kept")
    ap.add_argument("--moves", type=int, default=12, help="scrambling moves per table form")
    ap.add_argument("--sets", default="rings200,rings1000,table")
    ap.add_argument("--worker", help=argparse.SUPPRESS)
    args = ap.parse_args(argv)
    if args.worker:
        worker(args.worker)
        return 0
    if not args.old:
        ap.error("--old DIR is required (the older knotsift to compare with)")
    makers = {"rings200": lambda: _ring_inputs(200, args.frames),
              "rings1000": lambda: _ring_inputs(1000, args.frames),
              "table": lambda: _table_inputs(args.moves)}
    ok = True
    for name in args.sets.split(","):
        ok &= compare(name, makers[name](), args.old, args.rounds)
    return 0 if ok else 1


if __name__ == "__main__":
    sys.exit(main())

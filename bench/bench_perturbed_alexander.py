"""Benchmark: rho_1, its modular hash, and the FLINT paths, side by side with Jones.

Everything is measured in one run, so the ratios are fair on a noisy machine:

1. rho_1 of random 3-braid knot diagrams of 100 crossings (median of 5
   diagrams), beside the Jones polynomial of the same diagrams; targets:
   rho_1 under 0.3 s, and under 10 s at 300 crossings (``--big``);
2. the hash (rho_1 at 2 points modulo primes) of a 1,000-crossing diagram;
   target under 5 s;
3. the fingerprint of every reference form of the shipped table, as before
   rho_1 (Jones, Alexander by fraction-free or modular elimination,
   determinant by modular elimination, signature) and now (the same plus
   rho_1 and the double-cover homology, Delta from rho_1's matrix, FLINT
   determinants); target: now at most 2x before;
4. the Alexander polynomial and the determinant, old method and FLINT method,
   on diagrams of 12 to 200 crossings (median of 7 calls; outputs compared
   for equality).

    python bench/bench_perturbed_alexander.py [--big]
"""

from __future__ import annotations

import random
import statistics
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from knotsift.diagram import Diagram  # noqa: E402
from knotsift.invariants.alexander import alexander_polynomial  # noqa: E402
from knotsift.invariants.determinant import determinant  # noqa: E402
from knotsift.invariants.elimination import integer_determinant  # noqa: E402
from knotsift.invariants.fingerprint import fingerprint  # noqa: E402
from knotsift.invariants.goeritz import goeritz_forms  # noqa: E402
from knotsift.invariants.jones import jones_polynomial  # noqa: E402
from knotsift.invariants.perturbed_alexander import rho_1, rho_1_hash  # noqa: E402
from knotsift.invariants.signature import knot_signature  # noqa: E402

from tests.strategies import braid_closure, random_knot_braid  # noqa: E402


def timed(fn, *args, **kwargs):
    t0 = time.perf_counter()
    value = fn(*args, **kwargs)
    return value, time.perf_counter() - t0


def median_timed(fn, *args, repeats: int = 7, **kwargs):
    """The value and the median time of ``repeats`` calls."""
    runs = [timed(fn, *args, **kwargs) for _ in range(repeats)]
    return runs[0][0], statistics.median(t for _, t in runs)


def old_determinant(d: Diagram) -> int:
    (form,) = goeritz_forms(d)
    rows = [{c: v for c, v in enumerate(r) if v} for r in form.matrix]
    return abs(integer_determinant(rows, len(form.matrix))) if form.matrix else 1


def old_fingerprint(d: Diagram) -> tuple:
    """The fingerprint as computed before rho_1 (methods of that time)."""
    n = d.number_of_crossings()
    jones = jones_polynomial(d)
    alex = alexander_polynomial(d, method="bareiss" if n <= 12 else "modular")
    return jones, alex, abs(alex.evaluate(-1)), knot_signature(d)


def part_rho(rng: random.Random, big: bool) -> None:
    print("1. rho_1 against Jones on random 3-braid knots")
    print("   crossings  rho_1_s  jones_s  deg(rho_1)")
    sizes = [(100, 5)] + ([(300, 1)] if big else [])
    for n, count in sizes:
        rows = []
        for _ in range(count):
            d = braid_closure(random_knot_braid(rng, 3, n), 3)
            value, t_rho = timed(rho_1, d)
            _, t_jones = timed(jones_polynomial, d)
            rows.append((t_rho, t_jones, 0 if value.is_zero() else int(value.max_exponent)))
            print(f"   {d.number_of_crossings():9d}  {t_rho:7.3f}  {t_jones:7.3f}  "
                  f"{rows[-1][2]:6d}")
        print(f"   median at {n}: rho_1 {statistics.median(r[0] for r in rows):.3f} s, "
              f"Jones {statistics.median(r[1] for r in rows):.3f} s")


def part_hash(rng: random.Random) -> None:
    d = braid_closure(random_knot_braid(rng, 3, 1000), 3)
    _, t = timed(rho_1_hash, d)
    print(f"2. hash of a {d.number_of_crossings()}-crossing diagram (2 points): {t:.2f} s")


def part_table() -> None:
    from knotsift.table import open_table

    forms = [f for f in open_table().all_forms() if f.is_reference and f.components == 1]
    diagrams = [Diagram.from_pd(f.pd()) for f in forms]
    t0 = time.perf_counter()
    for d in diagrams:
        old_fingerprint(d)
    before = time.perf_counter() - t0
    t0 = time.perf_counter()
    for d in diagrams:
        fingerprint(d, simplified=True)
    now = time.perf_counter() - t0
    print(f"3. fingerprint of {len(diagrams)} table knots: before {before:.2f} s, "
          f"now {now:.2f} s, ratio {now / before:.2f}")


def part_flint(rng: random.Random) -> None:
    print("4. Alexander and determinant, old method against FLINT (same outputs)")
    print("   crossings  alex_old  alex_new  det_old  det_new")
    for n, strands in ((12, 3), (30, 4), (40, 4), (60, 5), (100, 6), (200, 5)):
        d = braid_closure(random_knot_braid(rng, strands, n), strands)
        old_method = "bareiss" if n <= 12 else "modular"
        a_old, ta_old = median_timed(alexander_polynomial, d, method=old_method)
        a_new, ta_new = median_timed(alexander_polynomial, d)
        d_old, td_old = median_timed(old_determinant, d)
        d_new, td_new = median_timed(determinant, d)
        assert a_old == a_new and d_old == d_new
        print(f"   {d.number_of_crossings():9d}  {ta_old:8.4f}  {ta_new:8.4f}  "
              f"{td_old:7.4f}  {td_new:7.4f}")


def main() -> None:
    rng = random.Random(20261203)
    rho_1(braid_closure([1, 1, 1]))  # imports and primes
    old_determinant(braid_closure([1, 1, 1]))
    part_rho(rng, "--big" in sys.argv)
    part_hash(rng)
    part_table()
    part_flint(rng)


if __name__ == "__main__":
    main()

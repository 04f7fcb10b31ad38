"""The knot spectrum, Wilson intervals and the fit of P(unknot) = exp(-N/N0)."""

from __future__ import annotations

import math

import pandas as pd
import pytest

from knotsift.bulk.runner import classify
from knotsift.bulk.summary import (
    knot_spectrum,
    read_results,
    unknot_fit,
    unknot_points,
    wilson_interval,
)
from knotsift.errors import KnotsiftError

from .inputs import write_mixed

# Wilson score intervals (95%, no continuity correction), method 3 of Newcombe 1998,
# "Two-sided confidence intervals for the single proportion: comparison of seven
# methods", Statistics in Medicine 17, 857-872, Table II, for the examples of its
# Table I (values from memory, to 4 decimals).
NEWCOMBE_1998_WILSON = [
    (81, 263, 0.2553, 0.3662),
    (15, 148, 0.0624, 0.1605),
    (0, 20, 0.0000, 0.1611),
    (1, 29, 0.0061, 0.1718),
]


@pytest.mark.parametrize("k, n, low, high", NEWCOMBE_1998_WILSON)
def test_wilson_interval_newcombe_1998(k, n, low, high):
    """The Wilson interval reproduces Newcombe's worked examples to 4 decimals."""
    lo, hi = wilson_interval(k, n)
    assert (round(lo, 4), round(hi, 4)) == (low, high)


@pytest.mark.parametrize("k, n", [(0, 7), (3, 10), (81, 263), (50, 50)])
def test_wilson_interval_swaps_under_complement(k, n):
    """The interval for failures is 1 minus the interval for successes, reversed."""
    lo, hi = wilson_interval(k, n)
    lo2, hi2 = wilson_interval(n - k, n)
    assert lo == pytest.approx(1 - hi2, abs=1e-12) and hi == pytest.approx(1 - lo2, abs=1e-12)
    assert lo <= k / n <= hi


def test_wilson_interval_rejects_impossible_counts():
    """k must lie in 0..n and n be positive."""
    for k, n in [(1, 0), (-1, 5), (6, 5)]:
        with pytest.raises(KnotsiftError):
            wilson_interval(k, n)


@pytest.fixture(scope="module")
def mixed_rows(tmp_path_factory):
    d = tmp_path_factory.mktemp("mixed")
    out = d / "r.sqlite"
    classify([write_mixed(d / "mixed.txt")], out, workers=1, progress=False)
    return read_results(out)


def test_knot_spectrum_of_known_mixed_batch_is_exact(mixed_rows):
    """3 trefoils, 2 figure-eights, 5 unknots and 1 unreadable code: exact fractions of 10,
    with the unreadable one counted apart."""
    spec = knot_spectrum(mixed_rows)
    got = {r.type: (r.count, r.total, r.fraction, r.failed) for r in spec.itertuples()}
    assert got == {"0_1": (5, 10, 0.5, 1), "3_1": (3, 10, 0.3, 1), "4_1": (2, 10, 0.2, 1)}
    for r in spec.itertuples():
        assert (r.low, r.high) == wilson_interval(r.count, 10)
    assert list(spec["type"]) == ["0_1", "3_1", "4_1"]


def test_knot_spectrum_merges_mirror_images(tmp_path):
    """A trefoil and its mirror count apart, or together with mirrors='merge'."""
    src = tmp_path / "m.txt"
    src.write_text("braid: s1^3\nbraid: s1^-3\nbraid: s1^-3\n")
    out = tmp_path / "r.csv"
    classify([src], out, workers=1, progress=False)
    df = read_results(out)
    kept = knot_spectrum(df).set_index("type")["count"].to_dict()
    assert sorted(kept.values()) == [1, 2] and set(kept) == {"3_1", "3_1*"}
    assert knot_spectrum(df, mirrors="merge").set_index("type")["count"].to_dict() == {"3_1": 3}


def test_knot_spectrum_by_filename_and_by_field(tmp_path):
    """Groups read from the file name by a regex, or from a column of the code table."""
    a = tmp_path / "run_T300.txt"
    a.write_text("DT: 4 6 2\nbraid: s1\n")
    b = tmp_path / "run_T310.csv"
    b.write_text("label,code,salt\nx,DT: 4 6 2,high\ny,DT: 4 6 8 2,low\n")
    out = tmp_path / "r.parquet"
    classify([a, b], out, workers=1, progress=False)
    df = read_results(out)
    spec = knot_spectrum(df, by_filename=r"_T(\d+)")
    assert {(r.group, r.type, r.count, r.total) for r in spec.itertuples()} == {
        ("300", "0_1", 1, 2), ("300", "3_1", 1, 2), ("310", "3_1", 1, 2), ("310", "4_1", 1, 2)}
    by_salt = knot_spectrum(df, by="salt")
    assert {(r.group, r.type) for r in by_salt.itertuples()} == {
        ("(none)", "0_1"), ("(none)", "3_1"), ("high", "3_1"), ("low", "4_1")}
    with pytest.raises(KnotsiftError, match="no column or code-table field"):
        knot_spectrum(df, by="pressure")


def _lengths_frame(counts: dict[int, tuple[int, int]], error_rows: int = 0) -> pd.DataFrame:
    """Rows with n_beads = N: ``unknots`` unknots and the rest trefoils, per length."""
    rows = []
    for N, (n, u) in counts.items():
        rows += [{"status": "identified", "knot_type": "0_1", "n_beads": N}] * u
        rows += [{"status": "identified", "knot_type": "3_1", "n_beads": N}] * (n - u)
    rows += [{"status": "error", "knot_type": None, "n_beads": 100}] * error_rows
    return pd.DataFrame(rows)


@pytest.mark.parametrize("method", ["mle", "wls"])
def test_unknot_fit_recovers_exact_exponential(method):
    """Counts lying exactly on P = 2^(-N/100) give N0 = 100/ln 2 with either fit."""
    df = _lengths_frame({100: (800, 400), 200: (800, 200), 300: (800, 100)}, error_rows=7)
    fit = unknot_fit(df, method=method)
    assert fit["N0"] == pytest.approx(100 / math.log(2), rel=1e-9)
    assert [p["trials"] for p in fit["points"]] == [800, 800, 800]


def test_unknot_fit_error_is_observed_information():
    """The MLE standard error of 1/N0 is 1/sqrt of minus the log-likelihood's curvature."""
    counts = {50: (300, 210), 150: (300, 95), 400: (300, 12)}
    fit = unknot_fit(_lengths_frame(counts))

    def loglik(lam):
        return sum(-u * lam * N + (n - u) * math.log(-math.expm1(-lam * N))
                   for N, (n, u) in counts.items())

    lam, h = fit["rate"], 1e-6 * fit["rate"]
    curvature = (loglik(lam + h) - 2 * loglik(lam) + loglik(lam - h)) / h ** 2
    assert fit["rate_error"] == pytest.approx(1 / math.sqrt(-curvature), rel=1e-4)
    assert fit["N0_error"] == pytest.approx(fit["rate_error"] / lam ** 2)
    h2 = 1e-4 * lam
    assert loglik(lam) > loglik(lam + h2) and loglik(lam) > loglik(lam - h2)


def test_unknot_fit_refuses_unidentifiable_data():
    """One length, or every chain unknotted, cannot determine N0."""
    with pytest.raises(KnotsiftError, match="at least two distinct lengths"):
        unknot_fit(_lengths_frame({100: (10, 5)}))
    with pytest.raises(KnotsiftError, match="every chain is unknotted"):
        unknot_fit(_lengths_frame({100: (10, 10), 200: (5, 5)}))


def test_unknot_points_leave_out_errors():
    """Failed rows are not trials."""
    pts = unknot_points(_lengths_frame({100: (10, 4)}, error_rows=3))
    assert pts.to_dict(orient="records") == [
        {"N": 100, "trials": 10, "unknots": 4, "p_unknot": 0.4,
         "low": wilson_interval(4, 10)[0], "high": wilson_interval(4, 10)[1]}]

"""The knot spectrum of a run: counts, fractions with Wilson intervals, and P(unknot) against N.

The spectrum counts the rows of each knot type within a group (a column, or a
condition read from the file name).  Rows with status ``error`` carry no
knot type: they are left out of the denominators and counted separately.  A
row's type is its knot label (``3_1``, ``3_1*``), its chirality-free knot
(``mirrors="merge"``), ``"A or B"`` when ambiguous, ``not in table``, or
``undetermined`` (an open chain whose closures give no majority type).

When chain lengths vary, the unknotting probability is fitted by the usual
exponential law P(unknot) = exp(-N/N0) (common practice in polymer physics).
"""

from __future__ import annotations

import json
import math
import re

from ..errors import KnotsiftError

__all__ = ["wilson_interval", "Z95", "knot_types", "group_labels", "knot_spectrum",
           "unknot_points", "unknot_fit", "read_results", "spectrum_text", "row_unit",
           "link_spectrum", "link_spectrum_text"]

#: The two-sided 95% standard normal quantile.
Z95 = 1.959963984540054
UNKNOT = "0_1"


def wilson_interval(k: int, n: int, z: float = Z95) -> tuple[float, float]:
    """The Wilson score interval for a binomial proportion k/n.

    Parameters
    ----------
    k, n : int
        Successes and trials, 0 <= k <= n, n >= 1.
    z : float
        Normal quantile (default: 95% two-sided).

    Returns
    -------
    (low, high) : tuple of float

    Raises
    ------
    KnotsiftError
        If n < 1 or k is outside 0..n.

    Examples
    --------
    >>> lo, hi = wilson_interval(0, 20)
    >>> round(lo, 4), round(hi, 4)
    (0.0, 0.1611)

    References
    ----------
    E. B. Wilson (1927), "Probable inference, the law of succession, and
    statistical inference", J. Amer. Statist. Assoc. 22, 209-212.
    R. G. Newcombe (1998), "Two-sided confidence intervals for the single
    proportion: comparison of seven methods", Statistics in Medicine 17, 857-872.
    """
    if n < 1 or not 0 <= k <= n:
        raise KnotsiftError(f"a proportion needs 0 <= k <= n and n >= 1, got k={k}, n={n}",
                            value=(k, n))
    p = k / n
    z2 = z * z
    centre = p + z2 / (2 * n)
    half = z * math.sqrt(p * (1 - p) / n + z2 / (4 * n * n))
    den = 1 + z2 / n
    low = 0.0 if k == 0 else max(0.0, (centre - half) / den)   # exact ends: no rounding off 0, 1
    high = 1.0 if k == n else min(1.0, (centre + half) / den)
    return low, high


def knot_types(df, mirrors: str = "keep"):
    """The type of each row as a Series (None for errors); ``mirrors`` is keep or merge."""
    if mirrors not in ("keep", "merge"):
        raise KnotsiftError(f"mirrors must be 'keep' or 'merge', got {mirrors!r}", value=mirrors)
    name = df["knot"] if mirrors == "keep" else df["knot_type"]
    key_column = "type_key" if mirrors == "keep" else "type_key_unoriented"
    keys = df[key_column] if key_column in df.columns else [None] * len(df)
    out = []
    for status, knot, cands, key in zip(df["status"], name, df["candidates"], keys,
                                        strict=True):
        if status == "identified":
            out.append(knot)
        elif status == "ambiguous":
            out.append(cands if isinstance(cands, str) and cands else "ambiguous")
        elif status in ("not in table", "undetermined", "too complex"):
            # a knot beyond the table is counted by its type key, like a name
            out.append(key if isinstance(key, str) and key else status)
        else:
            out.append(None)
    import pandas as pd

    return pd.Series(out, index=df.index, dtype=object)


def group_labels(df, by: str | None = None, by_filename: str | None = None):
    """The group of each row: a column, a field of a code table, or a regex on the source.

    ``by_filename`` is a regular expression searched in the source path; its
    first group (or the whole match) is the condition.  Rows it does not
    match are in group ``"(no match)"``.
    """
    import pandas as pd

    if by and by_filename:
        raise KnotsiftError("give one of by and by_filename, not both")
    if by_filename:
        try:
            rx = re.compile(by_filename)
        except re.error as exc:
            raise KnotsiftError(f"--by-filename is not a valid regular expression: {exc}",
                                value=by_filename) from None
        out = []
        for src in df["source"]:
            m = rx.search(str(src))
            out.append((m.group(1) if m.groups() else m.group(0)) if m else "(no match)")
        return pd.Series(out, index=df.index, dtype=object)
    if not by:
        return pd.Series(["all"] * len(df), index=df.index, dtype=object)
    if by in df.columns:
        return df[by].map(lambda v: "(none)" if v is None or v != v else str(v))
    out = []
    for fields in df["fields"]:
        value = json.loads(fields).get(by) if isinstance(fields, str) and fields else None
        out.append("(none)" if value is None else str(value))
    if all(v == "(none)" for v in out):
        raise KnotsiftError(f"no column or code-table field named {by!r}; columns: "
                            f"{', '.join(df.columns)}", value=by)
    return pd.Series(out, index=df.index, dtype=object)


def _group_key(value):
    """Sort groups numerically when they look like numbers."""
    try:
        return (0, float(value), "")
    except (TypeError, ValueError):
        return (1, 0.0, str(value))


def _type_key(t: str):
    m = re.fullmatch(r"(\d+)_(\d+)(\*?)", t)
    if m:
        return (0, int(m.group(1)), int(m.group(2)), m.group(3), t)
    if t.startswith("K") and "." in t:  # type keys after names and composites
        return (3, 0, 0, "", t)
    return (1 if "#" in t else 2, 0, 0, "", t)


def knot_spectrum(df, by: str | None = None, by_filename: str | None = None,
                  mirrors: str = "keep"):
    """Counts and fractions of knot types per group, with Wilson 95% intervals.

    Parameters
    ----------
    df : pandas.DataFrame
        Rows of a run (:func:`read_results`).
    by, by_filename
        Grouping, see :func:`group_labels`; default one group ``all``.
    mirrors : str
        ``keep`` counts ``3_1`` and ``3_1*`` apart; ``merge`` counts knot types.

    Returns
    -------
    pandas.DataFrame
        Columns group, type, count, total, fraction, low, high, failed (errors in
        the group, not in ``total``), ordered by group then crossing number.
    """
    import pandas as pd

    types = knot_types(df, mirrors)
    groups = group_labels(df, by, by_filename)
    records = []
    for g in sorted(set(groups), key=_group_key):
        in_group = groups == g
        t = types[in_group]
        failed = int(t.isna().sum())
        counts = t.dropna().value_counts()
        total = int(counts.sum())
        for name in sorted(counts.index, key=_type_key):
            k = int(counts[name])
            lo, hi = wilson_interval(k, total)
            records.append({"group": g, "type": name, "count": k, "total": total,
                            "fraction": k / total, "low": lo, "high": hi, "failed": failed})
        if total == 0:
            records.append({"group": g, "type": None, "count": 0, "total": 0,
                            "fraction": float("nan"), "low": float("nan"),
                            "high": float("nan"), "failed": failed})
    return pd.DataFrame.from_records(records, columns=["group", "type", "count", "total",
                                                       "fraction", "low", "high", "failed"])


def link_spectrum(df, by: str | None = None, by_filename: str | None = None):
    """Link spectra: per group and number of rings, counts by node number and by link type.

    One count per linked object: per frame for trajectories (its rings form
    one link), per row for codes.  ``nodes`` is the crossing number of the
    identified link (the band of a gel separating catenanes by node number);
    links not identified count under ``nodes`` None with their status.
    Wilson 95% intervals as for knots, within each (group, number of rings).

    Returns
    -------
    pandas.DataFrame
        Columns group, components, nodes, type, count, total, fraction, low, high.
    """
    import pandas as pd

    columns = ["group", "components", "nodes", "type", "count", "total", "fraction", "low",
               "high"]
    if "link_components" not in df.columns:
        return pd.DataFrame(columns=columns)
    has = df[df["link_components"].notna()]
    if has.empty:
        return pd.DataFrame(columns=columns)
    groups = group_labels(has, by, by_filename)
    items: dict = {}
    for idx, row in has.iterrows():
        key = (row["source"], row["frame"]) if row["kind"] == "frame" else row["key"]
        if key in items:
            continue
        nodes = row["link_crossings"]
        nodes = None if nodes is None or nodes != nodes else int(nodes)
        kind = row["link_type"] if isinstance(row["link_type"], str) else str(row["link"])
        items[key] = (groups[idx], int(row["link_components"]), nodes, kind)
    records = []
    by_gc: dict = {}
    for g, m, nodes, kind in items.values():
        by_gc.setdefault((g, m), []).append((nodes, kind))
    for (g, m) in sorted(by_gc, key=lambda gm: (_group_key(gm[0]), gm[1])):
        entries = by_gc[(g, m)]
        total = len(entries)
        counts: dict = {}
        for nodes, kind in entries:
            counts[(nodes, kind)] = counts.get((nodes, kind), 0) + 1
        for (nodes, kind), k in sorted(counts.items(), key=lambda kv: (
                kv[0][0] is None, kv[0][0] or 0, kv[0][1])):
            lo, hi = wilson_interval(k, total)
            records.append({"group": g, "components": m, "nodes": nodes, "type": kind,
                            "count": k, "total": total, "fraction": k / total, "low": lo,
                            "high": hi})
    return pd.DataFrame.from_records(records, columns=columns)


def link_spectrum_text(spec) -> str:
    """The link spectrum as plain text: per group and number of rings, one line per type."""
    lines = []
    for (g, m), part in spec.groupby(["group", "components"], sort=False):
        total = int(part["total"].iloc[0])
        lines.append(f"{g}, {m} rings: {total} linked objects")
        width = max([len(str(t)) for t in part["type"]] + [4])
        for r in part.itertuples():
            nodes = "   -" if r.nodes is None or r.nodes != r.nodes else f"{int(r.nodes):>4}"
            lines.append(f"  nodes {nodes}  {r.type:<{width}}  {r.count:>7}  {r.fraction:7.2%}"
                         f"   95% CI {r.low:.2%} - {r.high:.2%}")
    return "\n".join(lines)


def unknot_points(df, length: str = "n_beads"):
    """Per chain length: trials, unknots, P(unknot) and its Wilson interval (errors left out)."""
    import pandas as pd

    ok = df[(df["status"] != "error") & df[length].notna()]
    records = []
    for n_beads, part in ok.groupby(length):
        n = len(part)
        u = int(((part["status"] == "identified") & (part["knot_type"] == UNKNOT)).sum())
        lo, hi = wilson_interval(u, n)
        records.append({"N": int(n_beads), "trials": n, "unknots": u, "p_unknot": u / n,
                        "low": lo, "high": hi})
    return pd.DataFrame.from_records(records, columns=["N", "trials", "unknots", "p_unknot",
                                                       "low", "high"])


def _mle_rate(N, n, u) -> tuple[float, float]:
    """Maximum likelihood rate lam = 1/N0 of P(unknot) = exp(-lam N), and its standard error.

    The log-likelihood sum(-u lam N + (n - u) log(1 - exp(-lam N))) is concave
    in lam; its score is decreasing, so the root is found by bisection.  The
    error is from the observed information (its second derivative).
    """
    knotted = [ni - ui for ni, ui in zip(n, u, strict=True)]

    def score(lam):
        s = 0.0
        for Ni, ui, ki in zip(N, u, knotted, strict=True):
            s -= ui * Ni
            if ki and lam * Ni < 700:
                s += ki * Ni / math.expm1(lam * Ni)
        return s

    lo, hi = 1e-12, 1.0
    while score(hi) > 0:
        hi *= 2
        if hi > 1e6:
            raise KnotsiftError("no unknots at any length: N0 is not identifiable")
    for _ in range(200):
        mid = 0.5 * (lo + hi)
        if score(mid) > 0:
            lo = mid
        else:
            hi = mid
    lam = 0.5 * (lo + hi)
    info = sum(ki * Ni * Ni * math.exp(lam * Ni) / math.expm1(lam * Ni) ** 2
               for Ni, ki in zip(N, knotted, strict=True) if ki and lam * Ni < 700)
    return lam, 1 / math.sqrt(info)


def _wls_rate(N, n, u) -> tuple[float, float]:
    """Weighted least squares of log P on N through the origin; weights 1/var(log p).

    var(log p) ~ (1 - p) / (n p) by the delta method; lengths with no unknots
    (log 0) or no knots (zero variance) get a continuity correction of 1/2.
    """
    sxx = sxy = 0.0
    for Ni, ni, ui in zip(N, n, u, strict=True):
        uc = min(max(ui, 0.5), ni - 0.5) if ni > 1 else max(ui, 0.5)
        p = uc / ni
        w = ni * p / (1 - p) if p < 1 else float(ni)
        sxx += w * Ni * Ni
        sxy += w * Ni * math.log(p)
    lam = -sxy / sxx
    return lam, 1 / math.sqrt(sxx)


def unknot_fit(df, length: str = "n_beads", method: str = "mle") -> dict:
    """Fit P(unknot) = exp(-N/N0) over chain lengths N.

    Parameters
    ----------
    df : pandas.DataFrame
        Rows of a run with a chain-length column.
    length : str
        The chain-length column (default ``n_beads``).
    method : str
        ``mle`` (binomial maximum likelihood, default) or ``wls`` (weighted least
        squares on log P).

    Returns
    -------
    dict
        ``N0`` and ``N0_error`` (one standard error, delta method from the
        rate 1/N0), ``method``, and ``points`` (:func:`unknot_points` records).

    Raises
    ------
    KnotsiftError
        With fewer than two distinct lengths, or when N0 cannot be estimated
        (every chain unknotted, or none).
    """
    if method not in ("mle", "wls"):
        raise KnotsiftError(f"method must be 'mle' or 'wls', got {method!r}", value=method)
    if length not in df.columns:
        raise KnotsiftError(f"no column {length!r} for the chain length", value=length)
    pts = unknot_points(df, length)
    if len(pts) < 2:
        raise KnotsiftError(f"fitting P(unknot) against {length} needs at least two distinct "
                            f"lengths, got {len(pts)}", value=len(pts))
    N, n, u = list(pts["N"]), list(pts["trials"]), list(pts["unknots"])
    if sum(u) == sum(n):
        raise KnotsiftError("every chain is unknotted: N0 is not identifiable (larger than "
                            "the lengths sampled)")
    if sum(u) == 0:
        raise KnotsiftError("no chain is unknotted: N0 is not identifiable (smaller than the "
                            "lengths sampled)")
    lam, se = (_mle_rate if method == "mle" else _wls_rate)(N, n, u)
    return {"N0": 1 / lam, "N0_error": se / lam ** 2, "rate": lam, "rate_error": se,
            "method": method, "length_column": length,
            "points": pts.to_dict(orient="records")}


def read_results(out, table: str = "classifications"):
    """The rows of a classify output (CSV, Parquet, SQLite or a database URL) as a DataFrame."""
    from .sinks import open_sink

    sink = open_sink(out, table, create=False)
    try:
        return sink.read()
    finally:
        sink.close()


def row_unit(df) -> str:
    """What the rows of a run are, in words: ``chains`` (trajectory frames) or ``diagrams``."""
    kinds = set(df["kind"].dropna()) if "kind" in df.columns else set()
    return "diagrams" if kinds == {"code"} else "chains"


def spectrum_text(spec) -> str:
    """The spectrum as an aligned plain-text table, one block per group."""
    lines = []
    for g, part in spec.groupby("group", sort=False):
        total = int(part["total"].iloc[0])
        failed = int(part["failed"].iloc[0])
        lines.append(f"{g}: {total} classified" + (f", {failed} failed" if failed else ""))
        width = max([len(str(t)) for t in part["type"] if t is not None] + [4])
        for r in part.itertuples():
            if r.type is None:
                continue
            lines.append(f"  {r.type:<{width}}  {r.count:>7}  {r.fraction:7.2%}   "
                         f"Wilson 95% interval {r.low:.2%} - {r.high:.2%}")
    return "\n".join(lines)

"""Results for Python users: invariants as values, HTML tables in Jupyter, DataFrames.

* :class:`ResultValues` (a base of :class:`knotsift.result.IdentifyResult`)
  gives ``invariant_values``: the invariants as values (``Laurent`` for the
  polynomials, ``int`` for the others) beside their canonical text, and
  ``_repr_html_``, a small table that Jupyter shows.
* :class:`FrameValues` (a base of :class:`knotsift.curves.FrameResult`) shows
  one row per chain.
* :func:`to_dataframe` turns results, frame results, a classify report or a
  classify output into a pandas DataFrame in one call.
"""

from __future__ import annotations

import html
import os
from typing import Iterable

__all__ = ["ResultValues", "FrameValues", "to_dataframe", "result_row", "ROW_COLUMNS"]

_INTS = ("components", "determinant", "signature")
_POLYS = ("jones", "alexander")
#: Columns of :func:`to_dataframe` for results (not for classify outputs, which keep theirs).
ROW_COLUMNS = ("source", "frame", "chain", "status", "name", "chirality", "candidates",
               "components", "jones", "alexander", "determinant", "signature",
               "crossings_input", "crossings_simplified", "n_beads", "closure", "warnings",
               "notes", "error")


class ResultValues:
    """Values and display of a result (mixed into IdentifyResult)."""

    @property
    def invariant_values(self) -> dict:
        """The invariants as values: ``Laurent`` for jones and alexander, ``int`` for the rest.

        Invariants not computed are left out.  The text in ``invariants`` is
        the canonical form of the same values.

        Examples
        --------
        >>> from knotsift import identify
        >>> v = identify("DT: 4 6 2").invariant_values
        >>> v["determinant"], v["signature"], str(v["jones"])
        (3, -2, 't + t^3 - t^4')
        """
        from .laurent import Laurent

        out: dict = {}
        for key, text in self.invariants.items():
            if text in (None, ""):
                continue
            if key in _INTS:
                out[key] = int(text)
            elif key in _POLYS:
                out[key] = Laurent.parse(text)
            else:
                out[key] = text
        return out

    def _repr_html_(self) -> str:
        return _table([result_row(self)])


class FrameValues:
    """Display of a frame result: one row per chain (mixed into FrameResult)."""

    def _repr_html_(self) -> str:
        if self.error is not None:
            return (f"<p><b>{html.escape(self.source)}, frame {self.frame}</b>: error: "
                    f"{html.escape(self.error)}</p>")
        rows = [result_row(c) for c in self.chains]
        return _table(rows)


_SHOWN = ("source", "frame", "chain", "status", "name", "chirality", "jones", "alexander",
          "determinant", "signature", "warnings")


def _table(rows: list[dict]) -> str:
    def shown(c: str, v) -> bool:
        return v not in (None, "") and not (c == "warnings" and v == 0)

    cols = [c for c in _SHOWN if any(shown(c, r.get(c)) for r in rows)
            or c in ("status", "name")]
    head = "".join(f"<th>{html.escape(c)}</th>" for c in cols)
    body = "".join("<tr>" + "".join(f"<td>{html.escape(_cell(r.get(c)))}</td>" for c in cols)
                   + "</tr>" for r in rows)
    return f"<table><thead><tr>{head}</tr></thead><tbody>{body}</tbody></table>"


def _cell(v) -> str:
    return "" if v is None else str(v)


def result_row(r, source: str | None = None, frame: int | None = None) -> dict:
    """One flat row of a result (IdentifyResult or CurveResult): the columns of ROW_COLUMNS."""
    first = r.candidates[0] if r.candidates else None
    inv = r.invariants or {}

    def num(key):
        text = inv.get(key)
        return int(text) if text not in (None, "") else None

    return {
        "source": source if source is not None else r.source,
        "frame": frame if frame is not None else getattr(r, "frame", None),
        "chain": getattr(r, "chain", None) or None,
        "status": r.status,
        "name": r.name,
        "chirality": first.chirality if first is not None and r.status == "identified" else None,
        "candidates": " or ".join(c.label for c in r.candidates) or None,
        "components": num("components"),
        "jones": inv.get("jones") or None,
        "alexander": inv.get("alexander") or None,
        "determinant": num("determinant"),
        "signature": num("signature"),
        "crossings_input": r.crossings_input,
        "crossings_simplified": r.crossings_simplified,
        "n_beads": getattr(r, "beads", None) or None,
        "closure": getattr(r, "closure", None),
        "warnings": len(getattr(r, "warnings", []) or []),
        "notes": " | ".join(r.notes) if r.notes else None,
        "error": r.error,
    }


def to_dataframe(results) -> "pandas.DataFrame":  # noqa: F821
    """A pandas DataFrame of results, in one call.

    Parameters
    ----------
    results
        Any of: an iterable of ``IdentifyResult`` / ``CurveResult`` (one row
        each) or ``FrameResult`` (one row per chain, a failed frame as one row
        with its error); a classify output (path or URL) or the ``RunReport``
        of :func:`knotsift.bulk.classify` (its rows, read back with
        :func:`knotsift.bulk.summary.read_results`).

    Returns
    -------
    pandas.DataFrame
        Columns :data:`ROW_COLUMNS` for results (``determinant``,
        ``signature``, ``components`` as nullable integers, polynomials as
        canonical text); a classify output keeps its own columns.

    Examples
    --------
    >>> from knotsift import identify
    >>> df = to_dataframe([identify("DT: 4 6 2"), identify("DT: 4 6 8 2")])
    >>> df[["name", "determinant"]].values.tolist()
    [['3_1', 3], ['4_1', 5]]
    """
    import pandas as pd

    if isinstance(results, (str, os.PathLike)) or hasattr(results, "out") and \
            hasattr(results, "counts"):
        from .bulk.summary import read_results

        return read_results(results.out if hasattr(results, "counts") else results)
    rows = []
    for item in _iter(results):
        if hasattr(item, "linking") and hasattr(item, "chains"):  # a frame of chains
            if item.error is not None:
                rows.append(dict.fromkeys(ROW_COLUMNS) | {
                    "source": item.source, "frame": item.frame, "status": "error",
                    "error": item.error, "warnings": len(item.warnings)})
            for c in item.chains:
                rows.append(result_row(c, source=item.source, frame=item.frame))
        else:
            rows.append(result_row(item))
    df = pd.DataFrame.from_records(rows, columns=list(ROW_COLUMNS))
    return df.astype({k: "Int64" for k in ("frame", "components", "determinant", "signature",
                                           "crossings_input", "crossings_simplified",
                                           "n_beads", "warnings")})


def _iter(results) -> Iterable:
    if hasattr(results, "status") or hasattr(results, "linking"):
        return [results]
    return results

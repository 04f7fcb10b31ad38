"""Reports of a coordinate file for the command line: one block per frame, or JSON.

Frames are identified and printed one at a time, so a long trajectory
streams; bad frames are reported (on standard error too) and the run goes
on.  JSON output is a single object written as the frames come.
"""

from __future__ import annotations

import json
import sys
from collections import Counter
from pathlib import Path
from typing import TextIO


__all__ = ["report_file", "JSON_SCHEMA_VERSION", "COORDINATE_SUFFIXES"]

JSON_SCHEMA_VERSION = 1
#: Suffixes that ``knotsift identify FILE`` treats as coordinates (not code lists),
#: besides the MD formats' (knotsift.curves.universe.MD_SUFFIXES).
COORDINATE_SUFFIXES = (".xyz", ".pdb", ".ent", ".npy", ".npz")


def is_coordinate_file(text: str) -> bool:
    """True when ``text`` names an existing file with a coordinate or MD suffix."""
    p = Path(text)
    if not p.is_file():  # a code, not a file: decided without importing numpy
        return False
    if p.suffix.lower() in COORDINATE_SUFFIXES:
        return True
    from .universe import md_format_of

    return md_format_of(p) is not None


def report_file(path: str, *, format: str | None = None, closed: bool | None = None,
                frames=None, closure: str = "stochastic", n_closures: int = 100,
                seed: int = 0, localise: bool = False, table=None, as_json: bool = False,
                progress: bool | None = None, out: TextIO | None = None,
                err: TextIO | None = None, brief: bool = False, **reader) -> int:
    """Identify every frame of a coordinate file and print the results.

    Parameters
    ----------
    path : str
    format, closed, frames, closure, n_closures, seed, localise, table
        As for :func:`knotsift.curves.pipeline.identify_file`.
    as_json : bool
        Print one JSON object (``schema_version``, ``results``: one object
        per frame, ``summary``) instead of text.
    progress : bool, optional
        Show a progress line on standard error (default: when it is a terminal).
    brief : bool
        One line per chain (``file, frame, chain: status name``) instead of a block per frame.
    **reader
        Passed to :func:`knotsift.curves.formats.read_frames` (``topology``,
        ``select``, ``chains_by``, ``box``, ``beads_per_chain``...).

    Returns
    -------
    int
        0 when every frame was identified (whatever the outcome), 1 when some
        frame or chain could not be read or checked.

    Raises
    ------
    CurveError
        Before any output: a missing file, unknown format, bad frame selection.
    """
    from ..progress import Progress
    from .pipeline import identify_file

    out = out or sys.stdout
    err = err or sys.stderr
    bar = Progress(None, "frames", stream=err, enabled=progress)
    results = identify_file(path, format=format, closed=closed, frames=frames,
                            closure=closure, n_closures=n_closures, seed=seed,
                            localise=localise, table=table, progress=bar, **reader)
    counts: Counter[str] = Counter()
    names: Counter[str] = Counter()
    n_frames = failed_frames = 0
    first = True
    if as_json:
        out.write(f'{{"schema_version": {JSON_SCHEMA_VERSION}, "results": [')
    for fr in results:
        n_frames += 1
        if fr.failed:
            failed_frames += 1
        if fr.error is not None:
            counts["error"] += 1
            _clear(bar)
            err.write(f"knotsift: {fr.error}\n")
        for c in fr.chains:
            counts[c.status] += 1
            if c.status == "error":
                _clear(bar)
                err.write(f"knotsift: {c.error}\n")
            elif c.name:
                names[c.name] += 1
        if as_json:
            out.write(("\n" if first else ",\n") + json.dumps(fr.to_dict()))
        elif brief:
            from ..brief import brief_lines

            _clear(bar)
            out.write("".join(line + "\n" for line in brief_lines(fr)))
        else:
            _clear(bar)
            out.write(fr.to_text() + "\n\n")
        out.flush()
        first = False
    bar.close()
    summary = {"frames": n_frames, "frames_failed": failed_frames,
               "chains": {k: counts[k] for k in ("identified", "ambiguous", "not in table",
                                                  "undetermined", "depends on missing segment",
                                                  "error")},
               "types": dict(names.most_common())}
    if as_json:
        out.write(f'\n], "summary": {json.dumps(summary)}}}\n')
    else:
        shown = ", ".join(f"{k} {v}" for k, v in names.most_common(8))
        out.write(f"summary: {n_frames} frame(s), {failed_frames} with errors"
                  + (f"; types: {shown}" if shown else "") + "\n")
    return 1 if failed_frames else 0


def _clear(bar) -> None:
    if bar.enabled:
        bar.stream.write("\r" + " " * 100 + "\r")

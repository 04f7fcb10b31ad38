"""Coordinate tables (CSV or TSV): columns x, y, z and optional frame and chain columns.

The first row names the columns (case does not matter); other columns are
ignored.  Rows of one frame must be contiguous, and within a frame the beads
of each chain follow in row order (chains may interleave).  Without a frame
column the whole table is one frame; without a chain column each frame is
one chain.  Rows are read as a stream, one frame at a time.
"""

from __future__ import annotations

import csv
from pathlib import Path
from typing import Iterable, Iterator

import numpy as np

from ..errors import CurveError
from .frame import Chain, Frame, FrameFailure

__all__ = ["read_coords_table", "write_coords_table"]


def _delimiter(path: Path, first: str) -> str:
    suffix = path.suffix.lower()
    if suffix in (".tsv", ".tab"):
        return "\t"
    if suffix == ".csv":
        return ","
    return "\t" if first.count("\t") > first.count(",") else ","


def read_coords_table(path: str | Path, closed: bool = True, frames: slice | None = None,
                      delimiter: str | None = None, errors: str = "raise"
                      ) -> Iterator[Frame | FrameFailure]:
    """Frames of a CSV/TSV coordinate table, one at a time.

    Parameters
    ----------
    path : path-like
    closed : bool
        Whether chains are rings (default) or open.
    frames : slice, optional
        Which frames to yield, counted from 0 in order of appearance.
    delimiter : str, optional
        Default: tab for ``.tsv``/``.tab``, comma for ``.csv``, else guessed
        from the header.
    errors : {"raise", "yield"}

    Raises
    ------
    CurveError
        A missing file, a header without x, y and z, and (with
        ``errors="raise"``) a row with a missing or non-numeric value or a
        frame whose rows are not contiguous; the message names file, line and
        frame.
    """
    path = Path(path)
    if errors not in ("raise", "yield"):
        raise ValueError(f"errors must be 'raise' or 'yield', got {errors!r}")
    if not path.is_file():
        raise CurveError(f"no such file: {path}", value=str(path))
    with open(path, encoding="utf-8", errors="replace", newline="") as fh:
        first = fh.readline()
    if not first.strip():
        raise CurveError("the file is empty (expected a header row naming x, y, z)",
                         where=f"{path}, line 1")
    delim = delimiter or _delimiter(path, first)
    header = [h.strip().lower() for h in next(csv.reader([first], delimiter=delim))]
    missing = [c for c in ("x", "y", "z") if c not in header]
    if missing:
        raise CurveError(f"the header row has no column {', '.join(missing)} (found "
                         f"{', '.join(header) or 'nothing'})", value=header,
                         where=f"{path}, line 1")
    return _frames(path, header, delim, closed, frames or slice(None), errors)


def _wanted(sel: slice, k: int) -> bool:
    start = sel.start or 0
    if k < start or (sel.stop is not None and k >= sel.stop):
        return False
    return (k - start) % (sel.step or 1) == 0


def _frames(path: Path, header: list[str], delim: str, closed: bool, sel: slice,
            errors: str) -> Iterator[Frame | FrameFailure]:
    src = str(path)
    ix, iy, iz = header.index("x"), header.index("y"), header.index("z")
    ifr = header.index("frame") if "frame" in header else None
    ich = header.index("chain") if "chain" in header else None
    need = max(i for i in (ix, iy, iz, ifr, ich) if i is not None) + 1
    seen_frames: set[str] = set()
    index = -1
    label: str | None = None
    chains: dict[str, list[tuple[float, float, float]]] = {}
    error: CurveError | None = None

    def flush():
        if index < 0 or not _wanted(sel, index):
            return None
        if error is not None:
            return FrameFailure(src, index, error)
        fr = Frame(src, index, [Chain(c, np.array(v, dtype=np.float64), closed)
                                for c, v in chains.items()])
        if label is not None:
            fr.comment = f"frame {label}"
        return fr

    with open(path, encoding="utf-8", errors="replace", newline="") as fh:
        reader = csv.reader(fh, delimiter=delim)
        next(reader)
        for row in reader:
            lineno = reader.line_num
            if not row or all(not c.strip() for c in row):
                continue
            this = row[ifr].strip() if ifr is not None and ifr < len(row) else None
            if this is not None and not this.lstrip("-").isdigit():
                err = CurveError(f"the frame column holds {this[:20]!r}; expected an integer "
                                 "frame number", value=this, where=f"{src}, line {lineno}")
                if errors == "raise":
                    raise err
                yield FrameFailure(src, max(index, 0), err)
                return
            if index < 0 or (ifr is not None and this != label):
                out = flush()
                if out is not None:
                    if isinstance(out, FrameFailure) and errors == "raise":
                        raise out.error
                    yield out
                if this is not None and this in seen_frames:
                    err = CurveError(f"frame {this!r} appears again after other frames; the "
                                     "rows of a frame must be contiguous", value=this,
                                     where=f"{src}, line {lineno}, frame {index + 1}")
                    if errors == "raise":
                        raise err
                    yield FrameFailure(src, index + 1, err)
                    return
                index += 1
                if sel.stop is not None and index >= sel.stop:
                    return
                label = this
                if this is not None:
                    seen_frames.add(this)
                chains, error = {}, None
            if not _wanted(sel, index) or error is not None:
                continue
            if len(row) < need:
                error = CurveError(f"expected {need} columns, got {len(row)}: {row!r}",
                                   value=row, where=f"{src}, line {lineno}, frame {index}")
                continue
            try:
                xyz = (float(row[ix]), float(row[iy]), float(row[iz]))
            except ValueError:
                bad = next(row[i] for i in (ix, iy, iz) if not _is_float(row[i]))
                error = CurveError(f"coordinate {bad!r} is not a number", value=bad,
                                   where=f"{src}, line {lineno}, frame {index}")
                continue
            cid = row[ich].strip() if ich is not None else "A"
            chains.setdefault(cid or "A", []).append(xyz)
    out = flush()
    if out is not None:
        if isinstance(out, FrameFailure) and errors == "raise":
            raise out.error
        yield out
    elif index < 0:
        err = CurveError("the table has a header but no rows", where=f"{src}, line 2")
        if errors == "raise":
            raise err
        yield FrameFailure(src, 0, err)


def _is_float(text: str) -> bool:
    try:
        float(text)
        return True
    except ValueError:
        return False


def write_coords_table(path: str | Path, frames: Iterable, delimiter: str | None = None,
                       precision: int = 6) -> None:
    """Write frames as a table with columns frame, chain, x, y, z.

    Each frame is a :class:`Frame` or a list of N x 3 arrays (one per chain).
    """
    path = Path(path)
    delim = delimiter or ("\t" if path.suffix.lower() in (".tsv", ".tab") else ",")
    with open(path, "w", encoding="utf-8", newline="") as fh:
        w = csv.writer(fh, delimiter=delim, lineterminator="\n")
        w.writerow(["frame", "chain", "x", "y", "z"])
        for k, fr in enumerate(frames):
            if isinstance(fr, Frame):
                items = [(c.id, c.coords) for c in fr.chains]
            else:
                arrays = [fr] if isinstance(fr, np.ndarray) and fr.ndim == 2 else list(fr)
                items = [(chr(65 + i), a) for i, a in enumerate(arrays)]
            for cid, coords in items:
                for x, y, z in np.asarray(coords, dtype=float):
                    w.writerow([k, cid, f"{x:.{precision}f}", f"{y:.{precision}f}",
                                f"{z:.{precision}f}"])

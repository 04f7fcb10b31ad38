"""Plain XYZ files, single or multi-frame: a count line, a comment line, ``name x y z`` lines.

Frames are read one at a time (a generator), so a long trajectory is never
held in memory.  Columns after the fourth are ignored.  A frame holds one
chain, or several of equal length with ``beads_per_chain``.
"""

from __future__ import annotations

from pathlib import Path
from typing import Iterable, Iterator

import numpy as np

from ..errors import CurveError
from .frame import Chain, Frame, FrameFailure

__all__ = ["read_xyz", "write_xyz"]


def _split_chains(coords: np.ndarray, beads_per_chain: int | None, closed: bool,
                  where: str) -> list[Chain]:
    if not beads_per_chain:
        return [Chain("A", coords, closed)]
    if len(coords) % beads_per_chain:
        raise CurveError(f"{len(coords)} beads do not split into chains of "
                         f"{beads_per_chain}", value=len(coords), where=where)
    n = len(coords) // beads_per_chain
    return [Chain(_chain_name(k), coords[k * beads_per_chain:(k + 1) * beads_per_chain], closed)
            for k in range(n)]


def _chain_name(k: int) -> str:
    letters = "ABCDEFGHIJKLMNOPQRSTUVWXYZ"
    return letters[k] if k < 26 else f"C{k}"


def read_xyz(path: str | Path, closed: bool = True, beads_per_chain: int | None = None,
             frames: slice | None = None, errors: str = "raise"
             ) -> Iterator[Frame | FrameFailure]:
    """Frames of an XYZ file, one at a time.

    Parameters
    ----------
    path : path-like
    closed : bool
        Whether the chains are rings (default) or open chains.
    beads_per_chain : int, optional
        Split each frame into chains of this many beads (a melt of equal rings).
    frames : slice, optional
        Which frames to yield (``slice(0, 100)``, ``slice(None, None, 10)``);
        skipped frames are not parsed.
    errors : {"raise", "yield"}
        On a malformed frame, raise :class:`CurveError` or yield a
        :class:`FrameFailure` and go on with the next frame (when the count
        line still allows finding it).

    Raises
    ------
    CurveError
        A missing file or, with ``errors="raise"``, a malformed or truncated
        frame; the message names the file, line and frame.

    Examples
    --------
    >>> import tempfile, os
    >>> path = os.path.join(tempfile.mkdtemp(), "square.xyz")
    >>> _ = open(path, "w").write("4\\nsquare\\nC 0 0 0\\nC 1 0 0\\nC 1 1 0\\nC 0 1 0\\n")
    >>> [f.chains[0].coords.shape for f in read_xyz(path)]
    [(4, 3)]
    """
    path = Path(path)
    if errors not in ("raise", "yield"):
        raise ValueError(f"errors must be 'raise' or 'yield', got {errors!r}")
    if not path.is_file():
        raise CurveError(f"no such file: {path}", value=str(path))
    if beads_per_chain is not None and beads_per_chain < 1:
        raise CurveError(f"beads_per_chain must be positive, got {beads_per_chain}",
                         value=beads_per_chain)
    return _frames(path, closed, beads_per_chain, frames or slice(None), errors)


def _wanted(sel: slice, k: int) -> bool:
    start = sel.start or 0
    step = sel.step or 1
    if k < start or (sel.stop is not None and k >= sel.stop):
        return False
    return (k - start) % step == 0


def _frames(path: Path, closed: bool, bpc: int | None, sel: slice, errors: str
            ) -> Iterator[Frame | FrameFailure]:
    import os

    from ..limits import LimitError, check_at_most, check_declared_size

    src = str(path)
    size = os.path.getsize(path)
    with open(path, encoding="utf-8", errors="replace") as fh:
        lineno = 0
        index = 0
        while True:
            if sel.stop is not None and index >= sel.stop:
                return
            line = fh.readline(1 << 16)
            lineno += 1
            if not line:
                if index == 0:
                    err = CurveError("the file holds no frame (it is empty or blank): an XYZ "
                                     "frame starts with a bead count line",
                                     where=f"{src}, line {lineno}")
                    if errors == "raise":
                        raise err
                    yield FrameFailure(src, 0, err)
                return
            if not line.strip():
                # blank lines between frames (or at the end) are tolerated
                continue
            count_line = lineno
            try:
                count = int(line.split()[0])
                if count < 0:
                    raise ValueError
            except ValueError:
                err = CurveError(f"expected the bead count of a frame (an integer), got "
                                 f"{line.strip()[:40]!r}", value=line.strip(),
                                 where=f"{src}, line {lineno}, frame {index}")
                if errors == "raise":
                    raise err from None
                yield FrameFailure(src, index, err)
                return  # the file cannot be followed past a bad count line
            comment = fh.readline()
            lineno += 1
            if not comment:
                err = CurveError(f"the file ends after the count line of frame {index} "
                                 "(truncated: no comment line and no beads)",
                                 where=f"{src}, line {count_line}, frame {index}")
                if errors == "raise":
                    raise err
                yield FrameFailure(src, index, err)
                return
            try:   # the header is checked against the file before anything is allocated
                check_at_most("beads", count, "the bead count of the frame",
                              where=f"{src}, line {count_line}, frame {index}")
                check_declared_size(8 * count, size - fh.buffer.tell() + 8192,
                                    f"the bead count {count} (at least 8 bytes a bead line)",
                                    where=f"{src}, line {count_line}, frame {index}")
            except LimitError as err:
                if errors == "raise":
                    raise
                yield FrameFailure(src, index, err)
                return
            want = _wanted(sel, index)
            coords = np.empty((count, 3)) if want else None
            err = None
            for k in range(count):
                line = fh.readline()
                lineno += 1
                if not line:
                    err = CurveError(f"the file ends after {k} of the {count} bead lines of "
                                     f"frame {index} (truncated)", value=k,
                                     where=f"{src}, line {lineno}, frame {index}")
                    break
                if not want or err is not None:
                    continue
                parts = line.split()
                if len(parts) < 4:
                    err = CurveError(f"expected 'name x y z', got {line.strip()[:60]!r}",
                                     value=line.strip(),
                                     where=f"{src}, line {lineno}, frame {index}, bead {k}")
                    continue
                try:
                    coords[k] = (float(parts[1]), float(parts[2]), float(parts[3]))
                except ValueError:
                    bad = next(p for p in parts[1:4] if not _is_float(p))
                    err = CurveError(f"coordinate {bad!r} is not a number",
                                     value=bad,
                                     where=f"{src}, line {lineno}, frame {index}, bead {k}")
            if err is not None:
                if errors == "raise":
                    raise err
                yield FrameFailure(src, index, err)
                if "truncated" in err.message:
                    return
            elif want:
                try:
                    chains = _split_chains(coords, bpc, closed, f"{src}, frame {index}")
                except CurveError as exc:
                    if errors == "raise":
                        raise
                    yield FrameFailure(src, index, exc)
                else:
                    yield Frame(src, index, chains, comment=comment.rstrip("\n"))
            index += 1


def _is_float(text: str) -> bool:
    try:
        float(text)
        return True
    except ValueError:
        return False


def write_xyz(path: str | Path, frames: Iterable, name: str = "C",
              comments: Iterable[str] | None = None, precision: int = 6) -> None:
    """Write frames (each an N x 3 array, or a Frame whose chains are concatenated) as XYZ."""
    comments = iter(comments) if comments is not None else None
    with open(path, "w", encoding="utf-8") as fh:
        for k, fr in enumerate(frames):
            if isinstance(fr, Frame):
                coords = np.concatenate([c.coords for c in fr.chains])
                comment = fr.comment
            else:
                coords = np.asarray(fr, dtype=np.float64)
                comment = ""
            if comments is not None:
                comment = next(comments, comment)
            fh.write(f"{len(coords)}\n{comment or f'frame {k}'}\n")
            for x, y, z in coords:
                fh.write(f"{name} {x:.{precision}f} {y:.{precision}f} {z:.{precision}f}\n")

"""The items to classify: rows of a table of diagram codes, frames of trajectories.

Every output row has a deterministic key built from its source file, its
frame and its chain (:func:`knotsift.bulk.resume.item_key`), so a second run
over the same input can tell which rows are already done.  A code is one
item and one row; a trajectory frame is one item (its chains are classified
together, since linking numbers and contacts between chains need them all)
and one row per chain.  Items are produced lazily,
one at a time: a long input is never held in memory.

Inputs of diagram codes (``fmt="codes"``) are either a table with a header
(comma or tab separated, the codes in ``codes_column``; the other columns are
carried into the row's ``fields``), or the line format of ``knotsift identify
--file`` (one code per line, ``label<TAB>code`` allowed, ``#`` comments).  The
frame of a code item is its line number in the file.

Trajectories (``xyz``, ``pdb``, ``csv``, ``npy``) are read by
:mod:`knotsift.curves`; a frame the reader cannot read becomes an item
carrying the reader's error, and the run goes on.
"""

from __future__ import annotations

import csv
import json
import os
from collections.abc import Iterable, Iterator
from dataclasses import dataclass
from pathlib import Path

from ..errors import CurveError, KnotsiftError, NotationError
from .resume import item_key

__all__ = ["Item", "FORMATS", "CURVE_FORMATS", "detect_format", "iter_items"]

#: Trajectory formats, read by knotsift.curves (the MD ones through MDAnalysis).
CURVE_FORMATS = ("xyz", "pdb", "csv", "npy", "lammps-data", "lammps-dump", "dcd", "xtc",
                 "trr", "gro", "gsd", "netcdf", "mmcif")
#: ``codes`` is a table or list of diagram codes; ``auto`` decides per file (see detect_format).
FORMATS = ("auto", "codes") + CURVE_FORMATS

_CURVE_EXTENSIONS = {".xyz": "xyz", ".pdb": "pdb", ".ent": "pdb", ".npy": "npy", ".npz": "npy"}


@dataclass(frozen=True)
class Item:
    """One unit of work: a diagram code, or one frame of a trajectory with its chains.

    Attributes
    ----------
    key : str
        ``source:frame:chain`` of its first row, unique and stable across runs.
    source : str
        The input file as given (normalised).
    frame : int
        Line number for codes; frame index (from 0) for trajectories.
    chain : int
        Index of the first chain (0).
    kind : str
        ``"code"`` or ``"frame"``.
    payload : str or list
        The code text, or the frame's chains (``knotsift.curves.frame.Chain``).
    label : str
        A label given with the code (``label`` column or ``label<TAB>code``) or by the reader.
    fields : str
        JSON text of the other input columns of a code table ("" if none).
    error : str, optional
        Set when the reader could not produce this item (a corrupt frame): it
        becomes a row with status ``error``.
    n_rows : int
        Rows this item gives: 1 for a code, the number of chains for a frame.
    """

    key: str
    source: str
    frame: int
    chain: int
    kind: str
    payload: object
    label: str = ""
    fields: str = ""
    error: str | None = None
    n_rows: int = 1

    @property
    def keys(self) -> tuple[str, ...]:
        """The keys of the rows of this item, one per chain."""
        if self.n_rows == 1:
            return (self.key,)
        return tuple(item_key(self.source, self.frame, self.chain + c)
                     for c in range(self.n_rows))


def _first_line(path: Path) -> str:
    with open(path, encoding="utf-8", errors="replace") as fh:
        for line in fh:
            s = line.strip()
            if s and not s.startswith("#"):
                return s
    return ""


def _header(line: str) -> tuple[list[str], str]:
    delimiter = "\t" if "\t" in line else ","
    return [c.strip() for c in next(csv.reader([line], delimiter=delimiter))], delimiter


def detect_format(path: str | os.PathLike, codes_column: str = "code") -> str:
    """The format of one input file, from its extension and, for tables, its header.

    ``.xyz``, ``.pdb``/``.ent``, ``.npy``/``.npz`` are trajectories.  A
    ``.csv``, ``.tsv`` or ``.txt`` file is a table of codes when its header has
    ``codes_column``, 3D coordinates when its header has columns x, y and z,
    and otherwise a list of codes, one per line; other text is codes.

    Raises
    ------
    NotationError
        If the file cannot be read.
    """
    p = Path(path)
    ext = p.suffix.lower()
    if ext in _CURVE_EXTENSIONS:
        return _CURVE_EXTENSIONS[ext]
    from ..curves.universe import md_format_of

    md = md_format_of(p)
    if md is not None:
        return md
    try:
        first = _first_line(p)
    except OSError as exc:
        raise NotationError(f"cannot read {path}: {exc.strerror}", value=str(path)) from None
    columns, _ = _header(first)
    if codes_column in columns:
        return "codes"
    if {"x", "y", "z"} <= {c.lower() for c in columns}:
        return "csv"
    return "codes"


def _code_items(path: Path, source: str, codes_column: str, label_column: str
                ) -> Iterator[Item]:
    with open(path, encoding="utf-8", errors="replace", newline="") as fh:
        lines = enumerate(fh, 1)
        header: list[str] | None = None
        delimiter = "\t"
        for n, line in lines:
            s = line.strip()
            if not s or s.startswith("#"):
                continue
            columns, delimiter = _header(s)
            if codes_column in columns:
                header = columns
            else:
                yield _line_item(source, n, s)
            break
        if header is None:
            for n, line in lines:
                s = line.strip()
                if s and not s.startswith("#"):
                    yield _line_item(source, n, s)
            return
        at = header.index(codes_column)
        for n, line in lines:
            s = line.strip()
            if not s or s.startswith("#"):
                continue
            values = next(csv.reader([s], delimiter=delimiter))
            row = dict(zip(header, (v.strip() for v in values), strict=False))
            code = values[at].strip() if at < len(values) else ""
            label = row.pop(label_column, "")
            row.pop(codes_column, None)
            error = None
            if len(values) != len(header):
                error = (f"{source}, line {n}: expected {len(header)} columns as in the "
                         f"header, got {len(values)}")
            yield Item(item_key(source, n, 0), source, n, 0, "code", code, label,
                       json.dumps(row, sort_keys=True) if row else "", error)


def _line_item(source: str, n: int, s: str) -> Item:
    label, code = s.split("\t", 1) if "\t" in s else ("", s)
    return Item(item_key(source, n, 0), source, n, 0, "code", code.strip(), label.strip())


def _curve_reader():
    """The trajectory reader of knotsift.curves.

    This is the seam between bulk classification and the 3D pipeline on the
    reading side: the only place that names knotsift.curves' reader.
    """
    try:
        from ..curves import read_frames
    except ImportError as exc:
        raise CurveError("reading 3D trajectories needs knotsift.curves.read_frames, which "
                         f"this installation lacks ({exc})") from None
    return read_frames


def _curve_items(path: Path, source: str, fmt: str, closed: bool | None,
                 beads_per_chain: int | None, reader: dict | None = None) -> Iterator[Item]:
    """One item per frame from knotsift.curves' streaming reader; bad frames as error items."""
    read_frames = _curve_reader()
    extra = {"beads_per_chain": beads_per_chain} if beads_per_chain and fmt == "xyz" else {}
    try:
        frames = read_frames(path, format=fmt, closed=closed, errors="yield", **extra,
                             **(reader or {}))
    except KnotsiftError as exc:  # the file cannot be opened (topology, selection, extra)
        yield Item(item_key(source, -1, 0), source, -1, 0, "frame", None,
                   error=f"{source}: cannot read: {exc}")
        return
    while True:
        try:
            frame = next(frames)
        except StopIteration:
            return
        except KnotsiftError as exc:  # the reader cannot go on in this file
            yield Item(item_key(source, -1, 0), source, -1, 0, "frame", None,
                       error=f"{source}: reading stopped: {exc}")
            return
        index = frame.index
        error = getattr(frame, "error", None)
        if error is not None:
            yield Item(item_key(source, index, 0), source, index, 0, "frame", None,
                       error=str(error))
            continue
        frame.source = source
        yield Item(item_key(source, index, 0), source, index, 0, "frame", frame,
                   getattr(frame, "comment", "") or "", n_rows=max(1, len(frame.chains)))


def iter_items(inputs: Iterable[str | os.PathLike], fmt: str = "auto", *,
               codes_column: str = "code", label_column: str = "label",
               closed: bool | None = None, beads_per_chain: int | None = None,
               reader: dict | None = None) -> Iterator[Item]:
    """Every item of every input file, lazily, in file order.

    Parameters
    ----------
    inputs : paths
    fmt : str
        One of :data:`FORMATS`; ``auto`` decides per file with :func:`detect_format`.
    codes_column : str
        The column of a code table holding the codes.
    label_column : str
        The column of a code table holding a label for each code, if present.
    closed : bool, optional
        Trajectory chains are rings (True) or open (False); default per format
        (PDB open, the others rings; see knotsift.curves.formats).
    beads_per_chain : int, optional
        Split each XYZ frame into chains of this many beads.
    reader : dict, optional
        Keywords of :func:`knotsift.curves.formats.read_frames` for trajectories
        (``topology``, ``select``, ``chains_by``, ``box``).

    Returns
    -------
    iterator of Item

    Raises
    ------
    NotationError
        Before anything is yielded, when an input is missing or the format is unknown.
    CurveError
        Before anything is yielded, for a trajectory when knotsift.curves has no reader.

    Examples
    --------
    >>> from knotsift.demo import demo_path
    >>> first = next(iter_items([demo_path()]))
    >>> first.label, first.payload
    ('R7-01', 'DT: 4 6 2')
    """
    if fmt not in FORMATS:
        raise NotationError(f"format must be one of {', '.join(FORMATS)}, got {fmt!r}",
                            value=fmt)
    paths = [Path(p) for p in inputs]
    for p in paths:
        if not p.is_file():
            raise NotationError(f"input {p} does not exist or is not a file", value=str(p))
    plan = [(p, fmt if fmt != "auto" else detect_format(p, codes_column)) for p in paths]
    if any(used != "codes" for _, used in plan):
        _curve_reader()  # a missing 3D reader is reported now, not half-way through a run
    return _items(plan, codes_column, label_column, closed, beads_per_chain, reader)


def _items(plan, codes_column: str, label_column: str, closed, beads_per_chain, reader=None
           ) -> Iterator[Item]:
    for path, used in plan:
        source = os.path.normpath(str(path))
        if used == "codes":
            yield from _code_items(path, source, codes_column, label_column)
        else:
            yield from _curve_items(path, source, used, closed, beads_per_chain, reader)


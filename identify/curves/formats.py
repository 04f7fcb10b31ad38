"""Choosing the reader of a coordinate file by its suffix (or by an explicit format).

======  ==========================================  =================
format  suffixes                                    chains by default
======  ==========================================  =================
xyz     ``.xyz``                                    rings
pdb     ``.pdb``, ``.ent``                          open (proteins)
csv     ``.csv``, ``.tsv``, ``.tab``, ``.txt``      rings
npy     ``.npy``, ``.npz``                          rings
======  ==========================================  =================

Molecular-dynamics formats are read through MDAnalysis (the ``md`` extra, see
:mod:`knotsift.curves.universe`): ``lammps-data`` (``.data``, ``.lmp``),
``lammps-dump`` (``.lammpstrj``, ``.dump``), ``dcd``, ``xtc``, ``trr``
(``--topology`` needed), ``gro``, ``gsd``, ``netcdf`` (``.nc``, ``.ncdf``,
``--topology`` needed) and ``mmcif`` (``.cif``, ``.mmcif``, gzipped too).
Their chains come from the topology, rings where its bonds close a cycle.
A PDB file given a topology or a selection is read through MDAnalysis too.

A periodic box (the file's, or ``box=``) makes every chain be unwrapped
before it is identified (:mod:`knotsift.curves.periodic`).

Units do not matter to topology: coordinates in Angstrom, nanometres or
lattice units give the same answer.
"""

from __future__ import annotations

from pathlib import Path
from typing import Iterator

from ..errors import CurveError
from .frame import Frame, FrameFailure

__all__ = ["FORMATS", "SUFFIXES", "format_of", "read_frames", "parse_frames"]

PLAIN_FORMATS = ("xyz", "pdb", "csv", "npy")
#: Every format name; the MD ones are read through MDAnalysis (knotsift.curves.universe).
FORMATS = PLAIN_FORMATS + ("lammps-data", "lammps-dump", "dcd", "xtc", "trr", "gro", "gsd",
                           "netcdf", "mmcif")
SUFFIXES = {
    ".xyz": "xyz",
    ".pdb": "pdb",
    ".ent": "pdb",
    ".csv": "csv",
    ".tsv": "csv",
    ".tab": "csv",
    ".txt": "csv",
    ".npy": "npy",
    ".npz": "npy",
}
DEFAULT_CLOSED = {"xyz": True, "pdb": False, "csv": True, "npy": True}


def format_of(path: str | Path, format: str | None = None) -> str:
    """The format of ``path``: ``format`` if given, else from the suffix."""
    if format is not None:
        if format not in FORMATS:
            raise CurveError(f"format must be one of {', '.join(FORMATS)}, got {format!r}",
                             value=format)
        return format
    suffix = Path(path).suffix.lower()
    if suffix in SUFFIXES:
        return SUFFIXES[suffix]
    from .universe import md_format_of

    md = md_format_of(path)
    if md is not None:
        return md
    raise CurveError(f"cannot tell the format of {path} from its suffix {suffix or '(none)'!r}; "
                     f"name it ({', '.join(FORMATS)})", value=str(path))


def parse_frames(text: str) -> slice:
    """A frame selection ``START:STOP[:STEP]`` or a single index ``K``, as a slice."""
    parts = text.strip().split(":")
    try:
        nums = [int(p) if p.strip() else None for p in parts]
    except ValueError:
        raise CurveError(f"frames must look like 0:100, 10: or 5, got {text!r}",
                         value=text) from None
    if len(nums) == 1 and nums[0] is not None:
        return slice(nums[0], nums[0] + 1)
    if len(nums) not in (2, 3) or any(n is not None and n < 0 for n in nums):
        raise CurveError(f"frames must look like 0:100, 10: or 5 (no negative numbers), got "
                         f"{text!r}", value=text)
    if len(nums) == 3 and nums[2] == 0:
        raise CurveError("the frame step cannot be 0", value=text)
    return slice(*nums)


def read_frames(path: str | Path, format: str | None = None, closed: bool | None = None,
                frames: slice | str | None = None, errors: str = "raise", *,
                topology: str | Path | None = None, select: str | None = None,
                chains_by: str = "auto", box=None, **options
                ) -> Iterator[Frame | FrameFailure]:
    """Frames of a coordinate file, one at a time, whatever its format.

    Parameters
    ----------
    path : path-like
    format : str, optional
        One of :data:`FORMATS`; default: from the suffix (see the module docstring).
    closed : bool, optional
        Rings or open chains; default per format (PDB open, the others rings).
    frames : slice or str, optional
        ``slice(0, 100)`` or ``"0:100"``.
    errors : {"raise", "yield"}
        Raise on a bad frame, or yield a :class:`FrameFailure` and go on.
    topology : path-like, optional
        MD formats: the topology file (PSF, PDB, GRO, TPR, PRMTOP, LAMMPS data).
    select : str, optional
        MD formats (and PDB): atoms to take, in MDAnalysis's selection language.
    chains_by : str
        MD formats: ``auto``, ``molecules``, ``fragments``, ``segments`` or ``one``.
    box : sequence of 3 or 6 numbers, optional
        A periodic box ``Lx Ly Lz`` (or with angles) in the coordinates' units;
        every chain is unwrapped in it.  MD formats use the file's box by default.
    **options
        Passed to the reader (``beads_per_chain`` for XYZ, ``break_distance``
        for PDB, ``key`` for NPZ, ``delimiter`` for tables).

    Raises
    ------
    CurveError
        Unknown format, a missing file, or (with ``errors="raise"``) a bad frame.
    """
    fmt = format_of(path, format)
    if isinstance(frames, str):
        frames = parse_frames(frames)
    if fmt not in PLAIN_FORMATS or (fmt == "pdb" and (topology is not None or select)):
        from .universe import read_universe

        return read_universe(path, fmt, topology=topology, select=select,
                             chains_by=chains_by, closed=closed, frames=frames, errors=errors,
                             box=box, **options)
    if topology is not None or select:
        raise CurveError(f"--topology and --select apply to the MD formats read through "
                         f"MDAnalysis (and PDB), not to {fmt}", where=str(path))
    if closed is None:
        closed = DEFAULT_CLOSED[fmt]
    if fmt == "pdb" and box is not None:
        options = dict(options, box=box)  # the PDB reader measures breaks by minimum image
        box = None
    stream = _plain(path, fmt, closed, frames, errors, options)
    if box is None:
        return stream
    from .periodic import check_box

    return _with_box(stream, check_box(box, where=str(path)))


def _with_box(stream, box) -> Iterator[Frame | FrameFailure]:
    for fr in stream:
        if isinstance(fr, Frame):
            fr.box = box
        yield fr


def _plain(path, fmt: str, closed: bool, frames, errors: str, options: dict):
    if fmt == "xyz":
        from .xyz import read_xyz

        return read_xyz(path, closed=closed, frames=frames, errors=errors, **options)
    if fmt == "pdb":
        from .pdb import read_pdb

        return read_pdb(path, closed=closed, frames=frames, errors=errors, **options)
    if fmt == "csv":
        from .coords_table import read_coords_table

        return read_coords_table(path, closed=closed, frames=frames, errors=errors, **options)
    from .npy import read_npy

    return read_npy(path, closed=closed, frames=frames, errors=errors, **options)

"""Choosing the reader of a coordinate file by its suffix (or by an explicit format).

======  ==========================================  =================
format  suffixes                                    chains by default
======  ==========================================  =================
xyz     ``.xyz``                                    rings
pdb     ``.pdb``, ``.ent``                          open (proteins)
csv     ``.csv``, ``.tsv``, ``.tab``, ``.txt``      rings
npy     ``.npy``, ``.npz``                          rings
======  ==========================================  =================

Units do not matter to topology: coordinates in Angstrom, nanometres or
lattice units give the same answer.
"""

from __future__ import annotations

from pathlib import Path
from typing import Iterator

from ..errors import CurveError
from .frame import Frame, FrameFailure

__all__ = ["FORMATS", "SUFFIXES", "format_of", "read_frames", "parse_frames"]

FORMATS = ("xyz", "pdb", "csv", "npy")
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
                frames: slice | str | None = None, errors: str = "raise", **options
                ) -> Iterator[Frame | FrameFailure]:
    """Frames of a coordinate file, one at a time, whatever its format.

    Parameters
    ----------
    path : path-like
    format : {"xyz", "pdb", "csv", "npy"}, optional
        Default: from the suffix (see the module docstring).
    closed : bool, optional
        Rings or open chains; default per format (PDB open, the others rings).
    frames : slice or str, optional
        ``slice(0, 100)`` or ``"0:100"``.
    errors : {"raise", "yield"}
        Raise on a bad frame, or yield a :class:`FrameFailure` and go on.
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
    if closed is None:
        closed = DEFAULT_CLOSED[fmt]
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

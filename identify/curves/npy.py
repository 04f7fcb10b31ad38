"""NumPy arrays of coordinates: ``.npy`` (memory-mapped) and ``.npz``.

Accepted shapes: ``(beads, 3)`` (one frame), ``(frames, beads, 3)`` and
``(frames, chains, beads, 3)``.  A ``.npy`` file is opened with
``mmap_mode='r'``, so only the frames asked for are read from disk.  In a
``.npz`` archive the array named ``coords`` is used, or the only array.
"""

from __future__ import annotations

import zipfile
from pathlib import Path
from typing import Iterator

import numpy as np

from ..errors import CurveError
from .frame import Chain, Frame, FrameFailure

__all__ = ["read_npy", "write_npy"]


def _chain_name(k: int) -> str:
    return "ABCDEFGHIJKLMNOPQRSTUVWXYZ"[k] if k < 26 else f"C{k}"


def _declared(fh) -> tuple[tuple, np.dtype]:
    """(shape, dtype) from a .npy header, read without loading the array."""
    fmt = np.lib.format
    version = fmt.read_magic(fh)
    read = fmt.read_array_header_1_0 if version == (1, 0) else fmt.read_array_header_2_0
    shape, _, dtype = read(fh)
    return shape, dtype


def _check_size(shape, dtype, src: str, available: int | None) -> None:
    from ..limits import check_at_most, check_declared_size

    nbytes = int(np.prod(shape, dtype=object)) * int(dtype.itemsize)
    check_at_most("array_bytes", nbytes, f"the array of shape {tuple(shape)} ({dtype}) in bytes",
                  where=src)
    if available is not None:
        check_declared_size(nbytes, available, f"the header (shape {tuple(shape)})", where=src)


def _open(path: Path, key: str | None) -> np.ndarray:
    src = str(path)
    try:
        if path.suffix.lower() != ".npz":
            with open(path, "rb") as fh:
                shape, dtype = _declared(fh)
                _check_size(shape, dtype, src, path.stat().st_size - fh.tell())
        if path.suffix.lower() == ".npz":
            with np.load(path, allow_pickle=False) as z:
                names = list(z.files)
                if key is None:
                    if "coords" in names:
                        key = "coords"
                    elif len(names) == 1:
                        key = names[0]
                    else:
                        raise CurveError(f"the archive holds arrays {names}; name the one "
                                         "to read (key=...) or call it 'coords'", value=names,
                                         where=src)
                if key not in names:
                    raise CurveError(f"no array {key!r} in the archive (it holds {names})",
                                     value=key, where=src)
                with zipfile.ZipFile(path) as archive, archive.open(f"{key}.npy") as fh:
                    shape, dtype = _declared(fh)   # the size after decompression, checked first
                _check_size(shape, dtype, src, None)
                return np.asarray(z[key])
        return np.load(path, mmap_mode="r", allow_pickle=False)
    except CurveError:
        raise
    except (ValueError, OSError, EOFError, KeyError, zipfile.BadZipFile) as exc:
        from ..limits import LimitError

        if isinstance(exc, LimitError):
            raise
        raise CurveError(f"not a readable NumPy file ({exc})", where=src) from None


def read_npy(path: str | Path, closed: bool = True, frames: slice | None = None,
             key: str | None = None, errors: str = "raise"
             ) -> Iterator[Frame | FrameFailure]:
    """Frames of a ``.npy``/``.npz`` coordinate array, one at a time.

    Parameters
    ----------
    path : path-like
    closed : bool
        Whether chains are rings (default) or open.
    frames : slice, optional
    key : str, optional
        Array name inside a ``.npz`` archive.
    errors : {"raise", "yield"}
        Accepted for symmetry with the text readers; a NumPy file is checked
        as a whole before the first frame.

    Raises
    ------
    CurveError
        A missing or unreadable file, a non-numeric array, or a shape other
        than those listed in the module docstring.
    """
    path = Path(path)
    if not path.is_file():
        raise CurveError(f"no such file: {path}", value=str(path))
    arr = _open(path, key)
    src = str(path)
    if arr.dtype.kind not in "fiu":
        raise CurveError(f"expected a numeric array, got dtype {arr.dtype}", value=str(arr.dtype),
                         where=src)
    if arr.ndim == 2:
        arr = arr[None, :, :]
    if arr.ndim not in (3, 4) or arr.shape[-1] != 3:
        raise CurveError(f"expected an array shaped (beads, 3), (frames, beads, 3) or (frames, "
                         f"chains, beads, 3), got {arr.shape}", value=arr.shape, where=src)
    indices = range(arr.shape[0])[frames or slice(None)]
    return _frames(arr, src, closed, indices)


def _frames(arr: np.ndarray, src: str, closed: bool, indices: range
            ) -> Iterator[Frame | FrameFailure]:
    for k in indices:
        block = np.array(arr[k], dtype=np.float64)
        if block.ndim == 2:
            chains = [Chain("A", block, closed)]
        else:
            chains = [Chain(_chain_name(c), block[c], closed) for c in range(block.shape[0])]
        yield Frame(src, k, chains)


def write_npy(path: str | Path, coords) -> None:
    """Save an array of coordinates (``.npy``, or ``.npz`` with the name ``coords``)."""
    path = Path(path)
    arr = np.asarray(coords, dtype=np.float64)
    if path.suffix.lower() == ".npz":
        np.savez(path, coords=arr)
    else:
        np.save(path, arr)

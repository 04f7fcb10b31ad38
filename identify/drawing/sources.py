"""What ``knotsift draw`` draws: a code, a file of codes, or a 3D chain's projected diagram.

A coordinate file (``.xyz``, ``.pdb``, ``.csv``/``.tsv`` of coordinates,
``.npy``) gives the diagram of one frame seen along one seeded direction:
rings as they are, open chains closed first (``direct`` joins the ends,
``far`` sends both ends out to a large sphere).  Every chain of the frame
appears in the one diagram, so rings that link are drawn linked.
"""

from __future__ import annotations

from pathlib import Path

from ..diagram import Diagram
from ..errors import CurveError, KnotsiftError, NotationError

__all__ = ["diagrams_from_text", "diagrams_from_file", "chain_diagram", "DRAW_CLOSURES",
           "COORDINATE_SUFFIXES"]

#: Closures of open chains for a drawing (one closure: the drawing shows one diagram).
DRAW_CLOSURES = ("direct", "far")
COORDINATE_SUFFIXES = (".xyz", ".pdb", ".ent", ".npy", ".npz")


def _parse(text: str, notation: str | None, where: str) -> Diagram:
    from ..notations.detect import parse_any

    try:
        return parse_any(text, notation)
    except KnotsiftError as exc:
        raise exc.located(where) from None


def diagrams_from_text(text: str, notation: str | None = None, where: str = "input"
                       ) -> list[tuple[str, Diagram]]:
    """One (title, diagram) for a code given inline."""
    return [("", _parse(text, notation, where))]


def diagrams_from_file(path: str | Path, notation: str | None = None, frame: int = 0,
                       closure: str = "far", seed: int = 0, closed: bool | None = None
                       ) -> list[tuple[str, Diagram]]:
    """(title, diagram) of every code in a file, or of one frame of a coordinate file.

    A code file holds one code per line (``label<TAB>code`` allowed, ``#``
    comments); the title is the label or the line number.

    Raises
    ------
    NotationError
        An unreadable file or a bad code (with file and line).
    CurveError
        A bad coordinate file or frame.
    """
    path = Path(path)
    if path.suffix.lower() in COORDINATE_SUFFIXES or _looks_like_coordinates(path):
        d = chain_diagram(path, frame=frame, closure=closure, seed=seed, closed=closed)
        return [(f"{path.name}, frame {frame}", d)]
    try:
        lines = path.read_text(encoding="utf-8").splitlines()
    except OSError as exc:
        raise NotationError(f"cannot read {path}: {exc.strerror}", value=str(path)) from None
    except UnicodeDecodeError:
        raise NotationError(f"{path} is not UTF-8 text", value=str(path)) from None
    out = []
    for n, line in enumerate(lines, 1):
        s = line.strip()
        if not s or s.startswith("#"):
            continue
        label, code = (s.split("\t", 1) if "\t" in s else (f"line {n}", s))
        out.append((label.strip(), _parse(code.strip(), notation, f"{path}, line {n}")))
    if not out:
        raise NotationError(f"{path} holds no code to draw", value=str(path))
    return out


def _looks_like_coordinates(path: Path) -> bool:
    """A .csv/.tsv with x, y, z columns is a coordinate table, otherwise a code table."""
    if path.suffix.lower() not in (".csv", ".tsv"):
        return False
    try:
        with open(path, encoding="utf-8") as fh:
            head = fh.readline().lower().replace("\t", ",").replace(" ", "")
    except (OSError, UnicodeDecodeError):
        return False
    cols = set(head.strip().split(","))
    return {"x", "y", "z"} <= cols


def chain_diagram(path: str | Path, frame: int = 0, closure: str = "far", seed: int = 0,
                  closed: bool | None = None, reduce: bool = True) -> Diagram:
    """The projected diagram of every chain of one frame of a coordinate file.

    Parameters
    ----------
    path : path-like
    frame : int
        Frame index from 0.
    closure : {"direct", "far"}
        How open chains are closed before projecting.
    seed : int
        Seeds the view direction (as in ``knotsift curve``).
    closed : bool, optional
        Rings or open chains (default per format).
    reduce : bool
        KMT-reduce first (fewer crossings, same knot type).

    Raises
    ------
    CurveError
        Missing frame, bad coordinates, unknown closure.
    """
    import numpy as np

    from ..curves.closure import direct_closure, far_closure
    from ..curves.formats import read_frames
    from ..curves.frame import Frame, prepare_chains
    from ..curves.knot_type import polygon_type

    if closure not in DRAW_CLOSURES:
        raise CurveError(f"a drawing closes open chains by one of {', '.join(DRAW_CLOSURES)}, "
                         f"got {closure!r}", value=closure)
    if isinstance(frame, bool) or not isinstance(frame, int) or frame < 0:
        raise CurveError(f"the frame must be an index from 0, got {frame!r}", value=frame)
    found = None
    for item in read_frames(path, closed=closed, frames=slice(frame, frame + 1)):
        found = item
    if not isinstance(found, Frame):
        raise CurveError(f"{path} has no frame {frame}", value=frame)
    prep = prepare_chains(list(found.chains), where=f"{path}, frame {frame}")
    rings = []
    for chain in prep.chains:
        x = chain.coords
        if not chain.closed:
            extra = (direct_closure if closure == "direct" else far_closure)(x)
            x = np.vstack([x, extra]) if len(extra) else x
        rings.append((x, True))
    typed = polygon_type(rings, np.random.default_rng([seed, 0]), reduce=reduce,
                         simplified=False, with_fingerprint=False,
                         where=f"{path}, frame {frame}")
    return typed.diagram

"""Molecular-dynamics files through MDAnalysis: LAMMPS, DCD, XTC/TRR, GRO, GSD, NetCDF, mmCIF.

MDAnalysis (the ``md`` extra) reads the file; this module only turns its
``Universe`` into the :class:`~knotsift.curves.frame.Frame` objects every
reader yields, one frame at a time:

* **Atoms.** ``select`` is a selection in MDAnalysis's own language
  (``"name CA"``, ``"type 1"``, ``"segid A and backbone"``).  Without one,
  the C-alpha atoms of the protein residues are taken when there are any,
  and every atom otherwise.
* **Chains** come from the topology (``chains_by``): ``molecules``
  (GROMACS TPR), ``fragments`` (groups of atoms joined by the topology's
  bonds: PSF, LAMMPS data, GSD, TPR), ``segments`` (segments or PDB/mmCIF
  chains), or ``one`` (the whole selection).  ``auto`` takes the first of
  molecules, fragments, segments that the topology has; structure files
  (PDB, mmCIF) always use their chains.  Chains with fewer than 4 selected
  atoms (waters, ions) are left out with one warning.
* **Order and rings.**  When the selected atoms of a chain form one path in
  the topology's bonds, the beads follow the path (an open chain); when they
  form one cycle, they follow it and the chain is a ring.  Without bonds
  among them (a C-alpha trace), atoms keep the file's order.  A branched
  selection is taken in the file's order with a warning (select the
  backbone).  ``closed`` overrides the ring/open choice.
* **Boxes.**  Trajectory formats carry their periodic box, and each chain is
  unwrapped in it (:mod:`knotsift.curves.periodic`).  The unit cell of a
  crystal structure (PDB CRYST1, mmCIF cell) is not a simulation box and is
  not used.  ``box`` replaces the file's box.
* **Protein gaps.**  When every selected atom is a C-alpha, a C-alpha to
  C-alpha distance above ``break_distance`` is a gap in the chain
  (:mod:`knotsift.curves.gaps` decides what it does to the knot type).

MDAnalysis gives lengths in Angstrom whatever the file's units.
"""

from __future__ import annotations

import warnings
from dataclasses import dataclass
from pathlib import Path
from typing import Iterator

import numpy as np

from ..errors import CurveError
from .frame import MIN_BEADS, Chain, Frame, FrameFailure

__all__ = ["MD_FORMATS", "MD_SUFFIXES", "CHAINS_BY", "read_universe", "md_format_of"]

#: knotsift's format name -> (MDAnalysis format, needs a separate topology file).
MD_FORMATS = {
    "lammps-data": ("DATA", False),
    "lammps-dump": ("LAMMPSDUMP", False),
    "dcd": ("DCD", True),
    "xtc": ("XTC", True),
    "trr": ("TRR", True),
    "gro": ("GRO", False),
    "gsd": ("GSD", False),
    "netcdf": ("NCDF", True),
    "mmcif": ("MMCIF", False),
}
#: File name endings of the MD formats (compared in lower case, longest first).
MD_SUFFIXES = {
    ".cif.gz": "mmcif", ".mmcif.gz": "mmcif", ".cif": "mmcif", ".mmcif": "mmcif",
    ".data": "lammps-data", ".lmp": "lammps-data",
    ".lammpstrj": "lammps-dump", ".dump": "lammps-dump",
    ".dcd": "dcd", ".xtc": "xtc", ".trr": "trr", ".gro": "gro", ".gsd": "gsd",
    ".nc": "netcdf", ".ncdf": "netcdf",
}
CHAINS_BY = ("auto", "molecules", "fragments", "segments", "one")
#: Structure files: their cell is a crystal's, and their chains are the PDB/mmCIF chains.
_STRUCTURES = ("pdb", "mmcif")
_NEEDS = {"gsd": "gsd", "mmcif": "gemmi"}
_TOPOLOGY_HINT = {"dcd": "PSF or PDB", "xtc": "GRO, TPR or PDB", "trr": "GRO, TPR or PDB",
                  "netcdf": "PRMTOP/PARM7 or PDB"}


def md_format_of(path: str | Path) -> str | None:
    """The MD format of ``path`` from its ending, or None."""
    name = Path(path).name.lower()
    for suffix in sorted(MD_SUFFIXES, key=len, reverse=True):
        if name.endswith(suffix):
            return MD_SUFFIXES[suffix]
    return None


@dataclass
class _ChainPlan:
    id: str
    at: np.ndarray      # positions of the chain's beads in the selection, in chain order
    closed: bool


def _mda(fmt: str):
    from ..extras import require

    mda = require("MDAnalysis", "md", f"reading {fmt} files")
    if fmt in _NEEDS:
        require(_NEEDS[fmt], "md", f"reading {fmt} files")
    return mda


def _universe(path: Path, fmt: str, topology: Path | None):
    mda = _mda(fmt)
    mdafmt = "PDB" if fmt == "pdb" else MD_FORMATS[fmt][0]
    src = str(path)
    needs_topology = fmt in MD_FORMATS and MD_FORMATS[fmt][1]
    if needs_topology and topology is None:
        raise CurveError(f"a {fmt.upper()} file holds coordinates only: give its topology "
                         f"with --topology FILE ({_TOPOLOGY_HINT[fmt]})", where=src)
    if topology is not None and not topology.is_file():
        raise CurveError(f"no such topology file: {topology}", value=str(topology), where=src)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")  # MDAnalysis warns about guessed masses and elements
        try:
            if topology is not None:
                return mda.Universe(str(topology), src, format=mdafmt)
            return mda.Universe(src, format=mdafmt, topology_format=mdafmt)
        except Exception as exc:  # noqa: BLE001 - MDAnalysis raises many kinds; all are input errors
            raise _load_error(exc, src, topology) from None


def _load_error(exc: Exception, src: str, topology: Path | None) -> CurveError:
    text = " ".join(str(exc).split())
    if len(text) > 400:
        text = text[:400] + " ..."
    if topology is not None and "atoms" in text.lower() and (
            "same number" in text.lower() or "mismatch" in text.lower()
            or "number of atoms" in text.lower()):
        return CurveError(f"the trajectory and its topology {topology} disagree on the number "
                          f"of atoms ({text})", where=f"{src}, frame 0")
    with_top = f" with the topology {topology}" if topology is not None else ""
    return CurveError(f"MDAnalysis cannot read the file{with_top}: {type(exc).__name__}: {text}",
                      where=src)


def _select(u, select: str | None, src: str):
    from MDAnalysis.exceptions import SelectionError

    if select is None:
        try:
            ca = u.select_atoms("protein and name CA")
        except (SelectionError, AttributeError, ValueError):  # topology without names
            ca = None
        if ca is not None and len(ca):
            return ca, "protein and name CA"
        return u.atoms, "all"
    try:
        ag = u.select_atoms(select)
    except (SelectionError, ValueError, AttributeError, TypeError, IndexError) as exc:
        raise CurveError(f"the selection {select!r} is not valid in MDAnalysis's selection "
                         f"language: {exc}", value=select, where=src) from None
    if len(ag) == 0:
        raise CurveError(f"the selection {select!r} matches no atom", value=select, where=src)
    return ag, select


def _groups(u, ag, chains_by: str, fmt: str) -> tuple[str, list[tuple[str, np.ndarray]]]:
    """(grouping used, [(chain id, atom indices of the universe)])."""
    has_bonds = hasattr(u, "bonds") and len(u.bonds) > 0
    has_molnums = hasattr(u.atoms, "molnums")
    if chains_by == "auto":
        if fmt in _STRUCTURES:
            chains_by = "segments"
        elif has_molnums:
            chains_by = "molecules"
        elif has_bonds:
            chains_by = "fragments"
        else:
            chains_by = "segments"
    ix = ag.ix
    if chains_by == "one":
        return chains_by, [("A", ix)]
    if chains_by == "molecules":
        if not has_molnums:
            raise CurveError("the topology has no molecules (only GROMACS TPR files have "
                             "them); use --chains-by fragments or segments")
        keys = ag.molnums
        return chains_by, [(f"M{m}", ix[keys == m]) for m in _ordered_unique(keys)]
    if chains_by == "fragments":
        if not has_bonds:
            raise CurveError("the topology has no bonds, so no bonded fragments; use "
                             "--chains-by segments or one")
        keys = ag.fragindices
        return chains_by, [(f"F{k}", ix[keys == f]) for k, f in enumerate(_ordered_unique(keys))]
    keys = ag.segids if hasattr(ag, "segids") else np.zeros(len(ag), dtype=int)
    if fmt in _STRUCTURES and hasattr(ag, "chainIDs"):
        keys = ag.chainIDs
    out = []
    for s in _ordered_unique(keys):
        out.append((str(s).strip() or "_", ix[keys == s]))
    return "segments", out


def _ordered_unique(keys: np.ndarray) -> list:
    _, first = np.unique(keys, return_index=True)
    return [keys[i] for i in sorted(first)]


def _order(u, ix: np.ndarray, bonds: np.ndarray | None) -> tuple[np.ndarray, bool | None, bool]:
    """Order of a chain's atoms along its bonds: (atom indices, ring?, path found?)."""
    if bonds is None or len(ix) < 2:
        return ix, None, True
    inside = np.isin(bonds[:, 0], ix) & np.isin(bonds[:, 1], ix)
    edges = bonds[inside]
    if len(edges) == 0:
        return ix, None, True  # no bonds among them (a C-alpha trace): the file's order
    n = len(ix)
    adj: dict[int, list[int]] = {int(i): [] for i in ix}
    for a, b in edges:
        adj[int(a)].append(int(b))
        adj[int(b)].append(int(a))
    degrees = [len(v) for v in adj.values()]
    if max(degrees) > 2 or len(edges) not in (n - 1, n):
        return ix, None, False
    ring = len(edges) == n
    start = int(ix.min()) if ring else min(i for i, v in adj.items() if len(v) == 1)
    path = [start]
    seen = {start}
    while len(path) < n:
        nxt = [j for j in adj[path[-1]] if j not in seen]
        if not nxt:
            return ix, None, False  # in pieces
        step = min(nxt)
        path.append(step)
        seen.add(step)
    return np.array(path), ring, True


def _plan(u, ag, chains_by: str, fmt: str, closed: bool | None, src: str
          ) -> tuple[list[_ChainPlan], list[str], str]:
    used, groups = _groups(u, ag, chains_by, fmt)
    bonds = None
    if hasattr(u, "bonds") and len(u.bonds) > 0 and fmt not in _STRUCTURES:
        bonds = np.asarray(u.bonds.indices)
    pos_of = np.full(len(u.atoms), -1, dtype=np.int64)
    pos_of[ag.ix] = np.arange(len(ag))
    plans, notes, small = [], [], []
    for cid, ix in groups:
        if len(ix) < MIN_BEADS:
            small.append(cid)
            continue
        order, ring, linear = _order(u, ix, bonds)
        if not linear:
            notes.append(f"{src}, chain {cid}: its {len(ix)} selected atoms are not one path "
                         "or ring in the topology's bonds (branched, or in pieces): beads are "
                         "taken in the file's order; select the backbone with --select")
        ring_here = closed if closed is not None else bool(ring)
        plans.append(_ChainPlan(cid, pos_of[order], ring_here))
    if small:
        shown = ", ".join(small[:5]) + (" ..." if len(small) > 5 else "")
        notes.append(f"{src}: {len(small)} {used} with fewer than {MIN_BEADS} selected atoms "
                     f"left out ({shown})")
    if not plans:
        raise CurveError(f"no chain of at least {MIN_BEADS} atoms: the selection has "
                         f"{len(ag)} atoms in {len(groups)} {used}", where=src)
    return plans, notes, used


def read_universe(path: str | Path, format: str, topology: str | Path | None = None,
                  select: str | None = None, chains_by: str = "auto",
                  closed: bool | None = None, frames: slice | None = None,
                  errors: str = "raise", box=None, break_distance: float | None = None
                  ) -> Iterator[Frame | FrameFailure]:
    """Frames of an MD trajectory or structure file read by MDAnalysis, one at a time.

    Parameters
    ----------
    path : path-like
    format : str
        One of :data:`MD_FORMATS` (or ``"pdb"`` for a PDB read through MDAnalysis).
    topology : path-like, optional
        The topology (PSF, PDB, GRO, TPR, PRMTOP, LAMMPS data); needed by DCD,
        XTC, TRR and NetCDF.
    select : str, optional
        MDAnalysis selection (default: protein C-alphas if any, else all atoms).
    chains_by : {"auto", "molecules", "fragments", "segments", "one"}
    closed : bool, optional
        Force rings or open chains (default: rings where the bonds close a cycle).
    frames : slice, optional
    errors : {"raise", "yield"}
    box : sequence of 3 or 6 numbers, optional
        Replaces the file's periodic box (lengths in Angstrom, as MDAnalysis reads).
    break_distance : float, optional
        C-alpha gap threshold in Angstrom (default that of the PDB reader, 4.2).

    Raises
    ------
    CurveError
        Before the first frame: missing files or extra, a missing topology, a
        topology disagreeing with the trajectory, a bad selection or box, no
        chain of 4 atoms.  With ``errors="raise"``, a frame that cannot be read.
    MissingExtraError
        MDAnalysis (or gemmi for mmCIF, gsd for GSD) is not installed.
    """
    from .periodic import check_box
    from .pdb import BREAK_DISTANCE

    path = Path(path)
    if errors not in ("raise", "yield"):
        raise ValueError(f"errors must be 'raise' or 'yield', got {errors!r}")
    if format not in MD_FORMATS and format != "pdb":
        raise CurveError(f"not an MD format: {format!r}", value=format)
    if chains_by not in CHAINS_BY:
        raise CurveError(f"chains must be taken by one of {', '.join(CHAINS_BY)}, got "
                         f"{chains_by!r}", value=chains_by)
    if not path.is_file():
        raise CurveError(f"no such file: {path}", value=str(path))
    src = str(path)
    user_box = check_box(box, where=src) if box is not None else None
    u = _universe(path, format, Path(topology) if topology is not None else None)
    ag, used_select = _select(u, select, src)
    plans, notes, _ = _plan(u, ag, chains_by, format, closed, src)
    ca_trace = hasattr(ag, "names") and bool(np.all(ag.names == "CA"))
    brk = BREAK_DISTANCE if break_distance is None else float(break_distance)
    return _frames(u, ag, plans, notes, src, format, frames or slice(None), errors, user_box,
                   brk if ca_trace else None)


def _frames(u, ag, plans, notes, src, fmt, sel, errors, user_box, brk
            ) -> Iterator[Frame | FrameFailure]:
    from .periodic import check_box

    it = iter(u.trajectory[sel])
    expected = sel.start or 0
    first = True
    while True:
        try:
            ts = next(it)
        except StopIteration:
            cut = _cut_dcd(u, src) if fmt == "dcd" and (
                sel.stop is None or sel.stop > len(u.trajectory)) else None
            if cut is not None:
                if errors == "raise":
                    raise cut from None
                yield FrameFailure(src, len(u.trajectory), cut)
            return
        except Exception as exc:  # noqa: BLE001 - a damaged trajectory, whatever MDAnalysis raises
            text = " ".join(str(exc).split())[:300]
            err = CurveError(f"cannot read this frame (damaged or truncated file?): "
                             f"{type(exc).__name__}: {text}", where=f"{src}, frame {expected}")
            if errors == "raise":
                raise err from None
            yield FrameFailure(src, expected, err)
            return
        index = int(ts.frame)
        expected = index + (sel.step or 1)
        where = f"{src}, frame {index}"
        try:
            box = user_box
            if box is None and fmt not in _STRUCTURES and ts.dimensions is not None:
                dims = np.asarray(ts.dimensions, dtype=np.float64)
                if np.any(dims[:3] != 0):
                    box = check_box(dims, where=where)
            pos = np.asarray(ag.positions, dtype=np.float64)
            chains = [Chain(p.id, pos[p.at], p.closed) for p in plans]
            frame = Frame(src, index, chains, list(notes) if first else [], box=box)
            if brk is not None:
                _gaps(frame, brk)
        except CurveError as exc:
            if errors == "raise":
                raise
            yield FrameFailure(src, index, exc)
            continue
        first = False
        yield frame


def _cut_dcd(u, src: str) -> CurveError | None:
    """A DCD file whose size is not a whole number of frames ends inside a frame.

    MDAnalysis counts the complete frames and silently leaves out a cut one;
    the sizes it uses (header, first frame, other frames) tell how many bytes
    are left over.
    """
    f = getattr(u.trajectory, "_file", None)
    sizes = [getattr(f, name, None) for name in ("_header_size", "_firstframesize",
                                                 "_framesize")]
    if f is None or any(not isinstance(s, int) for s in sizes):
        return None
    header, first, other = sizes
    n = len(u.trajectory)
    whole = header + (first + (n - 1) * other if n else 0)
    size = Path(src).stat().st_size
    if size <= whole:
        return None
    return CurveError(f"the file ends inside frame {n} (truncated: {size - whole} bytes of a "
                      f"{other}-byte frame); the {n} complete frames before it were read",
                      where=f"{src}, frame {n}")


def _gaps(frame: Frame, brk: float) -> None:
    """Record C-alpha gaps (distance above ``brk``) in ``frame.gaps`` and its warnings."""
    from .periodic import minimum_image

    for ch in frame.chains:
        if ch.closed:
            continue
        steps = np.diff(ch.coords, axis=0)
        if frame.box is not None:  # a bond across the box is not a gap
            steps = minimum_image(steps, frame.box)
        d = np.linalg.norm(steps, axis=1)
        far = np.flatnonzero(d > brk)
        if far.size:
            frame.gaps[ch.id] = [(int(k), float(d[k])) for k in far]
            for k in far:
                frame.warnings.append(
                    f"{frame.where}, chain {ch.id}: gap between beads {k} and {k + 1} "
                    f"(C-alpha to C-alpha {d[k]:.1f} A > {brk:g} A); the type is computed with "
                    "the gap bridged by a straight segment and with the pieces apart")

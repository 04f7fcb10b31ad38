"""PDB files: the C-alpha trace of each chain, MODEL records as frames.

Only ``ATOM`` records named ``CA`` are read (``HETATM`` too with
``hetatm=True``); the first alternate location of each residue is kept.  A
C-alpha to C-alpha distance above ``break_distance`` (default 4.2 Angstrom;
consecutive C-alphas of a peptide are about 3.8 Angstrom apart, common
practice) is a chain break: it is reported as a warning naming the chain and
residues, and recorded in the frame's ``gaps``: the chain is identified both
with the gap bridged by a straight segment and as separate pieces (see
:mod:`knotsift.curves.gaps`).  Chains are open (proteins) unless
``closed=True``.
"""

from __future__ import annotations

from pathlib import Path
from typing import Iterable, Iterator

import numpy as np

from ..errors import CurveError
from .frame import Chain, Frame, FrameFailure

__all__ = ["read_pdb", "write_pdb", "BREAK_DISTANCE"]

#: CA-CA distance (Angstrom) above which consecutive residues count as a chain break.
BREAK_DISTANCE = 4.2


def read_pdb(path: str | Path, closed: bool = False, break_distance: float = BREAK_DISTANCE,
             frames: slice | None = None, hetatm: bool = False, errors: str = "raise",
             box=None) -> Iterator[Frame | FrameFailure]:
    """Frames (models) of a PDB file, each with the C-alpha trace of every chain.

    Parameters
    ----------
    path : path-like
    closed : bool
        Treat the chains as rings (default: open).
    break_distance : float
        CA-CA distance in Angstrom above which a chain break is reported.
    frames : slice, optional
        Which models to yield, counted from 0 in file order.
    hetatm : bool
        Also read ``HETATM`` C-alphas (modified residues).
    errors : {"raise", "yield"}
    box : sequence of 3 or 6 numbers, optional
        A periodic box the chains are wrapped into (not read from CRYST1,
        which is a crystal's cell): C-alpha distances are then measured by
        minimum image, and each chain is unwrapped before identification.

    Raises
    ------
    CurveError
        A missing file; with ``errors="raise"`` a malformed record (the line
        number and frame are named), a model without ``ENDMDL`` at the end of
        the file, or a model without C-alpha atoms.
    """
    path = Path(path)
    if errors not in ("raise", "yield"):
        raise ValueError(f"errors must be 'raise' or 'yield', got {errors!r}")
    if not path.is_file():
        raise CurveError(f"no such file: {path}", value=str(path))
    if box is not None:
        from .periodic import check_box

        box = check_box(box, where=str(path))
    return _models(path, closed, break_distance, frames or slice(None), hetatm, errors, box)


def _wanted(sel: slice, k: int) -> bool:
    start = sel.start or 0
    if k < start or (sel.stop is not None and k >= sel.stop):
        return False
    return (k - start) % (sel.step or 1) == 0


class _Model:
    def __init__(self, index: int, line: int):
        self.index = index
        self.line = line
        self.chains: dict[str, list[tuple[int, str, tuple[float, float, float], int]]] = {}
        self.seen: set[tuple[str, int, str]] = set()
        self.error: CurveError | None = None


def _models(path: Path, closed: bool, brk: float, sel: slice, hetatm: bool, errors: str,
            box=None) -> Iterator[Frame | FrameFailure]:
    src = str(path)
    records = ("ATOM  ", "HETATM") if hetatm else ("ATOM  ",)
    index = 0
    current: _Model | None = None
    explicit = False  # inside MODEL ... ENDMDL
    any_model = False

    def finish(m: _Model):
        if m.error is not None:
            return FrameFailure(src, m.index, m.error)
        if not m.chains:
            return FrameFailure(src, m.index, CurveError(
                "no C-alpha atoms (ATOM records named CA) in this model",
                where=f"{src}, line {m.line}, frame {m.index}"))
        return _frame(src, m, closed, brk, box)

    def emit(m: _Model):
        out = finish(m)
        if isinstance(out, FrameFailure) and errors == "raise":
            raise out.error
        return out

    with open(path, encoding="utf-8", errors="replace") as fh:
        for lineno, line in enumerate(fh, 1):
            rec = line[:6].ljust(6)
            if rec == "MODEL ":
                if explicit:
                    err = CurveError("MODEL record inside a model that has no ENDMDL",
                                     where=f"{src}, line {lineno}, frame {index}")
                    if errors == "raise":
                        raise err
                    yield FrameFailure(src, index, err)
                    index += 1
                elif current is not None and current.chains:
                    err = CurveError("atoms before the first MODEL record",
                                     where=f"{src}, line {lineno}, frame {index}")
                    if errors == "raise":
                        raise err
                    yield FrameFailure(src, index, err)
                    index += 1
                if sel.stop is not None and index >= sel.stop:
                    return
                current = _Model(index, lineno)
                explicit = True
                any_model = True
            elif rec == "ENDMDL":
                if not explicit:
                    err = CurveError("ENDMDL record without a MODEL record before it",
                                     where=f"{src}, line {lineno}, frame {index}")
                    if errors == "raise":
                        raise err
                    yield FrameFailure(src, index, err)
                    return
                if _wanted(sel, current.index):
                    yield emit(current)
                index += 1
                current = None
                explicit = False
            elif rec in records:
                if current is None:
                    if any_model:
                        err = CurveError("ATOM record outside any MODEL ... ENDMDL block",
                                         where=f"{src}, line {lineno}, frame {index}")
                        if errors == "raise":
                            raise err
                        yield FrameFailure(src, index, err)
                        return
                    current = _Model(index, lineno)
                if not _wanted(sel, current.index) or current.error is not None:
                    continue
                if line[12:16].strip() != "CA":
                    continue
                try:
                    _atom(current, line, lineno, src)
                except CurveError as exc:
                    current.error = exc
            elif rec in ("END   ", "END"):
                break
    if current is not None:
        if explicit:
            err = CurveError(f"the file ends inside MODEL {current.index} (no ENDMDL record; "
                             "truncated?)", where=f"{src}, line {current.line}, "
                                                  f"frame {current.index}")
            if errors == "raise":
                raise err
            yield FrameFailure(src, current.index, err)
        elif _wanted(sel, current.index):
            yield emit(current)
    elif index == 0 and not any_model:
        err = CurveError("no C-alpha atoms (ATOM records named CA) in the file",
                         where=src)
        if errors == "raise":
            raise err
        yield FrameFailure(src, 0, err)


def _atom(m: _Model, line: str, lineno: int, src: str) -> None:
    where = f"{src}, line {lineno}, frame {m.index}"
    if len(line.rstrip("\n")) < 54:
        raise CurveError(f"ATOM record too short for coordinates (columns 31-54), got "
                         f"{len(line.rstrip())} characters", value=line.rstrip(), where=where)
    alt = line[16]
    chain = line[21].strip() or "_"
    try:
        resseq = int(line[22:26])
    except ValueError:
        raise CurveError(f"residue number {line[22:26]!r} (columns 23-26) is not an integer",
                         value=line[22:26], where=where) from None
    icode = line[26].strip()
    key = (chain, resseq, icode)
    if key in m.seen:
        if alt.strip():
            return  # another alternate location of a residue already read
        raise CurveError(f"residue {resseq}{icode} of chain {chain} has two CA atoms",
                         value=resseq, where=where)
    try:
        xyz = (float(line[30:38]), float(line[38:46]), float(line[46:54]))
    except ValueError:
        raise CurveError(f"coordinates {line[30:54].strip()!r} (columns 31-54) are not "
                         "numbers", value=line[30:54], where=where) from None
    m.seen.add(key)
    m.chains.setdefault(chain, []).append((resseq, icode, xyz, lineno))


def _frame(src: str, m: _Model, closed: bool, brk: float, box=None) -> Frame:
    chains, warnings, gaps = [], [], {}
    for cid, atoms in m.chains.items():
        xyz = np.array([a[2] for a in atoms])
        if len(xyz) > 1:
            steps = np.diff(xyz, axis=0)
            if box is not None:  # a bond across the periodic box is not a break
                from .periodic import minimum_image

                steps = minimum_image(steps, box)
            d = np.linalg.norm(steps, axis=1)
            far = np.flatnonzero(d > brk)
            if far.size and not closed:
                gaps[cid] = [(int(k), float(d[k])) for k in far]
            for k in far:
                r1 = f"{atoms[k][0]}{atoms[k][1]}"
                r2 = f"{atoms[k + 1][0]}{atoms[k + 1][1]}"
                warnings.append(
                    f"{src}, frame {m.index}, chain {cid}: chain break between residues {r1} "
                    f"and {r2} (beads {k} and {k + 1}, CA-CA {d[k]:.1f} A > {brk:g} A, line "
                    f"{atoms[k + 1][3]}); the type is computed with the gap bridged by a "
                    "straight segment and with the pieces apart")
        chains.append(Chain(cid, xyz, closed))
    return Frame(src, m.index, chains, warnings, box=box, gaps=gaps)


def write_pdb(path: str | Path, frames: Iterable, chain_ids: Iterable[str] | None = None
              ) -> None:
    """Write C-alpha traces as PDB ``ATOM`` records (``MODEL`` blocks for several frames).

    Each frame is a :class:`Frame` or a list of N x 3 arrays (one per chain).
    """
    frames = list(frames)
    multi = len(frames) > 1
    with open(path, "w", encoding="utf-8") as fh:
        serial = 1
        for k, fr in enumerate(frames):
            if isinstance(fr, Frame):
                items = [(c.id, c.coords) for c in fr.chains]
            else:
                arrays = [fr] if isinstance(fr, np.ndarray) and fr.ndim == 2 else list(fr)
                ids = list(chain_ids) if chain_ids else [chr(65 + i) for i in range(len(arrays))]
                items = list(zip(ids, arrays, strict=True))
            if multi:
                fh.write(f"MODEL     {k + 1:4d}\n")
            for cid, coords in items:
                for r, (x, y, z) in enumerate(np.asarray(coords, dtype=float), 1):
                    fh.write(f"ATOM  {serial % 100000:5d}  CA  ALA {cid[:1]:1s}{r % 10000:4d}    "
                             f"{x:8.3f}{y:8.3f}{z:8.3f}  1.00  0.00           C\n")
                    serial += 1
                fh.write("TER\n")
            if multi:
                fh.write("ENDMDL\n")
        fh.write("END\n")

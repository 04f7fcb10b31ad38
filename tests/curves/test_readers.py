"""Tests of the coordinate readers: round trips, streaming, frame selection, malformed files."""

from __future__ import annotations

import types

import numpy as np
import pytest

from knotsift.curves.coords_table import read_coords_table, write_coords_table
from knotsift.curves.formats import format_of, parse_frames, read_frames
from knotsift.curves.frame import FrameFailure
from knotsift.curves.npy import read_npy, write_npy
from knotsift.curves.pdb import read_pdb, write_pdb
from knotsift.curves.xyz import read_xyz, write_xyz
from knotsift.errors import CurveError
from tests.curves.curves import figure_eight, right_torus_knot


def frames3():
    rng = np.random.default_rng(0)
    return [right_torus_knot(2, 3, 30) + rng.normal(scale=0.01, size=(30, 3)) for _ in range(3)]


def test_xyz_round_trip(tmp_path):
    """Writing and reading multi-frame XYZ keeps every coordinate (to the written precision)."""
    path = tmp_path / "run.xyz"
    data = frames3()
    write_xyz(path, data, comments=["a", "b", "c"])
    got = list(read_xyz(path))
    assert [f.index for f in got] == [0, 1, 2]
    assert [f.comment for f in got] == ["a", "b", "c"]
    for f, x in zip(got, data, strict=True):
        assert len(f.chains) == 1 and f.chains[0].closed
        assert np.allclose(f.chains[0].coords, x, atol=1e-6)


def test_xyz_is_streamed_and_sliced(tmp_path):
    """The reader is a generator; a frame slice skips the others."""
    path = tmp_path / "run.xyz"
    write_xyz(path, frames3() * 2)
    stream = read_xyz(path)
    assert isinstance(stream, types.GeneratorType)
    assert next(stream).index == 0
    assert [f.index for f in read_xyz(path, frames=slice(1, 5, 2))] == [1, 3]
    assert [f.index for f in read_frames(path, frames="4:")] == [4, 5]


def test_xyz_beads_per_chain(tmp_path):
    """A melt of equal rings splits into chains A, B, ..."""
    path = tmp_path / "melt.xyz"
    write_xyz(path, [np.concatenate(frames3())])
    (f,) = read_xyz(path, beads_per_chain=30)
    assert [c.id for c in f.chains] == ["A", "B", "C"]


def test_pdb_round_trip_models_and_chains(tmp_path):
    """C-alpha traces of two chains in two models come back as two frames of two open chains."""
    path = tmp_path / "prot.pdb"
    a = figure_eight(40) * 3.8 / 0.9
    b = right_torus_knot(2, 3, 40) * 4 + 50
    write_pdb(path, [[a, b], [a + 1, b + 1]])
    got = list(read_pdb(path))
    assert [f.index for f in got] == [0, 1]
    assert [c.id for c in got[0].chains] == ["A", "B"]
    assert not got[0].chains[0].closed
    assert np.allclose(got[1].chains[1].coords, b + 1, atol=1e-3)


def test_pdb_chain_break_warning(tmp_path):
    """A CA-CA distance above 4.2 Angstrom is reported with the chain and residues."""
    path = tmp_path / "gap.pdb"
    x = np.cumsum(np.full((10, 3), 3.8 / np.sqrt(3)), axis=0)
    x[6:] += 10.0
    write_pdb(path, [[x]])
    (f,) = read_pdb(path)
    assert len(f.warnings) == 1
    assert "chain A" in f.warnings[0] and "residues 6 and 7" in f.warnings[0]


def test_pdb_altloc_and_other_atoms(tmp_path):
    """Only CA atoms are read and the first alternate location of a residue is kept."""
    path = tmp_path / "alt.pdb"
    lines = []
    for r in range(1, 6):
        x = 3.8 * r
        lines.append(f"ATOM  {r:5d}  N   ALA A{r:4d}    {x - 1:8.3f}{0:8.3f}{0:8.3f}  1.00  0.00")
        lines.append(f"ATOM  {r:5d}  CA AALA A{r:4d}    {x:8.3f}{0:8.3f}{0:8.3f}  1.00  0.00")
        lines.append(f"ATOM  {r:5d}  CA BALA A{r:4d}    {x:8.3f}{9:8.3f}{0:8.3f}  1.00  0.00")
    path.write_text("\n".join(lines) + "\nEND\n")
    (f,) = read_pdb(path)
    assert np.allclose(f.chains[0].coords[:, 1], 0.0) and len(f.chains[0].coords) == 5


@pytest.mark.parametrize("suffix", [".csv", ".tsv"])
def test_table_round_trip(tmp_path, suffix):
    """CSV and TSV with frame and chain columns round-trip frames and chains."""
    path = tmp_path / f"coords{suffix}"
    data = frames3()
    write_coords_table(path, [[data[0], data[1]], [data[2]]])
    got = list(read_coords_table(path))
    assert [len(f.chains) for f in got] == [2, 1]
    assert np.allclose(got[0].chains[1].coords, data[1], atol=1e-6)
    assert np.allclose(got[1].chains[0].coords, data[2], atol=1e-6)


def test_table_without_frame_or_chain_columns(tmp_path):
    """A bare x, y, z table is one frame with one chain; other columns are ignored."""
    path = tmp_path / "bare.csv"
    x = frames3()[0]
    path.write_text("X,Y,Z,mass\n" + "\n".join(f"{a},{b},{c},1" for a, b, c in x) + "\n")
    (f,) = read_frames(path)
    assert np.allclose(f.chains[0].coords, x)


@pytest.mark.parametrize("suffix", [".npy", ".npz"])
def test_npy_round_trip(tmp_path, suffix):
    """frames x beads x 3 and frames x chains x beads x 3 arrays round-trip."""
    path = tmp_path / f"c{suffix}"
    arr = np.stack(frames3())
    write_npy(path, arr)
    got = list(read_npy(path, frames=slice(1, None)))
    assert [f.index for f in got] == [1, 2]
    assert np.allclose(got[0].chains[0].coords, arr[1])
    path4 = tmp_path / f"d{suffix}"
    write_npy(path4, arr[None])
    (f,) = read_npy(path4)
    assert len(f.chains) == 3


def test_format_chooser_and_override(tmp_path):
    """Formats follow the suffix; an explicit format overrides it."""
    assert format_of("a.XYZ") == "xyz" and format_of("b.ent") == "pdb"
    assert format_of("c.tsv") == "csv" and format_of("d.npz") == "npy"
    assert format_of("e.dat", "xyz") == "xyz"
    path = tmp_path / "ring.dat"
    write_xyz(path, frames3()[:1])
    assert len(list(read_frames(path, format="xyz"))) == 1
    with pytest.raises(CurveError, match="cannot tell the format"):
        format_of(path)
    assert parse_frames("3") == slice(3, 4) and parse_frames("::5") == slice(None, None, 5)
    with pytest.raises(CurveError, match="frames must look like"):
        parse_frames("a:b")


def xyz_lines(n=5):
    return [f"C {k}.0 {k * k}.0 {k % 2}.0" for k in range(n)]


MALFORMED = [
    # (file name, content, reader kwargs, message part, location part)
    ("count.xyz", "five\ncomment\n" + "\n".join(xyz_lines()), {}, "bead count", "line 1"),
    ("short.xyz", "5\ncomment\n" + "\n".join(xyz_lines(3)) + "\n", {}, "truncated", "frame 0"),
    ("word.xyz", "5\nc\n" + "\n".join(xyz_lines(2) + ["C 1.0 x2 3.0"] + xyz_lines(2)), {},
     "'x2' is not a number", "line 5"),
    ("cols.xyz", "5\nc\n" + "\n".join(xyz_lines(4) + ["C 1.0 2.0"]), {}, "expected 'name x y z'",
     "bead 4"),
    ("nocomment.xyz", "5\n", {}, "truncated", "line 1"),
    ("coords.pdb", "ATOM      1  CA  ALA A   1      1.000   abc      3.000  1.00  0.00\n", {},
     "are not numbers", "line 1"),
    ("tooshort.pdb", "ATOM      1  CA  ALA A   1      1.000\n", {}, "too short", "line 1"),
    ("nomdl.pdb", "MODEL        1\nATOM      1  CA  ALA A   1       1.000   2.000   3.000\n",
     {}, "no ENDMDL", "frame 0"),
    ("endmdl.pdb", "ENDMDL\n", {}, "without a MODEL", "line 1"),
    ("noca.pdb", "ATOM      1  N   ALA A   1       1.000   2.000   3.000\nEND\n", {},
     "no C-alpha", ""),
    ("resseq.pdb", "ATOM      1  CA  ALA A  x1       1.000   2.000   3.000\n", {},
     "residue number", "line 1"),
    ("header.csv", "a,b,c\n1,2,3\n", {}, "no column x, y, z", "line 1"),
    ("value.csv", "x,y,z\n1,2,3\n1,oops,3\n", {}, "'oops' is not a number", "line 3"),
    ("contig.csv", "frame,x,y,z\n0,1,2,3\n1,1,2,3\n0,1,2,3\n", {}, "contiguous", "line 4"),
    ("missing.csv", "x,y,z\n1,2\n", {}, "expected 3 columns", "line 2"),
    ("empty.csv", "", {}, "empty", "line 1"),
]


@pytest.mark.parametrize("name, content, kw, message, where", MALFORMED,
                         ids=[m[0] for m in MALFORMED])
def test_malformed_text_files(tmp_path, name, content, kw, message, where):
    """Each malformed file raises CurveError saying what is wrong and where (file, line, frame)."""
    path = tmp_path / name
    path.write_text(content)
    with pytest.raises(CurveError) as info:
        list(read_frames(path, **kw))
    text = str(info.value)
    assert message in text and where in text and name in text


def test_malformed_npy_files(tmp_path):
    """Wrong shape, text dtype, a corrupt file and an ambiguous archive are clear errors."""
    np.save(tmp_path / "shape.npy", np.zeros((4, 5)))
    np.save(tmp_path / "text.npy", np.array([["a", "b", "c"]] * 5))
    (tmp_path / "junk.npy").write_bytes(b"not numpy at all")
    np.savez(tmp_path / "two.npz", a=np.zeros((5, 3)), b=np.zeros((5, 3)))
    for name, message in [("shape.npy", "expected an array shaped"),
                          ("text.npy", "numeric array"), ("junk.npy", "not a readable"),
                          ("two.npz", "name the one")]:
        with pytest.raises(CurveError, match=message) as info:
            list(read_frames(tmp_path / name))
        assert name in str(info.value)


def test_missing_file(tmp_path):
    with pytest.raises(CurveError, match="no such file"):
        read_frames(tmp_path / "nope.xyz")


def test_bad_frame_is_yielded_and_reading_goes_on(tmp_path):
    """With errors='yield' a bad frame becomes a FrameFailure and the next frames are read."""
    path = tmp_path / "run.xyz"
    good = "\n".join(xyz_lines())
    bad = "\n".join(xyz_lines(2) + ["C 1.0 nan? 3.0"] + xyz_lines(2))
    path.write_text(f"5\nf0\n{good}\n5\nf1\n{bad}\n5\nf2\n{good}\n")
    got = list(read_frames(path, errors="yield"))
    assert [type(f).__name__ for f in got] == ["Frame", "FrameFailure", "Frame"]
    assert isinstance(got[1], FrameFailure) and "line 12, frame 1, bead 2" in str(got[1].error)
    assert got[2].index == 2

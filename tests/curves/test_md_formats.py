"""MD formats through MDAnalysis, on real outside data: the MDAnalysisTests package (PyPI, LGPL).

Every file below comes from the ``MDAnalysisTests`` package (its
``MDAnalysisTests.datafiles`` names are given beside each check).  The
expected answers are not copied from anywhere: adenylate kinase is a protein
without a knot in its backbone (from memory: it is not among the known
knotted protein families), and every result in ``STRUCTURES`` was computed
here, checked for knotted answers (none appeared) and recorded with the
closure settings used.  Chains are open C-alpha traces closed by 20 random
closures (seed 0), or by the single "far" closure where a trajectory has
many frames, to keep the suite fast.
"""

from __future__ import annotations

import os
import warnings

import numpy as np
import pytest

from knotsift.curves.formats import format_of, read_frames
from knotsift.curves.pipeline import identify_curve, identify_file, identify_frame
from knotsift.errors import CurveError

pytest.importorskip("MDAnalysis")
datafiles = pytest.importorskip("MDAnalysisTests.datafiles")
warnings.filterwarnings("ignore", module="MDAnalysis")

DATA = os.path.dirname(datafiles.PSF)


def names_of(results):
    return [(r.frame, c.chain, c.status, c.name) for r in results for c in r.chains]


def test_adk_psf_dcd_every_frame_unknotted(table):
    """MDAnalysisTests PSF + DCD (adk.psf, adk_dims.dcd): 98 frames of adenylate kinase."""
    res = list(identify_file(datafiles.DCD, topology=datafiles.PSF, closure="far", table=table))
    assert len(res) == 98 and all(r.error is None for r in res)
    assert all(len(r.chains) == 1 and r.chains[0].beads == 214 for r in res)  # 214 residues
    assert {(c.status, c.name) for r in res for c in r.chains} == {("identified", "0_1")}


def test_adk_gro_xtc_every_frame_unknotted_after_unwrapping(table):
    """MDAnalysisTests GRO + XTC (adk_oplsaa.gro, adk_oplsaa.xtc): 10 frames in a triclinic box.

    The protein is wrapped into the box in these files; unwrapping removes
    every apparent gap, so no gap warning may remain.
    """
    res = list(identify_file(datafiles.XTC, topology=datafiles.GRO, closure="far", table=table))
    assert len(res) == 10 and all(r.error is None for r in res)
    assert {(c.status, c.name) for r in res for c in r.chains} == {("identified", "0_1")}
    assert not any("gap" in w for r in res for w in r.warnings)


def test_trr_with_tpr_topology_chains_are_molecules(table):
    """MDAnalysisTests TPR + TRR (adk_oplsaa.tpr, adk_oplsaa.trr): chains are TPR molecules."""
    fr = next(iter(read_frames(datafiles.TRR, topology=datafiles.TPR, frames="0:1")))
    assert [len(c.coords) for c in fr.chains] == [214] and fr.chains[0].id.startswith("M")
    assert identify_frame(fr, closure="far", table=table).chains[0].name == "0_1"


# file (MDAnalysisTests data folder) -> {chain: (beads, answer)}, 20 closures, seed 0.
# Gap columns: chains with C-alpha gaps whose pieces agree with the bridged chain.
STRUCTURES = {
    "mmcif/5PTI.cif.gz": {"A": (58, "0_1")},
    "mmcif/1YJP.cif": {"A": (7, "0_1")},
    "mmcif/7ETN.cif.gz": {"A": (4, "0_1"), "B": (4, "0_1")},
    "mmcif/custom.cif.gz": {"A": (71, "0_1")},
    "mmcif/1BD2.cif.gz": {"A": (275, "0_1"), "B": (99, "0_1"), "C": (9, "0_1"),
                          "D": (190, "0_1"), "E": (242, "0_1")},   # D: 2 gaps, pieces agree
    "adk_open.pdb": {"_": (214, "0_1")},
    "adk_closed.pdb": {"_": (214, "0_1")},
    "cobrotoxin.pdb": {"_": (62, "0_1")},
    "4E43.pdb": {"A": (99, "0_1"), "B": (99, "0_1"), "C": (6, "0_1")},
    "nmr_neopetrosiamide.pdb": {"A": (27, "0_1")},                 # 1 gap, pieces agree
}


@pytest.mark.parametrize("name", list(STRUCTURES))
def test_protein_structures(name, table):
    """MDAnalysisTests PDB and mmCIF structures (files named in STRUCTURES)."""
    fr = next(iter(read_frames(os.path.join(DATA, name), frames="0:1")))
    res = identify_frame(fr, n_closures=20, seed=0, table=table)
    got = {c.chain: (c.beads, c.name) for c in res.chains}
    assert got == STRUCTURES[name]
    for c in res.chains:
        if c.gaps is not None:
            assert c.gaps["agree"] is True


def test_gap_that_decides_the_type(table):
    """MDAnalysisTests adk_oplsaa.pdb: one frame of the GRO/XTC system, wrapped into its box.

    Read as a plain PDB (its CRYST1 cell is not used), the C-alpha trace has
    four jumps of about 77-80 A across the box.  Bridged by straight segments
    and closed by the "far" closure the chain is 4_1 while each piece alone
    is unknotted, so the status says the type depends on the missing
    segment.  With the box given (--box, the CRYST1 values) the jumps are
    unwrapped and the chain is 0_1, as in every frame of the trajectory.
    """
    fr = next(iter(read_frames(datafiles.PDB)))
    assert [k for k, _ in fr.gaps["_"]] == [123, 128, 139, 156]
    c = identify_frame(fr, closure="far", table=table).chains[0]
    assert c.status == "depends on missing segment" and c.name is None
    assert c.gaps["agree"] is False and c.gaps["bridged"] == "4_1"
    assert {p["answer"] for p in c.gaps["pieces"]} == {"0_1"}
    assert "depends on the missing segment" in c.to_text()
    box = [80.017, 80.017, 80.017, 60.0, 60.0, 90.0]
    fr = next(iter(read_frames(datafiles.PDB, box=box)))
    assert fr.gaps == {}
    assert identify_frame(fr, closure="far", table=table).chains[0].name == "0_1"


def test_polymer_melt_per_chain_and_whole_frame(table):
    """MDAnalysisTests LAMMPS data (lammps/datatest.data): 24 polymer chains of 765 atoms.

    The backbone (atom types 3, 4 and 5: one path of 281 atoms per chain in
    the file's bonds) is read per bonded fragment; each chain is an open
    chain, identified per chain and then as a whole frame.
    """
    fr = next(iter(read_frames(datafiles.LAMMPSdata, select="type 3 4 5")))
    assert len(fr.chains) == 24 and {len(c.coords) for c in fr.chains} == {281}
    assert not fr.warnings  # each selection is one path in the bonds
    whole = identify_frame(fr, closure="far", table=table)
    assert [c.name for c in whole.chains] == ["0_1"] * 24
    for chain, in_frame in list(zip(fr.chains, whole.chains, strict=True))[:4]:  # per chain, on its own
        alone = identify_curve(chain, closure="far", table=table, box=fr.box)
        assert alone.name == in_frame.name and alone.invariants == in_frame.invariants


def test_gsd_bonded_chains_are_unwrapped(table):
    """MDAnalysisTests GSD (example_bonds.gsd): 49 bonded chains of 10 beads, box 10 x 3.5 x 3.5."""
    pytest.importorskip("gsd")
    fr = next(iter(read_frames(datafiles.GSD_bonds, frames="0:1")))
    assert len(fr.chains) == 49 and fr.box is not None
    res = identify_frame(fr, closure="far", table=table)
    # no chain is refused by the unwrapping (long bond or winding round the box)
    assert not [c.error for c in res.chains if c.status == "error" and (
        "unwrapping" in c.error or "winds" in c.error)]
    assert sum(c.name == "0_1" for c in res.chains) >= 40


def test_lammps_dump_and_netcdf_read():
    """MDAnalysisTests LAMMPS dump (lammps/chain_dump_1.lammpstrj with chain_initial.data) and
    AMBER NetCDF (Amber/bala.ncdf with bala.prmtop)."""
    frames = list(read_frames(datafiles.LAMMPSDUMP_chain1, topology=datafiles.LAMMPS_chain,
                              chains_by="one"))
    assert len(frames) > 1 and len(frames[0].chains[0].coords) == 22
    fr = next(iter(read_frames(datafiles.NCDF, topology=datafiles.PRMncdf, chains_by="one",
                               select="not resname WAT")))
    assert len(fr.chains) == 1


def test_suffixes_route_to_mdanalysis():
    assert [format_of(p) for p in ("a.dcd", "a.xtc", "a.trr", "a.gro", "a.gsd", "a.nc",
                                   "a.lammpstrj", "a.data", "b.cif.gz", "b.cif")] == \
        ["dcd", "xtc", "trr", "gro", "gsd", "netcdf", "lammps-dump", "lammps-data", "mmcif",
         "mmcif"]


# --- bad input: clear errors naming the file and frame -------------------------------------


def test_truncated_dcd_names_file_and_frame(tmp_path):
    """MDAnalysisTests adk_dims.dcd cut in the middle of frame 7."""
    cut = tmp_path / "cut.dcd"
    cut.write_bytes(open(datafiles.DCD, "rb").read()[:300000])
    items = list(read_frames(cut, topology=datafiles.PSF, errors="yield"))
    assert [hasattr(f, "chains") for f in items] == [True] * 7 + [False]
    assert "cut.dcd, frame 7: the file ends inside frame 7 (truncated" in str(items[-1].error)
    with pytest.raises(CurveError, match="truncated"):
        list(read_frames(cut, topology=datafiles.PSF))


def test_lammps_dump_without_coordinates(tmp_path):
    bad = tmp_path / "nocoords.lammpstrj"
    bad.write_text("ITEM: TIMESTEP\n0\nITEM: NUMBER OF ATOMS\n4\nITEM: BOX BOUNDS pp pp pp\n"
                   "0 10\n0 10\n0 10\nITEM: ATOMS id type vx\n1 1 0\n2 1 0\n3 1 0\n4 1 0\n")
    with pytest.raises(CurveError, match="nocoords.lammpstrj"):
        list(read_frames(bad))


def test_topology_with_another_atom_count():
    """MDAnalysisTests adk_oplsaa.xtc (47681 atoms) with adk.psf (3341 atoms)."""
    with pytest.raises(CurveError, match=r"adk_oplsaa\.xtc.*(frame 0|atoms)"):
        list(read_frames(datafiles.XTC, topology=datafiles.PSF))


def test_unknown_selection():
    with pytest.raises(CurveError, match=r"adk_dims\.dcd: the selection 'nme CA' is not valid"):
        read_frames(datafiles.DCD, topology=datafiles.PSF, select="nme CA")


def test_empty_selection_and_missing_topology():
    with pytest.raises(CurveError, match="matches no atom"):
        read_frames(datafiles.DCD, topology=datafiles.PSF, select="name XYZ9")
    with pytest.raises(CurveError, match="--topology"):
        read_frames(datafiles.DCD)


def test_box_of_zero_size_on_an_md_file():
    with pytest.raises(CurveError, match=r"adk_oplsaa\.gro: the box edge lengths must be "
                                         "positive"):
        read_frames(datafiles.GRO, box=[80.0, 0.0, 80.0])


def test_classify_keeps_good_rows_beside_a_truncated_file(tmp_path):
    """Bulk run over a good DCD and a damaged copy: the good rows are all written."""
    from knotsift.bulk import classify
    from knotsift.bulk.summary import read_results

    import MDAnalysis

    data = open(datafiles.DCD, "rb").read()
    cut = tmp_path / "cut.dcd"
    cut.write_bytes(data[:300000])
    f = MDAnalysis.Universe(datafiles.PSF, datafiles.DCD).trajectory._file
    good = tmp_path / "good.dcd"  # the first 10 whole frames
    good.write_bytes(data[:f._header_size + f._firstframesize + 9 * f._framesize])
    from knotsift.bulk.rows import ClassifyOptions

    opts = ClassifyOptions(closure="far", topology=datafiles.PSF)
    report = classify([str(cut), str(good)], tmp_path / "out.sqlite", options=opts, workers=1,
                      progress=False)
    df = read_results(tmp_path / "out.sqlite")
    ok = df[df["source"].str.endswith("good.dcd")]
    assert len(ok) == 10 and set(ok["knot"]) == {"0_1"}
    bad = df[df["source"].str.endswith("cut.dcd")]
    assert (bad["status"] == "error").any() and report.failed >= 1
    assert bad.loc[bad["status"] == "error", "error"].str.contains("cut.dcd").all()


def test_cli_curve_with_topology_brief(capsys):
    from knotsift.cli import main

    code = main(["curve", datafiles.DCD, "--topology", datafiles.PSF, "--frames", "0:2",
                 "--closure", "far", "--brief", "--quiet"])
    out = capsys.readouterr().out.splitlines()
    assert code == 0
    assert out[0].endswith("frame 0, chain F0\tidentified\t0_1")
    assert out[1].endswith("frame 1, chain F0\tidentified\t0_1")


def test_cli_bad_selection_is_one_line(capsys):
    from knotsift.cli import main

    code = main(["curve", datafiles.DCD, "--topology", datafiles.PSF, "--select", "nme CA"])
    err = capsys.readouterr().err.strip().splitlines()
    assert code == 1 and len(err) == 1 and "not valid in MDAnalysis's selection language" in err[0]


def test_chains_follow_bond_paths_and_cycles(tmp_path):
    """A LAMMPS data file written here: a ring of 6 atoms bonded in a shuffled order."""
    order = [0, 3, 1, 5, 2, 4]  # the cycle visits atoms in this order
    s = np.linspace(0, 2 * np.pi, 6, endpoint=False)
    xyz = np.stack([5 + 2 * np.cos(s), 5 + 2 * np.sin(s), 5 + 0.3 * np.sin(2 * s)], axis=1)
    pos = np.empty_like(xyz)
    pos[order] = xyz
    lines = ["ring", "", "6 atoms", "6 bonds", "", "1 atom types", "1 bond types", "",
             "0 10 xlo xhi", "0 10 ylo yhi", "0 10 zlo zhi", "", "Atoms", ""]
    lines += [f"{i + 1} 1 1 0.0 {x:.5f} {y:.5f} {z:.5f}" for i, (x, y, z) in enumerate(pos)]
    lines += ["", "Bonds", ""]
    lines += [f"{k + 1} 1 {order[k] + 1} {order[(k + 1) % 6] + 1}" for k in range(6)]
    path = tmp_path / "ring.data"
    path.write_text("\n".join(lines) + "\n")
    fr = next(iter(read_frames(path)))
    (chain,) = fr.chains
    assert chain.closed
    steps = np.linalg.norm(np.diff(chain.coords, axis=0), axis=1)
    assert steps.max() < 2.1  # neighbours on the hexagon (file order jumps 3.5 apart)

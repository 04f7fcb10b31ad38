"""Periodic boxes: unwrapping by minimum-image bonds, long bonds and rings winding round the box.

The knots are the torus-knot curves of tests/curves/curves.py (closed
formula, common practice); T(2,3) is the trefoil 3_1 (Rolfsen 1976,
Appendix C; from memory).  Minimum-image unwrapping is common practice in
simulation analysis; the triclinic case is checked against MDAnalysis's own
``minimize_vectors`` (a general-purpose library).
"""

from __future__ import annotations

import numpy as np
import pytest

from knotsift.curves import Chain, Frame, identify_curve, identify_frame
from knotsift.curves.formats import read_frames
from knotsift.curves.periodic import BOND_FACTOR, check_box, minimum_image, unwrap_chain
from knotsift.curves.xyz import write_xyz
from knotsift.errors import CurveError
from tests.curves.curves import right_torus_knot

BOX = np.array([5.0, 6.0, 7.0])


def wrapped(x: np.ndarray, box=BOX, shift=(1.3, -2.2, 0.4)) -> np.ndarray:
    """Coordinates folded into [0, L) in each direction, as a simulation writes them."""
    return np.mod(x + np.asarray(shift), box)


def trefoil(n: int = 150) -> np.ndarray:
    return 1.5 * right_torus_knot(2, 3, n)  # spans about 9 units: wider than the 5-6-7 box


def test_trefoil_wrapped_into_a_box_is_the_trefoil(table):
    x = trefoil()
    w = wrapped(x)
    assert np.ptp(w, axis=0).max() < 7.0 and np.ptp(x, axis=0).max() > 7.0
    assert identify_curve(w, table=table).name != "3_1"  # read as it is, it is not
    r = identify_curve(w, table=table, box=BOX)
    assert r.status == "identified" and r.name == "3_1"


def test_unwrapping_restores_the_bonds_exactly():
    x = trefoil()
    u = unwrap_chain(wrapped(x), BOX, closed=True)
    assert np.allclose(np.diff(u, axis=0), np.diff(x, axis=0))


def test_box_from_the_command_line_on_an_xyz_file(tmp_path, table):
    path = tmp_path / "wrapped.xyz"
    write_xyz(path, [wrapped(trefoil())])
    fr = next(iter(read_frames(path, box=list(BOX))))
    assert identify_frame(fr, table=table).chains[0].name == "3_1"


def test_ring_winding_round_the_box_is_reported():
    # a straight ring along x that closes only through the periodic image (common practice)
    n = 20
    x = np.stack([np.arange(n) * 0.5, np.full(n, 1.0), 1.0 + 0.1 * np.sin(np.arange(n))],
                 axis=1)
    with pytest.raises(CurveError, match=r"winds round the periodic box .*\(1, 0, 0\).*not "
                                         r"defined in the usual sense"):
        unwrap_chain(np.mod(x, [10.0, 10.0, 10.0]), [10.0, 10.0, 10.0], closed=True)


def test_winding_ring_is_an_error_result_naming_the_chain(table):
    n = 20
    x = np.stack([np.arange(n) * 0.5, 1 + 0.3 * np.cos(np.arange(n)),
                  1 + 0.3 * np.sin(np.arange(n))], axis=1)
    fr = Frame("melt.xyz", 4, [Chain("A", np.mod(x, 10.0), True),
                               Chain("B", trefoil(60) * 0.2 + 5, True)], box=check_box([10] * 3))
    res = identify_frame(fr, table=table)
    a, b = res.chains
    assert a.status == "error" and "melt.xyz, frame 4, chain A" in a.error
    assert "winds round" in a.error and b.status != "error"


def test_long_bond_after_unwrapping_names_file_frame_chain_and_beads():
    x = trefoil(60)
    x[30:] += np.array([0.0, 0.0, 2.2])  # a break of about ten median bonds
    with pytest.raises(CurveError) as exc:
        unwrap_chain(x, [50.0, 50.0, 50.0], closed=False, where="run.dcd, frame 3, chain F2")
    msg = str(exc.value)
    assert "run.dcd, frame 3, chain F2, beads 29-30" in msg
    assert f"more than {BOND_FACTOR:g} times the median bond" in msg


@pytest.mark.parametrize("box", [[0, 5, 5], [5, -1, 5], [5, 5], [5, 5, 5, 90, 0, 90]])
def test_bad_box_is_refused(box):
    with pytest.raises(CurveError, match="box"):
        check_box(box, where="traj.xyz")


def test_box_of_zero_size_on_a_file_names_the_file(tmp_path):
    path = tmp_path / "ring.xyz"
    write_xyz(path, [trefoil(40)])
    with pytest.raises(CurveError, match=r"ring\.xyz: the box edge lengths must be positive"):
        read_frames(path, box=[0.0, 10.0, 10.0])


def test_triclinic_minimum_image_agrees_with_mdanalysis():
    distances = pytest.importorskip("MDAnalysis.lib.distances")
    box = np.array([8.0, 9.0, 10.0, 70.0, 80.0, 65.0])
    d = np.random.default_rng(3).uniform(-12, 12, size=(200, 3))
    ours = minimum_image(d, check_box(box))
    theirs = distances.minimize_vectors(d.astype(np.float32), box.astype(np.float32))
    assert np.allclose(ours, theirs, atol=1e-4)
    # each image differs from the input by a lattice vector of the box
    from MDAnalysis.lib.mdamath import triclinic_vectors

    m = triclinic_vectors(box.astype(np.float32)).astype(float)
    n = np.linalg.solve(m.T, (d - ours).T).T
    assert np.allclose(n, np.rint(n), atol=1e-3)


def test_triclinic_wrapped_trefoil(table):
    mdamath = pytest.importorskip("MDAnalysis.lib.mdamath")
    box = np.array([6.0, 6.5, 7.0, 75.0, 80.0, 70.0])
    m = mdamath.triclinic_vectors(box.astype(np.float32)).astype(float)
    x = trefoil()
    # fold into the cell: fractional coordinates modulo 1
    frac = np.linalg.solve(m.T, x.T).T
    w = (frac - np.floor(frac)) @ m
    assert identify_curve(w, table=table, box=box).name == "3_1"


def test_cli_box_option(tmp_path, capsys):
    from knotsift.cli import main

    path = tmp_path / "wrapped.xyz"
    write_xyz(path, [wrapped(trefoil())])
    assert main(["curve", str(path), "--box", "5", "6", "7", "--brief", "--quiet"]) == 0
    assert capsys.readouterr().out.splitlines()[0].endswith("chain A\tidentified\t3_1")
    assert main(["curve", str(path), "--box", "5", "0", "7"]) == 1
    assert "the box edge lengths must be positive" in capsys.readouterr().err

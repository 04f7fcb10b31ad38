"""Chains in 3D: the figure's parts, the sliding-subchain strip and the projection view."""

from __future__ import annotations

import numpy as np
import pytest

from knotsift.cli import main
from knotsift.drawing.chain3d import (
    chain_figure,
    projection_direction,
    sliding_spectrum,
)
from knotsift.errors import CurveError

from ..curves.curves import right_torus_knot, with_tails

pytest.importorskip("matplotlib")


@pytest.fixture(scope="module")
def tailed_trefoil():
    """A right-handed trefoil ring opened and given straight tails (beads 30-88 knotted)."""
    return with_tails(right_torus_knot(2, 3, 60), 30, np.random.default_rng(1))


def test_sliding_spectrum_finds_the_knot_only_in_windows_holding_it(tailed_trefoil):
    """Windows over a tail alone are unknotted; a window holding the whole former ring is a
    trefoil (T(2,3), right-handed: 3_1 in the table's chirality, common practice)."""
    x, (first, last) = tailed_trefoil
    width = last - first + 11
    s = sliding_spectrum(x, width, step=5, closed=False, closure="far")
    assert s.types[0] == "0_1" and "3_1" in s.types
    j = s.types.index("3_1")
    for start, row in zip(s.starts, s.fractions):
        assert row.sum() == pytest.approx(1.0)
        if start <= first - 3 and start + width - 1 >= last + 3:
            assert row[j] == 1.0                        # holds the whole knotted region
        if start + width - 1 < first:
            assert row[0] == 1.0                        # a bare tail


def test_sliding_spectrum_rejects_a_bad_window(tailed_trefoil):
    """A window outside 4..N beads is a clear error."""
    x, _ = tailed_trefoil
    with pytest.raises(CurveError, match="sliding window"):
        sliding_spectrum(x, 3, closed=False)
    with pytest.raises(CurveError, match="sliding window"):
        sliding_spectrum(x, len(x) + 1, closed=False)


def test_projection_view_looks_along_the_direction(tailed_trefoil):
    """The second 3D view's camera points along the projection direction used."""
    x, (first, last) = tailed_trefoil
    u = projection_direction(x, closed=False)
    fig = chain_figure(x, closed=False, core=(first, last), direction=u,
                       closure_points=np.array([[50.0, 0, 0], [50.0, 10, 0]]))
    view = fig.axes[1]
    elev, azim = np.radians(view.elev), np.radians(view.azim)
    camera = np.array([np.cos(elev) * np.cos(azim), np.cos(elev) * np.sin(azim), np.sin(elev)])
    assert camera @ (u / np.linalg.norm(u)) == pytest.approx(1.0, abs=1e-9)
    labels = [t.get_text() for t in fig.axes[0].get_legend().get_texts()]
    assert labels == ["chain", "knotted core", "closure (towards its far points)"]


def test_chain_figure_core_wraps_round_a_ring():
    """A core running through the last bead of a ring is drawn as one coloured run."""
    x = right_torus_knot(2, 3, 40)
    fig = chain_figure(x, closed=True, core=(35, 4))
    lines = [ln for ln in fig.axes[0].get_lines() if ln.get_label() == "knotted core"]
    assert len(lines) == 1 and len(lines[0].get_data_3d()[0]) == 10    # beads 35-39, 0-4
    with pytest.raises(CurveError, match="outside beads"):
        chain_figure(x, closed=True, core=(0, 40))


def test_draw_3d_command(tmp_path, capsys):
    """knotsift draw FILE --3d writes a PNG; a missing chain is one clear line."""
    x = right_torus_knot(2, 3, 60)
    xyz = tmp_path / "ring.xyz"
    xyz.write_text(f"{len(x)}\nring\n" + "".join(f"C {a:.5f} {b:.5f} {c:.5f}\n"
                                                 for a, b, c in x))
    out = tmp_path / "ring.png"
    assert main(["draw", str(xyz), "--3d", "--core", "-o", str(out), "-q"]) == 0
    assert out.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    assert main(["draw", str(xyz), "--3d", "--chain", "2", "-o", str(out), "-q"]) == 1
    assert "no chain 2" in capsys.readouterr().err

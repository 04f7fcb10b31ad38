"""Link columns of classify rows and the link spectrum of summarise."""

from __future__ import annotations

import numpy as np

from knotsift.bulk.rows import ClassifyOptions
from knotsift.bulk.runner import classify
from knotsift.bulk.summary import link_spectrum, link_spectrum_text, read_results, wilson_interval
from knotsift.curves.xyz import write_xyz


def _torus_link_pair(m: int, n: int = 80) -> np.ndarray:
    """T(2, 2m) as two (1, m) curves on a torus, half a turn apart (common practice)."""
    s = np.linspace(0, 2 * np.pi, n, endpoint=False)
    out = []
    for k in range(2):
        th = m * s + k * np.pi
        rho = 2 + np.cos(th)
        out.append(np.stack([rho * np.cos(s), rho * np.sin(s), np.sin(th)], axis=1))
    return np.concatenate(out)


def _apart(n: int = 80) -> np.ndarray:
    s = np.linspace(0, 2 * np.pi, n, endpoint=False)
    a = np.stack([np.cos(s), np.sin(s), 0 * s], 1)
    return np.concatenate([a, a + np.array([10.0, 0, 0])])


def test_classify_rows_carry_link_and_summarise_counts_frames(tmp_path):
    """Frames of 2-, 4- and 6-noded catenanes and of two separate rings: every ring's row
    carries its frame's link; the spectrum counts each frame once, by node number."""
    frames = [_torus_link_pair(1), _torus_link_pair(2), _torus_link_pair(2),
              _torus_link_pair(3), _apart()]
    path = tmp_path / "products.xyz"
    write_xyz(path, frames)
    out = tmp_path / "r.csv"
    classify([path], out, workers=1, progress=False,
             options=ClassifyOptions(beads_per_chain=80))
    df = read_results(out)
    assert len(df) == 10
    by_frame = df.groupby("frame")["link_type"].agg(lambda v: sorted(set(v)))
    assert [by_frame[k] for k in range(5)] == [["2^2_1"], ["4^2_1"], ["4^2_1"], ["6^2_1"],
                                               ["0^2_1"]]
    assert set(df["link_components"]) == {2}
    spec = link_spectrum(df)
    assert list(spec["nodes"]) == [0, 2, 4, 6]
    assert list(spec["count"]) == [1, 1, 2, 1] and set(spec["total"]) == {5}
    row = spec[spec["nodes"] == 4].iloc[0]
    assert (row["low"], row["high"]) == wilson_interval(2, 5)
    assert "4^2_1" in link_spectrum_text(spec)


def test_link_spectrum_without_links_is_empty():
    import pandas as pd

    assert link_spectrum(pd.DataFrame({"status": ["identified"]})).empty

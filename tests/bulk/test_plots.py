"""Figures: the spectrum chart and P(unknot) against N are written as PNG and SVG."""

from __future__ import annotations

import pandas as pd
import pytest

from knotsift.bulk.plots import knot_label_tex, plot_spectrum, plot_unknot_probability
from knotsift.bulk.summary import knot_spectrum, unknot_fit
from knotsift.errors import KnotsiftError

pytest.importorskip("matplotlib")


def _rows():
    rows = []
    for N, u, t in [(100, 70, 30), (200, 45, 55), (400, 20, 80)]:
        rows += [{"status": "identified", "knot": "0_1", "knot_type": "0_1", "candidates": "0_1",
                  "n_beads": N, "source": f"ring_N{N}.xyz"}] * u
        rows += [{"status": "identified", "knot": "3_1*", "knot_type": "3_1",
                  "candidates": "3_1*", "n_beads": N, "source": f"ring_N{N}.xyz"}] * t
    return pd.DataFrame(rows)


@pytest.mark.parametrize("suffix, magic", [(".png", b"\x89PNG\r\n\x1a\n"), (".svg", b"<?xml")])
def test_plot_spectrum_writes_file(tmp_path, suffix, magic):
    """A grouped spectrum chart is written in the format of the extension."""
    spec = knot_spectrum(_rows(), by="n_beads")
    path = plot_spectrum(spec, tmp_path / f"spectrum{suffix}")
    data = path.read_bytes()
    assert data.startswith(magic) and len(data) > 5000
    if suffix == ".svg":
        text = data.decode()
        assert "n = 100" in text and "Wilson 95%" in text


@pytest.mark.parametrize("suffix", [".png", ".svg"])
def test_plot_unknot_probability_writes_file(tmp_path, suffix):
    """P(unknot) against N with the fitted N0 in the legend."""
    fit = unknot_fit(_rows())
    path = plot_unknot_probability(fit, tmp_path / f"p{suffix}")
    assert path.stat().st_size > 5000
    if suffix == ".svg":
        assert f"{fit['N0']:.0f}" in path.read_text()


def test_plot_refuses_unknown_format(tmp_path):
    """Only .png, .svg and .pdf are written."""
    with pytest.raises(KnotsiftError, match="png, .svg or .pdf"):
        plot_spectrum(knot_spectrum(_rows()), tmp_path / "x.gif")


def test_knot_label_tex_forms():
    """Knot labels become subscripted mathtext; other categories stay plain."""
    assert knot_label_tex("3_1*") == "$3_{1}^{*}$"
    assert knot_label_tex("5_2 or 3_1") == "5_2 or 3_1"

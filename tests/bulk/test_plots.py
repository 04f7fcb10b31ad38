"""Figures: the spectrum chart and P(unknot) against N are written as PNG and SVG."""

from __future__ import annotations

import pandas as pd
import pytest

from knotsift.bulk.plots import (
    knot_label_tex,
    plot_spectrum,
    plot_unknot_probability,
    spectrum_figure,
    unknot_figure,
)
from knotsift.bulk.summary import knot_spectrum, row_unit, unknot_fit
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


def _many_types():
    """Rows of 14 knot types (a long tail) at three lengths, as chains of a trajectory."""
    rows = []
    names = ["0_1", "3_1", "3_1*", "4_1", "5_1", "5_1*", "5_2", "5_2*", "6_1", "6_1*", "6_2",
             "6_2*", "6_3", "7_1"]
    for N in (100, 200, 400):
        for k, name in enumerate(names):
            rows += [{"status": "identified", "knot": name, "knot_type": name.rstrip("*"),
                      "candidates": name, "n_beads": N, "kind": "frame",
                      "source": f"ring_N{N}.xyz"}] * max(1, 60 // (k + 1) ** 2)
    return pd.DataFrame(rows)


def test_plot_spectrum_says_chains_for_the_hidden_tail(tmp_path):
    """The caption counts the rows left out as chains, with the right number."""
    df = _many_types()
    spec = knot_spectrum(df)
    text = plot_spectrum(spec, tmp_path / "s.svg", top=5).read_text()
    order = spec.set_index("type")["count"].sort_values(ascending=False, kind="stable")
    hidden = int(order.iloc[5:].sum())
    assert f"{hidden} chains of rarer types not shown" in text
    assert "rows" not in text


def test_plot_spectrum_labels_merged_mirrors(tmp_path):
    """A merged spectrum says so on the chart; a kept one does not."""
    df = _many_types()
    merged = plot_spectrum(knot_spectrum(df, mirrors="merge"), tmp_path / "m.svg",
                           mirrors="merge").read_text()
    kept = plot_spectrum(knot_spectrum(df), tmp_path / "k.svg").read_text()
    assert "mirror images merged" in merged and "mirror images merged" not in kept


def test_spectrum_figure_ordered_groups_sequential_colours_natural_order():
    """Chain lengths get colours of one sequential map, darkening with N, and a one-column
    legend in increasing order."""
    from matplotlib.colors import to_rgb

    fig = spectrum_figure(knot_spectrum(_many_types(), by="n_beads"), group_title="N")
    from matplotlib.backends.backend_agg import FigureCanvasAgg

    legend = fig.legends[0]
    FigureCanvasAgg(fig).draw()
    texts = legend.get_texts()
    assert [t.get_text().split(" ")[0] for t in texts] == ["100", "200", "400"]
    boxes = [t.get_window_extent() for t in texts]
    assert len({round(b.x0) for b in boxes}) == 1          # one column
    assert boxes[0].y0 > boxes[1].y0 > boxes[2].y0         # read top to bottom
    lum = [sum(to_rgb(h.get_facecolor())) for h in legend.legend_handles]
    assert lum[0] > lum[1] > lum[2]


def test_spectrum_figure_log_axis_shows_rare_types():
    """With log_scale the fraction axis is logarithmic and reaches below the rarest bar."""
    spec = knot_spectrum(_many_types())
    ax = spectrum_figure(spec, log_scale=True).axes[0]
    assert ax.get_yscale() == "log"
    assert ax.get_ylim()[0] < spec["fraction"].min()


def test_unknot_figure_ticks_and_error_meanings():
    """The P(unknot) axis has at least four labelled ticks within its range, and the
    legend says the bars are Wilson 95% intervals and the +- one standard error."""
    fig = unknot_figure(unknot_fit(_rows()))
    from matplotlib.backends.backend_agg import FigureCanvasAgg

    ax = fig.axes[0]
    FigureCanvasAgg(fig).draw()
    lo, hi = ax.get_ylim()
    labelled = [t for t in ax.get_yticklabels() if t.get_text() and lo <= t.get_position()[1]
                <= hi]
    assert len(labelled) >= 4
    legend = " ".join(t.get_text() for t in ax.get_legend().get_texts())
    assert "Wilson 95% interval" in legend and "one standard error" in legend


def test_row_unit():
    """Trajectory rows are chains, code rows diagrams."""
    assert row_unit(_many_types()) == "chains"
    assert row_unit(pd.DataFrame({"kind": ["code", "code"]})) == "diagrams"

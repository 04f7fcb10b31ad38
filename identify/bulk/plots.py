"""Figures of a run: the knot spectrum with Wilson error bars, and P(unknot) against N with its fit.

Drawn with matplotlib's object interface on a plain ``Figure`` (no pyplot, no
display needed); the file extension picks the format (``.png``, ``.svg``,
``.pdf``).
"""

from __future__ import annotations

import math
import re
from pathlib import Path

from ..errors import KnotsiftError

__all__ = ["plot_spectrum", "plot_unknot_probability", "spectrum_figure", "unknot_figure",
           "knot_label_tex"]

_STYLE = {
    "font.size": 9,
    "axes.titlesize": 9,
    "axes.labelsize": 9,
    "xtick.labelsize": 8,
    "ytick.labelsize": 8,
    "legend.fontsize": 8,
    "axes.spines.top": False,
    "axes.spines.right": False,
    "svg.fonttype": "none",
    "savefig.dpi": 200,
}
_COLOURS = ("#3b6ea5", "#d1793b", "#4f9a59", "#b94a4a", "#7d63a8", "#8a6d52", "#c66fa8",
            "#6f6f6f")


def knot_label_tex(name: str) -> str:
    """A knot label as mathtext: ``3_1*`` -> ``$3_{1}^{*}$``; other text unchanged.

    Examples
    --------
    >>> knot_label_tex("10_132")
    '$10_{132}$'
    >>> knot_label_tex("3_1#3_1*")
    '$3_{1}\\\\#3_{1}^{*}$'
    >>> knot_label_tex("not in table")
    'not in table'
    """
    parts = name.split("#")
    out = []
    for p in parts:
        m = re.fullmatch(r"(\d+)_(\d+)(\*?)", p)
        if not m:
            return name
        out.append(f"{m.group(1)}_{{{m.group(2)}}}" + ("^{*}" if m.group(3) else ""))
    return "$" + r"\#".join(out) + "$"


def _save(fig, path) -> Path:
    path = Path(path)
    if path.suffix.lower() not in (".png", ".svg", ".pdf"):
        raise KnotsiftError(f"a plot is written as .png, .svg or .pdf, got {path.name!r}",
                            value=str(path))
    path.parent.mkdir(parents=True, exist_ok=True)
    fig.savefig(path, bbox_inches="tight")
    return path


def _is_ordered(groups) -> bool:
    """True when every group label reads as a number (chain lengths, temperatures, ...)."""
    try:
        [float(g) for g in groups]
    except (TypeError, ValueError):
        return False
    return len(groups) > 1


def _group_colours(groups) -> list:
    """Categorical colours, or a sequential map (light to dark) for ordered groups."""
    if not _is_ordered(groups):
        return [_COLOURS[k % len(_COLOURS)] for k in range(len(groups))]
    from matplotlib import colormaps

    cmap = colormaps["viridis"]
    n = len(groups)
    return [cmap(0.85 - 0.75 * k / max(n - 1, 1)) for k in range(n)]


def spectrum_figure(spec, *, top: int = 12, title: str | None = None,
                    group_title: str | None = None, unit: str = "chains",
                    mirrors: str = "keep", log_scale: bool = False):
    """The spectrum bar chart as a matplotlib ``Figure`` (see :func:`plot_spectrum`)."""
    return _spectrum(spec, top=top, title=title, group_title=group_title, unit=unit,
                     mirrors=mirrors, log_scale=log_scale)


def plot_spectrum(spec, path, *, top: int = 12, title: str | None = None,
                  group_title: str | None = None, unit: str = "chains",
                  mirrors: str = "keep", log_scale: bool = False) -> Path:
    """Bar chart of the knot spectrum: fraction of each type with its Wilson 95% interval.

    Parameters
    ----------
    spec : pandas.DataFrame
        The output of :func:`knotsift.bulk.summary.knot_spectrum`; several
        groups give grouped bars.
    path : path
        ``.png``, ``.svg`` or ``.pdf``.
    top : int
        Show the most frequent types overall (the rest are left out, and the
        caption says how many rows they hold).
    title : str, optional
    group_title : str, optional
        Title of the legend of the groups (the grouping column).
    unit : str
        What a row is: ``chains`` (trajectories) or ``diagrams`` (codes).
    mirrors : {"keep", "merge"}
        How the spectrum counted mirror images; ``merge`` is said on the chart.
    log_scale : bool
        A logarithmic fraction axis, so that rare types stay readable.

    Returns
    -------
    pathlib.Path
    """
    fig = _spectrum(spec, top=top, title=title, group_title=group_title, unit=unit,
                    mirrors=mirrors, log_scale=log_scale)
    return _save(fig, path)


def _spectrum(spec, *, top, title, group_title, unit, mirrors, log_scale):
    from ..drawing.render import require_matplotlib

    require_matplotlib()
    from matplotlib import rc_context
    from matplotlib.figure import Figure

    spec = spec[spec["type"].notna()]
    if spec.empty:
        raise KnotsiftError("nothing to plot: no classified rows")
    order = (spec.groupby("type")["count"].sum().sort_values(ascending=False, kind="stable"))
    from .summary import _type_key

    shown = sorted(order.index[:top], key=lambda t: _type_key(str(t)))
    hidden = int(order.iloc[top:].sum()) if len(order) > top else 0
    groups = list(dict.fromkeys(spec["group"]))
    colours = _group_colours(groups)
    ordered = _is_ordered(groups)
    with rc_context(_STYLE):
        width_in = min(7.0, max(3.4, 0.45 * len(shown) * max(1, len(groups) ** 0.5) + 1.2))
        fig = Figure(figsize=(width_in, 2.8), layout="constrained")
        ax = fig.add_subplot()
        bar_w = 0.8 / len(groups)
        for gi, g in enumerate(groups):
            part = spec[spec["group"] == g].set_index("type")
            xs, ys, lo, hi = [], [], [], []
            for ti, t in enumerate(shown):
                if t not in part.index:
                    continue
                r = part.loc[t]
                xs.append(ti - 0.4 + bar_w * (gi + 0.5))
                ys.append(r["fraction"])
                lo.append(r["fraction"] - r["low"])
                hi.append(r["high"] - r["fraction"])
            total = int(part["total"].iloc[0])
            label = f"{g} (n = {total})" if len(groups) > 1 else None
            ax.bar(xs, ys, bar_w * 0.92, yerr=[lo, hi], capsize=2, label=label,
                   color=colours[gi], edgecolor="none",
                   error_kw={"elinewidth": 0.8, "capthick": 0.8, "ecolor": "#222222"})
        ax.set_xticks(range(len(shown)), [knot_label_tex(str(t)) for t in shown],
                      rotation=45 if len(shown) > 6 else 0,
                      ha="right" if len(shown) > 6 else "center")
        ax.set_xlim(-0.6, len(shown) - 0.4)
        ax.set_ylabel(f"fraction of {unit}")
        if log_scale:
            positive = spec.loc[spec["low"] > 0, "low"]
            floor = float(positive.min()) * 0.5 if len(positive) else 1e-4
            ax.set_yscale("log")
            ax.set_ylim(max(floor, 1e-6), 1.2)
            _log_ticks(ax, floor)
        else:
            ax.set_ylim(0, min(1.0, max(spec["high"]) * 1.08) or 1.0)
        ax.grid(axis="y", linewidth=0.4, alpha=0.5)
        ax.set_axisbelow(True)
        if len(groups) > 1:
            if ordered:   # one column, in the groups' natural order from top to bottom
                fig.legend(loc="outside right upper", ncols=1, frameon=False,
                           title=group_title)
            else:
                fig.legend(loc="outside upper center", ncols=min(len(groups), 4),
                           frameon=False, title=group_title)
        n_all = int(spec.drop_duplicates("group")["total"].sum())
        lines = [f"bars: fraction of {unit} (n = {n_all}); error bars: Wilson 95% intervals"]
        if hidden:
            lines.append(f"{hidden} {unit} of rarer types not shown")
        if mirrors == "merge":
            lines.append("mirror images merged: each bar counts a knot and its mirror image")
        note = "\n".join(lines)
        ax.set_title(title or note, loc="left", fontsize=8, color="#444444")
        return fig


def _log_ticks(ax, low: float) -> None:
    """Readable ticks on a log probability axis: 1-2-5 per decade, more within one decade."""
    from matplotlib.ticker import FuncFormatter, LogLocator, NullFormatter

    subs = (1.0, 2.0, 3.0, 5.0, 7.0) if low > 0.1 else (1.0, 2.0, 5.0)
    ax.yaxis.set_major_locator(LogLocator(subs=subs, numticks=30))
    ax.yaxis.set_minor_locator(LogLocator(subs="auto", numticks=30))
    ax.yaxis.set_major_formatter(FuncFormatter(lambda v, _: f"{v:g}"))
    ax.yaxis.set_minor_formatter(NullFormatter())


def plot_unknot_probability(fit: dict, path, *, title: str | None = None,
                            log_scale: bool = True) -> Path:
    """P(unknot) against chain length with Wilson 95% intervals and the fit exp(-N/N0).

    Parameters
    ----------
    fit : dict
        The output of :func:`knotsift.bulk.summary.unknot_fit`.
    path : path
        ``.png``, ``.svg`` or ``.pdf``.
    log_scale : bool
        Logarithmic probability axis, on which the fit is a straight line.

    Returns
    -------
    pathlib.Path
    """
    return _save(unknot_figure(fit, title=title, log_scale=log_scale), path)


def unknot_figure(fit: dict, *, title: str | None = None, log_scale: bool = True):
    """P(unknot) against N with the fit, as a matplotlib ``Figure``.

    The points carry Wilson 95% intervals; the fitted N0 is given with one
    standard error, and the legend says which is which.
    """
    from ..drawing.render import require_matplotlib

    require_matplotlib()
    import numpy as np
    from matplotlib import rc_context
    from matplotlib.figure import Figure

    pts = fit["points"]
    N = np.array([p["N"] for p in pts], dtype=float)
    p = np.array([p["p_unknot"] for p in pts])
    lo = np.array([q["low"] for q in pts])
    hi = np.array([q["high"] for q in pts])
    with rc_context(_STYLE):
        fig = Figure(figsize=(3.4, 2.6), layout="constrained")
        ax = fig.add_subplot()
        ax.errorbar(N, p, yerr=[p - lo, hi - p], fmt="o", ms=3.5, capsize=2,
                    color=_COLOURS[0], elinewidth=0.8,
                    label="fraction unknotted, Wilson 95% interval")
        grid = np.linspace(0, N.max() * 1.05, 200)
        n0, err = fit["N0"], fit["N0_error"]
        digits = max(0, 1 - int(math.floor(math.log10(err)))) if err > 0 else 1
        ax.plot(grid, np.exp(-grid / n0), color=_COLOURS[1], linewidth=1.2,
                label=rf"$\exp(-N/N_0)$, $N_0 = {n0:.{digits}f} \pm {err:.{digits}f}$"
                      "\n(\u00b1 one standard error)")
        if log_scale:
            ax.set_yscale("log")
            floor = max(1e-4, min(lo[lo > 0].min() if (lo > 0).any() else 1e-3,
                                  float(np.exp(-grid[-1] / n0))) * 0.7)
            ax.set_ylim(floor, 1.15)
            _log_ticks(ax, floor)
        else:
            ax.set_ylim(0, 1.05)
        ax.set_xlim(0, grid[-1])
        ax.set_xlabel("chain length N (beads)")
        ax.set_ylabel("P(unknot)")
        ax.grid(linewidth=0.4, alpha=0.5)
        ax.set_axisbelow(True)
        ax.legend(frameon=False, loc="lower left")
        ax.set_title(title or f"{fit['method'].upper()} fit, {len(pts)} lengths", loc="left",
                     fontsize=8, color="#444444")
        return fig

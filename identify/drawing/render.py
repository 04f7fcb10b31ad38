"""Drawn diagrams written out: SVG written directly, PNG and PDF through matplotlib.

The SVG holds one ``<g class="panel">`` per diagram and inside it one
``<g class="component">`` per component, each with a single ``<path>`` whose
sub-paths are the drawn pieces in the direction of travel (a gap at every
under-pass between two sub-paths).  Coordinates are on screen (y down), and
the picture is seen from the same side as the PD code's counter-clockwise
order.
"""

from __future__ import annotations

import math
from pathlib import Path
from xml.sax.saxutils import escape, quoteattr

import numpy as np

from ..errors import KnotsiftError
from .layout import DiagramLayout

__all__ = ["PALETTE", "DrawOptions", "svg_text", "write_drawing", "drawing_figure",
           "DrawingError", "FORMATS", "require_matplotlib"]

#: Component colours: our own choice, dark enough on white and told apart in grey.
PALETTE = ("#1f4e79", "#c0504d", "#2e7d4f", "#7a4fa3", "#b8860b", "#2b8a9a", "#8c564b",
           "#4d4d4d")
FORMATS = (".svg", ".png", ".pdf")
_SCALE = 90.0      # screen units per layout unit
_STROKE = 3.2


class DrawingError(KnotsiftError, ValueError):
    """A drawing cannot be written (unknown format, nothing to draw, missing extra)."""


class DrawOptions:
    """What to show besides the strands.

    Parameters
    ----------
    arrows : bool
        An arrow on every edge in the direction of travel.
    signs : bool
        The sign (+ or -) of every crossing beside it.
    labels : bool
        The PD edge labels beside their edges, and the crossing numbers (from 0).
    """

    __slots__ = ("arrows", "signs", "labels")

    def __init__(self, arrows: bool = False, signs: bool = False, labels: bool = False):
        self.arrows, self.signs, self.labels = bool(arrows), bool(signs), bool(labels)


def _screen(points: np.ndarray, origin: np.ndarray) -> np.ndarray:
    """Layout coordinates (y up) to screen coordinates (y down); keeps orientation as seen."""
    out = (points - origin) * _SCALE
    out[:, 1] = -out[:, 1]
    return out


def _fmt(v: float) -> str:
    return f"{v:.3f}".rstrip("0").rstrip(".")


def _path_data(pieces: list[np.ndarray], closed: bool) -> str:
    parts = []
    for piece in pieces:
        pts = piece[:-1] if closed else piece
        cmd = "M" + " L".join(f"{_fmt(x)},{_fmt(y)}" for x, y in pts)
        parts.append(cmd + (" Z" if closed else ""))
    return " ".join(parts)


def _annotations(layout: DiagramLayout, options: DrawOptions):
    """(kind, x, y, text or angle) of the arrows, signs and labels in layout coordinates."""
    d = layout.diagram
    marks = []
    if not d.number_of_crossings():
        return marks
    span = layout.bounds()
    size = max(span[2] - span[0], span[3] - span[1]) or 1.0
    for label, strand in sorted(layout.strands.items()):
        mid, direction = layout.edge_midpoint(label)
        normal = np.array([-direction[1], direction[0]])
        if options.arrows:
            marks.append(("arrow", mid, direction, strand.component))
        if options.labels:
            marks.append(("label", mid + normal * 0.045 * max(size, 1.0) ** 0.5, str(label),
                          strand.component))
    for i, sign in enumerate(d.signs()):
        c = layout.crossings[i]
        if options.signs:
            marks.append(("sign", c + np.array([0.05, 0.05]), "+" if sign > 0 else "\u2212", None))
        if options.labels:
            marks.append(("crossing", c + np.array([-0.06, -0.06]), f"c{i}", None))
    return marks


def svg_text(panels: list[tuple[str, DiagramLayout]], options: DrawOptions | None = None,
             columns: int | None = None) -> str:
    """An SVG document with one panel per (title, layout).

    Parameters
    ----------
    panels : list of (str, DiagramLayout)
    options : DrawOptions, optional
    columns : int, optional
        Panels per row (default: about square).

    Returns
    -------
    str
        A standalone SVG document (UTF-8 text).
    """
    if not panels:
        raise DrawingError("nothing to draw")
    options = options or DrawOptions()
    columns = columns or max(1, math.ceil(math.sqrt(len(panels))))
    boxes = []
    for _, lay in panels:
        x0, y0, x1, y1 = lay.bounds()
        boxes.append((x0, y0, x1, y1))
    margin = 0.35
    cell_w = max(b[2] - b[0] for b in boxes) + 2 * margin
    cell_h = max(b[3] - b[1] for b in boxes) + 2 * margin + 0.35
    rows = math.ceil(len(panels) / columns)
    width, height = cell_w * columns * _SCALE, cell_h * rows * _SCALE
    out = [f'<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 {_fmt(width)} '
           f'{_fmt(height)}" width="{_fmt(width)}" height="{_fmt(height)}" '
           'font-family="sans-serif">',
           f'<rect width="{_fmt(width)}" height="{_fmt(height)}" fill="white"/>']
    for n, ((title, lay), box) in enumerate(zip(panels, boxes)):
        col, row = n % columns, n // columns
        # centre the drawing in its cell; screen origin at the cell's top-left corner
        cx, cy = (box[0] + box[2]) / 2, (box[1] + box[3]) / 2
        ox = col * cell_w * _SCALE + cell_w * _SCALE / 2
        oy = row * cell_h * _SCALE + (cell_h + 0.35) * _SCALE / 2
        origin = np.array([cx, cy])
        out.append(f'<g class="panel" data-title={quoteattr(title)} '
                   f'transform="translate({_fmt(ox)},{_fmt(oy)})">')
        if title:
            out.append(f'<text x="0" y="{_fmt(-(cell_h / 2) * _SCALE + 22)}" '
                       f'text-anchor="middle" font-size="15">{escape(title)}</text>')
        for k, (pieces, closed) in enumerate(zip(lay.pieces, lay.closed)):
            colour = PALETTE[k % len(PALETTE)]
            screen = [_screen(p, origin) for p in pieces]
            out.append(f'<g class="component" data-component="{k}" fill="none" '
                       f'stroke="{colour}" stroke-width="{_STROKE}" stroke-linecap="round" '
                       'stroke-linejoin="round">')
            out.append(f'<path d="{_path_data(screen, closed)}"/>')
            out.append('</g>')
        marks = _annotations(lay, options)
        if marks:
            out.append('<g class="marks">')
        for kind, at, what, comp in marks:
            x, y = _screen(np.array([at]), origin)[0]
            if kind == "arrow":
                angle = math.degrees(math.atan2(-what[1], what[0]))
                colour = PALETTE[comp % len(PALETTE)]
                out.append(f'<path class="arrow" d="M -6,-5 L 5,0 L -6,5 Z" fill="{colour}" '
                           f'transform="translate({_fmt(x)},{_fmt(y)}) rotate({_fmt(angle)})"/>')
            else:
                size = {"label": 11, "sign": 13, "crossing": 9}[kind]
                fill = "#666666" if kind == "crossing" else "#111111"
                out.append(f'<text class="{kind}" x="{_fmt(x)}" y="{_fmt(y)}" '
                           f'font-size="{size}" fill="{fill}" text-anchor="middle" '
                           f'dominant-baseline="middle">{escape(what)}</text>')
        if marks:
            out.append('</g>')
        out.append('</g>')
    out.append('</svg>')
    return "\n".join(out) + "\n"


def drawing_figure(panels: list[tuple[str, DiagramLayout]], options: DrawOptions | None = None,
                   columns: int | None = None):
    """The same picture as a matplotlib ``Figure`` (no display needed).

    Raises
    ------
    DrawingError
        When matplotlib is missing (it comes with the ``plots`` extra).
    """
    Figure = _matplotlib_figure()
    if not panels:
        raise DrawingError("nothing to draw")
    options = options or DrawOptions()
    columns = columns or max(1, math.ceil(math.sqrt(len(panels))))
    rows = math.ceil(len(panels) / columns)
    fig = Figure(figsize=(2.6 * columns, 2.8 * rows), layout="constrained")
    axes = fig.subplots(rows, columns, squeeze=False)
    for ax in axes.flat:
        ax.set_axis_off()
    for n, (title, lay) in enumerate(panels):
        ax = axes.flat[n]
        for k, pieces in enumerate(lay.pieces):
            colour = PALETTE[k % len(PALETTE)]
            for piece in pieces:
                ax.plot(piece[:, 0], piece[:, 1], color=colour, linewidth=2.2,
                        solid_capstyle="round")
        for kind, at, what, comp in _annotations(lay, options):
            if kind == "arrow":
                ax.annotate("", xy=at + what * 0.04, xytext=at - what * 0.04,
                            arrowprops={"arrowstyle": "-|>", "color": PALETTE[comp % len(PALETTE)],
                                        "lw": 0, "mutation_scale": 12})
            else:
                ax.text(at[0], at[1], what, ha="center", va="center",
                        fontsize={"label": 7, "sign": 9, "crossing": 6}[kind],
                        color="#666666" if kind == "crossing" else "#111111")
        ax.set_aspect("equal")
        if title:
            ax.set_title(title, fontsize=9)
    return fig


def require_matplotlib():
    """matplotlib (non-interactive backend), or one clear error naming the ``plots`` extra.

    Raises
    ------
    knotsift.extras.MissingExtraError
    """
    from ..extras import require

    matplotlib = require("matplotlib", "plots", "drawing figures, PNG and PDF")
    matplotlib.use("Agg", force=False)
    return matplotlib


def _matplotlib_figure():
    require_matplotlib()
    from matplotlib.figure import Figure

    return Figure


def write_drawing(panels: list[tuple[str, DiagramLayout]], path, options: DrawOptions | None = None,
                  columns: int | None = None) -> Path:
    """Write the panels to ``path``; the extension picks SVG, PNG or PDF.

    Raises
    ------
    DrawingError
        For another extension, or PNG/PDF without matplotlib.
    """
    path = Path(path)
    suffix = path.suffix.lower()
    if suffix not in FORMATS:
        raise DrawingError(f"a drawing is written as .svg, .png or .pdf, got {path.name!r}",
                           value=str(path))
    if suffix == ".svg":
        text = svg_text(panels, options, columns)
        try:
            path.write_text(text, encoding="utf-8")
        except OSError as exc:
            raise DrawingError(f"cannot write {path}: {exc.strerror}", value=str(path)) from None
        return path
    fig = drawing_figure(panels, options, columns)
    try:
        fig.savefig(path, dpi=150)
    except OSError as exc:
        raise DrawingError(f"cannot write {path}: {exc.strerror}", value=str(path)) from None
    return path

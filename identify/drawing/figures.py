"""Drawings as matplotlib figures, for use from Python and in notebooks."""

from __future__ import annotations

from pathlib import Path

from ..diagram import Diagram
from ..errors import DiagramError

__all__ = ["draw_diagram"]


def draw_diagram(diagram: Diagram, path: str | Path | None = None, *, seed: int = 0,
                 simplified: bool = False, arrows: bool = False, signs: bool = False,
                 labels: bool = False, title: str = ""):
    """Draw a diagram: a matplotlib ``Figure``, or a file when ``path`` is given.

    Parameters
    ----------
    diagram : Diagram
    path : path-like, optional
        ``.svg``, ``.png`` or ``.pdf``; without it the figure is returned.
    seed : int
        The same diagram and seed give the same picture.
    simplified : bool
        Draw the simplified diagram instead.
    arrows, signs, labels : bool
        Orientation arrows, crossing signs, PD edge labels and crossing numbers.
    title : str

    Returns
    -------
    matplotlib.figure.Figure or pathlib.Path

    Raises
    ------
    DiagramError
        When ``diagram`` is not a Diagram.
    DrawingError
        For an unknown file extension, or without matplotlib for a figure.
    """
    from .layout import layout_diagram
    from .render import DrawOptions, drawing_figure, write_drawing

    if not isinstance(diagram, Diagram):
        raise DiagramError(f"draw_diagram needs a Diagram, got {type(diagram).__name__}",
                           value=diagram)
    if simplified:
        from ..simplify import simplify

        diagram = simplify(diagram)
    options = DrawOptions(arrows=arrows, signs=signs, labels=labels)
    panels = [(title, layout_diagram(diagram, seed=seed))]
    if path is None:
        return drawing_figure(panels, options)
    return write_drawing(panels, path, options)

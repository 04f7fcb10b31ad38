"""Writing pictures: SVG needs nothing extra; figures without matplotlib name the extra."""

from __future__ import annotations

import sys
import xml.etree.ElementTree as ET

import pytest

from knotsift import Diagram
from knotsift.drawing.layout import layout_diagram
from knotsift.drawing.render import DrawingError, drawing_figure, svg_text
from knotsift.extras import MissingExtraError

from .readback import SVG


def test_svg_needs_no_matplotlib(monkeypatch):
    """An SVG drawing is written without importing matplotlib; a figure names the extra."""
    monkeypatch.setitem(sys.modules, "matplotlib", None)   # any import of it now fails
    panels = [("trefoil", layout_diagram(Diagram([(1, 5, 2, 4), (3, 1, 4, 6), (5, 3, 6, 2)])))]
    root = ET.fromstring(svg_text(panels))
    assert root.tag == f"{SVG}svg"
    with pytest.raises(MissingExtraError, match=r"knotsift\[plots\]"):
        drawing_figure(panels)


def test_svg_titles_are_escaped():
    """Panel titles from a file are text, never markup."""
    panels = [("<b>R7 & co</b>", layout_diagram(Diagram([(1, 3, 2, 4), (3, 1, 4, 2)])))]
    root = ET.fromstring(svg_text(panels))
    titles = [t.text for t in root.iter(f"{SVG}text")]
    assert "<b>R7 & co</b>" in titles


def test_svg_of_nothing_is_an_error():
    """An empty list of panels is a clear error."""
    with pytest.raises(DrawingError, match="nothing to draw"):
        svg_text([])

"""Drawings from Python: draw_diagram, result.draw() and the notebook picture of a result."""

from __future__ import annotations

import pytest

from knotsift import Diagram, identify
from knotsift.drawing.figures import draw_diagram
from knotsift.drawing.render import DrawingError
from knotsift.errors import DiagramError
from knotsift.invariants.fingerprint import fingerprint
from knotsift.result import IdentifyResult

from .readback import diagram_from_drawing, panels_of

pytest.importorskip("matplotlib")


def test_result_draw_returns_a_figure_of_the_input():
    """result.draw() is a matplotlib Figure titled with the name; the same diagram is kept."""
    from matplotlib.figure import Figure

    r = identify("DT: 4 6 8 2")
    fig = r.draw()
    assert isinstance(fig, Figure) and fig.axes[0].get_title() == "4_1"
    assert r.diagram.number_of_crossings() == 4
    assert "diagram" not in r.to_dict()


def test_result_repr_svg_reads_back_as_the_identified_knot():
    """In a notebook a result shows its diagram; that picture reads back to the same knot
    (the right-handed trefoil's Jones polynomial t + t^3 - t^4, Jones 1985, common practice)."""
    r = identify("[[1,5,2,4],[3,1,4,6],[5,3,6,2]]")
    (panel,) = panels_of(r._repr_svg_())
    assert str(fingerprint(diagram_from_drawing(panel)).jones) == "t + t^3 - t^4"


def test_result_draw_without_a_diagram_is_a_clear_error():
    """An error result has nothing to draw, and says so."""
    r = IdentifyResult(status="error", error="bad code")
    assert r._repr_svg_() is None
    with pytest.raises(DrawingError, match="no diagram"):
        r.draw()


def test_draw_diagram_writes_files_and_checks_its_input(tmp_path):
    """draw_diagram writes the extension's format and refuses what is not a Diagram."""
    d = Diagram([(1, 3, 2, 4), (3, 1, 4, 2)])
    assert draw_diagram(d, tmp_path / "hopf.svg").read_text().startswith("<svg")
    with pytest.raises(DiagramError, match="needs a Diagram"):
        draw_diagram("DT: 4 6 2")
    with pytest.raises(DrawingError, match=".svg, .png or .pdf"):
        draw_diagram(d, tmp_path / "hopf.gif")

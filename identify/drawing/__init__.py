"""Pictures of diagrams, chains and runs: planar layouts, SVG/PNG/PDF, HTML reports.

``layout.py`` places a diagram in the plane, ``render.py`` writes it out,
``sources.py`` reads what to draw (codes, code files, 3D chains),
``chain3d.py`` draws chains in 3D and ``report.py`` builds the HTML report of a
classify run.  Names load lazily, so that the command line starts fast.
"""

from __future__ import annotations

__all__ = ["layout_diagram", "DiagramLayout", "draw_diagram", "write_drawing", "DrawOptions",
           "DrawingError"]

_HOMES = {"layout_diagram": "layout", "DiagramLayout": "layout", "draw_diagram": "figures",
          "write_drawing": "render", "DrawOptions": "render", "DrawingError": "render"}


def __getattr__(name):
    if name in _HOMES:
        from importlib import import_module

        return getattr(import_module(f".{_HOMES[name]}", __name__), name)
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")

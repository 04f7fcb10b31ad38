"""The ``knotsift draw`` subcommand (registered by knotsift.cli); thin: one library call."""

from __future__ import annotations

import sys
from pathlib import Path

__all__ = ["register", "register_report"]


def _cmd_draw(args) -> int:
    from ..simplify import simplify
    from .layout import layout_diagram
    from .render import DrawOptions, write_drawing
    from .sources import diagrams_from_file, diagrams_from_text

    source = args.source
    if args.three_d:
        return _draw_chain(args)
    if Path(source).is_file():
        items = diagrams_from_file(source, args.notation, frame=args.frame,
                                   closure=args.closure, seed=args.seed,
                                   closed=False if args.open else None)
    else:
        items = diagrams_from_text(source, args.notation)
    if args.simplified:
        items = [(title, simplify(d)) for title, d in items]
    options = DrawOptions(arrows=args.arrows or args.labels, signs=args.signs,
                          labels=args.labels)
    panels = [(title, layout_diagram(d, seed=args.seed)) for title, d in items]
    for title, lay in panels:
        for note in lay.notes:
            print(f"knotsift draw: warning: {title + ': ' if title else ''}{note}",
                  file=sys.stderr)
    out = write_drawing(panels, args.output, options, columns=args.columns)
    if not args.quiet:
        n = sum(d.number_of_crossings() for _, d in items)
        what = f"{len(items)} diagrams" if len(items) > 1 else "1 diagram"
        print(f"wrote {out} ({what}, {n} crossings)", file=sys.stderr)
    return 0


def _draw_chain(args) -> int:
    from .chain3d import chain_file_figure
    from .render import DrawingError

    if not Path(args.source).is_file():
        raise DrawingError(f"--3d draws a chain of a coordinate file; no file {args.source!r}",
                           value=args.source)
    suffix = Path(args.output).suffix.lower()
    if suffix not in (".png", ".svg", ".pdf"):
        raise DrawingError(f"a drawing is written as .svg, .png or .pdf, got "
                           f"{Path(args.output).name!r}", value=args.output)
    fig = chain_file_figure(args.source, frame=args.frame, chain=args.chain,
                            closed=False if args.open else None, closure=args.closure,
                            seed=args.seed, core=args.core, window=args.window)
    try:
        fig.savefig(args.output, dpi=150)
    except OSError as exc:
        raise DrawingError(f"cannot write {args.output}: {exc.strerror}",
                           value=args.output) from None
    if not args.quiet:
        print(f"wrote {args.output}", file=sys.stderr)
    return 0


def register(sub, notation_choices) -> None:
    """Add ``draw`` to the ``knotsift`` parser's subparsers."""
    from ..curves.commands import _positive
    from .sources import DRAW_CLOSURES

    d = sub.add_parser(
        "draw", help="draw a knot or link diagram (SVG, PNG or PDF)",
        description="Draw the diagram of a code, of every code in a file (one panel each), or "
                    "of one frame of a coordinate file seen along a seeded direction.")
    d.add_argument("source", metavar="CODE_OR_FILE",
                   help="a code in any notation (quote it), a file of codes, or a coordinate "
                        "file (.xyz, .pdb, .csv, .npy)")
    d.add_argument("-o", "--output", required=True,
                   help="the picture to write: .svg, .png or .pdf")
    d.add_argument("-n", "--notation", choices=notation_choices,
                   help="read the codes in this notation instead of detecting it")
    d.add_argument("--simplified", action="store_true",
                   help="draw the simplified diagram (fewer crossings, same knot)")
    d.add_argument("--arrows", action="store_true", help="orientation arrows on every edge")
    d.add_argument("--signs", action="store_true", help="the sign of every crossing")
    d.add_argument("--labels", action="store_true",
                   help="the PD edge labels, crossing numbers and arrows, to check a "
                        "hand-copied code label by label")
    d.add_argument("--seed", type=int, default=0,
                   help="seed of the picture's choices and of a chain's view direction "
                        "(default 0)")
    d.add_argument("--frame", type=int, default=0,
                   help="frame of a coordinate file to draw, from 0 (default 0)")
    d.add_argument("--open", action="store_true",
                   help="coordinate chains are open chains (default: PDB open, others rings)")
    d.add_argument("--closure", choices=DRAW_CLOSURES, default="far",
                   help="how open chains are closed before projecting (default far)")
    d.add_argument("--3d", dest="three_d", action="store_true",
                   help="draw a chain of a coordinate file in 3D (oblique and along the "
                        "projection direction) instead of its diagram")
    d.add_argument("--chain", type=int, default=0,
                   help="with --3d: which chain of the frame, from 0 (default 0)")
    d.add_argument("--core", action="store_true",
                   help="with --3d: identify the chain and colour its knotted core")
    d.add_argument("--window", type=_positive, default=None,
                   help="with --3d: add a strip of the knot types of sliding subchains of "
                        "this many beads")
    d.add_argument("--columns", type=_positive, default=None,
                   help="panels per row when a file holds several codes")
    d.add_argument("-q", "--quiet", action="store_true", help="no message on success")
    d.set_defaults(func=_cmd_draw)


def _cmd_report(args) -> int:
    from .report import write_report

    out = write_report(args.results, args.output, title=args.title, table_path=args.table)
    if not args.quiet:
        print(f"wrote {out} ({out.stat().st_size / 1e6:.1f} MB)", file=sys.stderr)
    return 0


def register_report(sub) -> None:
    """Add ``report`` to the ``knotsift`` parser's subparsers."""
    r = sub.add_parser(
        "report", help="a self-contained HTML report of a classify output",
        description="Build one HTML file (inline figures, no network) from the --out of "
                    "knotsift classify: options and totals, spectrum, P(unknot) against "
                    "length, a diagram per type, the sortable rows and the errors.")
    r.add_argument("results", help="the --out of a classify run (file or database URL)")
    r.add_argument("-o", "--output", default="report.html",
                   help="the HTML file to write (default report.html)")
    r.add_argument("--title", help="the report's title (default from the results' name)")
    r.add_argument("--table", help="reference table for the drawn examples (default shipped)")
    r.add_argument("-q", "--quiet", action="store_true", help="no message on success")
    r.set_defaults(func=_cmd_report)

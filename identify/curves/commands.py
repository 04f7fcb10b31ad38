"""The ``knotsift curve`` command (and 3D files given to ``knotsift identify``).

Thin: the options become one call of :func:`knotsift.curves.report.report_file`.
"""

from __future__ import annotations

import argparse

__all__ = ["register", "identify_coordinate_files"]

#: knotsift.curves.formats.FORMATS (kept here so the CLI starts fast).
FORMAT_CHOICES = ("xyz", "pdb", "csv", "npy", "lammps-data", "lammps-dump", "dcd", "xtc",
                  "trr", "gro", "gsd", "netcdf", "mmcif")
CHAINS_BY_CHOICES = ("auto", "molecules", "fragments", "segments", "one")
CLOSURE_CHOICES = ("direct", "far", "stochastic")


def _integer_at_least(minimum: int, words: str):
    """An argparse type: an integer of at least ``minimum`` (``words`` says it in the message)."""
    def convert(text: str) -> int:
        try:
            n = int(text)
        except ValueError:
            raise argparse.ArgumentTypeError(f"expected {words}, got {text!r}") from None
        if n < minimum:
            raise argparse.ArgumentTypeError(f"expected {words}, got {n}")
        return n
    return convert


_positive = _integer_at_least(1, "a positive integer")
_nonnegative = _integer_at_least(0, "an integer 0 or more")


def _length(text: str) -> float:
    try:
        return float(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"expected a number, got {text!r}") from None


def add_reader_options(parser, box: bool = True) -> None:
    """The MD reader options shared by ``curve``, ``identify`` and ``classify``."""
    parser.add_argument("--topology", metavar="FILE",
                        help="topology of an MD trajectory (PSF, PDB, GRO, TPR, PRMTOP, LAMMPS "
                             "data); needed by DCD, XTC, TRR and NetCDF")
    parser.add_argument("--select", metavar="SELECTION",
                        help="atoms to take, in MDAnalysis's selection language, e.g. "
                             "'name CA' or 'type 1' (default: protein C-alphas if any, else "
                             "all atoms)")
    parser.add_argument("--chains-by", choices=CHAINS_BY_CHOICES, default="auto",
                        help="MD formats: chains are the topology's molecules, bonded "
                             "fragments, segments, or one chain (default auto)")
    if box:
        parser.add_argument("--box", nargs=3, type=_length, metavar=("LX", "LY", "LZ"),
                            help="periodic box the chains are wrapped into (the coordinates' "
                                 "units; Angstrom for MD formats); replaces the file's box")


def reader_options(args) -> dict:
    """The read_frames keywords given on the command line (only those set)."""
    out = {}
    for name in ("topology", "select", "box"):
        value = getattr(args, name, None)
        if value is not None:
            out[name] = value
    if getattr(args, "chains_by", "auto") != "auto":
        out["chains_by"] = args.chains_by
    return out


def _cmd_curve(args) -> int:
    from ..table import open_table
    from .formats import parse_frames
    from .report import report_file

    files = list(args.file or [])
    if args.demo:
        from ..demo.ring_polymer import demo_xyz_path

        files.append(str(demo_xyz_path()))
    if not files:
        import sys

        print("knotsift curve: no input (give a coordinate file or --demo)", file=sys.stderr)
        return 2
    from ..limits import check_at_most

    check_at_most("closures", args.closures, "--closures")
    table = open_table(args.table)
    frames = parse_frames(args.frames) if args.frames else None
    from ..budget import budget_from_args, budget_scope

    status = 0
    for path in files:
        with budget_scope(budget_from_args(args)):
            code = report_file(path, format=args.format, closed=args.closed, frames=frames,
                               closure=args.closure, n_closures=args.closures,
                               seed=args.seed, localise=args.core, table=table,
                               as_json=args.json, progress=None if not args.quiet else False,
                               brief=args.brief, **reader_options(args))
        status = max(status, code)
    return status


def register(sub) -> None:
    """Add the ``curve`` subcommand to the ``knotsift`` parser's subparsers."""
    c = sub.add_parser(
        "curve", help="identify knots in 3D coordinates (XYZ, PDB, CSV/TSV, NumPy, MD "
                      "trajectories)",
        description="Identify the knot type of every chain in every frame of a coordinate "
                    "file. Rings are reduced (KMT) and projected; open chains are closed "
                    "first. Units do not matter.")
    c.add_argument("file", nargs="*", help="coordinate file(s); the format follows the suffix")
    c.add_argument("--demo", action="store_true",
                   help="run on the built-in demo: a knotted ring polymer's Monte Carlo "
                        "trajectory (invented data)")
    c.add_argument("--format", choices=FORMAT_CHOICES,
                   help="read the file in this format instead of guessing from the suffix")
    ring = c.add_mutually_exclusive_group()
    ring.add_argument("--open", dest="closed", action="store_false", default=None,
                      help="treat chains as open (default for PDB)")
    ring.add_argument("--closed", dest="closed", action="store_true", default=None,
                      help="treat chains as rings (default for XYZ, CSV, NumPy)")
    c.add_argument("--closure", choices=CLOSURE_CHOICES, default="stochastic",
                   help="how open chains are closed (default stochastic: the majority type "
                        "over random closures)")
    c.add_argument("--closures", type=_positive, default=100, metavar="N",
                   help="number of random closures (default 100)")
    c.add_argument("--seed", type=_nonnegative, default=0,
                   help="seed of every random step (default 0)")
    c.add_argument("--core", action="store_true",
                   help="also find the knotted core (the shortest subchain keeping the type)")
    c.add_argument("--frames", metavar="START:STOP",
                   help="which frames to read, e.g. 0:100, 10:, ::5 or 7 (from 0)")
    c.add_argument("--json", action="store_true",
                   help="machine-readable output (see README, 'Knots in 3D coordinates')")
    c.add_argument("--brief", action="store_true",
                   help="one line per chain: where, status, answer (tab-separated)")
    add_reader_options(c)
    c.add_argument("--quiet", action="store_true", help="no progress line")
    c.add_argument("--table", help="use this reference table file instead of the shipped one")
    from ..budget import add_budget_arguments

    add_budget_arguments(c)
    c.set_defaults(func=_cmd_curve)


def identify_coordinate_files(args) -> int | None:
    """For ``knotsift identify FILE.xyz``: run the curve report on coordinate files.

    Returns the exit code, or None when the inputs are not (all) coordinate files.
    """
    from .report import is_coordinate_file

    codes = getattr(args, "code", None) or []
    if not codes or getattr(args, "file", None) or getattr(args, "demo", False):
        return None
    if not all(is_coordinate_file(c) for c in codes):
        return None
    from ..table import open_table
    from .report import report_file

    from ..budget import budget_from_args, budget_scope

    table = open_table(getattr(args, "table", None))
    status = 0
    for path in codes:
        with budget_scope(budget_from_args(args)):
            status = max(status, report_file(path, table=table,
                                             as_json=getattr(args, "json", False),
                                             brief=getattr(args, "brief", False),
                                             **reader_options(args)))
    return status

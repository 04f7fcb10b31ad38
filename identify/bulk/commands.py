"""The ``knotsift classify`` and ``knotsift summarise`` subcommands (registered by knotsift.cli).

Exit codes of ``classify``: 0 every item classified; 1 some items failed
(their rows hold the error); 2 usage error; 3 reference table missing;
4 the output cannot be opened or resumed (unreachable database, other
options, not a knotsift output) or the Dask scheduler cannot be reached;
130 interrupted by Ctrl-C (SIGINT), 143 ended by SIGTERM (run again to continue:
the chunks already written are kept, the workers are ended).
"""

from __future__ import annotations

import json
import sys

__all__ = ["register", "EXIT_OUTPUT", "CLOSURE_CHOICES"]

#: Exit code when the output cannot be opened or resumed.
EXIT_OUTPUT = 4
#: Exit code after SIGTERM (128 + 15, the shell's convention).
EXIT_TERMINATED = 143
#: Closures of open chains: knotsift.curves.closure.CLOSURES (kept here so the CLI starts fast).
CLOSURE_CHOICES = ("direct", "far", "stochastic")
_GROUP_TITLES = {"n_beads": "chain length N (beads)", "source": "file"}


def _cmd_classify(args) -> int:
    from .resume import ResumeError
    from .rows import ClassifyOptions
    from .runner import classify

    if args.chunk < 1:
        print("knotsift classify: --chunk must be at least 1", file=sys.stderr)
        return 2
    if args.workers is not None and args.workers < 1:
        print("knotsift classify: --workers must be at least 1", file=sys.stderr)
        return 2
    for name in ("closures", "beads_per_chain"):
        value = getattr(args, name)
        if value is not None and value < 1:
            print(f"knotsift classify: --{name.replace('_', '-')} must be at least 1",
                  file=sys.stderr)
            return 2
    if args.seed < 0:
        print(f"knotsift classify: --seed must be 0 or more, got {args.seed}", file=sys.stderr)
        return 2
    options = ClassifyOptions(notation=args.notation, closed=False if args.open else None,
                              closure=args.closure, n_closures=args.closures, seed=args.seed,
                              core=args.core, beads_per_chain=args.beads_per_chain,
                              table=args.table, topology=args.topology, select=args.select,
                              chains_by=args.chains_by,
                              box=tuple(args.box) if args.box else None,
                              **_budget_options(args))
    try:
        report = classify(args.input, args.out, fmt=args.format, codes_column=args.codes_column,
                          label_column=args.label_column, options=options,
                          workers=args.workers, dask=args.dask, chunk=args.chunk,
                          progress=False if args.quiet else None, force=args.force)
    except ResumeError as exc:
        if args.debug:
            raise
        print(f"knotsift: {exc}", file=sys.stderr)
        return EXIT_OUTPUT
    if args.json:
        json.dump(report.to_dict(), sys.stdout, indent=2)
        print()
    elif not args.quiet or report.failed:
        print(report.text())
    if report.interrupted:
        return EXIT_TERMINATED if report.signal == "SIGTERM" else 130
    return 1 if report.failed else 0


def _cmd_summarise(args) -> int:
    from .plots import plot_spectrum, plot_unknot_probability
    from .resume import ResumeError
    from .summary import (
        knot_spectrum,
        link_spectrum,
        link_spectrum_text,
        read_results,
        row_unit,
        spectrum_text,
        unknot_fit,
    )

    try:
        df = read_results(args.out)
    except ResumeError as exc:
        if args.debug:
            raise
        print(f"knotsift: {exc}", file=sys.stderr)
        return EXIT_OUTPUT
    spec = knot_spectrum(df, by=args.by, by_filename=args.by_filename, mirrors=args.mirrors)
    links = link_spectrum(df, by=args.by, by_filename=args.by_filename)
    fit = fit_error = None
    if args.length_column in df.columns and df[args.length_column].nunique() >= 2:
        try:
            fit = unknot_fit(df, args.length_column, args.fit)
        except Exception as exc:  # noqa: BLE001 - reported, the spectrum still stands
            fit_error = str(exc)
    elif args.plot_length:
        fit_error = (f"P(unknot) against {args.length_column} needs at least two chain "
                     "lengths in the output")
    written = []
    if args.plot:
        written.append(str(plot_spectrum(
            spec, args.plot, group_title=_GROUP_TITLES.get(args.by, args.by)
            or ("condition" if args.by_filename else None), unit=row_unit(df),
            mirrors=args.mirrors, log_scale=args.log)))
    if args.plot_length:
        if fit is None:
            print(f"knotsift summarise: no P(unknot) plot: {fit_error}", file=sys.stderr)
        else:
            written.append(str(plot_unknot_probability(fit, args.plot_length)))
    if args.json:
        records = json.loads(spec.to_json(orient="records"))
        json.dump({"rows": len(df), "spectrum": records,
                   "link_spectrum": json.loads(links.to_json(orient="records")),
                   "unknot_fit": fit,
                   "unknot_fit_error": fit_error, "plots": written}, sys.stdout, indent=2)
        print()
    else:
        print(f"{len(df)} rows in {args.out}")
        print(spectrum_text(spec))
        if len(links):
            print("link spectrum (rings of a frame as one link; nodes = crossing number):")
            print(link_spectrum_text(links))
        if fit:
            print(f"P(unknot) = exp(-N/N0): N0 = {fit['N0']:.4g} +- {fit['N0_error']:.2g} "
                  f"(one standard error; {fit['method']}, {len(fit['points'])} lengths)")
        elif fit_error:
            print(f"no P(unknot) fit: {fit_error}")
        for w in written:
            print(f"wrote {w}")
    return 0


def register(sub, notation_choices) -> None:
    """Add the bulk subcommands to the ``knotsift`` argument parser."""
    from .sources import FORMATS

    c = sub.add_parser("classify", help="classify many diagrams or trajectory frames into a "
                                        "table (parallel, resumable)")
    c.add_argument("input", nargs="+",
                   help="code tables (.csv/.tsv with a code column, or one code per line) "
                        "or trajectories (.xyz, .pdb, .csv, .npy, and MD formats)")
    c.add_argument("--format", choices=FORMATS, default="auto",
                   help="how to read the inputs (default: from the extension and header)")
    c.add_argument("--codes-column", default="code",
                   help="column of a code table holding the codes (default: code)")
    c.add_argument("--label-column", default="label",
                   help="column of a code table holding labels (default: label)")
    c.add_argument("-n", "--notation", choices=notation_choices,
                   help="read every code in this notation instead of detecting it")
    c.add_argument("--open", action="store_true",
                   help="trajectory chains are open chains, closed by --closure (default: "
                        "PDB chains open, other formats rings)")
    c.add_argument("--closure", choices=CLOSURE_CHOICES, default="stochastic",
                   help="how open chains are closed: join the ends, send them far out, or "
                        "the majority over random closures (default stochastic)")
    c.add_argument("--closures", type=int, default=100,
                   help="random closures per open chain for --closure stochastic "
                        "(default 100)")
    c.add_argument("--seed", type=int, default=0,
                   help="seed of every random step of the 3D pipeline (default 0)")
    c.add_argument("--core", action="store_true",
                   help="also find the knotted core of each knotted chain (slower)")
    c.add_argument("--beads-per-chain", type=int, default=None,
                   help="split each XYZ frame into chains of this many beads (a melt)")
    from ..curves.commands import add_reader_options  # MD trajectories: --topology, --select

    add_reader_options(c)
    c.add_argument("-o", "--out", default="results.sqlite",
                   help="results.sqlite (the default: SQLite, embedded), results.csv, "
                        "results.parquet or a database URL (postgresql://user@host/db); run "
                        "again to resume")
    c.add_argument("-w", "--workers", type=int, default=None,
                   help="worker processes (default: all cores; 1 runs in this process)")
    c.add_argument("--dask", metavar="SCHEDULER",
                   help="run on Dask: a scheduler address (tcp://host:8786) or 'local'")
    c.add_argument("--chunk", type=int, default=200,
                   help="items per chunk, the unit of work and of each committed write "
                        "(default 200)")
    c.add_argument("--table", help="use this reference table file instead of the shipped one")
    c.add_argument("--force", action="store_true",
                   help="resume even if a trajectory changed since the run began (its frames "
                        "are keyed by index: rows of both versions may mix)")
    c.add_argument("-q", "--quiet", action="store_true",
                   help="no progress line; print the summary only if some items failed")
    c.add_argument("--json", action="store_true", help="print the run summary as JSON")
    from ..budget import add_budget_arguments

    add_budget_arguments(c)
    c.set_defaults(func=_cmd_classify)

    s = sub.add_parser("summarise", help="knot spectrum of a classify output, with plots")
    s.add_argument("out", help="the --out of a classify run (file or database URL)")
    group = s.add_mutually_exclusive_group()
    group.add_argument("--by", metavar="COLUMN",
                       help="group by an output column (source, n_beads, ...) or a column "
                            "of the code table")
    group.add_argument("--by-filename", metavar="REGEX",
                       help="group by a condition read from the file name (first regex group)")
    s.add_argument("--mirrors", choices=("keep", "merge"), default="keep",
                   help="count 3_1 and 3_1* apart (keep, default) or together (merge)")
    s.add_argument("--length-column", default="n_beads",
                   help="column of the chain length for P(unknot) (default: n_beads)")
    s.add_argument("--fit", choices=("mle", "wls"), default="mle",
                   help="fit of P(unknot) = exp(-N/N0): maximum likelihood (default) or "
                        "weighted least squares on log P")
    s.add_argument("--plot", metavar="FILE",
                   help="write the spectrum bar chart (.png, .svg or .pdf)")
    s.add_argument("--log", action="store_true",
                   help="logarithmic fraction axis on the spectrum chart (rare types readable)")
    s.add_argument("--plot-length", metavar="FILE",
                   help="write P(unknot) against chain length with the fit (.png, .svg, .pdf)")
    s.add_argument("--json", action="store_true", help="machine-readable output")
    s.set_defaults(func=_cmd_summarise)


def _budget_options(args) -> dict:
    """The budget options of a parsed classify command, as ClassifyOptions fields."""
    from ..budget import budget_from_args

    b = budget_from_args(args)
    return {"jones": b.jones, "jones_memory": b.jones_memory, "jones_seconds": b.jones_seconds,
            "wall_seconds": b.wall_seconds}

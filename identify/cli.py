"""The ``knotsift`` command: thin wrappers, each calling one library function.

Exit codes: 0 success; 1 some inputs could not be read or were refused by a
limit (their errors are reported, the rest is processed), or a name given to
``show`` is not in the table; 2 usage error (an unknown option, a bad
--limit, an empty name); 3 the reference table is missing or unreadable; 4
(classify, summarise) the output cannot be opened, is locked by another run,
or is damaged; 130 interrupted; 141 standard output was closed early
(``knotsift ... | head``): the command stops quietly, as a process ended by
SIGPIPE would; 143 ended by SIGTERM.
"""

from __future__ import annotations

import argparse
import json
import sys

__all__ = ["main"]

NOTATION_CHOICES = ("pd", "dt", "gauss", "braid", "conway")


def _inputs(args) -> list[tuple[str, object]]:
    """(label, text) of every input: inline codes, files, --file, standard input, or the demo.

    An argument naming an existing file is read as a file (:func:`_file_items`);
    a path-like argument naming no file becomes an error item ("no such
    file"), a :class:`~knotsift.errors.NotationError` in place of the text.
    """
    from .errors import NotationError

    items: list[tuple[str, object]] = []
    if args.demo:
        from .demo import demo_path

        args.file = [str(demo_path())]
    for k, code in enumerate(args.code or []):
        label = f"input {k + 1}" if len(args.code) > 1 else "input"
        if code == "-":
            items.extend(_lines(_read_lines(sys.stdin.buffer, "stdin"), "stdin"))
        elif _is_file(code):
            items.extend(_file_items(code))
        elif _looks_like_path(code):
            items.append((label, NotationError(
                f"no such file: {code!r} (the argument looks like a file name; a code "
                "with a name, such as 'DT: 4 6 2', is never read as one)", value=code)))
        else:
            items.append((label, code))
    for path in args.file or []:
        try:
            with open(path, "rb") as fh:
                items.extend(_lines(_read_lines(fh, path), path))
        except OSError as exc:
            raise NotationError(f"cannot read {path}: {exc.strerror}", value=path) from None
    if not items and not sys.stdin.isatty() and not args.code and not args.file:
        items.extend(_lines(_read_lines(sys.stdin.buffer, "stdin"), "stdin"))
    return items


def _read_lines(fh, where: str) -> list[str]:
    """The lines of a binary stream as UTF-8 text, each bounded by the text_chars limit.

    A line longer than the limit (``/dev/zero``, a file without newlines) or
    bytes that are not UTF-8 are refused, naming the line, before more is read.
    """
    from .errors import NotationError
    from .limits import LimitError, current

    cap = current().text_chars
    out = []
    n = 0
    while True:
        raw = fh.readline(cap + 2)
        if not raw:
            return out
        n += 1
        if len(raw) > cap + 1 or (len(raw) == cap + 1 and not raw.endswith(b"\n")):
            raise LimitError(f"line {n} is longer than the limit text_chars = {cap}; raise it "
                             "with --limit text_chars=N if you mean it", value=n, where=where)
        try:
            out.append(raw.decode("utf-8").rstrip("\r\n"))
        except UnicodeDecodeError as exc:
            raise NotationError(f"line {n} is not UTF-8 text (byte {exc.start + 1} of the line "
                                "cannot be decoded); binary data or another encoding",
                                value=n, where=where) from None


def _is_file(text: str) -> bool:
    from pathlib import Path

    try:
        return len(text) < 4096 and "\n" not in text and Path(text).is_file()
    except (OSError, ValueError):
        return False


def _looks_like_path(text: str) -> bool:
    """A path separator, or a name ending in a suffix such as ``.json`` or ``.xyz``.

    No notation uses letters after a dot (Conway's ``.2.20`` has digits), so
    a suffix of letters marks a file name.
    """
    import re

    s = text.strip()
    if not s or any(ch.isspace() for ch in s):
        return False
    return "/" in s or "\\" in s or re.fullmatch(r"[^.]+(\.[^.]+)*\.[A-Za-z][A-Za-z0-9]{0,7}",
                                                  s) is not None


def _file_items(path: str) -> list[tuple[str, object]]:
    """The codes of an existing file named as an argument.

    ``.json``: a PD code (a list of 4-lists), any one code as a JSON list, or
    a list of code strings.  Other files: one code per line, as ``--file``.
    Coordinate files are routed to the 3D path before this is reached.
    """
    from .errors import NotationError

    try:
        with open(path, encoding="utf-8") as fh:
            text = fh.read()
    except (OSError, UnicodeDecodeError) as exc:
        reason = getattr(exc, "strerror", None) or "not a text file"
        return [(path, NotationError(f"cannot read {path}: {reason}", value=path))]
    if path.lower().endswith(".json"):
        import json as _json

        try:
            data = _json.loads(text)  # parsed as data, never evaluated
        except ValueError as exc:
            return [(path, NotationError(f"{path}: not valid JSON ({exc})", value=path))]
        if isinstance(data, list) and data and all(isinstance(x, str) for x in data):
            return [(f"{path}, item {k + 1}", x) for k, x in enumerate(data)]
        if isinstance(data, list):
            return [(path, _json.dumps(data))]
        return [(path, NotationError(f"{path}: expected a JSON list (a PD code such as "
                                     "[[1,5,2,4],[3,1,4,6],[5,3,6,2]], or a list of codes), "
                                     f"found a JSON {type(data).__name__}", value=path))]
    return _lines(text.splitlines(), path)


def _lines(lines: list[str], where: str) -> list[tuple[str, str]]:
    """One diagram per line; '#' comments and blank lines skipped; 'label<TAB>code' allowed."""
    out = []
    for n, line in enumerate(lines, 1):
        s = line.strip()
        if not s or s.startswith("#"):
            continue
        if "\t" in s:
            label, code = s.split("\t", 1)
            out.append((f"{where}, line {n} ({label.strip()})", code.strip()))
        else:
            out.append((f"{where}, line {n}", s))
    return out


def _cmd_identify(args) -> int:
    from .curves.commands import identify_coordinate_files
    from .errors import KnotsiftError
    from .identification import identify
    from .result import JSON_SCHEMA_VERSION, IdentifyResult
    from .table import open_table

    routed = identify_coordinate_files(args)  # FILE.xyz / .pdb / .npy: the 3D pipeline
    if routed is not None:
        return routed
    table = open_table(args.table)
    items = _inputs(args)
    if not items:
        print("knotsift identify: no input (give a code, --file, --demo, or pipe codes in)",
              file=sys.stderr)
        return 2
    from .budget import budget_from_args, item_budget

    budget = budget_from_args(args)
    results = []
    for label, text in items:
        try:
            if isinstance(text, KnotsiftError):
                raise text
            with item_budget(budget):
                r = identify(text, args.notation, table=table, neighbours=args.neighbours,
                             label=label, expect=getattr(args, "expect", None))
        except KnotsiftError as exc:
            if args.debug:
                raise
            r = IdentifyResult(status="error", error=str(exc), source=label)
        results.append(r)
        if getattr(args, "brief", False) and not args.json:
            from .brief import brief_line

            print(brief_line(r))
        elif not args.json:
            print(r.to_text())
            if len(items) > 1:
                print()
    summary = {s: sum(1 for r in results if r.status == s)
               for s in ("identified", "ambiguous", "not in table", "too complex", "error")}
    summary["total"] = len(results)
    if args.json:
        json.dump({"schema_version": JSON_SCHEMA_VERSION, "results": [r.to_dict() for r in results],
                   "summary": summary}, sys.stdout, indent=2)
        print()
    elif len(results) > 1 and not getattr(args, "brief", False):
        print("summary: " + ", ".join(f"{v} {k}" for k, v in summary.items() if k != "total")
              + f" of {summary['total']}")
    if summary["error"]:
        for r in results:
            if r.status == "error":
                print(f"knotsift: {r.source}: {r.error}", file=sys.stderr)
        return 1
    return 0


def _print_entry(info: dict, as_json: bool, to_text) -> None:
    """A table entry (knot or link) as JSON or as readable text."""
    if as_json:
        json.dump(info, sys.stdout, indent=2)
        print()
    else:
        print(to_text(info))


def _cmd_show(args) -> int:
    from .entry import describe_entry, entry_text
    from .limits import check_text
    from .link_entry import describe_link, find_link, link_entry_text
    from .names import resolve_name
    from .table import open_table

    if not args.name.strip():
        print("knotsift show: give a name, e.g. 4_1 or 'figure eight'", file=sys.stderr)
        return 2
    check_text(args.name, "the name")
    table = open_table(args.table)
    link = find_link(args.name, table)
    if link is not None:
        _print_entry(describe_link(link, table), args.json, link_entry_text)
        return 0
    if "^" in args.name:
        print(f"knotsift show: no link named {args.name!r} (the link table holds links of 2 and "
              "3 components through 8 crossings, named like 5^2_1)", file=sys.stderr)
        return 1
    found = resolve_name(args.name, table)
    best = found.match
    if best is None:
        hint = ""
        if found.suggestions:
            hint = "; did you mean: " + ", ".join(
                f"{m.name} ({m.how})" for m in found.suggestions) + "?"
        if args.json:
            json.dump({"query": args.name, "found": False, "reason": found.reason,
                       "did_you_mean": [m.name for m in found.suggestions]}, sys.stdout,
                      indent=2)
            print()
        print(f"knotsift show: {found.reason}{hint}", file=sys.stderr)
        return 1
    info = describe_entry(best.name, best.mirrored, table)
    info.update(query=args.name, matched_by=best.how, guess=best.guess,
                notes=list(found.notes),
                other_matches=[m.name for m in found.suggestions if m.name != best.name])
    if best.guess:
        print(f"knotsift show: no table entry is named {args.name!r}; showing {info['label']} "
              f"as a guess ({best.how})", file=sys.stderr)
    _print_entry(info, args.json, entry_text)
    return 0


def _cmd_lookup(args) -> int:
    from .lookup import lookup_invariants, lookup_text
    from .table import open_table

    table = open_table(args.table)
    found = lookup_invariants(table, jones=args.jones, alexander=args.alexander,
                              determinant=args.determinant, signature=args.signature)
    if args.json:
        json.dump(found, sys.stdout, indent=2)
        print()
    else:
        print(lookup_text(found))
    return 0


def _cmd_build(args) -> int:
    from knotsift.data_build.build import build_table

    from .table import default_table_path

    out = args.output or default_table_path()
    report = build_table(out, max_crossings=args.max_crossings, keep_going=args.keep_going,
                         show_progress=False if args.quiet else None)
    if not args.quiet:
        print(report.summary())
        for p in report.problems:
            print(f"  problem: {p}")
    return 0


def _parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(
        prog="knotsift",
        description="Identify knots from diagrams by exact invariants matched against a "
                    "reference table.")
    p.add_argument("--debug", action="store_true", help="show tracebacks on errors")
    sub = p.add_subparsers(dest="command", required=True)

    q = sub.add_parser("identify", help="identify knots given as codes")
    q.add_argument("code", nargs="*", help="a code in any notation (quote it), or - for stdin")
    q.add_argument("-n", "--notation", choices=NOTATION_CHOICES,
                   help="read the codes in this notation instead of detecting it")
    q.add_argument("-f", "--file", action="append",
                   help="a file with one code per line ('label<TAB>code' allowed); repeatable")
    q.add_argument("--demo", action="store_true",
                   help="run on the built-in demo batch of transcribed plasmid micrographs")
    q.add_argument("--expect", choices=("knot", "link"),
                   help="require a knot (one component) or a link (two or more); other "
                        "inputs are reported as errors")
    q.add_argument("--neighbours", action="store_true",
                   help="also list table knots one crossing change away")
    q.add_argument("--json", action="store_true", help="machine-readable output (see README)")
    q.add_argument("--brief", action="store_true",
                   help="one line per item: where, status, answer (tab-separated)")
    q.add_argument("--table", help="use this reference table file instead of the shipped one")
    from .budget import add_budget_arguments

    add_budget_arguments(q)
    from .curves.commands import add_reader_options  # for 3D and MD files given to identify

    add_reader_options(q)
    q.set_defaults(func=_cmd_identify)

    s = sub.add_parser("show", help="print a table entry, found by a name typed loosely")
    s.add_argument("name", help="e.g. 4_1, 'figure eight', 7-4, 74, '3_1 mirror'")
    s.add_argument("--json", action="store_true", help="machine-readable output")
    s.add_argument("--table", help="use this reference table file")
    s.set_defaults(func=_cmd_show)

    lk = sub.add_parser("lookup", help="find table knots by invariant values you already have")
    lk.add_argument("--jones", help="Jones polynomial as text, e.g. 't + t^3 - t^4'")
    lk.add_argument("--alexander", help="Alexander polynomial as text, e.g. 't^2 - t + 1'")
    lk.add_argument("--determinant", type=int, help="the determinant")
    lk.add_argument("--signature", type=int, help="the signature (right-handed trefoil: -2)")
    lk.add_argument("--json", action="store_true", help="machine-readable output")
    lk.add_argument("--table", help="use this reference table file")
    lk.set_defaults(func=_cmd_lookup)

    b = sub.add_parser("build", help="rebuild the reference table from reference/")
    b.add_argument("-o", "--output", help="where to write (default: the shipped table)")
    b.add_argument("--max-crossings", type=int, default=10, choices=range(3, 11),
                   metavar="{3..10}", help="largest crossing number included (default 10)")
    b.add_argument("--keep-going", action="store_true",
                   help="leave out entries failing a check instead of stopping")
    b.add_argument("--quiet", action="store_true", help="no progress or summary")
    b.set_defaults(func=_cmd_build)

    from .bulk.commands import register as register_bulk  # classify, summarise

    register_bulk(sub, NOTATION_CHOICES)

    from .curves.commands import register as register_curve  # knots in 3D coordinates

    register_curve(sub)

    from .drawing.commands import register as register_draw  # pictures of diagrams
    from .drawing.commands import register_report  # the HTML report of a classify run

    register_draw(sub, NOTATION_CHOICES)
    register_report(sub)
    for command in sub.choices.values():   # the input limits (knotsift.limits), on every command
        command.add_argument("--limit", action="append", metavar="NAME=VALUE", default=[],
                             help="raise or lower an input limit, e.g. crossings=5000 "
                                  "(repeatable; see README, 'Limits')")
    return p


#: Exit status after the reader of standard output went away (128 + SIGPIPE, as a shell
#: reports a process ended by that signal; common practice).
CLOSED_PIPE_EXIT = 141


def _closed_pipe() -> int:
    """Quiet exit when standard output is a pipe whose reader closed (``knotsift ... | head``).

    Standard output is pointed at the null device so that the interpreter's
    final flush does not raise again; nothing is printed.
    """
    import os

    try:
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
    except (OSError, ValueError):
        pass
    return CLOSED_PIPE_EXIT


def main(argv: list[str] | None = None) -> int:
    """Entry point of the ``knotsift`` command."""
    from .errors import KnotsiftError, TableError

    parser = _parser()
    try:
        args = parser.parse_args(argv)  # --help writes to standard output too
    except BrokenPipeError:
        return _closed_pipe()
    from .limits import LimitError, current, parse_limit_options, set_limits

    try:
        if getattr(args, "limit", None):
            set_limits(parse_limit_options(args.limit, current()))
        else:
            current()   # a bad KNOTSIFT_LIMITS is reported here
    except LimitError as exc:
        print(f"knotsift: {exc}", file=sys.stderr)
        return 2
    try:
        code = args.func(args)
        sys.stdout.flush()  # a closed pipe shows here, inside the handler below
        return code
    except BrokenPipeError:
        return _closed_pipe()
    except TableError as exc:
        if args.debug:
            raise
        print(f"knotsift: {exc}", file=sys.stderr)
        return 3
    except KnotsiftError as exc:
        if args.debug:
            raise
        print(f"knotsift: {exc}", file=sys.stderr)
        return 1
    except KeyboardInterrupt:
        print("knotsift: interrupted", file=sys.stderr)
        return 130
    except OSError as exc:   # an unwritable plot, a full disk: one line, not a traceback
        if args.debug:
            raise
        where = f" {exc.filename}" if getattr(exc, "filename", None) else ""
        print(f"knotsift: cannot access{where}: {exc.strerror or exc}", file=sys.stderr)
        return 1


if __name__ == "__main__":
    sys.exit(main())

"""A self-contained HTML report of a classify run.

One file, readable offline and shareable: the figures are inline SVG, there
is no stylesheet, font or script fetched from anywhere, and the only script is
a few lines inside the page that sort the table of rows when a column head is
clicked (or when the address ends in ``#sort=COLUMN`` or ``#sort=-COLUMN``).

Sections: what the report can and cannot say; the run's options and totals;
the knot spectrum with Wilson 95% intervals; P(unknot) against chain length
with its fit when lengths vary; one drawn diagram per type (the reference
table's diagram of that type); the rows; the errors.
"""

from __future__ import annotations

import html
import json
import math
import re
import time
from pathlib import Path

from ..errors import KnotsiftError

__all__ = ["build_report", "write_report", "ReportError", "TABLE_COLUMNS"]

#: Columns of the rows table, in order (a subset of the classify output).
TABLE_COLUMNS = ("source", "frame", "chain", "label", "status", "knot", "crossings_input",
                 "crossings_simplified", "n_beads", "determinant", "signature", "seconds")
_EXAMPLES = 16      # drawn example diagrams at most
_SPECTRUM_TOP = 14  # bars in the spectrum chart


class ReportError(KnotsiftError, ValueError):
    """A report cannot be built (missing or unreadable results, unwritable output)."""


_STYLE = """
body{font-family:system-ui,-apple-system,"Segoe UI",sans-serif;margin:2em auto;max-width:70em;
color:#1b1b1b;padding:0 1em;line-height:1.45}
h1{font-size:1.5em;margin-bottom:.2em}h2{font-size:1.2em;margin-top:2em;border-bottom:1px solid
#ccc}table{border-collapse:collapse;font-size:.85em}td,th{padding:.2em .6em;border-bottom:1px
solid #e4e4e4;text-align:left}th{background:#f3f3f3}td.n{text-align:right;font-variant-numeric:
tabular-nums}.caution{background:#fff8e6;border-left:4px solid #d9a400;padding:.6em 1em}
.examples{display:flex;flex-wrap:wrap;gap:1em}.examples figure{margin:0;width:13em}
.examples svg{width:100%;height:auto}figcaption{font-size:.85em;text-align:center}
#rows th{cursor:pointer;user-select:none}#rows th[aria-sort=ascending]::after{content:" \\25B2"}
#rows th[aria-sort=descending]::after{content:" \\25BC"}.err{color:#9b1c1c}
.figure svg{max-width:100%;height:auto}.muted{color:#666}.wide{overflow-x:auto}
"""

_SORT_SCRIPT = """
(function(){
var table=document.getElementById('rows');if(!table)return;
var body=table.tBodies[0],heads=table.tHead.rows[0].cells;
function key(cell,numeric){var t=cell.textContent;if(!numeric)return t;
var v=parseFloat(t);return isNaN(v)?Infinity:v;}
function sortBy(col,descending){
var numeric=heads[col].dataset.type==='n';
var rows=Array.prototype.slice.call(body.rows);
rows.sort(function(a,b){var x=key(a.cells[col],numeric),y=key(b.cells[col],numeric);
var c=numeric?(x-y||0):(x<y?-1:x>y?1:0);return descending?-c:c;});
var frag=document.createDocumentFragment();rows.forEach(function(r){frag.appendChild(r);});
body.appendChild(frag);
for(var i=0;i<heads.length;i++)heads[i].removeAttribute('aria-sort');
heads[col].setAttribute('aria-sort',descending?'descending':'ascending');
table.dataset.sortedBy=heads[col].dataset.col+(descending?':desc':':asc');}
Array.prototype.forEach.call(heads,function(h,i){h.addEventListener('click',function(){
sortBy(i,h.getAttribute('aria-sort')==='ascending');});});
var m=/^#sort=(-?)([a-z_]+)$/.exec(location.hash);
if(m){for(var i=0;i<heads.length;i++){if(heads[i].dataset.col===m[2]){sortBy(i,m[1]==='-');}}}
})();
"""


def _esc(value) -> str:
    if value is None or (isinstance(value, float) and math.isnan(value)):
        return ""
    try:
        import pandas as pd

        if value is pd.NA:
            return ""
    except ImportError:  # pragma: no cover
        pass
    return html.escape(str(value))


def run_options(out) -> dict:
    """The options a classify output was written with, or {} when none are recorded."""
    text = str(out)
    try:
        if "://" in text or Path(text).suffix.lower() in (".sqlite", ".sqlite3", ".db"):
            import sqlalchemy as sa

            url = text if "://" in text else f"sqlite:///{Path(text).resolve()}"
            engine = sa.create_engine(url)
            try:
                with engine.connect() as conn:
                    value = conn.execute(sa.text(
                        "SELECT value FROM classifications_meta WHERE name = 'meta'")).scalar()
            finally:
                engine.dispose()
            meta = json.loads(value) if value else {}
        elif Path(text).suffix.lower() == ".csv":
            manifest = Path(text + ".manifest")
            meta = json.loads(manifest.read_text().splitlines()[0]) if manifest.exists() else {}
        else:
            path = Path(text) / "_knotsift.json"
            meta = json.loads(path.read_text()) if path.exists() else {}
    except Exception:  # noqa: BLE001 - the options are informative; the rows still stand
        return {}
    options = meta.get("options") if isinstance(meta, dict) else None
    return options if isinstance(options, dict) else {}


def _shown_source(out) -> str:
    """The results' name as shown in a shared report: a file's name, a URL without password."""
    text = str(out)
    if "://" in text:
        try:
            from sqlalchemy.engine import make_url

            return make_url(text).render_as_string(hide_password=True)
        except Exception:  # noqa: BLE001 - not a database URL: show the scheme only
            return text.split("://", 1)[0] + "://..."
    return Path(text).name


def _read(out):
    from ..bulk.summary import read_results

    text = str(out)
    if "://" not in text and not Path(text).exists():
        raise ReportError(f"no classify output at {text} (give the --out of a knotsift "
                          "classify run)", value=text)
    try:
        return read_results(text)
    except KnotsiftError as exc:
        raise ReportError(f"cannot read the classify output {text}: {exc}", value=text) from None
    except Exception as exc:  # noqa: BLE001 - a damaged file: say so in one line
        raise ReportError(f"cannot read the classify output {text}: {type(exc).__name__}: "
                          f"{exc}", value=text) from None


def _figure_svg(fig) -> str:
    """A matplotlib figure as inline SVG text (no XML prologue, no external references)."""
    import io

    buf = io.StringIO()
    fig.savefig(buf, format="svg", bbox_inches="tight")
    text = buf.getvalue()
    text = text[text.index("<svg"):]
    return re.sub(r"<metadata>.*?</metadata>", "", text, flags=re.S)


def _figure_or_note(make) -> str:
    """An inline figure, or a line saying why there is none (matplotlib missing)."""
    from ..extras import MissingExtraError

    try:
        return f'<div class="figure">{_figure_svg(make())}</div>'
    except MissingExtraError as exc:
        return f'<p class="muted">No figure: {_esc(exc)}</p>'


def _table(headers: list[str], rows: list[list], numeric: set[int] = frozenset()) -> str:
    out = ["<table><thead><tr>"]
    out += [f"<th>{_esc(h)}</th>" for h in headers]
    out.append("</tr></thead><tbody>")
    for r in rows:
        cells = "".join(f'<td class="n">{_esc(v)}</td>' if k in numeric else f"<td>{_esc(v)}</td>"
                        for k, v in enumerate(r))
        out.append(f"<tr>{cells}</tr>")
    out.append("</tbody></table>")
    return "".join(out)


def _example_svgs(types: list[str], table) -> list[tuple[str, str]]:
    """(type, inline SVG) of the reference table's diagram of each type that has one."""
    from ..diagram import Diagram
    from .layout import layout_diagram
    from .render import svg_text

    out = []
    for t in types:
        form = table.form(t) if table is not None else None
        if form is None or not form.pd_code:
            continue
        pd = json.loads(form.pd_code)
        d = Diagram.from_pd(pd)
        svg = svg_text([("", layout_diagram(d))])
        out.append((t, svg[svg.index("<svg"):]))
        if len(out) >= _EXAMPLES:
            break
    return out


def build_report(out, *, title: str | None = None, table_path: str | None = None) -> str:
    """The HTML text of the report of a classify output.

    Parameters
    ----------
    out : str or path
        The ``--out`` of a classify run (CSV, Parquet, SQLite or a database URL).
    title : str, optional
    table_path : str, optional
        The reference table whose diagrams illustrate each type (default shipped).

    Returns
    -------
    str

    Raises
    ------
    ReportError
        When the output is missing or unreadable.

    Notes
    -----
    Linear in the number of rows; the figures and drawn examples cost a
    fixed amount.  A 10,000-row report is a few megabytes.
    """
    from ..bulk.plots import spectrum_figure, unknot_figure
    from ..bulk.summary import knot_spectrum, row_unit, unknot_fit

    df = _read(out)
    options = run_options(out)
    unit = row_unit(df) if len(df) else "chains"
    title = title or f"knotsift run report: {Path(str(out)).name}"
    statuses = df["status"].value_counts().to_dict() if len(df) else {}
    n_err = int(statuses.get("error", 0))
    parts = [
        "<!DOCTYPE html>",
        '<html lang="en"><head><meta charset="utf-8">',
        '<meta name="viewport" content="width=device-width, initial-scale=1">',
        f"<title>{_esc(title)}</title><style>{_STYLE}</style></head><body>",
        f"<h1>{_esc(title)}</h1>",
        f'<p class="muted">Built {time.strftime("%Y-%m-%d %H:%M UTC", time.gmtime())} by '
        f"knotsift from {_esc(_shown_source(out))}.</p>",
        '<div class="caution"><p><strong>How to read this report.</strong> A name here means '
        "that the invariants knotsift computed (Jones and Alexander polynomials, determinant, "
        "signature) equal those of that knot in the reference table. That is evidence, not "
        "proof: different knots can share all of these invariants, and a knot beyond the "
        "table can look like one inside it. Where several table knots share the invariants "
        "the row is ambiguous and lists them all.</p>"
        "<p><strong>Chirality.</strong> A name without a mark is the chirality of the table's "
        "reference diagram; a trailing * marks its mirror image; an amphichiral knot carries "
        "no mark. Signatures follow the convention in which the right-handed trefoil has "
        "signature &minus;2. Open chains are closed before they can have a knot type at all; "
        "the closure used is in the options below.</p></div>",
    ]
    # options and totals
    parts.append("<h2>Run</h2>")
    if options:
        parts.append(_table(["option", "value"], [[k, json.dumps(v) if not isinstance(v, str)
                                                   else v] for k, v in sorted(options.items())]))
    else:
        parts.append('<p class="muted">The output does not record its options.</p>')
    total_rows = [["rows", len(df)]] + [[s, int(c)] for s, c in sorted(statuses.items())]
    if len(df) and "source" in df.columns:
        total_rows.append(["inputs (files)", int(df["source"].nunique())])
    if len(df) and "seconds" in df.columns:
        total_rows.append(["compute time (s, summed over rows)",
                           f"{float(df['seconds'].fillna(0).sum()):.1f}"])
    parts.append("<p></p>" + _table(["total", "count"], total_rows, numeric={1}))
    # spectrum
    parts.append(f"<h2>Knot spectrum</h2><p>Fraction of classified {unit} of each type, with "
                 "Wilson 95% intervals. Rows with errors are left out of the fractions.</p>")
    spec = knot_spectrum(df) if len(df) else None
    shown_types: list[str] = []
    if spec is not None and spec["type"].notna().any():
        rows = []
        for r in spec[spec["type"].notna()].itertuples():
            rows.append([r.type, int(r.count), f"{r.fraction:.2%}",
                         f"{r.low:.2%} \u2013 {r.high:.2%}"])
            shown_types.append(str(r.type))
        small = float(spec["fraction"].min()) < 0.02
        parts.append(_figure_or_note(lambda: spectrum_figure(
            spec, top=_SPECTRUM_TOP, unit=unit, log_scale=small)))
        if small:
            parts.append('<p class="muted">The fraction axis is logarithmic so that rare types '
                         "stay readable.</p>")
        parts.append(_table(["type", unit, "fraction", "Wilson 95% interval"], rows,
                            numeric={1, 2}))
    else:
        parts.append(f"<p>No classified {unit}.</p>")
    # P(unknot) against length
    length = "n_beads"
    if len(df) and length in df.columns and df[length].nunique() >= 2:
        parts.append("<h2>P(unknot) against chain length</h2>")
        try:
            fit = unknot_fit(df, length)
        except KnotsiftError as exc:
            parts.append(f"<p>No fit: {_esc(exc)}</p>")
        else:
            parts.append(_figure_or_note(lambda: unknot_figure(fit)))
            parts.append(f"<p>Fit of P(unknot) = exp(&minus;N/N<sub>0</sub>) "
                         f"({_esc(fit['method'])}): N<sub>0</sub> = {fit['N0']:.4g} &plusmn; "
                         f"{fit['N0_error']:.2g} (one standard error). Points: fraction "
                         "unknotted at each length with its Wilson 95% interval.</p>")
    # drawn examples
    parts.append("<h2>One diagram per type</h2>")
    try:
        from ..table import open_table

        table = open_table(table_path)
    except KnotsiftError as exc:
        table = None
        parts.append(f"<p>No reference table to draw from: {_esc(exc)}</p>")
    named = [t for t in shown_types if t not in ("not in table", "undetermined") and " or "
             not in t]
    examples = _example_svgs(named, table)
    if examples:
        parts.append("<p>The reference table's diagram of each type found (drawn by knotsift; "
                     "the mirror image for a name marked *), not the diagram of any one row."
                     "</p><div class=\"examples\">")
        for t, svg in examples:
            parts.append(f"<figure>{svg}<figcaption>{_esc(t)}</figcaption></figure>")
        parts.append("</div>")
    elif table is not None:
        parts.append("<p>No named type to draw.</p>")
    # rows
    parts.append(f"<h2>Rows</h2><p>Every row of the output ({len(df)}). Click a column head "
                 "to sort by it.</p>")
    cols = [c for c in TABLE_COLUMNS if c in df.columns]
    numeric_cols = {"frame", "chain", "crossings_input", "crossings_simplified", "n_beads",
                    "determinant", "signature", "seconds"}
    head = "".join(f'<th data-col="{c}" data-type="{"n" if c in numeric_cols else "t"}">'
                   f"{_esc(c)}</th>" for c in cols)
    body = []
    records = df[cols].to_dict(orient="list") if cols else {}
    for k in range(len(df)):
        cells = []
        for c in cols:
            v = records[c][k]
            if c == "seconds" and isinstance(v, float) and not math.isnan(v):
                v = f"{v:.3f}"
            cells.append(f'<td class="n">{_esc(v)}</td>' if c in numeric_cols
                         else f"<td>{_esc(v)}</td>")
        body.append("<tr>" + "".join(cells) + "</tr>")
    parts.append(f'<div class="wide"><table id="rows"><thead><tr>{head}</tr></thead><tbody>'
                 + "\n".join(body) + "</tbody></table></div>")
    # errors
    parts.append(f"<h2>Errors ({n_err})</h2>")
    if n_err:
        err = df[df["status"] == "error"]
        parts.append(_table(["source", "frame", "chain", "message"],
                            [[r.source, r.frame, r.chain, r.error]
                             for r in err.itertuples()], numeric={1, 2}))
    else:
        parts.append("<p>None.</p>")
    parts.append(f"<script>{_SORT_SCRIPT}</script></body></html>")
    return "\n".join(parts) + "\n"


def write_report(out, path, **kw) -> Path:
    """Build the report of ``out`` and write it to ``path`` (``.html``).

    Raises
    ------
    ReportError
        When the results cannot be read or the file cannot be written.
    """
    path = Path(path)
    if path.suffix.lower() not in (".html", ".htm"):
        raise ReportError(f"a report is written as .html, got {path.name!r}", value=str(path))
    text = build_report(out, **kw)
    try:
        path.write_text(text, encoding="utf-8")
    except OSError as exc:
        raise ReportError(f"cannot write {path}: {exc.strerror}", value=str(path)) from None
    return path

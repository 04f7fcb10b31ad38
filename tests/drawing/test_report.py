"""``knotsift report``: a self-contained HTML report, checked as text and in a real browser."""

from __future__ import annotations

import re
import shutil
import subprocess
from html.parser import HTMLParser

import pytest

from knotsift.bulk.summary import knot_spectrum, read_results, unknot_fit
from knotsift.cli import main
from knotsift.drawing.report import ReportError, build_report, write_report

from .runs import write_run

pytest.importorskip("matplotlib")


class _Page(HTMLParser):
    """Collects the parts of a page the tests look at."""

    def __init__(self):
        super().__init__()
        self.scripts, self.refs, self.figures, self.rows, self.cells = [], [], 0, [], []
        self._in_rows = self._in_body = False
        self._cell = None

    def handle_starttag(self, tag, attrs):
        attrs = dict(attrs)
        if tag == "script":
            self.scripts.append(attrs)
        for name in ("src", "href"):
            if name in attrs:
                self.refs.append(attrs[name])
        if tag in ("link", "iframe", "object", "embed", "img"):
            self.refs.append(tag)
        if tag == "figure":
            self.figures += 1
        if tag == "table" and attrs.get("id") == "rows":
            self._in_rows = True
        if self._in_rows and tag == "tbody":
            self._in_body = True
        if self._in_body and tag == "tr":
            self.rows.append([])
        if self._in_body and tag == "td":
            self._cell = ""

    @classmethod
    def of(cls, text: str) -> "_Page":
        page = cls()
        page.feed(text)
        return page

    def handle_data(self, data):
        if self._cell is not None:
            self._cell += data

    def handle_endtag(self, tag):
        if tag == "td" and self._cell is not None:
            self.rows[-1].append(self._cell)
            self._cell = None
        if tag == "table" and self._in_rows:
            self._in_rows = self._in_body = False


@pytest.fixture(scope="module")
def run(tmp_path_factory):
    out = tmp_path_factory.mktemp("run") / "results.csv"
    write_run(out)
    return out


@pytest.fixture(scope="module")
def report_html(run, tmp_path_factory):
    return write_report(run, tmp_path_factory.mktemp("report") / "report.html")


def test_report_holds_every_section(run):
    """Options, totals, spectrum, fit, one drawing per named type, every row, the errors."""
    text = build_report(run)
    df = read_results(run)
    page = _Page()
    page.feed(text)
    for heading in ("Run", "Knot spectrum", "P(unknot) against chain length",
                    "One diagram per type", "Rows", "Errors (6)"):
        assert f"<h2>{heading}" in text
    assert "evidence, not proof" in text and "trailing * marks its mirror image" in text
    assert "stochastic" in text                                   # the run's options
    spec = knot_spectrum(df)
    for r in spec.itertuples():
        assert f"<td>{r.type}</td><td class=\"n\">{r.count}</td>" in text
    fit = unknot_fit(df)
    assert f"{fit['N0']:.4g}" in text and "one standard error" in text
    assert page.figures == 6      # 0_1, 3_1, 3_1*, 4_1, 5_2, 3_1#3_1: all in the table
    assert len(page.rows) == len(df)
    assert "&lt;check the input&gt;" in text and "<check the input>" not in text


def test_report_is_self_contained(run):
    """No fetched resource: no src/href, no link, img or frame elements, one inline script."""
    page = _Page()
    page.feed(build_report(run))
    assert page.refs == []
    assert len(page.scripts) == 1 and page.scripts[0] == {}


def test_report_bad_inputs(tmp_path, capsys):
    """A missing output, a non-HTML target and an unreadable file give one clear line."""
    with pytest.raises(ReportError, match="no classify output"):
        build_report(tmp_path / "missing.csv")
    assert main(["report", str(tmp_path / "missing.sqlite"), "-o",
                 str(tmp_path / "r.html")]) == 1
    err = capsys.readouterr().err
    assert "no classify output" in err and "Traceback" not in err
    assert not (tmp_path / "missing.sqlite").exists()      # nothing created on the way
    bad = tmp_path / "bad.csv"
    bad.write_text("this is not\x00 a classify output\n")
    assert main(["report", str(bad), "-o", str(tmp_path / "r.html")]) == 1
    assert "cannot read the classify output" in capsys.readouterr().err
    with pytest.raises(ReportError, match=".html"):
        write_report(bad, tmp_path / "r.pdf")


# -- a real browser ------------------------------------------------------------------------
_CHROMIUM_FLAGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic",
                   "--no-first-run", "--disable-background-networking",
                   "--disable-component-update", "--disable-sync", "--enable-logging=stderr",
                   "--v=0"]


def _chromium():
    found = shutil.which("chromium") or shutil.which("chromium-browser")
    if not found:
        pytest.skip("Chromium is not installed (Debian package chromium; .ci/run installs it)")
    return found


def _browse(tmp_path, url: str, *extra: str) -> subprocess.CompletedProcess:
    profile = tmp_path / f"profile{len(list(tmp_path.glob('profile*')))}"
    profile.mkdir()
    return subprocess.run([_chromium(), *_CHROMIUM_FLAGS, f"--user-data-dir={profile}", *extra,
                           url], capture_output=True, text=True, timeout=120)


def _console(stderr: str) -> list[str]:
    return [line for line in stderr.splitlines() if ":CONSOLE" in line]


def test_report_opens_in_chromium_with_no_console_errors(report_html, tmp_path):
    """Headless Chromium renders the report (a screenshot of a sensible size) and its page
    logs nothing to the console."""
    html = report_html
    shot = tmp_path / "shot.png"
    done = _browse(tmp_path, html.as_uri(), "--window-size=1280,2400", f"--screenshot={shot}")
    assert done.returncode == 0, done.stderr[-2000:]
    assert _console(done.stderr) == []
    data = shot.read_bytes()
    assert data[:8] == b"\x89PNG\r\n\x1a\n"
    width, height = int.from_bytes(data[16:20], "big"), int.from_bytes(data[20:24], "big")
    assert (width, height) == (1280, 2400)
    assert len(data) > 50_000          # a blank page compresses to a few kilobytes


@pytest.mark.parametrize("sort, column, descending", [("-seconds", "seconds", True),
                                                       ("knot", "knot", False),
                                                       ("-n_beads", "n_beads", True)])
def test_report_table_sorts_in_chromium(run, report_html, tmp_path, sort, column, descending):
    """The inline script sorts the rows (driven here by the address's #sort=COLUMN), and
    the page Chromium builds holds them in that order."""
    html = report_html
    done = _browse(tmp_path, html.as_uri() + f"#sort={sort}", "--dump-dom")
    assert done.returncode == 0 and _console(done.stderr) == []
    dom = done.stdout
    mark = re.search(r'<table id="rows"[^>]*data-sorted-by="([^"]+)"', dom)
    assert mark and mark.group(1) == f"{column}:{'desc' if descending else 'asc'}"
    page = _Page()
    page.feed(dom)
    heads = re.findall(r'<th data-col="([a-z_]+)"', dom)
    k = heads.index(column)
    values = [r[k] for r in page.rows]
    assert len(values) == len(read_results(run))
    keys = values if column == "knot" else [float(v) if v else float("inf") for v in values]
    assert keys == sorted(keys, reverse=descending)
    unsorted = _Page.of(html.read_text(encoding="utf-8")).rows
    assert values != [r[k] for r in unsorted]                       # the order changed

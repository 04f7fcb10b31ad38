"""The link part of the table build, at a small crossing limit."""

from __future__ import annotations

import sqlite3

from knotsift.data_build.build import build_table


def test_small_build_has_links(tmp_path):
    """A build through 5 crossings holds the Hopf link, T(2,4) and the Whitehead link in every
    orientation class and mirror image, passes the link checks and is complete through 5."""
    out = tmp_path / "small.sqlite"
    report = build_table(out, max_crossings=5, keep_going=True, show_progress=False)
    assert report.links["counts"] == {"2:2": 1, "2:4": 1, "2:5": 1}
    with sqlite3.connect(out) as db:
        primes = [r[0] for r in db.execute(
            "SELECT name FROM links WHERE kind = 'prime' ORDER BY name")]
        forms = db.execute("SELECT count(*) FROM link_forms WHERE name = '5^2_1'").fetchone()
        meta = dict(db.execute("SELECT key, value FROM metadata"))
    assert primes == ["2^2_1", "4^2_1", "5^2_1"]
    assert forms == (4,)
    assert meta["link_complete_through"] == "5"
    assert meta["link_problems"] == "[]"

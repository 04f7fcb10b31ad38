"""Rows of single items: agreement with the one-by-one identifier, and errors recorded."""

from __future__ import annotations

import json

import pytest

from knotsift.bulk.rows import COLUMN_NAMES, ClassifyOptions, classify_item
from knotsift.bulk.sources import Item, iter_items
from knotsift.identification import identify
from knotsift.result import IdentifyResult

from .inputs import BAD_CODES


def test_classify_item_equals_identify_on_scrambled_table_knots(scrambled):
    """Every scrambled diagram of a table knot through 8 crossings gets the row that
    identify() gives it, and that row names the knot the diagram was made from (among
    the candidates when the table holds knots these invariants cannot separate)."""
    path, rows = scrambled
    expected = {r["label"]: r["expected"] for r in rows}
    seen = identified = 0
    for item in iter_items([path]):
        (row,) = classify_item(item)
        if not expected[item.label]:
            continue
        r = identify(item.payload)
        labels = [c.label if c.chirality in ("same", "mirror") else c.name
                  for c in r.candidates]
        assert row["status"] == r.status, item.label
        assert row["candidates"] == " or ".join(labels)
        assert expected[item.label] in labels
        if r.status == "identified":
            assert row["knot"] == r.name == expected[item.label]
            assert row["chirality"] == r.candidates[0].chirality
            assert row["knot_type"] == r.candidates[0].name
            identified += 1
        else:
            assert r.status == "ambiguous" and row["knot"] is None
        assert (row["crossings_input"], row["crossings_simplified"]) == \
            (r.crossings_input, r.crossings_simplified)
        assert row["jones"] == r.invariants["jones"]
        assert row["alexander"] == (r.invariants["alexander"] or None)
        assert row["determinant"] == int(r.invariants["determinant"])
        assert row["signature"] == int(r.invariants["signature"])
        seen += 1
    assert seen == len([r for r in rows if r["expected"]]) > 150
    assert identified > 0.9 * seen


@pytest.mark.parametrize("code", BAD_CODES)
def test_classify_item_records_bad_code(code):
    """An unreadable code becomes a row with status error and identify()'s message."""
    (row,) = classify_item(Item("f:1:0", "f", 1, 0, "code", code))
    try:
        identify(code)
    except Exception as exc:  # noqa: BLE001 - the message is what is compared
        message = str(exc)
    else:
        pytest.fail(f"identify accepted {code!r}")
    assert row["status"] == "error"
    assert row["error"] == message
    assert row["knot"] is None and row["seconds"] >= 0


def test_classify_item_reader_error_becomes_row():
    """An item the reader could not produce (a corrupt frame) is a row with its message."""
    (row,) = classify_item(Item("t.xyz:3:0", "t.xyz", 3, 0, "frame", None,
                             error="frame 3: 199 beads, expected 200"))
    assert (row["status"], row["error"]) == ("error", "frame 3: 199 beads, expected 200")
    assert set(row) == set(COLUMN_NAMES)


def test_classify_item_uncertain_crossings_keep_resolutions():
    """A code with uncertain crossings stores identify()'s distribution over resolutions."""
    code = "(1,5,2,4)? (3,1,4,6)? (5,3,6,2)"
    (row,) = classify_item(Item("f:1:0", "f", 1, 0, "code", code))
    r = identify(code)
    assert row["status"] == r.status == "ambiguous"
    assert json.loads(row["resolutions"]) == json.loads(json.dumps(r.resolutions,
                                                                    sort_keys=True))


def test_classify_item_given_notation_is_used():
    """With a notation given, the code is read in it (DT '4 6 2' read as a braid word fails)."""
    (as_dt,) = classify_item(Item("f:1:0", "f", 1, 0, "code", "4 6 2"), ClassifyOptions("dt"))
    assert (as_dt["knot_type"], as_dt["notation"]) == ("3_1", "dt")
    (as_braid,) = classify_item(Item("f:1:0", "f", 1, 0, "code", "4 6 2"),
                             ClassifyOptions("braid"))
    assert as_braid["notation"] != "dt"


def test_classify_item_internal_error_is_marked(monkeypatch):
    """An unexpected exception in one item is recorded as an internal error, not raised."""
    import knotsift.identification as ident

    def broken(*a, **k) -> IdentifyResult:
        raise ZeroDivisionError("boom")

    monkeypatch.setattr(ident, "identify", broken)
    (row,) = classify_item(Item("f:1:0", "f", 1, 0, "code", "DT: 4 6 2"))
    assert row["status"] == "error"
    assert row["error"] == "internal error: ZeroDivisionError: boom"

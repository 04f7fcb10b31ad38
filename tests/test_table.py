"""The reference table's lookups against plain SQL on the shipped file.

The lookups answer from an index of the forms built in memory on first use;
the ground truth here is the same question asked of SQLite directly
(``ReferenceTable._forms``, one SELECT per question, ordered by label).
"""

import pytest

from knotsift.errors import TableError
from knotsift.table import INVARIANT_COLUMNS, ReferenceTable, default_table_path, open_table

TABLE = open_table()


def _sql(column: str, value) -> list:
    return TABLE._forms(f"{column} = ?", (value,))


@pytest.mark.parametrize("column", INVARIANT_COLUMNS)
def test_every_value_of_every_invariant_matches_sql(column):
    values = {str(getattr(f, column)) for f in TABLE.all_forms()}
    assert len(values) >= (1 if column == "components" else 2)  # knots only: components 1
    for value in values:
        found = TABLE.by_invariant(column, value)
        assert found == _sql(column, value), (column, value)
        assert TABLE.count_by_invariant(column, value) == len(found)


def test_missing_values_find_nothing():
    for column in ("jones", "alexander", "rho_1", "homology"):
        assert TABLE.by_invariant(column, "not a value") == _sql(column, "not a value") == []
    assert TABLE.by_invariant("determinant", "100003") == []


def test_fingerprints_names_and_labels_match_sql():
    for f in TABLE.all_forms():
        assert TABLE.by_fingerprint(f.fingerprint) == _sql("fingerprint", f.fingerprint)
        assert TABLE.forms_of(f.name) == _sql("name", f.name)
        assert TABLE.form(f.label) == f
    assert TABLE.form("no such label") is None
    assert TABLE.forms_of("no such knot") == []


def test_several_invariants_at_once_match_sql():
    for f in TABLE.all_forms()[::7]:
        values = {"alexander": f.alexander, "determinant": str(f.determinant),
                  "signature": str(f.signature), "components": "1"}
        where = " AND ".join(f"{k} = ?" for k in values)
        assert TABLE.by_invariants(values) == TABLE._forms(where, tuple(values.values()))
        assert f in TABLE.by_invariants(values)
    assert TABLE.by_invariants({}) == TABLE.all_forms()
    assert TABLE.by_invariants({"jones": "no", "determinant": "3"}) == []


@pytest.mark.parametrize("text", ["05", "+5", "5.0", " 5", "-0", "0x5", "٥"])
def test_integer_columns_given_other_text_answer_as_sql_does(text):
    """Text that is not how an integer prints goes to SQLite, which converts it its own way."""
    assert TABLE.by_invariant("determinant", text) == _sql("determinant", text)
    if text in ("05", "+5", "5.0", " 5"):  # SQLite reads these as the number 5
        assert TABLE.by_invariant("determinant", text) == TABLE.by_invariant("determinant", "5")
    assert TABLE.by_invariants({"determinant": text, "components": "1"}) == TABLE._forms(
        "determinant = ? AND components = ?", (text, "1"))


def test_integer_values_given_as_int():
    assert TABLE.by_invariant("determinant", 5) == _sql("determinant", 5) != []
    assert TABLE.by_invariant("signature", -2) == _sql("signature", -2) != []


def test_lookups_return_lists_the_caller_may_change():
    first = TABLE.by_invariant("determinant", "3")
    first.clear()
    assert TABLE.by_invariant("determinant", "3") == _sql("determinant", "3") != []


def test_knot_rows_are_copies():
    row = TABLE.knot("3_1")
    assert row == TABLE._entries("knots", "3_1")[0]
    row["kind"] = "changed"
    assert TABLE.knot("3_1")["kind"] == "prime"
    assert TABLE.knot("no such knot") is None


def test_unknown_column_is_refused():
    with pytest.raises(TableError, match="unknown invariant column"):
        TABLE.by_invariant("pd_code", "x")
    with pytest.raises(TableError, match="unknown invariant column"):
        TABLE.by_invariants({"name": "3_1"})


def test_a_second_table_object_answers_the_same():
    other = ReferenceTable(default_table_path())
    assert other.by_invariant("signature", "0") == TABLE.by_invariant("signature", "0")
    other.close()

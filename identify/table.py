"""The reference table: schema, opening the shipped SQLite file, and lookups.

The table is written by ``data_build`` (``knotsift build``) and opened
read-only here.  Users may query it with plain SQL; the schema is:

``knots``
    one row per named knot: name, kind (unknot / prime / composite),
    crossing_number, components, alternating, amphichiral, chirality_basis,
    summands, aliases, construction, source, provenance.
``forms``
    one row per knot and chirality (amphichiral knots once): label (the name,
    with ``*`` for the mirror image of the reference diagram), is_reference,
    the invariants in canonical text, the whole fingerprint key, a PD code.
``coincidences``
    for each invariant and each value shared by several forms: the labels.
``metadata``
    schema version, package version, build time, counts.
"""

from __future__ import annotations

import json
from dataclasses import dataclass
from functools import lru_cache
from importlib import resources
from pathlib import Path

from .errors import TableError

__all__ = [
    "SCHEMA_VERSION",
    "MIRROR_MARK",
    "TableForm",
    "ReferenceTable",
    "open_table",
    "default_table_path",
    "schema",
]

SCHEMA_VERSION = 1
#: Appended to a name for the mirror image of the table's reference diagram.
MIRROR_MARK = "*"

REBUILD_HINT = "rebuild it with `knotsift build`"


def schema():
    """The SQLAlchemy table definitions (imported lazily: the CLI starts without them)."""
    import sqlalchemy as sa

    md = sa.MetaData()
    sa.Table(
        "metadata", md,
        sa.Column("key", sa.Text, primary_key=True),
        sa.Column("value", sa.Text, nullable=False),
    )
    sa.Table(
        "knots", md,
        sa.Column("name", sa.Text, primary_key=True),
        sa.Column("kind", sa.Text, nullable=False),
        sa.Column("crossing_number", sa.Integer, nullable=False),
        sa.Column("components", sa.Integer, nullable=False),
        sa.Column("alternating", sa.Integer, nullable=False),
        sa.Column("amphichiral", sa.Integer, nullable=False),
        sa.Column("chirality_basis", sa.Text, nullable=False),
        sa.Column("summands", sa.Text, nullable=False),
        sa.Column("aliases", sa.Text, nullable=False),
        sa.Column("construction", sa.Text, nullable=False),
        sa.Column("source", sa.Text, nullable=False),
        sa.Column("provenance", sa.Text, nullable=False),
        sa.Column("sort_order", sa.Integer, nullable=False),
    )
    sa.Table(
        "forms", md,
        sa.Column("label", sa.Text, primary_key=True),
        sa.Column("name", sa.Text, sa.ForeignKey("knots.name"), nullable=False, index=True),
        sa.Column("is_reference", sa.Integer, nullable=False),
        sa.Column("components", sa.Integer, nullable=False),
        sa.Column("jones", sa.Text, nullable=False, index=True),
        sa.Column("alexander", sa.Text, nullable=False, index=True),
        sa.Column("determinant", sa.Integer, nullable=False, index=True),
        sa.Column("signature", sa.Integer, nullable=False),
        sa.Column("fingerprint", sa.Text, nullable=False, index=True),
        sa.Column("pd_code", sa.Text, nullable=False),
    )
    sa.Table(
        "coincidences", md,
        sa.Column("invariant", sa.Text, primary_key=True),
        sa.Column("value", sa.Text, primary_key=True),
        sa.Column("count", sa.Integer, nullable=False),
        sa.Column("labels", sa.Text, nullable=False),
    )
    return md


@dataclass(frozen=True)
class TableForm:
    """One chirality of one named knot, as stored."""

    label: str
    name: str
    is_reference: bool
    components: int
    jones: str
    alexander: str
    determinant: int
    signature: int
    fingerprint: str
    pd_code: str

    def pd(self) -> list[list[int]]:
        return json.loads(self.pd_code)


def default_table_path() -> Path:
    """Where the shipped table lives inside the installed package."""
    return Path(str(resources.files("knotsift") / "data" / "knots.sqlite"))


_FORM_COLUMNS = ("label, name, is_reference, components, jones, alexander, determinant, "
                 "signature, fingerprint, pd_code")


class ReferenceTable:
    """Read-only access to a built reference table.

    Parameters
    ----------
    path : path-like, optional
        Defaults to the table shipped with the package.

    Raises
    ------
    TableError
        If the file is missing, is not a knotsift table, or has another schema
        version; the message names the path and the command that rebuilds it.
    """

    def __init__(self, path: str | Path | None = None):
        import sqlite3

        self.path = Path(path) if path is not None else default_table_path()
        if not self.path.is_file():
            raise TableError(f"reference table not found at {self.path}; {REBUILD_HINT}",
                             value=str(self.path))
        try:
            from urllib.parse import quote

            uri = f"file:{quote(str(self.path.resolve()))}?mode=ro&immutable=1"   # '#', '?', '%'
            self._db = sqlite3.connect(uri, uri=True, check_same_thread=False)
            rows = dict(self._db.execute("SELECT key, value FROM metadata").fetchall())
        except sqlite3.DatabaseError as exc:
            raise TableError(f"reference table at {self.path} is unreadable or corrupt "
                             f"({exc}); {REBUILD_HINT}", value=str(self.path)) from None
        version = rows.get("schema_version")
        if version != str(SCHEMA_VERSION):
            raise TableError(
                f"reference table at {self.path} has schema version {version}, this knotsift "
                f"reads version {SCHEMA_VERSION}; {REBUILD_HINT}", value=version)
        self.metadata = rows
        self._forms_cache: list[TableForm] | None = None

    # The lookups use the sqlite3 module directly: a lookup is a single indexed SELECT.
    def _forms(self, where: str, args: tuple) -> list[TableForm]:
        cur = self._db.execute(f"SELECT {_FORM_COLUMNS} FROM forms WHERE {where} ORDER BY label",
                               args)
        return [TableForm(r[0], r[1], bool(r[2]), *r[3:]) for r in cur.fetchall()]

    def by_fingerprint(self, key: str) -> list[TableForm]:
        """Forms whose whole fingerprint equals ``key`` (exact lookup)."""
        return self._forms("fingerprint = ?", (key,))

    def by_invariant(self, invariant: str, value: str) -> list[TableForm]:
        """Forms sharing one invariant's canonical text."""
        if invariant not in ("jones", "alexander", "determinant", "signature", "components"):
            raise TableError(f"unknown invariant column {invariant!r}", value=invariant)
        return self._forms(f"{invariant} = ?", (value,))

    def count_by_invariant(self, invariant: str, value: str) -> int:
        if invariant not in ("jones", "alexander", "determinant", "signature", "components"):
            raise TableError(f"unknown invariant column {invariant!r}", value=invariant)
        return self._db.execute(f"SELECT count(*) FROM forms WHERE {invariant} = ?",
                                (value,)).fetchone()[0]

    def form(self, label: str) -> TableForm | None:
        found = self._forms("label = ?", (label,))
        return found[0] if found else None

    def forms_of(self, name: str) -> list[TableForm]:
        return self._forms("name = ?", (name,))

    def all_forms(self) -> list[TableForm]:
        if self._forms_cache is None:
            self._forms_cache = self._forms("1 = 1", ())
        return self._forms_cache

    def knot(self, name: str) -> dict | None:
        cur = self._db.execute("SELECT * FROM knots WHERE name = ?", (name,))
        row = cur.fetchone()
        if row is None:
            return None
        return dict(zip([c[0] for c in cur.description], row))

    def knots(self) -> list[dict]:
        cur = self._db.execute("SELECT * FROM knots ORDER BY sort_order")
        cols = [c[0] for c in cur.description]
        return [dict(zip(cols, r)) for r in cur.fetchall()]

    def names_and_aliases(self) -> list[tuple[str, str]]:
        """(text, name) pairs for fuzzy name look-up: every name and every alias."""
        out = []
        for name, aliases in self._db.execute("SELECT name, aliases FROM knots"):
            out.append((name, name))
            for a in filter(None, (s.strip() for s in aliases.split(";"))):
                out.append((a, name))
        return out

    def coincidence(self, invariant: str, value: str) -> list[str]:
        row = self._db.execute("SELECT labels FROM coincidences WHERE invariant = ? AND value = ?",
                               (invariant, value)).fetchone()
        return row[0].split(",") if row else []

    def close(self) -> None:
        self._db.close()


@lru_cache(maxsize=4)
def open_table(path: str | None = None) -> ReferenceTable:
    """The reference table at ``path`` (default: shipped), opened once per process."""
    return ReferenceTable(path)

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
    the invariants in canonical text (Jones, Alexander, determinant,
    signature, rho_1, double-cover homology), the whole fingerprint key, a PD
    code.
``links``
    one row per named link of several components: name (``2^2_1``, ``5^2_1``,
    ...), kind (prime / composite / split / torus link), components,
    crossing_number, alternating, name_confidence (sure / recalled /
    uncertain: how sure the recalled index within its crossing number is),
    summands, aliases, construction, source, provenance.
``link_forms``
    one row per link, orientation class and mirror image: label (the name,
    ``~23`` when components 2 and 3 run against the table diagram, ``*`` for
    the mirror image), reversed, mirrored, the link invariants in canonical
    text (Jones, sorted linking numbers, multivariable Alexander polynomial,
    determinant, signature, |mu(123)|, each component's Jones polynomial),
    the whole link fingerprint key, a PD code and its circles without crossings
    (free_loops).
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
    "REVERSED_MARK",
    "LinkForm",
    "TableForm",
    "ReferenceTable",
    "open_table",
    "default_table_path",
    "schema",
]

SCHEMA_VERSION = 3
#: Appended to a name for the mirror image of the table's reference diagram.
MIRROR_MARK = "*"
#: Followed by component numbers in a link label: those components run backwards.
REVERSED_MARK = "~"

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
        sa.Column("rho_1", sa.Text, nullable=False, index=True),
        sa.Column("homology", sa.Text, nullable=False, index=True),
        sa.Column("fingerprint", sa.Text, nullable=False, index=True),
        sa.Column("pd_code", sa.Text, nullable=False),
    )
    sa.Table(
        "links", md,
        sa.Column("name", sa.Text, primary_key=True),
        sa.Column("kind", sa.Text, nullable=False),
        sa.Column("components", sa.Integer, nullable=False),
        sa.Column("crossing_number", sa.Integer, nullable=False),
        sa.Column("alternating", sa.Integer, nullable=False),
        sa.Column("name_confidence", sa.Text, nullable=False),
        sa.Column("summands", sa.Text, nullable=False),
        sa.Column("aliases", sa.Text, nullable=False),
        sa.Column("construction", sa.Text, nullable=False),
        sa.Column("source", sa.Text, nullable=False),
        sa.Column("provenance", sa.Text, nullable=False),
        sa.Column("sort_order", sa.Integer, nullable=False),
    )
    sa.Table(
        "link_forms", md,
        sa.Column("label", sa.Text, primary_key=True),
        sa.Column("name", sa.Text, sa.ForeignKey("links.name"), nullable=False, index=True),
        sa.Column("is_reference", sa.Integer, nullable=False),
        sa.Column("reversed", sa.Text, nullable=False),
        sa.Column("mirrored", sa.Integer, nullable=False),
        sa.Column("components", sa.Integer, nullable=False),
        sa.Column("jones", sa.Text, nullable=False, index=True),
        sa.Column("linking", sa.Text, nullable=False),
        sa.Column("alexander", sa.Text, nullable=False),
        sa.Column("determinant", sa.Integer, nullable=False),
        sa.Column("signature", sa.Integer, nullable=False),
        sa.Column("triple", sa.Text, nullable=False),
        sa.Column("component_jones", sa.Text, nullable=False),
        sa.Column("fingerprint", sa.Text, nullable=False, index=True),
        sa.Column("pd_code", sa.Text, nullable=False),
        sa.Column("free_loops", sa.Integer, nullable=False),
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
    rho_1: str
    homology: str
    fingerprint: str
    pd_code: str

    def pd(self) -> list[list[int]]:
        return json.loads(self.pd_code)


@dataclass(frozen=True)
class LinkForm:
    """One orientation class and chirality of one named link, as stored."""

    label: str
    name: str
    is_reference: bool
    reversed: str
    mirrored: bool
    components: int
    jones: str
    linking: str
    alexander: str
    determinant: int
    signature: int
    triple: str
    component_jones: str
    fingerprint: str
    pd_code: str
    free_loops: int

    def pd(self) -> list[list[int]]:
        return json.loads(self.pd_code)

    def diagram(self):
        """The stored diagram of this form (PD code and circles without crossings)."""
        from .diagram import Diagram

        return Diagram(self.pd(), free_loops=self.free_loops)


_LINK_FORM_COLUMNS = ("label, name, is_reference, reversed, mirrored, components, jones, "
                      "linking, alexander, determinant, signature, triple, component_jones, "
                      "fingerprint, pd_code, free_loops")


def default_table_path() -> Path:
    """Where the shipped table lives inside the installed package."""
    return Path(str(resources.files("knotsift") / "data" / "knots.sqlite"))


_FORM_COLUMNS = ("label, name, is_reference, components, jones, alexander, determinant, "
                 "signature, rho_1, homology, fingerprint, pd_code")
#: The invariant columns of ``forms`` that lookups may filter on.
INVARIANT_COLUMNS = ("jones", "alexander", "determinant", "signature", "rho_1", "homology",
                     "components")


#: Columns of ``forms`` stored as integers (SQL converts a text argument to a number).
_INTEGER_COLUMNS = ("determinant", "signature", "components")


def _canonical_integer(text: str) -> bool:
    """True when ``text`` is an integer written as ``str(int)`` writes it."""
    digits = text[1:] if text.startswith("-") else text
    return digits.isdigit() and digits.isascii() and (digits == "0" or digits[0] != "0") \
        and text != "-0"


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
        self._indexes: dict[str, dict[str, tuple[TableForm, ...]]] = {}
        self._knots: dict[str, dict] | None = None

    # The table is opened immutable, so its forms (a few hundred rows) are read once, on
    # first use, and every lookup below is a dictionary look-up in memory: repeated
    # lookups (million-frame runs) cost no SQL.  Memory is bounded by the table's size.
    def _forms(self, where: str, args: tuple) -> list[TableForm]:
        """Forms matching an SQL condition, in label order (the general path)."""
        cur = self._db.execute(f"SELECT {_FORM_COLUMNS} FROM forms WHERE {where} ORDER BY label",
                               args)
        return [TableForm(r[0], r[1], bool(r[2]), *r[3:]) for r in cur.fetchall()]

    def _index(self, column: str) -> dict[str, tuple[TableForm, ...]]:
        """{text of the column's value: forms in label order}, built on first use."""
        index = self._indexes.get(column)
        if index is None:
            grouped: dict[str, list[TableForm]] = {}
            for f in self.all_forms():
                grouped.setdefault(str(getattr(f, column)), []).append(f)
            index = self._indexes[column] = {k: tuple(v) for k, v in grouped.items()}
        return index

    def _where(self, column: str, value) -> list[TableForm]:
        """Forms whose ``column`` equals ``value`` as SQL compares them, in label order."""
        key = value if isinstance(value, str) else str(value)
        if column in _INTEGER_COLUMNS and not _canonical_integer(key):
            return self._forms(f"{column} = ?", (value,))  # SQL's own conversion of the text
        return list(self._index(column).get(key, ()))

    def by_fingerprint(self, key: str) -> list[TableForm]:
        """Forms whose whole fingerprint equals ``key`` (exact lookup)."""
        return self._where("fingerprint", key)

    def by_invariant(self, invariant: str, value: str) -> list[TableForm]:
        """Forms sharing one invariant's canonical text."""
        if invariant not in INVARIANT_COLUMNS:
            raise TableError(f"unknown invariant column {invariant!r}", value=invariant)
        return self._where(invariant, value)

    def by_invariants(self, values: dict[str, str]) -> list[TableForm]:
        """Forms agreeing with every given invariant (canonical texts)."""
        for invariant in values:
            if invariant not in INVARIANT_COLUMNS:
                raise TableError(f"unknown invariant column {invariant!r}", value=invariant)
        if not values:
            return self.all_forms()
        found = None
        for invariant, value in values.items():
            matched = self._where(invariant, value)
            if found is None:
                found = matched
            else:
                labels = {f.label for f in matched}
                found = [f for f in found if f.label in labels]
            if not found:
                break
        return found

    def count_by_invariant(self, invariant: str, value: str) -> int:
        return len(self.by_invariant(invariant, value))

    def form(self, label: str) -> TableForm | None:
        found = self._where("label", label)
        return found[0] if found else None

    def forms_of(self, name: str) -> list[TableForm]:
        return self._where("name", name)

    def all_forms(self) -> list[TableForm]:
        if self._forms_cache is None:
            self._forms_cache = self._forms("1 = 1", ())
        return self._forms_cache

    def _entries(self, table: str, name: str | None = None) -> list[dict]:
        """Rows of ``knots`` or ``links`` (one name, or all in table order) as dicts."""
        if name is None:
            cur = self._db.execute(f"SELECT * FROM {table} ORDER BY sort_order")
        else:
            cur = self._db.execute(f"SELECT * FROM {table} WHERE name = ?", (name,))
        cols = [c[0] for c in cur.description]
        return [dict(zip(cols, r)) for r in cur.fetchall()]

    def knot(self, name: str) -> dict | None:
        """The ``knots`` row of ``name`` as a dict (a fresh copy), or None."""
        if self._knots is None:
            self._knots = {k["name"]: k for k in self._entries("knots")}
        found = self._knots.get(name)
        return None if found is None else dict(found)

    def knots(self) -> list[dict]:
        return self._entries("knots")

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

    # -- links -----------------------------------------------------------
    def _link_forms(self, where: str, args: tuple) -> list[LinkForm]:
        cur = self._db.execute(
            f"SELECT {_LINK_FORM_COLUMNS} FROM link_forms WHERE {where} ORDER BY label", args)
        return [LinkForm(r[0], r[1], bool(r[2]), r[3], bool(r[4]), *r[5:]) for r in cur]

    def link_forms_by_fingerprint(self, key: str) -> list[LinkForm]:
        """Link forms whose whole link fingerprint equals ``key`` (exact lookup)."""
        return self._link_forms("fingerprint = ?", (key,))

    def link_forms_of(self, name: str) -> list[LinkForm]:
        return self._link_forms("name = ?", (name,))

    def link_forms_by_jones(self, jones: str) -> list[LinkForm]:
        return self._link_forms("jones = ?", (jones,))

    def link(self, name: str) -> dict | None:
        found = self._entries("links", name)
        return found[0] if found else None

    def links(self) -> list[dict]:
        return self._entries("links")

    def close(self) -> None:
        self._db.close()


@lru_cache(maxsize=4)
def open_table(path: str | None = None) -> ReferenceTable:
    """The reference table at ``path`` (default: shipped), opened once per process."""
    return ReferenceTable(path)

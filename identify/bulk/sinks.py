"""Where rows go: CSV, Parquet or any SQLAlchemy database, one committed chunk at a time.

Every sink writes a chunk of rows whole or not at all, so a crash (even
``kill -9``) never leaves half a chunk behind, and can say which item keys it
already holds (the done-set read back by :mod:`knotsift.bulk.resume`).

``results.sqlite`` (or ``.db``), or a database URL (``sqlite:///...``, ``postgresql://...``)
    A table ``classifications`` keyed by ``key``; each chunk is one
    transaction.  Options are kept in ``classifications_meta``.
``results.csv``
    One CSV file, appended chunk by chunk with fsync, and beside it
    ``results.csv.manifest``: one JSON line per committed chunk with the byte
    offset where it ends.  On opening, bytes past the last committed offset
    (a chunk being written when the run died) are cut off.
``results.parquet``
    A directory of part files, one per chunk, each written to a hidden
    temporary name, fsynced and renamed into place; ``_knotsift.json`` holds
    the options.  ``pandas.read_parquet("results.parquet")`` reads them all.
"""

from __future__ import annotations

import io
import json
import os
import uuid
from pathlib import Path

from .resume import ResumeError, check_options
from .rows import COLUMN_NAMES, COLUMNS

__all__ = ["open_sink", "rows_to_frame", "SQLSink", "CSVSink", "ParquetSink", "OUTPUT_SCHEMA",
           "DEFAULT_TABLE"]

#: Version of the output layout (columns and metadata).
OUTPUT_SCHEMA = 1
DEFAULT_TABLE = "classifications"

_PANDAS_DTYPES = {"int": "Int64", "float": "float64", "text": "object"}


def rows_to_frame(rows: list[dict]):
    """A DataFrame of rows with the columns of :data:`knotsift.bulk.rows.COLUMNS`, typed."""
    import pandas as pd

    df = pd.DataFrame.from_records(rows, columns=list(COLUMN_NAMES))
    return df.astype({name: _PANDAS_DTYPES[kind] for name, kind, _ in COLUMNS})


def _fsync_dir(path: Path) -> None:
    try:
        fd = os.open(path, os.O_RDONLY)
    except OSError:
        return
    try:
        os.fsync(fd)
    except OSError:
        pass
    finally:
        os.close(fd)


def _meta(options: dict) -> dict:
    return {"knotsift_bulk": OUTPUT_SCHEMA, "columns": list(COLUMN_NAMES), "options": options}


def _check_meta(stored: dict, options: dict, where: str) -> None:
    if stored.get("knotsift_bulk") != OUTPUT_SCHEMA or stored.get("columns") != list(COLUMN_NAMES):
        raise ResumeError(f"{where} holds results of another knotsift output layout "
                          f"(version {stored.get('knotsift_bulk')}, this knotsift writes "
                          f"{OUTPUT_SCHEMA}); write to a new --out", where=where)
    check_options(stored.get("options"), options, where)


class SQLSink:
    """Rows in a table of an SQLAlchemy database; one transaction per chunk.

    Parameters
    ----------
    url : str
        A database URL; ``postgresql://`` is read as ``postgresql+psycopg://``.
    table : str
        Table name (default ``classifications``).
    """

    def __init__(self, url: str, table: str = DEFAULT_TABLE):
        import sqlalchemy as sa

        if url.startswith(("postgresql://", "postgres://")):
            url = "postgresql+psycopg://" + url.split("://", 1)[1]
        if url.startswith("postgresql+psycopg://"):
            from ..extras import require

            require("psycopg", "bulk", "writing to PostgreSQL")
        self.url = url
        self.where = sa.engine.make_url(url).render_as_string(hide_password=True)
        try:
            self.engine = sa.create_engine(url, future=True)
        except (ImportError, sa.exc.ArgumentError) as exc:
            raise ResumeError(f"cannot use the database {self.where}: {exc}",
                              where=self.where) from None
        types = {"int": sa.Integer, "float": sa.Float, "text": sa.Text}
        md = sa.MetaData()
        cols = [sa.Column(name, types[kind], primary_key=(name == "key"),
                          nullable=(name != "key"), comment=meaning)
                for name, kind, meaning in COLUMNS]
        self.table = sa.Table(table, md, *cols)
        self.meta_table = sa.Table(f"{table}_meta", md,
                                   sa.Column("name", sa.Text, primary_key=True),
                                   sa.Column("value", sa.Text, nullable=False))
        self._md = md
        self._sa = sa

    def _connect_error(self, exc) -> ResumeError:
        return ResumeError(f"cannot reach the database {self.where}: "
                           f"{str(exc).splitlines()[0]}", where=self.where)

    def prepare(self, options: dict) -> None:
        """Create the tables if needed; store the options or check them against the stored."""
        sa = self._sa
        try:
            with self.engine.begin() as conn:
                self._md.create_all(conn, checkfirst=True)
                stored = conn.execute(sa.select(self.meta_table.c.value).where(
                    self.meta_table.c.name == "meta")).scalar()
                if stored is None:
                    conn.execute(self.meta_table.insert(),
                                 [{"name": "meta", "value": json.dumps(_meta(options))}])
                    return
        except sa.exc.OperationalError as exc:
            raise self._connect_error(exc) from None
        _check_meta(json.loads(stored), options, self.where)

    def done(self) -> dict[str, str]:
        """Key -> status of every row already stored."""
        sa = self._sa
        out: dict[str, str] = {}
        try:
            with self.engine.connect() as conn:
                if not sa.inspect(conn).has_table(self.table.name):
                    return out
                result = conn.execution_options(stream_results=True, yield_per=5000).execute(
                    sa.select(self.table.c.key, self.table.c.status))
                for key, status in result:
                    out[key] = status
        except sa.exc.OperationalError as exc:
            raise self._connect_error(exc) from None
        return out

    def write(self, rows: list[dict]) -> None:
        """Insert the rows in one transaction: all of them or none."""
        if not rows:
            return
        with self.engine.begin() as conn:
            conn.execute(self.table.insert(), [{k: r[k] for k in COLUMN_NAMES} for r in rows])

    def read(self, columns: list[str] | None = None):
        """All rows as a DataFrame (through pandas.read_sql)."""
        import pandas as pd

        sa = self._sa
        cols = [self.table.c[c] for c in (columns or COLUMN_NAMES)]
        with self.engine.connect() as conn:
            if not sa.inspect(conn).has_table(self.table.name):
                raise ResumeError(f"{self.where} has no table {self.table.name!r}",
                                  where=self.where)
            df = pd.read_sql(sa.select(*cols).order_by(self.table.c.key), conn)
        kinds = {name: kind for name, kind, _ in COLUMNS}
        return df.astype({c: _PANDAS_DTYPES[kinds[c]] for c in df.columns})

    def close(self) -> None:
        self.engine.dispose()


class CSVSink:
    """Rows appended to one CSV file, each chunk fsynced, then recorded in a manifest."""

    def __init__(self, path: str | os.PathLike):
        self.path = Path(path)
        self.manifest = self.path.with_name(self.path.name + ".manifest")
        self.where = str(self.path)
        self._end = 0
        self._chunks = 0

    def _read_manifest(self) -> tuple[dict | None, int, int]:
        """(header, committed end offset, committed chunks); cuts a torn last line."""
        if not self.manifest.exists():
            return None, 0, 0
        raw = self.manifest.read_bytes()
        good = raw[:raw.rfind(b"\n") + 1]
        header, end, chunks = None, 0, 0
        for line in good.splitlines():
            record = json.loads(line)
            if "knotsift_bulk" in record:
                header = record
            else:
                end, chunks = record["end"], record["chunk"] + 1
        if len(good) != len(raw):
            with open(self.manifest, "r+b") as fh:
                fh.truncate(len(good))
                os.fsync(fh.fileno())
        return header, end, chunks

    def prepare(self, options: dict) -> None:
        header, end, chunks = self._read_manifest()
        if header is None:
            if self.path.exists() and self.path.stat().st_size > 0:
                raise ResumeError(f"{self.path} exists but was not written by knotsift classify "
                                  f"(no {self.manifest.name}); write to a new --out",
                                  where=self.where)
            self.path.parent.mkdir(parents=True, exist_ok=True)
            self.path.write_bytes(b"")
            with open(self.manifest, "wb") as fh:
                fh.write((json.dumps(_meta(options)) + "\n").encode())
                fh.flush()
                os.fsync(fh.fileno())
            _fsync_dir(self.path.parent)
            return
        _check_meta(header, options, self.where)
        size = self.path.stat().st_size if self.path.exists() else 0
        if size < end:
            raise ResumeError(f"{self.path} is shorter ({size} bytes) than its manifest records "
                              f"({end} bytes): it was changed outside knotsift", where=self.where)
        if size > end:  # the chunk being written when the last run stopped: not committed
            with open(self.path, "r+b") as fh:
                fh.truncate(end)
                os.fsync(fh.fileno())
        self._end, self._chunks = end, chunks

    def done(self) -> dict[str, str]:
        import pandas as pd

        if self._end == 0:
            return {}
        df = pd.read_csv(self.path, usecols=["key", "status"], dtype=str,
                         keep_default_na=False, nrows=None)
        return dict(zip(df["key"], df["status"], strict=True))

    def write(self, rows: list[dict]) -> None:
        """Append the chunk, fsync it, then commit it with one manifest line."""
        if not rows:
            return
        buf = io.StringIO()
        rows_to_frame(rows).to_csv(buf, index=False, header=(self._end == 0),
                                   lineterminator="\n")
        data = buf.getvalue().encode()
        with open(self.path, "ab") as fh:
            fh.write(data)
            fh.flush()
            os.fsync(fh.fileno())
        end = self._end + len(data)
        record = {"chunk": self._chunks, "rows": len(rows), "end": end}
        with open(self.manifest, "ab") as fh:
            fh.write((json.dumps(record) + "\n").encode())
            fh.flush()
            os.fsync(fh.fileno())
        self._end, self._chunks = end, self._chunks + 1

    def read(self, columns: list[str] | None = None):
        import pandas as pd

        header, end, _ = self._read_manifest()
        if header is None:
            raise ResumeError(f"{self.path} has no {self.manifest.name}: not a knotsift output",
                              where=self.where)
        kinds = {name: kind for name, kind, _ in COLUMNS}
        cols = list(columns or COLUMN_NAMES)
        if end == 0:
            return rows_to_frame([])[cols]
        with open(self.path, "rb") as fh:
            data = fh.read(end)
        text_cols = [c for c in cols if kinds[c] == "text"]
        df = pd.read_csv(io.BytesIO(data), usecols=cols,
                         dtype={c: _PANDAS_DTYPES[kinds[c]] if kinds[c] != "text" else str
                                for c in cols})
        for c in text_cols:  # CSV cannot tell None from "": both read back as None
            df[c] = df[c].astype(object).where(df[c].notna(), None)
        return df[cols].sort_values("key", kind="stable").reset_index(drop=True) \
            if "key" in cols else df[cols]

    def close(self) -> None:
        pass


class ParquetSink:
    """Rows in a directory of Parquet part files, each written atomically."""

    META = "_knotsift.json"

    def __init__(self, path: str | os.PathLike):
        self.path = Path(path)
        self.where = str(self.path)

    def _schema(self):
        import pyarrow as pa

        types = {"int": pa.int64(), "float": pa.float64(), "text": pa.string()}
        return pa.schema([(name, types[kind]) for name, kind, _ in COLUMNS])

    def prepare(self, options: dict) -> None:
        meta = self.path / self.META
        if self.path.exists() and not self.path.is_dir():
            raise ResumeError(f"{self.path} is a file; a Parquet output is a directory of part "
                              "files: write to a new --out", where=self.where)
        if self.path.is_dir() and not meta.exists():
            if any(self.path.iterdir()):
                raise ResumeError(f"{self.path} exists but was not written by knotsift classify "
                                  f"(no {self.META}); write to a new --out", where=self.where)
        if meta.exists():
            _check_meta(json.loads(meta.read_text()), options, self.where)
        else:
            self.path.mkdir(parents=True, exist_ok=True)
            tmp = self.path / f".{self.META}.{uuid.uuid4().hex}.tmp"
            tmp.write_text(json.dumps(_meta(options)))
            os.replace(tmp, meta)
            _fsync_dir(self.path)
        for stale in self.path.glob(".part-*.tmp"):  # a part being written when a run died
            stale.unlink()

    def _parts(self) -> list[Path]:
        return sorted(self.path.glob("part-*.parquet"))

    def done(self) -> dict[str, str]:
        import pyarrow.parquet as pq

        out: dict[str, str] = {}
        for part in self._parts():
            t = pq.read_table(part, columns=["key", "status"])
            keys, statuses = t.column("key").to_pylist(), t.column("status").to_pylist()
            out.update(zip(keys, statuses, strict=True))
        return out

    def write(self, rows: list[dict]) -> None:
        """Write the chunk as a new part file: hidden temporary name, fsync, rename."""
        import pyarrow as pa
        import pyarrow.parquet as pq

        if not rows:
            return
        table = pa.Table.from_pandas(rows_to_frame(rows), schema=self._schema(),
                                     preserve_index=False)
        name = f"part-{uuid.uuid4().hex}.parquet"
        tmp = self.path / f".{name}.tmp"
        with open(tmp, "wb") as fh:
            pq.write_table(table, fh)
            fh.flush()
            os.fsync(fh.fileno())
        os.replace(tmp, self.path / name)
        _fsync_dir(self.path)

    def read(self, columns: list[str] | None = None):
        import pyarrow as pa
        import pyarrow.parquet as pq

        cols = list(columns or COLUMN_NAMES)
        parts = self._parts()
        if not parts:
            return rows_to_frame([])[cols]
        table = pa.concat_tables([pq.read_table(p, columns=cols) for p in parts])
        df = table.to_pandas()
        kinds = {name: kind for name, kind, _ in COLUMNS}
        df = df.astype({c: _PANDAS_DTYPES[kinds[c]] for c in cols})
        return df.sort_values("key", kind="stable").reset_index(drop=True) \
            if "key" in cols else df

    def close(self) -> None:
        pass


def open_sink(out: str | os.PathLike, table: str = DEFAULT_TABLE):
    """The sink for an ``--out`` value, chosen by its form.

    ``*.csv`` -> :class:`CSVSink`; ``*.parquet`` -> :class:`ParquetSink`;
    a URL (``scheme://...``) or ``*.sqlite``, ``*.sqlite3``, ``*.db`` ->
    :class:`SQLSink` (a file path becomes an SQLite URL).

    Raises
    ------
    ResumeError
        For any other form.
    """
    text = str(out)
    if "://" in text:
        return SQLSink(text, table)
    path = Path(text)
    ext = path.suffix.lower()
    if ext == ".csv":
        return CSVSink(path)
    if ext == ".parquet":
        from ..extras import require

        require("pyarrow", "bulk", "writing Parquet outputs")
        return ParquetSink(path)
    if ext in (".sqlite", ".sqlite3", ".db"):
        path.parent.mkdir(parents=True, exist_ok=True)
        return SQLSink(f"sqlite:///{path.resolve()}", table)
    raise ResumeError(f"--out must end in .csv, .parquet, .sqlite or .db, or be a database URL "
                      f"such as postgresql://user@host/db; got {text!r}", value=text)

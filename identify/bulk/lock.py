"""One writer per output: a lock held by a ``classify`` run for as long as it writes.

File outputs (CSV, Parquet, SQLite files and ``sqlite:///`` URLs) are locked
with a lock file beside them, ``OUTPUT.lock``, held with an advisory
``flock``.  The kernel releases it when its process ends however it ends
(even ``kill -9``), so a lock whose owner is dead is simply free and the next
run takes it over; the file itself holds the owner's host, process id and start
time, only for the message shown to a refused run.  PostgreSQL outputs are
locked with a session advisory lock on a dedicated connection, which the
server releases when that connection ends.  Other database URLs get a row in
``<table>_lock`` naming the owner; a row left by a dead process of the same
host is taken over, one left by another host must be removed by hand (the
message says how).

A second run on a locked output is refused with :class:`OutputLockedError`
(exit code 4 from the command line).  ``flock`` is not reliable on some
network file systems: there, give each concurrent run its own output.
"""

from __future__ import annotations

import json
import os
import socket
import time
import zlib
from pathlib import Path

from .resume import ResumeError

__all__ = ["OutputLock", "OutputLockedError", "lock_output"]


class OutputLockedError(ResumeError):
    """Another live run is writing this output."""


def _owner() -> dict:
    return {"host": socket.gethostname(), "pid": os.getpid(),
            "since": time.strftime("%Y-%m-%d %H:%M:%S")}


def _describe(owner: dict | None) -> str:
    if not owner:
        return "another run"
    return (f"process {owner.get('pid')} on {owner.get('host')} (running since "
            f"{owner.get('since')})")


def _pid_alive(pid: int) -> bool:
    try:
        os.kill(pid, 0)
    except ProcessLookupError:
        return False
    except PermissionError:
        return True
    return True


class OutputLock:
    """A held lock; release it with :meth:`release` (or use it as a context manager)."""

    def __init__(self, release):
        self._release = release

    def release(self) -> None:
        if self._release is not None:
            release, self._release = self._release, None
            release()

    def __enter__(self):
        return self

    def __exit__(self, *exc):
        self.release()
        return False


def _file_lock(target: Path, where: str) -> OutputLock:
    import fcntl

    path = target.with_name(target.name + ".lock")
    try:
        path.parent.mkdir(parents=True, exist_ok=True)
    except OSError as exc:
        raise ResumeError(f"cannot create the folder of {where}: {exc.strerror}",
                          where=where) from None
    for _ in range(5):
        try:
            fd = os.open(path, os.O_RDWR | os.O_CREAT, 0o644)
        except OSError as exc:
            raise ResumeError(f"cannot create the lock file {path}: {exc.strerror}",
                              where=where) from None
        try:
            fcntl.flock(fd, fcntl.LOCK_EX | fcntl.LOCK_NB)
        except OSError:
            try:
                owner = json.loads(os.pread(fd, 4096, 0) or b"null")
            except ValueError:
                owner = None
            os.close(fd)
            raise OutputLockedError(
                f"{where} is being written by {_describe(owner)}: one run per output; wait "
                f"for it to end or write to another --out", value=owner, where=where) from None
        try:   # the file we locked may have been removed by its last owner meanwhile
            same = os.fstat(fd).st_ino == os.stat(path).st_ino
        except FileNotFoundError:
            same = False
        if not same:
            os.close(fd)
            continue
        os.ftruncate(fd, 0)
        os.pwrite(fd, json.dumps(_owner()).encode(), 0)

        def release(fd=fd, path=path):
            try:
                os.unlink(path)
            except OSError:
                pass
            os.close(fd)

        return OutputLock(release)
    raise OutputLockedError(f"cannot take the lock of {where}: its lock file keeps changing",
                            where=where)


def _postgres_lock(url: str, table: str, where: str) -> OutputLock:
    import sqlalchemy as sa

    engine = sa.create_engine(url, future=True, poolclass=sa.pool.NullPool)
    key = zlib.crc32(f"knotsift:{table}".encode()) & 0x7FFFFFFF
    try:
        conn = engine.connect()
        got = conn.execute(sa.text("SELECT pg_try_advisory_lock(:k)"), {"k": key}).scalar()
        conn.commit()
    except sa.exc.SQLAlchemyError as exc:
        engine.dispose()
        raise ResumeError(f"cannot reach the database {where}: {str(exc).splitlines()[0]}",
                          where=where) from None
    if not got:
        conn.close()
        engine.dispose()
        raise OutputLockedError(f"table {table} of {where} is being written by another run: one "
                                "run per output; wait for it to end or use another --out",
                                where=where)

    def release():
        try:
            conn.close()
        finally:
            engine.dispose()

    return OutputLock(release)


def _table_lock(url: str, table: str, where: str) -> OutputLock:
    import sqlalchemy as sa

    engine = sa.create_engine(url, future=True)
    md = sa.MetaData()
    lock = sa.Table(f"{table}_lock", md, sa.Column("name", sa.Text, primary_key=True),
                    sa.Column("owner", sa.Text, nullable=False))
    me = _owner()
    try:
        md.create_all(engine, checkfirst=True)
        for _ in range(2):
            try:
                with engine.begin() as conn:
                    conn.execute(lock.insert(), [{"name": "writer", "owner": json.dumps(me)}])
                break
            except sa.exc.IntegrityError:
                with engine.begin() as conn:
                    raw = conn.execute(sa.select(lock.c.owner)).scalar()
                owner = json.loads(raw) if raw else {}
                if owner.get("host") == me["host"] and not _pid_alive(int(owner.get("pid", 0))):
                    with engine.begin() as conn:   # a dead owner on this host: take over
                        conn.execute(lock.delete().where(lock.c.owner == raw))
                    continue
                raise OutputLockedError(
                    f"table {table} of {where} is being written by {_describe(owner)}; if that "
                    f"run is gone, delete the row of {table}_lock", value=owner,
                    where=where) from None
    except sa.exc.SQLAlchemyError as exc:
        engine.dispose()
        raise ResumeError(f"cannot reach the database {where}: {str(exc).splitlines()[0]}",
                          where=where) from None

    def release():
        try:
            with engine.begin() as conn:
                conn.execute(lock.delete().where(lock.c.owner == json.dumps(me)))
        finally:
            engine.dispose()

    return OutputLock(release)


def lock_output(sink, table: str = "classifications") -> OutputLock:
    """Take the writer's lock of a sink's output, or refuse.

    Raises
    ------
    OutputLockedError
        When a live run holds it.
    ResumeError
        When the lock cannot be created (an unwritable folder, an unreachable database).
    """
    path = getattr(sink, "path", None)
    if path is not None:
        return _file_lock(Path(path), sink.where)
    import sqlalchemy as sa

    url = sa.engine.make_url(sink.url)
    if url.get_backend_name() == "sqlite":
        if url.database and url.database != ":memory:":
            return _file_lock(Path(url.database), sink.where)
        return OutputLock(None)
    if url.get_backend_name() == "postgresql":
        return _postgres_lock(sink.url, table, sink.where)
    return _table_lock(sink.url, table, sink.where)

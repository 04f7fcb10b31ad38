"""The hostile-input corpus: inputs meant to break knotsift, each with the outcome it must get.

Each case is a command line, the files it needs (built in a fresh folder),
optional standard input, the exit codes it may end with (those documented in
knotsift.cli and knotsift.bulk.commands) and a text the message must contain.
A case passes when the command ends within the time limit, under the memory
cap, with no traceback, one of its exit codes, and its expected text.
"""

from __future__ import annotations

import io
import json
import sqlite3
import zipfile
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

__all__ = ["Case", "CASES"]


@dataclass
class Case:
    """One hostile input: ``argv`` after ``knotsift``; files are name -> bytes or callable(dir)."""

    name: str
    argv: list[str]
    codes: tuple[int, ...]
    expect: str = ""
    files: dict = field(default_factory=dict)
    stdin: bytes | None = None
    env: dict = field(default_factory=dict)
    absent: tuple[str, ...] = ()     # files that must not exist afterwards


def _ring(n: int = 40, scale: float = 1.0) -> np.ndarray:
    t = np.linspace(0, 2 * np.pi, n, endpoint=False)
    return np.c_[np.cos(t), np.sin(t), 0 * t] * scale


def _xyz(*frames) -> bytes:
    out = []
    for f in frames:
        out.append(f"{len(f)}\nframe\n" + "".join(f"C {x} {y} {z}\n" for x, y, z in f))
    return "".join(out).encode()


def _npy(arr) -> bytes:
    buf = io.BytesIO()
    np.save(buf, arr, allow_pickle=True)
    return buf.getvalue()


def _npy_header_only(shape) -> bytes:
    buf = io.BytesIO()
    np.lib.format.write_array_header_1_0(buf, {"descr": "<f8", "fortran_order": False,
                                               "shape": shape})
    return buf.getvalue() + bytes(96)


_BOMB: list[bytes] = []


def _npz_bomb(path: Path) -> None:
    """1.2 GB of zeros announced (above the 1 GiB default limit), about 1.2 MB on disk."""
    if not _BOMB:
        buf = io.BytesIO()
        with zipfile.ZipFile(buf, "w", zipfile.ZIP_DEFLATED) as z:
            with z.open("coords.npy", "w", force_zip64=True) as fh:
                np.lib.format.write_array_header_1_0(
                    fh, {"descr": "<f8", "fortran_order": False, "shape": (50_000_000, 3)})
                block = bytes(1 << 20)
                for _ in range(1145):
                    fh.write(block)
        _BOMB.append(buf.getvalue())
    path.write_bytes(_BOMB[0])


def _npz(**arrays) -> bytes:
    buf = io.BytesIO()
    np.savez(buf, **arrays)
    return buf.getvalue()


def _sqlite_foreign(path: Path) -> None:
    db = sqlite3.connect(path)
    db.execute("CREATE TABLE classifications (a INTEGER, b TEXT)")
    db.execute("INSERT INTO classifications VALUES (1, 'x')")
    db.commit()
    db.close()


def _table_copy(sub: str):
    def make(path: Path) -> None:
        from knotsift.table import default_table_path

        path.parent.mkdir(parents=True, exist_ok=True)
        path.write_bytes(default_table_path().read_bytes())
    make.sub = sub
    return make


def _pdb(lines: list[str]) -> bytes:
    return ("\n".join(lines)).encode()


def _atom(k: int, x: float, y: float, z: float) -> str:
    return f"ATOM  {k:5d}  CA  ALA A{k:4d}    {x:8.3f}{y:8.3f}{z:8.3f}  1.00  0.00           C"


_PDB_OK = [_atom(k + 1, *(3.8 * p)) for k, p in enumerate(_ring(30))]
ERR = (1,)          # some inputs could not be read or were refused by a limit
USAGE = (2,)
OUT = (4,)          # output unusable, locked or damaged
GOOD_CODES = b"label,code\nt,DT: 4 6 2\nf,DT: 4 6 8 2\n"

CASES: list[Case] = []


def add(*args, **kw) -> None:
    CASES.append(Case(*args, **kw))


# --- identify: typed codes -------------------------------------------------------------
for name, code, expect in [
    ("braid power 1001", "s1^1001", "limit crossings"),
    ("braid power 10^9", "s1^1000000000", "crossings"),
    ("braid power 5000 digits", "s1^" + "9" * 5000, "integer_digits"),
    ("braid generator 5000 digits", "s" + "7" * 5000, "integer_digits"),
    ("dt 5000 digits", "DT: 4 6 " + "2" * 5000, "integer_digits"),
    ("pd 5000 digits", "PD[X[1,5,2," + "4" * 5000 + "]]", "integer_digits"),
    ("gauss 5000 digits", "O1+ U" + "1" * 5000 + "+", "integer_digits"),
    ("conway 5000 digits", "Conway: 3 " + "1" * 5000, "integer_digits"),
    ("conway huge twist", "Conway: 3 999999999", "limit crossings"),
    ("conway many twists", "Conway: " + " ".join(["999"] * 40), "limit crossings"),
    ("conway digit string long", "Conway: " + "9" * 120, "integer_digits"),
    ("braid group power", "(s1 s2^-1)^100000", "crossings"),
    ("nested braid powers", "((s1^100)^100)^100", "limit crossings"),
    ("braid zero generator", "s0", "generator 0"),
    ("braid negative exponent huge", "s1^-99999999", "crossings"),
    ("nul byte", "DT: 4 6 2\x01", "control"),
    ("escape sequence", "\x1b[31mDT: 4 6 2", "control"),
    ("replacement char", "DT: 4 6\ufffd 2", "undecodable"),
    ("superscript digits", "s1\u00b3", ""),
    ("fullwidth digits", "DT: \uff14 \uff16 \uff12", ""),
    ("arabic-indic digits", "DT: \u0664 \u0666 \u0662", ""),
    ("only brackets mismatched", "[[[[", ""),
    ("pd unclosed", "PD[X[1,5,2,4], X[3,1,4,6", ""),
    ("pd wrong arity", "PD[X[1,5,2], X[3,1,4,6]]", ""),
    ("pd labels once", "PD[X[1,2,3,4]]", ""),
    ("pd zero labels", "[[0,0,0,0]]", ""),
    ("dt odd numbers", "DT: 3 5 1", ""),
    ("dt repeated", "DT: 4 4 4", ""),
    ("dt huge count", "DT: " + " ".join(str(2 * k) for k in range(2, 1300)), ""),
    ("gauss unpaired", "O1+ U2+ O3+", ""),
    ("gauss bad sign", "O1* U1*", ""),
    ("conway garbage", "Conway: 3,,,,2", ""),
    ("conway polyhedron unknown", "Conway: 99*", ""),
    ("named nothing", "PD:", ""),
    ("emoji", "\U0001f600\U0001f600", ""),
    ("right-to-left marks", "\u202eDT: 4 6 2", "control"),
    ("sql text", "'; DROP TABLE knots; --", ""),
    ("python code", "__import__('os').system('echo pwned')", ""),
    ("format string", "{0.__class__}", ""),
    ("13 uncertain", "PD" + str([[1, 5, 2, 4]] * 13).replace("]", "]?"), ""),
]:
    add(f"identify: {name}", ["identify", code], ERR, expect)
for name, code, expect, codes in [
    ("pd negative labels", "PD[X[-1,5,2,4], X[3,-1,4,6], X[5,3,6,2]]", "", (0, 1)),
    ("letters only words", "hello world", "", (0, 1)),
]:
    add(f"identify: {name}", ["identify", code], codes, expect)

add("identify: uncertain work on a big diagram",
    ["identify", "(1,5,2,4)? (3,1,4,6)? (5,3,6,2)? " + " ".join(
        f"({a},{a + 4},{a + 1},{a + 3})" for a in range(7, 600, 6))], ERR, "")
add("identify: 200 KB line of 1 on stdin", ["identify", "-"], ERR, "text_chars",
    stdin=b"1 " * 100_000 + b"\n")
add("identify: 200 KB line of 1 in a file", ["identify", "--file", "ones.txt"], ERR,
    "text_chars", files={"ones.txt": b"1 " * 100_000})
add("identify: /dev/zero as file", ["identify", "--file", "/dev/zero"], ERR, "text_chars")
add("identify: non-UTF-8 file", ["identify", "--file", "latin.txt"], ERR, "not UTF-8",
    files={"latin.txt": "DT: 4 6 2 \u00e9t\u00e9\n".encode("latin-1")})
add("identify: binary garbage file", ["identify", "--file", "bin.dat"], ERR, "",
    files={"bin.dat": bytes(range(256)) * 20})
add("identify: missing file", ["identify", "--file", "nope.txt"], ERR, "cannot read")
add("identify: directory as file", ["identify", "--file", "."], ERR, "cannot read")
add("identify: nul bytes in file", ["identify", "--file", "nul.txt"], ERR, "control",
    files={"nul.txt": b"DT: 4 6 2\x00\x00\n"})
add("identify: empty stdin", ["identify"], USAGE, "no input", stdin=b"")
add("identify: bad notation name", ["identify", "-n", "morse", "DT: 4 6 2"], USAGE, "")
add("identify: notation mismatch", ["identify", "-n", "pd", "s1 s2 s1"], ERR, "")
add("identify: xyz routed empty file", ["identify", "empty.xyz"], ERR, "no frame",
    files={"empty.xyz": b""})
add("identify: many lines mixed bad", ["identify", "--file", "mixed.txt"], ERR, "",
    files={"mixed.txt": b"DT: 4 6 2\ns1^5000\n\xff\n"})
add("identify: table garbage", ["identify", "--table", "junk.sqlite", "DT: 4 6 2"], (3,),
    "unreadable or corrupt", files={"junk.sqlite": b"this is not sqlite" * 10})
add("identify: table missing", ["identify", "--table", "none.sqlite", "DT: 4 6 2"], (3,),
    "not found")
add("identify: table path with # ? %", ["identify", "--table", "a#b?c%d/knots.sqlite",
                                        "DT: 4 6 2"], (0,), "3_1",
    files={"a#b?c%d/knots.sqlite": _table_copy("a#b?c%d")}, absent=("a",))
add("identify: table of another schema", ["identify", "--table", "other.sqlite", "4 6 2"],
    (3,), "", files={"other.sqlite": _sqlite_foreign})

# --- lookup ---------------------------------------------------------------------------------
for name, argv, codes, expect in [
    ("huge exponent", ["--jones", "t^100000000 + 1"], ERR, "poly_degree"),
    ("huge negative exponent", ["--jones", "t^-100000000"], ERR, "poly_degree"),
    ("exponent 5000 digits", ["--jones", "t^" + "9" * 5000], ERR, "integer_digits"),
    ("coefficient 5000 digits", ["--alexander", "9" * 5000 + "t"], ERR, "integer_digits"),
    ("dense polynomial", ["--jones", " + ".join(f"t^{k}" for k in range(3000))], ERR,
     "poly_"),
    ("superscripts", ["--jones", "t\u00b2 + 1"], ERR, ""),
    ("empty text", ["--jones", ""], ERR, ""),
    ("operators only", ["--jones", "+-+-"], ERR, ""),
    ("python expression", ["--jones", "__import__('os')"], ERR, ""),
    ("power operator chain", ["--jones", "t**t**t"], ERR, ""),
    ("third exponent", ["--jones", "t^(1/3)"], ERR, ""),
    ("not alexander", ["--alexander", "t + 7"], ERR, "not an Alexander"),
    ("nothing given", [], ERR, "at least one"),
    ("determinant not integer", ["--determinant", "1e5"], USAGE, ""),
    ("determinant 5000 digits", ["--determinant", "9" * 5000], USAGE, ""),
    ("signature float", ["--signature", "0.5"], USAGE, ""),
    ("long text", ["--jones", "t" + " + t" * 30000], ERR, "text_chars"),
    ("nul in polynomial", ["--jones", "t\x01 + 1"], ERR, "control"),
]:
    add(f"lookup: {name}", ["lookup"] + argv, codes, expect)

# --- show ----------------------------------------------------------------------------------
for name, arg, codes, expect in [
    ("empty name", "", USAGE, "give a name"),
    ("blank name", "   ", USAGE, "give a name"),
    ("long name", "x" * 5000, ERR, ""),
    ("control characters", "4_1\x07", ERR, "control"),
    ("sql", "4_1' OR '1'='1", (0, 1), ""),
    ("digits only long", "9" * 40, ERR, "integer_digits"),
    ("unicode lookalike", "\u2074_\u2081", ERR, ""),
]:
    add(f"show: {name}", ["show", arg], codes, expect)

# --- curve: coordinate files ----------------------------------------------------------------
for name, fname, data, expect in [
    ("empty xyz", "e.xyz", b"", "no frame"),
    ("blank xyz", "b.xyz", b"\n\n\n", "no frame"),
    ("count 10^10", "c.xyz", b"10000000000\nc\nC 0 0 0\n", "limit beads"),
    ("count beyond file", "d.xyz", b"500000\nc\nC 0 0 0\n", "remain in the file"),
    ("count negative", "n.xyz", b"-5\nc\n", "bead count"),
    ("count not a number", "w.xyz", b"many\nc\n", "bead count"),
    ("count 5000 digits", "h.xyz", b"9" * 5000 + b"\nc\n", "bead count"),
    ("truncated frame", "t.xyz", _xyz(_ring())[:-60], "truncated"),
    ("non-numeric coordinate", "x.xyz", _xyz(_ring()).replace(b"C 1.0", b"C abc", 1),
     "not a number"),
    ("nan coordinates", "nan.xyz", b"4\nc\nC nan 0 0\nC 1 0 0\nC 1 1 0\nC 0 1 0\n",
     "not finite"),
    ("infinite coordinates", "inf.xyz", b"4\nc\nC inf 0 0\nC 1 0 0\nC 1 1 0\nC 0 1 0\n",
     "not finite"),
    ("coordinates of 1e155", "big.xyz", _xyz(_ring(scale=1e155)), "rescale"),
    ("three beads", "3.xyz", b"3\nc\nC 0 0 0\nC 1 0 0\nC 0 1 0\n", "at least 4"),
    ("all beads equal", "same.xyz", b"4\nc\nC 0 0 0\nC 0 0 0\nC 0 0 0\nC 0 0 0\n", ""),
    ("binary as xyz", "bin.xyz", bytes(range(256)) * 40, ""),
    ("csv without x y z", "nox.csv", b"a,b,c\n1,2,3\n", ""),
    ("csv frame column words", "fw.csv", b"frame,x,y,z\na,0,0,0\nb,1,0,0\nc,1,1,0\n",
     "integer frame number"),
    ("csv header only", "ho.csv", b"x,y,z\n", "no rows"),
    ("csv 1e155", "big.csv", b"x,y,z\n1e155,0,0\n0,1e155,0\n0,0,1e155\n-1e155,0,0\n",
     "rescale"),
    ("csv short rows", "sr.csv", b"x,y,z\n1,2\n3,4\n", "columns"),
    ("pdb no atoms", "none.pdb", b"HEADER nothing\nEND\n", "no C-alpha"),
    ("pdb truncated atom line", "cut.pdb", _pdb(_PDB_OK[:12] + [_PDB_OK[12][:40]]),
     "too short"),
    ("pdb model never closed", "open.pdb", _pdb(["MODEL        1"] + _PDB_OK), "ENDMDL"),
    ("pdb non-numeric coordinates", "nn.pdb",
     _pdb(_PDB_OK[:5] + [_PDB_OK[5][:30] + "   abc  " + _PDB_OK[5][38:]] + _PDB_OK[6:]), ""),
    ("npy object array", "obj.npy", _npy(np.array([{"a": 1}], dtype=object)), ""),
    ("npy header lies", "lie.npy", _npy_header_only((1_000_000, 3)), "remain in the file"),
    ("npy huge header", "huge.npy", _npy_header_only((10 ** 12, 3)), "array_bytes"),
    ("npy wrong shape", "shape.npy", _npy(np.zeros((5, 4))), "expected an array shaped"),
    ("npy strings", "str.npy", _npy(np.array(["a", "b"])), "numeric"),
    ("npy garbage", "g.npy", b"\x93NUMPY garbage" * 10, "not a readable"),
    ("npz no coords", "two.npz", _npz(a=np.zeros((4, 3)), b=np.zeros((4, 3))), "name the one"),
    ("npz garbage", "g.npz", b"PK\x03\x04garbage" * 10, "not a readable"),
]:
    add(f"curve: {name}", ["curve", fname], ERR, expect, files={fname: data})
add("curve: npz bomb", ["curve", "bomb.npz"], ERR, "array_bytes", files={"bomb.npz": _npz_bomb})
add("curve: missing file", ["curve", "nope.xyz"], ERR, "")
add("curve: directory", ["curve", "dir.xyz"], ERR, "", files={"dir.xyz/x": b""})
add("curve: /dev/zero as xyz", ["curve", "--format", "xyz", "/dev/zero"], ERR, "")
add("curve: unknown suffix", ["curve", "ring.dat"], ERR, "cannot tell the format",
    files={"ring.dat": _xyz(_ring())})
add("curve: closures 10^9", ["curve", "--closures", "1000000000", "r.xyz"], ERR,
    "limit closures", files={"r.xyz": _xyz(_ring())})
add("curve: closures 0", ["curve", "--closures", "0", "r.xyz"], USAGE, "",
    files={"r.xyz": _xyz(_ring())})
add("curve: negative seed", ["curve", "--seed", "-1", "r.xyz"], USAGE, "0 or more",
    files={"r.xyz": _xyz(_ring())})
add("curve: frames garbage", ["curve", "--frames", "a:b", "r.xyz"], ERR, "frames",
    files={"r.xyz": _xyz(_ring())})
add("curve: frames step zero", ["curve", "--frames", "0:5:0", "r.xyz"], ERR, "step",
    files={"r.xyz": _xyz(_ring())})
add("curve: no input", ["curve"], USAGE, "no input")

# --- classify ----------------------------------------------------------------------------
C = ["classify", "-q", "--workers", "1"]
for name, argv, files, codes, expect in [
    ("code table without code column", ["t.csv", "-o", "o.sqlite"],
     {"t.csv": b"label,knot\na,DT: 4 6 2\n"}, ERR, "expected code column 'code'"),
    ("code column renamed", ["t.csv", "-o", "o.sqlite", "--codes-column", "diagram"],
     {"t.csv": b"label,code\na,DT: 4 6 2\n"}, ERR, ""),
    ("binary garbage input", ["bin.txt", "-o", "o.sqlite"],
     {"bin.txt": bytes(range(1, 256)) * 10}, ERR, "failed"),
    ("a poison code in a batch", ["b.txt", "-o", "o.sqlite"],
     {"b.txt": b"DT: 4 6 2\ns1^5000\nDT: 4 6 8 2\n" + b"s1 " * 50_000 + b"\n"}, ERR, "2 failed"),
    ("short and long rows", ["t.csv", "-o", "o.csv"],
     {"t.csv": b"label,code\na,DT: 4 6 2,extra\nb\n"}, ERR, "failed"),
    ("missing input", ["nope.csv", "-o", "o.sqlite"], {}, ERR, "does not exist"),
    ("directory input", [".", "-o", "o.sqlite"], {}, ERR, "not a regular file"),
    ("/dev/zero input", ["/dev/zero", "-o", "o.sqlite"], {}, ERR, "not a regular file"),
    ("empty xyz input", ["e.xyz", "-o", "o.sqlite"], {"e.xyz": b""}, ERR, "failed"),
    ("xyz count 10^10", ["c.xyz", "-o", "o.sqlite"],
     {"c.xyz": b"10000000000\nc\nC 0 0 0\n"}, ERR, "failed"),
    ("npz bomb", ["bomb.npz", "-o", "o.sqlite"], {"bomb.npz": _npz_bomb}, ERR, "failed"),
    ("closures 10^9", ["r.xyz", "-o", "o.sqlite", "--closures", "1000000000"],
     {"r.xyz": _xyz(_ring())}, ERR, "limit closures"),
    ("negative seed", ["r.xyz", "-o", "o.sqlite", "--seed", "-1"],
     {"r.xyz": _xyz(_ring())}, USAGE, "0 or more"),
    ("chunk zero", ["t.csv", "-o", "o.sqlite", "--chunk", "0"], {"t.csv": GOOD_CODES}, USAGE,
     ""),
    ("workers zero", ["t.csv", "-o", "o.sqlite", "--workers", "0"], {"t.csv": GOOD_CODES},
     USAGE, ""),
    ("output suffix unknown", ["t.csv", "-o", "o.txt"], {"t.csv": GOOD_CODES}, OUT, "--out"),
    ("output under a file", ["t.csv", "-o", "t.csv/o.sqlite"], {"t.csv": GOOD_CODES}, OUT,
     "t.csv"),
    ("output sqlite is garbage", ["t.csv", "-o", "g.sqlite"],
     {"t.csv": GOOD_CODES, "g.sqlite": b"garbage, not a database" * 100}, OUT, "g.sqlite"),
    ("output sqlite of another schema", ["t.csv", "-o", "f.sqlite"],
     {"t.csv": GOOD_CODES, "f.sqlite": _sqlite_foreign}, OUT, "not written by knotsift"),
    ("output sqlite is a folder", ["t.csv", "-o", "d.sqlite"],
     {"t.csv": GOOD_CODES, "d.sqlite/x": b""}, OUT, "folder"),
    ("output csv foreign", ["t.csv", "-o", "f.csv"],
     {"t.csv": GOOD_CODES, "f.csv": b"a,b\n1,2\n"}, OUT, "not written by knotsift"),
    ("garbage csv manifest", ["t.csv", "-o", "m.csv"],
     {"t.csv": GOOD_CODES, "m.csv": b"x\n", "m.csv.manifest": b"{not json\n"}, OUT,
     "manifest"),
    ("manifest of other records", ["t.csv", "-o", "m.csv"],
     {"t.csv": GOOD_CODES, "m.csv": b"", "m.csv.manifest": b"[1, 2]\n"}, OUT, "manifest"),
    ("parquet output is a file", ["t.csv", "-o", "p.parquet"],
     {"t.csv": GOOD_CODES, "p.parquet": b"x"}, OUT, "is a file"),
    ("parquet metadata garbage", ["t.csv", "-o", "p.parquet"],
     {"t.csv": GOOD_CODES, "p.parquet/_knotsift.json": b"\x00\x01"}, OUT, "damaged"),
    ("parquet foreign folder", ["t.csv", "-o", "p.parquet"],
     {"t.csv": GOOD_CODES, "p.parquet/other.txt": b"x"}, OUT, "not written by knotsift"),
    ("unreachable database", ["t.csv", "-o", "postgresql://nobody@127.0.0.1:1/none"],
     {"t.csv": GOOD_CODES}, OUT, "cannot"),
    ("unknown database driver", ["t.csv", "-o", "nosuchdb://x/y"], {"t.csv": GOOD_CODES}, OUT,
     "cannot use"),
    ("stale lock file of a dead run", ["t.csv", "-o", "o.sqlite"],
     {"t.csv": GOOD_CODES, "o.sqlite.lock": b'{"pid": 999999999, "host": "gone"}'}, (0,), ""),
    ("bad format name", ["t.csv", "-o", "o.sqlite", "--format", "exe"], {"t.csv": GOOD_CODES},
     USAGE, ""),
    ("beads per chain not dividing", ["r.xyz", "-o", "o.sqlite", "--beads-per-chain", "7"],
     {"r.xyz": _xyz(_ring())}, ERR, "failed"),
    ("limit lowered refuses a code", ["t.csv", "-o", "o.sqlite", "--limit", "crossings=3"],
     {"t.csv": GOOD_CODES}, ERR, "1 failed"),
]:
    add(f"classify: {name}", C + argv, codes, expect, files=files)
add("classify: poison item with two workers", ["classify", "-q", "--workers", "2", "b.txt",
                                               "-o", "o.csv"], ERR, "1 failed",
    files={"b.txt": b"".join(f"x{k}\tDT: 4 6 2\n".encode() for k in range(30))
           + b"poison\ts1^1001\n"})

# --- summarise ---------------------------------------------------------------------------
for name, argv, files, codes, expect, absent in [
    ("missing sqlite", ["typo/out.sqlite"], {}, OUT, "no such output", ("typo",)),
    ("missing csv", ["nope.csv"], {}, OUT, "no such output", ("nope.csv",)),
    ("missing parquet", ["nope.parquet"], {}, OUT, "no such output", ("nope.parquet",)),
    ("missing sqlite url", ["sqlite:///nope.sqlite"], {}, OUT, "no such output",
     ("nope.sqlite",)),
    ("garbage sqlite", ["g.sqlite"], {"g.sqlite": b"garbage" * 200}, OUT, "g.sqlite", ()),
    ("foreign sqlite", ["f.sqlite"], {"f.sqlite": _sqlite_foreign}, OUT, "not written", ()),
    ("empty sqlite", ["e.sqlite"], {"e.sqlite": b""}, OUT, "no table", ()),
    ("csv without manifest", ["c.csv"], {"c.csv": b"a,b\n1,2\n"}, OUT, "manifest", ()),
    ("csv with garbage manifest", ["c.csv"], {"c.csv": b"a\n", "c.csv.manifest": b"zzz\n"},
     OUT, "manifest", ()),
    ("parquet garbage part", ["p.parquet"],
     {"p.parquet/_knotsift.json": json.dumps({"knotsift_bulk": 1}).encode(),
      "p.parquet/part-0.parquet": b"PAR1 garbage"}, OUT, "part", ()),
    ("parquet without metadata", ["p.parquet"], {"p.parquet/part-0.parquet": b"x"}, OUT,
     "", ()),
    ("unknown suffix", ["o.txt"], {"o.txt": b"x"}, OUT, "--out", ()),
]:
    add(f"summarise: {name}", ["summarise"] + argv, codes, expect, files=files, absent=absent)

# --- limits themselves -------------------------------------------------------------------
add("limits: unknown name", ["identify", "--limit", "speed=3", "DT: 4 6 2"], USAGE, "NAME=VALUE")
add("limits: not a number", ["identify", "--limit", "crossings=many", "DT: 4 6 2"], USAGE,
    "positive integer")
add("limits: zero", ["identify", "--limit", "crossings=0", "DT: 4 6 2"], USAGE,
    "positive integer")
add("limits: 5000 digits", ["identify", "--limit", "crossings=" + "9" * 5000, "DT: 4 6 2"],
    USAGE, "positive integer")
add("limits: bad environment", ["identify", "DT: 4 6 2"], USAGE, "KNOTSIFT_LIMITS",
    env={"KNOTSIFT_LIMITS": "crossings"})
add("limits: lowered in environment", ["identify", "DT: 4 6 8 2"], ERR, "limit crossings",
    env={"KNOTSIFT_LIMITS": "crossings=3"})

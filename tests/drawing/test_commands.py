"""``knotsift draw``: the written pictures, and clear errors on bad input."""

from __future__ import annotations

import xml.etree.ElementTree as ET

from knotsift.cli import main
from knotsift.demo import demo_path
from knotsift.invariants.fingerprint import fingerprint
from knotsift.notations.detect import parse_any

from ..curves.curves import right_torus_knot
from .readback import SVG, diagram_from_drawing, panels_of


def _draw(tmp_path, *argv, name="out.svg"):
    out = tmp_path / name
    code = main(["draw", *argv, "-o", str(out), "-q"])
    return code, out


def test_draw_svg_is_valid_xml_with_one_group_per_component_and_one_gap_per_crossing(tmp_path):
    """The SVG parses, holds one path group per component, one gap per crossing."""
    code, out = _draw(tmp_path, "braid: s1 s2^-1 s1 s2^-1 s1 s2^-1")  # Borromean rings
    assert code == 0
    root = ET.parse(out).getroot()
    groups = [g for g in root.iter(f"{SVG}g") if g.get("class") == "component"]
    assert len(groups) == 3
    subpaths = sum(g.find(f"{SVG}path").get("d").count("M") for g in groups)
    assert subpaths == 6                 # each component broken once per under-pass


def test_draw_labels_show_every_pd_label(tmp_path):
    """--labels writes every PD edge label and the orientation arrows."""
    code, out = _draw(tmp_path, "[[1,5,2,4],[3,1,4,6],[5,3,6,2]]", "--labels")
    assert code == 0
    root = ET.parse(out).getroot()
    labels = sorted(t.text for t in root.iter(f"{SVG}text") if t.get("class") == "label")
    assert labels == ["1", "2", "3", "4", "5", "6"]
    arrows = [p for p in root.iter(f"{SVG}path") if p.get("class") == "arrow"]
    assert len(arrows) == 6


def test_draw_signs_match_the_diagram(tmp_path):
    """--signs writes the sign of every crossing (right-handed trefoil: three +)."""
    code, out = _draw(tmp_path, "[[1,5,2,4],[3,1,4,6],[5,3,6,2]]", "--signs")
    root = ET.parse(out).getroot()
    signs = [t.text for t in root.iter(f"{SVG}text") if t.get("class") == "sign"]
    assert signs == ["+", "+", "+"]


def test_draw_demo_batch_one_panel_per_code(tmp_path):
    """The demo's micrograph batch gives one panel per code, each reading back as its code."""
    code, out = _draw(tmp_path, str(demo_path()))
    assert code == 0
    text = out.read_text()
    panels = panels_of(text)
    codes = [line.split("\t")[1] for line in demo_path().read_text().splitlines()
             if line and not line.startswith("#")]
    assert len(panels) == len(codes)
    for panel, code_text in zip(panels, codes):
        d = parse_any(code_text)
        assert fingerprint(diagram_from_drawing(panel)).key() == fingerprint(d).key()


def test_draw_png_and_pdf(tmp_path):
    """PNG and PDF are written through matplotlib (PNG magic number, PDF header)."""
    code, png = _draw(tmp_path, "DT: 4 6 2", name="t.png")
    assert code == 0 and png.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    code, pdf = _draw(tmp_path, "DT: 4 6 2", name="t.pdf")
    assert code == 0 and pdf.read_bytes()[:5] == b"%PDF-"


def test_draw_simplified_has_fewer_crossings(tmp_path):
    """--simplified draws the simplified diagram (a kinked unknot becomes a circle)."""
    code, out = _draw(tmp_path, "[[1,1,2,2]]", "--simplified")
    (panel,) = panels_of(out.read_text())
    assert code == 0 and diagram_from_drawing(panel).number_of_crossings() == 0


def test_draw_chain_projection_reads_back_as_the_knot(tmp_path):
    """A ring in an XYZ file is drawn as its projected diagram: the right-handed trefoil
    (torus knot T(2,3), parametrised as in tests/curves) reads back with its Jones polynomial
    t + t^3 - t^4 (Jones 1985, common practice)."""
    x = right_torus_knot(2, 3, 60)
    xyz = tmp_path / "ring.xyz"
    xyz.write_text(f"{len(x)}\nring\n" + "".join(f"C {a:.5f} {b:.5f} {c:.5f}\n"
                                                 for a, b, c in x))
    code, out = _draw(tmp_path, str(xyz))
    assert code == 0
    (panel,) = panels_of(out.read_text())
    back = diagram_from_drawing(panel)
    assert str(fingerprint(back).jones) == "t + t^3 - t^4"


def test_draw_bad_code_is_one_line_error(tmp_path, capsys):
    """A bad code is one clear line on stderr and exit code 1, no traceback, no file."""
    code, out = _draw(tmp_path, "DT: 4 6 x")
    err = capsys.readouterr().err
    assert code == 1 and "position" in err and "Traceback" not in err and not out.exists()
    assert len(err.strip().splitlines()) == 1


def test_draw_bad_extension(tmp_path, capsys):
    """An unknown picture format names the accepted ones."""
    code, _ = _draw(tmp_path, "DT: 4 6 2", name="t.jpg")
    assert code == 1 and ".svg, .png or .pdf" in capsys.readouterr().err


def test_draw_missing_frame(tmp_path, capsys):
    """A frame beyond the file is a clear error naming it."""
    xyz = tmp_path / "ring.xyz"
    x = right_torus_knot(2, 3, 40)
    xyz.write_text(f"{len(x)}\nring\n" + "".join(f"C {a} {b} {c}\n" for a, b, c in x))
    code, _ = _draw(tmp_path, str(xyz), "--frame", "5")
    assert code == 1 and "frame 5" in capsys.readouterr().err


def test_draw_file_with_a_bad_line(tmp_path, capsys):
    """A bad code in a file is reported with the file and line."""
    f = tmp_path / "codes.txt"
    f.write_text("DT: 4 6 2\nPD: [[1,2,3]]\n")
    code, _ = _draw(tmp_path, str(f))
    err = capsys.readouterr().err
    assert code == 1 and "line 2" in err


def test_draw_is_deterministic(tmp_path):
    """The same code and seed write the same bytes; the layout does not depend on time."""
    _, a = _draw(tmp_path, "Conway: 3 1 3", name="a.svg")
    _, b = _draw(tmp_path, "Conway: 3 1 3", name="b.svg")
    assert a.read_bytes() == b.read_bytes()

"""knotsift installs as one import package and lives beside the unrelated ``identify``."""

from __future__ import annotations

import json
import subprocess
import sys
import venv
from pathlib import Path

import pytest

REPO = Path(__file__).resolve().parents[1]

_CHECK = r"""
import json, sys
import identify.identify as tags          # the unrelated PyPI package (file-type tags)
import knotsift
from knotsift import identify as identify_knot
from knotsift.data_build import build      # subpackages mapped from the top-level folders
from knotsift.data_build.sources import reference_dir
print(json.dumps({
    "tags": sorted(tags.tags_from_filename("setup.py")),
    "knot": identify_knot("DT: 4 6 2").name,
    "knotsift_file": knotsift.__file__,
    "reference_files": sorted(p.name for p in reference_dir().glob("*.csv"))[:2],
}))
"""


def _run(cmd, **kw):
    return subprocess.run(cmd, capture_output=True, text=True, timeout=600, **kw)


def test_install_beside_unrelated_identify_package(tmp_path):
    """A plain install into a fresh venv, next to PyPI's ``identify``, leaves both importable."""
    env_dir = tmp_path / "venv"
    # System site-packages give the venv knotsift's dependencies without a download;
    # knotsift itself and ``identify`` are installed into the venv, which comes first.
    venv.create(env_dir, system_site_packages=True, with_pip=True)
    py = env_dir / ("Scripts" if sys.platform == "win32" else "bin") / "python"
    got = _run([str(py), "-m", "pip", "install", "--quiet", "identify"])
    if got.returncode != 0:
        pytest.skip("the package index is unreachable, so PyPI's 'identify' cannot be "
                    f"installed: {got.stderr.strip().splitlines()[-1:]}")
    got = _run([str(py), "-m", "pip", "install", "--quiet", "--no-deps", str(REPO)])
    assert got.returncode == 0, got.stderr
    got = _run([str(py), "-c", _CHECK], cwd=tmp_path)
    assert got.returncode == 0, got.stderr
    out = json.loads(got.stdout)
    assert "python" in out["tags"]                     # identify still works
    assert out["knot"] == "3_1"                        # knotsift works
    assert str(env_dir) in out["knotsift_file"]        # ... from the venv, not the checkout
    assert out["reference_files"]                      # package data shipped
    cli = env_dir / "bin" / "knotsift"
    got = _run([str(cli), "identify", "DT: 4 6 2", "--json"], cwd=tmp_path)
    assert got.returncode == 0, got.stderr
    assert '"3_1"' in got.stdout
    got = _run([str(py), "-m", "knotsift", "show", "4_1"], cwd=tmp_path)
    assert got.returncode == 0 and "4_1" in got.stdout, got.stderr


def test_no_generic_top_level_packages_declared():
    """The distribution declares knotsift and its subpackages only (no 'identify' etc.)."""
    text = (REPO / "pyproject.toml").read_text()
    start = text.index("packages = [")
    names = [line.strip().strip('",') for line in text[start:text.index("]", start)].splitlines()[1:]]
    assert names and all(n == "knotsift" or n.startswith("knotsift.") for n in names)

"""The start-up rule: identifying a small diagram loads none of the heavy libraries.

``knotsift identify`` on a code of a few crossings should start in a fraction
of a second; networkx, numpy, FLINT, sympy, SQLAlchemy, pandas, scipy and
matplotlib each take 0.05 to 0.4 s to import, more than the whole job.  The
command is run as a process with ``-X importtime`` (which lists every module
imported), so the test fails if any of them is imported again on this path,
directly or through another module.  See DEVELOPERS.md, "Start-up".
"""

import os
import subprocess
import sys

import pytest

HEAVY = ("networkx", "numpy", "flint", "sympy", "sqlalchemy", "pandas", "scipy", "matplotlib")


def _imported(args: list[str]) -> tuple[set[str], str]:
    """Top-level packages imported by ``python -m knotsift ARGS``, and its output."""
    env = {k: v for k, v in os.environ.items() if k != "PYTHONDONTWRITEBYTECODE"}
    done = subprocess.run([sys.executable, "-X", "importtime", "-m", "knotsift", *args],
                          capture_output=True, text=True, env=env, timeout=120)
    assert done.returncode == 0, done.stderr[-2000:]
    names = {line.rsplit("|", 1)[1].strip().split(".")[0]
             for line in done.stderr.splitlines() if line.startswith("import time:")}
    return names, done.stdout


@pytest.mark.parametrize("code", ["DT: 4 6 2", "Gauss: -1 2 -3 1 -2 3",
                                  "PD: X[1,5,2,4] X[3,1,4,6] X[5,3,6,2]"])
def test_identify_small_code_imports_no_heavy_library(code):
    """The trefoil in three notations is identified without importing any heavy library."""
    names, out = _imported(["identify", code])
    assert "knotsift" in names  # the listing is read correctly
    assert "3_1" in out
    assert not names & set(HEAVY), sorted(names & set(HEAVY))


def test_identify_large_code_still_imports_numpy():
    """A five-crossing diagram does load numpy (rho_1 in one batch), so the check above can fail."""
    names, out = _imported(["identify", "DT: 4 8 10 2 6"])
    assert "5_2" in out
    assert "numpy" in names

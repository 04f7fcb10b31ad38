"""The pictures of the README's "Pictures" section, made by knotsift's own commands.

Run from the repository root (a minute or so; the screenshot needs Chromium)::

    python3 docs/pictures_demo.py

1. ``knotsift draw`` on the shipped micrograph batch (an invented scenario):
   ``docs/micrographs.svg``, one panel per transcribed code.
2. ``knotsift draw --3d --core --window 40`` on the first frame of the shipped
   demo trajectory: ``docs/chain3d.png``.
3. ``knotsift classify`` of the demo trajectory, ``knotsift report`` of its
   output, and a screenshot of the report in headless Chromium:
   ``docs/report_screenshot.png``.
"""

from __future__ import annotations

import shutil
import subprocess
import sys
import tempfile
from pathlib import Path

DOCS = Path(__file__).resolve().parent
REPO = DOCS.parent
DEMO = REPO / "identify" / "demo"


def knotsift(*argv: str) -> None:
    subprocess.run([sys.executable, "-m", "knotsift", *argv], check=True)


def main() -> None:
    knotsift("draw", str(DEMO / "plasmid_micrographs.tsv"), "-o", str(DOCS / "micrographs.svg"))
    knotsift("draw", str(DEMO / "phantom_ring_run.xyz"), "--3d", "--core", "--window", "40",
             "-o", str(DOCS / "chain3d.png"))
    browser = shutil.which("chromium") or shutil.which("chromium-browser")
    with tempfile.TemporaryDirectory() as tmp:
        out = Path(tmp) / "run.sqlite"
        knotsift("classify", str(DEMO / "phantom_ring_run.xyz"), "--out", str(out), "--quiet")
        html = Path(tmp) / "report.html"
        knotsift("report", str(out), "-o", str(html), "--title",
                 "knotsift run report: phantom_ring_run.xyz (demo)")
        if browser is None:
            print("no Chromium: the report screenshot is not made", file=sys.stderr)
            return
        profile = Path(tmp) / "profile"
        profile.mkdir()
        subprocess.run([browser, "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic",
                        "--no-first-run", "--disable-background-networking",
                        "--disable-component-update", "--disable-sync",
                        f"--user-data-dir={profile}", "--window-size=1100,1900",
                        f"--screenshot={DOCS / 'report_screenshot.png'}", html.as_uri()],
                       check=True, capture_output=True, timeout=180)


if __name__ == "__main__":
    main()

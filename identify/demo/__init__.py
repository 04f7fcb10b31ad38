"""The built-in demo: a batch of knot diagrams transcribed from plasmid micrographs.

The scenario is invented for the demo: a (fictional) bench group treats a
supercoiled plasmid with a recombinase, spreads the products for electron
microscopy and transcribes each knotted molecule's crossings by hand.  Some
crossings could not be read and are marked uncertain with ``?``.
"""

from importlib import resources
from pathlib import Path

__all__ = ["demo_path"]


def demo_path() -> Path:
    """The demo batch file (one code per line, ``label<TAB>code``)."""
    return Path(str(resources.files("knotsift.demo") / "plasmid_micrographs.tsv"))

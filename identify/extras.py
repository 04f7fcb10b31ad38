"""Optional dependencies: which extra of the package brings each one, and the one-line error.

The plain install (``pip install knotsift``) covers diagram codes, the 3D
formats XYZ, PDB, CSV and NumPy, and SQLite outputs.  The rest comes with
extras:

=========  ==================================================  =====================
extra      brings                                              for
=========  ==================================================  =====================
``bulk``   dask[distributed], pyarrow, psycopg                 Dask clusters, Parquet
                                                               outputs, PostgreSQL
``md``     MDAnalysis, gemmi, gsd                              MD trajectory formats,
                                                               mmCIF, triclinic boxes
``plots``  matplotlib                                          figures of summarise
``all``    all of the above
``test``   all of the above, pytest, hypothesis, MDAnalysisTests   the test suite
=========  ==================================================  =====================

:func:`require` imports a module or raises :class:`MissingExtraError`, whose
message is one line naming the extra to install; the command line prints it
without a traceback.
"""

from __future__ import annotations

from importlib import import_module
from types import ModuleType

from .errors import KnotsiftError

__all__ = ["EXTRAS", "MissingExtraError", "require", "install_hint"]

#: Top-level module -> the extra that installs it.
EXTRAS = {
    "dask": "bulk",
    "distributed": "bulk",
    "pyarrow": "bulk",
    "psycopg": "bulk",
    "MDAnalysis": "md",
    "gemmi": "md",
    "gsd": "md",
    "matplotlib": "plots",
}


class MissingExtraError(KnotsiftError, ImportError):
    """An optional dependency is not installed; the message names the extra that brings it."""


def install_hint(extra: str) -> str:
    """The pip command that installs ``extra``."""
    return f'pip install "knotsift[{extra}]"'


def require(module: str, extra: str | None = None, purpose: str = "") -> ModuleType:
    """Import ``module``, or raise :class:`MissingExtraError` naming the extra to install.

    Parameters
    ----------
    module : str
        A module name (``"MDAnalysis"``, ``"pyarrow.parquet"``).
    extra : str, optional
        The extra that brings it (default: from :data:`EXTRAS`).
    purpose : str
        What needs it, for the message ("reading DCD files").

    Examples
    --------
    >>> require("json").__name__
    'json'
    """
    top = module.split(".")[0]
    try:
        return import_module(module)
    except ImportError as exc:
        missing = getattr(exc, "name", None) or top
        extra = extra or EXTRAS.get(missing.split(".")[0]) or EXTRAS.get(top, "all")
        what = f"{purpose} needs" if purpose else "this needs"
        raise MissingExtraError(f"{what} the optional package {missing.split('.')[0]}, which "
                                f"is not installed: {install_hint(extra)}",
                                value=missing) from None

"""Knots in 3D coordinates: rings and open chains from simulation output.

The path of the data: a coordinate file (:mod:`.xyz`, :mod:`.pdb`,
:mod:`.coords_table`, :mod:`.npy`, chosen by :mod:`.formats`) -> frames
(:mod:`.frame`) -> checks (:mod:`.frame`, :mod:`.contact`) -> closure of open
chains (:mod:`.closure`) -> KMT reduction (:mod:`.kmt`) -> projection to a
diagram (:mod:`.projection`) -> the core's invariants and table
(:mod:`.knot_type`, :mod:`.pipeline`); the knotted core (:mod:`.localisation`).
"""

from importlib import import_module

# Names load on first use (PEP 562), so that the command line can register its
# subcommands without importing numpy.
_WHERE = {
    "CLOSURES": "closure", "closure_spectrum": "closure",
    "read_frames": "formats",
    "Chain": "frame", "Frame": "frame", "FrameFailure": "frame", "prepare_chains": "frame",
    "kmt_reduce": "kmt",
    "knotted_core": "localisation",
    "CurveResult": "pipeline", "FrameResult": "pipeline", "identify_curve": "pipeline",
    "identify_file": "pipeline", "identify_frame": "pipeline", "identify_frames": "pipeline",
    "curve_diagram": "projection", "project": "projection",
}


def __getattr__(name: str):
    if name in _WHERE:
        return getattr(import_module(f".{_WHERE[name]}", __name__), name)
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")


__all__ = [
    "Chain",
    "Frame",
    "FrameFailure",
    "CurveResult",
    "FrameResult",
    "identify_curve",
    "identify_frame",
    "identify_frames",
    "identify_file",
    "read_frames",
    "prepare_chains",
    "kmt_reduce",
    "project",
    "curve_diagram",
    "closure_spectrum",
    "knotted_core",
    "CLOSURES",
]

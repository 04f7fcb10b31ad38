"""Reading and writing knots in the usual notations: PD, DT, Gauss, braids, Conway."""

from .braid import braid_word, parse_braid, write_braid
from .conway import parse_rational, rational_entries, rational_fraction
from .conway_algebraic import parse_conway_notation
from .detect import NOTATIONS, detect_notation, parse_any, parse_any_with_uncertain
from .dt import dt_entries, parse_dt, write_dt
from .gauss import parse_gauss, parse_gauss_with_uncertain, write_gauss
from .pd import parse_pd, parse_pd_with_uncertain, write_pd

__all__ = [
    "NOTATIONS",
    "detect_notation",
    "parse_any",
    "parse_any_with_uncertain",
    "parse_pd",
    "parse_pd_with_uncertain",
    "write_pd",
    "parse_dt",
    "dt_entries",
    "write_dt",
    "parse_gauss",
    "parse_gauss_with_uncertain",
    "write_gauss",
    "parse_braid",
    "braid_word",
    "write_braid",
    "parse_rational",
    "rational_entries",
    "rational_fraction",
    "parse_conway_notation",
]

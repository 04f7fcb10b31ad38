"""The cost budget of one item: cheap invariants first, Jones only within its estimated cost.

One mechanism serves every caller (codes, 3D rings, open-chain closures,
bulk runs):

* **Cheap first.**  The Alexander polynomial, the determinant and the
  signature take polynomial time and are always computed, for a diagram of
  any size.
* **Jones by estimate.**  The Jones polynomial is a tangle contraction whose
  cost grows exponentially with the contraction width.  Before it starts,
  :func:`jones_cost` estimates its peak memory and its time from the
  contraction order; above :attr:`Budget.jones_memory` or
  :attr:`Budget.jones_seconds` it is skipped, and the result says so.  While
  it runs, the contraction reports its live state count, and it is stopped as
  soon as the memory it holds passes the budget (the estimate is a guess; the
  live count is not).
* **Jones only where it can matter** (``Budget.jones == "auto"``).  When
  no table knot and no product of table prime knots has the Alexander
  polynomial, determinant and signature found, no name can come from Jones;
  it is then computed only if cheap (below :attr:`Budget.jones_always`
  estimated seconds), for the crossing-number bound it gives.  Wherever a
  name is possible Jones is computed (within budget), so names are the same
  as with ``jones="always"``.
* **Wall time.**  :func:`item_budget` opens a per-item deadline; the long
  loops call :func:`check_deadline`, which raises :class:`TooComplex` once it
  has passed.  Callers turn that into the status ``too complex`` and keep
  what was computed.
"""

from __future__ import annotations

import math
import time
from contextlib import contextmanager
from contextvars import ContextVar
from dataclasses import dataclass, field

from .errors import KnotsiftError

__all__ = [
    "Budget",
    "DEFAULT_BUDGET",
    "JONES_MODES",
    "JonesCost",
    "TooComplex",
    "JonesOverBudget",
    "jones_cost",
    "item_budget",
    "check_deadline",
    "bracket_progress",
    "current_budget",
    "JONES_OUTCOMES",
    "Staged",
    "staged_invariants",
    "jones_can_name",
    "budget_scope",
    "add_budget_arguments",
    "budget_from_args",
]

JONES_MODES = ("auto", "always", "never")

# Calibration of the estimate (measured on random equilateral polygons, bench/):
# Python-level cost of one state update in the contraction, in seconds, and
# the bytes one state holds besides its packed polynomial (key tuple, dict slot).
_SECONDS_PER_STATE = 2.0e-6
_STATE_OVERHEAD = 120


class TooComplex(KnotsiftError, TimeoutError):
    """The item's wall-time budget ran out; what was computed so far is kept by the caller."""


class JonesOverBudget(KnotsiftError, MemoryError):
    """The Jones contraction would pass (or passed) its memory or time budget."""


@dataclass(frozen=True)
class Budget:
    """Limits on the cost of one item.

    Parameters
    ----------
    jones_memory : int
        Bytes the Jones contraction may hold (estimated before, counted
        during).  Default 1 GiB: two workers stay far below 24 GB.
    jones_seconds : float
        Estimated seconds above which Jones is not started.
    wall_seconds : float or None
        Wall time of one item (a code, a chain); None for no limit.
    jones : {"auto", "always", "never"}
        auto: Jones where it can change the answer or is cheap; always:
        within the budget; never: skip it.
    jones_always : float
        In auto mode, Jones is computed anyway when its estimate is below
        this many seconds (it gives the span-of-V crossing bound).
    """

    jones_memory: int = 1 << 30
    jones_seconds: float = 20.0
    wall_seconds: float | None = 60.0
    jones: str = "auto"
    jones_always: float = 0.05

    def __post_init__(self):
        if self.jones not in JONES_MODES:
            raise KnotsiftError(f"jones must be one of {', '.join(JONES_MODES)}, got "
                                f"{self.jones!r}", value=self.jones)
        for name in ("jones_memory", "jones_seconds", "jones_always"):
            v = getattr(self, name)
            if isinstance(v, bool) or not isinstance(v, (int, float)) or v < 0 or v != v:
                raise KnotsiftError(f"{name} must be a non-negative number, got {v!r}", value=v)
        w = self.wall_seconds
        if w is not None and (isinstance(w, bool) or not isinstance(w, (int, float))
                              or not w > 0):
            raise KnotsiftError(f"wall_seconds must be a positive number or None, got {w!r}",
                                value=w)

    def to_dict(self) -> dict:
        return {"jones_memory": self.jones_memory, "jones_seconds": self.jones_seconds,
                "wall_seconds": self.wall_seconds, "jones": self.jones,
                "jones_always": self.jones_always}


DEFAULT_BUDGET = Budget()


@dataclass
class JonesCost:
    """The estimated cost of the Jones contraction of one diagram.

    Attributes
    ----------
    crossings, width : int
        Crossings and largest open boundary along ``order``.
    states : int
        Estimated peak number of boundary states.
    memory : int
        Estimated peak bytes.
    seconds : float
        Estimated time.
    order : list of int
        The contraction order (reused by the contraction itself).
    """

    crossings: int
    width: int
    states: int
    memory: int
    seconds: float
    order: list = field(repr=False, default_factory=list)

    def text(self) -> str:
        return (f"contraction width {self.width} over {self.crossings} crossings, estimated "
                f"{_bytes(self.memory)} and {_duration(self.seconds)}")


def _bytes(n: float) -> str:
    for unit in ("B", "kB", "MB", "GB", "TB"):
        if n < 1000:
            return f"{n:.0f} {unit}"
        n /= 1000
    return f"{n:.0f} PB"


def _duration(s: float) -> str:
    if s < 1:
        return f"{s * 1000:.0f} ms"
    if s < 3600:
        return f"{s:.1f} s"
    return f"{s / 3600:.1f} h"


def packed_state_bytes(crossings: int) -> int:
    """Bytes of one packed bracket polynomial (the layout of knotsift.invariants.bracket)."""
    bits = 2 * crossings + 8
    digits = 2 * crossings + 4  # offset n + 2 and up to n + 2 more digits (powers of A^2)
    return bits * digits // 8 + 32


def _boundary_states(width: int) -> int:
    """Non-crossing matchings of ``width`` boundary points (a Catalan number), 1 for odd."""
    if width % 2:
        return 1
    k = width // 2
    return math.comb(2 * k, k) // (k + 1)


def jones_cost(diagram) -> JonesCost:
    """Estimate the Jones contraction's peak memory and time before starting it.

    Parameters
    ----------
    diagram : Diagram

    Returns
    -------
    JonesCost

    Notes
    -----
    Along the order of :func:`knotsift.invariants.bracket.contraction_order`
    the number of boundary states after step i is at most both 2^i and the
    number of non-crossing matchings of the open boundary (a Catalan number
    of half the width; twice that, since the processed part need not be a
    disc), and each crossing at most doubles the states of the step before.
    The estimate follows that recurrence; the contraction counts its real
    states as it goes and stops at the budget whatever the estimate said.
    """
    from .invariants.bracket import boundary_widths, contraction_order

    n = len(diagram.crossings)
    order = contraction_order(diagram)
    widths = boundary_widths(diagram, order)
    widest = max(widths, default=0)
    peak = states = 1
    work = 0
    for width in widths:
        states = min(2 * _boundary_states(width), 2 * states)
        peak = max(peak, states)
        work += states
    per_state = packed_state_bytes(n) + _STATE_OVERHEAD + 8 * widest
    # two generations of states live at once while a crossing is added
    memory = 2 * peak * per_state
    seconds = work * _SECONDS_PER_STATE * (1 + per_state / 4096)
    return JonesCost(n, widest, peak, memory, seconds, order)


@dataclass
class _Guard:
    deadline: float | None
    budget: Budget


_GUARD: ContextVar[_Guard | None] = ContextVar("knotsift_budget_guard", default=None)


def current_budget() -> Budget:
    """The budget of the item being computed (the default outside :func:`item_budget`)."""
    g = _GUARD.get()
    return g.budget if g is not None else DEFAULT_BUDGET


@contextmanager
def item_budget(budget: Budget | None = None):
    """Run one item under ``budget``: its deadline starts now.

    Nested items keep the earlier of the two deadlines, so an item inside a
    frame never outlives the frame's budget.
    """
    budget = budget or current_budget()
    outer = _GUARD.get()
    deadline = None if budget.wall_seconds is None else time.monotonic() + budget.wall_seconds
    if outer is not None and outer.deadline is not None:
        deadline = outer.deadline if deadline is None else min(deadline, outer.deadline)
    token = _GUARD.set(_Guard(deadline, budget))
    try:
        yield budget
    finally:
        _GUARD.reset(token)


def check_deadline(what: str = "") -> None:
    """Raise :class:`TooComplex` when the current item's wall time has run out."""
    g = _GUARD.get()
    if g is not None and g.deadline is not None and time.monotonic() > g.deadline:
        raise TooComplex(f"the wall-time budget of {g.budget.wall_seconds:g} s ran out"
                         + (f" during {what}" if what else ""), value=g.budget.wall_seconds)


def bracket_progress(states: int, state_bytes: int) -> None:
    """Called by the bracket contraction after each crossing: stop it past the budget."""
    g = _GUARD.get()
    if g is None:
        return
    held = states * (state_bytes + _STATE_OVERHEAD)
    if held > g.budget.jones_memory:
        raise JonesOverBudget(f"the Jones contraction held {states} states (about "
                              f"{_bytes(held)}), over the budget of "
                              f"{_bytes(g.budget.jones_memory)}", value=states)
    check_deadline("the Jones polynomial")


#: What happened to the Jones polynomial of an item (``Staged.jones``).
JONES_OUTCOMES = ("computed", "over budget", "stopped", "not needed", "not requested")


@dataclass
class Staged:
    """The invariants of one simplified diagram, computed cheap first.

    Attributes
    ----------
    values : dict
        ``components``, ``alexander``, ``determinant``, ``signature``,
        ``rho_1`` (or ``rho_1_hash`` above the rho_1 crossing limit),
        ``homology``, ``jones`` as computed so far.
    jones : str
        One of :data:`JONES_OUTCOMES`.
    cost : JonesCost or None
        The estimate, when one was made.
    note : str or None
        Why Jones is missing, in words, for the result's notes.
    """

    values: dict = field(default_factory=dict)
    jones: str = "not requested"
    cost: JonesCost | None = None
    note: str | None = None
    no_sum: bool = False  # no sum of table primes has these Alexander, det, signature

    def fingerprint(self):
        """The Fingerprint of what was computed (Jones None when skipped)."""
        from .invariants.fingerprint import Fingerprint

        v = self.values
        return Fingerprint(v["components"], v.get("jones"), v.get("alexander"),
                           v["determinant"], v["signature"], v.get("rho_1"),
                           v.get("homology", ()), v.get("rho_1_hash"))


def jones_can_name(table, alexander, determinant: int, signature: int,
                   staged: "Staged | None" = None) -> bool:
    """True when some table knot, or product of table primes, has these mirror-blind values.

    Only then can the Jones polynomial help name the knot; otherwise no name
    is possible whatever Jones is (the table lookup and the connected-sum
    search both need these three to agree first).
    """
    for f in table.by_invariant("alexander", str(alexander)):
        if f.determinant == determinant and f.signature == signature:
            return True
    from .factorisation import factorisations

    search = factorisations(table, alexander, determinant, signature, None, limit=1)
    if staged is not None and search.complete and not search.solutions:
        staged.no_sum = True  # identification need not search again
    return bool(search.solutions) or not search.complete  # unsure: let Jones decide


def staged_invariants(simple, table=None, budget: Budget | None = None,
                      staged: Staged | None = None) -> Staged:
    """The invariants of a simplified diagram: cheap ones always, Jones within the budget.

    Parameters
    ----------
    simple : Diagram
        Already simplified.
    table : ReferenceTable, optional
        For the "can Jones matter" rule (default: the shipped table).
    budget : Budget, optional
        Default: the current item's (see :func:`item_budget`).
    staged : Staged, optional
        Filled in place, so that a caller catching :class:`TooComplex` keeps
        what was computed before the deadline.

    Returns
    -------
    Staged
    """
    from .invariants.bracket import kauffman_bracket
    from .invariants.jones import jones_from_bracket
    from .invariants.signature import knot_signature

    budget = budget or current_budget()
    st = staged if staged is not None else Staged()
    v = st.values
    components = simple.number_of_components()
    v["components"] = components
    check_deadline("the Alexander polynomial")
    if components == 1:
        from .invariants.fingerprint import RHO_1_UP_TO

        if simple.number_of_crossings() <= RHO_1_UP_TO:
            from .invariants.perturbed_alexander import perturbed_alexander

            # Delta from the same matrix as rho_1 (equal to alexander_polynomial)
            both = perturbed_alexander(simple)
            v["alexander"], v["rho_1"] = both.alexander, both.rho_1
        else:
            from .invariants.alexander import alexander_polynomial
            from .invariants.perturbed_alexander import rho_1_hash

            v["alexander"] = alexander_polynomial(simple)
            check_deadline("the hash of rho_1")
            v["rho_1_hash"] = rho_1_hash(simple)
        v["determinant"] = abs(v["alexander"].evaluate(-1))
    else:
        from .invariants.determinant import determinant

        v["alexander"] = None
        v["determinant"] = determinant(simple)
    check_deadline("the signature")
    v["signature"] = knot_signature(simple)
    check_deadline("the double-cover homology")
    from .invariants.double_cover import double_cover_homology

    v["homology"] = double_cover_homology(simple)
    check_deadline("the Jones polynomial")
    if budget.jones == "never":
        st.jones = "not requested"
        st.note = "the Jones polynomial was not computed (not requested)"
        return st
    if simple.number_of_crossings() == 0:
        from .invariants.jones import jones_polynomial

        v["jones"] = jones_polynomial(simple)
        st.jones = "computed"
        return st
    cost = st.cost = jones_cost(simple)
    cheap = cost.seconds <= budget.jones_always and cost.memory <= budget.jones_memory
    if budget.jones == "auto" and components == 1 and not cheap:
        if table is None:
            from .table import open_table

            table = open_table()
        if not jones_can_name(table, v["alexander"], v["determinant"], v["signature"], st):
            st.jones = "not needed"
            st.note = ("the Jones polynomial was not computed: no table knot and no connected "
                       "sum of table knots has this Alexander polynomial, determinant and "
                       "signature, so it could not change the answer (" + cost.text() + ")")
            return st
    if cost.memory > budget.jones_memory or cost.seconds > budget.jones_seconds:
        st.jones = "over budget"
        st.note = ("the Jones polynomial was skipped for cost (" + cost.text() +
                   f"; budget {_bytes(budget.jones_memory)} and "
                   f"{_duration(budget.jones_seconds)}): the answer stands on the Alexander "
                   "polynomial, the determinant and the signature")
        return st
    try:
        v["jones"] = jones_from_bracket(kauffman_bracket(simple, cost.order), simple.writhe())
        st.jones = "computed"
    except JonesOverBudget as exc:
        st.jones = "stopped"
        st.note = (f"the Jones polynomial was stopped: {exc.message} ({cost.text()}); the "
                   "answer stands on the Alexander polynomial, the determinant and the "
                   "signature")
    return st


@contextmanager
def budget_scope(budget: Budget | None):
    """Make ``budget`` the default of every item started inside, without a clock of its own.

    For a run of many items (a file of frames): each item still gets its own
    wall time from :func:`item_budget`.
    """
    if budget is None:
        yield None
        return
    token = _GUARD.set(_Guard(None, budget))
    try:
        yield budget
    finally:
        _GUARD.reset(token)


def _non_negative(text: str) -> float:
    import argparse

    try:
        v = float(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"expected a number, got {text!r}") from None
    if not v >= 0 or v == float("inf"):
        raise argparse.ArgumentTypeError(f"expected a finite number >= 0, got {text}")
    return v


def add_budget_arguments(parser) -> None:
    """The budget options shared by ``identify``, ``curve`` and ``classify``."""
    d = DEFAULT_BUDGET
    g = parser.add_argument_group("cost budget (README: Budgets)")
    g.add_argument("--jones", choices=JONES_MODES, default=d.jones,
                   help="auto (default): the Jones polynomial where it can change the answer "
                        "or is cheap; always: whenever within budget; never")
    g.add_argument("--jones-memory", type=_non_negative, default=d.jones_memory / 1e9,
                   metavar="GB", help=f"memory the Jones contraction may use (default "
                                      f"{d.jones_memory / 1e9:.2f} GB)")
    g.add_argument("--jones-seconds", type=_non_negative, default=d.jones_seconds,
                   metavar="S", help=f"skip Jones when estimated above this (default "
                                     f"{d.jones_seconds:g} s)")
    g.add_argument("--time-budget", type=_non_negative, default=d.wall_seconds, metavar="S",
                   help=f"wall time per item, then status 'too complex' (default "
                        f"{d.wall_seconds:g} s; 0 for none)")


def budget_from_args(args) -> Budget:
    """The Budget of parsed :func:`add_budget_arguments` options."""
    wall = getattr(args, "time_budget", DEFAULT_BUDGET.wall_seconds)
    return Budget(jones_memory=int(getattr(args, "jones_memory", 1.0) * 1e9),
                  jones_seconds=getattr(args, "jones_seconds", DEFAULT_BUDGET.jones_seconds),
                  wall_seconds=wall or None, jones=getattr(args, "jones", "auto"))

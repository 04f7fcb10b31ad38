"""Limits on what one input may cost: the single place every entry point checks.

A short input can ask for an enormous amount of work (``s1^1000000``, an
exponent of ``t^100000000``, a header announcing 10^10 beads).  Every reader
and command checks the sizes it is about to commit to against these limits
*before* it allocates or computes, and refuses with a :class:`LimitError`
naming the limit, the value found and the option that raises it.

=================  ===========  ====================================================
limit              default      what it bounds
=================  ===========  ====================================================
text_chars         100000       characters of one code or polynomial text
integer_digits     30           digits of one integer in any text
crossings          1000         crossings of a diagram read from a notation
uncertain_work     40000        2^(uncertain crossings) x crossings of the diagram
closures           10000        random closures per open chain
poly_degree        1000         largest \\|exponent\\| in a typed polynomial
poly_terms         1000         terms of a typed polynomial
array_bytes        1073741824   bytes of one coordinate array in a .npy/.npz file
beads              1000000      beads of one frame announced by a file header
item_seconds       600          wall-clock seconds of one classify item (hard)
worker_memory_mb   4096         address space of one classify worker, in MiB (hard)
=================  ===========  ====================================================

The last two are enforced from outside the computation by
:mod:`knotsift.bulk.runner` (a worker past them is ended and its item
recorded as an error); the others are checked by the readers themselves.
Change a limit with ``--limit NAME=VALUE`` on any command, with the
environment variable ``KNOTSIFT_LIMITS="NAME=VALUE,NAME=VALUE"`` (inherited by
worker processes), or in Python with :func:`set_limits`.
"""

from __future__ import annotations

import os
import re
from dataclasses import asdict, dataclass, fields, replace

from .errors import KnotsiftError

__all__ = ["Limits", "LimitError", "LIMIT_MEANINGS", "ENV_VAR", "current", "set_limits",
           "parse_limit_options", "check_text", "check_at_most", "check_declared_size"]

#: Environment variable holding limit overrides, ``NAME=VALUE`` separated by commas.
ENV_VAR = "KNOTSIFT_LIMITS"


@dataclass(frozen=True)
class Limits:
    """The limits in force (see the module docstring for their meaning)."""

    text_chars: int = 100_000
    integer_digits: int = 30
    crossings: int = 1_000
    uncertain_work: int = 40_000
    closures: int = 10_000
    poly_degree: int = 1_000
    poly_terms: int = 1_000
    array_bytes: int = 1 << 30
    beads: int = 1_000_000
    item_seconds: int = 600
    worker_memory_mb: int = 4096

    def to_dict(self) -> dict[str, int]:
        return asdict(self)


#: One line per limit, for --help and error messages.
LIMIT_MEANINGS = {
    "text_chars": "characters of one code or polynomial text",
    "integer_digits": "digits of one integer in any text",
    "crossings": "crossings of a diagram read from a notation",
    "uncertain_work": "2^(uncertain crossings) x crossings of the diagram",
    "closures": "random closures per open chain",
    "poly_degree": "largest |exponent| in a typed polynomial",
    "poly_terms": "terms of a typed polynomial",
    "array_bytes": "bytes of one coordinate array in a .npy/.npz file",
    "beads": "beads of one frame announced by a file header",
    "item_seconds": "wall-clock seconds of one classify item (hard limit)",
    "worker_memory_mb": "address space of one classify worker in MiB (hard limit)",
}


class LimitError(KnotsiftError, ValueError):
    """An input asks for more than a limit allows; ``value`` holds the size found."""


_NAMES = tuple(f.name for f in fields(Limits))
_current: Limits | None = None


def parse_limit_options(entries, base: Limits | None = None) -> Limits:
    """``base`` with ``NAME=VALUE`` entries applied (from --limit or the environment).

    Raises
    ------
    LimitError
        For an unknown name or a value that is not a positive integer.

    Examples
    --------
    >>> parse_limit_options(["crossings=50"]).crossings
    50
    """
    changes: dict[str, int] = {}
    for entry in entries:
        name, sep, value = str(entry).partition("=")
        name = name.strip().replace("-", "_")
        if not sep or name not in _NAMES:
            raise LimitError(f"a limit is NAME=VALUE with NAME one of {', '.join(_NAMES)}; "
                             f"got {entry!r}", value=entry)
        value = value.strip().replace("_", "")
        if not re.fullmatch(r"[0-9]{1,15}", value) or int(value) < 1:
            raise LimitError(f"limit {name} must be a positive integer of at most 15 digits, "
                             f"got {value!r}", value=entry)
        changes[name] = int(value)
    return replace(base or Limits(), **changes)


def _from_environment() -> Limits:
    raw = os.environ.get(ENV_VAR, "").strip()
    if not raw:
        return Limits()
    try:
        return parse_limit_options([e for e in raw.split(",") if e.strip()])
    except LimitError as exc:
        raise LimitError(f"environment variable {ENV_VAR}: {exc.message}",
                         value=raw) from None


def current() -> Limits:
    """The limits in force in this process (defaults, then ``KNOTSIFT_LIMITS``, then set_limits)."""
    global _current
    if _current is None:
        _current = _from_environment()
    return _current


def set_limits(limits: Limits | None = None, *, export: bool = True, **changes: int) -> Limits:
    """Replace the limits in force; returns the previous ones.

    Parameters
    ----------
    limits : Limits, optional
        The new limits (default: the current ones), with ``changes`` applied.
    export : bool
        Also write them to ``KNOTSIFT_LIMITS`` so worker processes started
        later inherit them.
    """
    global _current
    previous = current()
    new = replace(limits or previous, **changes)
    _current = new
    if export:
        differ = [f"{k}={v}" for k, v in new.to_dict().items()
                  if v != getattr(Limits(), k)]
        if differ:
            os.environ[ENV_VAR] = ",".join(differ)
        else:
            os.environ.pop(ENV_VAR, None)
    return previous


def _hint(name: str) -> str:
    return f"raise it with --limit {name}=N if you mean it"


def check_at_most(name: str, value: int, what: str, where: str | None = None) -> None:
    """Refuse ``value`` above the limit ``name``; ``what`` says what was counted.

    Raises
    ------
    LimitError
        Naming the limit, the value and the option that raises it.
    """
    limit = getattr(current(), name)
    if value > limit:
        raise LimitError(f"{what} is {value}, above the limit {name} = {limit}; "
                         f"{_hint(name)}", value=value, where=where)


_LONG_DIGITS = re.compile(r"[0-9]+")


def check_text(text: str, what: str = "the text", where: str | None = None) -> None:
    """Refuse text too long, with an integer too long, or with control bytes of a binary file.

    Called before any parsing, so no reader ever meets Python's own limit on
    converting long digit strings (which would surface as a bare ValueError).

    Raises
    ------
    LimitError
        For too many characters or digits (position given).
    KnotsiftError
        For NUL bytes or other control characters (binary data, not text).
    """
    lim = current()
    if len(text) > lim.text_chars:
        raise LimitError(f"{what} has {len(text)} characters, above the limit text_chars = "
                         f"{lim.text_chars}; {_hint('text_chars')}", value=len(text),
                         where=where)
    bad = next((i for i, ch in enumerate(text)
                if (ord(ch) < 32 and ch not in "\t\n\r") or ch in "\x7f\ufffd"), None)
    if bad is not None:
        raise LimitError(f"{what} holds the control or undecodable character "
                         f"{text[bad]!r} at position {bad + 1}: binary data, not a code",
                         value=text[bad], where=where)
    if not text.isascii():
        import unicodedata

        hidden = next((i for i, ch in enumerate(text) if unicodedata.category(ch) == "Cf"), None)
        if hidden is not None:   # bidirectional overrides and other invisible characters
            raise LimitError(f"{what} holds the invisible formatting (control) character "
                             f"{text[hidden]!r} at position {hidden + 1}",
                             value=text[hidden], where=where)
    for m in _LONG_DIGITS.finditer(text):
        if m.end() - m.start() > lim.integer_digits:
            raise LimitError(f"{what} holds an integer of {m.end() - m.start()} digits at "
                             f"position {m.start() + 1}, above the limit integer_digits = "
                             f"{lim.integer_digits}; {_hint('integer_digits')}",
                             value=m.end() - m.start(), where=where)


def check_declared_size(declared_bytes: int, available_bytes: int, what: str,
                        where: str | None = None) -> None:
    """Refuse a header announcing more data than the file holds (before allocating).

    Raises
    ------
    LimitError
        When ``declared_bytes`` exceeds ``available_bytes``.
    """
    if declared_bytes > available_bytes:
        raise LimitError(f"{what} announces at least {declared_bytes} bytes but only "
                         f"{available_bytes} remain in the file: truncated or corrupt",
                         value=declared_bytes, where=where)

"""A part drawn for one plan, given again to another plan that would draw
it the same (#12: "work shared by many kits computed once").

A class set's schools differ in latitude, language and title, yet many of
their parts do not: the mater's two faces, the rule and the alidade are
the same at every latitude of one language (the front, of one
hemisphere) where no town is given, and the rete wherever the rim
(kitgen.sky.rete_rim) is the same, as it is, the outer tropic, at every
northern school beyond about 49 N on A4.  Which of a plan's values a builder reads
is its own affair and changes as parts are improved, so it is not listed
by hand: each part is drawn once with a context that notes every value
read from it (:class:`_Reading`: of the plan, the kit's dimensions, the
scales and the plate), and kept with those values.  A later context is
given the kept part when every value noted reads the same from it: the
part is then the builder's own answer for it, element for element.  This is
memoization by a verifying trace, as in A. Mokhov, N. Mitchell and
S. Peyton Jones, "Build systems a la carte" (Proc. ACM Program. Lang. 2,
ICFP 2018): a task is run again only when a value it read has changed.

Builders are pure functions of their context (kitgen.parts.context):
what they read besides it is the shipped data and the modules' constants,
the same for every plan in one process.
"""

from __future__ import annotations

import dataclasses
import itertools
import math
import threading

import numpy as np

from ..kept import keep_last
from ..words.templates import Words

#: How many parts of each kind are kept (a plate's geometry is megabytes).
KEPT_PER_KIND = 4

#: By kind: (the values read, each with its path from the context; the part), the oldest first.
_KEPT: dict[str, dict] = {}
_COUNT = itertools.count()
_LOCK = threading.Lock()


def reused_or_drawn(kind: str, ctx, build):
    """``build(ctx)`` for the part kind ``kind``, or the part kept from a
    context (kitgen.parts.context.PartContext) in which every value that
    ``build`` read (of its plan, dimensions, scales and plate) is the same
    as in ``ctx`` (:func:`_same`)."""
    with _LOCK:   # the web page's builds may run in threads
        kept = list(_KEPT.setdefault(kind, {}).values())
    for reads, part in reversed(kept):
        if all(_same(value, _read(ctx, path)) for path, value in reads):
            return part
    reading = _Reading(ctx, (), {})
    part = build(reading)
    with _LOCK:
        keep_last(_KEPT.setdefault(kind, {}), next(_COUNT), (tuple(reading.reads.items()), part), KEPT_PER_KIND)
    return part


def let_go() -> None:
    """Forget every kept part (the tests' fresh start)."""
    with _LOCK:
        _KEPT.clear()


class _Reading:
    """A part's context (or one of its frozen dataclass values, at
    ``path`` from it) that notes in ``reads`` each value read from it by
    its path; a frozen dataclass value read is itself a :class:`_Reading`,
    so that what is noted is the value read at the end (the plan's
    ``sky.rim_deg``), not the whole that holds it.  A method read notes
    the whole of its object, which it may read all of."""

    __slots__ = ("_of", "_path", "reads")

    def __init__(self, of, path: tuple, reads: dict):
        object.__setattr__(self, "_of", of)
        object.__setattr__(self, "_path", path)
        object.__setattr__(self, "reads", reads)

    def __getattr__(self, name: str):
        value = getattr(self._of, name)
        if getattr(value, "__self__", None) is self._of:   # a method: it may read any of the whole
            self.reads.setdefault(self._path, self._of)
            return value
        path = self._path + (name,)
        if dataclasses.is_dataclass(value) and not isinstance(value, type) and _frozen(value):
            return _Reading(value, path, self.reads)
        self.reads.setdefault(path, value)
        return value

    def __setattr__(self, name, value):
        raise dataclasses.FrozenInstanceError(f"cannot assign to field {name!r}")

    # Used whole (compared, hashed, tested for truth): the whole is noted.
    def _whole(self):
        self.reads.setdefault(self._path, self._of)
        return self._of

    def __eq__(self, other):
        return self._whole() == (other._whole() if isinstance(other, _Reading) else other)

    def __hash__(self):
        return hash(self._whole())

    def __bool__(self):
        return bool(self._whole())

    @property
    def __class__(self):   # isinstance() sees the value's own class
        return type(self._of)


def _frozen(value) -> bool:
    params = getattr(type(value), "__dataclass_params__", None)
    return bool(params is not None and params.frozen)


def _read(ctx, path: tuple):
    """The value at ``path`` from ``ctx``; :data:`_NONE` where it has none
    (a value read through one that is None in this context)."""
    value = ctx
    for name in path:
        value = getattr(value, name, _NONE)
        if value is _NONE:
            break
    return value


#: What a path that leads nowhere (through a None) reads as: :func:`_same`
#: takes no value read for it.
_NONE = object()


def _same(a, b) -> bool:
    """Whether two values read are the same: equal, of the same type (1
    and 1.0 and True are not), NaN the same as NaN, words the same words,
    arrays equal element for element."""
    if a is b:
        return True
    if type(a) is not type(b):
        return False
    if isinstance(a, Words):
        return a.same_as(b)
    if isinstance(a, float):
        return a == b or (math.isnan(a) and math.isnan(b))
    if isinstance(a, np.ndarray):
        return a.shape == b.shape and a.dtype == b.dtype and bool(np.array_equal(a, b, equal_nan=a.dtype.kind == "f"))
    if isinstance(a, (tuple, list)):
        return len(a) == len(b) and all(_same(x, y) for x, y in zip(a, b))
    try:
        return bool(a == b)
    except (TypeError, ValueError):   # a value with arrays inside: never taken for another
        return False

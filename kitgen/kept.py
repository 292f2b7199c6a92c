"""The last few of something, kept: the one way kitgen's small
module-level caches let their oldest entries go.

A class set builds many kits in one process, so each cache holds only
the last few things it was asked for (a school's plans, pages, PDFs,
pictures, polylines) and lets the oldest go first: first in, first out.
A plain ``dict`` is enough for that, since a dict keeps its keys in the
order they were first inserted (The Python Language Reference, 3.7 and
later, "Dictionaries": "Dictionaries preserve insertion order"), so its
first key is its oldest.  Storing under a key already there changes the
value but not the key's place.
"""

from __future__ import annotations


def keep_last(store: dict, key, value, most: int):
    """``value`` stored under ``key`` in ``store``, the oldest entries
    (first inserted) let go first so that ``store`` holds at most
    ``most``; returns ``value``.  The room is made before storing, as if
    ``key`` were new."""
    while len(store) >= most:
        del store[next(iter(store))]
    store[key] = value
    return value


def kept_for(store: dict, obj, make, most: int):
    """``make()``, kept in ``store`` for the object ``obj`` by its identity
    (:func:`keep_last`, at most ``most``): the kept value while that very
    object is the one kept under its ``id`` (a freed object's id may be
    reused by another), else made and kept.  The store holds ``obj``
    itself, so its id stays its own while kept."""
    hit = store.get(id(obj))
    if hit is not None and hit[0] is obj:
        return hit[1]
    return keep_last(store, id(obj), (obj, make()), most)[1]

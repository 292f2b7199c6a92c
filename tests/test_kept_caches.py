"""The small caches' one eviction (kitgen.kept.keep_last, #12) against
a plain reference model: Python's standard library
``collections.OrderedDict``, whose ``popitem(last=False)`` removes the
first inserted item (documented FIFO order), on key sequences Hypothesis
draws, with repeats; and no module of the package writes the eviction
out again by hand (read with Python's ``ast``)."""

from __future__ import annotations

import ast
from collections import OrderedDict
from pathlib import Path

from hypothesis import given
from hypothesis import strategies as st

from kitgen.kept import keep_last

PACKAGE = Path(__file__).resolve().parent.parent / "kitgen"

#: Few distinct keys, so that a key often comes back while still kept.
KEYS = st.lists(st.sampled_from("abcdefgh"), max_size=60)


def _reference(model: OrderedDict, key, value, most: int) -> None:
    """The cap by count before storing, the oldest first out (FIFO)."""
    while len(model) >= most:
        model.popitem(last=False)
    model[key] = value


@given(KEYS, st.integers(min_value=1, max_value=6))
def test_keep_last_is_a_fifo_of_at_most_most(keys, most):
    store, model = {}, OrderedDict()
    for n, key in enumerate(keys):
        value = (key, n)
        assert keep_last(store, key, value, most) is value
        _reference(model, key, value, most)
        assert list(store.items()) == list(model.items())
        assert len(store) <= most


def test_a_worked_case():
    # written out by hand: four keys into room for three, then a kept key again
    store = {}
    for key in "abcd":
        keep_last(store, key, key.upper(), 3)
    assert list(store.items()) == [("b", "B"), ("c", "C"), ("d", "D")]   # "a", the oldest, let go
    keep_last(store, "c", "C2", 3)   # room made as for a new key: "b" goes, "c" keeps its place
    assert list(store.items()) == [("c", "C2"), ("d", "D")]


def _evicts_by_hand(node) -> bool:
    """``del store[next(iter(store))]``: the eviction keep_last holds."""
    return (isinstance(node, ast.Delete)
            and any(isinstance(t, ast.Subscript) and isinstance(t.slice, ast.Call)
                    and isinstance(t.slice.func, ast.Name) and t.slice.func.id == "next"
                    for t in node.targets))


def test_no_module_evicts_by_hand():
    found = [f"{path.relative_to(PACKAGE.parent)}:{node.lineno}"
             for path in sorted(PACKAGE.rglob("*.py")) if path.name != "kept.py"
             for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))) if _evicts_by_hand(node)]
    assert not found, f"evicted by hand, not through kitgen.kept.keep_last: {found}"


def test_kept_for_makes_once_per_object_and_never_serves_a_stranger():
    """``kept_for`` keys by ``id``, which is unique only among objects that
    exist at the same time (The Python Language Reference, 3.1, "Objects,
    values and types"): an entry left by another object under the same id
    is never served, and the same object is made for once."""
    from kitgen.kept import kept_for

    made, store, obj = [], {}, object()

    def make():
        made.append(1)
        return len(made)

    assert kept_for(store, obj, make, 4) == 1
    assert kept_for(store, obj, make, 4) == 1 and len(made) == 1
    store[id(obj)] = (object(), "a stranger's")   # as if a freed object's id were reused
    assert kept_for(store, obj, make, 4) == 2
    others = [object() for _ in range(4)]
    for other in others:
        kept_for(store, other, make, 4)
    assert id(obj) not in store and len(store) == 4   # the oldest let go

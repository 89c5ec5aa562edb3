"""Results kept for the last object a function was given.

Deriving one entry asks several estimators about the same molecule: the boiling-point,
melting-point and Hansen trees read the same group counts and descriptors, and the Hansen
trees take the boiling-point estimate and the dipole moment as features, both already made
for the entry's own values. :func:`for_last` keeps a function's result for the very object
it was last called with (``is``, not ``==``: two equal molecules with their atoms in another
order can give results that differ in the last bits of a float), so a repeated question
about one molecule is answered without working it out again, and with the same result.

The kept result is shared: a function wrapped here must return something its callers do not
change (a tuple, a frozen dataclass).
"""
from __future__ import annotations

import functools
from collections.abc import Callable
from typing import Any, TypeVar

T = TypeVar("T")

__all__ = ["for_last"]


def for_last(fn: Callable[[Any], T]) -> Callable[[Any], T]:
    """Wrap the one-argument function ``fn`` so that its result for the last object is kept.

    >>> calls = []
    >>> @for_last
    ... def size(items):
    ...     calls.append(1)
    ...     return len(items)
    >>> a, b = [1, 2], [1, 2]
    >>> size(a), size(a), size(b), size(a)
    (2, 2, 2, 2)
    >>> len(calls)   # a, then b (equal, not the same object), then a again
    3
    """
    last: list = [None, None]  # [object, result]; the object is held so its id cannot be reused

    @functools.wraps(fn)
    def wrapper(obj):
        if last[0] is not obj or obj is None:
            result = fn(obj)  # worked out before anything is kept, so an exception keeps nothing
            last[0], last[1] = obj, result
        return last[1]

    return wrapper

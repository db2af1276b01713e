"""Per-dataset memory of fitted contact models and per-ball predictions (private).

A dashboard asks for the same dataset's contact model on every click; fitting takes
seconds, so results are kept per dataset. A loaded PlateAppearances object is recognised
by identity (through a weak reference, so the memory goes when the data does); a plain
DataFrame is recognised by a fingerprint of the columns the contact layer reads.
"""

from __future__ import annotations

import hashlib
import weakref
from collections import Counter, OrderedDict
from collections.abc import Callable
from typing import Any

import pandas as pd

from matchup_widgets.data import BASE_OUT_COLUMNS

from ._frames import frame_of

_MAX_FRAMES = 4
# every column the contact layer reads or keeps on its per-ball tables (the base-out
# columns feed the data's own advancement and the tiered hits)
_FINGERPRINT_COLUMNS = (
    "game_id", "batter_id", "pitcher_id", "batter_hand", "pitcher_hand",
    "outcome", "exit_velo", "launch_angle", "season", "game_date", *BASE_OUT_COLUMNS,
)
_by_object: weakref.WeakKeyDictionary = weakref.WeakKeyDictionary()
_by_print: OrderedDict[str, dict] = OrderedDict()
_hits: Counter = Counter()
_misses: Counter = Counter()


def fingerprint(frame: pd.DataFrame) -> str:
    """Hash of the contact-relevant columns of ``frame`` (row order matters)."""
    cols = [c for c in _FINGERPRINT_COLUMNS if c in frame.columns]
    hashed = pd.util.hash_pandas_object(frame[cols], index=False).to_numpy()
    return hashlib.sha1(hashed.tobytes() + repr(cols).encode()).hexdigest()


def dataset_cache(pas: Any) -> dict:
    """The memory dict of a dataset (created empty on first use)."""
    if not isinstance(pas, pd.DataFrame):
        try:
            return _by_object.setdefault(pas, {})
        except TypeError:  # not weakly referenceable or not hashable: use the fingerprint
            pass
    key = fingerprint(frame_of(pas))
    store = _by_print.get(key)
    if store is None:
        store = _by_print[key] = {}
        while len(_by_print) > _MAX_FRAMES:
            _by_print.popitem(last=False)
    else:
        _by_print.move_to_end(key)
    return store


def remembered(pas: Any, key: tuple, make: Callable[[], Any], *, owners: tuple = ()) -> Any:
    """The value stored under ``key`` for dataset ``pas``, made by ``make()`` the first time.

    ``key[0]`` names the kind of table (it is what :func:`contact_cache_info` counts).
    ``owners`` are the objects the value was computed from (a fitted model, a tier scale);
    keys carry their ``id`` and a stored value is only reused while the very same objects
    are given, so an id reused after garbage collection cannot return a stale table.
    """
    cache = dataset_cache(pas)
    hit = cache.get(key)
    if hit is not None and len(hit[0]) == len(owners) and all(a is b for a, b in zip(hit[0], owners)):
        _hits[key[0]] += 1
        return hit[1]
    _misses[key[0]] += 1
    value = make()
    cache[key] = (owners, value)
    return value


def contact_cache_info() -> dict[str, dict[str, int]]:
    """How often each kind of per-dataset contact table was reused (hits) or computed (misses).

    Counts run from the start of the session or the last :func:`clear_contact_cache`.

    Examples
    --------
    >>> clear_contact_cache()
    >>> contact_cache_info()
    {'hits': {}, 'misses': {}}
    """
    return {"hits": dict(_hits), "misses": dict(_misses)}


def clear_contact_cache() -> None:
    """Forget every fitted contact model and stored prediction (and the reuse counts)."""
    _by_object.clear()
    _by_print.clear()
    _hits.clear()
    _misses.clear()

"""Per-dataset memory of fitted contact models and per-ball predictions (private).

A dashboard asks for the same dataset's contact model on every click; fitting takes
seconds, so results are kept per dataset. A loaded PlateAppearances object is recognised
by identity (through a weak reference, so the memory goes when the data does); a plain
DataFrame is recognised by a fingerprint of the columns the contact layer reads.
"""

from __future__ import annotations

import hashlib
import weakref
from collections import OrderedDict
from typing import Any

import pandas as pd

from ._frames import frame_of

_MAX_FRAMES = 4
_FINGERPRINT_COLUMNS = (
    "game_id", "batter_id", "pitcher_id", "batter_hand", "pitcher_hand",
    "outcome", "exit_velo", "launch_angle", "season", "game_date",
)
_by_object: weakref.WeakKeyDictionary = weakref.WeakKeyDictionary()
_by_print: OrderedDict[str, dict] = OrderedDict()


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


def clear_contact_cache() -> None:
    """Forget every fitted contact model and stored prediction."""
    _by_object.clear()
    _by_print.clear()

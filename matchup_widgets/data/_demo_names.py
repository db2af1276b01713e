"""Invented names for the demo league: players and teams built from syllables.

The syllables are chosen so that the names read as names but belong to nobody: two or
three syllables for a given name, three for a family name, with unusual joins.
"""

from __future__ import annotations

import numpy as np

_FIRST_A = ("Bra", "Cor", "Da", "El", "Fen", "Gal", "Ha", "Iv", "Jas", "Ko", "Lu", "Mar",
            "Nel", "Or", "Pel", "Quen", "Ros", "Sa", "Tam", "Ul", "Vel", "Wil", "Yar", "Zeb")
_FIRST_B = ("dro", "vin", "ric", "mon", "tav", "lio", "sen", "dek", "rin", "bas", "ton", "vek")
_LAST_A = ("Abe", "Bol", "Car", "Dun", "Este", "Fal", "Gor", "Hal", "Ing", "Jor", "Kel",
           "Lom", "Mav", "Nor", "Oss", "Pra", "Quil", "Rav", "Sten", "Tor", "Ub", "Var", "Wen", "Zol")
_LAST_B = ("ban", "den", "gar", "ka", "lin", "mor", "ne", "ri", "sto", "ven", "wy", "za")
_LAST_C = ("ski", "vard", "ley", "tano", "quist", "rell", "mont", "vik", "dorf", "ayo", "hurst", "ezar")

#: Invented places and nicknames for the teams (first ``n_teams`` are used).
TEAM_PLACES: tuple[str, ...] = (
    "Quillhaven", "Marrowick", "Tollbeck Falls", "Vestrand", "Orrinport", "Calloway Reach",
    "Dunmarsh", "Brightwater Flats", "Keldmoor", "Sallowfield", "Fennick Bay", "Harrowgate Mills",
    "Lumenvale", "Corrith", "Ambersea", "Wyndle Cross", "Pellory", "Thornhollow", "Galesmoor",
    "Ostrey Point", "Nimbrook", "Varrowby", "Cindral", "Hollin Rise",
)
TEAM_NICKNAMES: tuple[str, ...] = (
    "Lamplighters", "Herons", "Ferrymen", "Kestrels", "Millwrights", "Otters", "Comets",
    "Thistles", "Quarrymen", "Foxes", "Tidecallers", "Badgers", "Moths", "Stonecutters",
    "Gulls", "Wanderers", "Lanterns", "Harriers", "Weavers", "Beacons", "Salters", "Hollies",
    "Sparrowhawks", "Drovers",
)


def invent_names(n: int, rng: np.random.Generator) -> list[str]:
    """``n`` distinct invented full names ("Given Family"), drawn with ``rng``."""
    names: list[str] = []
    seen: set[str] = set()
    while len(names) < n:
        k = 2 * (n - len(names)) + 8
        a = rng.integers(0, len(_FIRST_A), k)
        b = rng.integers(0, len(_FIRST_B), k)
        c = rng.integers(0, len(_LAST_A), k)
        d = rng.integers(0, len(_LAST_B), k)
        e = rng.integers(0, len(_LAST_C), k)
        for i in range(k):
            name = f"{_FIRST_A[a[i]]}{_FIRST_B[b[i]]} {_LAST_A[c[i]]}{_LAST_B[d[i]]}{_LAST_C[e[i]]}"
            if name not in seen:
                seen.add(name)
                names.append(name)
                if len(names) == n:
                    break
    return names

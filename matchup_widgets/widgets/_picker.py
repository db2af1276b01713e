"""A searchable player picker: type part of a name, choose among the matches (ids shown)."""

from __future__ import annotations

from typing import Any

import ipywidgets as W
import pandas as pd

from ._common import guarded, StatusLine

_HAND_WORDS = {
    "batter": {"L": "bats L", "R": "bats R", "L/R": "switch"},
    "pitcher": {"L": "throws L", "R": "throws R", "L/R": "throws both"},
}


def player_options(rows: pd.DataFrame, *, role: str) -> list[tuple[str, str]]:
    """Dropdown options ``(label, player_id)`` for rows of ``search_players``; the id in the
    label tells namesakes apart.

    Examples
    --------
    >>> rows = pd.DataFrame({"player_id": ["b7"], "name": ["Ada Quill"], "hands": ["L/R"], "pa": [1234]})
    >>> player_options(rows, role="batter")
    [('Ada Quill (b7, switch, 1,234 PA)', 'b7')]
    """
    words = _HAND_WORDS[role]
    return [
        (f"{name} ({pid}, {words.get(str(hands), str(hands))}, {int(pa):,} PA)", str(pid))
        for pid, name, hands, pa in zip(rows["player_id"], rows["name"], rows["hands"], rows["pa"])
    ]


class PlayerPicker:
    """A search box and a dropdown of the players that match it, for one role.

    Parameters
    ----------
    pas : PlateAppearances
        Loaded plate appearances (searched with :func:`matchup_widgets.data.search_players`).
    role : {"batter", "pitcher"}
    status : StatusLine, optional
        Where to say that nothing matched.
    limit : int
        Matches listed at most.
    """

    def __init__(self, pas: Any, *, role: str, status: StatusLine | None = None, limit: int = 25) -> None:
        from matchup_widgets.data import search_players

        self._search_players = search_players
        self.pas = pas
        self.role = role
        self.limit = limit
        self.status = status
        title = role.capitalize()
        self.search = W.Text(
            value="",
            placeholder="type part of a name or an id",
            description=f"Find {role}",
            continuous_update=True,
            style={"description_width": "110px"},
            layout=W.Layout(width="336px"),
        )
        self.pick = W.Dropdown(
            options=self._options(""),
            description=title,
            style={"description_width": "110px"},
            layout=W.Layout(width="336px"),
        )
        self.search.add_class(f"mw-{role}-search")
        self.pick.add_class(f"mw-{role}-pick")
        # a failed search shows in the panel's status line (ipywidgets would log and drop it)
        on_search = self._on_search if status is None else guarded(status, f"Could not search {role}s")(self._on_search)
        self.search.observe(on_search, names="value")
        self.widget = W.VBox([self.search, self.pick])

    def _options(self, text: str) -> list[tuple[str, str]]:
        rows = self._search_players(self.pas, text, role=self.role, limit=self.limit)
        return player_options(rows, role=self.role)

    def _on_search(self, change: dict) -> None:
        text = str(change["new"])
        options = self._options(text)
        if not options:
            if self.status is not None:
                self.status.warn(f"No {self.role} matches {text!r}; keeping the current choice.")
            return
        current = self.pick.value
        ids = [v for _, v in options]
        if current in ids:
            # keep the choice: listed first, so replacing the options does not change the value
            options = [o for o in options if o[1] == current] + [o for o in options if o[1] != current]
        self.pick.options = options  # the first option becomes the value (one change at most)

    @property
    def value(self) -> str | None:
        """The chosen player's id."""
        return self.pick.value

    @value.setter
    def value(self, player_id: str) -> None:
        self.select(player_id)

    def select(self, query: str) -> str:
        """Choose a player by id or name (as :func:`matchup_widgets.data.resolve_player` does)."""
        from matchup_widgets.data import resolve_player

        player_id = resolve_player(self.pas, query, role=self.role)
        if player_id in [v for _, v in self.pick.options]:
            self.pick.value = player_id
        else:  # list it first: replacing the options then selects it in one change
            self.pick.options = self._options(player_id)[:1] + list(self.pick.options)
        return player_id

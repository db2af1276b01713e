"""Widgets: thin ipywidgets panels over the core and the chart builders."""

from ._common import Coalescer, LiveChart, StatusLine, enable_offline_charts, guarded, live_chart, set_chart
from ._explorer import DATA_ENV, MatchupExplorer
from ._picker import PlayerPicker, player_options

__all__ = [
    "Coalescer",
    "DATA_ENV",
    "LiveChart",
    "MatchupExplorer",
    "PlayerPicker",
    "StatusLine",
    "enable_offline_charts",
    "guarded",
    "live_chart",
    "player_options",
    "set_chart",
]

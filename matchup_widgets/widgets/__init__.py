"""Widgets: thin ipywidgets panels over the core and the chart builders."""

from matchup_widgets._paths import DATA_ENV

from .calibration import CalibrationLab
from .card import MatchupCardExport
from ._common import (
    Coalescer,
    LiveChart,
    StatusLine,
    enable_offline_charts,
    guarded,
    live_chart,
    load_data,
    set_chart,
)
from ._explorer import MatchupExplorer
from ._picker import PlayerPicker, player_options
from .lineup import LineupPanel
from .options import OptionRanking

__all__ = [
    "CalibrationLab",
    "Coalescer",
    "DATA_ENV",
    "LineupPanel",
    "LiveChart",
    "MatchupCardExport",
    "MatchupExplorer",
    "OptionRanking",
    "PlayerPicker",
    "StatusLine",
    "enable_offline_charts",
    "guarded",
    "live_chart",
    "load_data",
    "player_options",
    "set_chart",
]

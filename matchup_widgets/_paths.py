"""Where the dashboards find their data: one place for the environment variable and the default.

Kept free of heavy imports so the command line can use it while registering commands.
"""

from __future__ import annotations

import os
from pathlib import Path

#: Environment variable that carries the plate-appearance file to a served notebook.
DATA_ENV = "MATCHUP_WIDGETS_DATA"


def data_path(path: str | os.PathLike | None = None) -> Path:
    """Return ``path``, else the file named by ``$MATCHUP_WIDGETS_DATA``, else the demo league.

    Examples
    --------
    >>> str(data_path("games.parquet"))
    'games.parquet'
    """
    if path is None:
        path = os.environ.get(DATA_ENV) or None
    if path is None:
        from matchup_widgets.data.demo import demo_path

        return demo_path()
    return Path(path)

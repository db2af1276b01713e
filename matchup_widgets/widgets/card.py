"""Export the explorer's current matchup as a one-page card (HTML, PNG, SVG) or CSV tables.

The card is :func:`matchup_widgets.export.matchup_card` of the estimate on screen; this panel
only renders it on a click and offers the file as a download link.
"""

from __future__ import annotations

import base64
import html
import re
from typing import Any

import ipywidgets as W

from matchup_widgets.export import (
    CARD_FORMATS,
    card_tables,
    csv_links_html,
    matchup_card,
    render_card,
)

from ._common import Panel, StatusLine, guarded

_MIME = {"html": "text/html", "png": "image/png", "svg": "image/svg+xml"}


def _slug(text: str) -> str:
    return re.sub(r"[^a-z0-9]+", "_", text.lower()).strip("_") or "matchup"


class MatchupCardExport(Panel):
    """Buttons that turn the explorer's current matchup into a card or CSV files.

    Parameters
    ----------
    explorer : MatchupExplorer
        Any object with an ``estimate`` attribute (a MatchupEstimate or None).
    """

    def __init__(self, explorer: Any) -> None:
        self.explorer = explorer
        self.status = StatusLine()
        self.buttons = {fmt: W.Button(description=f"Card as {fmt.upper()}", layout=W.Layout(width="140px"))
                        for fmt in CARD_FORMATS}
        self.buttons["csv"] = W.Button(description="Numbers as CSV", layout=W.Layout(width="140px"))
        for fmt, button in self.buttons.items():
            button.add_class(f"mw-card-{fmt}")
            button.on_click(guarded(self.status, f"Could not export the {fmt.upper()}")(
                lambda _b, fmt=fmt: self.export(fmt)))
        self.link = W.HTML()
        self.link.add_class("mw-card-link")
        self.widget = W.VBox([W.HBox(list(self.buttons.values())), self.link, self.status.widget])
        self.widget.add_class("mw-card-export")

    def _estimate(self) -> Any:
        est = getattr(self.explorer, "estimate", None)
        if est is None:
            msg = "the explorer shows no matchup yet; pick a batter and a pitcher first."
            raise RuntimeError(msg)
        return est

    def render(self, fmt: str) -> bytes | str:
        """The current matchup's card in ``fmt`` (``html``, ``png`` or ``svg``)."""
        est = self._estimate()
        chart, tables = matchup_card(est)
        return render_card(chart, fmt, title=f"Matchup card: {est.batter_name} vs {est.pitcher_name}", tables=tables)

    def export(self, fmt: str) -> str:
        """Render ``fmt`` (or ``csv``) for the current matchup and show a download link; return the file name."""
        est = self._estimate()
        name = f"card_{_slug(est.batter_name)}_vs_{_slug(est.pitcher_name)}"
        self.status.clear()
        if fmt == "csv":
            # the card's numbers, and the tables behind each of the explorer's charts
            tables = card_tables(est)
            tables |= {f"explorer_{k}": v for k, v in (getattr(self.explorer, "tables", None) or {}).items()}
            self.link.value = csv_links_html(tables, prefix=f"{name}_")
            return name
        data = self.render(fmt)
        raw = data if isinstance(data, bytes) else data.encode("utf-8")
        encoded = base64.b64encode(raw).decode("ascii")
        fname = f"{name}.{fmt}"
        self.link.value = (
            f'<a download="{html.escape(fname)}" href="data:{_MIME[fmt]};base64,{encoded}">'
            f"Download {html.escape(fname)}</a> ({len(raw) / 1024:,.0f} KB)"
        )
        return fname

"""Helpers every panel shares: guarded callbacks with a status line, charts that update in
place, offline vega, and the searchable player picker.

Panels hold state and wire controls to the core and to :mod:`matchup_widgets.charts`;
nothing here computes a statistic.
"""

from __future__ import annotations

import html
import logging
import os
from collections.abc import Callable
from typing import Any

import altair as alt
import ipywidgets as W

from matchup_widgets.charts._theme import ERROR, INK, MUTED, WARNING

log = logging.getLogger("matchup_widgets.widgets")

_OFFLINE_READY = False


def enable_offline_charts() -> None:
    """Serve vega/vega-lite JavaScript from installed packages, never from a CDN (once per kernel)."""
    global _OFFLINE_READY
    if not _OFFLINE_READY:
        alt.JupyterChart.enable_offline()
        _OFFLINE_READY = True


def live_chart(chart: alt.TopLevelMixin) -> alt.JupyterChart:
    """Return a long-lived chart widget showing ``chart`` with vega loaded offline.

    Keep the widget and assign a new chart to ``.chart`` to update it in place; creating a
    widget per update would resend the JavaScript bundle and leak widgets.
    """
    enable_offline_charts()
    return alt.JupyterChart(chart, embed_options={"actions": False, "renderer": "svg"})


def set_chart(widget: alt.JupyterChart, chart: alt.TopLevelMixin) -> None:
    """Replace the chart shown by ``widget`` in place (no new output area, no flicker)."""
    widget.chart = chart


class LiveChart:
    """One long-lived chart widget that follows a table.

    The first table, and any table whose layout differs (other categories, sides or
    options), builds the chart with ``builder``; a table with the same layout only swaps
    the rows inside the finished spec, which skips rebuilding and re-validating the chart
    (the browser re-renders the same either way). An unchanged table does nothing.

    Parameters
    ----------
    builder : callable
        A chart builder from :mod:`matchup_widgets.charts` (``table, **options -> chart``).
    table : DataFrame
        The first table to show.
    css_class : str, optional
        Class on the widget, for pages and browser tests.
    **options
        Keyword options passed to ``builder`` every time.

    Attributes
    ----------
    widget : altair.JupyterChart
        The widget to place in a layout. ``widget.spec`` is what the browser renders.
    table : DataFrame
        The table last shown.
    n_builds, n_swaps : int
        How many updates rebuilt the chart and how many only swapped rows.

    Examples
    --------
    >>> import pandas as pd
    >>> from matchup_widgets.charts import tier_shares_chart
    >>> live = LiveChart(tier_shares_chart, pd.DataFrame({"side": ["matchup"], "tier": ["soft"], "share": [0.5]}))
    >>> live.update(pd.DataFrame({"side": ["matchup"], "tier": ["soft"], "share": [0.7]}))
    True
    >>> live.rows()[0]["share"], live.n_builds, live.n_swaps
    (0.7, 1, 1)
    """

    def __init__(self, builder: Callable[..., Any], table: Any, *, css_class: str | None = None, **options: Any) -> None:
        self.builder = builder
        self.options = options
        self.table = table
        self.n_builds = 0
        self.n_swaps = 0
        self._key: Any = None
        self.widget = live_chart(self._build(table, options))
        if css_class:
            self.widget.add_class(css_class)

    def _build(self, table: Any, options: dict[str, Any]) -> alt.TopLevelMixin:
        from matchup_widgets.charts import chart_rows

        prepared = chart_rows(self.builder, table)
        self._key = None if prepared is None else (prepared[1], tuple(sorted(options.items())))
        self.n_builds += 1
        return self.builder(table, **options)

    def update(self, table: Any, **options: Any) -> bool:
        """Show ``table`` (with ``options`` replacing the stored ones); return whether anything changed."""
        from matchup_widgets.charts import chart_rows

        options = {**self.options, **options}
        if options == self.options and table.equals(self.table):
            return False
        self.table, self.options = table, options
        prepared = chart_rows(self.builder, table)
        spec = self.widget.spec or {}
        datasets = spec.get("datasets", {})
        if prepared is not None and len(datasets) == 1 and (prepared[1], tuple(sorted(options.items()))) == self._key:
            (name,) = datasets
            self.widget.spec = {**spec, "datasets": {name: prepared[0]}}
            self.n_swaps += 1
        else:
            set_chart(self.widget, self._build(table, options))
        return True

    def rows(self) -> list[dict]:
        """The rows embedded in the spec the browser renders."""
        (values,) = (self.widget.spec or {}).get("datasets", {"": []}).values()
        return values


class StatusLine:
    """A one-line message area of a panel: quiet when all is well, readable when not.

    Examples
    --------
    >>> s = StatusLine()
    >>> s.error("could not blend", ValueError("pitcher weight must be <= 1"))
    >>> "pitcher weight must be &lt;= 1" in s.widget.value
    True
    >>> s.clear(); s.widget.value
    ''
    """

    def __init__(self) -> None:
        self.widget = W.HTML(value="", layout=W.Layout(min_height="1.6em"))
        self.widget.add_class("mw-status")
        self.last_error: BaseException | None = None

    def clear(self) -> None:
        self.widget.value = ""
        self.last_error = None

    def note(self, text: str) -> None:
        self.widget.value = f'<div style="color:{MUTED}">{html.escape(text)}</div>'

    def warn(self, text: str) -> None:
        self.widget.value = f'<div style="color:{WARNING}">{html.escape(text)}</div>'

    def error(self, what: str, exc: BaseException) -> None:
        self.last_error = exc
        kind = type(exc).__name__
        self.widget.value = (
            f'<div role="alert" style="color:{ERROR};border-left:3px solid {ERROR};padding:2px 8px">'
            f"<b>{html.escape(what)}</b>: {html.escape(str(exc))} "
            f'<span style="color:{MUTED}">({html.escape(kind)}; the controls still work: change a setting to try again)</span>'
            "</div>"
        )


def guarded(status: StatusLine, what: str) -> Callable[[Callable[..., Any]], Callable[..., Any]]:
    """Wrap a widget callback so an exception is logged and shown in ``status``, never swallowed.

    ipywidgets logs and drops exceptions raised in callbacks; this wrapper makes them visible
    in the panel and keeps the controls usable.

    Examples
    --------
    >>> s = StatusLine()
    >>> @guarded(s, "Update failed")
    ... def boom(change=None):
    ...     raise ValueError("no such batter")
    >>> boom()
    >>> "no such batter" in s.widget.value
    True
    """

    def wrap(func: Callable[..., Any]) -> Callable[..., Any]:
        def run(*args: Any, **kwargs: Any) -> Any:
            try:
                return func(*args, **kwargs)
            except Exception as exc:
                log.exception("%s", what)
                status.error(what, exc)
                return None

        run.__name__ = getattr(func, "__name__", "callback")
        run.__doc__ = func.__doc__
        return run

    return wrap


class Coalescer:
    """Run a refresh once per burst of changes and never re-entrantly.

    A change that arrives while a refresh runs (for example a dropdown whose options were
    just replaced fires its own change) marks the work dirty; the running refresh then goes
    round once more with the latest values instead of stacking a second call.

    Examples
    --------
    >>> calls = []
    >>> c = Coalescer(lambda: calls.append(len(calls)))
    >>> c.request(); c.request(); calls
    [0, 1]
    >>> with c.paused():
    ...     c.request(); c.request()
    >>> calls
    [0, 1, 2]
    """

    def __init__(self, refresh: Callable[[], None]) -> None:
        self._refresh = refresh
        self._running = False
        self._dirty = False
        self._paused = 0

    def request(self, change: Any = None) -> None:
        if self._running or self._paused:
            self._dirty = True
            return
        self._running = True
        try:
            self._dirty = True
            rounds = 0
            while self._dirty and rounds < 3:
                self._dirty = False
                rounds += 1
                self._refresh()
        finally:
            self._running = False
            self._dirty = False

    def paused(self) -> _Pause:
        """Context manager: hold refreshes while several controls change, then run once."""
        return _Pause(self)


class _Pause:
    def __init__(self, owner: Coalescer) -> None:
        self.owner = owner

    def __enter__(self) -> Coalescer:
        self.owner._paused += 1
        return self.owner

    def __exit__(self, *exc: object) -> None:
        self.owner._paused -= 1
        if not self.owner._paused and self.owner._dirty and not self.owner._running:
            self.owner._dirty = False
            self.owner.request()


def section(title: str, *children: W.Widget, note: str | None = None) -> W.VBox:
    """A titled block of a panel."""
    head = f'<div style="font-weight:600;color:{INK};font-size:14px;margin:10px 0 2px">{html.escape(title)}</div>'
    if note:
        head += f'<div style="color:{MUTED};font-size:12px">{html.escape(note)}</div>'
    return W.VBox([W.HTML(head), *children])


def label_style() -> dict[str, str]:
    """Wide enough description column for the words on our controls."""
    return {"description_width": "110px"}


def load_data(path: str | os.PathLike | None = None) -> Any:
    """Load plate appearances for a panel: ``path``, else ``$MATCHUP_WIDGETS_DATA``, else the demo league."""
    from matchup_widgets._paths import data_path
    from matchup_widgets.data import load_pas

    return load_pas(data_path(path))


class Panel:
    """What every panel shares: a root ``widget`` to display inline or with :meth:`show`."""

    widget: Any

    def show(self) -> None:
        """Display the panel."""
        from IPython.display import display

        display(self.widget)

    def _repr_mimebundle_(self, **kwargs: Any) -> Any:
        return self.widget._repr_mimebundle_(**kwargs)


class DataPanel(Panel):
    """A panel built on loaded plate appearances (its constructor's first argument)."""

    @classmethod
    def from_path(cls, path: str | os.PathLike | None = None, **kwargs: Any) -> Any:
        """Load ``path``, else ``$MATCHUP_WIDGETS_DATA``, else the demo league; build the panel.

        Keyword arguments go to the panel's constructor.
        """
        return cls(load_data(path), **kwargs)

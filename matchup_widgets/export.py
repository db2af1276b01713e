"""Exports for presenting: the one-page matchup card (HTML, PNG, SVG) and CSV tables.

Presentation only: the card's numbers come from the model's estimate, its picture from
:func:`matchup_widgets.charts._card.matchup_card_chart`, and the files are written with
vl-convert, offline (the HTML page carries the vega JavaScript inline, never from a CDN).
"""

from __future__ import annotations

import base64
import functools
import html
from collections.abc import Mapping
from pathlib import Path
from typing import Any
import altair as alt
import pandas as pd

from matchup_widgets.charts._theme import CAUTION
from matchup_widgets.data._files import write_bytes_atomic, write_text_atomic

#: File formats a card can be written in, chosen by the file's suffix.
CARD_FORMATS: tuple[str, ...] = ("html", "png", "svg")

#: Printed at the foot of every card: the project's one caution text.
CARD_CAUTION = CAUTION


def card_format(path: str | Path) -> str:
    """Return the card format named by ``path``'s suffix.

    Examples
    --------
    >>> card_format("cards/today.PNG")
    'png'
    >>> card_format("card.pdf")
    Traceback (most recent call last):
    ...
    ValueError: card file 'card.pdf' has suffix '.pdf'; use one of .html, .png, .svg.
    """
    suffix = Path(path).suffix.lower().lstrip(".")
    if suffix not in CARD_FORMATS:
        shown = "." + suffix if suffix else "no suffix"
        choices = ", ".join("." + f for f in CARD_FORMATS)
        msg = f"card file '{path}' has suffix '{shown}'; use one of {choices}."
        raise ValueError(msg.replace("suffix 'no suffix'", "no suffix"))
    return suffix


@functools.lru_cache(maxsize=1)
def _vega_bundle() -> str:
    """The vega, vega-lite and vega-embed JavaScript, bundled once per process (~1 MB)."""
    import vl_convert as vlc

    return vlc.javascript_bundle()


def _table_html(name: str, table: pd.DataFrame) -> str:
    body = table.to_html(index=False, border=0, float_format=lambda v: f"{v:.4g}", classes="numbers")
    return f"<h3>{html.escape(name.replace('_', ' ').capitalize())}</h3>\n{body}"


def card_html(chart: alt.TopLevelMixin, *, title: str, tables: Mapping[str, pd.DataFrame] | None = None) -> str:
    """Return a self-contained HTML page showing ``chart`` and the numbers behind it.

    The vega JavaScript is inlined, so the page opens with no internet connection.

    Parameters
    ----------
    chart : altair chart
        The card.
    title : str
        The page title.
    tables : mapping of str to DataFrame, optional
        Tables printed under the card (the numbers behind it).

    Returns
    -------
    str
        The HTML document.

    Examples
    --------
    >>> c = alt.Chart(pd.DataFrame({"a": [1]})).mark_bar().encode(x="a:Q")
    >>> page = card_html(c, title="Card", tables={"numbers": pd.DataFrame({"a": [1]})})
    >>> "vegaEmbed" in page, "<h3>Numbers</h3>" in page, "cdn." in page
    (True, True, False)
    """
    spec = chart.to_json(indent=None)
    spec = spec.replace("</", "<\\/")  # keep the JSON from closing the script element
    numbers = "\n".join(_table_html(k, v) for k, v in (tables or {}).items())
    return f"""<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<title>{html.escape(title)}</title>
<style>
body {{ font-family: sans-serif; color: #252b36; margin: 24px; }}
table.numbers {{ border-collapse: collapse; font-size: 13px; margin-bottom: 16px; }}
table.numbers th, table.numbers td {{ padding: 2px 10px; text-align: right; border-bottom: 1px solid #ebe8df; }}
h3 {{ font-size: 14px; margin: 18px 0 4px; }}
</style>
<script>{_vega_bundle()}</script>
</head>
<body>
<div id="card"></div>
<script>vegaEmbed("#card", {spec}, {{"renderer": "svg", "actions": false}}).catch(console.error);</script>
<details open><summary>Numbers behind the card</summary>
{numbers}
</details>
</body>
</html>
"""


def render_card(
    chart: alt.TopLevelMixin,
    fmt: str,
    *,
    title: str = "Matchup card",
    tables: Mapping[str, pd.DataFrame] | None = None,
    ppi: float = 144,
) -> bytes | str:
    """Render the card as ``"html"`` (str), ``"svg"`` (str) or ``"png"`` (bytes), offline.

    Examples
    --------
    >>> c = alt.Chart(pd.DataFrame({"a": [1]})).mark_bar().encode(x="a:Q")
    >>> render_card(c, "png", ppi=72)[:8] == b"\\x89PNG\\r\\n\\x1a\\n"
    True
    """
    import vl_convert as vlc

    if fmt == "html":
        return card_html(chart, title=title, tables=tables)
    if fmt == "svg":
        return vlc.vegalite_to_svg(chart.to_dict())
    if fmt == "png":
        return vlc.vegalite_to_png(chart.to_dict(), ppi=ppi)
    choices = ", ".join(CARD_FORMATS)
    msg = f"fmt must be one of {choices}; got {fmt!r}."
    raise ValueError(msg)


def write_card(
    chart: alt.TopLevelMixin,
    path: str | Path,
    *,
    title: str = "Matchup card",
    tables: Mapping[str, pd.DataFrame] | None = None,
) -> Path:
    """Write the card to ``path`` in the format its suffix names (.html, .png, .svg).

    Returns
    -------
    Path
        The file written.

    Examples
    --------
    >>> import tempfile
    >>> c = alt.Chart(pd.DataFrame({"a": [1]})).mark_bar().encode(x="a:Q")
    >>> with tempfile.TemporaryDirectory() as d:
    ...     write_card(c, Path(d) / "card.svg").read_text()[:4]
    '<svg'
    """
    out = Path(path)
    fmt = card_format(out)
    rendered = render_card(chart, fmt, title=title, tables=tables)
    # a failed or interrupted write leaves the previous card (or none), never half of one
    if isinstance(rendered, bytes):
        write_bytes_atomic(out, rendered)
    else:
        write_text_atomic(out, rendered)
    return out


def write_tables(tables: Mapping[str, pd.DataFrame], folder: str | Path, *, prefix: str = "") -> list[Path]:
    """Write each table to ``folder/<prefix><name>.csv``; return the paths.

    Examples
    --------
    >>> import tempfile
    >>> with tempfile.TemporaryDirectory() as d:
    ...     [p.name for p in write_tables({"runs": pd.DataFrame({"a": [1]})}, d, prefix="lineup_")]
    ['lineup_runs.csv']
    """
    root = Path(folder)
    root.mkdir(parents=True, exist_ok=True)
    paths = []
    for name, table in tables.items():
        path = root / f"{prefix}{name}.csv"
        write_text_atomic(path, table.to_csv(index=False))
        paths.append(path)
    return paths


def csv_links_html(tables: Mapping[str, pd.DataFrame], *, prefix: str = "") -> str:
    """HTML links that download each table as CSV (data URLs: no server round trip).

    Examples
    --------
    >>> 'download="x_t.csv"' in csv_links_html({"t": pd.DataFrame({"a": [1]})}, prefix="x_")
    True
    """
    links = []
    for name, table in tables.items():
        data = base64.b64encode(table.to_csv(index=False).encode("utf-8")).decode("ascii")
        fname = html.escape(f"{prefix}{name}.csv")
        links.append(
            f'<a download="{fname}" href="data:text/csv;base64,{data}" '
            f'style="margin-right:1em">{html.escape(name.replace("_", " "))} (CSV)</a>'
        )
    return "<div>Numbers behind the charts: " + " ".join(links) + "</div>"



def _settings_line(s: Mapping[str, Any]) -> str:
    """The model settings in words, with the weights the chosen method uses."""
    method = s.get("method", "linear")
    if method == "two-stage":
        first = s.get("first_weight") if s.get("first_weight") is not None else s.get("pitcher_weight")
        in_play = s.get("in_play_weight") if s.get("in_play_weight") is not None else s.get("pitcher_weight")
        weights = f"pitcher weights {first:g} (strikeout, walk, home run) and {in_play:g} (in play)"
    elif method == "odds-ratio":
        weights = f"exponents batter {s.get('batter_exponent', 1.0):g}, pitcher {s.get('pitcher_exponent', 1.0):g}"
    else:
        weights = f"pitcher weight {s.get('pitcher_weight', 0.5):.2f}"
    seasons = s.get("seasons")
    seasons_text = "all seasons" if not seasons else f"seasons {seasons[0]}-{seasons[1]}"
    return (
        f"Settings: {method} blend, {weights}; priors batter {s.get('batter_prior_pa', 0):g} PA, "
        f"pitcher {s.get('pitcher_prior_pa', 0):g} PA; {s.get('basis', 'observed')} basis; {seasons_text}"
    )


#: A side with fewer plate appearances than this in the split gets a plain sample-size note.
#: Our display rule, not a statistic: below it the league prior carries much of the estimate.
SMALL_SAMPLE_PA = 150


def sample_notes(estimate: Any, *, small: int = SMALL_SAMPLE_PA) -> list[str]:
    """Plain sentences for sides with few plate appearances in the split."""
    notes = []
    for role, name in (("batter", estimate.batter_name), ("pitcher", estimate.pitcher_name)):
        n = float(estimate.pa[role])
        if n < small:
            prior = float(estimate.settings.get(f"{role}_prior_pa", 0.0))
            notes.append(
                f"Small sample: {name} has only {n:,.0f} PA in the {estimate.split} split, so the "
                f"league average (prior of {prior:,.0f} PA) carries much of the {role}'s side."
            )
    return notes


def card_tables(estimate: Any) -> dict[str, pd.DataFrame]:
    """The numbers behind a matchup card (also its CSV export).

    Parameters
    ----------
    estimate : MatchupEstimate
        From :meth:`matchup_widgets.model.MatchupModel.predict`.

    Returns
    -------
    dict of str to DataFrame
        ``outcomes`` (code, label, matchup probability, interval ends, league), ``summary``
        (rates, wOBA and runs per PA of matchup, batter, pitcher, league) and ``facts``
        (one row: players, split, PA counts, interval level and every setting).

    Examples
    --------
    >>> import pandas as pd
    >>> from matchup_widgets.data import load_pas
    >>> from matchup_widgets.model import MatchupModel
    >>> df = pd.DataFrame({
    ...     "game_id": ["g1"] * 6, "game_date": ["2031-04-02"] * 6,
    ...     "batter_id": ["b1"] * 3 + ["b2"] * 3, "pitcher_id": ["p1"] * 6,
    ...     "batter_name": ["Ada Quill"] * 3 + ["Bo Reed"] * 3, "pitcher_name": ["Cy Moss"] * 6,
    ...     "batter_hand": ["L"] * 3 + ["R"] * 3, "pitcher_hand": ["R"] * 6,
    ...     "outcome": ["K", "1B", "HR", "BB", "GB_OUT", "AIR_OUT"]})
    >>> est = MatchupModel(n_draws=200).fit(load_pas(df)).predict("b1", "p1")
    >>> t = card_tables(est)
    >>> sorted(t), float(t["facts"].loc[0, "batter_pa"]), t["outcomes"]["outcome"].iloc[0]
    (['facts', 'outcomes', 'summary'], 3.0, 'K')
    """
    from matchup_widgets.data import OUTCOME_LABELS, OUTCOMES

    codes = list(OUTCOMES)
    outcomes = pd.DataFrame(
        {
            "outcome": codes,
            "label": [OUTCOME_LABELS[c] for c in codes],
            "matchup": estimate.probabilities[codes].to_numpy(dtype=float),
            "interval_low": estimate.intervals.loc[codes, "lo"].to_numpy(dtype=float),
            "interval_high": estimate.intervals.loc[codes, "hi"].to_numpy(dtype=float),
            "league": estimate.distributions.loc["league", codes].to_numpy(dtype=float),
        }
    )
    summary = estimate.summary.rename_axis("row").reset_index()
    s = dict(estimate.settings)
    facts = {
        "batter_id": estimate.batter_id,
        "batter": estimate.batter_name,
        "batter_hand": estimate.batter_hand,
        "pitcher_id": estimate.pitcher_id,
        "pitcher": estimate.pitcher_name,
        "pitcher_hand": estimate.pitcher_hand,
        "split": estimate.split,
        "batter_pa": float(estimate.pa["batter"]),
        "pitcher_pa": float(estimate.pa["pitcher"]),
        "effective_pa": float(estimate.effective_pa),
    }
    facts |= {k: (str(v) if isinstance(v, (list, tuple)) else v) for k, v in s.items()}
    return {"outcomes": outcomes, "summary": summary, "facts": pd.DataFrame([facts])}


def matchup_card(estimate: Any, *, width: int = 640) -> tuple[alt.TopLevelMixin, dict[str, pd.DataFrame]]:
    """The card for one matchup estimate, and the tables behind it.

    The card states the batter, the pitcher, the platoon split, every setting, the plate
    appearances behind each side, each probability with its interval, wOBA and runs per
    PA against the league, and the caution line.

    Parameters
    ----------
    estimate : MatchupEstimate
    width : int
        Card width in pixels.

    Returns
    -------
    chart : altair chart
    tables : dict of str to DataFrame
        As :func:`card_tables`.
    """
    from matchup_widgets.charts._card import matchup_card_chart

    tables = card_tables(estimate)
    out = tables["outcomes"]
    s = dict(estimate.settings)
    level = float(s.get("interval", 0.8))
    long = pd.concat(
        [
            pd.DataFrame({"outcome": out["outcome"], "side": "matchup", "probability": out["matchup"],
                          "low": out["interval_low"], "high": out["interval_high"]}),
            pd.DataFrame({"outcome": out["outcome"], "side": "league", "probability": out["league"]}),
        ],
        ignore_index=True,
    )
    lg = estimate.summary.loc["league"]
    switch = " (switch hitter)" if estimate.switch_hitter else ""
    lines = [
        f"Plate appearances in this split: batter {estimate.pa['batter']:,.0f}, pitcher {estimate.pa['pitcher']:,.0f} "
        f"(the estimate is as precise as {estimate.effective_pa:,.0f} PA of one sample)",
        _settings_line(s),
        f"wOBA {estimate.woba:.3f} (league {float(lg['woba']):.3f}); runs per PA {estimate.runs_per_pa:+.4f} "
        "against the league-average PA of the split",
    ]
    numbers = [
        f"{label}: {p:.1%} ({level:.0%} interval {lo:.1%} to {hi:.1%}; league {g:.1%})"
        for label, p, lo, hi, g in zip(out["label"], out["matchup"], out["interval_low"], out["interval_high"],
                                       out["league"])
    ]
    chart = matchup_card_chart(
        long,
        title=f"{estimate.batter_name} vs {estimate.pitcher_name}",
        subtitle=(
            f"Platoon split {estimate.split}: batter bats {estimate.batter_hand}{switch}, "
            f"pitcher throws {estimate.pitcher_hand}"
        ),
        lines=lines,
        notes=sample_notes(estimate),  # the explorer's small-sample warning goes on the card too
        numbers=numbers,
        caution=CARD_CAUTION,
        width=width,
    )
    return chart, tables


def write_matchup_card(estimate: Any, path: str | Path) -> Path:
    """Write the card of ``estimate`` to ``path`` (.html, .png or .svg); return the path."""
    card_format(path)  # a bad suffix fails before any rendering
    chart, tables = matchup_card(estimate)
    title = f"Matchup card: {estimate.batter_name} vs {estimate.pitcher_name}"
    return write_card(chart, path, title=title, tables=tables)

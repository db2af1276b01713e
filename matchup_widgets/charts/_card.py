"""The one-page matchup card as a single chart: title, facts, outcome bars, numbers, caution.

Everything the card says is written into the chart itself, so the PNG and SVG exports carry
the settings, sample sizes and intervals, not only the HTML page.
"""

from __future__ import annotations

import textwrap
from collections.abc import Sequence

import altair as alt
import pandas as pd

from ._matchup import outcome_bars_chart
from ._tables import require_columns
from ._theme import FONT, INK, MUTED, WARNING, style

_LINE_PX = 18
#: Average width of a character of 12 px sans-serif text, to wrap lines at the card's width.
_CHAR_PX = 6.6


def _wrap(lines: Sequence[str], chars: int) -> list[str]:
    """Break each line at spaces into pieces of at most ``chars`` characters.

    Examples
    --------
    >>> _wrap(["one two three", "four"], 8)
    ['one two', 'three', 'four']
    """
    return [piece for line in lines for piece in (textwrap.wrap(line, chars) or [""])]


def _text_block(lines: Sequence[str], *, width: int, color: str = INK, size: int = 12, bold: bool = False) -> alt.Chart:
    """A block of left-aligned text lines, one per row, placed in pixels."""
    rows = pd.DataFrame({"line": list(lines), "y": [i * _LINE_PX for i in range(len(lines))]})
    return (
        alt.Chart(rows)
        .mark_text(align="left", baseline="top", color=color, fontSize=size, fontWeight="bold" if bold else "normal",
                   font=FONT)
        .encode(x=alt.value(0), y=alt.Y("y:Q", scale=None, axis=None), text="line:N")
        .properties(width=width, height=max(_LINE_PX, _LINE_PX * len(lines)))
    )


def matchup_card_chart(
    outcomes: pd.DataFrame,
    *,
    title: str,
    subtitle: str = "",
    lines: Sequence[str] = (),
    notes: Sequence[str] = (),
    numbers: Sequence[str] = (),
    caution: str,
    width: int = 640,
) -> alt.VConcatChart:
    """Assemble the one-page matchup card.

    Parameters
    ----------
    outcomes : DataFrame
        Long-form outcome shares as :func:`outcome_bars_chart` takes them: ``outcome``,
        ``side``, ``probability`` and optionally ``low``/``high`` (interval ends).
    title, subtitle : str
        The matchup ("batter vs pitcher") and the platoon split.
    lines : sequence of str
        Facts under the title: settings, plate-appearance counts, wOBA and runs.
    notes : sequence of str
        Warnings printed in the warning colour under the facts (e.g. a small sample).
    numbers : sequence of str
        The probabilities with their intervals, one outcome per line.
    caution : str
        The caution line printed at the foot of the card.
    width : int
        Card width in pixels.

    Returns
    -------
    alt.VConcatChart
        Styled with the project theme; render it with vl-convert for PNG or SVG.

    Examples
    --------
    >>> t = pd.DataFrame({"outcome": ["K"], "side": ["matchup"], "probability": [0.2]})
    >>> spec = matchup_card_chart(t, title="A vs B", lines=["Settings: linear"],
    ...                           caution="Estimates, not certainties.").to_dict()
    >>> len(spec["vconcat"]), spec["title"]["text"]
    (3, 'A vs B')
    """
    require_columns(outcomes, ["outcome", "side", "probability"], where="matchup_card_chart")
    bars = outcome_bars_chart(outcomes, width=width - 60, height=200, title="Outcome shares per plate appearance")
    bars = bars.copy()
    bars.config = alt.Undefined  # the card is styled once, at the top
    # long facts wrap at the card's width instead of stretching the card to twice its size
    chars = max(40, int(width / _CHAR_PX))
    parts: list[alt.TopLevelMixin] = [_text_block(_wrap(lines, chars), width=width)]
    if notes:
        parts.append(_text_block(_wrap(notes, chars), width=width, color=WARNING))
    parts.append(bars)
    if numbers:
        half = (len(numbers) + 1) // 2
        parts.append(
            alt.hconcat(
                _text_block(numbers[:half], width=width // 2 - 10, size=11),
                _text_block(numbers[half:], width=width // 2 - 10, size=11),
                spacing=10,
            )
        )
    parts.append(_text_block([caution], width=width, color=WARNING, size=11))
    # independent legend: it sits under the bars, not at the foot of the card
    card = alt.vconcat(*parts, spacing=14).resolve_legend(color="independent").properties(
        title=alt.Title(title, subtitle=subtitle, fontSize=18, subtitleFontSize=13, subtitleColor=MUTED, anchor="start"),
        padding=24,
    )
    return style(card)

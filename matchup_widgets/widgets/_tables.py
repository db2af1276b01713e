"""Reshape core results into the small long tables the chart builders take, and the
headline HTML. Pure reshaping and formatting: every number comes from the core."""

from __future__ import annotations

import html
from typing import Any

import numpy as np
import pandas as pd

from matchup_widgets.charts._theme import CAUTION, INK, MUTED, SIDE_COLORS, WARNING, side_label
from matchup_widgets.data import OUTCOMES
from matchup_widgets.export import SMALL_SAMPLE_PA, sample_notes  # noqa: F401 - shared with the card


_SIDES = ("batter", "pitcher", "league", "matchup")
_HEAD_ORDER = ("matchup", "batter", "pitcher", "league")


def caution_html() -> str:
    """The project's caution (``charts._theme.CAUTION``) as a small plain line for a panel's foot.

    Examples
    --------
    >>> "not betting advice" in caution_html()
    True
    """
    return (
        f'<div class="mw-caution" style="color:{MUTED};font-size:11px;margin-top:6px">'
        f"{html.escape(CAUTION)}</div>"
    )


def outcome_table(estimate: Any) -> pd.DataFrame:
    """Long table ``outcome, side, probability, low, high`` of an estimate.

    Batter and pitcher rows are the shrunk distributions the blend used. Every side carries
    its central interval: batter, pitcher and league from ``estimate.side_intervals``, the
    matchup from ``estimate.intervals``.
    """
    codes = list(OUTCOMES)
    probs = estimate.distributions.loc[list(_SIDES), codes].to_numpy(dtype=float)
    low = np.full(probs.shape, np.nan)
    high = np.full(probs.shape, np.nan)
    sides = getattr(estimate, "side_intervals", None)
    if sides is not None:
        # rows are labelled (side, "lo"/"hi"): select by label, so another row order cannot
        # hang one side's whiskers on another side's bars
        for i, side in enumerate(_SIDES[:-1]):
            low[i] = sides.loc[(side, "lo"), codes].to_numpy(dtype=float)
            high[i] = sides.loc[(side, "hi"), codes].to_numpy(dtype=float)
    low[-1] = estimate.intervals.loc[codes, "lo"].to_numpy(dtype=float)
    high[-1] = estimate.intervals.loc[codes, "hi"].to_numpy(dtype=float)
    return pd.DataFrame(
        {
            "outcome": codes * len(_SIDES),
            "side": np.repeat(_SIDES, len(codes)),
            "probability": probs.ravel(),
            "low": low.ravel(),
            "high": high.ravel(),
        }
    )


def heatmap_table(buckets: pd.DataFrame, *, batter_id: str, pitcher_id: str, batter_hand: str, pitcher_hand: str) -> pd.DataFrame:
    """Pick the batter's and pitcher's rows of the split from per-role bucket tables.

    ``buckets`` maps role -> :func:`matchup_widgets.contact.bucket_shares` output.
    """
    parts = []
    for side, pid in (("batter", batter_id), ("pitcher", pitcher_id)):
        t = buckets[side]
        rows = t[(t["player_id"] == pid) & (t["batter_hand"] == batter_hand) & (t["pitcher_hand"] == pitcher_hand)]
        parts.append(
            pd.DataFrame(
                {
                    "side": side,
                    "exit_velo_bin": rows["exit_velo_bin"].astype(str).to_numpy(),
                    "launch_angle_bin": rows["launch_angle_bin"].astype(str).to_numpy(),
                    "share": rows["share"].to_numpy(dtype=float),
                    "n": rows["n"].to_numpy(dtype=float),
                }
            )
        )
    return pd.concat(parts, ignore_index=True)


def tier_table(sides: pd.DataFrame, mix: pd.Series) -> pd.DataFrame:
    """Long ``side, tier, share`` from the contact layer's side table and a matchup mix."""
    known = sides[sides["side"] != "matchup"]
    labels = dict(zip(known["category"], known["label"]))
    out = known[["side", "label", "share"]].rename(columns={"label": "tier"})
    matchup = pd.DataFrame({"side": "matchup", "tier": [labels.get(c, str(c)) for c in mix.index], "share": mix.to_numpy(dtype=float)})
    out = pd.concat([out, matchup], ignore_index=True)
    out["share"] = out["share"].astype(float)
    return out


def run_table(situation: dict[str, Any]) -> pd.DataFrame:
    """Rows ``matchup`` and ``league_hitter`` from :func:`matchup_widgets.runs.situation`."""
    return pd.DataFrame(
        {
            "side": ["matchup", "league_hitter"],
            "expected_runs": [situation["expected_runs"], situation["league_expected_runs"]],
            "scoring_chance": [situation["p_score"], situation["league_p_score"]],
        }
    )


def _pct(x: float) -> str:
    return "–" if not np.isfinite(x) else f"{100 * x:.1f}%"


def _woba(x: float) -> str:
    return "–" if not np.isfinite(x) else f"{x:.3f}".lstrip("0") if x < 1 else f"{x:.3f}"


def _runs(x: float) -> str:
    """Signed runs to 3 decimals; a rounding-level difference reads +0.000, never -0.000.

    >>> _runs(-1e-17), _runs(-0.0123)
    ('+0.000', '-0.012')
    """
    return "–" if not np.isfinite(x) else f"{round(x, 3) + 0.0:+.3f}"


_ROWS = (
    ("Strikeout rate (K%)", "k_rate", _pct),
    ("Walk rate (BB%)", "bb_rate", _pct),
    ("Home-run rate (HR%)", "hr_rate", _pct),
    ("wOBA", "woba", _woba),
    ("Runs per PA vs league average", "runs_per_pa", _runs),
)


def headline_html(estimate: Any) -> str:
    """The headline figures as a small HTML table: PA behind each side and the key rates."""
    s = estimate.summary
    counts = estimate.counts
    head = "".join(
        f'<th style="text-align:right;padding:2px 10px;border-bottom:3px solid {SIDE_COLORS[side]}">'
        f"{html.escape(side_label(side))}</th>"
        for side in _HEAD_ORDER
    )
    pa_cells = "".join(
        f'<td style="text-align:right;padding:2px 10px">{v}</td>'
        for v in (
            f"≈{estimate.effective_pa:,.0f}",
            f"{estimate.pa['batter']:,.0f}",
            f"{estimate.pa['pitcher']:,.0f}",
            f"{counts.loc['league', 'pa']:,.0f}",
        )
    )
    body = [f'<tr><td style="color:{MUTED}">Plate appearances behind it</td>{pa_cells}</tr>']
    for label, col, fmt in _ROWS:
        cells = "".join(
            f'<td style="text-align:right;padding:2px 10px{";font-weight:700" if side == "matchup" else ""}">'
            f"{fmt(float(s.loc[side, col]))}</td>"
            for side in _HEAD_ORDER
        )
        body.append(f"<tr><td>{html.escape(label)}</td>{cells}</tr>")
    hand = {"L": "left", "R": "right"}
    switch = " (switch hitter)" if estimate.switch_hitter else ""
    split = (
        f"{html.escape(estimate.batter_name)} ({html.escape(estimate.batter_id)}) batting "
        f"{hand[estimate.batter_hand]}-handed{switch} against {html.escape(estimate.pitcher_name)} "
        f"({html.escape(estimate.pitcher_id)}), a {hand[estimate.pitcher_hand]}-hander: split {html.escape(estimate.split)}"
    )
    notes = "".join(
        f'<div class="mw-sample-note" style="color:{WARNING};margin-top:4px">{html.escape(n)}</div>'
        for n in sample_notes(estimate)
    )
    return (
        f'<div class="mw-headline-box" style="color:{INK};font-size:13px">'
        f'<div style="font-size:15px;font-weight:600;margin-bottom:4px">{split}</div>'
        f'<table style="border-collapse:collapse"><thead><tr><th></th>{head}</tr></thead>'
        f"<tbody>{''.join(body)}</tbody></table>"
        f'<div style="color:{MUTED};font-size:12px;margin-top:4px">Matchup PA: a single sample as precise as the blended estimate. '
        f"Batter and pitcher columns are after pulling each toward the league of the same split.</div>"
        f"{notes}</div>"
    )

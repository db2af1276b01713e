"""The matchup card: all three formats, the words on it, and the `card` command."""

from __future__ import annotations

import json
import re
import struct
from pathlib import Path

import numpy as np
import pytest

from matchup_widgets.cli import main
from matchup_widgets.data import OUTCOMES, load_pas
from matchup_widgets.export import CARD_CAUTION, card_tables, matchup_card, write_matchup_card
from matchup_widgets.model import MatchupModel


@pytest.fixture(scope="module")
def data_file(tilted_league, tmp_path_factory) -> Path:
    path = tmp_path_factory.mktemp("card") / "pas.parquet"
    tilted_league(
        seed=11, n_pa=5000, n_batters=6, n_pitchers=3, batter_sd=0.3, games_per_day=3,
        batter_names=["Orrin Vale", "Tem Hollis", "Gus Marrow", "Lio Penn", "Abe Sorrel", "Kip Dune"],
        pitcher_names=["Wade Fenner", "Cole Brask", "Rudy Omberlane"], left_batter=lambda i: i % 2 == 0,
    ).to_parquet(path)
    return path


@pytest.fixture(scope="module")
def estimate(data_file):
    model = MatchupModel(method="odds-ratio", batter_prior_pa=150, pitcher_prior_pa=250).fit(load_pas(data_file))
    return model.predict("Gus Marrow", "Wade Fenner")


def _png_size(data: bytes) -> tuple[int, int]:
    # PNG: 8-byte signature, then the IHDR chunk whose first 8 data bytes are width, height
    # (big-endian uint32) -- the PNG specification, section 11.2.2.
    assert data[:8] == b"\x89PNG\r\n\x1a\n"
    assert data[12:16] == b"IHDR"
    return struct.unpack(">II", data[16:24])


def _svg_text(svg: str) -> str:
    return " ".join(re.findall(r"<text[^>]*>([^<]*)</text>", svg)).replace("&amp;", "&")


def test_card_in_all_three_formats_states_settings_and_counts(estimate, tmp_path, artifacts_dir):
    pa_b, pa_p = f"{estimate.pa['batter']:,.0f}", f"{estimate.pa['pitcher']:,.0f}"
    paths = {fmt: write_matchup_card(estimate, tmp_path / f"card.{fmt}") for fmt in ("html", "png", "svg")}

    png = paths["png"].read_bytes()
    width, height = _png_size(png)
    assert 900 <= width <= 3000 and 700 <= height <= 3000, (width, height)
    assert 30_000 < len(png) < 3_000_000
    (artifacts_dir / "matchup_card.png").write_bytes(png)

    words = _svg_text(paths["svg"].read_text())
    for text in (
        "Gus Marrow vs Wade Fenner",
        f"Platoon split {estimate.split}",
        "Settings: odds-ratio blend",
        "priors batter 150 PA, pitcher 250 PA",
        "observed basis",
        f"batter {pa_b}, pitcher {pa_p}",
        "80% interval",
        CARD_CAUTION,
    ):
        assert text in words, text
    k = estimate.probabilities["K"]
    lo, hi = estimate.intervals.loc["K", ["lo", "hi"]]
    assert f"Strikeout: {k:.1%} (80% interval {lo:.1%} to {hi:.1%}" in words

    page = paths["html"].read_text()
    assert "cdn." not in page and "<script src" not in page  # vega JavaScript inline, no CDN
    assert "vegaEmbed" in page and "Numbers behind the card" in page
    assert f"batter {pa_b}, pitcher {pa_p}" in page
    assert "Settings: odds-ratio blend" in page


def test_card_tables_hold_the_estimates_numbers(estimate):
    t = card_tables(estimate)
    assert t["outcomes"]["outcome"].tolist() == list(OUTCOMES)
    assert np.allclose(t["outcomes"]["matchup"], estimate.probabilities.to_numpy(), rtol=1e-12)
    assert np.allclose(t["outcomes"]["interval_low"], estimate.intervals["lo"].to_numpy(), rtol=1e-12)
    assert t["facts"].loc[0, "batter_pa"] == estimate.pa["batter"]
    assert t["facts"].loc[0, "method"] == "odds-ratio"
    chart, _ = matchup_card(estimate)
    assert chart.to_dict()["title"]["text"] == "Gus Marrow vs Wade Fenner"


def test_card_command_writes_the_same_card(data_file, tmp_path, capsys):
    out = tmp_path / "cmd_card.svg"
    code = main(["card", "--data", str(data_file), "--batter", "Gus Marrow", "--pitcher", "Wade Fenner",
                 "--out", str(out), "--method", "odds-ratio", "--batter-prior", "150", "--pitcher-prior", "250",
                 "--csv", str(tmp_path / "csv"), "--json"])
    assert code == 0
    payload = json.loads(capsys.readouterr().out)
    assert payload["format"] == "svg" and Path(payload["out"]) == out
    assert payload["settings"]["batter_prior_pa"] == 150
    assert payload["pa"]["batter"] > 0 and isinstance(payload["pa"]["batter"], int)  # as blend prints it
    assert len(payload["csv"]) == 3
    assert "Settings: odds-ratio blend" in _svg_text(out.read_text())


@pytest.mark.parametrize(
    ("args", "message"),
    [
        (["--out", "card.pdf"], r"has suffix '\.pdf'; use one of \.html, \.png, \.svg"),
        (["--out", "card.png", "--batter", "Nobody Atall"], "card: "),
    ],
)
def test_card_command_reports_bad_input(data_file, tmp_path, capsys, args, message):
    base = {"--batter": "Gus Marrow", "--pitcher": "Wade Fenner"}
    opts = dict(zip(args[::2], args[1::2]))
    argv = ["card", "--data", str(data_file), "--json"]
    for key, value in (base | opts).items():
        argv += [key, str(tmp_path / value) if key == "--out" else value]
    assert main(argv) == 2
    err = json.loads(capsys.readouterr().out)["error"]
    assert re.search(message, err), err


def test_card_export_panel_offers_the_current_matchup(estimate):
    from types import SimpleNamespace

    from matchup_widgets.widgets.card import MatchupCardExport

    panel = MatchupCardExport(SimpleNamespace(estimate=estimate))
    panel.buttons["svg"].click()  # as the browser would
    assert panel.status.last_error is None, panel.status.widget.value
    assert 'download="card_gus_marrow_vs_wade_fenner.svg"' in panel.link.value
    assert "data:image/svg+xml;base64," in panel.link.value
    panel.buttons["csv"].click()
    assert 'download="card_gus_marrow_vs_wade_fenner_outcomes.csv"' in panel.link.value
    empty = MatchupCardExport(SimpleNamespace(estimate=None))
    empty.buttons["png"].click()
    assert "pick a batter and a pitcher first" in empty.status.widget.value

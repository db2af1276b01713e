"""Player table, id/name resolution and search, on invented players."""

from __future__ import annotations

import pandas as pd
import pytest

from matchup_widgets.data import DataError, load_pas, player_table, resolve_player, search_players


def _pas():
    rows = [
        # batter_id, batter_name, batter_hand, pitcher_id, pitcher_name, pitcher_hand, date
        ("b1", "Ada Quill", "L", "p1", "Orin Vance", "R", "2031-04-02"),
        ("b1", "Ada Quill", "L", "p2", "Tess Vance", "L", "2031-04-03"),
        ("b2", "Bo Reed", "R", "p3", "Uma Vancel", "R", "2031-04-04"),
        ("b3", "Bo Reed", "L", "p1", "Orin Vance", "R", "2031-04-05"),  # a namesake
        ("b4", "Cal Fenn", "L", "p1", "Orin Vance", "R", "2031-04-06"),
        ("b4", "Cal Fenn", "R", "p2", "Tess Vance", "L", "2031-04-07"),  # switch hitter
        ("b5", "Dee Ashworth", "R", "p1", "Orin Vance", "R", "2031-04-08"),
        ("b5", "Dee Ashworth-Lyle", "R", "p1", "Orin Vance", "R", "2031-05-08"),  # renamed later
    ]
    df = pd.DataFrame(rows, columns=["batter_id", "batter_name", "batter_hand", "pitcher_id", "pitcher_name",
                                     "pitcher_hand", "game_date"])
    df["game_id"] = [f"g{i}" for i in range(len(df))]
    df["outcome"] = "K"
    return load_pas(df)


@pytest.fixture(scope="module")
def pas():
    return _pas()


def test_player_table(pas):
    players = pas.players
    batters = players[players["role"] == "batter"].set_index("player_id")
    assert batters.loc["b4", "hands"] == "L/R"
    assert batters.loc["b1", "pa"] == 2
    assert batters.loc["b5", "name"] == "Dee Ashworth-Lyle"  # the latest game's name
    pitchers = players[players["role"] == "pitcher"].set_index("player_id")
    assert pitchers.loc["p1", "pa"] == 5 and pitchers.loc["p1", "hands"] == "R"
    pd.testing.assert_frame_equal(player_table(pas.table), players)


def test_player_table_without_dates():
    df = _pas().frame.drop(columns=["game_date", "season"])
    players = player_table(df)
    assert players.set_index("player_id").loc["b5", "name"] == "Dee Ashworth-Lyle"  # alphabetically last
    assert resolve_player(df, "Fenn", role="batter") == "b4"


def test_resolve_by_id_exact_name_and_unique_part(pas):
    assert resolve_player(pas, "b2", role="batter") == "b2"
    assert resolve_player(pas, "ada quill", role="batter") == "b1"
    assert resolve_player(pas, "FENN", role="batter") == "b4"
    assert resolve_player(pas, "Orin Vance", role="pitcher") == "p1"  # exact beats the part match of Vancel
    assert resolve_player(pas.table, "Tess", role="pitcher") == "p2"


def test_ambiguous_names_list_the_players_with_ids(pas):
    with pytest.raises(DataError, match=r"batter 'Bo Reed' matches 2 players: Bo Reed \(b[23], 1 PA\), "
                                        r"Bo Reed \(b[23], 1 PA\)\. Give the id instead\."):
        resolve_player(pas, "Bo Reed", role="batter")
    with pytest.raises(DataError, match=r"pitcher 'Vance' matches 3 players: Orin Vance \(p1, 5 PA\), .*Give the id"):
        resolve_player(pas, "Vance", role="pitcher")


def test_unknown_names_suggest_close_matches(pas):
    with pytest.raises(DataError, match=r"No batter matches 'Ada Quilt' among 5 batters\. Closest names: Ada Quill \(b1"):
        resolve_player(pas, "Ada Quilt", role="batter")


def test_unknown_without_close_matches_still_lists_the_nearest(pas):
    # nothing is spelled like 'zzz', but the message still gives the nearest names as a lead
    with pytest.raises(DataError, match=r"No pitcher matches 'zzz' among 3 pitchers\. Closest names: .*\(p1.*Give an id"):
        resolve_player(pas, "zzz", role="pitcher")
    with pytest.raises(ValueError, match=r"role must be"):
        resolve_player(pas, "b1", role="fielder")


def test_search_ranks_and_limits(pas):
    got = search_players(pas, "van", role="pitcher")
    assert got["player_id"].tolist() == ["p1", "p2", "p3"]  # word starts, then more PA first
    assert list(got.columns) == ["player_id", "name", "hands", "pa"]
    assert search_players(pas, "", role="batter", limit=2)["player_id"].tolist() == ["b1", "b4"]
    assert search_players(pas, "b3", role="batter")["player_id"].tolist()[0] == "b3"
    assert search_players(pas, "Ashwort", role="batter")["player_id"].tolist() == ["b5"]
    assert search_players(pas, "nobody-like-this", role="batter").empty

"""Every command that loads a plate-appearance file reads a user's own column names and codes."""

from __future__ import annotations

import json

import pytest

from matchup_widgets.cli import main

_MAPPING = {"Result": "outcome", "Hitter": "batter_id", "Hurler": "pitcher_id"}


@pytest.fixture(scope="module")
def own_names(tmp_path_factory, tilted_league):
    """An invented league written with the user's own column names and one raw code to drop."""
    folder = tmp_path_factory.mktemp("own")
    df = tilted_league(seed=3, n_pa=4000, n_batters=12, n_pitchers=8, batter_sd=0.2)
    df.loc[df.index[:25], "outcome"] = "SAC"
    df = df.rename(columns={v: k for k, v in _MAPPING.items()})
    df.to_csv(folder / "pas.csv", index=False)
    (folder / "mapping.json").write_text(json.dumps(_MAPPING))
    (folder / "codes.json").write_text(json.dumps({"SAC": None}))
    return folder


@pytest.mark.parametrize(
    "argv",
    [
        ["check", "{data}"],
        ["blend", "--data", "{data}", "--batter", "b1", "--pitcher", "p1"],
        ["fit", "--data", "{data}", "--priors", "0,50", "--n-boot", "5", "--quiet"],
        ["run-values", "--data", "{data}"],
    ],
    ids=lambda argv: argv[0],
)
def test_mapping_and_outcome_map_reach_every_loading_command(own_names, capsys, argv):
    argv = [a.format(data=own_names / "pas.csv") for a in argv]
    assert main([*argv, "--json"]) == 2  # without the mapping the columns are missing
    assert "no required columns 'batter_id', 'pitcher_id', 'outcome'" in json.loads(capsys.readouterr().out)["error"]
    extra = ["--mapping", str(own_names / "mapping.json"), "--outcome-map", str(own_names / "codes.json")]
    assert main([*argv, *extra, "--json"]) == 0
    assert "error" not in json.loads(capsys.readouterr().out)


def test_duplicates_option_reaches_the_computing_commands(own_names, capsys):
    # run-values counts the league's plate appearances: 4,000 rows less the 25 dropped SAC rows,
    # with repeated rows kept (auto, no key column) or dropped as copies (drop)
    base = ["run-values", "--data", str(own_names / "pas.csv"), "--mapping", str(own_names / "mapping.json"),
            "--outcome-map", str(own_names / "codes.json"), "--json"]
    assert main(base) == 0
    assert json.loads(capsys.readouterr().out)["advancement"]["n_pa"] == 3975
    assert main([*base, "--duplicates", "drop"]) == 0
    assert json.loads(capsys.readouterr().out)["advancement"]["n_pa"] < 3975

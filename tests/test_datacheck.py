"""drift check: a dry run that says how every column was read, end to end through main(argv)."""

from __future__ import annotations

from conftest import DEMO, small_table

from drift.cli import main


def _config(tmp_path, text):
    path = tmp_path / "drift.toml"
    path.write_text(text)
    return str(path)


def test_check_on_a_real_export_explains_every_column(tmp_path, capsys):
    from exports import COLUMN_MAP, write_export

    write_export(DEMO, tmp_path / "export")
    config = _config(tmp_path, "[columns]\n" + "".join(f'{k} = "{v}"\n' for k, v in COLUMN_MAP.items()))
    code = main(["check", str(tmp_path / "export"), "--config", config])
    out = capsys.readouterr().out
    assert code == 0
    assert "A run would work: 1939 player-seasons pass the filters." in out  # the demo's count
    lines = {ln.split()[0]: ln for ln in out.splitlines() if ln.startswith("  ") and ln.split()}
    assert "feature: share_isolation" in lines["ISO_FREQ"] and "isolation" in lines["ISO_FREQ"]
    assert "efficiency" in lines["PRBALLHANDLER_PPP"] and "pnr_handler" in lines["PRBALLHANDLER_PPP"]
    assert "ignored" in lines["TEAM_ID"] and "describes the player (an id)" in lines["TEAM_ID"]
    assert "ignored" in lines["AGE"] and "(age)" in lines["AGE"]
    assert "player_id" in lines["PERSON_KEY"] and "config [columns]" in lines["PERSON_KEY"]
    assert "percent" in lines["USG_PCT"] and "fraction" in lines["TS_PCT"]
    assert "2024-25" in lines and "club_export_2024-25.xlsx, sheet 'Players'" in lines["2024-25"]
    assert "minutes per game < 10" in out


def test_check_refuses_with_the_reason_and_exit_2(tmp_path, capsys):
    from exports import write_export

    write_export(DEMO, tmp_path / "export")
    code = main(["check", str(tmp_path / "export")])
    captured = capsys.readouterr()
    assert code == 2
    assert "A run would not work:" in captured.out
    assert "sheet 'Players' lacks ['games', 'minutes', 'player_id', 'team']" in captured.err
    assert "map your names in the config's [columns] table" in captured.err


def test_check_says_when_filters_leave_too_few_and_lists_warnings(tmp_path, capsys):
    t = small_table(seasons=("2024-25",)).drop(columns="season")
    t["hustle"] = 1.0
    t.to_csv(tmp_path / "2024-25.csv", index=False)
    code = main(["check", str(tmp_path), "--min-games", "5"])
    captured = capsys.readouterr()
    assert code == 2
    assert "the pool has 6 player-seasons; at least 10 are needed" in captured.out
    assert "hustle match no name rule and are used as rate features" in captured.out
    assert "drift: error: a run would not work" in captured.err


def test_failing_check_still_shows_how_the_columns_were_read(tmp_path, capsys):
    from exports import small_league, write_text_export

    league = small_league(seasons=("2023-24",))
    league.loc[4, "orb_pct"] = 401.0
    write_text_export(league, tmp_path)
    code = main(["check", str(tmp_path)])
    captured = capsys.readouterr()
    assert code == 2
    assert "Read so far (the problem below stopped the reading)" in captured.out
    lines = {ln.split()[0]: ln for ln in captured.out.splitlines() if ln.startswith("  ") and ln.split()}
    assert "feature: orb_pct" in lines["OREB_PCT"] and "feature: share_spot_up" in lines["SPOTUP_FREQ"]
    assert "row 6, column 'OREB_PCT' (drift's orb_pct): value 401 is impossible" in captured.err


def test_check_lists_combined_rows_and_how_files_were_read(tmp_path, capsys):
    from exports import small_league, with_combined_rows, write_text_export

    league = with_combined_rows(small_league(seasons=("2023-24",), traded=2), "{n}TM")
    write_text_export(league, tmp_path, separator=";", encoding="cp1252")
    code = main(["check", str(tmp_path), "--min-games", "5"])
    out = capsys.readouterr().out
    assert code == 0
    assert "Combined rows: 2 (2 as the sum of his other rows)" in out
    assert "2TM   as the sum of his other rows" in out
    assert "text, semicolon-separated, Windows-1252" in out
    assert "read as semicolon-separated text" in out and "read as Windows-1252 text, not UTF-8" in out


def test_check_unit_column_says_per_game_minutes_were_converted(tmp_path, capsys):
    from exports import small_league, write_text_export

    league = small_league(seasons=("2023-24",))
    league["minutes"] = (league["minutes"] / league["games"]).round(1)
    write_text_export(league, tmp_path)
    main(["check", str(tmp_path)])
    out = capsys.readouterr().out
    line = next(ln for ln in out.splitlines() if ln.startswith("  MIN "))
    assert "per game -> season total" in line


def test_a_check_summarises_itself_in_one_line_a_terminal_and_a_notebook():
    import drift

    table = small_table(n_players=12, seasons=("2021-22", "2022-23"))
    table.loc[0, ["games", "minutes"]] = 3, 90  # one exclusion by the games filter (a plausible 30 a game)
    passed = drift.check(table)
    assert passed.summary() == ("check passed: 23 of 24 player-seasons pass the filters (2 season(s), "
                                "4 features, 1 table(s) read)")
    assert repr(passed).splitlines() == [f"DataCheck: {passed.summary()}",
                                         "  seasons: 2021-22 (11 kept), 2022-23 (12 kept)", "  warnings: none"]
    page = passed._repr_html_()
    assert "DataFrame &#x27;seasons&#x27;" in page and "games &lt; 20" in page and "<p>Problems: none</p>" in page
    failed = drift.check(table.drop(columns="minutes"))
    assert failed.summary().startswith("check failed: DataFrame 'seasons': missing required column(s) ['minutes']")
    assert "<li>DataFrame &#x27;seasons&#x27;: missing required column(s) [&#x27;minutes&#x27;]" in failed._repr_html_()

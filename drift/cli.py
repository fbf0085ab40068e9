"""Command line: parse options, call the API, turn drift's errors into one line (exit 2)."""

from __future__ import annotations

import argparse
import sys

__all__ = ["main", "build_parser"]

_RUN_EXAMPLE = """example:
  drift run demo_seasons --out drift-report
  drift run seasons/ --out review --reference 2021-22 2022-23 2023-24 --roles 7 --compare 2021-22 2024-25
  drift run --db postgresql://analyst@db.local/league --query seasons.sql --out review
"""
_PLACE_EXAMPLE = """example:
  drift place drift-report/model.json current/2025-26.csv --out early.csv --min-games 10
  drift place drift-report/model.json current/2025-26.csv --against seasons/ --out early-check
"""
_CHECK_EXAMPLE = """example:
  drift check seasons/ --config drift.toml
  drift check --db sqlite:///league.db --table seasons
"""
_DEMO_EXAMPLE = """example:
  drift demo --out my_demo --seed 7
"""


def _literal(text: str):
    """Command-line text as the value a config file would hold: a whole number, a number, or text."""
    try:
        return int(text)
    except ValueError:
        pass
    try:
        value = float(text)
    except ValueError:
        return text
    return int(value) if value.is_integer() and value >= 1 else value


def _setting(name: str, rule_name: str, *args):
    """An argparse type that checks a value with the setting's own validator (drift.settings_rules).

    The CLI, the TOML file, the model file and the API refuse the same values with the same words.
    """
    from drift import settings_rules
    from drift.errors import ConfigError

    rule = getattr(settings_rules, rule_name)
    rule = rule(*args) if args else rule

    def parse(text: str):
        try:
            return rule(name, _literal(text))
        except ConfigError as exc:
            raise argparse.ArgumentTypeError(str(exc)) from None

    parse.__name__ = name  # argparse names the type in its messages
    return parse


def _defaults():
    """The settings' own defaults, for the help texts (each has one home: its settings part)."""
    from drift.config import IntakePolicy, ModelSettings, MoveSettings

    return IntakePolicy(), ModelSettings(), MoveSettings()


class _Parser(argparse.ArgumentParser):
    """argparse whose errors are one ``drift: error:`` line, exit 2.

    Options are never abbreviated (``--min-game`` is not ``--min-games``), and an unknown
    option is named, with the nearest known one, before any missing argument: a misspelt
    ``--ot`` is the reason ``--out`` is missing.
    """

    def __init__(self, *args, **kwargs):
        kwargs["allow_abbrev"] = False
        super().__init__(*args, **kwargs)
        self._given = ()

    def parse_known_args(self, args=None, namespace=None):
        self._given = tuple(sys.argv[1:] if args is None else args)
        namespace, extras = super().parse_known_args(args, namespace)
        unknown = self._unknown(extras, to_end=True)
        if unknown:
            self.error(unknown)
        return namespace, extras

    def _unknown(self, given, *, to_end):
        """'unknown option --x (did you mean --y?)' for the options in ``given`` this parser lacks."""
        import difflib

        found = []
        for arg in given:
            if arg == "--":
                break
            if not arg.startswith("-") or arg == "-" or self._negative_number_matcher.match(arg):
                if not to_end and self._subparsers is not None:
                    break  # the command name: what follows is the command's own options
                continue
            name = arg.split("=", 1)[0]
            if name not in self._option_string_actions:
                found.append(name)
        if not found:
            return None
        known = [o[2:] for o in self._option_string_actions if o.startswith("--")]
        near = difflib.get_close_matches(found[0].lstrip("-"), known, n=1, cutoff=0.7)
        hint = f" (did you mean --{near[0]}?)" if near else ""
        return f"unknown option{'s' if len(found) > 1 else ''} {', '.join(found)}{hint}"

    def error(self, message):
        from drift.messages import printable

        if message.startswith("the following arguments are required"):
            message = self._unknown(self._given, to_end=False) or message
        self.exit(2, f"drift: error: {printable(message)} (see '{self.prog} --help')\n")


def _add_intake_options(p):
    p.add_argument("--config", metavar="TOML", help="config file (columns, filters, model settings)")
    intake = _defaults()[0]
    p.add_argument("--min-games", type=_setting("min_games", "count_from", 0), metavar="N",
                   help=f"fewest games for a season to be placed (run: default {intake.min_games:g}; "
                        "place: the model's)")
    p.add_argument("--min-minutes", type=_setting("min_minutes_per_game", "non_negative"), metavar="MPG",
                   help=f"fewest minutes per game (run: default {intake.min_minutes_per_game:g}; place: the model's)")


def _add_source_options(p):
    """The data as positional paths, or a database: --db URL with --table or --query."""
    p.add_argument("data", nargs="*", help="season files (.csv, .xlsx, .parquet) or folders of them "
                                            "(or --db instead)")
    db = p.add_argument_group("reading from a database (instead of files)")
    db.add_argument("--db", metavar="URL", help="database URL: sqlite:///league.db or "
                                                "postgresql://user@host/db (the password is never shown)")
    what = db.add_mutually_exclusive_group()
    what.add_argument("--table", metavar="NAME", help="with --db: the table (or view) holding the seasons")
    what.add_argument("--query", metavar="FILE.sql", help="with --db: a file holding one SQL query")


def _source(parser, args):
    """The data to read: the paths given, or a Database; a wrong mix is one parser error."""
    if args.db is None:
        if args.table is not None or args.query is not None:
            parser.error("--table and --query read from a database: give --db URL too")
        if not args.data:
            parser.error("give season files or folders, or a database (--db URL with --table or --query)")
        return args.data
    if args.data:
        parser.error(f"give season files or --db, not both (files given: {', '.join(args.data[:3])})")
    if args.table is None and args.query is None:
        parser.error("--db needs --table NAME or --query FILE.sql: what to read from the database")
    from drift.intake import Database

    return Database(args.db, table=args.table, query_file=args.query)


def _add_progress_options(p):
    shown = p.add_mutually_exclusive_group()
    shown.add_argument("--quiet", action="store_true", help="no progress lines on standard error")
    shown.add_argument("--progress", action="store_true",
                       help="progress lines even when standard error is not a terminal")


def _progress(args):
    """Stage reporter for long runs: on a terminal unless --quiet, elsewhere only with --progress."""
    if args.quiet or not (args.progress or sys.stderr.isatty()):
        return None
    from drift.progress import TerminalProgress

    return TerminalProgress(sys.stderr)


def build_parser() -> argparse.ArgumentParser:
    from drift import __version__
    from drift.constants import DISTRIBUTION, NOISE_POLICIES
    from drift.placing import SEASON_GAMES

    _, model, moves = _defaults()

    parser = _Parser(
        prog="drift", description="Season-over-season role drift for basketball front offices.")
    parser.add_argument("--version", action="version", version=f"drift {__version__} (package {DISTRIBUTION})")
    parser.add_argument("--debug", action="store_true", default=False,
                        help="show the traceback of an unexpected error")
    sub = parser.add_subparsers(dest="command", required=True, metavar="COMMAND",
                                parser_class=_Parser)

    run = sub.add_parser("run", help="fit roles on a reference pool, place every season, measure moves",
                         epilog=_RUN_EXAMPLE, formatter_class=argparse.RawDescriptionHelpFormatter)
    _add_source_options(run)
    run.add_argument("--out", required=True, metavar="DIR", help="output folder (replaced only on success)")
    _add_intake_options(run)
    run.add_argument("--reference", nargs="+", metavar="SEASON", help="seasons of the pool (default: all)")
    run.add_argument("--roles", type=_setting("roles", "roles"), metavar="K",
                     help=f"number of roles, or auto (default {model.roles})")
    run.add_argument("--components", type=_setting("components", "components"), metavar="N|FRACTION|RULE",
                     help=f"components: variance (default {model.components}, "
                          f"{100 * model.variance_threshold:.0f}%%), parallel, elbow, a count or a fraction")
    run.add_argument("--noise-policy", choices=NOISE_POLICIES,
                     help=f"how small samples are handled (default {model.noise_policy})")
    run.add_argument("--previous", metavar="MODEL", help="earlier model.json whose role ids to keep")
    run.add_argument("--compare", nargs=2, metavar=("A", "B"), help="also compare these two seasons")
    run.add_argument("--alpha", type=_setting("alpha", "fraction_open"),
                     help=f"level for 'beyond noise' (default {moves.alpha:g})")
    run.add_argument("--seed", type=_setting("seed", "seed"), help=f"random seed (default {model.seed})")
    run.add_argument("--format", dest="table_format", type=_setting("format", "table_format"), default="csv",
                     metavar="csv|parquet", help="format of the tables: csv (default) or parquet (same columns and "
                                                  f"values; needs pyarrow: pip install '{DISTRIBUTION}[parquet]')")
    run.add_argument("--self-check", type=_setting("self_check", "count_from", 0), default=0, metavar="N",
                     help="simulate N leagues like yours and report how often roles and role changes "
                          "are recovered (about one fit each; default 0: off)")
    _add_progress_options(run)

    place = sub.add_parser("place", help="place season files with a saved model",
                           epilog=_PLACE_EXAMPLE, formatter_class=argparse.RawDescriptionHelpFormatter)
    place.add_argument("model", help="model.json written by drift run")
    place.add_argument("files", nargs="+", help="season files or folders")
    place.add_argument("--out", required=True, metavar="FILE|DIR",
                       help="CSV of placements to write (with --against: a folder)")
    _add_intake_options(place)
    place.add_argument("--against", nargs="+", metavar="DATA",
                       help="full seasons to check the files against (in-season check; default 5 games)")
    place.add_argument("--alpha", type=_setting("alpha", "fraction_open"),
                       help=f"with --against: level for 'beyond noise' (default {moves.alpha:g})")
    place.add_argument("--season-games", type=_setting("season_games", "count_from", 1), default=SEASON_GAMES,
                       metavar="N", help=f"with --against: games in a full season (default {SEASON_GAMES})")
    _add_progress_options(place)

    check = sub.add_parser("check", help="dry run: say how every column was read, fit nothing",
                           epilog=_CHECK_EXAMPLE, formatter_class=argparse.RawDescriptionHelpFormatter)
    _add_source_options(check)
    _add_intake_options(check)

    demo = sub.add_parser("demo", help="write the fictional demo league",
                          epilog=_DEMO_EXAMPLE, formatter_class=argparse.RawDescriptionHelpFormatter)
    demo.add_argument("--out", required=True, metavar="DIR", help="folder for the season files")
    demo.add_argument("--seed", type=_setting("seed", "seed"), default=2024, help="seed of the league (default 2024)")
    demo.add_argument("--partial-games", type=_setting("partial_games", "count_from", 1), metavar="N",
                      help="also write the first N games of the next season to DIR/partial/")
    for p in (run, place, check, demo):  # --debug also after the command name
        p.add_argument("--debug", action="store_true", default=argparse.SUPPRESS, help=argparse.SUPPRESS)
    return parser


def _config(args):
    from drift.config import load_config
    from drift.intake.preflight import check_regular

    check_regular([args.config])
    config = load_config(args.config)
    changes = {}
    if args.command in ("run", "check"):
        changes.update(min_games=args.min_games, min_minutes_per_game=args.min_minutes)
    if args.command == "run":
        changes.update(reference=tuple(args.reference) if args.reference else None,
                       roles=args.roles, components=args.components, noise_policy=args.noise_policy,
                       compare=tuple(args.compare) if args.compare else None, alpha=args.alpha,
                       seed=args.seed)
    return config.replace(**changes)


def _run(args):
    from drift.api import run

    analysis = run(args.source, args.out, _config(args), previous=args.previous,
                   inputs=[args.config] if args.config else (), progress=_progress(args),
                   self_check=int(args.self_check), table_format=args.table_format)
    check = f"\ndrift: {analysis.self_check.sentence}" if analysis.self_check is not None else ""
    return f"drift: {analysis.summary()}; report: {args.out}/report.html{check}"


def _check(args):
    from drift.api import check_files

    checked = check_files(args.model, args.files, args.against, args.out, _config(args),
                          min_games=args.min_games, min_minutes_per_game=args.min_minutes, alpha=args.alpha,
                          season_games=args.season_games, inputs=[args.config] if args.config else ())
    return f"drift: {checked.summary()}"


def _check_data(args):
    from drift.api import check
    from drift.errors import InputError
    from drift.intake.dry_run import format_check
    from drift.messages import printable

    result = check(args.source, _config(args))
    print("\n".join(printable(line) for line in format_check(result).splitlines()))  # names are the user's
    if not result.ok:
        raise InputError("a run would not work: " + "; ".join(result.problems))
    data = "this database" if args.db else "these files"
    return f"drift: check passed; `drift run` with {data} and this config would work"


def _place(args):
    from drift.api import place_files

    if args.against:
        return _check(args)

    placed = place_files(args.model, args.files, args.out, _config(args),
                         min_games=args.min_games, min_minutes_per_game=args.min_minutes,
                         inputs=[args.config] if args.config else (), progress=_progress(args))
    return f"drift: {placed.summary()}"


def _demo(args):
    from drift.output.folders import atomic_folder
    from drift.sim.demo import generate_league, write_league

    with atomic_folder(args.out, kind="demo") as tmp:  # checked first: never over a folder of real seasons
        files = write_league(tmp, generate_league(args.seed, partial_games=args.partial_games))
    return f"drift: wrote {len(files)} season files and the truth to {args.out}"


def main(argv=None) -> int:
    """Entry point; returns the exit code.

    0 done; 2 a refused input or any other failure (one ``drift: error:`` line); 130
    interrupted by Ctrl-C, 143 by SIGTERM; 141 the reader of the output went away (quietly).
    """
    from drift.messages import run_guarded

    parser = build_parser()
    args = parser.parse_args(argv)
    if args.command in ("run", "check"):
        sub = next(a for a in parser._actions if a.dest == "command").choices[args.command]
        args.source = _source(sub, args)
    return run_guarded({"run": _run, "place": _place, "check": _check_data, "demo": _demo}[args.command], args,
                       debug=args.debug)


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())

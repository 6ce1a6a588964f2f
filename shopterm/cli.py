"""The ``shopterm`` command: starts the app, or answers one question (``calc``, ``export``)."""

from __future__ import annotations

import argparse
import importlib
import sys

from shopterm import __version__

#: ``shopterm calc`` subcommands, each in ``shopterm/commands/calc_<name>.py``.
CALC_COMMANDS = ("limits", "wires", "passes", "gears", "dial", "starts", "identify", "taper")


def _load(module: str):
    try:
        return importlib.import_module(module)
    except ModuleNotFoundError as exc:
        if exc.name == module:
            return None
        raise


class OneLineParser(argparse.ArgumentParser):
    """An argument parser whose mistakes are one line, as every other bad value: the message
    and where to read the usage, exit status 2 (subcommand parsers are made of this class too).
    """

    def error(self, message: str):
        self.exit(2, f"{self.prog}: {message}. See '{self.prog} --help'.\n")


def build_parser(with_commands: bool = True) -> argparse.ArgumentParser:
    """Return the argument parser; ``with_commands=False`` leaves the calc/export modules
    unloaded (starting the app does not pay for importing them)."""
    parser = OneLineParser(
        prog="shopterm",
        description="Screw cutting on a manual lathe: thread limits, set-up, pass counter, "
                    "three-wire readings and the job record.")
    parser.add_argument("--version", action="version", version=f"shopterm {__version__}")
    parser.add_argument("--config", metavar="PATH", help="config file to use")
    parser.add_argument("--data-dir", metavar="DIR", help="where the job record is kept")
    parser.add_argument("--check-config", nargs="?", const="", metavar="PATH",
                        help="validate a config file (default: the one that would be used); "
                             "exit 0 if good, 2 if not")
    parser.add_argument("--pi-boot", nargs="?", const="unit", choices=("unit", "getty", "profile"),
                        metavar="unit|getty|profile",
                        help="print a file that starts shopterm at boot on a Raspberry Pi's "
                             "console: the systemd unit (default), or the autologin drop-in "
                             "and login-shell snippet (see README)")
    parser.add_argument("--profile-start", action="store_true",
                        help="start, stop at the first screen, and print where the start-up "
                             "time went (one line per phase, in ms)")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND")
    if not with_commands:
        return parser
    calc = sub.add_parser("calc", help="answer one question and exit")
    calc_sub = calc.add_subparsers(dest="calc", metavar="QUESTION", required=True)
    for name in CALC_COMMANDS:
        mod = _load(f"shopterm.commands.calc_{name}")
        if mod is not None:
            mod.register(calc_sub)
    export = _load("shopterm.commands.export")
    if export is not None:
        export.register(sub)
    return parser


_TAKES_VALUE = ("--config", "--data-dir", "--check-config", "--pi-boot")


def _wants_command(argv: list[str]) -> bool:
    """Return whether ``argv`` names a command (or asks for help), beyond starting the app."""
    after_option = False
    for a in argv:
        if a in ("-h", "--help"):
            return True
        if after_option:
            after_option = False
        elif a in _TAKES_VALUE:
            after_option = True
        elif not a.startswith("-"):
            return True
    return False


def main(argv: list[str] | None = None) -> int:
    from shopterm.errors import ShoptermError

    argv = sys.argv[1:] if argv is None else argv
    parser = build_parser(with_commands=_wants_command(argv))
    args = parser.parse_args(argv)
    try:
        if args.check_config is not None:
            from shopterm.config import check_config_command
            return check_config_command(args.check_config or args.config or None)
        if args.pi_boot is not None:
            from shopterm.pi import print_boot_file
            return print_boot_file(args.pi_boot)
        if args.command is None:
            return _run_app(args)
        return int(args.func(args) or 0)
    except ShoptermError as exc:
        print(f"shopterm: {exc}", file=sys.stderr)
        return 2
    except BrokenPipeError:
        return 0
    except Exception as exc:  # a bug: say so in one line; SHOPTERM_DEBUG=1 shows the traceback
        import os
        if os.environ.get("SHOPTERM_DEBUG"):
            raise
        print(f"shopterm: internal error ({type(exc).__name__}: {exc}). Nothing was changed; "
              "please report it (run with SHOPTERM_DEBUG=1 for details).", file=sys.stderr)
        return 3


def _run_app(args) -> int:
    if args.profile_start:
        from shopterm.startprofile import profile_start
        return profile_start(config_path=args.config, data_dir=args.data_dir)
    from shopterm.ui.app import run_app
    return run_app(config_path=args.config, data_dir=args.data_dir)


if __name__ == "__main__":
    sys.exit(main())

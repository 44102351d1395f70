"""The ``disteco`` command. Parses arguments, calls the API, prints errors without tracebacks.

Exit codes: 0 success, 2 bad input or an infeasible request, 1 internal failure.
"""

from __future__ import annotations

import argparse
import sys
import traceback
from pathlib import Path

from . import __version__

EXIT_OK, EXIT_FAILURE, EXIT_BAD_INPUT = 0, 1, 2


def _parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(
        prog="disteco",
        description="Economic design of continuous distillation columns (screening estimates).")
    parser.add_argument("--version", action="version", version=f"disteco {__version__}")
    commands = parser.add_subparsers(dest="command", required=True, metavar="COMMAND")
    check = commands.add_parser("check", help="validate a case file and print a mixture report")
    check.add_argument("case", type=Path, help="case file (TOML)")
    design = commands.add_parser("design", help="design the column and write result.json")
    design.add_argument("case", type=Path, help="case file (TOML)")
    design.add_argument("-o", "--out", type=Path, default=Path("disteco-out"),
                        help="output folder (default: ./disteco-out)")
    for sub in (check, design):
        sub.add_argument("--debug", action="store_true", help="show a traceback on internal failures")
    return parser


def _run(args) -> int:
    from . import api
    from .reports.text import cautions_text, mixture_text

    case = api.load_case(args.case)
    if args.command == "check":
        print(f"Case: {case.title}")
        print(mixture_text(api.check(case)))
        print("Case file is valid.")
        return EXIT_OK
    result = api.design(case)
    print(f"Case: {case.title}")
    print(mixture_text(result.mixture))
    for warning in result.warnings:
        print(f"Warning: {warning}")
    path = api.write_results(result, args.out)
    print(f"Wrote {path}")
    print(cautions_text())
    return EXIT_OK


def main(argv: list[str] | None = None) -> int:
    from ._base.errors import DistecoError

    args = _parser().parse_args(argv)
    try:
        return _run(args)
    except ValueError as exc:
        # DistecoError subclasses of ValueError are user mistakes or infeasible requests.
        if not isinstance(exc, DistecoError):
            raise
        print(f"error: {exc}", file=sys.stderr)
        return EXIT_BAD_INPUT
    except DistecoError as exc:
        print(f"error: {exc}", file=sys.stderr)
        if getattr(args, "debug", False):
            traceback.print_exc()
        return EXIT_FAILURE
    except KeyboardInterrupt:
        print("interrupted", file=sys.stderr)
        return EXIT_FAILURE
    except Exception as exc:  # an internal failure, not the user's mistake
        print(f"internal error: {type(exc).__name__}: {exc}", file=sys.stderr)
        if getattr(args, "debug", False):
            traceback.print_exc()
        else:
            print("rerun with --debug for the details and report it", file=sys.stderr)
        return EXIT_FAILURE


if __name__ == "__main__":
    sys.exit(main())

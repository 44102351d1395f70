"""The ``disteco`` command. Parses arguments, calls the API, prints errors without tracebacks.

Exit codes: 0 success, 2 bad input or an infeasible request, 1 internal failure.
"""

from __future__ import annotations

import argparse
import os
import re
import signal
import sys
import threading
import traceback
from contextlib import contextmanager
from pathlib import Path

from . import __version__
from ._base import interrupt

EXIT_OK, EXIT_FAILURE, EXIT_BAD_INPUT = 0, 1, 2
# Option of the command line behind each field of the given design and of the optimiser's options.
OPTION_OF = {"reflux_ratio": "--reflux", "stages": "--stages", "feed_stage": "--feed-stage",
             "max_stages": "--max-stages", "time_limit": "--time-limit", "relative_gap": "--gap",
             "scenarios": "--scenario", "scenario": "--scenario"}


def _parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(
        prog="disteco",
        description="Economic design of continuous distillation columns (screening estimates).")
    parser.add_argument("--version", action="version", version=f"disteco {__version__}")
    commands = parser.add_subparsers(dest="command", required=True, metavar="COMMAND")
    check = commands.add_parser(
        "check", help="run every check design runs before optimising (same options) and print a mixture report")
    design = commands.add_parser(
        "design", help="find the lowest-TAC design (or price a given one) and write result.json, "
                       "design.xlsx and figures")
    for sub in (check, design):
        _run_options(sub)
    design.add_argument("-o", "--out", type=Path, default=Path("disteco-out"),
                        help="output folder (default: ./disteco-out)")
    design.add_argument("--no-figures", action="store_true", help="skip the PNG figures")
    design.add_argument("-q", "--quiet", action="store_true", help="no progress messages")
    for sub in (check, design):
        sub.add_argument("--debug", action="store_true", help="show a traceback on internal failures")
    return parser


def _run_options(sub: argparse.ArgumentParser) -> None:
    """The case and the options that decide what a design run does (check validates the same ones)."""
    sub.add_argument("case", type=Path, help="case file (TOML)")
    sub.add_argument("--scenario", action="append", default=[], metavar="NAME",
                     help="utility-price scenario to design for; repeat to compare several "
                          "(default: the case's [economics] scenarios)")
    sub.add_argument("--price", action="append", default=[], metavar="[SCENARIO.]UTILITY=PRICE[@YEAR]",
                     help="set a utility price, e.g. lp_steam=20USD/GJ (per GJ, kWh, t or m3; utility names "
                          "as in the cost data; money of the cost year, or of YEAR with @YEAR, e.g. "
                          "lp_steam=20USD/GJ@2019); repeatable; without SCENARIO it applies to every scenario")
    given = sub.add_argument_group("price a given design instead of optimising (all three together)")
    given.add_argument("--reflux", type=float, metavar="R", help="reflux ratio L/D [-]")
    given.add_argument("--stages", type=int, metavar="N", help="equilibrium stages, reboiler included [-]")
    given.add_argument("--feed-stage", type=int, metavar="F", help="feed stage counted from the top [-]")
    given.add_argument("--no-compare", action="store_true",
                       help="skip finding the optimum under the same prices to compare the given design with")
    sub.add_argument("--max-stages", type=int, metavar="N",
                     help="most equilibrium stages searched, at least 3 (default: 4.5 x the minimum stages, "
                          "at least 60)")
    sub.add_argument("--time-limit", type=float, metavar="S", help="wall-clock limit of each search [s]")
    sub.add_argument("--gap", type=float, metavar="G", help="relative optimality gap asked of a certifying solver [-]")


def _given(args):
    from ._base.errors import CaseError
    from .api import GivenDesign

    values = (args.reflux, args.stages, args.feed_stage)
    if all(v is None for v in values):
        return None
    if any(v is None for v in values):
        raise CaseError("--reflux/--stages/--feed-stage", "only some of the three were given",
                        "all three to price a given design, or none to optimise")
    return GivenDesign(args.reflux, args.stages, args.feed_stage)


def _options(args) -> dict:
    """The optimiser options given on the command line, checked before the case is read."""
    from .optimisation.options import model_options

    options = {}
    if args.max_stages is not None:
        options["max_stages"] = args.max_stages
    if args.time_limit is not None:
        options["time_limit"] = args.time_limit
    if args.gap is not None:
        options["relative_gap"] = args.gap
    model_options(options)
    return options


def _as_option(exc):
    """``exc`` with its field named as the command-line option that set it (unchanged otherwise)."""
    from ._base.errors import CaseError

    if not isinstance(exc, CaseError) or exc.field not in OPTION_OF:
        return exc
    return CaseError(OPTION_OF[exc.field], exc.problem, exc.allowed, exc.value)


def _run(args) -> int:
    from . import api
    from .reports.progress import ProgressDisplay
    from ._base.prices import parse_price_option
    from .reports.tables_prices import prices_text
    from .reports.text import cautions_text

    given, options = _given(args), _options(args)  # option mistakes are found before the case is read
    prices = tuple(parse_price_option(text, "--price") for text in args.price)
    case = api.load_case(args.case)
    if args.command == "check":
        print(api.check(case, given=given, scenarios=tuple(args.scenario), options=options,
                        compare=not args.no_compare, prices=prices))
        return EXIT_OK
    with api.claim_output(args.out, "--out", case) as out:  # before the search: a bad folder fails fast
        api.ready_to_design()
        with ProgressDisplay() as display:
            result = api.design(case, given=given, scenarios=tuple(args.scenario), options=options,
                                progress=None if args.quiet else display, compare=not args.no_compare,
                                prices=prices, files_next=True)
        print(result)
        for line in prices_text(result.parts):
            print(line)
        for path in api.write_results(result, out, figures=not args.no_figures):
            print(f"Wrote {path}")
    print(cautions_text())
    return EXIT_OK


def _interrupt(signum, frame):
    interrupt.request()  # read again after each solver call: the interrupt itself can be swallowed there
    raise KeyboardInterrupt


@contextmanager
def _terminate_as_interrupt():
    """SIGTERM raises KeyboardInterrupt, so a terminated run unwinds: it releases its output
    folder's lock and removes its staging files, as an interrupted one does."""
    if threading.current_thread() is not threading.main_thread():
        yield
        return
    previous = signal.signal(signal.SIGTERM, _interrupt)
    try:
        yield
    finally:
        signal.signal(signal.SIGTERM, previous)


class _ClosedReaderSafe:
    """Standard output that goes quiet when its reader closes the pipe, so that the run goes on."""

    def __init__(self, stream):
        self._stream = stream

    def _guarded(self, call, *args):
        try:
            return call(*args)
        except BrokenPipeError:
            # what is left to print goes nowhere; a later flush (at exit too) finds the null device
            os.dup2(os.open(os.devnull, os.O_WRONLY), self._stream.fileno())
            return None

    def write(self, text: str):
        return self._guarded(self._stream.write, text)

    def flush(self):
        return self._guarded(self._stream.flush)

    def __getattr__(self, name):
        return getattr(self._stream, name)


@contextmanager
def _output_to_a_closed_reader():
    """While the command runs, a reader that stops reading (`disteco design case.toml | head`) does not end it:
    it printed "internal error: BrokenPipeError" and wrote no files."""
    stream = sys.stdout
    sys.stdout = _ClosedReaderSafe(stream)
    try:
        yield
    finally:
        sys.stdout = stream


def _price_split_by_a_space(args, extra: list[str]) -> str | None:
    """What to say where a --price written with a space ("lp_steam=20 USD/GJ", unquoted) left its unit
    as a stray argument; None where the stray arguments are something else."""
    numbers = [p for p in getattr(args, "price", []) if re.search(r"=\s*[-+0-9.eE]+$", p)]
    if not numbers or not re.match(r"^[A-Za-z]{3}/", extra[0]):
        return None
    given = f"{numbers[-1]} {extra[0]}"
    return (f"'{numbers[-1]}' and '{extra[0]}' came as two arguments (allowed: the price without a space, "
            f"{given.replace(' ', '')}, or quoted: --price '{given}')")


def main(argv: list[str] | None = None) -> int:
    from ._base.errors import DistecoError

    parser = _parser()
    args, extra = parser.parse_known_args(argv)
    if extra:
        split = _price_split_by_a_space(args, extra)
        if split is None:
            parser.error(f"unrecognized arguments: {' '.join(extra)}")
        print(f"error: --price: {split}", file=sys.stderr)
        return EXIT_BAD_INPUT
    interrupt.clear()
    try:
        with _terminate_as_interrupt(), _output_to_a_closed_reader():
            return _run(args)
    except KeyboardInterrupt:
        interrupt.request()  # for run(): the process ends at once after an interrupt
        print("interrupted", file=sys.stderr)
        return EXIT_FAILURE
    except Exception as exc:
        if interrupt.requested():
            # the interrupt raised inside a library came back as another exception: Python 3.11 wraps what a
            # class body's __set_name__ raises in a RuntimeError (a run terminated while scipy imported)
            print("interrupted", file=sys.stderr)
            return EXIT_FAILURE
        if isinstance(exc, DistecoError):
            print(f"error: {_as_option(exc)}", file=sys.stderr)
            if isinstance(exc, ValueError):  # a user mistake or an infeasible request
                return EXIT_BAD_INPUT
            if getattr(args, "debug", False):
                traceback.print_exc()
            return EXIT_FAILURE
        print(f"internal error: {type(exc).__name__}: {exc}", file=sys.stderr)  # not the user's mistake
        if getattr(args, "debug", False):
            traceback.print_exc()
        else:
            print("rerun with --debug for the details and report it", file=sys.stderr)
        return EXIT_FAILURE


def run() -> None:
    """The console entry: exit with :func:`main`'s code.

    After an interrupt the process ends at once (streams flushed, its folder already released).
    CPython remembers a KeyboardInterrupt raised inside code it runs from a string (the
    dataclass machinery builds methods that way while modules import) even when the
    interrupt is caught, and then ends the process by SIGINT at exit: a terminated run
    printed "interrupted" and still exited -2 instead of 1 (6 of 20 runs terminated as soon as
    they had claimed their folder, measured).
    """
    code = main()
    if interrupt.requested():
        sys.stdout.flush()
        sys.stderr.flush()
        os._exit(code)
    sys.exit(code)


if __name__ == "__main__":
    run()

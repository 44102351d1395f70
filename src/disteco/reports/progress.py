"""Progress of a design run: its named steps, a time-left estimate from measured times, the display.

A run is a known list of steps (shortcut design; per scenario: the search, the checks on
thermo, the TAC-against-reflux curve; the cross pricing). :class:`ProgressPlan` times each
step as it ends and estimates what is left from those times: a step of a kind already run
is expected to take as long as the mean of its kind; a cross pricing (one configuration)
as long as one configuration of the searches took on average; checks and a curve not yet
measured as a measured share of the search (:data:`SHARE_OF_SEARCH`). Until a search has
ended there is nothing measured to go on and no estimate is given, rather than a wrong one.

:class:`ProgressDisplay` shows the steps on stderr: a bar (tqdm) in a terminal, one plain
line per step otherwise (a log file, a pipe), as before.
"""

from __future__ import annotations

import os
import shutil
import sys
import threading
import time
import weakref
from collections.abc import Callable
from dataclasses import dataclass

# Kinds of step; "search" steps report the configurations they solved. "checks" are the full checks
# on thermo of the reported design (with the energy-balance minimum reflux), "verify" the
# verification alone of another scenario's optimum (measured: 4 s against 0.1 s).
SHORTCUT, SEARCH, CHECKS, VERIFY, CURVE, PRICING = "shortcut", "search", "checks", "verify", "curve", "pricing"
REFRESH = 1.0  # s between redraws of the bar while a long step runs
# Expected time of a step not yet measured, as a share of the mean search time [-]. Measured
# (bench/bench_speed.py, four examples): the curve took 0.31-0.58 of the optimisation's CPU; on
# the benzene example the checks on thermo with the control margin's second search 4 s against
# a 5 s search.
SHARE_OF_SEARCH = {CURVE: 0.5, CHECKS: 0.8}


@dataclass(frozen=True)
class ProgressStep:
    """What a run is doing: step ``done + 1`` of ``total`` (``done == total`` at the end).

    ``seconds_left``: estimate of the time left at the start of this step [s]; None while
    nothing measured supports one.
    """

    what: str
    done: int
    total: int
    seconds_left: float | None = None


Progress = Callable[[ProgressStep], None]


def run_steps(scenarios: int, given: bool, compare: bool = False) -> list[str]:
    """The kinds of step of a run, in order: a given design is priced once, then checked, then
    (``compare``) the optimum under each scenario's prices is searched for."""
    if given:
        return [SHORTCUT, PRICING, CHECKS] + ([SEARCH] * scenarios if compare else [])
    others = [SEARCH, VERIFY, CURVE] * (scenarios - 1)
    return [SHORTCUT, SEARCH, CHECKS, CURVE] + others + [PRICING] * (scenarios * (scenarios - 1))


class ProgressPlan:
    """The steps of one run, timed as they end; tells ``report`` each step as it starts."""

    def __init__(self, kinds: list[str], report: Progress | None = None, clock=time.monotonic):
        self.kinds = kinds
        self.report = report or (lambda step: None)
        self.clock = clock
        self.measured: list[tuple[str, float, int]] = []  # (kind, seconds, configurations)
        self._started: float | None = None

    @property
    def done(self) -> int:
        return len(self.measured)

    def start(self, what: str) -> None:
        """Step ``done + 1`` begins."""
        self._started = self.clock()
        self.report(ProgressStep(what, self.done, len(self.kinds), self.seconds_left()))

    def finish(self, configurations: int = 0) -> None:
        """The running step ended; a search says how many configurations it solved."""
        seconds = self.clock() - self._started if self._started is not None else 0.0
        self.measured.append((self.kinds[self.done], seconds, configurations))
        self._started = None

    def end(self, what: str = "done") -> None:
        """The run is over: the counter reaches its total."""
        self.report(ProgressStep(what, len(self.kinds), len(self.kinds), 0.0))

    def expected(self, kind: str) -> float | None:
        """Expected seconds of a step of ``kind`` from the steps measured so far."""
        same = [seconds for k, seconds, _ in self.measured if k == kind]
        if same:
            return sum(same) / len(same)
        if kind == VERIFY:
            return 0.0  # one stage-by-stage solve, a fraction of a second: no basis needed
        if kind == PRICING:
            searched = [(seconds, n) for k, seconds, n in self.measured if k == SEARCH and n > 0]
            if searched:
                return sum(s for s, _ in searched) / sum(n for _, n in searched)
        searches = [seconds for k, seconds, _ in self.measured if k == SEARCH]
        if kind in SHARE_OF_SEARCH and searches:
            return SHARE_OF_SEARCH[kind] * sum(searches) / len(searches)
        return None

    def seconds_left(self) -> float | None:
        """Expected seconds of the steps not yet ended, or None when one has no measured basis."""
        left = 0.0
        for kind in self.kinds[self.done:]:
            expected = self.expected(kind)
            if expected is None:
                return None
            left += expected
        return left


# Displays whose ticker thread may be writing: a fork (the solver's worker processes, the curve's
# process) waits until none is, so no child starts with the stream's lock held by a thread it lacks.
_LIVE_DISPLAYS: weakref.WeakSet = weakref.WeakSet()


def _before_fork() -> None:
    for display in list(_LIVE_DISPLAYS):
        display._lock.acquire()


def _after_fork() -> None:
    for display in list(_LIVE_DISPLAYS):
        if display._lock.locked():
            display._lock.release()


if hasattr(os, "register_at_fork"):
    os.register_at_fork(before=_before_fork, after_in_parent=_after_fork, after_in_child=_after_fork)


def _duration(seconds: float) -> str:
    seconds = round(seconds)
    return f"{seconds // 60} min {seconds % 60:02d} s" if seconds >= 60 else f"{seconds} s"


class ProgressDisplay:
    """Shows :class:`ProgressStep` reports on ``stream``: a bar in a terminal, plain lines otherwise.

    Use as a context manager, so the bar is closed (and its line ended) whatever happens.
    """

    def __init__(self, stream=None, bar: bool | None = None, clock=time.monotonic):
        self.stream = stream if stream is not None else sys.stderr
        self.bar_wanted = self.stream.isatty() if bar is None else bar
        self.clock = clock
        self.start = clock()
        self._bar = None
        self._step: ProgressStep | None = None
        self._step_start = self.start
        self._lock = threading.Lock()
        self._stop = threading.Event()
        self._ticker: threading.Thread | None = None

    def __enter__(self) -> ProgressDisplay:
        return self

    def __exit__(self, *exc) -> None:
        self.close()

    def left_text(self) -> str:
        """The time left now: the step's estimate less the time the step has run."""
        step = self._step
        if step is None or step.done >= step.total:
            return ""
        if step.seconds_left is None:
            return "time left not known yet"  # nothing measured for a step still to come
        left = step.seconds_left - (self.clock() - self._step_start)
        if left >= 1.0:
            return f"about {_duration(left)} left"
        # an estimate under a second is no delay: the TAC curve's step, drawn beside the checks, often ends so
        return "under a second left" if left >= 0.0 else "taking longer than estimated"

    def __call__(self, step: ProgressStep) -> None:
        with self._lock:
            self._step, self._step_start = step, self.clock()
            if self.bar_wanted:
                self._show_bar(step)
            else:
                elapsed = self.clock() - self.start
                left = self.left_text()
                print(f"[{step.done}/{step.total}] {step.what} (elapsed {_duration(elapsed)}"
                      f"{', ' + left if left else ''})", file=self.stream, flush=True)

    def _show_bar(self, step: ProgressStep) -> None:
        if self._bar is None:
            from tqdm import tqdm

            # A terminal that reports no size (some pseudo-terminals) would get no bar at all: 100 x 24 then.
            size = shutil.get_terminal_size((100, 24))
            self._bar = tqdm(total=step.total, file=self.stream, unit="step", ncols=size.columns, nrows=size.lines,
                             desc=step.what, initial=step.done, postfix=self.left_text(), leave=True,
                             bar_format="{desc} |{bar}| {n_fmt}/{total_fmt} steps [{elapsed}{postfix}]")
            self._ticker = threading.Thread(target=self._tick, daemon=True)
            _LIVE_DISPLAYS.add(self)
            self._ticker.start()
        self._bar.n = step.done
        self._bar.set_description_str(step.what, refresh=False)
        self._bar.set_postfix_str(self.left_text(), refresh=False)
        self._bar.refresh()

    def _tick(self) -> None:
        """Redraw the bar every second, so elapsed and left time move during a long step."""
        while not self._stop.wait(REFRESH):
            with self._lock:
                if self._bar is not None:
                    self._bar.set_postfix_str(self.left_text(), refresh=False)
                    self._bar.refresh()

    def close(self) -> None:
        self._stop.set()
        if self._ticker is not None:
            self._ticker.join()
            _LIVE_DISPLAYS.discard(self)
        with self._lock:
            if self._bar is not None:
                self._bar.close()
                self._bar = None

"""Progress of a run: the named steps, the time-left estimate from measured times, the display."""

from __future__ import annotations

import io
import os
import threading
import time

import pytest

from disteco.reports.progress import (CHECKS, CURVE, PRICING, SEARCH, SHORTCUT, VERIFY, ProgressDisplay,
                                      ProgressPlan, ProgressStep, run_steps)


class Clock:
    """A clock the test moves by hand [s]."""

    def __init__(self):
        self.now = 0.0

    def __call__(self) -> float:
        return self.now


def test_steps_of_a_run():
    assert run_steps(1, given=False) == [SHORTCUT, SEARCH, CHECKS, CURVE]
    assert run_steps(3, given=False).count(PRICING) == 6  # every design under the other two price sets
    assert run_steps(2, given=False)[4:7] == [SEARCH, VERIFY, CURVE]  # the full checks on the first only
    assert run_steps(2, given=True) == [SHORTCUT, PRICING, CHECKS]


def test_estimate_from_measured_times_and_counter_reaching_total():
    clock, seen = Clock(), []
    plan = ProgressPlan(run_steps(2, given=False), seen.append, clock)
    plan.start("shortcut")
    clock.now += 2.0
    plan.finish()
    plan.start("search a")
    clock.now += 40.0
    plan.finish(configurations=20)  # 2 s per configuration
    plan.start("checks a")
    # checks and curve not measured yet: their measured shares of the 40 s search; the second
    # search 40 s, its curve 0.5 x 40, two cross pricings of one configuration (2 s)
    assert seen[-1].seconds_left == pytest.approx(0.8 * 40 + 0.5 * 40 + 40 + 0.0 + 0.5 * 40 + 2 * 2.0)
    clock.now += 10.0
    plan.finish()
    plan.start("curve a")
    clock.now += 30.0
    plan.finish()
    plan.start("search b")
    # search 40 + verification (no estimate needed) + curve 30 + two cross pricings of one configuration (2 s)
    assert seen[-1].seconds_left == pytest.approx(40.0 + 0.0 + 30.0 + 2 * 2.0)
    for what in ("search b", "checks b", "curve b", "cross 1", "cross 2"):
        if what != "search b":
            plan.start(what)
        clock.now += 1.0
        plan.finish(configurations=5 if what == "search b" else 0)
    plan.end()
    assert [s.done for s in seen] == list(range(len(plan.kinds))) + [len(plan.kinds)]
    assert seen[-1] == ProgressStep("done", 9, 9, 0.0)
    assert seen[1].seconds_left is None and seen[0].total == 9


def test_plain_lines_when_not_a_terminal():
    clock, stream = Clock(), io.StringIO()
    with ProgressDisplay(stream, clock=clock) as display:
        display(ProgressStep("searching under 'reference'", 1, 4, None))
        clock.now = 75.0
        display(ProgressStep("TAC against reflux ratio under 'reference'", 3, 4, 130.0))
        display(ProgressStep("done", 4, 4, 0.0))
    lines = stream.getvalue().splitlines()
    assert lines[0] == "[1/4] searching under 'reference' (elapsed 0 s, time left not known yet)"
    assert lines[1] == "[3/4] TAC against reflux ratio under 'reference' (elapsed 1 min 15 s, about 2 min 10 s left)"
    assert lines[2] == "[4/4] done (elapsed 1 min 15 s)"


def test_bar_in_a_terminal_counts_down_and_reaches_its_total():
    clock, stream = Clock(), io.StringIO()
    with ProgressDisplay(stream, bar=True, clock=clock) as display:
        display(ProgressStep("searching", 1, 4, 100.0))
        clock.now = 40.0
        assert display.left_text() == "about 1 min 00 s left"
        clock.now = 99.5
        assert display.left_text() == "under a second left"
        clock.now = 120.0
        assert display.left_text() == "taking longer than estimated"
        display(ProgressStep("done", 4, 4, 0.0))
        assert display._bar.n == 4
    shown = stream.getvalue()
    assert "4/4 steps" in shown and "searching" in shown and "|" in shown


@pytest.mark.skipif(not hasattr(os, "fork"), reason="the platform does not fork")
def test_a_fork_waits_for_the_bars_redraw_and_leaves_its_lock_free():
    """Worker and curve processes are forked while the bar's ticker thread redraws it: the fork holds
    the bar's lock, so the child never starts with the lock (and the stream) held by a thread it does
    not have; after the fork the lock is free in both processes."""
    clock, stream = Clock(), io.StringIO()
    with ProgressDisplay(stream, bar=True, clock=clock) as display:
        display(ProgressStep("searching", 1, 4, 100.0))
        redrawing = threading.Event()

        def redraw():  # a redraw that holds the lock when the fork comes
            with display._lock:
                redrawing.set()
                time.sleep(0.3)

        painter = threading.Thread(target=redraw)
        painter.start()
        redrawing.wait()
        pid = os.fork()
        if pid == 0:  # the child: its copy of the lock must be free (without the guard it is held for ever)
            os._exit(0 if display._lock.acquire(timeout=2.0) else 1)
        _, status = os.waitpid(pid, 0)
        assert os.waitstatus_to_exitcode(status) == 0
        painter.join()
        assert display._lock.acquire(timeout=2.0)
        display._lock.release()

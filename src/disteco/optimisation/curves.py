"""TAC against reflux ratio, each point a column with its stages and feed stage at their best.

Every configuration (N, NF) the search solves is a point of this curve: the model gives its
lowest-TAC reflux ratio. For each stage count the point is the feed stage with the lowest
TAC; more stages need less reflux, so the points run from the many-stage, low-reflux side
to the few-stage, high-reflux side. The search leaves points near the optimum; the curve adds
stage counts on both sides, in steps that widen away from the optimum (points denser near
the minimum), each with the better of the two feed stages around its neighbour's feed
position. Every added configuration starts from the solved profile of its nearest solved
neighbour, and all of them are the optimiser's own model on the optimum's cost basis, so the
curve passes through the optimum.
"""

from __future__ import annotations

import contextlib
import math
import multiprocessing
import pickle
import signal
import time
from collections.abc import Callable, Sequence
from dataclasses import dataclass, replace

from .._base.cores import can_fork, usable_cores
from ..case import Case
from ..costing.data import CostData
from ..properties import FeedState, Mixture
from ..sizing.options import SizingOptions
from ..stages.shortcut import ShortcutPoint
from .design import model_cost_basis, resolved_problem
from .options import barrier_order, first_strategy, model_options
from .results import DesignEvaluation, OptimumDesign
from .search import Evaluator, worker_pool
from .start import shortcut, stage_floor

CURVE_FACTORS = (1.1, 1.3, 1.5, 2.0)  # R / Rmin of the stages layer's table rows: the largest ends the curve
MORE_STAGES_FACTOR = 1.8  # the curve's most stages, as a multiple of the optimum's (common practice, no source)
# Towards more stages the reflux settles on its minimum: the curve ends when a step of stages
# lowers it by less than this share (the TAC only climbs with the capital beyond).
FLAT_REFLUX = 2e-3
HIGHEST_REFLUX_FACTOR = 2.0  # without a table: the curve's highest reflux as a multiple of the minimum
# The curve's first step in stages, and its growth, is one per this many stages of the optimum: a
# 139-stage splitter stepped one stage at a time took 37 points (68 solves, more than its search).
STAGES_PER_STEP = 30
# The curve's solves stop after the optimisation's own wall time (its search rounds), at least
# this long [s]: the curve shows the trade-off around a design already found and should not cost
# more than finding it (a twenty-component column's curve took 207 s after a 128 s search).
CURVE_TIME_FLOOR = 30.0


def reflux_curve(case: Case, mixture: Mixture, feed: FeedState, data: CostData, optimum: OptimumDesign,
                 table: Sequence[ShortcutPoint], options=None, sizing: SizingOptions = SizingOptions(),
                 scenario: str | None = None, factors: tuple[float, ...] = CURVE_FACTORS,
                 notes: list[str] | None = None) -> tuple[DesignEvaluation, ...]:
    """Designs along the reflux ratio, the optimum among them, sorted by reflux ratio.

    Towards fewer stages the curve goes on until the reflux reaches the highest of the
    ``table``'s rows at ``factors`` x the minimum reflux (the stages layer's reflux-stages
    trade-off), down to that row's stages at most, or until no column is feasible; towards
    more stages until the reflux settles (:data:`FLAT_REFLUX`), up to
    ``MORE_STAGES_FACTOR`` x the optimum's stages within the stage bound; the points found within
    :func:`curve_time` are kept, and a note saying the curve was cut is appended to ``notes``.
    """
    config = model_options(options)
    problem = resolved_problem(case, mixture, feed, config)  # also sets the stage bound
    basis = optimum.basis  # the optimum's settled basis, so that the curve passes through it
    if basis is None:
        basis, _ = model_cost_basis(problem, mixture, data, replace(sizing, light_key=problem.light_key,
                                                                    heavy_key=problem.heavy_key),
                                    scenario, case.economics.cost_year, config)
    else:
        problem = optimum.problem
    best = optimum.best
    if best.solver.barrier:  # try first the barrier strategy that solved the optimum
        config.barrier_strategies = first_strategy(best.solver.barrier, barrier_order(config, len(problem.z)))
    rows = [row for row in table if any(abs(row.reflux_factor - f) < 1e-9 for f in factors)]
    top = max(rows, key=lambda row: row.reflux_ratio) if rows else None
    highest = top.reflux_ratio if top else HIGHEST_REFLUX_FACTOR * optimum.minimum_reflux_ratio
    allowed = curve_time(optimum, config)
    evaluator = Evaluator(problem, basis, config, time.perf_counter() + allowed,
                          low=stage_floor(shortcut(problem), config))
    evaluator.seed(optimum.solved or (best,))
    evaluator.strategies = config.barrier_strategies
    most = min(config.max_stages, math.ceil(MORE_STAGES_FACTOR * best.stages))
    fewest = max(evaluator.low, top.whole_stages if top else evaluator.low)  # the table's stages at that reflux
    unit = max(1, round(best.stages / STAGES_PER_STEP))
    with worker_pool(config) as evaluator.pool:
        try:
            _extend(evaluator, -1, fewest, lambda last, new: new.reflux_ratio >= highest, unit)
            _extend(evaluator, +1, most,
                    lambda last, new: last.reflux_ratio - new.reflux_ratio < unit * FLAT_REFLUX * new.reflux_ratio,
                    unit)
        except TimeoutError:  # the curve keeps the points found within its time
            if notes is not None:
                # a time limit below the floor caps the curve too ("cut after 0 s (..., at least 30 s)" read before)
                why = ("the search's time limit, --time-limit" if allowed >= config.time_limit else
                       f"the optimisation's own time, at least {CURVE_TIME_FLOOR:g} s")
                notes.append(f"the TAC-against-reflux curve{f' of {scenario!r}' if scenario else ''} was cut after "
                             f"{allowed:.3g} s ({why}): it shows {len({n for n, _ in evaluator.evaluations})} stage "
                             "counts around the optimum")
    return along_reflux(evaluator.evaluations.values())


# The curve waiting in a forked process to be computed there: set just before the fork, so the child
# finds it in its copy of this module and nothing (the mixture with thermo's objects) is pickled.
_PENDING: dict[str, Callable[[], tuple]] = {}
CHILD_GRACE = 5.0  # s a cancelled curve's process gets to unwind before it is killed


@dataclass
class CurveJob:
    """A TAC-against-reflux curve computed beside the work that follows the search.

    The curve is drawn around the search's optimum and reads nothing the thermo checks or the
    control margin's second search produce, so where the platform forks and the machine has more
    than one core (the options allowing more than one worker) it runs in a child process meanwhile
    (:func:`start_curve`); else in place when :meth:`designs` asks for it. Used as a context
    manager: leaving the block early (an error, an interrupt) stops the child.
    """

    run: Callable[[], tuple]  # () -> (designs, notes, new mixture notes)
    mixture: Mixture
    process: multiprocessing.Process | None = None
    reader: object | None = None  # the pipe's end the child's result comes through

    def designs(self, notes: list[str] | None = None) -> tuple[DesignEvaluation, ...]:
        """The curve's designs; its notes appended to ``notes`` and the mixture notes it added
        (in the child) recorded on the mixture."""
        outcome = None
        if self.process is not None:
            try:
                outcome = self.reader.recv()
            except (EOFError, OSError, pickle.UnpicklingError):  # the child died or sent what cannot be read
                outcome = None
            finally:
                # a child that sent its curve is ending on its own: terminating it then raced its exit
                self.cancel(wait=CHILD_GRACE if outcome is not None else 0.0)
        if outcome is None:  # in place: also what reproduces a failure of the child in this process
            designs, found, _ = self.run()
            mixture_notes = ()  # noted on the mixture here
        else:
            designs, found, mixture_notes = outcome
        for text in mixture_notes:
            if text not in self.mixture.warnings:
                self.mixture.note(text, text)
        if notes is not None:
            notes.extend(found)
        return designs

    @property
    def beside(self) -> bool:
        """Whether the curve is still being computed in its child process."""
        return self.process is not None and self.process.is_alive()

    def cancel(self, wait: float = 0.0) -> None:
        """Stop the child (if any) and wait for it to go; ``wait`` [s]: first let it end on its own that long."""
        if self.process is None:
            return
        if wait > 0.0:
            self.process.join(wait)
        if self.process.is_alive():
            self.process.terminate()  # the run's own SIGTERM handling: the child unwinds
            self.process.join(CHILD_GRACE)
            if self.process.is_alive():
                self.process.kill()
        self.process.join()
        self.reader.close()
        self.process = None

    def __enter__(self) -> CurveJob:
        return self

    def __exit__(self, *exc) -> None:
        self.cancel()


def _curve_with_notes(mixture: Mixture, *args, **kwargs) -> tuple:
    before = set(mixture.warnings)
    notes: list[str] = []
    designs = reflux_curve(*args, notes=notes, **kwargs)
    return designs, notes, tuple(w for w in mixture.warnings if w not in before)


def _curve_child(key: str, writer) -> None:
    """The child's work: the pending curve, sent back whole; nothing on a failure (the parent then
    draws the curve itself and meets the failure in its own process)."""
    try:
        outcome = _PENDING.pop(key)()
        # done: a cancel from now on ends the process as is (unwinding it printed a traceback of the
        # interrupt raised inside the pipe's close)
        signal.signal(signal.SIGTERM, signal.SIG_DFL)
        writer.send(outcome)
    except BaseException:  # noqa: BLE001 - reported by the parent's own run; an interrupt ends the child quietly
        pass
    finally:
        with contextlib.suppress(BaseException):
            writer.close()


def start_curve(case: Case, mixture: Mixture, feed: FeedState, data: CostData, optimum: OptimumDesign,
                table: Sequence[ShortcutPoint], options=None, sizing: SizingOptions = SizingOptions(),
                scenario: str | None = None) -> CurveJob:
    """Start :func:`reflux_curve` of ``optimum`` beside the caller's next work (see :class:`CurveJob`).

    Measured on 2 cores, the same curves and TACs either way (DEVELOPERS.md, Speed): the benzene
    example's work after the search 2.64 -> 2.01 s and 3.51 -> 2.32 s (two pairs of runs), the
    depentaniser's 13.2 -> 10.0 s.
    """
    def run() -> tuple:
        return _curve_with_notes(mixture, case, mixture, feed, data, optimum, table, options, sizing, scenario)

    config = model_options(options)
    # the machine's cores, not its load: the load average still counts the search just finished
    workers = config.workers if config.workers is not None else usable_cores()
    if workers <= 1 or not can_fork():
        return CurveJob(run, mixture)
    context = multiprocessing.get_context("fork")
    key = f"{scenario}:{id(optimum)}"
    reader, writer = context.Pipe(duplex=False)
    _PENDING[key] = run
    try:
        process = context.Process(target=_curve_child, args=(key, writer), name="disteco-curve")
        process.start()
    finally:
        _PENDING.pop(key, None)  # the child has its own copy
        writer.close()
    return CurveJob(run, mixture, process, reader)


def curve_time(optimum: OptimumDesign, config) -> float:
    """Seconds the curve's solves may take: the optimisation's wall time, at least
    :data:`CURVE_TIME_FLOOR`, at most the options' time limit."""
    return min(config.time_limit, max(CURVE_TIME_FLOOR, optimum.solver.wall_time))


def _extend(evaluator: Evaluator, direction: int, bound: int, far_enough, unit: int = 1) -> None:
    """Add stage counts beyond the solved ones in ``direction`` (-1 fewer, +1 more) up to ``bound``.

    The gap between stage counts starts at ``unit`` and grows by ``unit`` every second point, so
    the points are densest near the optimum; ``far_enough(last, new)`` ends the walk. At each stage count the feed
    stage is the better of the two around the last point's feed position (:func:`_feed_between`).
    """
    known = sorted({n for n, _ in evaluator.evaluations})
    last = _best_of(evaluator, known[0] if direction < 0 else known[-1])
    step, count = unit, 0
    while last is not None and (last.stages - bound) * direction < 0:
        stages = last.stages + direction * step
        stages = max(stages, bound) if direction < 0 else min(stages, bound)
        feed = _feed_between(evaluator, stages, 1 + (last.feed_stage - 1) / (last.stages - 1) * (stages - 1))
        if feed is None:
            return
        new = evaluator.evaluations[(stages, feed)]
        if far_enough(last, new):
            return
        last, count = new, count + 1
        step += unit * (count % 2 == 0)


def _feed_between(evaluator: Evaluator, stages: int, position: float) -> int | None:
    """The cheaper of the two whole feed stages around ``position`` (None when neither is feasible).

    The feed position is carried from the nearest point at the same share of the column; its
    best whole stage is one of the two around it (measured on the benzene example: the best
    feed share stays within 0.41-0.50 over 15 to 42 stages). A full line search would cost a
    third solve at every point for a TAC change of about 0.01 %.
    """
    feeds = sorted({min(max(math.floor(position) + k, 2), stages - 1) for k in (0, 1)})
    costs = {feed: tac for (_, feed), tac in evaluator.tac_all([(stages, feed) for feed in feeds]).items()}
    feed = min(costs, key=costs.get)
    return None if costs[feed] == float("inf") else feed


def _best_of(evaluator: Evaluator, stages: int) -> DesignEvaluation | None:
    feeds = [d for (n, _), d in evaluator.evaluations.items() if n == stages]
    return min(feeds, key=lambda d: d.tac) if feeds else None


def along_reflux(designs) -> tuple[DesignEvaluation, ...]:
    """The lowest-TAC design of each stage count, sorted by reflux ratio, keeping the reflux falling as stages rise.

    A stage count whose best reflux is not below that of fewer stages adds no information
    about the trade-off (a flat stretch near a bound) and is left out.
    """
    best: dict[int, DesignEvaluation] = {}
    for design in designs:
        if design.stages not in best or design.tac < best[design.stages].tac:
            best[design.stages] = design
    kept: list[DesignEvaluation] = []
    for stages in sorted(best):
        if not kept or best[stages].reflux_ratio < kept[-1].reflux_ratio:
            kept.append(best[stages])
    return tuple(sorted(kept, key=lambda d: d.reflux_ratio))

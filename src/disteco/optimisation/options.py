"""Typed options of the optimiser (a Pyomo ConfigDict), with defaults that work from pip alone."""

from __future__ import annotations

import math

from pyomo.common.config import Bool, ConfigDict, ConfigValue

from .._base.errors import CaseError

SOLVERS = ("ripopt", "ipopt", "scip_direct")


BARRIER_STRATEGIES = ("monotone", "adaptive")


def _strategies(value) -> tuple[str, ...]:
    """A non-empty tuple of known barrier strategies."""
    names = (value,) if isinstance(value, str) else tuple(value)
    unknown = [n for n in names if n not in BARRIER_STRATEGIES]
    if not names or unknown:
        raise ValueError(f"barrier_strategies: {unknown or 'empty'} not among {BARRIER_STRATEGIES}")
    return names


class Number:
    """A ConfigDict domain: a finite number (optionally a whole one) at or above ``low`` (above it if ``strict``).

    Pyomo's own numeric domains accept NaN and give multi-line messages; this one says in one
    phrase what is allowed (``allowed``), which the options' errors quote.
    """

    def __init__(self, low: float, strict: bool, whole: bool = False, unit: str = ""):
        self.low, self.strict, self.whole = low, strict, whole
        kind = "a whole number" if whole else "a finite number"
        self.allowed = f"{kind} {'above' if strict else 'at least'} {low:g}{unit}"

    def __call__(self, value):
        if isinstance(value, bool) or not isinstance(value, (int, float)):
            raise ValueError(self.allowed)
        number = float(value)
        if not math.isfinite(number) or number < self.low or (self.strict and number == self.low):
            raise ValueError(self.allowed)
        if self.whole:
            if number != int(number):
                raise ValueError(self.allowed)
            return int(number)
        return number


def _optional(domain: Number):
    """``domain``, or None (the default is then worked out from the problem)."""
    def cast(value):
        return None if value is None else domain(value)
    return cast


SECONDS = Number(0.0, strict=True, unit=" s")
POSITIVE = Number(0.0, strict=True)
NON_NEGATIVE = Number(0.0, strict=False)
COUNT = Number(1, strict=False, whole=True)
STAGE_COUNT = Number(3, strict=False, whole=True)  # a tray above the feed, the feed stage and the reboiler


def first_strategy(strategy: str, order) -> tuple[str, ...]:
    """``order`` of barrier strategies with ``strategy`` moved to the front."""
    return (strategy,) + tuple(b for b in order if b != strategy)


def barrier_order(config, components: int) -> tuple[str, ...]:
    """The barrier strategies to try, in order: the options' own, else by the number of components.

    Measured: monotone solves the binaries fastest, adaptive the five-component example; on a
    twenty-component debutaniser (17 stages) monotone stalled at 300 iterations from every
    start tried while adaptive converged in 18, so mixtures start with adaptive.
    """
    if config.barrier_strategies is not None:
        return tuple(config.barrier_strategies)
    return ("monotone", "adaptive") if components <= 2 else ("adaptive", "monotone")


def _options() -> ConfigDict:
    config = ConfigDict("disteco optimiser options")
    config.declare("solver", ConfigValue(default="ripopt", domain=str,
                                         description="Pyomo NLP solver for each fixed configuration"))
    config.declare("time_limit", ConfigValue(default=120.0, domain=SECONDS,
                                             description="wall-clock limit of the whole search [s]"))
    config.declare("relative_gap", ConfigValue(default=1e-4, domain=NON_NEGATIVE,
                                               description="relative optimality gap asked of a certifying solver [-]"))
    config.declare("energy_balances", ConfigValue(
        default=True, domain=Bool,
        description="stage energy balances; False: constant molar overflow (measured: no faster with ripopt)"))
    config.declare("reflux_min", ConfigValue(default=0.01, domain=POSITIVE, description="lowest reflux ratio [-]"))
    config.declare("reflux_max", ConfigValue(default=50.0, domain=POSITIVE, description="highest reflux ratio [-]"))
    config.declare("min_stages", ConfigValue(default=3, domain=STAGE_COUNT,
                                             description="fewest equilibrium stages, reboiler included"))
    config.declare("max_stages", ConfigValue(
        default=None, domain=_optional(STAGE_COUNT),
        description="most equilibrium stages, reboiler included; None: a multiple of the Fenske minimum "
                    "(see disteco.optimisation.problem.default_max_stages)"))
    config.declare("configuration_time_limit", ConfigValue(
        default=5.0, domain=SECONDS,
        description="wall-clock limit of one configuration's NLP [s]; a configuration that hits it counts as "
                    "infeasible (measured: feasible ones take 0.05-0.6 s)"))
    config.declare("max_iterations", ConfigValue(default=300, domain=COUNT,
                                                 description="iteration limit of each NLP solve"))
    config.declare("barrier_strategies", ConfigValue(
        default=None, domain=lambda value: None if value is None else _strategies(value),
        description="barrier-parameter updates (interior-point mu_strategy) tried in turn on a configuration; "
                    "the one that last worked goes first; None: by the mixture (see barrier_order)"))
    config.declare("quick_iterations", ConfigValue(
        default=50, domain=COUNT,
        description="iteration limit of an attempt that has another strategy behind it"))
    config.declare("quick_time_limit", ConfigValue(
        default=1.0, domain=SECONDS,
        description="wall-clock limit of an attempt that has another strategy behind it [s] (measured: one "
                    "stalling try took 5.8 s for its 50 iterations)"))
    config.declare("shortfall_penalty", ConfigValue(
        default=10.0, domain=POSITIVE,
        description="objective charge per unit relative shortfall of a product specification, in multiples "
                    "of the start's TAC [-]; must exceed the relative TAC saved per relative shortfall"))
    config.declare("shortfall_tolerance", ConfigValue(
        default=1e-6, domain=POSITIVE, description="relative shortfall accepted as meeting a specification [-]"))
    config.declare("certify", ConfigValue(default=False, domain=Bool,
                                          description="certify the best configuration with a global solver"))
    config.declare("certify_solver", ConfigValue(default="scip_direct", domain=str))
    config.declare("certify_time_limit", ConfigValue(default=30.0, domain=SECONDS, description="[s]"))
    config.declare("workers", ConfigValue(
        default=None, domain=_optional(COUNT),
        description="worker processes solving independent configurations side by side (neighbours, feed "
                    "stages tried together, the curve's feed stages); None: the cores not busy with other "
                    "work, at most 4; 1: all in this process. Results are the same either way"))
    config.declare("tee", ConfigValue(default=False, domain=Bool, description="print solver logs"))
    return config


OPTIONS = _options()


def model_options(options=None) -> ConfigDict:
    """A fresh options block; ``options`` may be a dict or a ConfigDict of overrides.

    Raises :class:`CaseError` naming the option (as its field) for an unknown name or a value
    outside what the option allows.
    """
    config = OPTIONS()
    if options is None:
        return config
    if isinstance(options, ConfigDict):
        config.set_value(options)
        return config
    for name, value in options.items():
        if name not in config:
            raise CaseError(name, "unknown optimiser option", ", ".join(config.keys()))
        try:
            config[name] = value
        except ValueError as exc:
            allowed = str(exc).rsplit("Error: ", 1)[-1].strip()  # the domain's own one-line reason
            raise CaseError(name, f"{value!r} is not allowed", allowed, value) from None
    return config


__all__ = ["OPTIONS", "SOLVERS", "Number", "barrier_order", "first_strategy", "model_options"]

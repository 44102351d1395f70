"""Typed options of the optimiser (a Pyomo ConfigDict), with defaults that work from pip alone."""

from __future__ import annotations

from pyomo.common.config import Bool, ConfigDict, ConfigValue, NonNegativeFloat, PositiveFloat, PositiveInt

SOLVERS = ("ripopt", "ipopt", "scip_direct")


BARRIER_STRATEGIES = ("monotone", "adaptive")


def _strategies(value) -> tuple[str, ...]:
    """A non-empty tuple of known barrier strategies."""
    names = (value,) if isinstance(value, str) else tuple(value)
    unknown = [n for n in names if n not in BARRIER_STRATEGIES]
    if not names or unknown:
        raise ValueError(f"barrier_strategies: {unknown or 'empty'} not among {BARRIER_STRATEGIES}")
    return names


def first_strategy(strategy: str, order) -> tuple[str, ...]:
    """``order`` of barrier strategies with ``strategy`` moved to the front."""
    return (strategy,) + tuple(b for b in order if b != strategy)


def _options() -> ConfigDict:
    config = ConfigDict("disteco optimiser options")
    config.declare("solver", ConfigValue(default="ripopt", domain=str,
                                         description="Pyomo NLP solver for each fixed configuration"))
    config.declare("time_limit", ConfigValue(default=120.0, domain=PositiveFloat,
                                             description="wall-clock limit of the whole search [s]"))
    config.declare("relative_gap", ConfigValue(default=1e-4, domain=NonNegativeFloat,
                                               description="relative optimality gap asked of a certifying solver [-]"))
    config.declare("energy_balances", ConfigValue(
        default=True, domain=Bool,
        description="stage energy balances; False: constant molar overflow (measured: no faster with ripopt)"))
    config.declare("reflux_min", ConfigValue(default=0.01, domain=PositiveFloat, description="lowest reflux ratio [-]"))
    config.declare("reflux_max", ConfigValue(default=50.0, domain=PositiveFloat, description="highest reflux ratio [-]"))
    config.declare("min_stages", ConfigValue(default=3, domain=PositiveInt,
                                             description="fewest equilibrium stages, reboiler included"))
    config.declare("max_stages", ConfigValue(default=60, domain=PositiveInt,
                                             description="most equilibrium stages, reboiler included"))
    config.declare("configuration_time_limit", ConfigValue(
        default=5.0, domain=PositiveFloat,
        description="wall-clock limit of one configuration's NLP [s]; a configuration that hits it counts as "
                    "infeasible (measured: feasible ones take 0.05-0.6 s)"))
    config.declare("max_iterations", ConfigValue(default=300, domain=PositiveInt,
                                                 description="iteration limit of each NLP solve"))
    config.declare("barrier_strategies", ConfigValue(
        default=("monotone", "adaptive"), domain=_strategies,
        description="barrier-parameter updates (interior-point mu_strategy) tried in turn on a configuration; "
                    "the one that last worked goes first (measured: monotone solves the binaries fastest, "
                    "adaptive the five-component example, see DEVELOPERS.md)"))
    config.declare("quick_iterations", ConfigValue(
        default=50, domain=PositiveInt,
        description="iteration limit of an attempt that has another strategy behind it"))
    config.declare("quick_time_limit", ConfigValue(
        default=1.0, domain=PositiveFloat,
        description="wall-clock limit of an attempt that has another strategy behind it [s] (measured: one "
                    "stalling try took 5.8 s for its 50 iterations)"))
    config.declare("shortfall_penalty", ConfigValue(
        default=10.0, domain=PositiveFloat,
        description="objective charge per unit relative shortfall of a product specification, in multiples "
                    "of the start's TAC [-]; must exceed the relative TAC saved per relative shortfall"))
    config.declare("shortfall_tolerance", ConfigValue(
        default=1e-6, domain=PositiveFloat, description="relative shortfall accepted as meeting a specification [-]"))
    config.declare("certify", ConfigValue(default=False, domain=Bool,
                                          description="certify the best configuration with a global solver"))
    config.declare("certify_solver", ConfigValue(default="scip_direct", domain=str))
    config.declare("certify_time_limit", ConfigValue(default=30.0, domain=PositiveFloat, description="[s]"))
    config.declare("tee", ConfigValue(default=False, domain=Bool, description="print solver logs"))
    return config


OPTIONS = _options()


def model_options(options=None) -> ConfigDict:
    """A fresh options block; ``options`` may be a dict or a ConfigDict of overrides."""
    config = OPTIONS()
    if options is not None:
        config.set_value(options)
    return config


__all__ = ["OPTIONS", "SOLVERS", "first_strategy", "model_options"]

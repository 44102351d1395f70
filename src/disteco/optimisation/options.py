"""Typed options of the optimiser, with defaults that work from pip alone.

A small record of declared options, each with a default, a domain that checks and converts a
value, and a description. Pyomo's ConfigDict did this before; importing it made Pyomo's
dependency module import scipy.stats (scipy being loaded), 0.5 s of every `check` on a loaded
2-core machine, for options that need none of its other features (DEVELOPERS.md).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any, Callable

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


@dataclass(frozen=True)
class Option:
    """One declared option: its default, the domain that checks and converts a value, what it does."""

    default: Any
    domain: Callable[[Any], Any]
    description: str = ""


class Options:
    """Declared options and their values; reading and setting by attribute or by name.

    A value is set through its option's domain (a ValueError saying what is allowed); an
    undeclared name is a KeyError. Calling a block gives a fresh block of the defaults.
    """

    def __init__(self, declared: dict[str, Option], values: dict[str, Any] | None = None):
        object.__setattr__(self, "_declared", declared)
        object.__setattr__(self, "_values", dict(values) if values is not None else
                           {name: option.default for name, option in declared.items()})

    def __call__(self) -> "Options":
        return Options(self._declared)

    def __getattr__(self, name: str):
        if name.startswith("_"):  # not an option (and not set yet while unpickling)
            raise AttributeError(name)
        try:
            return self._values[name]
        except KeyError:
            raise AttributeError(f"no optimiser option {name!r}") from None

    def __setattr__(self, name: str, value) -> None:
        self[name] = value

    def __getitem__(self, name: str):
        return self._values[name]

    def __setitem__(self, name: str, value) -> None:
        if name not in self._declared:
            raise KeyError(f"no optimiser option {name!r}")
        self._values[name] = self._declared[name].domain(value)

    def __contains__(self, name: str) -> bool:
        return name in self._declared

    def keys(self):
        return self._declared.keys()

    def value(self) -> dict[str, Any]:
        """The values by name (a copy)."""
        return dict(self._values)

    def __reduce__(self):
        # the values alone cross to a worker process; its declarations are the module's own
        return _optimiser_options, (self.value(),)

    def set_value(self, other: "Options") -> None:
        """Take every value of ``other``."""
        for name, value in other.value().items():
            self[name] = value


def flag(value) -> bool:
    """A domain: true or false (also 1/0 and the words true/false, yes/no)."""
    if isinstance(value, bool):
        return value
    if isinstance(value, int) and value in (0, 1):
        return bool(value)
    if isinstance(value, str) and value.strip().lower() in ("true", "false", "yes", "no"):
        return value.strip().lower() in ("true", "yes")
    raise ValueError("true or false")


class Number:
    """A domain: a finite number (optionally a whole one) at or above ``low`` (above it if ``strict``).

    It says in one phrase what is allowed (``allowed``), which the options' errors quote.
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
    """``domain``, or None (the default is then worked out from the problem, or the solver's own)."""
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


def _options() -> Options:
    return Options({
        "solver": Option(default="ripopt", domain=str,
            description="Pyomo NLP solver for each fixed configuration"),
        "time_limit": Option(default=120.0, domain=SECONDS,
            description="wall-clock limit of the whole search [s]"),
        "relative_gap": Option(default=1e-4, domain=NON_NEGATIVE,
            description="relative optimality gap asked of a certifying solver [-]"),
        "energy_balances": Option(
            default=True, domain=flag,
            description="stage energy balances; False: constant molar overflow (measured: no faster with ripopt)"),
        "reflux_min": Option(default=0.01, domain=POSITIVE, description="lowest reflux ratio [-]"),
        "reflux_max": Option(default=50.0, domain=POSITIVE, description="highest reflux ratio [-]"),
        "min_stages": Option(default=3, domain=STAGE_COUNT,
            description="fewest equilibrium stages, reboiler included"),
        "max_stages": Option(
            default=None, domain=_optional(STAGE_COUNT),
            description="most equilibrium stages, reboiler included; None: a multiple of the minimum stages "
                        "(see disteco.optimisation.problem.default_max_stages)"),
        "configuration_time_limit": Option(
            default=5.0, domain=SECONDS,
            description="wall-clock limit of one configuration's NLP [s]; a configuration that hits it counts as "
                        "infeasible (measured: feasible ones take 0.05-0.6 s)"),
        "initial_barrier": Option(
            default=1e-4, domain=_optional(POSITIVE),
            description="barrier parameter an interior-point solve starts from (its 'mu_init'); None: the solver's "
                        "default (0.1). Every start is a converged profile or one built to be close to the "
                        "column's, so a small barrier keeps the iterate near it. Measured with one worker, same "
                        "optima: the configuration solves of the benzene example 7.5 -> 6.0 s, methanol-water "
                        "8.2 -> 7.1 s, the styrene column 21.8 -> 18.9 s, ethanol-water and the depentaniser "
                        "2 % faster, the deethaniser unchanged"),
        "nlp_tolerance": Option(
            default=1e-3, domain=_optional(POSITIVE),
            description="overall convergence tolerance of an interior-point solve (its 'tol'; the violation of "
                        "the equations and the complementarity keep the solver's own 1e-4); None: the solver's "
                        "default (1e-8). Measured: the examples' optima unchanged (the benzene example's TAC "
                        "1 USD/yr apart), the twenty-component design 0.76 x the wall time, its tries no longer "
                        "stalling a few iterations from the optimum"),
        "max_iterations": Option(default=300, domain=COUNT,
            description="iteration limit of each NLP solve"),
        "barrier_strategies": Option(
            default=None, domain=lambda value: None if value is None else _strategies(value),
            description="barrier-parameter updates (interior-point mu_strategy) tried in turn on a configuration; "
                        "the one that last worked goes first; None: by the mixture (see barrier_order)"),
        "quick_iterations": Option(
            default=50, domain=COUNT,
            description="iteration limit of an attempt that has another strategy behind it"),
        "quick_time_limit": Option(
            default=1.0, domain=SECONDS,
            description="wall-clock limit of an attempt that has another strategy behind it [s] (measured: one "
                        "stalling try took 5.8 s for its 50 iterations)"),
        "shortfall_penalty": Option(
            default=10.0, domain=POSITIVE,
            description="objective charge per unit relative shortfall of a product specification, in multiples "
                        "of the start's TAC [-]; must exceed the relative TAC saved per relative shortfall"),
        "shortfall_tolerance": Option(
            default=1e-6, domain=POSITIVE, description="relative shortfall accepted as meeting a specification [-]"),
        "certify": Option(default=False, domain=flag,
            description="certify the best configuration with a global solver"),
        "certify_solver": Option(default="scip_direct", domain=str),
        "certify_time_limit": Option(default=30.0, domain=SECONDS, description="[s]"),
        "workers": Option(
            default=None, domain=_optional(COUNT),
            description="worker processes solving independent configurations side by side (neighbours, feed "
                        "stages tried together, the curve's feed stages); None: the cores not busy with other "
                        "work, at most 4; 1: all in this process. Results are the same either way"),
        "tee": Option(default=False, domain=flag, description="print solver logs"),
    })


OPTIONS = _options()


def _optimiser_options(values: dict[str, Any]) -> Options:
    """An options block of :data:`OPTIONS`' declarations holding ``values`` (as checked when they were set)."""
    return Options(OPTIONS._declared, values)


def model_options(options=None) -> Options:
    """A fresh options block; ``options`` may be a dict or an options block of overrides.

    Raises :class:`CaseError` naming the option (as its field) for an unknown name or a value
    outside what the option allows.
    """
    config = OPTIONS()
    if options is None:
        return config
    if isinstance(options, Options):
        config.set_value(options)
        return config
    for name, value in options.items():
        if name not in config:
            raise CaseError(name, "unknown optimiser option", ", ".join(config.keys()))
        try:
            config[name] = value
        except ValueError as exc:  # the domain's own one-line reason
            raise CaseError(name, f"{value!r} is not allowed", str(exc).strip(), value) from None
    return config


__all__ = ["OPTIONS", "SOLVERS", "Number", "Option", "Options", "barrier_order", "first_strategy", "flag",
           "model_options"]

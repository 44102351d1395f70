"""The Python API: load a case, check it, run the design, write the results.

Engineers use this from notebooks and scripts; the command line is a thin layer over it.
"""

from __future__ import annotations

from pathlib import Path

from .case import Case, load_case
from .properties import Mixture, MixtureSummary, build_mixture, feed_state, summarise_mixture
from .reports.design_result import DesignResult
from .reports.files import write_json
from .reports.json_result import result_json

RESULT_FILE = "result.json"


def mixture_of(case: Case) -> Mixture:
    """The case's mixture (built once and cached)."""
    return build_mixture(case.components, case.thermo, case.column.top_pressure)


def check(case: Case) -> MixtureSummary:
    """Resolve the components and summarise the mixture at the column's top pressure."""
    mixture = mixture_of(case)
    return summarise_mixture(mixture, case.feed.composition, case.column.top_pressure,
                             case.products.light_key, case.products.heavy_key)


def design(case: Case) -> DesignResult:
    """Run the design of ``case``."""
    mixture = mixture_of(case)
    summary = check(case)
    feed = feed_state(case.feed, mixture, case.column.top_pressure)
    return DesignResult(case=case, mixture=summary, feed=feed)


def write_results(result: DesignResult, folder: str | Path) -> Path:
    """Write result.json into ``folder``; return its path."""
    path = Path(folder) / RESULT_FILE
    write_json(path, result_json(result))
    return path


__all__ = ["check", "design", "load_case", "mixture_of", "write_results"]

"""The utility prices a run used, on its cost year: console lines, a workbook table, result.json.

Every price is shown as given (value and year), the escalation factor that moved it to the
run's cost year and its price index, and who set it (the cost data, a case field, an option).
"""

from __future__ import annotations

from typing import TYPE_CHECKING

from ..costing.operating import ELECTRICITY, UtilityPrice
from .tables import Column, Table, text

if TYPE_CHECKING:  # the design parts pull in the optimiser; `check` prints prices without it
    from .tables_design import ReportParts


def run_prices(parts: ReportParts) -> tuple[UtilityPrice, ...]:
    """Every price of the scenarios run, moved to the run's cost year."""
    if parts.cost_data is None or parts.cost is None:
        return ()
    return scenario_prices(parts.cost_data, parts.scenarios_run, parts.cost.cost_year)


def scenario_prices(data, scenarios, year: int | None) -> tuple[UtilityPrice, ...]:
    """Every price of ``data`` (:class:`CostData`) in ``scenarios``, moved to ``year``."""
    return tuple(data.price(name, p.utility, year) for name in scenarios for p in data.prices if p.scenario == name)


def _as_given(p: UtilityPrice) -> str:
    if p.escalation_factor == 1.0 and p.given_year == p.year:
        return f"{p.price:.4g} {p.unit}"
    return f"{p.given_price:.4g} {p.unit} of {p.given_year} x {p.escalation_factor:.3f} ({p.price_index})"


def prices_text(parts: ReportParts) -> list[str]:
    """Console lines: the cost year, each price the user set, and each escalated price the design uses."""
    prices = run_prices(parts)
    if not prices:
        return []
    used = {u.utility for u in parts.cost.utilities}
    shown = [p for p in prices if p.set_by is not None or p.utility in used and (p.given_year != p.year or p.note)]
    lines = [f"Utility prices in {parts.cost.currency} of {parts.cost.cost_year} (the capital's cost year)"
             + (":" if shown else "; all given in that year.")]
    for p in shown:
        by = f", set by {p.set_by}" if p.set_by else ""
        kept = " KEPT AS GIVEN (no index fits)" if p.note else ""
        lines.append(f"  {p.scenario} / {p.utility}: {p.price:.4g} {p.unit} = {_as_given(p)}{by}{kept}")
    return lines + [f"  Note: {note}" for note in price_notes(parts)]


# a set price this many times the cost data's own (or its inverse) is taken for a unit mistake
# (20 USD/kWh of steam meant per GJ is 418 x the bundled price); common practice, no source
PRICE_SCALE = 20.0


def price_notes(parts: ReportParts) -> tuple[str, ...]:
    """The notes on the prices of the scenarios run: :func:`power_price_notes`, then
    :func:`far_price_notes` for the utilities the design uses."""
    used = ({u.utility for u in parts.cost.utilities} if parts.cost is not None else set())
    return power_price_notes(parts) + far_price_notes(run_prices(parts), used)


def far_price_notes(prices, used) -> tuple[str, ...]:
    """A note for each of ``prices`` (:class:`UtilityPrice`) a case field or option set for a utility in
    ``used`` (or electricity) that lies more than :data:`PRICE_SCALE` times above or below the cost data's
    own price it replaced (per joule of duty)."""
    used = set(used) | {ELECTRICITY}
    far = [p for p in prices if p.set_by is not None and p.utility in used and p.cost_data_ratio
           and not 1.0 / PRICE_SCALE <= p.cost_data_ratio <= PRICE_SCALE]
    return tuple(
        f"scenario '{p.scenario}': {p.utility} is set to {_given(p):.4g} {p.unit} ({p.set_by}), "
        f"{p.cost_data_ratio:.3g} x the cost data's own price for it per unit of duty: check the number and its "
        "unit (per GJ, kWh, t or m3)" for p in far)


def _given(p: UtilityPrice) -> float:
    """The price as it was given, before any move to the cost year."""
    return p.given_price if p.given_price is not None else p.price


def power_price_notes(parts: ReportParts) -> tuple[str, ...]:
    """A note for each scenario run whose electricity price a case field or option set while a utility the
    design uses keeps the cost data's price escalated by an electricity index.

    Refrigeration and chilled water are mostly compressor power (cooling water pumps and fans): an
    ethylene column's "dear_power" scenario at 0.15 USD/kWh moved its TAC by 0.2 % because only the
    reflux pump's power followed, its -50 degC refrigerant staying at the cost data's price.
    """
    prices = run_prices(parts)
    used = {u.utility for u in parts.cost.utilities} if parts.cost is not None else set()
    notes = []
    for name in parts.scenarios_run:
        power = next((p for p in prices if p.scenario == name and p.utility == ELECTRICITY), None)
        if power is None or power.set_by is None:
            continue
        follows = [p for p in prices if p.scenario == name and p.utility in used and p.utility != ELECTRICITY
                   and p.set_by is None and "electricity" in p.price_index]
        if follows:
            kept = ", ".join(f"{p.utility} {p.price:.4g} {p.unit}" for p in follows)
            notes.append(f"scenario '{name}': electricity is set to {power.price:.4g} {power.unit} ({power.set_by}) "
                         f"but the design's {kept} keep the cost data's prices, escalated by an electricity "
                         "index, not by this power price: refrigeration and chilled water are mostly compressor "
                         f"power; set them in [prices.{name}] (or --price {name}.UTILITY=...) where they follow it")
    return tuple(notes)


def prices_table(parts: ReportParts) -> Table | None:
    """Workbook (Inputs): every price of the scenarios run, as given and on the cost year."""
    prices = run_prices(parts)
    if not prices:
        return None
    columns = (text("Scenario", 22.0), text("Utility", 22.0), Column("Price as given", "unit in Unit", "0.0000"),
               text("Unit", 10.0), Column("Year given", "year", "0", 10.0),
               Column("Escalation factor", "-", "0.000", 12.0), text("Price index", 24.0),
               Column("Price in cost year", "unit in Unit", "0.0000"), Column("Cost year", "year", "0", 10.0),
               text("Set by", 30.0), text("Source", 80.0))
    rows = tuple((p.scenario, p.utility, p.given_price, p.unit, p.given_year, p.escalation_factor, p.price_index,
                  p.price, p.year, p.set_by or "cost data", p.source) for p in prices)
    return Table(f"Utility prices ({parts.cost.currency} of {parts.cost.cost_year})", columns, rows)


def economics_json(parts: ReportParts) -> dict | None:
    """result.json ``economics``: the one cost year of capital and utilities, and every price used."""
    if parts.cost is None:
        return None
    return {
        "cost_year": parts.cost.cost_year,
        "currency": parts.cost.currency,
        "cost_index": {"name": parts.cost.index_name, "value": parts.cost.cost_index},
        "scenarios": list(parts.scenarios_run),
        "prices": [{"scenario": p.scenario, "utility": p.utility, "price": p.price, "unit": p.unit, "year": p.year,
                    "given_price": p.given_price, "given_year": p.given_year,
                    "escalation_factor": p.escalation_factor, "price_index": p.price_index,
                    "kept_as_given": p.note is not None, "set_by": p.set_by, "source": p.source}
                   for p in run_prices(parts)],
    }


__all__ = ["economics_json", "far_price_notes", "power_price_notes", "price_notes", "prices_table", "prices_text",
           "run_prices", "scenario_prices"]

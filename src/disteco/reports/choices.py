"""The designer's choices a run used: the sizing options (case [sizing] table over the defaults)
and the control margin on the reflux ratio, for result.json, the workbook and the console."""

from __future__ import annotations

from typing import TYPE_CHECKING

from ..case import Case
from ..sizing.options import SizingOptions, sizing_options
from .tables import Cell, Table, quantity_table

if TYPE_CHECKING:  # the margin module imports the optimiser; annotations only
    from ..optimisation.margin import ControlMargin

# case key of [sizing]: (label with its display unit, result.json key, SI value -> display value)
_SAME = None
SIZING_SHOWN = {
    "tray_type": ("Tray type", "tray_type", _SAME),
    "tray_spacing": ("Tray spacing [m]", "tray_spacing_m", _SAME),
    "tray_spacings": ("Candidate tray spacings [m]", "tray_spacings_m", _SAME),
    "flood_fraction": ("Fraction of flooding velocity [-]", "flood_fraction", _SAME),
    "downcomer_area_fraction": ("Downcomer area fraction [-]", "downcomer_area_fraction", _SAME),
    "system_factor": ("System (foaming) factor [-]", "system_factor", _SAME),
    "tray_efficiency": ("Tray efficiency [-]", "tray_efficiency", _SAME),
    "shell_material": ("Shell material", "shell_material", _SAME),
    "tray_material": ("Tray material", "tray_material", _SAME),
    "pressure_margin_fraction": ("Design pressure margin [-]", "pressure_margin_fraction", _SAME),
    "pressure_margin_minimum": ("Least design pressure margin [kPa]", "pressure_margin_minimum_kPa",
                                lambda v: v / 1e3),
    "temperature_margin": ("Design temperature margin [K]", "temperature_margin_K", _SAME),
    "min_approach": ("Least process-utility temperature approach [K]", "min_approach_K", _SAME),
    "max_height": ("Largest tangent length before a warning [m]", "max_height_m", _SAME),
    "max_height_to_diameter": ("Largest height-to-diameter ratio before a warning [-]", "max_height_to_diameter",
                               _SAME),
}
# what an option left at None means
_NONE_MEANS = {"downcomer_area_fraction": "from the flow parameter", "tray_efficiency": "O'Connell",
               "tray_spacings": "the tray spacing only"}


def _shown(key: str, value):
    convert = SIZING_SHOWN[key][2]
    if value is None:
        return None
    if isinstance(value, tuple):
        return [convert(v) if convert else v for v in value]
    return convert(value) if convert else value


def sizing_json(options: SizingOptions, case: Case) -> dict:
    """The sizing options the run used, by result.json key, and which of them the case set."""
    data = {json_key: _shown(key, getattr(options, key)) for key, (_, json_key, _) in SIZING_SHOWN.items()}
    data["set_in_case"] = [key for key, _ in case.sizing.given]
    return data


def margin_json(margin: ControlMargin | None) -> dict | None:
    """The control margin: least R/Rmin, the floor it gave and, where it binds, the optimum without it."""
    if margin is None:
        return None
    free = margin.unconstrained
    return {
        "min_reflux_ratio_factor": margin.factor,
        "energy_balance_minimum_reflux_ratio": margin.minimum_reflux,
        "reflux_floor": margin.reflux_floor,
        "binds": margin.binds,
        "unconstrained": None if free is None else {
            "reflux_ratio": free.best.reflux_ratio, "stages": free.best.stages, "feed_stage": free.best.feed_stage,
            "tac_per_year": _tac(free), "model_tac_per_year": free.best.tac},
    }


def _tac(optimum) -> float:
    return optimum.sequential.cost.tac_per_year if optimum.sequential else optimum.best.tac


def inputs_json(case: Case) -> dict:
    return {"sizing": sizing_json(sizing_options(case), case),
            "min_reflux_ratio_factor": case.column.min_reflux_ratio_factor}


def sizing_table(case: Case) -> Table:
    """The sizing options the run used (the case's [sizing] table over the defaults)."""
    options = sizing_options(case)
    given = dict(case.sizing.given)
    items: list[tuple[str, Cell]] = []
    for key, (label, _, _) in SIZING_SHOWN.items():
        value = _shown(key, getattr(options, key))
        if isinstance(value, list):
            value = ", ".join(f"{v:.4g}" for v in value)
        if value is None:
            value = _NONE_MEANS[key]
        if key not in given:
            name, bracket, unit = label.partition(" [")
            label = f"{name} (default){bracket}{unit}"
        items.append((label, value))
    items.append(("Least reflux ratio over the energy-balance minimum [-]", case.column.min_reflux_ratio_factor))
    return quantity_table("Design choices", items)


def margin_text(margin: ControlMargin | None, currency: str, reported_tac: float | None) -> str | None:
    """One console line where the control margin binds: the floor and the optimum without it."""
    if margin is None or not margin.binds:
        return None
    free = margin.unconstrained
    extra = f" ({reported_tac - _tac(free):+,.0f} per year with the margin)" if reported_tac is not None else ""
    free_design = (f"reflux ratio {free.best.reflux_ratio:.3f} [-], {free.best.stages} stages, feed on stage "
                   f"{free.best.feed_stage}, TAC {_tac(free):,.0f} {currency} per year{extra}")
    # "at least": with fewer stages the specifications can ask more reflux than the floor (a ketone column
    # read "held at 0.683" above a design at 0.688); the minimum is the one on the design without the margin,
    # which can differ from the reported design's own
    floor = (f"reflux ratio at least {margin.reflux_floor:.3f} [-] ({margin.factor:g} x the energy-balance minimum "
             f"{margin.minimum_reflux:.4f} of the design without it)")
    if reported_tac is not None and margin.costs_nothing(reported_tac, _tac(free)):
        return (f"Control margin held at no cost: {floor}; the lowest-TAC design found without it, {free_design}, "
                f"costs the same within the search's {margin.tac_tolerance * 100:g} % tolerance")
    return f"Control margin binds: {floor}; without it the lowest-TAC design is {free_design}"


def margin_items(margin: ControlMargin | None, currency: str) -> list[tuple[str, Cell]]:
    """Summary-table rows of a binding control margin."""
    if margin is None or not margin.binds:
        return []
    free = margin.unconstrained
    return [("Control margin: least R / energy-balance minimum [-]", margin.factor),
            ("Control margin: reflux floor [-]", margin.reflux_floor),
            ("Without the margin: reflux ratio [-]", free.best.reflux_ratio),
            ("Without the margin: stages [-]", free.best.stages),
            (f"Without the margin: total annualised cost [{currency}/year]", _tac(free))]





def sizing_text(case: Case) -> str | None:
    """One console line of the sizing options the case set; None when it set none (or no case)."""
    if case is None or not case.sizing.given:
        return None
    options = sizing_options(case)
    shown = []
    for key, _ in case.sizing.given:
        name, _, unit = SIZING_SHOWN[key][0].partition(" [")
        unit = unit.rstrip("]")
        value = _shown(key, getattr(options, key))
        if isinstance(value, list):
            value = ", ".join(f"{v:.4g}" for v in value)
        elif isinstance(value, float):
            value = f"{value:.4g}"
        shown.append(f"{name.lower()} {value}" + (f" {unit}" if unit and unit != "-" else ""))
    return "Sizing choices from the case: " + "; ".join(shown)


__all__ = ["SIZING_SHOWN", "inputs_json", "margin_items", "margin_json", "margin_text", "sizing_json", "sizing_table",
           "sizing_text"]

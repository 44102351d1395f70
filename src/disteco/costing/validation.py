"""Schemas of the cost-data files and the checks across them.

Each ``read_*`` reads one file against its column list; each ``check_*`` checks rows
against rows of other files. All problems raise CostDataError naming file, row, column.
"""

from __future__ import annotations

from .._base.errors import CostDataError
from .annual import AccuracyBand
from .curves import SI_PER_SIZE_UNIT, TrayQuantityFactor
from .operating import ELECTRICITY, NO_PRICE_INDEX, price_units
from .tables import Field, Folder, read_csv, read_toml, unique

FILES = {
    "curves": "purchased_cost_correlations.csv",
    "material": "material_factors.csv",
    "bare_module": "bare_module_factors.csv",
    "pressure": "pressure_factors.csv",
    "vessel_pressure": "vessel_pressure_factor.csv",
    "tray_factor": "tray_quantity_factor.csv",
    "index": "cost_index.csv",
    "heat_transfer": "heat_transfer_coefficients.csv",
    "levels": "utility_levels.csv",
    "scenarios": "scenarios.csv",
    "prices": "utility_prices.csv",
    "price_index": "utility_price_index.csv",
    "annualisation": "annualisation.toml",
    "accuracy": "estimate_accuracy.toml",
}
ANNUALISATION = FILES["annualisation"]
ACCURACY = FILES["accuracy"]
SOURCE = Field("source", "str")
LEVEL_KINDS = ("cooling_water", "chilled_water", "refrigerant", "steam", "hot_oil", "warm_water")
LATENT_KINDS = ("steam", "refrigerant")
ABOVE_RANGE = ("parallel", "extrapolate")
NO_PRESSURE_FACTOR = "none"
HOURS_PER_YEAR = 8784.0  # a leap year


def _str(*names: str) -> tuple[Field, ...]:
    return tuple(Field(n, "str") for n in names)


def _num(*names: str, **kw) -> tuple[Field, ...]:
    return tuple(Field(n, "float", **kw) for n in names)


def _choice(folder: Folder, filename: str, line: int, column: str, value: str, allowed) -> None:
    if value not in allowed:
        raise CostDataError(folder.name_of(filename), f"'{value}' is not one of {', '.join(allowed)}",
                            row=line, column=column)


def read_curves(folder: Folder):
    fields = (_str("item", "description", "size_variable", "size_unit")
              + _num("size_min", "size_max", positive=True) + _num("k1", "k2", "k3")
              + (Field("base_year", "int"), Field("base_index", positive=True))
              + _str("index_name", "currency", "above_range", "material_group", "pressure_group",
                     "bare_module_group") + (SOURCE,))
    rows = read_csv(folder, FILES["curves"], fields)
    unique(folder, FILES["curves"], rows, "item")
    for line, r in rows:
        _choice(folder, FILES["curves"], line, "size_unit", r["size_unit"], tuple(SI_PER_SIZE_UNIT))
        _choice(folder, FILES["curves"], line, "above_range", r["above_range"], ABOVE_RANGE)
        if r["size_min"] >= r["size_max"]:
            raise CostDataError(folder.name_of(FILES["curves"]),
                                f"size_min {r['size_min']:g} is not below size_max {r['size_max']:g}",
                                row=line, column="size_min")
    return rows


def check_curves(folder: Folder, curves, material, bare, pressure, vessel, index, settings) -> None:
    name = FILES["curves"]
    groups = {
        "material_group": {r["material_group"] for _, r in material},
        "bare_module_group": {r["bare_module_group"] for _, r in bare},
        "pressure_group": {r["pressure_group"] for _, r in pressure + vessel} | {NO_PRESSURE_FACTOR},
        "index_name": {r["index_name"] for _, r in index},
        "currency": {settings["currency"]},
    }
    for line, r in curves:
        for column, allowed in groups.items():
            _choice(folder, name, line, column, r[column], sorted(allowed))


def read_material(folder: Folder):
    rows = read_csv(folder, FILES["material"], _str("material_group", "material")
                    + (Field("material_factor", positive=True), SOURCE))
    unique(folder, FILES["material"], rows, "material_group", "material")
    return rows


def read_bare_module(folder: Folder):
    rows = read_csv(folder, FILES["bare_module"], _str("bare_module_group") + _num("b1", "b2", minimum=0.0)
                    + (SOURCE,))
    unique(folder, FILES["bare_module"], rows, "bare_module_group")
    return rows


def read_pressure(folder: Folder):
    rows = read_csv(folder, FILES["pressure"], _str("pressure_group") + _num("c1", "c2", "c3")
                    + _num("pressure_min_barg", "pressure_max_barg") + (SOURCE,))
    unique(folder, FILES["pressure"], rows, "pressure_group")
    for line, r in rows:
        if r["pressure_min_barg"] >= r["pressure_max_barg"]:
            raise CostDataError(folder.name_of(FILES["pressure"]), "pressure_min_barg is not below pressure_max_barg",
                                row=line, column="pressure_min_barg")
    return rows


def read_vessel_pressure(folder: Folder):
    rows = read_csv(folder, FILES["vessel_pressure"], _str("pressure_group")
                    + _num("allowable_stress_bar", "pressure_coefficient", "minimum_thickness_m", "vacuum_factor",
                           "pressure_max_barg", positive=True)
                    + _num("corrosion_allowance_m", minimum=0.0) + _num("vacuum_limit_barg") + (SOURCE,))
    unique(folder, FILES["vessel_pressure"], rows, "pressure_group")
    return rows


def read_tray_factor(folder: Folder) -> TrayQuantityFactor:
    rows = read_csv(folder, FILES["tray_factor"], _num("c1", "c2", "c3")
                    + (Field("trays_max", "int", positive=True), SOURCE))
    if len(rows) != 1:
        raise CostDataError(folder.name_of(FILES["tray_factor"]), f"{len(rows)} data rows; exactly one expected",
                            row=rows[1][0])
    r = rows[0][1]
    return TrayQuantityFactor(r["c1"], r["c2"], r["c3"], r["trays_max"], r["source"])


def read_index(folder: Folder):
    rows = read_csv(folder, FILES["index"], (Field("year", "int", minimum=1900), Field("index", positive=True))
                    + _str("index_name", "basis") + (SOURCE,))
    unique(folder, FILES["index"], rows, "year")
    names = {r["index_name"] for _, r in rows}
    if len(names) != 1:
        raise CostDataError(folder.name_of(FILES["index"]), f"several index names ({', '.join(sorted(names))}); "
                            "one table holds one index", column="index_name")
    return sorted(rows, key=lambda lr: lr[1]["year"])


def read_heat_transfer(folder: Folder):
    name = FILES["heat_transfer"]
    rows = read_csv(folder, name, _str("service", "process_side", "utility_kind")
                    + _num("u_low", "u_typical", "u_high", positive=True) + _str("unit") + (SOURCE,))
    unique(folder, name, rows, "service", "process_side", "utility_kind")
    for line, r in rows:
        _choice(folder, name, line, "service", r["service"], ("condenser", "reboiler"))
        _choice(folder, name, line, "utility_kind", r["utility_kind"], LEVEL_KINDS)
        _choice(folder, name, line, "unit", r["unit"], ("W/(m2 K)",))
        if not r["u_low"] <= r["u_typical"] <= r["u_high"]:
            raise CostDataError(folder.name_of(name), "u_low <= u_typical <= u_high does not hold",
                                row=line, column="u_typical")
    return rows


def read_levels(folder: Folder):
    fields = (_str("name", "service", "kind") + _num("supply_temperature_degC", "return_temperature_degC",
                                                     minimum=-273.15)
              + _num("latent_heat_kJ_per_kg", "heat_capacity_kJ_per_kg_K", "density_kg_per_m3",
                     required=False, positive=True)
              + _num("pressure_barg", required=False, minimum=-1.0) + (SOURCE,))
    rows = read_csv(folder, FILES["levels"], fields)
    unique(folder, FILES["levels"], rows, "name")
    return rows


def check_levels(folder: Folder, levels) -> None:
    name = FILES["levels"]
    for line, r in levels:
        _choice(folder, name, line, "service", r["service"], ("cooling", "heating"))
        _choice(folder, name, line, "kind", r["kind"], LEVEL_KINDS)
        if r["name"] == ELECTRICITY:
            raise CostDataError(folder.name_of(name), "'electricity' is reserved for the power price",
                                row=line, column="name")
        rise = r["return_temperature_degC"] - r["supply_temperature_degC"]
        if r["kind"] in LATENT_KINDS:
            if rise != 0.0:
                raise CostDataError(folder.name_of(name), f"a {r['kind']} level condenses or evaporates at one "
                                    "temperature: supply and return must be equal", row=line,
                                    column="return_temperature_degC")
            if r["kind"] == "steam" and r["latent_heat_kJ_per_kg"] is None:
                raise CostDataError(folder.name_of(name), "steam needs its latent heat", row=line,
                                    column="latent_heat_kJ_per_kg")
        else:
            if r["heat_capacity_kJ_per_kg_K"] is None:
                raise CostDataError(folder.name_of(name), f"a sensible {r['kind']} level needs a heat capacity",
                                    row=line, column="heat_capacity_kJ_per_kg_K")
            if (rise <= 0.0) if r["service"] == "cooling" else (rise >= 0.0):
                raise CostDataError(folder.name_of(name), "the return temperature must be "
                                    + ("above" if r["service"] == "cooling" else "below") + " the supply temperature",
                                    row=line, column="return_temperature_degC")


def read_scenarios(folder: Folder):
    rows = read_csv(folder, FILES["scenarios"], _str("scenario", "basis", "description") + (SOURCE,))
    unique(folder, FILES["scenarios"], rows, "scenario")
    return rows


def read_prices(folder: Folder):
    fields = (_str("scenario", "utility") + (Field("price", minimum=0.0),) + _str("currency", "per")
              + (Field("year", "int", minimum=1900), Field("price_index", "str"), SOURCE))
    rows = read_csv(folder, FILES["prices"], fields)
    unique(folder, FILES["prices"], rows, "scenario", "utility")
    return rows


def read_price_index(folder: Folder):
    """Utility price indices by name and year, each name with one unit."""
    rows = read_csv(folder, FILES["price_index"], _str("index_name") + (Field("year", "int", minimum=1900),
                    Field("value", positive=True)) + _str("unit", "basis") + (SOURCE,))
    unique(folder, FILES["price_index"], rows, "index_name", "year")
    for line, r in rows:
        if r["index_name"] == NO_PRICE_INDEX:
            raise CostDataError(folder.name_of(FILES["price_index"]), f"'{NO_PRICE_INDEX}' is kept for prices "
                                "that are not escalated", row=line, column="index_name")
        units = {u["unit"] for _, u in rows if u["index_name"] == r["index_name"]}
        if len(units) > 1:
            raise CostDataError(folder.name_of(FILES["price_index"]), f"index '{r['index_name']}' has several "
                                f"units ({', '.join(sorted(units))}); one index has one unit", row=line, column="unit")
    return sorted(rows, key=lambda lr: (lr[1]["index_name"], lr[1]["year"]))


def check_prices(folder: Folder, prices, levels, scenarios, settings, indices=()) -> None:
    name = FILES["prices"]
    by_name = {r["name"]: r for _, r in levels}
    utilities = sorted(by_name) + [ELECTRICITY]
    index_names = sorted({r["index_name"] for _, r in indices}) + [NO_PRICE_INDEX]
    for line, r in prices:
        _choice(folder, name, line, "scenario", r["scenario"], [s["scenario"] for _, s in scenarios])
        _choice(folder, name, line, "utility", r["utility"], utilities)
        _choice(folder, name, line, "currency", r["currency"], (settings["currency"],))
        _choice(folder, name, line, "price_index", r["price_index"], index_names)
        _choice(folder, name, line, "per", r["per"], price_units(r["utility"] == ELECTRICITY))
        level = by_name.get(r["utility"])
        if r["per"] in ("t", "m3") and level["latent_heat_kJ_per_kg"] is None \
                and level["heat_capacity_kJ_per_kg_K"] is None:
            raise CostDataError(folder.name_of(name), f"a price per {r['per']} needs the latent heat or heat "
                                f"capacity of '{r['utility']}' in {FILES['levels']}", row=line, column="per")
        if r["per"] == "m3" and level["density_kg_per_m3"] is None:
            raise CostDataError(folder.name_of(name), f"a price per m3 needs the density of '{r['utility']}' "
                                f"in {FILES['levels']}", row=line, column="per")
    for _, s in scenarios:
        priced = {r["utility"] for _, r in prices if r["scenario"] == s["scenario"]}
        missing = [u for u in utilities if u not in priced]
        if missing:
            raise CostDataError(folder.name_of(name), f"scenario '{s['scenario']}' has no price for "
                                f"{', '.join(missing)}; every scenario prices every level and electricity",
                                column="utility")


def read_annualisation(folder: Folder) -> dict:
    fields = (Field("default_scenario", "str"), Field("method", "str"), Field("interest_rate", minimum=0.0),
              Field("plant_life_years", positive=True), Field("payback_years", positive=True),
              Field("operating_hours_per_year", positive=True), Field("currency", "str"), SOURCE)
    data = read_toml(folder, ANNUALISATION, fields)
    if data["method"] not in ("capital_recovery", "payback"):
        raise CostDataError(folder.name_of(ANNUALISATION), f"'{data['method']}' is not one of capital_recovery, "
                            "payback", column="method")
    if data["operating_hours_per_year"] > HOURS_PER_YEAR:
        raise CostDataError(folder.name_of(ANNUALISATION), f"{data['operating_hours_per_year']:g} h is more than "
                            "a year", column="operating_hours_per_year")
    scenarios = {r["scenario"] for _, r in read_scenarios(folder)}
    if data["default_scenario"] not in scenarios:
        raise CostDataError(folder.name_of(ANNUALISATION), f"'{data['default_scenario']}' is not in "
                            f"{FILES['scenarios']} ({', '.join(sorted(scenarios))})", column="default_scenario")
    return data


def read_accuracy(folder: Folder) -> AccuracyBand:
    fields = (Field("estimate_class", "str"), Field("low_best"), Field("low_worst"), Field("high_best"),
              Field("high_worst"), SOURCE)
    data = read_toml(folder, ACCURACY, fields)
    if not -1.0 < data["low_worst"] <= data["low_best"] < 0.0 < data["high_best"] <= data["high_worst"]:
        raise CostDataError(folder.name_of(ACCURACY), "need -1 < low_worst <= low_best < 0 < high_best <= high_worst",
                            column="low_worst")
    cautions = data.get("cautions", [])
    if not isinstance(cautions, list) or any(not isinstance(c, str) for c in cautions):
        raise CostDataError(folder.name_of(ACCURACY), "cautions must be a list of text lines", column="cautions")
    return AccuracyBand(data["estimate_class"], data["low_best"], data["low_worst"], data["high_best"],
                        data["high_worst"], data["source"], tuple(cautions))

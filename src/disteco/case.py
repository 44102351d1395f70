"""The case file (TOML) into frozen dataclasses, with field-named validation errors.

Only syntax, units and ranges are checked here. Component names are resolved and the
feed flow is put on a molar basis by the properties layer, which knows the chemicals.
"""

from __future__ import annotations

import tomllib
from dataclasses import dataclass, field, replace
from pathlib import Path

from ._base.errors import CaseError
from ._base.fields import QUANTITY, fraction as _fraction, get as _get, matrix as _matrix, only_keys as _only_keys, \
    printable as _printable, shown as _shown, table as _table, text as _text
from ._base.interaction import KIJ_RANGE, LN_GAMMA_INF_RANGE, NRTL_ALPHA_RANGE, TEMPERATURES, nrtl_outside, \
    wilson_outside
from ._base.prices import ScenarioPrices, parse_price_table
from ._base.units import ATMOSPHERE, parse_quantity

METHODS = ("ideal", "unifac-dortmund", "nrtl", "wilson", "peng-robinson")
CONDENSERS = ("total", "partial")
MIN_PRESSURE = 1e3  # Pa; below this vacuum distillation is out of scope
MAX_PRESSURE = 5e6  # Pa; above this a cubic EOS and a high-pressure column design are needed
COMPOSITION_TOLERANCE = 1e-6
# Feed temperatures from cryogenic service to hot-oil heating (common practice, no source);
# outside them the property correlations extrapolate far beyond their data.
FEED_TEMPERATURE_RANGE = (50.0, 1000.0)  # K
# Feed flows from a pilot column (about 4 mol/h) to the largest columns built (about
# 360 000 kmol/h) (common practice, no source), per basis of the flow as written.
FLOW_RANGES = {"molar": (1e-3, 1e5, "mol/s"), "mass": (1e-4, 1e4, "kg/s"), "volume": (1e-7, 10.0, "m3/s")}


@dataclass(frozen=True)
class FeedFlow:
    """Feed flow as written: basis "molar" [mol/s], "mass" [kg/s] or "volume" [m^3/s]."""

    basis: str
    value: float


@dataclass(frozen=True)
class ThermalCondition:
    """Feed thermal condition: "temperature" [K], "vapour_fraction" [-] or "q" [-]."""

    kind: str
    value: float


@dataclass(frozen=True)
class Feed:
    flow: FeedFlow
    composition: tuple[float, ...]  # fractions as written, in component order [-], on composition_basis
    condition: ThermalCondition
    pressure: float | None  # Pa; None means the feed-stage pressure
    composition_basis: str = "mole"  # "mole" or "mass"; properties.feed.mole_fractions gives mole fractions


# Least reflux ratio over the energy-balance minimum: a margin for control and for the
# uncertainty of the equilibrium data near the pinch (common practice, no source).
MIN_REFLUX_RATIO_FACTOR = 1.1  # [-]
MIN_REFLUX_RATIO_FACTOR_RANGE = (1.0, 5.0)  # [-]; 1 holds no margin
PRELIMINARY_TRAY_DROP = 0.7e3  # Pa per real tray before the hydraulics are known (common practice, no source)
PRELIMINARY_EFFICIENCY = 0.6  # [-] before O'Connell is evaluated (common practice, no source)
MAX_TRAY_DROP = 5e3  # Pa per real tray


@dataclass(frozen=True)
class Column:
    """The column table. ``pressure_drop_per_tray`` is per real tray; None: from the sieve-tray hydraulics."""

    top_pressure: float  # Pa, absolute
    pressure_drop_per_tray: float | None  # Pa per real tray; None means "auto" (tray hydraulics)
    condenser: str  # "total" or "partial"
    subcooling: float  # K below the bubble point of the reflux and distillate
    warnings: tuple[str, ...] = field(default=(), compare=False)  # deprecation notes from reading the case
    min_reflux_ratio_factor: float = MIN_REFLUX_RATIO_FACTOR  # least R over the energy-balance minimum [-]

    def stage_pressure_drop(self, efficiency: float = PRELIMINARY_EFFICIENCY,
                            tray_drop: float | None = None) -> float:
        """Pressure drop per equilibrium stage [Pa]: the per-tray drop over the overall efficiency.

        ``tray_drop`` [Pa] is the hydraulics' figure, used when the case asks for "auto";
        before any sizing the preliminary figures of this module stand in.
        """
        per_tray = self.pressure_drop_per_tray
        if per_tray is None:
            per_tray = PRELIMINARY_TRAY_DROP if tray_drop is None else tray_drop
        return per_tray / efficiency

    @property
    def pressure_drop_per_stage(self) -> float:
        """Preliminary per-stage drop [Pa] for the stages layer, before efficiency and hydraulics are known."""
        return self.stage_pressure_drop()


@dataclass(frozen=True)
class EndSpec:
    """One end of the split: kind "recovery" (fraction of feed) or "fraction" (mole fraction)."""

    kind: str
    value: float


@dataclass(frozen=True)
class Products:
    """Key components (indices into the component list) and the two end specifications.

    ``light_key`` is specified by its recovery to the distillate or by its mole fraction
    in the bottoms; ``heavy_key`` by its recovery to the bottoms or its mole fraction in
    the distillate.
    """

    light_key: int
    heavy_key: int
    light_key_spec: EndSpec
    heavy_key_spec: EndSpec
    fraction_basis: str = "mole"  # of the in-product fractions as written: "mole" or "mass" (two components)
    written: tuple[EndSpec, EndSpec] | None = None  # the specifications as written, where turned into moles
    binary_fractions: bool = False  # written as distillate_/bottoms_light_key_fraction (messages name those)


def require_mole_basis(products, layer: str) -> None:
    """Stop product fractions written by mass that reach ``layer`` unconverted: every layer works in mole
    fractions (``api.on_mole_basis`` turns them, with the molar masses only the properties layer knows)."""
    if getattr(products, "fraction_basis", "mole") != "mole":
        raise ValueError(f"product fractions written by mass reached {layer}: turn them into mole fractions "
                         "first (api.on_mole_basis)")


@dataclass(frozen=True)
class Thermo:
    """Thermodynamic method and user-supplied interaction parameters."""

    method: str  # one of METHODS, or "auto"
    nrtl_a: tuple[tuple[float, ...], ...] | None = None  # tau_ij = a_ij + b_ij/T [-]
    nrtl_b: tuple[tuple[float, ...], ...] | None = None  # [K]
    nrtl_alpha: tuple[tuple[float, ...], ...] | None = None  # [-]
    wilson_a: tuple[tuple[float, ...], ...] | None = None  # ln Lambda_ij = a_ij + b_ij/T [-]
    wilson_b: tuple[tuple[float, ...], ...] | None = None  # [K]
    kij: tuple[tuple[float, ...], ...] | None = None  # Peng-Robinson [-]


@dataclass(frozen=True)
class Economics:
    cost_data: Path | None  # None means the bundled cost_data
    cost_year: int | None  # None means the newest year in the index table
    scenarios: tuple[str, ...]  # empty means the cost data's default scenario
    currency: str = "USD"


# The [sizing] table: case key -> (TOML kind, quantity of its unit or None for a plain number or text).
SIZING_KEYS = {
    "tray_type": (str, None),
    "tray_spacing": (str, "length"),
    "tray_spacings": (list, "length"),
    "flood_fraction": (float, None),
    "downcomer_area_fraction": (float, None),
    "system_factor": (float, None),
    "tray_efficiency": (float, None),
    "shell_material": (str, None),
    "tray_material": (str, None),
    "pressure_margin_fraction": (float, None),
    "pressure_margin_minimum": (str, "pressure difference"),
    "temperature_margin": (str, "temperature difference"),
    "min_approach": (str, "temperature difference"),
    "max_height": (str, "length"),
    "max_height_to_diameter": (float, None),
}


@dataclass(frozen=True)
class Sizing:
    """The [sizing] table as given, in SI: pairs of (key of :data:`SIZING_KEYS`, value).

    Keys left out keep the sizing layer's defaults; the sizing layer checks the ranges.
    """

    given: tuple[tuple[str, object], ...] = ()

    def as_dict(self) -> dict:
        return dict(self.given)


@dataclass(frozen=True)
class Case:
    title: str
    components: tuple[str, ...]  # as written: names or CAS numbers
    feed: Feed
    column: Column
    products: Products
    thermo: Thermo
    economics: Economics
    source: Path | None = field(default=None, compare=False)
    sizing: Sizing = Sizing()
    prices: tuple[ScenarioPrices, ...] = ()  # the [prices] table: overrides and inline scenarios


def load_case(path: str | Path) -> Case:
    """Read and validate a case file."""
    path = Path(path)
    if not path.is_file():
        raise CaseError("case file", f"{path} does not exist or is not a file")
    try:
        data = tomllib.loads(path.read_text(encoding="utf-8-sig"))
    except tomllib.TOMLDecodeError as exc:
        raise CaseError("case file", f"{path} is not valid TOML: {exc}") from None
    except UnicodeDecodeError:
        raise CaseError("case file", f"{path} is not UTF-8 text") from None
    case = parse_case(data)
    economics = case.economics
    if economics.cost_data is not None and not economics.cost_data.is_absolute():
        # A cost-data folder is written relative to the case file, as a person expects.
        economics = Economics(path.resolve().parent / economics.cost_data, economics.cost_year,
                              economics.scenarios, economics.currency)
    if economics.cost_data is not None and not economics.cost_data.is_dir():
        raise CaseError("economics.cost_data", f"{str(economics.cost_data)!r} is not a folder",
                        "a folder holding cost-data files, relative to the case file or absolute")
    return Case(**{**case.__dict__, "economics": economics, "source": path.resolve()})


def parse_case(data: dict) -> Case:
    """Validate a case given as the dict read from TOML."""
    _only_keys(data, "", {"title", "mixture", "feed", "column", "products", "economics", "sizing", "prices"})
    title = _text(data, "title", "", "untitled case")
    mixture = _table(data, "mixture")
    components = _components(mixture)
    return Case(
        title=title,
        components=components,
        feed=_feed(_table(data, "feed"), components),
        column=_column(_table(data, "column")),
        products=_products(_table(data, "products"), components),
        thermo=_thermo(mixture, components),
        economics=_economics(data.get("economics", {})),
        sizing=_sizing(data.get("sizing", {})),
        prices=parse_price_table(data.get("prices", {})),
    )


# ---------------------------------------------------------------- helpers


def _components(mixture: dict) -> tuple[str, ...]:
    names = _get(mixture, "components", list, "mixture.")
    if len(names) < 2:
        raise CaseError("mixture.components", f"{len(names)} component(s) given",
                        "at least 2 names or CAS numbers")
    for name in names:
        if not isinstance(name, str) or not name.strip():
            raise CaseError("mixture.components", f"{name!r} is not a name", "text names or CAS numbers")
    lowered = [n.strip().lower() for n in names]
    twice = sorted({n for n in lowered if lowered.count(n) > 1})
    if twice:
        raise CaseError("mixture.components", f"{', '.join(map(repr, twice))} listed twice", "distinct components")
    return tuple(n.strip() for n in names)


COMPOSITION_BASES = ("mole", "mass")


def _composition(feed: dict, components: tuple[str, ...], basis: str) -> tuple[float, ...]:
    raw = _get(feed, "composition", (list, dict), "feed.")
    if isinstance(raw, dict):
        unknown = [k for k in raw if k not in components]
        if unknown:
            raise CaseError("feed.composition", f"{unknown[0]!r} is not in mixture.components",
                            ", ".join(components))
        values = [raw.get(name, 0.0) for name in components]
    else:
        if len(raw) != len(components):
            raise CaseError("feed.composition", f"{len(raw)} values for {len(components)} components",
                            f"one {basis} fraction per component, in the order of mixture.components")
        values = raw
    for name, value in zip(components, values):
        if isinstance(value, bool) or not isinstance(value, (int, float)) or not 0.0 <= value <= 1.0:
            raise CaseError("feed.composition", f"{basis} fraction of {name} is {value!r}", "0 to 1")
    total = float(sum(values))
    if abs(total - 1.0) > COMPOSITION_TOLERANCE:
        raise CaseError("feed.composition", f"{basis} fractions sum to {total:.8g}",
                        f"a sum of 1 within {COMPOSITION_TOLERANCE:g}")
    return tuple(float(v) for v in values)


def _feed(feed: dict, components: tuple[str, ...]) -> Feed:
    _only_keys(feed, "feed.", {"flow", "composition", "composition_basis", "temperature", "vapour_fraction", "q",
                               "pressure"})
    basis = _get(feed, "composition_basis", str, "feed.") if "composition_basis" in feed else "mole"
    if basis not in COMPOSITION_BASES:
        raise CaseError("feed.composition_basis", repr(basis), " or ".join(COMPOSITION_BASES))
    flow_si, unit = parse_quantity(_get(feed, "flow", QUANTITY, "feed."), "flow", "feed.flow")
    if flow_si <= 0.0:
        raise CaseError("feed.flow", f"{feed['flow']!r} is not positive", "a flow above zero")
    low, high, si_unit = FLOW_RANGES[unit.basis]
    if not low <= flow_si <= high:
        raise CaseError("feed.flow", f"{feed['flow']!r} ({flow_si:.4g} {si_unit}) is out of range",
                        f"{low:g} to {high:g} {si_unit} for a {unit.basis} flow")
    conditions = [k for k in ("temperature", "vapour_fraction", "q") if k in feed]
    if len(conditions) != 1:
        found = (f"{len(conditions)} thermal conditions given ({', '.join(conditions)})" if conditions
                 else "no thermal condition given")
        raise CaseError("feed", found, "exactly one of temperature, vapour_fraction, q")
    kind = conditions[0]
    if kind == "temperature":
        value, _ = parse_quantity(feed["temperature"], "temperature", "feed.temperature")
        low, high = FEED_TEMPERATURE_RANGE
        if not low <= value <= high:
            raise CaseError("feed.temperature", f"{feed['temperature']!r} ({value:.6g} K) is out of range",
                            f"{low:g} to {high:g} K ({low - 273.15:g} to {high - 273.15:g} degC)")
    elif kind == "vapour_fraction":
        value = _fraction(feed, "vapour_fraction", "feed.", open_ends=False)
    else:
        value = _get(feed, "q", float, "feed.")
        if not -5.0 <= value <= 5.0:
            raise CaseError("feed.q", f"q = {value}", "-5 to 5 (q = 1 saturated liquid, 0 saturated vapour)")
    pressure = None
    if "pressure" in feed:
        pressure = _pressure(feed, "pressure", "feed.")
    return Feed(FeedFlow(unit.basis, flow_si), _composition(feed, components, basis),
                ThermalCondition(kind, value), pressure, basis)


def _pressure(table: dict, key: str, prefix: str) -> float:
    value, _ = parse_quantity(_get(table, key, QUANTITY, prefix), "pressure", prefix + key)
    if not MIN_PRESSURE <= value <= MAX_PRESSURE:
        raise CaseError(prefix + key, f"{table[key]!r} is {value / 1e5:.4g} bar absolute",
                        f"{MIN_PRESSURE / 1e5:g} to {MAX_PRESSURE / 1e5:g} bar absolute")
    return value


def _column(column: dict) -> Column:
    _only_keys(column, "column.", {"top_pressure", "pressure_drop_per_tray", "pressure_drop_per_stage",
                                   "condenser", "subcooling", "min_reflux_ratio_factor"})
    top = _pressure(column, "top_pressure", "column.")
    drop, warnings = _tray_drop(column)
    condenser = _get(column, "condenser", str, "column.", "total")
    if condenser not in CONDENSERS:
        raise CaseError("column.condenser", f"{condenser!r}", ", ".join(CONDENSERS))
    subcooling, _ = parse_quantity(_get(column, "subcooling", QUANTITY, "column.", "0 K"),
                                   "temperature difference", "column.subcooling")
    if not 0.0 <= subcooling <= 50.0:
        raise CaseError("column.subcooling", f"{subcooling:.4g} K", "0 to 50 K")
    if condenser == "partial" and subcooling > 0.0:
        raise CaseError("column.subcooling", "a partial condenser has no subcooling", "0 K with a partial condenser")
    factor = _get(column, "min_reflux_ratio_factor", float, "column.", MIN_REFLUX_RATIO_FACTOR)
    low, high = MIN_REFLUX_RATIO_FACTOR_RANGE
    if not low <= factor <= high:
        raise CaseError("column.min_reflux_ratio_factor", f"{factor:g}",
                        f"{low:g} to {high:g} times the energy-balance minimum reflux ratio (1: no margin)", factor)
    return Column(top, drop, condenser, subcooling, warnings, factor)


def _tray_drop(column: dict) -> tuple[float | None, tuple[str, ...]]:
    """``pressure_drop_per_tray`` [Pa] or None for "auto"; the deprecated per-stage name is read as per tray."""
    if "pressure_drop_per_stage" in column and "pressure_drop_per_tray" in column:
        raise CaseError("column.pressure_drop_per_stage", "given together with pressure_drop_per_tray",
                        "pressure_drop_per_tray alone (pressure_drop_per_stage is deprecated)")
    key, warnings = "pressure_drop_per_tray", ()
    if "pressure_drop_per_stage" in column:
        key = "pressure_drop_per_stage"
        warnings = ("column.pressure_drop_per_stage is deprecated and will be removed in the next release: "
                    "its value is read as column.pressure_drop_per_tray (per real tray; the drop per "
                    "equilibrium stage is the per-tray drop over the tray efficiency); rename the field",)
    raw = _get(column, key, QUANTITY, "column.", "auto")
    if isinstance(raw, str) and raw.strip().lower() == "auto":
        return None, warnings
    drop, _ = parse_quantity(raw, "pressure difference", "column." + key)
    if not 0.0 <= drop <= MAX_TRAY_DROP:
        raise CaseError("column." + key, f"{drop / 1e3:.4g} kPa per tray",
                        f"0 to {MAX_TRAY_DROP / 1e3:g} kPa per real tray, or \"auto\" (sieve-tray hydraulics)")
    return drop, warnings


def _component_index(products: dict, key: str, components: tuple[str, ...]) -> int:
    name = _get(products, key, str, "products.")
    if name not in components:
        raise CaseError(f"products.{key}", f"{name!r} is not in mixture.components", ", ".join(components))
    return components.index(name)


def _products(products: dict, components: tuple[str, ...]) -> Products:
    prefix = "products."
    binary_keys = {"distillate_light_key_fraction", "bottoms_light_key_fraction"}
    key_keys = {"light_key", "heavy_key", "light_key_recovery", "light_key_in_bottoms",
                "heavy_key_recovery", "heavy_key_in_distillate"}
    _only_keys(products, prefix, binary_keys | key_keys | {"fraction_basis"})
    basis = _get(products, "fraction_basis", str, prefix) if "fraction_basis" in products else "mole"
    if basis not in COMPOSITION_BASES:
        raise CaseError(prefix + "fraction_basis", repr(basis), " or ".join(COMPOSITION_BASES))
    if basis == "mass" and len(components) != 2:
        raise CaseError(prefix + "fraction_basis", f"'mass' with {len(components)} components",
                        "mole: a mass fraction in a product of more than two components depends on the others, "
                        "unknown before the design; give recoveries (the same on either basis) or mole fractions")
    return replace(_products_on(products, components, prefix, binary_keys, key_keys), fraction_basis=basis)


def _products_on(products: dict, components: tuple[str, ...], prefix: str, binary_keys: set, key_keys: set
                 ) -> Products:
    if binary_keys & products.keys():
        if len(components) != 2:
            raise CaseError(prefix + "distillate_light_key_fraction",
                            f"binary specification given for {len(components)} components",
                            "light_key, heavy_key with recoveries or fractions for more than 2 components")
        unused = sorted(products.keys() & (key_keys - {"light_key", "heavy_key"}))
        if unused:
            raise CaseError(prefix + unused[0], "not used with distillate_light_key_fraction and "
                            "bottoms_light_key_fraction", "either the two binary fractions or key "
                            "recoveries/fractions, not both")
        light = _component_index(products, "light_key", components) if "light_key" in products else 0
        heavy = 1 - light
        if "heavy_key" in products and _component_index(products, "heavy_key", components) != heavy:
            raise CaseError(prefix + "heavy_key", "same component as the light key", "the other component")
        x_d = _fraction(products, "distillate_light_key_fraction", prefix)
        x_b = _fraction(products, "bottoms_light_key_fraction", prefix)
        return Products(light, heavy, EndSpec("fraction", x_b), EndSpec("fraction", 1.0 - x_d),
                        binary_fractions=True)
    light = _component_index(products, "light_key", components)
    heavy = _component_index(products, "heavy_key", components)
    if light == heavy:
        raise CaseError(prefix + "heavy_key", "same component as the light key", "two different components")
    return Products(light, heavy,
                    _end_spec(products, "light_key_recovery", "light_key_in_bottoms"),
                    _end_spec(products, "heavy_key_recovery", "heavy_key_in_distillate"))


def _end_spec(products: dict, recovery_key: str, fraction_key: str) -> EndSpec:
    given = [k for k in (recovery_key, fraction_key) if k in products]
    if len(given) != 1:
        raise CaseError("products", f"give exactly one of {recovery_key} and {fraction_key}",
                        "a recovery (fraction of the key in the feed) or a mole fraction in the other product")
    key = given[0]
    kind = "recovery" if key == recovery_key else "fraction"
    value = products[key]
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not 0.0 < value < 1.0:
        raise CaseError(f"products.{key}", f"{value!r} is not a fraction", "strictly between 0 and 1", value)
    return EndSpec(kind, float(value))


_METHOD_TABLES = {"nrtl": "nrtl", "wilson": "wilson", "peng-robinson": "peng_robinson"}


def _thermo(mixture: dict, components: tuple[str, ...]) -> Thermo:
    n = len(components)
    _only_keys(mixture, "mixture.", {"components", "method", "nrtl", "wilson", "peng_robinson"})
    method = _get(mixture, "method", str, "mixture.", "auto")
    if method not in METHODS + ("auto",):
        raise CaseError("mixture.method", f"unknown method {_shown(method)}", ", ".join(METHODS + ("auto",)))
    for other in set(_METHOD_TABLES.values()) - {_METHOD_TABLES.get(method)}:
        if other in mixture:
            raise CaseError(f"mixture.{other}", f"parameters given but mixture.method is {method!r}",
                            f"a [mixture.{other}] table only with method = "
                            f"{next(m for m, t in _METHOD_TABLES.items() if t == other)!r}")
    kwargs = {}
    if method == "nrtl":
        table = _table(mixture, "nrtl", "mixture.")
        _only_keys(table, "mixture.nrtl.", {"a", "b", "alpha"})
        kwargs = dict(nrtl_a=_matrix(table, "a", n, "mixture.nrtl."),
                      nrtl_b=_matrix(table, "b", n, "mixture.nrtl."),
                      nrtl_alpha=_matrix(table, "alpha", n, "mixture.nrtl.", zero_diagonal=False))
        low, high = NRTL_ALPHA_RANGE
        if not all(low <= x <= high for row in kwargs["nrtl_alpha"] for x in row):
            raise CaseError("mixture.nrtl.alpha", "a value lies outside the range of the non-randomness "
                            "parameter", f"{low:g} to {high:g} (0.2 to 0.47 usual)")
        _activity_limits("mixture.nrtl", components,
                         nrtl_outside(kwargs["nrtl_a"], kwargs["nrtl_b"], kwargs["nrtl_alpha"]))
    elif method == "wilson":
        table = _table(mixture, "wilson", "mixture.")
        _only_keys(table, "mixture.wilson.", {"a", "b"})
        kwargs = dict(wilson_a=_matrix(table, "a", n, "mixture.wilson."),
                      wilson_b=_matrix(table, "b", n, "mixture.wilson."))
        _activity_limits("mixture.wilson", components, wilson_outside(kwargs["wilson_a"], kwargs["wilson_b"]))
    elif method == "peng-robinson" and "peng_robinson" in mixture:
        table = _table(mixture, "peng_robinson", "mixture.")
        _only_keys(table, "mixture.peng_robinson.", {"kij"})
        kij = _matrix(table, "kij", n, "mixture.peng_robinson.")
        low, high = KIJ_RANGE
        if any(kij[i][j] != kij[j][i] for i in range(n) for j in range(n)):
            raise CaseError("mixture.peng_robinson.kij", "not symmetric", "k_ij = k_ji")
        if not all(low <= x <= high for row in kij for x in row):
            raise CaseError("mixture.peng_robinson.kij", "a value lies outside the range of binary "
                            "interaction parameters", f"{low:g} to {high:g}")
        kwargs = dict(kij=kij)
    return Thermo(method, **kwargs)


def _activity_limits(field: str, components: tuple[str, ...], outside) -> None:
    """Refuse parameters whose infinite-dilution activity coefficients leave the finite range."""
    if outside is None:
        return
    value, i, j, T = outside
    low, high = LN_GAMMA_INF_RANGE
    raise CaseError(field, f"these parameters give ln(gamma) = {value:.4g} for {components[i]} infinitely "
                    f"diluted in {components[j]} at {T:g} K",
                    f"parameters whose ln(gamma) at infinite dilution lies from {low:g} to {high:g} for "
                    f"every pair from {TEMPERATURES[0]:g} to {TEMPERATURES[-1]:g} K")


def _economics(table) -> Economics:
    if not isinstance(table, dict):
        raise CaseError("economics", "must be a table", "[economics]")
    _only_keys(table, "economics.", {"cost_data", "cost_year", "scenarios", "currency"})
    cost_data = _text(table, "cost_data", "economics.", None)
    if cost_data is not None and not cost_data.strip():
        raise CaseError("economics.cost_data", "empty", "a folder holding cost-data files; leave the field "
                        "out for the bundled data")
    year = _get(table, "cost_year", int, "economics.", None)
    if year is not None and not 1950 <= year <= 2100:
        raise CaseError("economics.cost_year", f"{year}", "a year from 1950 to 2100 present in the cost-index table")
    scenarios = _get(table, "scenarios", list, "economics.", [])
    if any(not isinstance(s, str) or not s.strip() for s in scenarios):
        raise CaseError("economics.scenarios", "every scenario must be a name", "a list of scenario names")
    for name in scenarios:
        _printable(name, "economics.scenarios")
    currency = _text(table, "currency", "economics.", "USD")
    if not currency.strip():
        raise CaseError("economics.currency", "empty", "a currency code such as USD or EUR")
    return Economics(Path(cost_data) if cost_data else None, year, tuple(scenarios), currency)


def _sizing(table) -> Sizing:
    """The [sizing] table: units read and kinds checked here; ranges by the sizing layer's options."""
    if not isinstance(table, dict):
        raise CaseError("sizing", "must be a table", "[sizing]")
    _only_keys(table, "sizing.", set(SIZING_KEYS))
    given = []
    for key, (kind, quantity) in SIZING_KEYS.items():
        if key not in table:
            continue
        field_name = "sizing." + key
        # a bare number where a quantity is asked for is let through, to be told its unit is missing
        value = _get(table, key, QUANTITY if kind is str and quantity is not None else kind, "sizing.")
        if kind is list:
            if not value:
                raise CaseError(field_name, "empty list", f"a list of {quantity}s with units, "
                                "e.g. [\"0.45 m\", \"0.6 m\"]")
            value = tuple(parse_quantity(v, quantity, field_name)[0] for v in value)
        elif quantity is not None:
            value = parse_quantity(value, quantity, field_name)[0]
        elif kind is str:
            value = _text(table, key, "sizing.")
        given.append((key, value))
    return Sizing(tuple(given))


__all__ = ["Case", "Column", "Economics", "EndSpec", "Feed", "FeedFlow", "Products", "require_mole_basis",
           "Sizing", "SIZING_KEYS", "ThermalCondition", "Thermo", "load_case", "parse_case", "ATMOSPHERE", "METHODS"]

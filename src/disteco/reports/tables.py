"""Typed tables and plot data with display units, built from the layers' result dataclasses.

Everything below the reports layer is SI; here, at the edge, numbers are converted once
to the units an engineer reads (degC, kPa, kmol/h, kW) and every header names its unit.
Numbers stay numbers: the workbook stores them as numbers with a number format, the
figures plot them as they are.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from .._base.units import HOUR, to_degC
from ..case import Case, EndSpec
from ..properties import FeedState, MixtureSummary
from ..stages.results import StageProfile
from .cautions import CAUTIONS

TEXT = "@"  # Excel's number format for text
MONEY = "#,##0"  # whole money units with thousands separators
MIXED = "General"  # a column of labelled values: numbers stay numbers, text stays text
KMOL_PER_H = HOUR / 1e3  # (kmol/h) per (mol/s)
KPA = 1e3  # Pa per kPa
KW = 1e3  # W per kW

Cell = float | int | str | None


@dataclass(frozen=True)
class Column:
    """One column: a label, its display unit ("-" when dimensionless, "" for text) and format."""

    label: str
    unit: str = ""
    number_format: str = "0.000"
    width: float = 14.0

    @property
    def header(self) -> str:
        """The label with its unit in brackets, e.g. ``Temperature [degC]``."""
        return f"{self.label} [{self.unit}]" if self.unit else self.label

    @property
    def is_text(self) -> bool:
        return self.number_format == TEXT

    @property
    def is_mixed(self) -> bool:
        return self.number_format == MIXED


def text(label: str, width: float = 24.0) -> Column:
    """A text column."""
    return Column(label, "", TEXT, width)


@dataclass(frozen=True)
class Table:
    """A titled table; text columns hold ``str``, number columns finite numbers or None (empty)."""

    title: str
    columns: tuple[Column, ...]
    rows: tuple[tuple[Cell, ...], ...]

    def __post_init__(self):
        for number, row in enumerate(self.rows, start=1):
            if len(row) != len(self.columns):
                raise ValueError(f"table '{self.title}', row {number}: {len(row)} cells for "
                                 f"{len(self.columns)} columns")
            for column, value in zip(self.columns, row):
                _check_cell(self.title, number, column, value)

    def column(self, header: str) -> tuple[Cell, ...]:
        """The values of the column with this header (label and unit)."""
        index = [c.header for c in self.columns].index(header)
        return tuple(row[index] for row in self.rows)

    def frame(self):
        """The table as a pandas DataFrame: one column per header (label and unit), empty cells NaN."""
        import pandas  # imported when asked for: it adds about half a second to the command line's start

        frame = pandas.DataFrame(list(self.rows), columns=[c.header for c in self.columns])
        frame.attrs["title"] = self.title
        return frame


def size_text(value: float) -> str:
    """A size or duty to the unit, or to two significant figures below ten (a pilot column's 0.0036 m2 condenser
    and 0.14 kW duty read "0").

    >>> size_text(1860.4), size_text(0.0036), size_text(9.96)
    ('1,860', '0.0036', '10')
    """
    return f"{value:,.0f}" if abs(value) >= 10.0 else f"{value:.2g}"


def fraction_decimals(value: float, decimals: int) -> int | None:
    """Decimal places that tell a fraction [-] apart from 0 or 1: ``decimals`` in between, one past
    the first digit that differs from 1 near 1 (at most 9); None below 0.001, where three
    significant figures in scientific notation say more than fixed decimals (a 1 ppm bottoms).

    >>> fraction_decimals(0.98512, 5), fraction_decimals(0.999998, 4), fraction_decimals(1e-6, 5)
    (5, 7, None)
    """
    if 0.0 < value < 1e-3:
        return None
    if 0.999 < value < 1.0:
        return min(max(decimals, math.ceil(-math.log10(1.0 - value)) + 1), 9)
    return decimals


def is_number(value: Cell) -> bool:
    """True for a finite int or float (bool excluded)."""
    return isinstance(value, (int, float)) and not isinstance(value, bool) and math.isfinite(value)


def _check_cell(title: str, number: int, column: Column, value: Cell) -> None:
    if column.is_text:
        ok, wanted = isinstance(value, str), "text"
    elif column.is_mixed:
        ok, wanted = value is None or isinstance(value, str) or is_number(value), "text or a finite number"
    else:
        ok, wanted = value is None or is_number(value), "a finite number"
    if not ok:
        raise ValueError(f"table '{title}', row {number}, column '{column.header}': {value!r} is not {wanted}")


# ------------------------------------------------------------------ plot data

# Our own palette (hex RGB), used in turn by the series of a chart and of a PNG figure.
PALETTE = ("1F5A7A", "D9822B", "3E8E41", "B23A48", "6C4F9C", "8C6D1F", "2A9D8F", "5C5C5C")
# "guide": a thin dotted reference line (a minimum, an asymptote); "highlight": one large marker (an optimum);
# "open_markers": rings, so a second set of points on top of a first leaves it visible.
STYLES = ("line", "markers", "open_markers", "line_markers", "dashed", "guide", "highlight")


@dataclass(frozen=True)
class Series:
    """One plotted series; ``style`` is one of ``STYLES``; ``colour`` (hex RGB) else the palette's turn."""

    name: str
    x: tuple[float, ...]
    y: tuple[float, ...]
    style: str = "line"
    colour: str | None = None

    def __post_init__(self):
        if len(self.x) != len(self.y):
            raise ValueError(f"series '{self.name}': {len(self.x)} x values for {len(self.y)} y values")
        if self.style not in STYLES:
            raise ValueError(f"series '{self.name}': style {self.style!r} is not one of {', '.join(STYLES)}")


@dataclass(frozen=True)
class Note:
    """A short text written beside a data point (a stage count, say) in the colour of its series."""

    x: float
    y: float
    text: str
    colour: str | None = None


@dataclass(frozen=True)
class SecondAxis:
    """A second scale along the top of a figure: the bottom axis's value divided by ``divisor``."""

    label: str
    divisor: float


@dataclass(frozen=True)
class Plot:
    """The data of one chart: axis labels carry units; ``stage_axis`` puts stage 1 at the top.

    ``notes`` and ``top_axis`` are drawn on the figures; the workbook's charts hold the series.
    """

    name: str  # file stem and chart key, snake_case
    title: str
    x_label: str
    y_label: str
    series: tuple[Series, ...]
    x_limits: tuple[float, float] | None = None
    y_limits: tuple[float, float] | None = None
    stage_axis: bool = False
    notes: tuple[Note, ...] = ()
    top_axis: SecondAxis | None = None

    def colour_of(self, index: int) -> str:
        """Hex RGB of series ``index``: its own colour, else the palette's turn."""
        return self.series[index].colour or PALETTE[index % len(PALETTE)]


# ------------------------------------------------------------------ key-value tables


QUANTITY = text("Quantity [unit]", 46.0)
VALUE = Column("Value", "", MIXED, 30.0)


def quantity_table(title: str, items: list[tuple[str, Cell]]) -> Table:
    """A two-column table of labelled values; each label that names a number carries its unit."""
    return Table(title, (QUANTITY, VALUE), tuple((label, v) for label, v in items))


def _end_spec(spec: EndSpec, key: str, product: str, written: EndSpec | None = None) -> str:
    if spec.kind == "recovery":
        return f"{key}: recovery {spec.value:.6g} [-]"
    by_mass = f" (mass fraction {written.value:.6g} as written)" if written is not None else ""
    return f"{key}: mole fraction {spec.value:.6g} in the {product} [-]{by_mass}"


def case_table(case: Case) -> Table:
    """The case as given (SI converted to display units); text from the case stays text."""
    names = case.components
    p = case.products
    items: list[tuple[str, Cell]] = [
        ("Case title", case.title),
        ("Case file", str(case.source) if case.source else "(not from a file)"),
        ("Component names (as written)", ", ".join(names)),
        ("Thermodynamic method (as asked)", case.thermo.method),
        ("Feed composition basis (as written)", case.feed.composition_basis),
        *((f"Feed mass fraction {name} [-] (as written)", w) for name, w in zip(names, case.feed.composition)
          if case.feed.composition_basis == "mass"),
        ("Top pressure [kPa]", case.column.top_pressure / KPA),
        ("Pressure drop per real tray [kPa]", "auto (sieve-tray hydraulics)"
         if case.column.pressure_drop_per_tray is None else case.column.pressure_drop_per_tray / KPA),
        ("Condenser", case.column.condenser),
        ("Subcooling [K]", case.column.subcooling),
        ("Light key", names[p.light_key]),
        ("Heavy key", names[p.heavy_key]),
        ("Light-key specification", _end_spec(p.light_key_spec, names[p.light_key], "bottoms",
                                              p.written[0] if p.written else None)),
        ("Heavy-key specification", _end_spec(p.heavy_key_spec, names[p.heavy_key], "distillate",
                                              p.written[1] if p.written else None)),
        ("Cost data", str(case.economics.cost_data) if case.economics.cost_data else "bundled"),
        ("Cost year [year]", case.economics.cost_year if case.economics.cost_year is not None else "newest"),
        ("Scenarios named in the case file", ", ".join(case.economics.scenarios) or "none named (reference)"),
        ("Currency", case.economics.currency),
    ]
    return quantity_table("Case", items)


def feed_table(feed: FeedState, names: tuple[str, ...]) -> Table:
    """Feed state in display units, one mole fraction per component."""
    items: list[tuple[str, Cell]] = [
        ("Molar flow [kmol/h]", feed.molar_flow * KMOL_PER_H),
        ("Pressure [kPa]", feed.pressure / KPA),
        ("Temperature [degC]", to_degC(feed.temperature)),
        ("Thermal condition q [-]", feed.q),
        ("Vapour fraction on entry [-]",
         feed.vapour_fraction if feed.vapour_fraction is not None else "not computed (given by q, or let down)"),
        ("Bubble point [degC]", to_degC(feed.bubble_T)),
        ("Dew point [degC]", to_degC(feed.dew_T)),
    ]
    items += [(f"Mole fraction {name} [-]", zi) for name, zi in zip(names, feed.z)]
    return quantity_table("Feed", items)


def components_table(mixture: MixtureSummary) -> Table:
    """The mixture's components: names as written, databank identity, properties, feed fraction."""
    columns = (text("Component (as written)"), text("Databank name"), text("CAS number", 14.0),
               Column("Molar mass", "g/mol", "0.00"), Column("Normal boiling point", "degC", "0.00", 22.0),
               Column("Feed mole fraction", "-", "0.0000", 20.0))
    rows = tuple((c.name, c.databank_name, c.cas, c.molar_mass * 1e3, to_degC(c.normal_boiling_point),
                  c.feed_fraction) for c in mixture.components)
    return Table("Components", columns, rows)


def mixture_table(mixture: MixtureSummary) -> Table:
    """Method, keys, volatility range, feed bubble and dew points and azeotropes at top pressure."""
    items: list[tuple[str, Cell]] = [
        ("Thermodynamic method (used)", mixture.method),
        *(() if not mixture.untuned_polar_pairs else (
            ("Pairs needing an interaction parameter, none given (kij = 0)", ", ".join(mixture.untuned_polar_pairs)),)),
        *(() if not mixture.acids_without_dimerisation else (
            ("Acids whose vapour dimerisation is left out, unmeasured", ", ".join(mixture.acids_without_dimerisation)),)),
        ("Top pressure [kPa]", mixture.pressure / KPA),
        ("Light key", mixture.light_key),
        ("Heavy key", mixture.heavy_key),
        ("Key relative volatility, lowest [-]", mixture.key_volatility_min),
        ("Key relative volatility, highest [-]", mixture.key_volatility_max),
        *(() if mixture.vapour is None else (
            ("Key relative volatility at the feed bubble point, vapour as ideal gas [-]", mixture.vapour.alpha_ideal_gas),
            ("Key relative volatility at the feed bubble point, real vapour [-]", mixture.vapour.alpha_real_vapour))),
        *(() if mixture.association is None else (
            (f"Key relative volatility, lowest, with {mixture.association.acid} dimerising in the vapour [-]",
             mixture.association.alpha_min),
            (f"Key relative volatility, highest, with {mixture.association.acid} dimerising in the vapour [-]",
             mixture.association.alpha_max))),
        ("Feed bubble point at top pressure [degC]", to_degC(mixture.feed_bubble_T)),
        ("Feed dew point at top pressure [degC]", to_degC(mixture.feed_dew_T)),
    ]
    for a in mixture.azeotropes:
        items += [(f"Azeotrope {a.first}/{a.second} ({a.kind}): mole fraction {a.first} [-]", a.x_first),
                  (f"Azeotrope {a.first}/{a.second} ({a.kind}): temperature [degC]", to_degC(a.T))]
        if a.alpha_dimerised is not None:
            items.append((f"Azeotrope {a.first}/{a.second}: relative volatility there with {a.dimerising} "
                          "dimerising in the vapour [-]", a.alpha_dimerised))
    if not mixture.azeotropes:
        items.append(("Azeotropes", "none found between any pair at top pressure"))
    return quantity_table("Mixture", items)


def stage_profile_table(profile: StageProfile, names: tuple[str, ...]) -> Table:
    """Per stage from the top: T, P, liquid and vapour flows leaving, x_i and y_i."""
    columns = [Column("Stage", "-", "0", 8.0), text("Role", 12.0),
               Column("Temperature", "degC", "0.00"), Column("Pressure", "kPa", "0.00"),
               Column("Liquid flow", "kmol/h", "0.00"), Column("Vapour flow", "kmol/h", "0.00")]
    columns += [Column(f"x {name}", "-", "0.00000") for name in names]
    columns += [Column(f"y {name}", "-", "0.00000") for name in names]
    rows = []
    for i in range(profile.stages):
        n = i + 1
        role = "reboiler" if n == profile.stages else "feed" if n == profile.feed_stage else ""
        rows.append((n, role, to_degC(profile.T[i]), profile.P[i] / KPA, profile.L[i] * KMOL_PER_H,
                     profile.V[i] * KMOL_PER_H, *profile.x[i], *profile.y[i]))
    return Table("Stage profile", tuple(columns), tuple(rows))


def stages_counted(profile: StageProfile) -> str:
    """What the stage count holds: the reboiler, and not a partial condenser (an equilibrium contact above stage 1)."""
    return "reboiler included" + (", the partial condenser a further equilibrium stage" if profile.partial_condenser
                                  else "")


def design_items(profile: StageProfile) -> list[tuple[str, Cell]]:
    return [
        ("Reflux ratio [-]", profile.reflux_ratio),
        (f"Equilibrium stages, {stages_counted(profile)} [-]", profile.stages),
        ("Feed stage, from the top [-]", profile.feed_stage),
        ("Distillate flow [kmol/h]", profile.distillate_flow * KMOL_PER_H),
        ("Bottoms flow [kmol/h]", profile.bottoms_flow * KMOL_PER_H),
        ("Condenser duty [kW]", profile.condenser_duty / KW),
        ("Reboiler duty [kW]", profile.reboiler_duty / KW),
        ("Condenser temperature [degC]", to_degC(profile.condenser_temperature)),
        ("Reboiler temperature [degC]", to_degC(profile.reboiler_temperature)),
    ]


def products_table(profile: StageProfile, names: tuple[str, ...]) -> Table:
    """Distillate and bottoms: flows, compositions, duties and end temperatures."""
    items = design_items(profile)
    items += [(f"Distillate mole fraction {n} [-]", v) for n, v in zip(names, profile.distillate_composition)]
    items += [(f"Bottoms mole fraction {n} [-]", v) for n, v in zip(names, profile.bottoms_composition)]
    return quantity_table("Products", items)


def cautions_table(extra: tuple[str, ...] = ()) -> Table:
    """The standing cautions of every estimate, then ``extra`` ones (e.g. from the cost data)."""
    cautions = CAUTIONS + tuple(c for c in extra if c not in CAUTIONS)
    return Table("Cautions", (text("Caution", 120.0),), tuple((c,) for c in cautions))


def warnings_table(warnings: tuple[str, ...] | list[str]) -> Table:
    """Every warning of the run, numbered."""
    rows = tuple((i, w) for i, w in enumerate(warnings, start=1)) or ((0, "no warnings"),)
    return Table("Warnings", (Column("No.", "-", "0", 6.0), text("Warning", 120.0)), rows)


# ------------------------------------------------------------------ plots


def nice_limits(values) -> tuple[float, float]:
    """Axis limits around ``values`` on round steps (a power of ten below their span).

    A spreadsheet starts an automatic axis at zero when the data lie far from it; fixed
    limits keep a profile readable.

    >>> nice_limits([85.2, 118.7])
    (80.0, 120.0)
    """
    span = max(values) - min(values)
    power = math.floor(math.log10(span if span > 0.0 else max(abs(max(values)), 1.0)))
    step, digits = 10.0 ** power, max(0, -power)
    low = round(math.floor(min(values) / step) * step, digits)
    high = round(math.ceil(max(values) / step) * step, digits)
    return (low, high) if high > low else (low - step, high + step)

"""size_column on a hand-built benzene-toluene profile: equipment list, options, errors, warnings."""

import dataclasses
import json
import math

import pytest

from disteco._base.errors import CaseError, CorrelationRangeError, InfeasibleSpecError
from disteco._base.validity import OutOfRange
from disteco.sizing import SizingOptions, UtilityLevel, required_tray_area, size_column
from disteco.stages.results import StageProfile

C = 273.15
UTILITIES = (  # levels for the tests only
    UtilityLevel("cooling water", "cooling", "cooling_water", C + 30, C + 45, heat_capacity=4180.0),
    UtilityLevel("low-pressure steam", "heating", "steam", C + 160, C + 160, latent_heat=2.08e6),
)
N, FEED, D, R = 12, 6, 13.9, 2.0  # stages, feed stage, distillate mol/s, reflux ratio


@pytest.fixture(scope="module")
def mixture(benzene_toluene):
    return benzene_toluene


def make_profile(mixture, liquid_scale=1.0, top=101325.0, drop=700.0):
    """A column at ``top`` [Pa] (1 atm), ``drop`` [Pa] per stage (0.7 kPa); bubble-point stages, constant molar
    overflow."""
    pressures = [top + drop * i for i in range(N)]
    points = [mixture.bubble_point(p, (x, 1.0 - x))
              for p, x in zip(pressures, [0.95 - 0.92 * i / (N - 1) for i in range(N)])]
    liquid = [R * D * liquid_scale] * (FEED - 1) + [(R * D + 2 * D) * liquid_scale] * (N - FEED) + [D]
    return StageProfile(
        T=tuple(p.T for p in points), P=tuple(pressures), L=tuple(liquid), V=((R + 1) * D,) * N,
        x=tuple(p.x for p in points), y=tuple(p.y for p in points), feed_stage=FEED, reflux_ratio=R,
        distillate_flow=D, bottoms_flow=D, distillate_composition=points[0].x,
        bottoms_composition=points[-1].x, condenser_duty=(R + 1) * D * 31e3,
        reboiler_duty=(R + 1) * D * 33e3, condenser_temperature=points[0].T)


@pytest.fixture(scope="module")
def sized(mixture):
    return size_column(make_profile(mixture), mixture, UTILITIES, 850.0, 1000.0)


def test_equipment_list(sized):
    tags = [item.tag for item in sized.equipment]
    assert tags == ["column", "trays", "condenser", "reboiler", "reflux_drum", "reflux_pump"]
    units = {item.tag: item.size_unit for item in sized.equipment}
    assert units == {"column": "kg", "trays": "m", "condenser": "m^2", "reboiler": "m^2",
                     "reflux_drum": "m^3", "reflux_pump": "W"}
    trays = sized.equipment[1]
    assert trays.quantity == sized.real_trays and trays.size == sized.diameter
    assert all(item.design_pressure > 0.0 and item.design_temperature > C for item in sized.equipment)
    assert sized.condenser.utility.name == "cooling water"
    assert sized.reboiler.utility.name == "low-pressure steam"


def test_result_serialises_to_json(sized):
    text = json.dumps(dataclasses.asdict(sized), allow_nan=False)
    assert '"tag": "reflux_pump"' in text


def test_regression_pin(sized):
    """Regression pin only: guards against unnoticed change, not a published value."""
    assert sized.diameter == pytest.approx(1.20)
    assert sized.real_trays == 21
    assert sized.efficiency.value == pytest.approx(0.538, abs=0.002)
    assert sized.condenser.area == pytest.approx(35.2, abs=0.1)
    assert sized.warnings == ()


def test_column_diameter_is_rounded_largest_tray(sized):
    largest = max(t.diameter for t in sized.hydraulics)
    assert sized.diameter - 0.05 < largest <= sized.diameter
    assert len(sized.hydraulics) == N - 1
    assert max(sized.rectifying_diameter, sized.stripping_diameter) == sized.diameter


def test_shared_area_function_gives_every_tray(mixture, sized):
    """The branch-free area function the model also uses gives each tray's area (regression guard)."""
    profile = make_profile(mixture)
    for tray in sized.hydraulics:
        i = tray.stage - 1
        area = required_tray_area(
            profile.V[i] * mixture.molar_mass(profile.y[i]), profile.L[i] * mixture.molar_mass(profile.x[i]),
            tray.liquid_density, tray.vapour_density, tray.surface_tension, 24 * 0.0254, 0.8)
        assert area == pytest.approx(tray.total_area, rel=1e-12)
        assert math.pi / 4 * tray.diameter ** 2 == pytest.approx(area, rel=1e-12)


def test_user_efficiency_and_separate_sections(mixture):
    options = SizingOptions(tray_efficiency=0.7, separate_sections=True, diameter_increment=0.01)
    sized = size_column(make_profile(mixture), mixture, UTILITIES, 850.0, 1000.0, options)
    assert sized.real_trays == 16  # ceil(11 / 0.7)
    assert sized.efficiency.method == "user value" and sized.efficiency.viscosity is None
    tags = [item.tag for item in sized.equipment]
    assert "trays_rectifying" in tags and "trays_stripping" in tags
    counts = {item.tag: item.quantity for item in sized.equipment}
    assert counts["trays_rectifying"] + counts["trays_stripping"] == 16


# ---------------------------------------------------------------- bad input


def test_tray_spacing_outside_correlation_range():
    with pytest.raises(CaseError, match="sizing.tray_spacing: 0.1 m is outside the range of the flooding"):
        SizingOptions(tray_spacing=0.1)


@pytest.mark.parametrize("field, value, match", [
    ("flood_fraction", 1.2, "sizing.flood_fraction: 1.2 is not a fraction"),
    ("flood_fraction", 0.0, "sizing.flood_fraction"),
    ("flooding_method", "chart", "unknown method 'chart'"),
    ("shell_material", "wood", "sizing.shell_material: unknown material 'wood'"),
    ("corrosion_allowance", -1e-3, "sizing.corrosion_allowance"),
    ("heavy_key", 0, "two different component indices"),
])
def test_bad_options(field, value, match):
    with pytest.raises(CaseError, match=match):
        SizingOptions(**{field: value})


def test_flow_parameter_outside_chart_warns_or_raises(mixture):
    profile = make_profile(mixture, liquid_scale=0.1)
    sized = size_column(profile, mixture, UTILITIES, 850.0, 1000.0)
    assert any("flow parameter outside 0.01 to 1" in w and "stage(s) 1, 2" in w for w in sized.warnings)
    with pytest.raises(CorrelationRangeError, match=r"Fair flooding chart \(stage 1\): flow parameter"):
        size_column(profile, mixture, UTILITIES, 850.0, 1000.0, SizingOptions(out_of_range=OutOfRange.RAISE))


class _ThinLiquid:
    """The benzene-toluene properties with a liquid viscosity of 0.01 cP (a near-critical liquid's order)."""

    def __init__(self, mixture):
        self._mixture = mixture

    def __getattr__(self, name):
        return getattr(self._mixture, name)

    def liquid_viscosity(self, T, P, x):
        return 1e-5


def test_efficiency_range_warning_names_the_column_mean_not_a_stage(mixture):
    """O'Connell's correlation takes one column-wide viscosity x volatility: the warning names that place."""
    sized = size_column(make_profile(mixture), _ThinLiquid(mixture), UTILITIES, 850.0, 1000.0)
    [warning] = [w for w in sized.warnings if w.startswith("extrapolated: O'Connell")]
    assert "at the column's mean of top tray and reboiler (0.02" in warning and "stage" not in warning.split(" at ")[1]
    with pytest.raises(CorrelationRangeError, match=r"O'Connell .*\(the column's mean of top tray and reboiler\)"):
        size_column(make_profile(mixture), _ThinLiquid(mixture), UTILITIES, 850.0, 1000.0,
                    SizingOptions(out_of_range=OutOfRange.RAISE))


def test_no_steam_hot_enough(mixture):
    cool_steam = (UTILITIES[0], UtilityLevel("steam 100 degC", "heating", "steam", C + 100, C + 100,
                                             latent_heat=2.26e6))
    with pytest.raises(InfeasibleSpecError, match=r"reboiler: .* steam 100 degC 100.0 -> 100.0 degC"):
        size_column(make_profile(mixture), mixture, cool_steam, 850.0, 1000.0)


def test_profile_feed_stage_checked(mixture):
    profile = dataclasses.replace(make_profile(mixture), feed_stage=N + 1)
    with pytest.raises(CaseError, match="profile.feed_stage"):
        size_column(profile, mixture, UTILITIES, 850.0, 1000.0)


def test_partial_condenser_drum_holds_reflux_only(mixture, sized):
    """Total condenser: reflux + distillate, (R + 1) D, to the drum; partial: reflux R D only."""
    profile = dataclasses.replace(make_profile(mixture), partial_condenser=True)
    partial = size_column(profile, mixture, UTILITIES, 850.0, 1000.0)
    assert partial.reflux_drum.volume == pytest.approx(sized.reflux_drum.volume * R / (R + 1), rel=0.02)


def test_lowest_metal_temperatures_and_cold_service_warning(mixture, sized):
    """Each item carries its lowest operating metal temperature (process or utility side). The
    benzene column on cooling water stays warm: no warning. Condensed on a -40 degC refrigerant,
    the condenser's metal meets -40 degC, below -28.9 degC (-20 degF), the lowest temperature of
    the SA-516 Grade 70 allowable-stress table (ASME BPVC Section II Part D Table 1A, from
    memory), and only the condenser is named."""
    profile = make_profile(mixture)
    lowest = {item.tag: item.minimum_temperature for item in sized.equipment}
    assert lowest["column"] == pytest.approx(min(profile.T))
    assert lowest["condenser"] == pytest.approx(C + 30)  # the cooling water's supply
    assert lowest["reboiler"] == pytest.approx(min(profile.T[-2:]))
    assert lowest["reflux_drum"] == pytest.approx(profile.condenser_temperature)
    assert not any("metal temperature" in w for w in sized.warnings)
    cold = (UtilityLevel("refrigerant", "cooling", "refrigerant", C - 40, C - 40), UTILITIES[1])
    chilled = size_column(profile, mixture, cold, 850.0, 1000.0)
    assert {i.tag: i.minimum_temperature for i in chilled.equipment}["condenser"] == pytest.approx(C - 40)
    [warning] = [w for w in chilled.warnings if "metal temperature" in w]
    assert "below -28.9 degC" in warning and "condenser -40.0 degC" in warning
    assert "column" not in warning.split(":")[1]


def test_reboiler_flux_against_the_peak_heat_flux(mixture, sized):
    """Zuber's peak heat flux (K 0.149) against the ht library's implementation (a general-purpose
    reference library) at two states; the benzene reboiler on low-pressure steam stays far below its
    peak, while an overall coefficient of 100 kW/(m2 K) (a tiny area) is warned with the area needed."""
    from ht.boiling_nucleic import Zuber

    from disteco.sizing.boiling import zuber_peak_heat_flux

    for state in ((272e3, 567.0, 18.09, 8.2e-3), (360e3, 780.0, 2.9, 0.018)):
        hvap, rhol, rhog, sigma = state
        assert zuber_peak_heat_flux(*state) == pytest.approx(Zuber(sigma, hvap, rhol, rhog, K=0.149), rel=1e-12)
    assert not any("heat flux" in w for w in sized.warnings)
    profile = make_profile(mixture)
    tiny = size_column(profile, mixture, UTILITIES, 850.0, 1e5)
    [warning] = [w for w in tiny.warnings if "heat flux" in w]
    flux = profile.reboiler_duty / tiny.reboiler.area
    assert f"mean heat flux {flux / 1e3:,.0f} kW/m2" in warning and "film boiling" in warning
    needed = float(warning.split("at least ")[1].split(" m2")[0].replace(",", ""))
    assert tiny.reboiler.area < needed < sized.reboiler.area


def test_an_efficiency_far_beyond_o_connell_s_data_is_said_on_the_console():
    """A water/glycol regenerator's keys (relative volatility about 77 at the column's mean, liquid
    0.6 mPa s) put viscosity x volatility at 46 cP, six times the top of O'Connell's data (7.5 cP,
    Lockett's fit): the efficiency 0.492 x 46.2^-0.245 = 0.19 sets the real trays, so a sizing warning
    that the console shows says so; a benzene-like 0.75 cP gives none."""
    from types import SimpleNamespace

    from disteco.reports.notes import console_warnings, kind_of
    from disteco.sizing.column import _efficiency
    from disteco.sizing.options import SizingOptions

    profile = SimpleNamespace(stages=2, T=[350.0, 400.0], P=[2e4, 3e4], x=[[0.99, 0.01], [0.01, 0.99]],
                              y=[[1.0, 0.0], [0.5, 0.5]])

    def efficiency(alpha):
        mixture = SimpleNamespace(liquid_viscosity=lambda T, P, x: 0.6e-3,
                                  relative_volatility=lambda T, P, x, light, heavy, y: alpha)
        warnings: list[str] = []
        found = _efficiency(profile, mixture, SizingOptions(light_key=0, heavy_key=1), warnings)
        return found.value, [w for w in warnings if w.startswith("tray efficiency")]

    value, (warning,) = efficiency(77.0)
    assert value == pytest.approx(0.492 * 46.2 ** -0.245, rel=1e-9)
    assert warning.startswith("tray efficiency 0.19 from O'Connell's correlation at 6.16 times the top of its data")
    assert kind_of(warning).name == "sizing and mechanical" and console_warnings((warning,))[0] == (warning,)
    assert efficiency(1.25)[1] == []


def test_a_column_wider_than_eight_metres_is_said_to_be_rare(mixture, sized):
    """Fifty times the flows: a column about 7 x wider (the flooding area goes with the vapour flow), warned
    as rare with two columns in parallel to consider (common practice, no source)."""
    base = make_profile(mixture)
    scale = 50.0
    wide = dataclasses.replace(base, L=tuple(scale * f for f in base.L), V=tuple(scale * f for f in base.V),
                               distillate_flow=scale * D, bottoms_flow=scale * D,
                               condenser_duty=scale * base.condenser_duty, reboiler_duty=scale * base.reboiler_duty)
    column = size_column(wide, mixture, UTILITIES, 850.0, 1000.0)
    assert column.diameter == pytest.approx(sized.diameter * math.sqrt(scale), rel=0.05)
    assert column.diameter > 8.0
    [warning] = [w for w in column.warnings if "above 8 m" in w]
    assert f"column diameter {column.diameter:.2f} m" in warning and "two columns in parallel" in warning
    assert not any("above 8 m" in w for w in sized.warnings)


@pytest.mark.parametrize("top, drop, warned", [(120e3, 13e3, True), (120e3, 10e3, False), (101325.0, 700.0, False)])
def test_trays_that_more_than_double_a_columns_pressure_are_pointed_out(mixture, top, drop, warned):
    """Above atmospheric pressure too: a column whose trays take its bottom past twice its top pressure gets
    a warning with both pressures, that its temperatures rise with them and that packing takes a fraction of a
    tray's drop (an acetone/water column at 1.2 bar reached 282 kPa through 170 trays without a word; the
    vacuum columns' warning, three times the top, is tested in test_vacuum_column). 12 stages: 120 kPa + 11 x
    13 kPa = 263 kPa, 2.2 x; 11 x 10 kPa, 1.9 x: no warning."""
    sized = size_column(make_profile(mixture, top=top, drop=drop), mixture, UTILITIES, 850.0, 1000.0)
    notes = [w for w in sized.warnings if "trays' pressure drop takes the bottom" in w]
    assert len(notes) == warned
    if warned:
        bottom = top + 11 * drop
        assert notes[0].startswith(f"the trays' pressure drop takes the bottom of this column to {bottom / 1e3:.4g} "
                                   f"kPa, {bottom / top:.1f} x the top's 120 kPa")
        assert "packing takes a fraction of a tray's drop per stage" in notes[0]

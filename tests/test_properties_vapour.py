"""The vapour of light hydrocarbons under pressure: the automatic method and the ideal-gas check.

The reference library is thermo: its Peng-Robinson flash and its gamma-phi liquid (the
databank's vapour pressures with saturation fugacity coefficients and Poynting factors).
"""

import re

import pytest
from thermo import ChemicalConstantsPackage, CEOSGas, CEOSLiquid, FlashVL, PRMIX

from disteco.case import Thermo
from disteco.cli import main
from disteco.properties import build_mixture, choose_method
from disteco.properties.components import resolve_components
from disteco.properties.summary import summarise_mixture, vapour_ideality
from disteco.reports.json_result import mixture_json
from disteco.reports.notes import console_warnings, kind_of
from disteco.reports.tables import mixture_table

from conftest import EXAMPLES

BUTANES = ("isobutane", "n-butane")
FEED = (0.4, 0.6)


def _thermo_pr_alpha(names, P, z):
    """The key relative volatility at the bubble point of ``z`` by thermo's own Peng-Robinson flash (kij zero)."""
    constants, correlations = ChemicalConstantsPackage.from_IDs(list(names))
    kwargs = dict(eos_kwargs=dict(Tcs=constants.Tcs, Pcs=constants.Pcs, omegas=constants.omegas),
                  HeatCapacityGases=correlations.HeatCapacityGases, T=300.0, P=1e5, zs=list(z))
    flasher = FlashVL(constants, correlations, liquid=CEOSLiquid(PRMIX, **kwargs), gas=CEOSGas(PRMIX, **kwargs))
    result = flasher.flash(P=P, VF=0.0, zs=list(z))
    x, y = result.liquid0.zs, result.gas.zs
    return (y[0] / x[0]) / (y[1] / x[1])


@pytest.mark.parametrize("names, pressure, method", [
    (BUTANES, 8e5, "peng-robinson"),            # the butane splitter example's pressure
    (BUTANES, 1.5e5, "ideal"),                  # near atmospheric: Raoult's law
    (("n-pentane", "n-hexane"), 2.5e5, "peng-robinson"),
    (("methanol", "water"), 5e5, "unifac-dortmund"),   # polar: activity coefficients up to 10 bar
    (("methanol", "water"), 12e5, "peng-robinson"),
    (("nitrogen", "oxygen"), 1.3e5, "ideal"),   # hetero-atoms but no dipole: no UNIFAC groups either
    (("carbon dioxide", "propane"), 5e5, "peng-robinson"),
    (("thiophene", "benzene"), 1e5, "unifac-dortmund"),  # thiophene 0.55 D stays polar
    (("benzene", "cyclohexane"), 1.05e5, "unifac-dortmund"),  # aromatic with aliphatic: not an ideal liquid
    (("n-hexane", "benzene", "toluene"), 1.5e5, "unifac-dortmund"),
    (("benzene", "toluene"), 1.15e5, "ideal"),  # aromatics alone
    (("ethylbenzene", "styrene"), 8e3, "ideal"),
    (("benzene", "cyclohexane"), 5e5, "peng-robinson"),  # above 2 bar the vapour is the larger error
])
def test_automatic_method(names, pressure, method):
    """Peng-Robinson above 10 bar; UNIFAC (Dortmund) for a polar mixture below it; Peng-Robinson
    for a non-polar mixture above 2 bar, where Raoult's law's ideal-gas vapour is the larger error
    (the line is measured, see choose_method), Raoult's law below. A molecule with hetero-atoms
    whose dipole moment in the databank is below 0.5 D counts as non-polar (nitrogen 0, oxygen 0,
    carbon dioxide 0 D: the databank's values, chemicals.dipole)."""
    assert choose_method(resolve_components(names), pressure) == method


def test_benzene_cyclohexane_azeotrope_refuses_a_split_across_it(tmp_path, capsys):
    """Benzene/cyclohexane at 1.05 bar: the automatic method takes UNIFAC (Dortmund) and finds the
    minimum-boiling azeotrope (about 54 % benzene, 77.6 degC at 1 atm, from memory: Gmehling et al.,
    Azeotropic Data); with Raoult's law the same case was sent on to an 18.6 m shell at a reflux ratio
    of 138 (the key relative volatility near 1.02)."""
    case = tmp_path / "case.toml"
    case.write_text('title = "t"\n[mixture]\ncomponents = ["benzene", "cyclohexane"]\n[feed]\nflow = "50 kmol/h"\n'
                    'composition = { benzene = 0.3, cyclohexane = 0.7 }\nq = 1.0\n[column]\ntop_pressure = "1.05 bar"\n'
                    '[products]\ndistillate_light_key_fraction = 0.9\nbottoms_light_key_fraction = 0.01\n')
    assert main(["check", str(case)]) == 2
    err = capsys.readouterr().err
    found = re.search(r"minimum-boiling azeotrope of benzene and cyclohexane at ([\d.]+) \(([\d.]+) degC", err)
    assert found, err
    assert 0.50 < float(found.group(1)) < 0.58 and 77.0 < float(found.group(2)) < 79.5
    assert ("predicted by unifac-dortmund without parameters fitted to the pair: where equilibrium data show none, "
            "give NRTL or Wilson parameters fitted to them") in err


def test_real_vapour_of_raoults_law_agrees_with_peng_robinson():
    """Isobutane/n-butane at 8 bar: Raoult's law overstates the key relative volatility; the same
    liquid with vapour, saturation fugacity coefficients and Poynting factors (thermo's gamma-phi
    route) agrees with thermo's Peng-Robinson flash within 0.5 %. Measured: 1.3548 (Raoult),
    1.2722 (real vapour)."""
    mixture = build_mixture(BUTANES, Thermo("ideal"), 8e5)
    mixture.clear_warnings()
    found = vapour_ideality(mixture, mixture.bubble_point(8e5, FEED), 0, 1)
    reference = _thermo_pr_alpha(BUTANES, 8e5, FEED)
    assert found.alpha_real_vapour == pytest.approx(reference, rel=0.005)
    assert 0.05 < found.deviation < 0.08
    (note,) = mixture.warnings
    assert "ideal gas at a top pressure of 800 kPa" in note and f"{100 * found.deviation:+.1f} %" in note
    assert 'method = "peng-robinson"' in note
    assert kind_of(note).name == "properties and model" and console_warnings((note,)) == ((note,), 0)


def test_no_ideal_gas_check_where_it_does_not_apply():
    """Peng-Robinson has a real vapour; at 2 bar and below the check is not run (no note)."""
    pr = build_mixture(BUTANES, Thermo("peng-robinson"), 8e5)
    ideal = build_mixture(BUTANES, Thermo("ideal"), 1.5e5)
    for mixture, pressure in ((pr, 8e5), (ideal, 1.5e5)):
        mixture.clear_warnings()
        assert vapour_ideality(mixture, mixture.bubble_point(pressure, FEED), 0, 1) is None
        assert mixture.warnings == ()


def test_check_prints_the_ideal_gas_deviation(tmp_path, capsys):
    """The butane splitter with Raoult's law chosen by hand: check reports both relative volatilities."""
    text = (EXAMPLES / "c4_splitter.toml").read_text().replace("[mixture]\n", '[mixture]\nmethod = "ideal"\n')
    case = tmp_path / "c4_ideal.toml"
    case.write_text(text)
    assert main(["check", str(case)]) == 0
    (line,) = [s for s in capsys.readouterr().out.splitlines() if s.startswith("Vapour taken as an ideal gas")]
    assert "1.2722 [-] with a real vapour (the ideal gas's +6.5 %)" in line


def test_result_file_and_workbook_table_carry_both_relative_volatilities():
    """result.json `mixture.ideal_gas_vapour_check` and the workbook's mixture table hold the two
    values the check computed; a Peng-Robinson mixture has none (null, no rows)."""
    for method, expected in (("ideal", True), ("peng-robinson", False)):
        mixture = build_mixture(BUTANES, Thermo(method), 8e5)
        mixture.clear_warnings()
        summary = summarise_mixture(mixture, FEED, 8e5, 0, 1)
        found = mixture_json(summary)["ideal_gas_vapour_check"]
        labels = [row[0] for row in mixture_table(summary).rows]
        assert ("Key relative volatility at the feed bubble point, real vapour [-]" in labels) == expected
        if not expected:
            assert found is None
            continue
        assert found["key_relative_volatility_real_vapour"] == summary.vapour.alpha_real_vapour
        assert found["ideal_gas_deviation_fraction"] == pytest.approx(
            found["key_relative_volatility_ideal_gas_vapour"] / found["key_relative_volatility_real_vapour"] - 1.0)

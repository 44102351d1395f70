"""thermo's data packages kept on disk: equal to a fresh build, rebuilt when damaged, never required."""

import pytest
from thermo import ChemicalConstantsPackage

from disteco.case import Thermo
from disteco.properties import data_cache
from disteco.properties.mixture import Mixture
from disteco.properties.components import resolve_components

ETHANOL_WATER = ["64-17-5", "7732-18-5"]
CORRELATIONS = ("VaporPressures", "HeatCapacityGases", "VolumeLiquids", "EnthalpyVaporizations",
                "ViscosityLiquids", "ViscosityGases", "ThermalConductivityLiquids", "SurfaceTensions")


@pytest.fixture
def folder(tmp_path, monkeypatch):
    monkeypatch.setenv(data_cache.ENVIRONMENT, str(tmp_path / "cache"))
    return tmp_path / "cache"


def _no_tables(monkeypatch):
    def no_tables(ids):
        raise AssertionError("the data tables were read although the packages are kept")

    monkeypatch.setattr(ChemicalConstantsPackage, "from_IDs", staticmethod(no_tables))


def _same_correlations(one, other) -> None:
    """Every temperature-dependent correlation: same chosen method, same methods, same value at 300 K."""
    for group in CORRELATIONS:
        for a, b in zip(getattr(one, group), getattr(other, group), strict=True):
            assert (a.method, set(a.all_methods)) == (b.method, set(b.all_methods)), group
            assert a.T_dependent_property(300.0) == b.T_dependent_property(300.0), group


def test_kept_packages_equal_a_fresh_build_and_are_read_back(folder, monkeypatch):
    """The JSON round trip is thermo's own (as_json/from_json): constants compare equal, every
    correlation gives the same method and value, and a second call reads the file, not the tables."""
    fresh = ChemicalConstantsPackage.from_IDs(ETHANOL_WATER)
    first = data_cache.component_packages(ETHANOL_WATER)
    [stored] = list(folder.iterdir())
    assert stored.suffix == ".json" and not list(folder.glob(".*.part"))
    _no_tables(monkeypatch)
    kept = data_cache.component_packages(ETHANOL_WATER)
    for package in (first, kept):
        assert package[0] == fresh[0]
        _same_correlations(package[1], fresh[1])


def test_mixture_from_kept_packages_gives_the_same_equilibrium(folder):
    """Ethanol/water by UNIFAC (Dortmund) at 1 atm: the bubble point of x = 0.1 from kept packages
    equals the one from a fresh build to the last digit (reference: thermo's own flash, fresh)."""
    components = resolve_components(("ethanol", "water"))
    fresh = Mixture(components, "unifac-dortmund", Thermo("unifac-dortmund")).bubble_point(101325.0, [0.1, 0.9])
    assert list(folder.iterdir())  # written by the first build
    kept = Mixture(components, "unifac-dortmund", Thermo("unifac-dortmund")).bubble_point(101325.0, [0.1, 0.9])
    assert kept.T == fresh.T and kept.y == fresh.y
    assert 350.0 < kept.T < 360.0


def test_damaged_file_is_rebuilt_and_written_again(folder, monkeypatch):
    data_cache.component_packages(ETHANOL_WATER)
    [stored] = list(folder.iterdir())
    stored.write_text('{"not": "packages"', encoding="utf-8")
    constants, _ = data_cache.component_packages(ETHANOL_WATER)
    assert constants.Tcs == pytest.approx([514.71, 647.096], abs=0.5)  # ethanol, water (chemicals' tables)
    _no_tables(monkeypatch)
    assert data_cache.component_packages(ETHANOL_WATER)[0] == constants  # the file was written again


def test_cache_off_or_unwritable_still_gives_the_packages(tmp_path, monkeypatch):
    monkeypatch.setenv(data_cache.ENVIRONMENT, "")
    assert data_cache.cache_folder() is None
    assert data_cache.component_packages(ETHANOL_WATER)[0].N == 2
    blocker = tmp_path / "a_file"
    blocker.write_text("")
    monkeypatch.setenv(data_cache.ENVIRONMENT, str(blocker / "cache"))  # a folder below a file
    assert data_cache.component_packages(ETHANOL_WATER)[0].N == 2
    assert blocker.read_text() == ""


def test_exact_names_are_kept_and_unknown_ones_never(folder, monkeypatch):
    """A name resolved exactly is read back without the identifier tables; an obsolete synonym is
    refused every time (nothing is kept for it). Reference: chemicals' databank, benzene 71-43-2."""
    from disteco._base.errors import CaseError
    from disteco.properties import components

    first = components.resolve_component(" Benzene ")
    assert (first.cas, first.formula) == ("71-43-2", "C6H6")

    def no_tables(text):
        raise AssertionError("the identifier tables were searched although the name is kept")

    monkeypatch.setattr(components, "search_chemical", no_tables)
    assert components.resolve_component("benzene") == components.ComponentId("benzene", "71-43-2", first.name,
                                                                               "C6H6")
    monkeypatch.undo()
    monkeypatch.setenv(data_cache.ENVIRONMENT, str(folder))
    for _ in range(2):
        with pytest.raises(CaseError, match="unknown component 'benzine'"):
            components.resolve_component("benzine")

"""Cost-data files: fingerprints of the bundled tables, a user folder, and malformed input.

Fingerprints are regression pins: they only guard against accidental edits of the
bundled data (row counts, key columns, ranges, a source on every row).
"""

import csv
import shutil
from importlib.resources import files
from pathlib import Path

import pytest

from disteco._base.errors import CaseError, CostDataError
from disteco.costing import ColumnCostInput, cost_column, load_cost_data, resolve_scenarios
from disteco.costing.validation import FILES

BUNDLED = Path(str(files("disteco.cost_data")))

# file -> (data rows, key columns)
FINGERPRINT = {
    "purchased_cost_correlations.csv": (11, ("item",)),
    "material_factors.csv": (25, ("material_group", "material")),
    "bare_module_factors.csv": (6, ("bare_module_group",)),
    "pressure_factors.csv": (2, ("pressure_group",)),
    "vessel_pressure_factor.csv": (2, ("pressure_group",)),
    "tray_quantity_factor.csv": (1, ("c1",)),
    "cost_index.csv": (23, ("year",)),
    "heat_transfer_coefficients.csv": (11, ("service", "process_side", "utility_kind")),
    "utility_levels.csv": (9, ("name",)),
    "scenarios.csv": (3, ("scenario",)),
    "utility_prices.csv": (30, ("scenario", "utility")),
    "utility_price_index.csv": (46, ("index_name", "year")),
}


def _rows(name):
    with open(BUNDLED / name, newline="", encoding="utf-8") as handle:
        return list(csv.DictReader(handle))


@pytest.mark.parametrize("name", sorted(FINGERPRINT))
def test_bundled_table_fingerprint(name):
    """Row count, unique keys and a non-empty source on every row (regression pin)."""
    count, keys = FINGERPRINT[name]
    rows = _rows(name)
    assert len(rows) == count
    assert len({tuple(r[k] for k in keys) for r in rows}) == count
    assert all(r["source"].strip() for r in rows)


def test_every_csv_file_is_in_the_manifest_and_in_the_loader():
    """The manifest lists every file the loader reads, and the loader reads every file it lists."""
    manifest = (BUNDLED / "MANIFEST.md").read_text(encoding="utf-8")
    for name in FILES.values():
        assert f"`{name}`" in manifest
    ours = {p.name for p in BUNDLED.iterdir() if p.suffix in (".csv", ".toml")}
    ours -= {"allowable_stress.csv"} | {p for p in ours if p.startswith("fair_")}
    assert ours == set(FILES.values())


def test_size_ranges_and_sources_of_correlations():
    """size_min < size_max on every correlation; sources name the table or say from memory."""
    for row in _rows("purchased_cost_correlations.csv"):
        assert float(row["size_min"]) < float(row["size_max"])
        assert "Table A.1" in row["source"] or row["source"].startswith("from memory:")


def test_demo_scenarios_say_they_are_invented():
    """Only the published reference set may carry a non-demo source."""
    data = load_cost_data()
    for price in data.prices:
        if data.scenario(price.scenario).basis == "demo":
            assert price.source == "demo, invented"
    assert resolve_scenarios(data) == ("reference",)
    assert {s.name for s in data.scenarios} == {"reference", "cheap-steam-demo", "expensive-power-demo"}


def test_heat_transfer_coefficient_lookup():
    """Typical U of a condenser against cooling water (Towler and Sinnott Table 19.1, from memory)."""
    u = load_cost_data().heat_transfer_coefficient("condenser", "cooling_water", "organic vapours")
    assert (u.u_low, u.u_high) == (700, 1000)


# ---------------------------------------------------------------- a user folder and malformed files


@pytest.fixture
def folder(tmp_path):
    target = tmp_path / "my_cost_data"
    shutil.copytree(BUNDLED, target, ignore=shutil.ignore_patterns("__pycache__", "__init__.py"))
    return target


def _edit(path: Path, old: str, new: str) -> None:
    text = path.read_text(encoding="utf-8")
    assert old in text
    path.write_text(text.replace(old, new, 1), encoding="utf-8")


def test_user_folder_is_used(folder):
    """A copy with one price changed gives that price."""
    _edit(folder / "utility_prices.csv", "reference,lp_steam,13.28,", "reference,lp_steam,99.5,")
    data = load_cost_data(folder)
    assert data.price("reference", "lp_steam").price == 99.5
    assert data.folder == str(folder.resolve())


def test_user_file_with_byte_order_mark(folder):
    """A table saved by a spreadsheet as UTF-8 CSV starts with a byte-order mark; its first column still reads."""
    _edit(folder / "utility_prices.csv", "reference,lp_steam,13.28,", "reference,lp_steam,99.5,")
    path = folder / "utility_prices.csv"
    path.write_bytes(b"\xef\xbb\xbf" + path.read_bytes())
    assert load_cost_data(folder).price("reference", "lp_steam").price == 99.5


def test_missing_folder_names_the_case_field(tmp_path):
    with pytest.raises(CostDataError, match="economics.cost_data: folder not found"):
        load_cost_data(tmp_path / "nowhere")


MALFORMED = [
    # (file, text replaced, replacement, expected message fragment)
    ("purchased_cost_correlations.csv", ",k3,", ",k_three,",
     r"purchased_cost_correlations.csv, row 1, column 'k3': missing column"),
    ("utility_prices.csv", "reference,mp_steam,14.19,", "reference,mp_steam,-14.19,",
     r"utility_prices.csv, row 8, column 'price': -14.19 is negative"),
    ("material_factors.csv", "process_vessel,SS,3.12,", "process_vessel,SS,three,",
     r"material_factors.csv, row 5, column 'material_factor': 'three' is not a number"),
    ("purchased_cost_correlations.csv", "area,m2,10,100,", "area,m2,100,10,",
     r"row 8, column 'size_min': size_min 100 is not below size_max 10"),
    ("cost_index.csv", '2003,402.0,CEPCI,annual average,"from memory: Chemical Engineering Plant Cost Index, '
     'annual average as printed in Chemical Engineering magazine"', "2003,402.0,CEPCI,annual average,",
     r"cost_index.csv, row 4, column 'source': empty cell"),
    ("purchased_cost_correlations.csv", "parallel,pump_centrifugal,", "parallel,pump_rotary,",
     r"row 11, column 'material_group': 'pump_rotary' is not one of"),
    ("utility_prices.csv", 'expensive-power-demo,electricity,0.25,USD,kWh,2023,industrial_electricity,"demo, invented"\n',
     "",
     r"scenario 'expensive-power-demo' has no price for electricity"),
    ("annualisation.toml", 'method = "capital_recovery"\n', 'method = "annuity"\n',
     r"annualisation.toml, column 'method': 'annuity' is not one of"),
    ("utility_levels.csv", "lp_steam,heating,steam,158.9,158.9,2086,", "lp_steam,heating,steam,158.9,158.9,,",
     r"utility_levels.csv, row 7, column 'latent_heat_kJ_per_kg': steam needs its latent heat"),
]


@pytest.mark.parametrize("name, old, new, message", MALFORMED, ids=[m[3][:40] for m in MALFORMED])
def test_malformed_file_names_file_row_and_column(folder, name, old, new, message):
    _edit(folder / name, old, new)
    with pytest.raises(CostDataError, match=message):
        load_cost_data(folder)


def test_edited_folder_is_reloaded(folder):
    """The cache notices a changed file."""
    assert load_cost_data(folder).settings.interest_rate == 0.10
    _edit(folder / "annualisation.toml", "interest_rate = 0.10", "interest_rate = 0.12")
    assert load_cost_data(folder).settings.interest_rate == 0.12


# ---------------------------------------------------------------- case-level errors

INPUT = ColumnCostInput(shell_diameter=1.5, shell_height=20.0, design_pressure_gauge=1e5, trays=30,
                        condenser_area=80.0, condenser_duty=2e6, condenser_utility="cooling_water",
                        reboiler_area=60.0, reboiler_duty=2.2e6, reboiler_utility="lp_steam",
                        drum_volume=4.0, drum_diameter=1.2, pump_shaft_power=1.5e3)


def test_cost_year_outside_the_index_table():
    with pytest.raises(CaseError, match=r"economics.cost_year: 1995 is not in the cost-index table "
                                        r"cost_data \(bundled\)/cost_index.csv \(allowed: years 2001 to 2023"):
        cost_column(load_cost_data(), INPUT, cost_year=1995)


def test_cost_year_added_by_the_user(folder):
    """A user extends the index table by one row and may then use that year."""
    path = folder / "cost_index.csv"
    path.write_text(path.read_text(encoding="utf-8") + "2030,900.0,CEPCI,annual average,\"demo, invented\"\n",
                    encoding="utf-8")
    summary = cost_column(load_cost_data(folder), INPUT)
    assert (summary.cost_year, summary.cost_index) == (2030, 900.0)


def test_unknown_scenario_and_currency():
    data = load_cost_data()
    with pytest.raises(CaseError, match=r"economics.scenarios: unknown scenario 'cheap'"):
        cost_column(data, INPUT, scenario="cheap")
    with pytest.raises(CaseError, match=r"economics.currency: 'EUR' differs"):
        cost_column(data, INPUT, currency="EUR")


def test_wrong_service_utility():
    with pytest.raises(CaseError, match=r"reboiler utility: 'cooling_water' is a cooling utility"):
        cost_column(load_cost_data(), ColumnCostInput(**{**INPUT.__dict__, "reboiler_utility": "cooling_water"}))

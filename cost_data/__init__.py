"""Bundled cost data (CSV/TOML files); shipped inside the wheel as disteco.cost_data."""

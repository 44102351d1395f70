"""result.json: a stable, documented shape with the unit of every quantity in its key."""

from __future__ import annotations

from .. import __version__
from .._base.units import to_degC
from ..properties import FeedState, MixtureSummary
from .design_result import CAUTIONS, SCHEMA_VERSION, DesignResult


def mixture_json(summary: MixtureSummary) -> dict:
    return {
        "method": summary.method,
        "top_pressure_kPa": summary.pressure / 1e3,
        "components": [
            {"name": c.name, "databank_name": c.databank_name, "cas": c.cas,
             "molar_mass_g_per_mol": c.molar_mass * 1e3,
             "normal_boiling_point_degC": to_degC(c.normal_boiling_point),
             "feed_mole_fraction": c.feed_fraction}
            for c in summary.components],
        "light_key": summary.light_key,
        "heavy_key": summary.heavy_key,
        "key_relative_volatility_min": summary.key_volatility_min,
        "key_relative_volatility_max": summary.key_volatility_max,
        "feed_bubble_point_degC": to_degC(summary.feed_bubble_T),
        "feed_dew_point_degC": to_degC(summary.feed_dew_T),
        "azeotropes": [
            {"first": a.first, "second": a.second, "mole_fraction_first": a.x_first,
             "temperature_degC": to_degC(a.T), "pressure_kPa": a.pressure / 1e3, "kind": a.kind}
            for a in summary.azeotropes],
    }


def feed_json(feed: FeedState) -> dict:
    return {
        "molar_flow_kmol_per_h": feed.molar_flow * 3.6,
        "mole_fractions": list(feed.z),
        "pressure_kPa": feed.pressure / 1e3,
        "temperature_degC": to_degC(feed.temperature),
        "q": feed.q,
    }


def result_json(result: DesignResult) -> dict:
    """The whole result as a JSON-ready dict."""
    return {
        "schema_version": SCHEMA_VERSION,
        "disteco_version": __version__,
        "case_title": result.case.title,
        "case_file": str(result.case.source) if result.case.source else None,
        "mixture": mixture_json(result.mixture),
        "feed": feed_json(result.feed),
        "warnings": list(result.warnings),
        "cautions": list(CAUTIONS),
    }

"""Shared fixtures: example paths and cached mixtures (thermo's set-up takes about a second)."""

import os
import tempfile
from pathlib import Path

import pytest

# thermo's data packages are cached on disk between runs (disteco.properties.data_cache); the suite
# keeps its own folder, shared with the command lines it starts, so it neither reads nor fills the user's.
os.environ["DISTECO_CACHE_DIR"] = tempfile.mkdtemp(prefix="disteco-test-cache-")

from disteco.case import Thermo
from disteco.properties import build_mixture

ROOT = Path(__file__).resolve().parents[1]
EXAMPLES = ROOT / "examples"


@pytest.fixture(scope="session")
def benzene_toluene():
    return build_mixture(("benzene", "toluene"), Thermo("ideal"), 101325.0)


@pytest.fixture(scope="session")
def ethanol_water():
    return build_mixture(("ethanol", "water"), Thermo("unifac-dortmund"), 101325.0)

"""Properties layer: the only layer that talks to thermo/chemicals.

Public interface: :class:`Mixture` (built once per case by :func:`build_mixture`),
binary diagrams and azeotropes, and the feed state.
"""

from .binary import Azeotrope, BinaryDiagram, all_azeotropes, binary_diagram, find_azeotropes
from .feed import FeedState, feed_molar_flow, feed_state, mole_fractions, products_on_mole_basis
from .summary import ComponentSummary, MixtureSummary, summarise_mixture
from .mixture import Mixture, PhasePoint, build_mixture, choose_method

__all__ = ["Azeotrope", "BinaryDiagram", "FeedState", "Mixture", "PhasePoint", "all_azeotropes",
           "binary_diagram", "build_mixture", "choose_method", "feed_molar_flow", "feed_state", "mole_fractions",
           "products_on_mole_basis",
           "find_azeotropes", "ComponentSummary", "MixtureSummary", "summarise_mixture"]

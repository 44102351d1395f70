"""Component names and CAS numbers resolved through the chemicals databank."""

from __future__ import annotations

import difflib
from dataclasses import dataclass
from functools import lru_cache

from chemicals.identifiers import CAS_from_any, dippr_compounds, search_chemical

from .._base.errors import CaseError

POLAR_ELEMENTS = frozenset({"O", "N", "S", "F", "Cl", "Br", "I", "P"})


@dataclass(frozen=True)
class ComponentId:
    """A resolved component: the name as written, its CAS number and databank name."""

    given: str
    cas: str
    name: str
    formula: str

    @property
    def is_polar(self) -> bool:
        """True when the formula holds a hetero-atom (O, N, S, halogen, P)."""
        return any(element in POLAR_ELEMENTS for element in _elements(self.formula))


def _elements(formula: str) -> set[str]:
    import re

    return set(re.findall(r"[A-Z][a-z]?", formula))


@lru_cache(maxsize=1)
def _known_names() -> tuple[str, ...]:
    names = []
    for cas in dippr_compounds():
        try:
            names.append(search_chemical(cas).common_name)
        except ValueError:
            continue
    return tuple(sorted(set(names)))


def close_matches(text: str, count: int = 5) -> list[str]:
    """Names in the databank that look like ``text``."""
    return difflib.get_close_matches(text.lower(), _known_names(), n=count, cutoff=0.6)


def resolve_component(text: str, field: str = "mixture.components") -> ComponentId:
    """Resolve a name or CAS number; raise CaseError listing close matches when unknown."""
    try:
        cas = CAS_from_any(text)
        meta = search_chemical(cas)
    except ValueError:
        matches = close_matches(text)
        hint = ", ".join(matches) if matches else "a name or CAS number from the thermo/chemicals databank"
        raise CaseError(field, f"unknown component {text!r}", f"close matches: {hint}" if matches else hint,
                        text) from None
    return ComponentId(text, cas, meta.common_name, meta.formula)


def resolve_components(names: tuple[str, ...]) -> tuple[ComponentId, ...]:
    """Resolve every component; two names for one chemical are an error."""
    resolved = tuple(resolve_component(name) for name in names)
    seen: dict[str, str] = {}
    for component in resolved:
        if component.cas in seen:
            raise CaseError("mixture.components",
                            f"{seen[component.cas]!r} and {component.given!r} are the same chemical "
                            f"(CAS {component.cas})", "distinct components")
        seen[component.cas] = component.given
    return resolved

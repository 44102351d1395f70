"""Component names, synonyms, CAS numbers and formulas resolved exactly through the chemicals databank."""

from __future__ import annotations

import difflib
from dataclasses import dataclass
from functools import lru_cache

from chemicals.identifiers import CAS_from_any, dippr_compounds, search_chemical

from .._base.errors import CaseError
from .data_cache import keep_name, kept_name

POLAR_ELEMENTS = frozenset({"O", "N", "S", "F", "Cl", "Br", "I", "P"})
# debye; below it a molecule with hetero-atoms counts as non-polar for the method's choice (carbon
# monoxide 0.11, nitrous oxide 0.17; toluene, a hydrocarbon, 0.33; thiophene 0.55 stays polar).
# Common practice, no source.
NONPOLAR_DIPOLE = 0.5
OBSOLETE = "(obs.)"  # how the databank marks an obsolete synonym
# Non-polar gases whose interaction with hydrocarbons Peng-Robinson's kij = 0 misrepresents: with
# kij = 0 no carbon dioxide/ethane azeotrope is found at 20 bar, with kij = 0.13 (from memory) one
# at 66 % carbon dioxide, as the pair is known to have. Common practice, no source.
KIJ_GASES = frozenset({"124-38-9", "7727-37-9"})  # carbon dioxide, nitrogen


@dataclass(frozen=True)
class ComponentId:
    """A resolved component: the name as written, its CAS number and databank name."""

    given: str
    cas: str
    name: str
    formula: str

    @property
    def is_hydrocarbon(self) -> bool:
        """True when the formula holds carbon and hydrogen only."""
        return _elements(self.formula) == {"C", "H"}

    @property
    def is_kij_gas(self) -> bool:
        """Carbon dioxide or nitrogen (:data:`KIJ_GASES`)."""
        return self.cas in KIJ_GASES

    @property
    def is_polar(self) -> bool:
        """True when the formula holds a hetero-atom (O, N, S, halogen, P), unless the databank gives the
        molecule a dipole moment below :data:`NONPOLAR_DIPOLE` (nitrogen, oxygen, carbon dioxide, carbon
        tetrachloride: no groups in UNIFAC and no reason for an activity model)."""
        if not any(element in POLAR_ELEMENTS for element in _elements(self.formula)):
            return False
        dipole = _dipole_moment(self.cas)
        return dipole is None or dipole >= NONPOLAR_DIPOLE


@lru_cache(maxsize=None)
def _dipole_moment(cas: str) -> float | None:
    """The databank's dipole moment [debye], None where it has none."""
    from chemicals.dipole import dipole_moment

    value = dipole_moment(cas)
    return None if value is None else float(value)


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


def _exact_names(meta) -> set[str]:
    """Every spelling that names ``meta`` exactly: CAS, names, formula, current synonyms (lower case).

    A synonym the databank also lists as obsolete ("benzine (obs.)") is left out: an obsolete
    name today means something else (benzine is a petroleum cut), so it is not a name.
    """
    synonyms = {s.lower() for s in meta.synonyms}
    obsolete = {s[:-len(OBSOLETE)].strip() for s in synonyms if s.endswith(OBSOLETE)}
    names = {meta.CASs, meta.common_name, meta.iupac_name, meta.formula}
    return {n.lower() for n in names if n} | (synonyms - obsolete)


def resolve_component(text: str, field: str = "mixture.components") -> ComponentId:
    """Resolve a name, synonym, CAS number or formula matching the databank exactly (any case).

    The databank's own search also accepts near spellings; a name it finds that is not one of
    the chemical's exact names is refused with close matches, never substituted. An exact
    resolution is kept on disk (:mod:`.data_cache`) for later runs.
    """
    kept = kept_name(text)
    if kept is not None:
        return ComponentId(text, *kept)
    try:
        meta = search_chemical(CAS_from_any(text.strip()))
        exact = text.strip().lower() in _exact_names(meta)
    except ValueError:
        meta, exact = None, False
    if not exact:
        matches = close_matches(text)
        if meta is not None and meta.common_name not in matches:
            matches.insert(0, meta.common_name)
        hint = ", ".join(matches) if matches else "a name, synonym, CAS number or formula from the " \
                                                   "thermo/chemicals databank, spelt exactly"
        raise CaseError(field, f"unknown component {text!r}", f"close matches: {hint}" if matches else hint,
                        text) from None
    keep_name(text, meta.CASs, meta.common_name, meta.formula)
    return ComponentId(text, meta.CASs, meta.common_name, meta.formula)


def resolve_components(names: tuple[str, ...]) -> tuple[ComponentId, ...]:
    """Resolve every component; two names for one chemical are an error."""
    resolved = tuple(resolve_component(name, f"mixture.components[{k}]") for k, name in enumerate(names))
    seen: dict[str, str] = {}
    for component in resolved:
        if component.cas in seen:
            raise CaseError("mixture.components",
                            f"{seen[component.cas]!r} and {component.given!r} are the same chemical "
                            f"(CAS {component.cas})", "distinct components")
        seen[component.cas] = component.given
    return resolved

"""Package namespaces whose names are imported from their modules on first use.

A package ``__init__`` that imports every module makes importing one small module pull in
the whole layer (the cost data's utility levels pulled in the stages layer and scipy's
interpolation). With :func:`lazy_names` the package still offers the same names, but each
module is imported only when one of its names is asked for.
"""

from __future__ import annotations

import importlib
import sys
import types


def lazy_names(package: str, modules: dict[str, tuple[str, ...]]):
    """(``__getattr__``, ``__dir__``, ``__all__``) for ``package`` offering ``modules``' names.

    ``modules`` maps a module of the package (relative name) to the names it exports.
    """
    home = {name: module for module, names in modules.items() for name in names}
    shadowed = sorted(set(home) & set(modules))
    if shadowed:  # importing the module would set the package attribute to the module itself
        raise ValueError(f"{package}: {shadowed} share their module's name; import them eagerly")

    def __getattr__(name: str):
        module = home.get(name)
        if module is None:
            raise AttributeError(f"module {package!r} has no attribute {name!r}")
        value = getattr(importlib.import_module(f"{package}.{module}"), name)
        setattr(sys.modules[package], name, value)  # the next look-up is an ordinary attribute
        return value

    def __dir__() -> list[str]:
        return sorted(set(vars(sys.modules[package])) | set(home))

    return __getattr__, __dir__, sorted(home)


class _LoadedOnFirstUse(types.ModuleType):
    """Stands in ``sys.modules`` for a module not imported yet; the first attribute it lacks imports it."""

    def __getattr__(self, name: str):
        if sys.modules.get(self.__name__) is self:
            del sys.modules[self.__name__]
        return getattr(importlib.import_module(self.__name__), name)


def import_on_first_use(*modules: str) -> None:
    """Let ``modules`` be imported on first use although a dependency imports them eagerly.

    Pyomo's dependency module imports scipy's statistics and integration packages as soon as
    scipy and Pyomo are both loaded (``_finalize_scipy``; no option turns it off), 0.26 s of
    every process that builds a model, for packages that neither disteco nor the parts of Pyomo
    it uses touch. A module already imported is left alone; one that is used after all is
    imported then, whole (the placeholder hands every attribute on to it).
    """
    for module in modules:
        if module not in sys.modules:
            sys.modules[module] = _LoadedOnFirstUse(module)

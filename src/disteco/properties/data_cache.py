"""thermo's pure-component data packages and resolved component names, kept on disk between runs.

``ChemicalConstantsPackage.from_IDs`` reads chemicals' data tables each time: 0.7 s of a
``check`` of about 3 s on the benzene/toluene example, and again in every worker process.
thermo's own JSON round trip of the two packages (``as_json``/``from_json``) takes 3 ms and
gives equal packages. So the packages of a component list are written once as JSON, keyed
by the list and the versions of thermo and chemicals, and read back on later runs. A name
resolved exactly in the databank (0.12 s of chemicals' identifier tables on the first lookup)
is kept the same way, with its CAS number, databank name and formula.

The folder is ``$DISTECO_CACHE_DIR`` if set (an empty value turns the cache off), else
``$XDG_CACHE_HOME/disteco``, else ``~/.cache/disteco``. A file that cannot be read or built
from is ignored and written again; a folder that cannot be written is left alone. Nothing
but thermo's data goes there, so deleting the folder is always safe.
"""

from __future__ import annotations

import hashlib
import json
import os
import tempfile
from pathlib import Path

import chemicals
import thermo
from thermo import ChemicalConstantsPackage, PropertyCorrelationsPackage

ENVIRONMENT = "DISTECO_CACHE_DIR"
FORMAT = 1  # raise when the stored layout changes


def cache_folder() -> Path | None:
    """Where the packages are kept; None when the cache is turned off."""
    given = os.environ.get(ENVIRONMENT)
    if given is not None:
        return Path(given) if given.strip() else None
    base = os.environ.get("XDG_CACHE_HOME") or str(Path.home() / ".cache")
    return Path(base) / "disteco"


def _file(folder: Path, kind: str, what) -> Path:
    key = json.dumps([FORMAT, thermo.__version__, chemicals.__version__, kind, what])
    return folder / f"{kind}-{hashlib.sha256(key.encode()).hexdigest()[:24]}.json"


def _kept(kind: str, what):
    """(path to keep it in or None, the kept JSON data or None)."""
    folder = cache_folder()
    if folder is None:
        return None, None
    path = _file(folder, kind, what)
    try:
        return path, json.loads(path.read_text(encoding="utf-8"))
    except (OSError, ValueError):  # absent or damaged: built again
        return path, None


def component_packages(ids: list[str]) -> tuple[ChemicalConstantsPackage, PropertyCorrelationsPackage]:
    """thermo's constants and correlations of the components ``ids`` (CAS numbers), from the cache if kept."""
    path, data = _kept("components", ids)
    if data is not None:
        try:
            constants, correlations = data
            return ChemicalConstantsPackage.from_json(constants), PropertyCorrelationsPackage.from_json(correlations)
        except Exception:  # a foreign layout: rebuilt below and written again
            pass
    constants, correlations = ChemicalConstantsPackage.from_IDs(ids)
    if path is not None:
        _store(path, [constants.as_json(), correlations.as_json()])
    return constants, correlations


def kept_name(text: str) -> tuple[str, str, str] | None:
    """(CAS number, databank name, formula) of a name resolved before, or None."""
    _, data = _kept("name", text.strip().lower())
    if isinstance(data, list) and len(data) == 3 and all(isinstance(v, str) for v in data):
        return data[0], data[1], data[2]
    return None


def keep_name(text: str, cas: str, name: str, formula: str) -> None:
    """Keep the exact resolution of ``text`` for later runs."""
    path, _ = _kept("name", text.strip().lower())
    if path is not None:
        _store(path, [cas, name, formula])


def _store(path: Path, data: list) -> None:
    """Write ``data`` to ``path`` whole or not at all (a temporary file renamed); OSError leaves no file."""
    try:
        path.parent.mkdir(parents=True, exist_ok=True)
        handle, temporary = tempfile.mkstemp(dir=path.parent, prefix=".", suffix=".part")
        try:
            with os.fdopen(handle, "w", encoding="utf-8") as stream:
                json.dump(data, stream)
            os.replace(temporary, path)
        except BaseException:
            os.unlink(temporary)
            raise
    except OSError:
        pass

"""Safe output files: written to a temporary file beside the target, then moved into place."""

from __future__ import annotations

import json
import os
import tempfile
from pathlib import Path


def write_atomically(path: Path, write) -> None:
    """Call ``write(tmp_path)`` and move the result over ``path`` only if it succeeded."""
    path.parent.mkdir(parents=True, exist_ok=True)
    handle, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".part", dir=path.parent)
    os.close(handle)
    tmp_path = Path(tmp)
    try:
        write(tmp_path)
        os.replace(tmp_path, path)
    finally:
        tmp_path.unlink(missing_ok=True)


def write_json(path: Path, data: dict) -> None:
    """Write ``data`` as indented JSON, atomically."""
    write_atomically(path, lambda tmp: tmp.write_text(json.dumps(data, indent=2) + "\n", encoding="utf-8"))

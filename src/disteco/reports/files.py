"""Output files that land together: a claimed folder, a staging folder, and one commit step.

A run first claims its output folder (:func:`claim_folder`): the folder is created if
needed, its writability is proved by creating a lock file in it, and an exclusive lock on
that file keeps a second run out until the first one ends. The run's files are then
written into a staging folder inside the output folder and committed together
(:meth:`ClaimedFolder.write_set`): the old set is moved aside into a folder holding a
journal of what it held, the new set is moved in, and the journal is deleted, which is
the commit point. Termination signals are held back during those few renames, and an
exception rolls them back, so the folder holds the whole old set or the whole new one.
If the process is killed outright in between, the next run into the folder finds the
journal and rolls back before it writes. Files follow the user's umask.
"""

from __future__ import annotations

import json
import os
import shutil
import signal
import socket
import tempfile
import time
from collections.abc import Callable, Iterator, Mapping
from contextlib import contextmanager
from pathlib import Path

from .._base.errors import OutputFolderError

try:
    import fcntl
except ImportError:  # not on Windows: runs into one folder are then not kept apart
    fcntl = None

LOCK_FILE = ".disteco.lock"
STAGING_PREFIX = ".disteco-new-"
ASIDE_PREFIX = ".disteco-old-"
JOURNAL = "journal.json"
_HELD_SIGNALS = {getattr(signal, name) for name in ("SIGINT", "SIGTERM", "SIGHUP") if hasattr(signal, name)}


def _umask() -> int:
    mask = os.umask(0o022)
    os.umask(mask)
    return mask


def write_atomically(path: Path, write) -> None:
    """Call ``write(tmp_path)`` and move the result over ``path`` only if it succeeded.

    The file gets the mode a newly created file gets under the user's umask (the
    temporary file would otherwise keep the owner-only mode of ``tempfile.mkstemp``).
    """
    path.parent.mkdir(parents=True, exist_ok=True)
    handle, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".part", dir=path.parent)
    os.close(handle)
    tmp_path = Path(tmp)
    try:
        write(tmp_path)
        os.chmod(tmp_path, 0o666 & ~_umask())
        os.replace(tmp_path, path)
    finally:
        tmp_path.unlink(missing_ok=True)


def write_json(path: Path, data: dict) -> None:
    """Write ``data`` as indented JSON, atomically."""
    write_atomically(path, lambda tmp: tmp.write_text(json.dumps(data, indent=2) + "\n", encoding="utf-8"))


class ClaimedFolder:
    """An output folder this process holds the lock of; see :func:`claim_folder`."""

    def __init__(self, path: Path, label: str):
        self.path = path
        self.label = label

    def write_set(self, writers: Mapping[str, Callable[[Path], object]], managed: tuple[str, ...]) -> None:
        """Write the entries ``writers`` names (``name -> write(path)``) and replace the set together.

        ``managed`` lists every entry a run may own; an entry of the old set that the new
        set does not write (figures of an earlier run, say) is removed with the old set.
        """
        recover(self.path, managed)
        staging = Path(tempfile.mkdtemp(prefix=STAGING_PREFIX, dir=self.path))
        try:
            for name, write in writers.items():
                write(staging / name)
            with _signals_held():
                _commit(self.path, staging, managed)
        finally:
            shutil.rmtree(staging, ignore_errors=True)


def _commit(folder: Path, staging: Path, managed: tuple[str, ...]) -> None:
    aside = Path(tempfile.mkdtemp(prefix=ASIDE_PREFIX, dir=folder))
    present = [name for name in managed if os.path.lexists(folder / name)]
    (aside / JOURNAL).write_text(json.dumps(present), encoding="utf-8")  # written before anything moves
    try:
        for name in present:
            os.replace(folder / name, aside / name)
        for name in managed:
            if os.path.lexists(staging / name):
                os.replace(staging / name, folder / name)
    except BaseException:
        _roll_back(folder, aside, managed)
        raise
    (aside / JOURNAL).unlink()  # the commit point
    shutil.rmtree(aside, ignore_errors=True)


def _roll_back(folder: Path, aside: Path, managed: tuple[str, ...]) -> None:
    """Put the old set back from ``aside`` after an interrupted commit."""
    present = json.loads((aside / JOURNAL).read_text(encoding="utf-8"))
    for name in managed:
        target = folder / name
        if name in present and not os.path.lexists(aside / name):
            continue  # never moved: what the folder holds is the old entry
        if target.is_dir() and not target.is_symlink():
            shutil.rmtree(target)
        elif os.path.lexists(target):
            target.unlink()
        if name in present:
            os.replace(aside / name, target)
    shutil.rmtree(aside, ignore_errors=True)


def recover(folder: Path, managed: tuple[str, ...]) -> None:
    """Undo what a killed run left: roll back an unfinished commit, remove staging folders.

    Call only while holding the folder's lock, since a running writer's folders look alike.
    """
    for entry in sorted(folder.glob(ASIDE_PREFIX + "*")):
        if (entry / JOURNAL).is_file():
            _roll_back(folder, entry, managed)
        else:
            shutil.rmtree(entry, ignore_errors=True)
    for entry in folder.glob(STAGING_PREFIX + "*"):
        shutil.rmtree(entry, ignore_errors=True)


@contextmanager
def _signals_held() -> Iterator[None]:
    """Hold back termination signals (delivered after the block) so a commit is not cut in two."""
    if not hasattr(signal, "pthread_sigmask"):
        yield
        return
    previous = signal.pthread_sigmask(signal.SIG_BLOCK, _HELD_SIGNALS)
    try:
        yield
    finally:
        signal.pthread_sigmask(signal.SIG_SETMASK, previous)


@contextmanager
def claim_folder(folder: str | Path, label: str = "output folder", owner: str = "",
                 managed: tuple[str, ...] = ()) -> Iterator[ClaimedFolder]:
    """Create ``folder`` if needed, prove it writable and lock it for this run.

    Raises :class:`OutputFolderError` (naming ``label``) when the folder cannot be
    created or written, or when another run holds it. With the lock held, what a killed
    run left of the ``managed`` set is rolled back at once (:func:`recover`), so a mixture
    lasts until the next run starts, not until it writes. A folder created here and left
    empty is removed again on the way out.
    """
    path = Path(folder)
    created = _make_folder(path, label)
    try:
        with _locked(path, label, owner):
            if managed:
                recover(path, managed)
            yield ClaimedFolder(path, label)
    finally:
        if created:
            try:
                path.rmdir()  # only succeeds when the run wrote nothing
            except OSError:
                pass


def _make_folder(path: Path, label: str) -> bool:
    if path.is_dir():
        return False
    if path.exists() or path.is_symlink():
        raise OutputFolderError(label, path, "is a file, not a folder", "a folder, or a path where one can be made")
    try:
        path.mkdir(parents=True)
    except FileExistsError:
        raise OutputFolderError(label, path, "a part of the path is a file, not a folder",
                                "a folder, or a path where one can be made") from None
    except OSError as exc:
        raise OutputFolderError(label, path, f"cannot be created ({exc.strerror or exc})",
                                "a folder you may write into") from None
    return True


@contextmanager
def _locked(path: Path, label: str, owner: str) -> Iterator[None]:
    lock = path / LOCK_FILE
    while True:
        try:
            handle = os.open(lock, os.O_RDWR | os.O_CREAT, 0o666)
        except OSError as exc:
            raise OutputFolderError(label, path, f"cannot be written into ({exc.strerror or exc})",
                                    "a folder you may write into") from None
        if fcntl is None:
            break
        try:
            fcntl.flock(handle, fcntl.LOCK_EX | fcntl.LOCK_NB)
        except OSError:
            holder = os.read(handle, 4096).decode("utf-8", "replace").strip() or "holder unknown"
            os.close(handle)
            raise OutputFolderError(label, path, f"another disteco run is writing into it ({holder})",
                                    "wait for that run to end, or choose another folder") from None
        try:
            same = os.stat(lock).st_ino == os.fstat(handle).st_ino
        except FileNotFoundError:
            same = False
        if same:
            break
        os.close(handle)  # the holder removed the file as we opened it: take the new one
    try:
        stamp = time.strftime("%Y-%m-%d %H:%M:%S UTC", time.gmtime())
        text = f"pid {os.getpid()} on {socket.gethostname()}, started {stamp}" + (f", {owner}" if owner else "")
        os.ftruncate(handle, 0)
        os.write(handle, text.encode("utf-8"))
        yield
    finally:
        lock.unlink(missing_ok=True)  # before the lock goes, so a waiting run opens a fresh file
        os.close(handle)

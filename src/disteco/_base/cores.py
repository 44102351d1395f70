"""The cores this process may run on, for the layers that work beside themselves in forked processes."""

from __future__ import annotations

import multiprocessing
import os


def usable_cores() -> int:
    """Cores this process may run on."""
    try:
        return len(os.sched_getaffinity(0))
    except AttributeError:  # not on every platform
        return os.cpu_count() or 1


def can_fork() -> bool:
    """Whether child processes can be forked here (they inherit the imported modules and the data)."""
    return "fork" in multiprocessing.get_all_start_methods()


__all__ = ["can_fork", "usable_cores"]

"""A request to stop the run (SIGTERM or Ctrl-C), kept where every layer can read it.

The command line turns SIGTERM into ``KeyboardInterrupt`` so that a terminated run unwinds
(releases its folder's lock, removes its staging files). An interrupt raised while the
modelling library waits for the solver's process can come back as another exception (its
output capture catches what its context managers raise and reports a ``RuntimeError``), which
the solve layer then counts as a failed configuration: the run went on and exited 0. So the
signal handler also records the request here, and the solve layer stops on it after every
solver call, whatever that call raised.
"""

from __future__ import annotations

_requested = False


def request() -> None:
    """Record that the run was asked to stop."""
    global _requested
    _requested = True


def clear() -> None:
    global _requested
    _requested = False


def requested() -> bool:
    return _requested


def stop_if_requested() -> None:
    """Raise ``KeyboardInterrupt`` when the run was asked to stop."""
    if _requested:
        raise KeyboardInterrupt


__all__ = ["clear", "request", "requested", "stop_if_requested"]

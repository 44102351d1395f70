"""Machine facts the benchmarks print beside their ratios."""

from __future__ import annotations

import os
import platform


def cpu_model() -> str:
    """The processor's model name, or "unknown"."""
    try:
        with open("/proc/cpuinfo", encoding="utf-8") as info:
            return next(line.split(":", 1)[1].strip() for line in info if line.startswith("model name"))
    except (OSError, StopIteration):
        return "unknown"


def facts() -> str:
    """Cores, processor, load average and Python version in one line."""
    load = " ".join(f"{x:.1f}" for x in os.getloadavg())
    return f"nproc {os.cpu_count()}, CPU {cpu_model()}, load average {load}, Python {platform.python_version()}"
